package report

import (
	"bytes"
	"fmt"
	"html/template"
	"io"
	"math"
	"path/filepath"
	"strconv"
	"strings"
	"unfold/figure"
	"unfold/series"

	"gonum.org/v1/plot"
)

// sweepPage is the sweep's HTML page: one column, inline CSS and SVG, no scripts, nothing
// fetched. Every text passes through html/template.
const sweepPage = `<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>unfold sweep: {{.Param}}</title>
<style>
:root { color-scheme: light; }
body { font-family: system-ui, -apple-system, "Segoe UI", "DejaVu Sans", sans-serif; color: #222;
  background: #fcfcfa; max-width: 50rem; margin: 2rem auto; padding: 0 1.2rem; line-height: 1.5; font-size: 15px; }
h1 { font-size: 1.5rem; margin: 0 0 .2rem; font-weight: 600; }
h2 { font-size: 1.15rem; margin: 2rem 0 .5rem; font-weight: 600; color: #333; }
.sub { color: #555; margin: 0 0 1rem; }
.route { background: #f1f5f8; border-left: 3px solid #0072b2; padding: .5rem .9rem; margin: .8rem 0; }
.route p { margin: .25rem 0; }
.caution { background: #fbf6ea; border-left: 3px solid #e69f00; padding: .4rem .9rem; margin: .8rem 0; font-size: .92rem; }
.key { font-size: .9rem; color: #333; margin: .3rem 0 .2rem; }
.key span.sw { display: inline-block; width: .8rem; height: .8rem; border-radius: 50%; margin: 0 .3rem 0 .8rem; vertical-align: -.05rem; }
table { border-collapse: collapse; width: 100%; margin: .4rem 0 .8rem; font-size: .86rem; }
th, td { text-align: left; padding: .2rem .4rem; border-bottom: 1px solid #e4e4e4; vertical-align: top; }
th { font-weight: 600; color: #333; }
td.num { text-align: right; font-variant-numeric: tabular-nums; white-space: nowrap; }
td.path { overflow-wrap: anywhere; min-width: 12rem; }
td.path small { color: #666; }
.wide { overflow-x: auto; }
code { font-family: ui-monospace, "DejaVu Sans Mono", monospace; font-size: .86em; }
figure { margin: .8rem 0 1.4rem; break-inside: avoid; page-break-inside: avoid; }
figure svg { display: block; width: 100%; height: auto; }
figcaption { color: #444; font-size: .88rem; margin-top: .3rem; }
dl.units { font-size: .9rem; display: grid; grid-template-columns: max-content 1fr; gap: .1rem 1rem; }
dl.units dt { font-weight: 600; } dl.units dd { margin: 0; }
footer { margin-top: 2.5rem; color: #666; font-size: .8rem; border-top: 1px solid #ddd; padding-top: .5rem; }
@page { size: A4; margin: 14mm; }
@media print { body { max-width: none; margin: 0; background: #fff; font-size: 10pt; } footer { display: none; } }
</style>
</head>
<body>
<header>
<h1>Sweep over {{.Param}}</h1>
<p class="sub">{{.Count}} records, {{.Param}} = {{.From}} … {{.To}} · {{.Counts}}</p>
</header>
<section id="route" class="route">
{{range .Transitions}}<p>{{.}}</p>
{{end}}</section>
<p class="caution">These results support expert judgement; they do not replace it. A transition is located only to within the spacing of the sweep, and each verdict rests on one record: look at the records' own reports (in this folder, one per record) before naming a bifurcation.</p>
<h2>Units</h2>
<dl class="units">{{range .Units}}<dt>{{index . 0}}</dt><dd>{{index . 1}}</dd>{{end}}</dl>
<h2>Figures</h2>
<p class="key">Colours:{{range .Key}}<span class="sw" style="background: {{.Color}}"></span>{{.Name}}{{end}}</p>
{{range .Figures}}<figure id="fig-{{.Name}}">{{.SVG}}<figcaption>{{.Caption}}</figcaption></figure>
{{end}}
<h2>Records</h2>
<div class="wide"><table>
<tr><th>{{.Param}}</th><th>verdict</th><th>conf.</th><th>λ1 [interval]</th><th>D2 [interval]</th><th>hμ</th><th>Cμ</th><th>lines</th><th>Δt</th><th>status</th>{{range .Labels}}<th>{{.}}</th>{{end}}<th>record</th></tr>
{{range .Rows}}<tr><td class="num">{{.Value}}</td><td>{{.Regime}}</td><td class="num">{{.Confidence}}</td><td class="num">{{.Lambda}}</td><td class="num">{{.D2}}</td><td class="num">{{.H}}</td><td class="num">{{.C}}</td><td>{{.Lines}}</td><td class="num">{{.Dt}}</td><td>{{.Status}}</td>{{range .Labels}}<td>{{.}}</td>{{end}}<td class="path"><code>{{.Path}}</code>{{if .Note}}<br><small>{{.Note}}</small>{{end}}</td></tr>
{{end}}</table></div>
<p>Every number is in <code>sweep.csv</code> beside this page, one row per record, sorted by {{.Param}}.</p>
<footer>Written by unfold {{.Version}}. The page is self-contained: it fetches nothing.</footer>
</body>
</html>
`

