package report

import (
	"fmt"
	"math"
	"strconv"
	"strings"
)

// verdictRun is a stretch of consecutive rows (by the parameter) with the same verdict.
type verdictRun struct {
	verdict     string
	first, last float64
	count       int
}

// fmtParam writes a parameter value as its shortest decimal.
func fmtParam(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }

// Transitions describes in words the route a sweep takes, from rows sorted by the parameter
// (SortSweepRows). Rows without a verdict (no result, an error, or no regime stage) are left
// out. The first sentence lists the verdict runs — consecutive rows with equal verdicts merged
// — naming the values that bound them: "periodic up to r = 3.56, chaotic from r = 3.58;
// periodic again in r = 3.835 … 3.84; chaotic again from r = 3.86". A transition lies between
// the last value of one run and the first value of the next: it is located only to within the
// spacing of the sweep. The sentences after it note where the largest Lyapunov exponent's
// interval first lies above zero, where the spectral lines need a second (or third)
// incommensurate frequency in a record judged quasiperiodic, and where the spectrum becomes
// broadband after having lines.
func Transitions(parameter string, rows []SweepRow) []string {
	var runs []verdictRun
	for _, r := range rows {
		if r.Regime == "" {
			continue
		}
		if n := len(runs); n > 0 && runs[n-1].verdict == r.Regime {
			runs[n-1].last = r.Value
			runs[n-1].count++
			continue
		}
		runs = append(runs, verdictRun{verdict: r.Regime, first: r.Value, last: r.Value, count: 1})
	}
	var out []string
	if len(runs) == 0 {
		return []string{"No record of the sweep has a verdict yet."}
	}
	p := parameter
	span := func(ru verdictRun) string {
		if ru.count == 1 || ru.first == ru.last {
			return "at " + p + " = " + fmtParam(ru.first)
		}
		return "in " + p + " = " + fmtParam(ru.first) + " … " + fmtParam(ru.last)
	}
	if len(runs) == 1 {
		ru := runs[0]
		if ru.count == 1 {
			out = append(out, fmt.Sprintf("%s %s (one record with a verdict).", ru.verdict, span(ru)))
		} else {
			out = append(out, fmt.Sprintf("%s throughout, %s = %s … %s.", ru.verdict, p, fmtParam(ru.first), fmtParam(ru.last)))
		}
	} else {
		seen := map[string]bool{runs[0].verdict: true}
		var b strings.Builder
		fmt.Fprintf(&b, "%s up to %s = %s", runs[0].verdict, p, fmtParam(runs[0].last))
		for i, ru := range runs[1:] {
			sep := "; "
			if i == 0 {
				sep = ", "
			}
			again := ""
			if seen[ru.verdict] {
				again = " again"
			}
			last := i == len(runs)-2
			switch {
			case last || (!seen[ru.verdict] && ru.count > 1):
				fmt.Fprintf(&b, "%s%s%s from %s = %s", sep, ru.verdict, again, p, fmtParam(ru.first))
			default:
				fmt.Fprintf(&b, "%s%s%s %s", sep, ru.verdict, again, span(ru))
			}
			seen[ru.verdict] = true
		}
		b.WriteString(".")
		out = append(out, b.String())
	}
	// The largest Lyapunov exponent: first value with its whole interval above zero.
	for _, r := range rows {
		lo := r.LambdaLo
		if math.IsNaN(lo) {
			lo = r.LambdaMax
		}
		if !math.IsNaN(lo) && lo > 0 {
			out = append(out, fmt.Sprintf("λ1 is first positive (its interval above zero) at %s = %s.", p, fmtParam(r.Value)))
			break
		}
	}
	// Spectral lines: new incommensurate frequencies and the onset of a broadband spectrum.
	prevGen, hadLines, broad := 0, false, false
	for _, r := range rows {
		switch r.LineKind {
		case "periodic", "quasiperiodic":
			g := len(r.Fundamentals)
			// Incommensurate lines are noted where the verdict agrees (or is missing): inside
			// a chaotic band the lines of the band's period may look incommensurate.
			torus := r.Regime == "quasiperiodic" || r.Regime == ""
			if r.LineKind == "quasiperiodic" && torus && g > prevGen && g >= 2 {
				out = append(out, fmt.Sprintf("%d incommensurate frequencies in the spectral lines from %s = %s (quasiperiodic motion, a torus).", g, p, fmtParam(r.Value)))
			}
			prevGen, hadLines, broad = g, true, false
		case "broadband":
			if hadLines && !broad {
				out = append(out, fmt.Sprintf("The spectrum turns broadband at %s = %s.", p, fmtParam(r.Value)))
			}
			broad, prevGen = true, 0
		}
	}
	return out
}
