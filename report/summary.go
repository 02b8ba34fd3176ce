package report

import (
	"fmt"
	"regexp"
	"slices"
	"strconv"
	"strings"

	"unfold/analysis"
	"unfold/regime"
)

// Estimate is one headline number with its interval and unit.
type Estimate struct {
	Value float64 `json:"value"`
	Lo    float64 `json:"lo"`
	Hi    float64 `json:"hi"`
	Unit  string  `json:"unit"`
	From  string  `json:"from"` // the stage it was read from: "lyapunov" or "fractal"
}

// Text is "3.65 [3.42, 3.87] nats per second".
func (e *Estimate) Text() string {
	g := sig3
	t := fmt.Sprintf("%s [%s, %s]", g(e.Value), g(e.Lo), g(e.Hi))
	if e.Unit != "" {
		t += " " + e.Unit
	}
	return t
}

// Summary is the block at the top of the report and of the terminal output of `report`: the
// verdict in words, the headline numbers from their one estimate each (λ1 from the lyapunov
// stage, D2 from the fractal stage), the embedding, the cautions that matter most and the
// figure to look at first.
type Summary struct {
	// Regime is the verdict ("" when the regime stage gave none); Confidence its confidence
	// in 0..1 and Strength the confidence in words ("strong evidence").
	Regime     string  `json:"regime"`
	Confidence float64 `json:"confidence"`
	Strength   string  `json:"strength"`
	// Verdict is the whole line: "chaotic — strong evidence (confidence 0.93)".
	Verdict string `json:"verdict"`
	// Lambda is λ1 (nil: no estimate), D2 the correlation dimension (nil: none).
	Lambda *Estimate `json:"lambda_max"`
	D2     *Estimate `json:"d2"`
	// Lag is the delay in samples (0: none chosen), LagTime the same in time units; Dim the
	// embedding dimension (0: none).
	Lag     int     `json:"lag"`
	LagTime float64 `json:"lag_time"`
	Dim     int     `json:"dim"`
	// Units are the record's units.
	Units analysis.Units `json:"units"`
	// Cautions are the two or three cautions that matter most (see TopCautions).
	Cautions []string `json:"cautions"`
	// Figure is the name of the figure that best shows the verdict ("embed", "regime", …;
	// "" when none was drawn) and FigureWhy says what to look for in it.
	Figure    string `json:"first_figure"`
	FigureWhy string `json:"first_figure_why"`
}

// PerTime is the unit of a rate per time unit u in nats: "nats per second" for "s", "nats per
// ms" for "ms", "nats per time unit" when u is unknown.
func PerTime(u string) string {
	return "nats per " + timeWord(u)
}

// timeWord is a time unit in words for "per …": "second", "ms", "minute", "hour", "day",
// "year", the unit as given, or "time unit".
func timeWord(u string) string {
	switch u {
	case "", "time units":
		return "time unit"
	case "s":
		return "second"
	case "min":
		return "minute"
	case "h":
		return "hour"
	case "d":
		return "day"
	case "y":
		return "year"
	}
	return u
}

// TimeText is a time with its unit: "0.116 s", or "0.116 time units" when the unit is unknown.
func TimeText(v float64, u string) string {
	if u == "" || u == "time units" {
		if v == 1 {
			return "1 time unit"
		}
		return fmtG4(v) + " time units"
	}
	return fmtG4(v) + " " + u
}

// sig3 writes v with three significant digits, keeping trailing zeros ("2.30"), so that a
// number reads the same wherever the page shows it.
func sig3(v float64) string {
	t := fmt.Sprintf("%#.3g", v)
	if strings.ContainsAny(t, "e") {
		return strconv.FormatFloat(v, 'g', 3, 64)
	}
	return strings.TrimSuffix(t, ".")
}

// plural is word, with an "s" unless n is 1.
func plural(n int, word string) string {
	if n == 1 {
		return word
	}
	return word + "s"
}

