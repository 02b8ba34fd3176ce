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
// Choices made here, where the paper leaves room:
//   - a state's next-symbol distribution pools the counts of all its histories; a child that
//     its parent's state rejects joins the other state with the largest p-value above α, or
//     starts a new one;
//   - the homogeneity test is the two-sample χ² test (Press et al. 2007, §14.3.2); the
//     Kolmogorov–Smirnov alternative of the paper needs ordered symbols and is not offered;
//   - transitions come from the histories shorter than L (their one-symbol extensions were
//     placed by the homogenisation phase), so a history that never synchronises (1…1 in the
//     even process) ends in a transient state instead of splitting the recurrent ones;
//   - transient states are those outside the closed strongly connected components of the
//     transition graph; π is the stationary distribution of the recurrent chain;
//   - the automatic L is the largest with K^(L+1) ≤ N/50 and α·K^(L+1) ≤ 0.1 (LengthRule): every
//     word of length L+1 could be seen 50 times, and fewer than 0.1 false splits are expected
//     from the about K^(L+1) tests, each wrong with probability α. A stated L is refused when
//     N < 5·K^(L+1).
//
// The package lives beside symbolic (block entropies of the same streams) and reads plain
// symbol slices ([]uint8 with an alphabet size K), so it needs nothing above it.
package states
