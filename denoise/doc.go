// Package denoise cleans a measured record before analysis: nonlinear noise reduction in the
// reconstructed state space, and the linear preprocessing that users expect beside it
// (zero-phase Butterworth filters, resampling to a new sampling interval, polynomial
// detrending).
//
// It is a package of its own because nonlinear noise reduction needs the neighbour index and
// the delay embedding (it sits above `neighbors` in the dependency order), while `series`
// below it only reads records and applies the shared, dynamics-free preprocessing; the linear
// filters live here rather than in `series` because they are the alternatives a user weighs
// against the nonlinear methods, with the same output contract (a cleaned record on the same
// time grid).
//
// Nonlinear methods (both iterated, corrections computed from the previous iterate for all
// points at once, so the result does not depend on the number of goroutines):
//   - Locally constant noise reduction: T. Schreiber (1993), "Extremely simple nonlinear
//     noise-reduction method", Physical Review E 47(4), 2401–2404. The middle coordinate of
//     each delay vector is replaced by its mean over the ε-neighbours of the vector.
//   - Local projective noise reduction: P. Grassberger, R. Hegger, H. Kantz, C. Schaffrath and
//     T. Schreiber (1993), "On noise reduction methods for chaotic data", Chaos 3(2), 127–141.
//     Each delay vector is projected onto the q-dimensional local manifold spanned by the
//     leading eigenvectors of the weighted covariance of its ε-neighbourhood; the first and
//     last coordinates get a large weight so that they are hardly corrected (the standard
//     weighting, see also H. Kantz and T. Schreiber (1997), "Nonlinear Time Series Analysis",
//     Cambridge University Press, §10.3.2).
//
// Linear methods:
//   - Butterworth filters: S. Butterworth (1930), "On the theory of filter amplifiers",
//     Wireless Engineer 7, 536–541 (the maximally flat magnitude |H|² = 1/(1+(ω/ωc)^(2N)));
//     digitised by the bilinear transform with frequency prewarping (A. V. Oppenheim and
//     R. W. Schafer (1989), "Discrete-Time Signal Processing", Prentice Hall, §7.1), held as
//     second-order sections and applied forward and backward for zero phase.
//   - Resampling by Kaiser-windowed sinc interpolation (J. F. Kaiser (1974), "Nonrecursive
//     digital filter design using the I0-sinh window function", Proc. IEEE ISCAS, 20–23).
//   - Polynomial detrending by least squares in a Legendre basis.
package denoise
