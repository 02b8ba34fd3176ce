package analysis

import (
	"fmt"
	"math"

	"unfold/series"
)

// ExtremeExponent bounds the magnitudes the chain analyses as they are: a record whose largest
// magnitude lies outside [2^−ExtremeExponent, 2^ExtremeExponent] runs on x·2^−e
// (series.ScaleExponent), so that values near ±1.8e308 do not overflow and denormal values
// are not taken for a constant record; results in signal units are then stated in the input's
// units again (Unscale).
const ExtremeExponent = 60

// scaledForChain returns s scaled by 2^−e when its magnitudes are extreme (see
// ExtremeExponent), with e; otherwise s itself and 0. Multiplying by a power of two is exact.
func scaledForChain(s *series.Series) (*series.Series, int) {
	e := series.ScaleExponent(s.Values)
	if e >= -ExtremeExponent && e <= ExtremeExponent {
		return s, 0
	}
	c := *s
	c.Values = make([]float64, len(s.Values))
	for i, v := range s.Values {
		c.Values[i] = math.Ldexp(v, -e)
	}
	return &c, e
}

// Unscale states the results of a chain run on x·2^−e in the units of x: the quantities in
// signal units (the Kantz radii and the divergence curve's mean log distance of lyapunov, the
// radii and scaling range of fractal, the distances of the space–time separation curve, the
// thresholds of the symbols partition) are multiplied by 2^e (logarithms shifted by e·ln 2).
// Scale-free results (lags, dimensions, exponents, D2, entropies, the verdict) are unchanged;
// inspect ran on the record as given. Each stage touched says so in a caution, since its
// figures are drawn in the scaled units.
func Unscale(res *Result, e int) {
	if e == 0 || res == nil {
		return
	}
	up := func(v float64) float64 { return math.Ldexp(v, e) }
	shift := float64(e) * math.Ln2
	note := fmt.Sprintf("the record's magnitudes are extreme (largest about 2^%d): the analysis ran on the record times 2^%d (exact), and the values in signal units are stated in the input's units; the figures are drawn in the scaled units", e, -e)
	if st := res.Embed; st != nil {
		if c := st.Body.STPCurve; c != nil {
			for i := range c.Curve {
				for j := range c.Curve[i].Quantile {
					c.Curve[i].Quantile[j] = up(c.Curve[i].Quantile[j])
				}
			}
		}
		st.Body.Cautions = append(st.Body.Cautions, note)
	}
	if st := res.Lyapunov; st != nil {
		b := &st.Body
		if b.Eps != nil {
			v := up(*b.Eps)
			b.Eps = &v
		}
		for i := range b.Curves {
			b.Curves[i].Eps = up(b.Curves[i].Eps)
		}
		for i := range b.Divergence {
			b.Divergence[i].MeanLog += shift
		}
		for i := range st.Params.Eps {
			st.Params.Eps[i] = up(st.Params.Eps[i])
		}
		b.Cautions = append(b.Cautions, note)
	}
	if st := res.Fractal; st != nil {
		b := &st.Body
		for i := range b.CorrelationSum {
			b.CorrelationSum[i].R = up(b.CorrelationSum[i].R)
		}
		b.ScalingRange = [2]float64{up(b.ScalingRange[0]), up(b.ScalingRange[1])}
		b.Cautions = append(b.Cautions, note)
	}
	if st := res.Symbols; st != nil {
		t := st.Body.Partition.Thresholds
		scaled := make([]float64, len(t))
		for i, v := range t {
			scaled[i] = up(v)
		}
		st.Body.Partition.Thresholds = scaled
		st.Body.Cautions = append(st.Body.Cautions, note)
	}
}
