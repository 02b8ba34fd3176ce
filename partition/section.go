// Package partition turns a measured signal into the values a symbol stream is cut from, and
// chooses the cuts.
//
//   - Poincaré sections of flows: crossings of a hyperplane in the delay embedding, located by
//     linear or cubic (four-point Lagrange) interpolation between samples, or the local maxima
//     of the signal, refined by the vertex of the parabola through three samples (the
//     first-return map of maxima, E. N. Lorenz 1963, "Deterministic nonperiodic flow",
//     J. Atmos. Sci. 20, 130); H. Poincaré (1899), Les méthodes nouvelles de la mécanique
//     céleste.
//   - Threshold and quantile partitions into K symbols.
//   - The critical-point partition of a one-dimensional return map: the map is fitted by local
//     quadratic regression (W. S. Cleveland 1979, "Robust locally weighted regression and
//     smoothing scatterplots", JASA 74, 829) and cut at its interior extremum, where a
//     unimodal map has its generating partition (J. Milnor and W. Thurston 1988, "On iterated
//     maps of the interval", LNM 1342).
//   - A generating-like partition search that scores candidates by symbolic false nearest
//     neighbours (M. B. Kennel and M. Buhl 2003, "Estimating good discrete partitions from
//     observed data: symbolic false nearest neighbors", Phys. Rev. Lett. 91, 084102) and by
//     the entropy-rate estimate, which a generating partition maximises (its entropy rate is
//     the Kolmogorov–Sinai entropy).
//   - Whether a record is map-like or flow-like, decided from its lag-1 autocorrelation and
//     its chosen lag.
package partition

import (
	"errors"
	"fmt"
	"math"
)

// Interp is how a crossing is located between samples.
type Interp int

// The interpolation schemes.
const (
	Linear Interp = iota // straight line through the two samples around the crossing
	Cubic                // four-point Lagrange cubic through the samples i−1 … i+2
)

// String returns the scheme's name as the command line spells it.
func (m Interp) String() string {
	if m == Cubic {
		return "cubic"
	}
	return "linear"
}

// ParseInterp returns the scheme named s ("linear" or "cubic").
func ParseInterp(s string) (Interp, error) {
	switch s {
	case "linear", "":
		return Linear, nil
	case "cubic":
		return Cubic, nil
	}
	return 0, fmt.Errorf("unknown interpolation %q (want linear or cubic)", s)
}

// SectionOptions say which section to take. The zero value is not usable: set Lag ≥ 1 and
// Dim ≥ 1 (or use Maxima).
type SectionOptions struct {
	// Lag and Dim are the delay embedding: vector i is (x[i], x[i+Lag], …,
	// x[i+(Dim−1)Lag]). The hyperplane is normal to the first coordinate, so a crossing
	// point has Dim−1 in-plane coordinates (x(t+Lag), …); with Dim = 1 its value is the level.
	Lag, Dim int
	// Level is where the plane cuts the first coordinate; used only when LevelSet, otherwise
	// the mean of the signal.
	Level    float64
	LevelSet bool
	// Direction is +1 for upward crossings (x increasing through the level), −1 for downward
	// and 0 for both.
	Direction int
	// Interp locates the crossings between samples.
	Interp Interp
	// Maxima takes the local maxima of the signal instead of a hyperplane; the value of a
	// crossing is then the height of the maximum (Lag, Dim, Level and Direction are unused).
	Maxima bool
}

// Section is a Poincaré section (or the sequence of maxima) of a sampled flow.
type Section struct {
	// Method is "hyperplane" or "maxima".
	Method string
	// Level, Direction, Lag, Dim and Interp are the options used ("parabola" for maxima).
	Level     float64
	Direction int
	Lag, Dim  int
	Interp    string
	// Times are the crossing times in time units (T0 + fractional sample index · Dt).
	Times []float64
	// Points are the crossing coordinates, row-major, Width per crossing: the in-plane
	// coordinates x(t+Lag) … x(t+(Dim−1)Lag) for a hyperplane (the level when Dim = 1), the
	// height of the maximum for maxima.
	Points []float64
	Width  int
	// Duration is the time spanned by the record.
	Duration float64
	// Rate is the number of crossings per unit time, MeanReturn the mean time between
	// successive crossings (time units).
	Rate, MeanReturn float64
	// Cautions are plain-word warnings (too few crossings).
	Cautions []string
}

// Len returns the number of crossings.
func (s *Section) Len() int { return len(s.Times) }

// Values returns the first coordinate of every crossing: the variable of the return map
// x_{n+1} versus x_n.
func (s *Section) Values() []float64 {
	v := make([]float64, s.Len())
	for i := range v {
		v[i] = s.Points[i*s.Width]
	}
	return v
}

// MinCrossings is the number of crossings below which a section gets a caution: fewer give
// return maps and symbol statistics that cannot be trusted (common practice).
const MinCrossings = 100

// ErrTooFewCrossings is wrapped when a section has fewer than 3 crossings.
var ErrTooFewCrossings = errors.New("too few crossings")

