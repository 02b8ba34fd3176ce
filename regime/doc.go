// Package regime decides whether a measured signal is periodic, quasiperiodic, chaotic or
// stochastic, and supplies the tests behind that verdict: surrogate data (random-phase, AAFT,
// IAAFT), the Welch power spectrum with line analysis, the 0-1 test for chaos, time-reversal
// asymmetry and nonlinear prediction error with rank tests against surrogates.
//
// Decision rule (Decide), in order. A deterministic verdict needs evidence specific to it;
// the 0-1 test, D2, Cao's E2 and time-reversal asymmetry are supporting evidence only, listed
// with the reason in Verdict.Unused.
//
//  1. Lines. If significant spectral lines explain at least MinLineFraction = 90 % of the
//     variance and are the harmonics of one fundamental, the regime is periodic; if they are
//     integer combinations of two or three incommensurate fundamentals, quasiperiodic —
//     unless the chaos evidence of step 3 holds. Lines that explain less describe a noisy
//     oscillation: it goes on to step 2, and its dominant cycle is named in the rule.
//  2. Null. IAAFT surrogates (null: a linear Gaussian process seen through a static monotone
//     function) are compared with the data by a nonlinear prediction error in a one-sided
//     rank test at level α (0.05), which needs at least 1/α − 1 surrogates (Theiler &
//     Prichard 1996); with fewer, or without the test, the regime is undetermined. If the
//     test does not reject (rank p > α), the regime is stochastic, whatever λ1 or K say; the
//     rank result alone decides (no effect-size rule can overrule it). Time-reversal asymmetry
//     (two-sided, needing 2/α − 1 surrogates) only qualifies the wording: irreversibility
//     shows nonlinearity, not determinism.
//  3. Chaos. The null is rejected. If the spectra of the first and last thirds differ
//     (SpectralDrift), non-stationarity alone can reject stationary surrogates: undetermined.
//     Otherwise chaotic when λ1's interval lies above zero (and λ1 exceeds 1 % growth per
//     delay time) and its divergence curve has an exponential range (Exponent.Bounded false,
//     see lyapunov.RangeCheck); else undetermined. Also undetermined when neither number is
//     firm: λ1 depends on the fit choices (Exponent.Unsure) and D2 does not saturate with m,
//     as for a high-dimensional or nonlinear stochastic signal; and when a flow's D2 saturates
//     below 1.5 (a closed curve: a noisy or phase-diffusing limit cycle).
//
// Confidence is the weighted share of the evidence items (lines 3, prediction error 3, 0-1
// test 2, λ1 2, D2 1.5, time reversal 1, Cao's E2 1) whose "points to" set contains the
// regime, times 0.8 for records under 2000 samples and 0.9 for non-stationary ones (mean,
// variance or spectral drift); an undetermined verdict has confidence 0.
//
// Analyze answers records of 48 samples or more; a test the record is too short for is
// listed among the unused evidence with the reason. Verdict.DominantPeriod names the
// strongest cycle.
//
// References: J. Theiler, S. Eubank, A. Longtin, B. Galdrikian and J. D. Farmer (1992),
// Physica D 58, 77; T. Schreiber and A. Schmitz (1996), Phys. Rev. Lett. 77, 635, and (2000),
// Physica D 142, 346; G. A. Gottwald and I. Melbourne (2004), Proc. R. Soc. A 460, 603, and
// (2009), SIAM J. Appl. Dyn. Syst. 8, 129; J. Theiler and D. Prichard (1996), Physica D 94, 221; J. D. Farmer and J. J. Sidorowich (1987), Phys. Rev.
// Lett. 59, 845; P. D. Welch (1967), IEEE Trans. Audio Electroacoust. 15, 70; L. Cao (1997),
// Physica D 110, 43.
package regime
