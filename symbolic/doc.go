// Package symbolic holds symbol streams and the estimators that read them.
//
// A symbol stream is plain text, one character per symbol (line breaks are ignored and are
// written every LineWidth symbols), with a JSON sidecar beside it (name + ".json") holding the
// alphabet, the partition that made the symbols (kind, thresholds, score), the source file and
// its SHA-256, the symbol counts and the exact command. Reading a stream checks it against its
// sidecar. Writer and Reader work on io.Writer and io.Reader in bounded memory.
//
// Estimators:
//   - block entropies H(L) of words of L symbols, plug-in, with the bias correction of
//     G. A. Miller (1955), "Note on the bias of information estimates", in Information Theory
//     in Psychology (Free Press), or of P. Grassberger (2003), "Entropy estimates from
//     insufficient samplings", arXiv:physics/0307138;
//   - the entropy-rate estimates h(L) = H(L) − H(L−1) and the excess entropy, the effective
//     measure complexity of P. Grassberger (1986), "Toward a quantitative theory of
//     self-generated complexity", Int. J. Theor. Phys. 25, 907;
//   - Lempel–Ziv complexity: A. Lempel and J. Ziv (1976), "On the complexity of finite
//     sequences", IEEE Trans. Inf. Theory IT-22, 75, in the phrase counting of F. Kaspar and
//     H. G. Schuster (1987), "Easily calculable measure for the complexity of spatiotemporal
//     patterns", Phys. Rev. A 36, 842, computed in linear time with a suffix automaton
//     (A. Blumer et al. 1985, "The smallest automaton recognizing the subwords of a text",
//     Theor. Comput. Sci. 40, 31);
//   - permutation entropy of a numeric series: C. Bandt and B. Pompe (2002), "Permutation
//     entropy: a natural complexity measure for time series", Phys. Rev. Lett. 88, 174102.
package symbolic
