package report

import (
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"

	"unfold/analysis"
	"unfold/regime"
)

// EvidenceLine is one row of the page's evidence table: a test in plain words, what it found
// in a sentence, and whether the verdict used it (and why, or why not).
type EvidenceLine struct {
	Key      string // the machine key of result.json ("prediction_error"); not shown
	Name     string // the test in words ("nonlinear prediction against surrogates")
	Term     string // the glossary entry it links to ("" for none)
	Sentence string // what it found, with its numbers and units
	Used     bool
	Role     string // "used: …" or "not used: …"
	Weight   float64
}

// evidenceNames are the tests' names in words and their glossary entries, by machine key.
var evidenceNames = map[string][2]string{
	"prediction_error":      {"nonlinear prediction against IAAFT surrogates", "iaaft"},
	"time_reversal":         {"time-reversal asymmetry against IAAFT surrogates", "iaaft"},
	"lines":                 {"spectral lines", "spectrum"},
	"zero_one":              {"0-1 test for chaos", "zero-one"},
	"lyapunov":              {"largest Lyapunov exponent", "lyapunov"},
	"correlation_dimension": {"correlation dimension D2", "d2"},
	"cao_e2":                {"Cao's E2", "e1e2"},
	"spectral_drift":        {"spectral drift between the first and last thirds", "stationarity"},
}

// Evidence turns the verdict's evidence into plain sentences, used items first (by weight),
// then the unused ones with the reason; tests that were not computed come last. Times and
// rates are in the units u.
func Evidence(an *regime.Analysis, u analysis.Units) []EvidenceLine {
	if an == nil || an.Verdict == nil {
		return nil
	}
	v, ev := an.Verdict, an.Evidence
	lines := make([]EvidenceLine, 0, len(v.Evidence))
	for k, it := range v.Evidence {
		name := evidenceNames[k]
		if name[0] == "" {
			name[0] = strings.ReplaceAll(k, "_", " ")
		}
		l := EvidenceLine{Key: k, Name: name[0], Term: name[1], Used: it.Used, Weight: it.Weight,
			Sentence: sentence(k, it, ev, u)}
		why := strings.TrimPrefix(it.Why, "supporting evidence only: ")
		if why != it.Why {
			why = "supporting evidence only, because " + why
		}
		if it.Used {
			l.Role = "used: " + why
		} else {
			l.Role = "not used: " + why
		}
		lines = append(lines, l)
	}
	slices.SortFunc(lines, func(a, b EvidenceLine) int {
		if a.Used != b.Used {
			if a.Used {
				return -1
			}
			return 1
		}
		if a.Weight != b.Weight {
			if a.Weight > b.Weight {
				return -1
			}
			return 1
		}
		return strings.Compare(a.Key, b.Key)
	})
	if ev != nil {
		for _, s := range ev.Skipped {
			name, why, _ := strings.Cut(s, ": ")
			lines = append(lines, EvidenceLine{Key: name, Name: strings.ReplaceAll(name, "_", " "), Term: evidenceNames[name][1],
				Sentence: "not computed", Role: "not used: " + why})
		}
	}
	return lines
}

