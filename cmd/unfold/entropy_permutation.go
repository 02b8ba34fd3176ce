package main

import (
	"fmt"
	"strconv"

	"gonum.org/v1/plot"

	"unfold/figure"
	"unfold/symbolic"
)

// The permutation part of `entropy`: --permutation D on a numeric record (Bandt & Pompe 2002)
// and its complexity–entropy plane (Rosso et al. 2007).

type permutationParams struct {
	Column string `json:"column"`
	Order  int    `json:"order"`
	Delay  int    `json:"delay"`
}

func (a *app) runPermutation(path string, o *entropyOptions) error {
	if o.permutation < 2 || o.permutation > symbolic.MaxOrder {
		return usagef("entropy: --permutation %d: want an order from 2 to %d", o.permutation, symbolic.MaxOrder)
	}
	if o.delay < 1 {
		return usagef("entropy: --lag must be ≥ 1")
	}
	if err := checkFigurePath(o.plot); err != nil {
		return err
	}
	s, in, err := a.loadInput(path, &o.in)
	if err != nil {
		return err
	}
	p, err := symbolic.PermutationEntropy(s.Values, o.permutation, o.delay)
	if err != nil {
		return noAnswer(fmt.Errorf("entropy: %s: %w", path, err))
	}
	var cautions []string
	f := 1
	for i := 2; i <= o.permutation; i++ {
		f *= i
	}
	if p.Patterns < 10*f {
		cautions = append(cautions, fmt.Sprintf("%d patterns for %d possible ones (fewer than 10 per pattern): the entropy is biased low and forbidden patterns may be only unseen", p.Patterns, f))
	}
	if cautions == nil {
		cautions = []string{}
	}
	// the complexity–entropy plane (Rosso et al. 2007) and its bounding curves at this entropy
	pt := p.Complexity()
	cmin, cmax := symbolic.ComplexityBounds(f, pt.Entropy)
	if o.plot != "" {
		p, err := figure.ComplexityPlane(o.permutation, pt, fmt.Sprintf("%s: complexity–entropy plane (order %d, lag %d)", figureName(path), o.permutation, o.delay))
		if err != nil {
			return noAnswer(fmt.Errorf("entropy: %s: %w", path, err))
		}
		if err := writeFigureFile(o.plot, path, [][]*plot.Plot{{p}}); err != nil {
			return err
		}
	}
	if a.global.JSON {
		return a.emitJSON("entropy", in, permutationParams{Column: s.Name, Order: o.permutation, Delay: o.delay},
			struct {
				Permutation *symbolic.Permutation `json:"permutation_entropy"`
				Complexity  float64               `json:"permutation_complexity"`
				MinCurve    float64               `json:"complexity_min"`
				MaxCurve    float64               `json:"complexity_max"`
				Cautions    []string              `json:"cautions"`
			}{p, pt.Complexity, cmin, cmax, cautions})
	}
	g := func(v float64) string { return strconv.FormatFloat(v, 'f', 4, 64) }
	rows := [][]string{
		{"file", path},
		{"order / lag", fmt.Sprintf("%d / %d", p.Order, p.Delay)},
		{"patterns", strconv.Itoa(p.Patterns)},
		{"permutation entropy", g(p.Bits) + " bits (normalised " + g(p.Normalized) + ", " + g(p.PerSymbol) + " bits per step)"},
		{"patterns seen", fmt.Sprintf("%d of %d (%d forbidden or unseen)", p.Observed, f, p.Forbidden)},
		{"complexity", g(pt.Complexity) + " (Jensen–Shannon; " + g(cmin) + " … " + g(cmax) + " possible at this entropy)"},
	}
	if err := a.table(rows); err != nil {
		return err
	}
	for _, c := range cautions {
		fmt.Fprintf(a.stdout, "caution: %s\n", c)
	}
	return nil
}