type sweepKey struct {
	Name  string
	Color template.CSS
}

type sweepPageRow struct {
	Value, Regime, Confidence, Lambda, D2, H, C, Lines, Dt, Status, Path, Note string
	Labels                                                                     []string
}

type sweepPageData struct {
	Param, From, To, Counts, Version string
	Count                            int
	Labels                           []string
	Transitions                      []string
	Units                            [][2]string
	Key                              []sweepKey
	Figures                          []pageFigure
	Rows                             []sweepPageRow
}

// SweepPageOptions say what the page states besides the rows.
type SweepPageOptions struct {
	Version string // the toolkit's version string, written in the footer
}

// common returns the single value shared by every non-empty s of rows, or "" when they differ.
func common(rows []SweepRow, get func(SweepRow) string) (string, bool) {
	v, same := "", true
	for _, r := range rows {
		s := get(r)
		if s == "" {
			continue
		}
		if v != "" && s != v {
			same = false
		}
		if v == "" {
			v = s
		}
	}
	return v, same
}

func fmt3(v float64) string {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return ""
	}
	return strconv.FormatFloat(v, 'g', 4, 64)
}

func withInterval(v, lo, hi float64) string {
	s := fmt3(v)
	if s != "" && !math.IsNaN(lo) && !math.IsNaN(hi) {
		s += " [" + fmt3(lo) + ", " + fmt3(hi) + "]"
	}
	return s
}

// WriteSweepPage writes the sweep page for rows sorted by the parameter (without the
// label columns; WriteSweep shows them).
func WriteSweepPage(w io.Writer, parameter string, rows []SweepRow, opt SweepPageOptions) error {
	return writeSweepPage(w, parameter, nil, rows, opt)
}

