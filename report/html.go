package report

import (
	"bytes"
	"fmt"
	"html/template"
	"io"
	"strconv"
	"strings"
)

// page is the HTML page: one column, inline CSS, inline SVG, no scripts and no fetched fonts.
// Every text comes through html/template, so names from the input are escaped.
const page = `<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>unfold report: {{.Title}}</title>
<style>
:root { color-scheme: light; }
body { font-family: system-ui, -apple-system, "Segoe UI", "DejaVu Sans", sans-serif; color: #1b1b1b;
  background: #fff; max-width: 46rem; margin: 2rem auto; padding: 0 1.2rem; line-height: 1.45; font-size: 15px; }
h1 { font-size: 1.55rem; margin: 0 0 .2rem; overflow-wrap: anywhere; }
h2 { font-size: 1.2rem; margin: 2.2rem 0 .6rem; padding-bottom: .2rem; border-bottom: 2px solid #1f5fa8; }
.sub { color: #555; margin: 0 0 1rem; }
table { border-collapse: collapse; width: 100%; margin: .4rem 0 .8rem; font-size: .92rem; }
th, td { text-align: left; vertical-align: top; padding: .22rem .5rem; border-bottom: 1px solid #e2e2e2; }
th { width: 34%; font-weight: 600; color: #333; }
td { overflow-wrap: anywhere; }
td.num, th.num { text-align: right; font-variant-numeric: tabular-nums; width: auto; }
table.times th { width: auto; }
code { font-family: ui-monospace, "DejaVu Sans Mono", monospace; font-size: .88em; overflow-wrap: anywhere; }
.cautions { background: #fff6e5; border-left: 4px solid #d96b0b; padding: .4rem .8rem .4rem 1.6rem; margin: .6rem 0; }
.cautions li { margin: .15rem 0; }
.skipped { background: #f2f2f2; border-left: 4px solid #777; padding: .5rem .8rem; margin: .6rem 0; }
.failed { background: #fdecee; border-left: 4px solid #b2182b; padding: .5rem .8rem; margin: .6rem 0; }
figure { margin: .8rem 0 1.2rem; break-inside: avoid; page-break-inside: avoid; }
figure svg { display: block; width: 100%; height: auto; }
figcaption { color: #444; font-size: .88rem; margin-top: .3rem; }
nav ol { columns: 2; font-size: .92rem; padding-left: 1.4rem; }
footer { margin-top: 2.5rem; color: #666; font-size: .8rem; border-top: 1px solid #ddd; padding-top: .5rem; }
@page { size: A4; margin: 14mm 14mm 16mm; }
@media print {
  body { max-width: none; margin: 0; padding: 0; font-size: 10.5pt; }
  h2 { break-after: avoid; page-break-after: avoid; }
  nav, footer { display: none; } /* the provenance table holds the version */
  a { color: inherit; text-decoration: none; }
}
</style>
</head>
<body>
<header>
<h1>{{.Title}}</h1>
<p class="sub">unfold report · {{.Status}} · {{.Samples}} samples, Δt = {{.Dt}} · {{.Wall}} s</p>
</header>
<nav><ol>{{range .Sections}}<li><a href="#{{.Key}}">{{.Title}}</a>{{if .Error}} (no answer){{end}}</li>{{end}}</ol></nav>
{{range .Sections}}
<section id="{{.Key}}">
<h2>{{.Title}}</h2>
{{if .Error}}<p class="failed">No answer from this stage: {{.Error}}</p>{{end}}{{if .Skipped}}<p class="skipped">skipped: {{.Skipped}}</p>{{end}}
{{if .Rows}}<table>{{range .Rows}}<tr><th>{{index . 0}}</th><td>{{index . 1}}</td></tr>{{end}}</table>{{end}}
{{if .Cautions}}<ul class="cautions">{{range .Cautions}}<li>{{.}}</li>{{end}}</ul>{{end}}
{{range .Figures}}<figure id="fig-{{.Name}}">{{.SVG}}<figcaption>{{.Caption}} <code>figures/{{.Name}}.svg</code></figcaption></figure>
{{end}}
</section>
{{end}}
<section id="provenance">
<h2>Provenance</h2>
<table>
<tr><th>input</th><td><code>{{.Input.Path}}</code></td></tr>
<tr><th>input SHA-256</th><td><code>{{.Input.SHA256}}</code></td></tr>
<tr><th>version</th><td>{{.Version}}</td></tr>
<tr><th>commit</th><td><code>{{.Commit}}</code></td></tr>
<tr><th>command line</th><td><code>{{.CommandLine}}</code></td></tr>
<tr><th>seeds</th><td>{{.Seeds}}</td></tr>
<tr><th>started (UTC)</th><td>{{.Started}}</td></tr>
</table>
<table class="times"><tr><th>stage</th><th class="num">wall time (s)</th><th class="num">share</th><th>status</th></tr>
{{range .Times}}<tr><td>{{.Key}}</td><td class="num">{{.Seconds}}</td><td class="num">{{.Share}}</td><td>{{.Status}}</td></tr>
{{end}}</table>
<p>Every stage's numbers, curves and parameters are in <code>result.json</code>, under the stage's key.</p>
</section>
<footer>Written by unfold {{.Version}}. The page is self-contained: it fetches nothing.</footer>
</body>
</html>
`

