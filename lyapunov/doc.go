// Package lyapunov estimates Lyapunov exponents from one measured scalar record, after delay
// embedding:
//
//   - the largest exponent from divergence curves (Divergence): the mean logarithm of the
//     distance between initially close delay vectors, as a function of the number of steps
//     followed, is linear in the steps with slope λ_max while the separation stays small. Two
//     curves are offered: M. T. Rosenstein, J. J. Collins & C. J. De Luca (1993), "A practical
//     method for calculating largest Lyapunov exponents from small data sets", Physica D 65,
//     117 (one nearest neighbour per reference point, outside the Theiler window), and H. Kantz
//     (1994), "A robust method to estimate the maximal Lyapunov exponent of a time series",
//     Physics Letters A 185, 77 (the logarithm of the mean distance to every neighbour within ε,
//     for several ε, which is more robust to noise). The linear range is found automatically by
//     package fit, and the interval comes from a block bootstrap over reference points;
//   - the spectrum (Spectrum) from local linear maps fitted by least squares in neighbourhoods
//     and re-orthonormalised by QR factorisations along the orbit: J.-P. Eckmann, S. O.
//     Kamphorst, D. Ruelle & S. Ciliberto (1986), "Liapunov exponents from time series",
//     Physical Review A 34, 4971, and M. Sano & Y. Sawada (1985), "Measurement of the Lyapunov
//     spectrum from a chaotic time series", Physical Review Letters 55, 1082; with the
//     Kaplan–Yorke dimension (J. L. Kaplan & J. A. Yorke 1979, Lecture Notes in Mathematics
//     730, 204) computed by models.KaplanYorke.
//
// The exponents of the model systems from their equations (Benettin et al. 1980), which the
// estimators here are tested against, live in package models.
//
// Cost: Divergence follows at most DefaultReferencePoints sampled reference points, so after
// the O(N log N · m) index its cost does not grow with N (see Divergence); Spectrum fits one
// local map per point along the orbit it follows.
//
// Units: exponents per sample are in nats per step (natural logarithm); multiplied by 1/Dt
// they are in nats per time unit. Divide by ln 2 for bits.
//
// Cautions follow J.-P. Eckmann & D. Ruelle (1992), "Fundamental limitations for estimating
// dimensions and Lyapunov exponents in dynamical systems", Physica D 56, 185 (too few points
// for the embedding), and the common-practice warning signs of divergence curves: a fit range
// of only a few steps, a slope that depends on ε (noise), a curve that saturates at the first
// step (noise, or too large a lag).
package lyapunov
