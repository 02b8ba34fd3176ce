// Package states reconstructs the causal states of a symbol stream and their statistical
// complexity.
//
// The method is causal-state splitting reconstruction (CSSR) of C. R. Shalizi and
// K. L. Klinkner (2004), "Blind construction of optimal nonlinear recursive predictors for
// discrete sequences", in Proc. 20th Conf. on Uncertainty in Artificial Intelligence (UAI 2004),
// 504–511. Histories (suffixes of the past) of length 0 … L are grouped into states whose
// next-symbol distributions do not differ significantly (a χ² homogeneity test at level α);
// the states are then split until every symbol leads from a state to one state
// (determinisation), and the states that the process leaves for good are removed as transient.
//
// From the recurrent states and their transitions come the statistical complexity
// Cμ = H[π] (bits), the Shannon entropy of the stationary state distribution π
// (J. P. Crutchfield and K. Young 1989, "Inferring statistical complexity", Phys. Rev. Lett.
// 63, 105), and the entropy rate hμ = Σ π(s) H[next symbol | s] (bits per symbol); see also
// J. P. Crutchfield and D. P. Feldman (2003), "Regularities unseen, randomness observed",
// Chaos 13, 25.
//
// The package lives beside symbolic (block entropies of the same streams) and reads plain
// symbol slices ([]uint8 with an alphabet size K), so it needs nothing above it.
package states