type pageSection struct {
	Key, Title, Error string
	Skipped           string
	Rows              [][2]string
	Cautions          []string
	Figures           []pageFigure
}

type pageFigure struct {
	Name, Caption string
	SVG           template.HTML
}

type pageTime struct{ Key, Seconds, Share, Status string }

type pageData struct {
	Title, Status, Dt, Wall, Version, Commit, CommandLine, Seeds, Started string
	Samples                                                               int
	Input                                                                 Input
	Sections                                                              []pageSection
	Times                                                                 []pageTime
}

// inlineSVG strips the XML prolog of an SVG document so that it can stand inside HTML. The
// SVG comes from gonum/plot, which escapes every text it draws.
func inlineSVG(b []byte) template.HTML {
	if i := bytes.Index(b, []byte("<svg")); i >= 0 {
		b = b[i:]
	}
	return template.HTML(b) // #nosec: generated by vgsvg, texts escaped there
}

func (r *Result) writeHTML(w io.Writer, svgs map[string][]byte) error {
	t, err := template.New("page").Parse(page)
	if err != nil {
		return fmt.Errorf("report: page template: %w", err)
	}
	g := func(v float64) string { return strconv.FormatFloat(v, 'g', 6, 64) }
	cl := ""
	for i, a := range r.Provenance.CommandLine {
		if i > 0 {
			cl += " "
		}
		if a == "" || strings.ContainsAny(a, " \t\n\"'\\$`*?[]<>|;&()#~") {
			a = strconv.Quote(a)
		}
		cl += a
	}
	seeds := ""
	for k, v := range r.Provenance.Seeds {
		if seeds != "" {
			seeds += ", "
		}
		seeds += k + " = " + strconv.FormatUint(v, 10)
	}
	d := pageData{Title: r.Header.Title, Status: r.Status(), Dt: g(r.Header.Input.Dt), Wall: fmt.Sprintf("%.2f", r.Provenance.WallSeconds),
		Version: r.Provenance.Version, Commit: r.Provenance.Commit, CommandLine: cl, Seeds: seeds, Started: r.Provenance.Started,
		Samples: r.Header.Input.Samples, Input: r.Header.Input}
	if d.Title == "" {
		d.Title = r.Header.Input.Path
	}
	for _, k := range r.Keys {
		ps := pageSection{Key: k, Title: r.Titles[k], Error: r.Errors[k], Skipped: r.Skipped[k]}
		if s, ok := r.Sections[k]; ok {
			ps.Rows, ps.Cautions = s.Summary, s.Cautions
			for _, f := range s.Figures {
				if f.svg == nil {
					continue
				}
				ps.Figures = append(ps.Figures, pageFigure{Name: f.Name, Caption: f.Caption, SVG: inlineSVG(svgs[f.Name])})
			}
		}
		d.Sections = append(d.Sections, ps)
	}
	total := 0.0
	for _, s := range r.Provenance.Stages {
		total += s.Seconds
	}
	for _, s := range r.Provenance.Stages {
		share := "–"
		if total > 0 {
			share = fmt.Sprintf("%.0f %%", 100*s.Seconds/total)
		}
		d.Times = append(d.Times, pageTime{Key: s.Key, Seconds: fmt.Sprintf("%.2f", s.Seconds), Share: share, Status: s.Status})
	}
	if err := t.Execute(w, d); err != nil {
		return fmt.Errorf("report: page: %w", err)
	}
	return nil
}
