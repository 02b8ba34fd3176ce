// Package spectral holds the signal numerics that several analyses share: FFT lengths with
// small prime factors, the Hann window, Welch's averaged-periodogram spectrum and the
// autocovariance by the Wiener–Khinchin theorem. It sits at the bottom of the module beside
// series and fit (it imports only the standard library and gonum), so that embed, regime,
// series and report compute these the same way from one implementation.
//
// References:
//   - P. D. Welch (1967), "The use of fast Fourier transform for the estimation of power
//     spectra: a method based on time averaging over short, modified periodograms", IEEE
//     Transactions on Audio and Electroacoustics 15(2), 70–73.
//   - R. B. Blackman and J. W. Tukey (1958), "The Measurement of Power Spectra from the Point
//     of View of Communications Engineering"; F. J. Harris (1978), "On the use of windows for
//     harmonic analysis with the discrete Fourier transform", Proceedings of the IEEE 66(1),
//     51–83 (the Hann window and its leakage).
//   - N. Wiener (1930), "Generalized harmonic analysis", Acta Mathematica 55, 117–258;
//     A. Khinchin (1934), "Korrelationstheorie der stationären stochastischen Prozesse",
//     Mathematische Annalen 109, 604–615 (autocovariance as the transform of the power
//     spectrum).
package spectral
