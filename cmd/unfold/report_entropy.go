package main

import (
	"encoding/json"
	"fmt"
	"image/color"
	"math"
	"strconv"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"unfold/analysis"
	"unfold/report"
)

// entropyStage renders the chain's "entropy" stage: the block entropies H(L) and the
// entropy-rate estimates h(L) against the word length.
func entropyStage(res *analysis.Result) report.Stage {
	return report.Stage{Key: "entropy", Title: "Entropy of the symbol stream", Run: func() (*report.Section, error) {
		if res.Entropy == nil {
			return nil, stageErr(res, "entropy")
		}
		in, p, b := res.Entropy.Input, res.Entropy.Params, res.Entropy.Body
		js, err := json.Marshal(res.Entropy)
		if err != nil {
			return nil, err
		}
		rows, err := entropyFigure(p, b)
		if err != nil {
			return nil, fmt.Errorf("entropy: figure: %w", err)
		}
		g := func(v float64) string { return strconv.FormatFloat(v, 'f', 4, 64) }
		return &report.Section{JSON: js, Cautions: b.Cautions, Summary: [][2]string{
			{"stream", fmt.Sprintf("%d symbols over %q from the symbols stage (in memory)", in.Samples, p.Alphabet)},
			{"entropy rate", g(b.EntropyRate) + " bits/symbol at L = " + strconv.Itoa(p.RateLength)},
			{"excess entropy", g(b.ExcessEntropy) + " bits"},
			{"LZ76", fmt.Sprintf("%s normalised (%d phrases)", g(b.LZ76), b.LZ76Detail.Phrases)},
			{"estimator", p.Estimator + ", word lengths 1 … " + strconv.Itoa(p.MaxLength)},
			{"estimate", p.Extrapolation},
		}, Figures: []report.Figure{{Name: "entropy",
			Caption: "Block entropy H(L) and entropy-rate estimates h(L) = H(L) − H(L−1) in bits against the word length L; " +
				"hollow points are lengths the data do not support, the entropy rate is read at the marked L*, and the dotted line is log2 K (random symbols).",
			Width: 9 * vg.Inch, Height: 4.5 * vg.Inch, Rows: rows}}}, nil
	}}
}

// entropyFigure draws H(L) and h(L) side by side.
func entropyFigure(p analysis.EntropyParams, res analysis.EntropyResult) ([][]*plot.Plot, error) {
	k := float64(len([]rune(p.Alphabet)))
	blue := color.RGBA{R: 0x1f, G: 0x5f, B: 0xa8, A: 0xff}
	grey := color.RGBA{R: 0x80, G: 0x80, B: 0x80, A: 0xff}
	red := color.RGBA{R: 0xc0, G: 0x20, B: 0x20, A: 0xff}
	panel := func(title, ylabel string, ys []float64, supported []bool, ref func(l float64) float64) (*plot.Plot, error) {
		pl := plot.New()
		pl.Title.Text = title
		pl.X.Label.Text = "word length L (symbols)"
		pl.Y.Label.Text = ylabel
		var all, sup, uns plotter.XYs
		for i, y := range ys {
			pt := plotter.XY{X: float64(i + 1), Y: y}
			all = append(all, pt)
			if supported[i] {
				sup = append(sup, pt)
			} else {
				uns = append(uns, pt)
			}
		}
		line, err := plotter.NewLine(all)
		if err != nil {
			return nil, err
		}
		line.Color = blue
		n := float64(len(ys))
		refLine := plotter.NewFunction(ref)
		refLine.XMin, refLine.XMax = 1, n
		refLine.Color, refLine.Dashes = grey, []vg.Length{vg.Points(1), vg.Points(3)}
		pl.Add(refLine, line)
		if len(sup) > 0 {
			sc, err := plotter.NewScatter(sup)
			if err != nil {
				return nil, err
			}
			sc.GlyphStyle = draw.GlyphStyle{Shape: draw.CircleGlyph{}, Radius: vg.Points(3), Color: blue}
			pl.Add(sc)
		}
		if len(uns) > 0 {
			sc, err := plotter.NewScatter(uns)
			if err != nil {
				return nil, err
			}
			sc.GlyphStyle = draw.GlyphStyle{Shape: draw.RingGlyph{}, Radius: vg.Points(3), Color: blue}
			pl.Add(sc)
		}
		if p.RateLength >= 1 {
			lo, hi := 0.0, 0.0
			for _, y := range ys {
				hi = math.Max(hi, y)
			}
			hi = math.Max(hi, ref(n))
			mark, err := plotter.NewLine(plotter.XYs{{X: float64(p.RateLength), Y: lo}, {X: float64(p.RateLength), Y: hi}})
			if err != nil {
				return nil, err
			}
			mark.Color, mark.Dashes = red, []vg.Length{vg.Points(4), vg.Points(2)}
			pl.Add(mark)
			pl.Legend.Add("L* = "+strconv.Itoa(p.RateLength), mark)
		}
		pl.Y.Min = 0
		pl.Legend.Top, pl.Legend.Left = false, false
		return pl, nil
	}
	n := len(res.BlockEntropies)
	if n == 0 || len(res.EntropyRates) != n {
		return nil, fmt.Errorf("no block entropies to draw")
	}
	hb, hr, sup := make([]float64, n), make([]float64, n), make([]bool, n)
	for i, b := range res.BlockEntropies {
		hb[i], hr[i], sup[i] = b.Bits, res.EntropyRates[i].Bits, b.Supported
	}
	lk := math.Log2(k)
	left, err := panel("Block entropy", "H(L) (bits)", hb, sup, func(l float64) float64 { return l * lk })
	if err != nil {
		return nil, err
	}
	right, err := panel(fmt.Sprintf("Entropy rate (h = %.3f bits/symbol)", res.EntropyRate), "h(L) (bits/symbol)", hr, sup,
		func(float64) float64 { return lk })
	if err != nil {
		return nil, err
	}
	return [][]*plot.Plot{{left, right}}, nil
}