func writeSweepPage(w io.Writer, parameter string, labels []string, rows []SweepRow, opt SweepPageOptions) error {
	timeUnit, sameT := common(rows, func(r SweepRow) string { return r.TimeUnit })
	unit, sameU := common(rows, func(r SweepRow) string { return r.Unit })
	perTime := "time unit"
	if timeUnit != "" && sameT {
		perTime = timeUnit
	}
	d := sweepPageData{Param: parameter, Count: len(rows), Version: opt.Version, Labels: labels,
		Transitions: Transitions(parameter, rows)}
	if len(rows) > 0 {
		d.From, d.To = fmtParam(rows[0].Value), fmtParam(rows[len(rows)-1].Value)
	}
	counts := map[string]int{}
	var order []string
	for _, r := range rows {
		if counts[r.Status] == 0 {
			order = append(order, r.Status)
		}
		counts[r.Status]++
	}
	var cs []string
	for _, s := range order {
		cs = append(cs, fmt.Sprintf("%d %s", counts[s], s))
	}
	d.Counts = strings.Join(cs, ", ")

	eachUnit := "in each record's own time unit (the Δt column gives its sampling interval)"
	if !sameT {
		eachUnit = "in each record's own time unit, which differs between records"
	} else if timeUnit != "" {
		eachUnit = "per " + timeUnit
	}
	signal := "signal units"
	if unit != "" && sameU {
		signal = unit
	}
	anyMap := false
	for _, r := range rows {
		anyMap = anyMap || (len(r.Points) > 0 && !r.PointsAreMaxima)
	}
	d.Units = [][2]string{
		{parameter, "as the list's header names it"},
		{"λ1", "nats " + eachUnit + " (per iteration for a map sampled once per step)"},
		{"D2", "dimensionless"},
		{"hμ, Cμ", "bits per symbol and bits, of the record's symbol stream"},
		{"spectral lines", "cycles " + eachUnit},
		{"bifurcation values", signal},
	}
	for _, v := range []string{"periodic", "quasiperiodic", "chaotic", "stochastic", "undetermined"} {
		d.Key = append(d.Key, sweepKey{Name: v, Color: template.CSS(hexColor(verdictColor(v)))})
	}

	bifY := "maxima of the record"
	if anyMap {
		bifY = "values of the record"
	}
	if unit != "" && sameU {
		bifY += " (" + unit + ")"
	}
	figs := []struct {
		name, caption string
		make          func() (*plot.Plot, error)
	}{
		{"bifurcation", "Bifurcation diagram: for each record, its last local maxima (a sampled flow) or its last values (a map), at most 200, against " + parameter + ". One value per column means period one; branches split at period doublings and fill a band in chaos.",
			func() (*plot.Plot, error) { return bifurcationPlot(parameter, bifY, rows) }},
		{"lyapunov", "Largest Lyapunov exponent λ1 with its interval against " + parameter + ", coloured by verdict; the dashed line is zero. λ1 < 0 on a stable periodic orbit, > 0 in chaos, ≈ 0 on a torus.",
			func() (*plot.Plot, error) {
				return estimatePlot("largest Lyapunov exponent", parameter, "λ1 (nats per "+perTime+")", rows,
					func(r SweepRow) (float64, float64, float64) { return r.LambdaMax, r.LambdaLo, r.LambdaHi }, true)
			}},
		{"dimension", "Correlation dimension D2 with its interval against " + parameter + ", coloured by verdict.",
			func() (*plot.Plot, error) {
				return estimatePlot("correlation dimension", parameter, "D2", rows,
					func(r SweepRow) (float64, float64, float64) { return r.D2, r.D2Lo, r.D2Hi }, false)
			}},
		{"lines", "Significant spectral lines of each record against " + parameter + ": dots where the lines are harmonics of one frequency (blue) or combinations of incommensurate frequencies (green), crosses where the spectrum is broadband (vermilion). New incommensurate lines mark a torus; a broadband spectrum marks chaos or noise.",
			func() (*plot.Plot, error) { return linesPlot(parameter, "frequency (cycles per "+perTime+")", rows) }},
		{"plane", "Complexity–entropy plane: statistical complexity Cμ of the causal states against their entropy rate hμ, one point per record, labelled by " + parameter + ". Periodic records lie at hμ = 0; the most structured records lie high in the middle.",
			func() (*plot.Plot, error) { return planePlot(parameter, rows) }},
	}
	for _, f := range figs {
		p, err := f.make()
		if err != nil {
			return fmt.Errorf("sweep: figure %s: %w", f.name, err)
		}
		var b bytes.Buffer
		if err := figure.Write(&b, "svg", figure.Width, figure.Height, [][]*plot.Plot{{p}}); err != nil {
			return fmt.Errorf("sweep: figure %s: %w", f.name, err)
		}
		cap := f.caption
		if f.name == "plane" && !hasPlane(rows) {
			cap += " No record has causal states yet, so the plane is empty."
		}
		d.Figures = append(d.Figures, pageFigure{Name: f.name, Caption: cap, SVG: inlineSVG(b.Bytes())})
	}
	for _, r := range rows {
		pr := sweepPageRow{Value: fmtParam(r.Value), Regime: r.Regime, Confidence: fmt3(r.Confidence),
			Lambda: withInterval(r.LambdaMax, r.LambdaLo, r.LambdaHi), D2: withInterval(r.D2, r.D2Lo, r.D2Hi),
			H: fmt3(r.EntropyRate), C: fmt3(r.Complexity), Status: r.Status, Path: series.CleanText(r.Path), Note: series.CleanText(r.Error)}
		for i := range labels {
			if i < len(r.Labels) {
				pr.Labels = append(pr.Labels, series.CleanText(r.Labels[i]))
			} else {
				pr.Labels = append(pr.Labels, "")
			}
		}
		if len(r.Frequencies) > 0 {
			pr.Lines = fmt.Sprintf("%d (%s)", len(r.Frequencies), r.LineKind)
		} else if r.LineKind != "" {
			pr.Lines = r.LineKind
		}
		if !math.IsNaN(r.Dt) {
			pr.Dt = fmt3(r.Dt)
			if r.TimeUnit != "" {
				pr.Dt += " " + r.TimeUnit
			}
		}
		if r.RecordReadMessage != "" {
			pr.Note = strings.TrimPrefix(pr.Note+"; ", "; ") + "record not read again: " + r.RecordReadMessage
		}
		if rs := []rune(pr.Note); len(rs) > 200 {
			pr.Note = string(rs[:200]) + " … (the whole message is in the record's result.json)"
		}
		d.Rows = append(d.Rows, pr)
	}
	t, err := template.New("sweep").Parse(sweepPage)
	if err != nil {
		return fmt.Errorf("sweep: page template: %w", err)
	}
	return t.Execute(w, d)
}

func hasPlane(rows []SweepRow) bool {
	for _, r := range rows {
		if !math.IsNaN(r.EntropyRate) && !math.IsNaN(r.Complexity) {
			return true
		}
	}
	return false
}

// WriteSweep writes DIR/sweep.csv and DIR/sweep.html for rows (as SweepRows returns them,
// sorted by the parameter), each through a temporary file renamed into place.
func WriteSweep(dir string, list *SweepList, rows []SweepRow, opt SweepPageOptions) error {
	rows = append([]SweepRow(nil), rows...)
	SortSweepRows(rows)
	var c bytes.Buffer
	if err := WriteSweepCSV(&c, list.Parameter, list.Labels, rows); err != nil {
		return fmt.Errorf("sweep: sweep.csv: %w", err)
	}
	if err := writeFileAtomic(filepath.Join(dir, "sweep.csv"), c.Bytes()); err != nil {
		return err
	}
	var h bytes.Buffer
	if err := writeSweepPage(&h, list.Parameter, list.Labels, rows, opt); err != nil {
		return err
	}
	return writeFileAtomic(filepath.Join(dir, "sweep.html"), h.Bytes())
}
