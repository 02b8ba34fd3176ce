// Package regime decides whether a measured signal is periodic, quasiperiodic, chaotic or
// stochastic, and supplies the tests behind that verdict: surrogate data (random-phase, AAFT,
// IAAFT), the Welch power spectrum with line analysis, the 0-1 test for chaos, time-reversal
// asymmetry and nonlinear prediction error with rank tests against surrogates.
//
// Decision rule (Decide), in order:
//
//  1. Lines. If at least half the power lies within ±4 bins of significant spectral lines and
//     the lines are the harmonics of one fundamental, the regime is periodic; if they are
//     integer combinations of two or three incommensurate fundamentals, quasiperiodic —
//     provided fewer than two of the chaos indicators contradict: the 0-1 test (K ≥ 0.5), λ1
//     clearly above zero, D2 saturating at a non-integer value (cycles and tori have integer
//     dimension).
//  2. Null. Otherwise IAAFT surrogates (null: a linear Gaussian process seen through a static
//     monotone function) are compared with the data by a nonlinear prediction error
//     (one-sided) and by time-reversal asymmetry (two-sided, at level max(α, 2/(K+1))) in rank
//     tests. If neither rejects — rank p ≤ α = 0.05 and the data at least 3 surrogate standard
//     deviations from the surrogate mean — the regime is stochastic, whatever λ1 says.
//  3. Chaos. The null is rejected: chaotic if at least two of the three chaos indicators
//     agree — the 0-1 test gives K ≥ 0.5 (on every ⌈τ/2⌉-th sample of an oversampled record),
//     λ1's interval lies above zero (and λ1 exceeds 1 % growth per delay time), D2 saturates —
//     and λ1 is not ≤ 0; otherwise undetermined.
//
// Confidence is the weighted share of the evidence items (lines 3, prediction error 3, 0-1
// test 2, λ1 2, D2 1.5, time reversal 1, Cao's E2 1) whose "points to" set contains the
// regime, times 0.8 for records under 2000 samples and 0.9 for non-stationary ones; an
// undetermined verdict has confidence 0. The 3σ guard of step 2 keeps the rate of false
// "nonlinear" calls on linear data far below α, so a verdict does not flip between seeds.
//
// References: J. Theiler, S. Eubank, A. Longtin, B. Galdrikian and J. D. Farmer (1992),
// Physica D 58, 77; T. Schreiber and A. Schmitz (1996), Phys. Rev. Lett. 77, 635, and (2000),
// Physica D 142, 346; G. A. Gottwald and I. Melbourne (2004), Proc. R. Soc. A 460, 603, and
// (2009), SIAM J. Appl. Dyn. Syst. 8, 129; J. D. Farmer and J. J. Sidorowich (1987), Phys. Rev.
// Lett. 59, 845; P. D. Welch (1967), IEEE Trans. Audio Electroacoust. 15, 70; L. Cao (1997),
// Physica D 110, 43.
package regime