func fmtG4(v float64) string { return strconv.FormatFloat(v, 'g', 4, 64) }

// Strength puts a verdict's confidence in words. The bands are the project's own judgement:
// 0.85 and above "strong evidence", 0.65 and above "moderate evidence", else "weak evidence".
func Strength(regimeName string, confidence float64) string {
	switch {
	case regimeName == regime.Undetermined:
		return "no regime could be established"
	case confidence >= 0.85:
		return "strong evidence"
	case confidence >= 0.65:
		return "moderate evidence"
	}
	return "weak evidence"
}

// Summarize computes the summary of res for a record in the units u.
func Summarize(res *analysis.Result, u analysis.Units) *Summary {
	sm := &Summary{Units: u, Cautions: TopCautions(res)}
	if r := res.Regime; r != nil {
		sm.Regime, sm.Confidence = r.Body.Regime, r.Body.Confidence
		sm.Strength = Strength(sm.Regime, sm.Confidence)
		sm.Verdict = fmt.Sprintf("%s — %s (confidence %.2f)", sm.Regime, sm.Strength, sm.Confidence)
	} else {
		sm.Verdict = "no verdict: the regime stage gave no answer"
		if st := res.Stage("regime"); st != nil && st.Error != "" {
			sm.Verdict += " (" + st.Error + ")"
		}
	}
	if l := res.Lyapunov; l != nil && l.Run != nil && l.Run.R != nil && l.Body.LambdaMax != nil {
		r := l.Run.R
		sm.Lambda = &Estimate{Value: r.Lambda, Lo: r.Interval[0], Hi: r.Interval[1], Unit: PerTime(u.Time), From: "lyapunov"}
	}
	if f := res.Fractal; f != nil {
		b := f.Body
		sm.D2 = &Estimate{Value: b.D2, Lo: b.Interval[0], Hi: b.Interval[1], Unit: "(dimensionless)", From: "fractal"}
	}
	if e := res.Embed; e != nil {
		sm.Lag, sm.LagTime, sm.Dim = e.Body.Lag, e.Body.LagTime, e.Body.Dimension
	} else if c := res.Embedding; c != nil {
		sm.Lag, sm.Dim = c.Lag.Value, c.Dim.Value
		if res.Lag != nil {
			sm.LagTime = res.Lag.Body.LagTime
		}
	}
	sm.Figure, sm.FigureWhy = firstFigure(res, sm.Regime)
	return sm
}

// firstFigure picks the figure that best shows the verdict: the state-space picture for a
// deterministic verdict (chaotic, periodic, quasiperiodic), the regime evidence (spectrum and
// surrogate tests) for a stochastic or undetermined one, else the signal itself.
func firstFigure(res *analysis.Result, verdict string) (string, string) {
	switch {
	case (verdict == regime.Chaotic || verdict == regime.Periodic || verdict == regime.Quasiperiodic) && res.Embed != nil:
		what := map[string]string{
			regime.Chaotic:       "a folded, layered cloud that never closes on itself",
			regime.Periodic:      "a closed loop traced again and again",
			regime.Quasiperiodic: "a torus: loops that fill a band without closing",
		}[verdict]
		return "embed", "the state-space picture: look for " + what
	case res.Regime != nil:
		return "regime", "the regime evidence: the spectrum and the data against the surrogates"
	case res.Inspect != nil:
		return "signal", "the signal and its spectrum"
	}
	return "", ""
}

// cautionRank orders cautions by what matters most for reading the verdict: 0 non-stationarity
// or a trend, 1 a record too short, 2 noise-limited estimates, 3 estimates from a sample of the
// record, 4 anything else.
func cautionRank(c string) int {
	l := strings.ToLower(c)
	has := func(words ...string) bool {
		for _, w := range words {
			if strings.Contains(l, w) {
				return true
			}
		}
		return false
	}
	switch {
	case has("stationar", "trend", "drift", "changes with"):
		return 0
	case has("too short", "too few", "longer record"):
		return 1
	case has("noise-limited", "noise floor", "consistent with noise", "noise"):
		return 2
	case has("sampled") || sampleOf.MatchString(l):
		return 3
	}
	return 4
}