// TakeSection returns the Poincaré section of x, sampled at interval dt from time t0.
func TakeSection(x []float64, dt, t0 float64, opt SectionOptions) (*Section, error) {
	n := len(x)
	if n < 4 {
		return nil, fmt.Errorf("section: %d samples are too few", n)
	}
	if !(dt > 0) {
		dt = 1
	}
	for i, v := range x {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return nil, fmt.Errorf("section: sample %d is %v", i, v)
		}
	}
	s := &Section{Duration: float64(n-1) * dt}
	if opt.Maxima {
		s.Method, s.Interp, s.Width = "maxima", "parabola", 1
		for i := 1; i+1 < n; i++ {
			a, b, c := x[i-1], x[i], x[i+1]
			if !(b > a && b >= c) {
				continue
			}
			den := a - 2*b + c
			off, val := 0.0, b
			if den < 0 {
				off = 0.5 * (a - c) / den
				val = b - 0.25*(a-c)*off
			}
			s.Times = append(s.Times, t0+(float64(i)+off)*dt)
			s.Points = append(s.Points, val)
		}
	} else {
		if opt.Lag < 1 || opt.Dim < 1 {
			return nil, fmt.Errorf("section: lag %d and dimension %d must be at least 1", opt.Lag, opt.Dim)
		}
		if opt.Direction < -1 || opt.Direction > 1 {
			return nil, fmt.Errorf("section: direction %d must be −1, 0 or +1", opt.Direction)
		}
		level := opt.Level
		if !opt.LevelSet {
			level = 0
			for _, v := range x {
				level += v
			}
			level /= float64(n)
		}
		s.Method, s.Level, s.Direction, s.Lag, s.Dim, s.Interp = "hyperplane", level, opt.Direction, opt.Lag, opt.Dim, opt.Interp.String()
		s.Width = max(opt.Dim-1, 1)
		span := (opt.Dim - 1) * opt.Lag
		row := make([]float64, s.Width)
		for i := 0; i+1+span < n; i++ {
			a, b := x[i], x[i+1]
			up := a < level && b >= level
			down := a > level && b <= level
			if !(up && opt.Direction >= 0 || down && opt.Direction <= 0) {
				continue
			}
			f := (level - a) / (b - a)
			if opt.Interp == Cubic && i >= 1 && i+2 < n {
				f = cubicRoot(x[i-1], a, b, x[i+2], level, f)
			}
			if opt.Dim == 1 {
				row[0] = level
			} else {
				ok := true
				for k := 1; k < opt.Dim; k++ {
					j := i + k*opt.Lag
					if opt.Interp == Cubic {
						if j+2 >= n {
							ok = false
							break
						}
						row[k-1] = lagrange4(x[j-1], x[j], x[j+1], x[j+2], f)
					} else {
						row[k-1] = x[j] + f*(x[j+1]-x[j])
					}
				}
				if !ok {
					continue
				}
			}
			s.Times = append(s.Times, t0+(float64(i)+f)*dt)
			s.Points = append(s.Points, row...)
		}
	}
	m := len(s.Times)
	if m < 3 {
		return nil, fmt.Errorf("section: %d crossings in %d samples: %w (choose another level or direction, or a longer record)", m, n, ErrTooFewCrossings)
	}
	s.Rate = float64(m) / s.Duration
	s.MeanReturn = (s.Times[m-1] - s.Times[0]) / float64(m-1)
	if m < MinCrossings {
		s.Cautions = append(s.Cautions, fmt.Sprintf("only %d crossings (fewer than %d): the return map is sparse and symbol statistics from it are unreliable; use a longer record", m, MinCrossings))
	}
	if s.MeanReturn < 4*dt {
		s.Cautions = append(s.Cautions, fmt.Sprintf("crossings come every %.3g samples on average: the record is barely resolved between crossings (is it a map rather than a flow?)", s.MeanReturn/dt))
	}
	return s, nil
}

// lagrange4 evaluates the cubic through (−1, p0), (0, p1), (1, p2), (2, p3) at f.
func lagrange4(p0, p1, p2, p3, f float64) float64 {
	return -f*(f-1)*(f-2)/6*p0 + (f+1)*(f-1)*(f-2)/2*p1 - (f+1)*f*(f-2)/2*p2 + (f+1)*f*(f-1)/6*p3
}

// cubicRoot finds f in [0, 1] where the cubic through the four samples equals level, starting
// from the linear estimate f0 (bisection on the bracket, which the samples guarantee).
func cubicRoot(p0, p1, p2, p3, level, f0 float64) float64 {
	lo, hi := 0.0, 1.0
	glo := p1 - level
	if glo == 0 {
		return 0
	}
	for it := 0; it < 60; it++ {
		mid := 0.5 * (lo + hi)
		g := lagrange4(p0, p1, p2, p3, mid) - level
		if (g < 0) == (glo < 0) {
			lo, glo = mid, g
		} else {
			hi = mid
		}
	}
	f := 0.5 * (lo + hi)
	if math.IsNaN(f) {
		return f0
	}
	return f
}
