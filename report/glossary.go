package report

import "strings"

// GlossaryEntry is one term of the page's glossary: its anchor (#g-KEY), the term and a short
// explanation in plain words.
type GlossaryEntry struct {
	Key, Term, Text string
}

// Glossary is the glossary at the end of the page, in reading order of the chain.
var Glossary = []GlossaryEntry{
	{"embedding", "delay embedding (lag, dimension)", "The state of the system is rebuilt from the one measured signal: each point is (x(t), x(t+τ), …, x(t+(m−1)τ)) for a delay (lag) τ and an embedding dimension m. With a suitable τ and a large enough m the points trace a picture equivalent to the system's own state space (Takens 1981)."},
	{"mi", "mutual information", "How much (in bits) knowing x(t) tells about x(t+τ), linear or not. Its first clear minimum is the usual choice of the delay τ: the coordinates are then as independent as they can be without being unrelated (Fraser & Swinney 1986)."},
	{"fnn", "false nearest neighbours", "Points that are close only because the picture is squeezed into too few dimensions: they fly apart when one more delay coordinate is added. The dimension at which (almost) none are left is large enough (Kennel, Brown & Abarbanel 1992)."},
	{"e1e2", "E1/E2 (Cao's method)", "E1 measures how much neighbour distances still grow from dimension d to d+1 and stops changing when d is large enough. E2 compares predicted and actual next values: it stays at 1 for random noise and departs from 1 for deterministic signals (Cao 1997)."},
	{"theiler", "Theiler window", "Points close in time are close in space just because the signal is continuous, not because the motion returns. Neighbour searches exclude pairs fewer than w samples apart; w is the Theiler window (Theiler 1986), here the time over which the autocorrelation falls to 1/e."},
	{"lyapunov", "Lyapunov exponent", "The average exponential rate at which two nearby states separate, in nats (natural-log units) per unit of time. A positive largest exponent λ1, read from a straight part of the divergence curve, is the mark of chaos; regular motion gives zero or negative values (Rosenstein et al. 1993; Kantz 1994)."},
	{"d2", "correlation dimension", "How the number of pairs of points closer than r grows with r: C(r) ∝ r^D2. A D2 that stops growing as the embedding dimension grows (saturates) at a low, non-integer value points to a fractal (strange) attractor; noise keeps growing with the dimension (Grassberger & Procaccia 1983)."},
	{"spectrum", "spectrum and spectral lines", "The power of the signal at each frequency (Welch 1967). Sharp significant lines mean periodic or quasiperiodic components; power spread over a broad band comes from chaos or noise."},
	{"stationarity", "stationarity", "A record is stationary when its statistics (mean, spread, spectrum) do not change over time. Trends, drifts and changes of regime break the assumption that every method here makes."},
	{"surrogate", "surrogate data", "Artificial series that keep chosen properties of the data and are otherwise random. If a statistic of the data lies outside the range of the surrogates' values, the hypothesis the surrogates stand for is rejected (Theiler et al. 1992)."},
	{"iaaft", "IAAFT surrogate", "Iterative amplitude-adjusted Fourier-transform surrogate: a series with the same values and (almost) the same spectrum as the data but otherwise random — what a linear Gaussian process seen through a fixed monotone function would give (Schreiber & Schmitz 1996)."},
	{"zero-one", "0-1 test", "A test for chaos that needs no embedding: the signal drives a random walk in the plane whose growth rate K is near 0 for regular motion and near 1 for chaos (Gottwald & Melbourne 2004). Noise also gives K near 1, so the test is supporting evidence only."},
	{"poincare", "Poincaré section", "The points where the trajectory crosses a chosen surface in one direction. It turns a continuous flow into a map and a cloud into a simpler set of points (Poincaré 1899)."},
	{"partition", "generating partition", "Cutting the range of values into a few cells so that the sequence of cell labels (symbols) keeps all the information of the motion. The search here picks the cuts with the fewest symbolic false neighbours (Kennel & Buhl 2003)."},
	{"entropy-rate", "entropy rate", "The new information per symbol, in bits, that the symbol stream produces: 0 for a periodic stream, log2 K for random symbols from K letters; read from block entropies of growing word length."},
	{"excess-entropy", "excess entropy", "The information, in bits, the past of the symbol stream shares with its future: how much structure there is to learn before the stream looks as random as it will ever look (Crutchfield & Feldman 2003)."},
	{"lz", "Lempel–Ziv complexity", "The number of new phrases met when reading the symbol stream from start to end, normalised so that random symbols give about 1 (Lempel & Ziv 1976)."},
}

// glossaryTerm returns the glossary entry a table label names ("" when none): the page links
// the label to it.
func glossaryTerm(label string) string {
	l := strings.ToLower(label)
	for _, m := range []struct{ word, key string }{
		{"theiler", "theiler"}, {"false neighbours", "fnn"}, {"cao", "e1e2"}, {"e2", "e1e2"},
		{"λ", "lyapunov"}, {"lyapunov", "lyapunov"}, {"d2", "d2"}, {"takens", "d2"}, {"scaling range", "d2"},
		{"excess entropy", "excess-entropy"}, {"entropy rate", "entropy-rate"}, {"lz76", "lz"},
		{"partition", "partition"}, {"symbols from", "poincare"}, {"chosen lag", "mi"}, {"autocorrelation", "mi"},
		{"chosen dimension", "embedding"}, {"delay vectors", "embedding"}, {"stationary", "stationarity"},
		{"surrogate", "iaaft"},
	} {
		if strings.Contains(l, m.word) {
			return m.key
		}
	}
	return ""
}