// sentence says what the test of key found, in words, with its numbers.
func sentence(key string, it regime.Item, ev *regime.Evidence, u analysis.Units) string {
	g := sig3
	if ev == nil {
		return it.Detail
	}
	switch key {
	case "prediction_error":
		p := ev.Prediction
		if p == nil || len(p.Surrogates) == 0 {
			break
		}
		lo := slices.Min(p.Surrogates)
		n := len(p.Surrogates)
		if p.Data < lo && p.Data > 0 {
			return fmt.Sprintf("the signal is predicted %s× better than any of %d linear (IAAFT) surrogates (error %s against %s … %s): nonlinear, deterministic structure",
				strconv.FormatFloat(lo/p.Data, 'f', 1, 64), n, g(p.Data), g(lo), g(slices.Max(p.Surrogates)))
		}
		return fmt.Sprintf("the signal is predicted no better than its %d linear (IAAFT) surrogates (error %s against %s … %s, rank p = %s): no sign of nonlinear structure",
			n, g(p.Data), g(lo), g(slices.Max(p.Surrogates)), g(p.P))
	case "time_reversal":
		r := ev.Reversal
		if r == nil || len(r.Surrogates) == 0 {
			break
		}
		lo, hi := slices.Min(r.Surrogates), slices.Max(r.Surrogates)
		if r.Data >= lo && r.Data <= hi {
			return fmt.Sprintf("the asymmetry under time reversal, %s, lies within the range of %d linear surrogates (%s … %s): the signal looks the same forwards and backwards",
				g(r.Data), len(r.Surrogates), g(lo), g(hi))
		}
		return fmt.Sprintf("the asymmetry under time reversal, %s, lies outside the range of %d linear surrogates (%s … %s): the signal is irreversible, a sign of nonlinearity",
			g(r.Data), len(r.Surrogates), g(lo), g(hi))
	case "lines":
		l := ev.Lines
		if l == nil {
			break
		}
		pct := strconv.FormatFloat(100*l.LineFraction, 'f', 1, 64)
		switch l.Kind {
		case regime.LinesPeriodic:
			return fmt.Sprintf("%d significant spectral lines, harmonics of %s cycles per %s, carry %s %% of the power: a periodic component",
				len(l.Peaks), g(l.Fundamentals[0]), timeWord(u.Time), pct)
		case regime.LinesQuasiperiodic:
			return fmt.Sprintf("%d significant spectral lines, combinations of %d incommensurate frequencies, carry %s %% of the power: a quasiperiodic component",
				len(l.Peaks), len(l.Fundamentals), pct)
		}
		return fmt.Sprintf("only %s %% of the power lies in %d significant spectral lines: a broadband spectrum, as chaos and noise both give", pct, len(l.Peaks))
	case "zero_one":
		z := ev.ZeroOne
		if z == nil {
			break
		}
		reads := "near 1: chaos, or noise"
		if z.K < 0.5 {
			reads = "near 0: regular motion"
		}
		return fmt.Sprintf("the 0-1 test gives K = %s (%s; %d samples, taking every %d of the record's)", strconv.FormatFloat(z.K, 'f', 2, 64), reads, z.Samples, z.Subsample)
	case "lyapunov":
		l := ev.Lyapunov
		if l == nil || math.IsNaN(l.Value) {
			break
		}
		t := fmt.Sprintf("λ1 = %s [%s, %s] %s", g(l.Value), g(l.Lo), g(l.Hi), PerTime(u.Time))
		switch {
		case l.Bounded:
			return t + ": but the divergence curve has no exponential range, so this is no evidence of chaos"
		case l.Lo > 0:
			return t + ": nearby states separate exponentially fast"
		case l.Hi <= 0:
			return t + ": nearby states do not separate"
		}
		return t + ": the interval includes zero"
	case "correlation_dimension":
		d := ev.Dimension
		if d == nil {
			break
		}
		t := fmt.Sprintf("D2 = %s [%s, %s] at embedding dimension %d", g(d.D2), g(d.Lo), g(d.Hi), d.Dim)
		if !d.Saturated {
			return t + ", not saturated: no low-dimensional attractor is seen"
		}
		return t + ", saturated: the points lie on a set of low, non-integer dimension"
	case "cao_e2":
		if ev.CaoNoiseLike != nil && *ev.CaoNoiseLike {
			return fmt.Sprintf("Cao's E2 stays within %s of 1 at every dimension, as for random noise", g(ev.CaoE2Dev))
		}
		return fmt.Sprintf("Cao's E2 departs from 1 by up to %s: the values are not independent noise", g(ev.CaoE2Dev))
	case "spectral_drift":
		d := ev.Drift
		if d == nil {
			break
		}
		if d.Changed {
			return fmt.Sprintf("the spectra of the first and last thirds differ by %s (estimation noise about %s): the spectrum moves, the record is not stationary", g(d.Distance), g(d.Noise))
		}
		return fmt.Sprintf("the spectra of the first and last thirds differ by %s, within the estimation noise (about %s): the spectrum is steady", g(d.Distance), g(d.Noise))
	}
	return it.Detail
}
