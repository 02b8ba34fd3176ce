// Package regime decides whether a measured signal is periodic, quasiperiodic, chaotic or
// stochastic, and supplies the tests behind that verdict: surrogate data (random-phase, AAFT,
// IAAFT), the Welch power spectrum with line analysis, the 0-1 test for chaos, time-reversal
// asymmetry and nonlinear prediction error with rank tests against surrogates.
package regime