// sampleOf finds "the first 10000 of 20000 samples": an estimate from part of the record.
var sampleOf = regexp.MustCompile(`first \d+ of \d+`)

// TopCautions picks the two or three cautions that matter most: those of the stages the
// verdict rests on (inspect, dim, lyapunov, fractal, regime) ranked by cautionRank, then —
// when fewer than two — those of the symbol and entropy stages. Duplicates are dropped.
func TopCautions(res *analysis.Result) []string {
	type cand struct {
		text       string
		tier, rank int
		order      int
	}
	var all []cand
	seen := map[string]bool{}
	add := func(tier int, cs []string) {
		for _, c := range cs {
			if c == "" || seen[c] {
				continue
			}
			seen[c] = true
			all = append(all, cand{text: c, tier: tier, rank: cautionRank(c), order: len(all)})
		}
	}
	if res.Inspect != nil && res.Inspect.Summary != nil {
		add(0, res.Inspect.Summary.Cautions)
	}
	if res.Dim != nil {
		add(0, res.Dim.Body.Cautions)
	}
	if res.Lyapunov != nil {
		add(0, res.Lyapunov.Body.Cautions)
	}
	if res.Fractal != nil {
		add(0, res.Fractal.Body.Cautions)
	}
	if res.Regime != nil {
		add(0, res.Regime.Body.Cautions)
	}
	if res.Symbols != nil {
		add(1, res.Symbols.Body.Cautions)
	}
	if res.Entropy != nil {
		add(1, res.Entropy.Body.Cautions)
	}
	slices.SortStableFunc(all, func(a, b cand) int {
		if a.tier != b.tier {
			return a.tier - b.tier
		}
		if a.rank != b.rank {
			return a.rank - b.rank
		}
		return a.order - b.order
	})
	out := []string{}
	for _, c := range all {
		if len(out) == 3 || (c.tier > 0 && len(out) >= 2) {
			break
		}
		out = append(out, c.text)
	}
	return out
}

// Rows are the summary as (label, value) rows in plain text: the terminal output of `report`.
func (s *Summary) Rows() [][2]string {
	rows := [][2]string{{"verdict", s.Verdict}}
	if s.Lambda != nil {
		rows = append(rows, [2]string{"largest Lyapunov exponent λ1", s.Lambda.Text()})
	} else {
		rows = append(rows, [2]string{"largest Lyapunov exponent λ1", "no estimate"})
	}
	if s.D2 != nil {
		rows = append(rows, [2]string{"correlation dimension D2", s.D2.Text()})
	} else {
		rows = append(rows, [2]string{"correlation dimension D2", "no estimate"})
	}
	rows = append(rows, [2]string{"embedding", s.EmbeddingText()})
	if s.Units.Signal != "" {
		rows = append(rows, [2]string{"signal unit", s.Units.Signal})
	}
	for i, c := range s.Cautions {
		l := ""
		if i == 0 {
			l = "cautions"
		}
		rows = append(rows, [2]string{l, c})
	}
	if s.Figure != "" {
		rows = append(rows, [2]string{"look at this figure first", s.FigureWhy + " (figures/" + s.Figure + ".svg)"})
	}
	return rows
}

// EmbeddingText is "lag 29 samples (0.116 s), dimension 6".
func (s *Summary) EmbeddingText() string {
	lag := "no lag chosen"
	if s.Lag > 0 {
		lag = fmt.Sprintf("lag %d %s (%s)", s.Lag, plural(s.Lag, "sample"), TimeText(s.LagTime, s.Units.Time))
	}
	dim := "no dimension chosen"
	if s.Dim > 0 {
		dim = "dimension " + strconv.Itoa(s.Dim)
	}
	return lag + ", " + dim
}
