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
*, *::before, *::after { box-sizing: border-box; }
body { font-family: system-ui, -apple-system, "Segoe UI", "DejaVu Sans", sans-serif; color: #1b1b1b;
  background: #fff; max-width: 46rem; margin: 1.2rem auto 2rem; padding: 0 1rem; line-height: 1.45; font-size: 15px;
  overflow-wrap: break-word; }
h1 { font-size: 1.45rem; margin: 0 0 .15rem; }
h2 { font-size: 1.2rem; margin: 2.2rem 0 .6rem; padding-bottom: .2rem; border-bottom: 2px solid #1f5fa8; }
.sub { color: #555; margin: 0 0 .6rem; font-size: .9rem; }
a { color: #1f5fa8; }
a.term { color: inherit; text-decoration: underline dotted #1f5fa8; text-underline-offset: 2px; }
table { border-collapse: collapse; width: 100%; margin: .4rem 0 .8rem; font-size: .92rem; }
th, td { text-align: left; vertical-align: top; padding: .22rem .5rem; border-bottom: 1px solid #e2e2e2; }
th { width: 34%; font-weight: 600; color: #333; }
td { overflow-wrap: anywhere; }
td.num, th.num { text-align: right; font-variant-numeric: tabular-nums; width: auto; }
table.times th, table.evidence th { width: auto; }
table.evidence td.used { white-space: nowrap; font-weight: 600; }
table.evidence tr.unused td { color: #555; }
.scroll { overflow-x: auto; max-width: 100%; }
code { font-family: ui-monospace, "DejaVu Sans Mono", monospace; font-size: .88em; overflow-wrap: anywhere; }
#summary { border: 1px solid #b9cde6; border-left: 5px solid #1f5fa8; background: #f3f7fc; padding: .5rem .9rem .3rem; margin: .2rem 0 1rem; }
#summary .verdict { font-size: 1.2rem; margin: .1rem 0 .4rem; }
#summary table { margin: .2rem 0 .4rem; }
#summary th { width: 30%; }
#summary ul { margin: 0; padding-left: 1.1rem; }
#summary .first { font-weight: 600; }
.judgement { font-size: .85rem; color: #444; margin: .3rem 0 .2rem; }
.cautions { background: #fff6e5; border-left: 4px solid #d96b0b; padding: .4rem .8rem .4rem 1.6rem; margin: .6rem 0; }
.cautions li { margin: .15rem 0; }
.skipped { background: #f2f2f2; border-left: 4px solid #777; padding: .5rem .8rem; margin: .6rem 0; }
.failed { background: #fdecee; border-left: 4px solid #b2182b; padding: .5rem .8rem; margin: .6rem 0; }
figure { margin: .8rem 0 1.2rem; break-inside: avoid; page-break-inside: avoid; max-width: 100%; }
figure svg { display: block; width: 100%; max-width: 100%; height: auto; }
figcaption { color: #444; font-size: .88rem; margin-top: .3rem; }
nav#contents ol { columns: 2; font-size: .92rem; padding-left: 1.4rem; margin: .4rem 0; }
dl.glossary dt { font-weight: 600; margin-top: .6rem; }
dl.glossary dd { margin: .1rem 0 0 1rem; }
footer { margin-top: 2.5rem; color: #666; font-size: .8rem; border-top: 1px solid #ddd; padding-top: .5rem; }
@media (max-width: 540px) {
  body { font-size: 14px; padding: 0 .6rem; }
  th { width: 40%; }
  #summary { padding: .4rem .6rem .2rem; }
  #summary th, #summary td { display: block; width: 100%; padding: .1rem .2rem; }
  #summary th { border: 0; padding-top: .35rem; }
  nav#contents ol { columns: 1; }
  table.evidence, table.evidence tbody, table.evidence tr, table.evidence td { display: block; width: 100%; }
  table.evidence tr:first-child { display: none; }
  table.evidence tr { border-bottom: 1px solid #e2e2e2; padding: .2rem 0; }
  table.evidence td { border: 0; padding: .1rem .3rem; }
  table.evidence td:first-child { font-weight: 600; }
}
@page { size: A4; margin: 14mm 14mm 16mm; }
@media print {
  body { max-width: none; margin: 0; padding: 0; font-size: 10.5pt; }
  h2 { break-after: avoid; page-break-after: avoid; }
  nav#contents { display: block; break-after: avoid; }
  footer { display: none; } /* the provenance table holds the version */
  a, a.term { color: inherit; text-decoration: none; }
  th, td { border-bottom: .5pt solid #d0d0d0; }
  #summary { background: none; border-color: #999; break-inside: avoid; }
  .cautions, .failed { background: none; }
}
</style>
</head>
<body>
<header>
<h1>{{.Title}}</h1>
<p class="sub">unfold report · {{.Status}} · {{.Samples}} samples, Δt = {{.Dt}} {{or .Input.Units.Time "time units"}} · analysed in {{.Wall}} s</p>
</header>
{{with .Summary}}<section id="summary" aria-label="Summary">
<p class="verdict"><strong>{{.Regime}}</strong>{{if .Strength}} — {{.Strength}} (confidence {{printf "%.2f" .Confidence}}){{end}}{{if not .Regime}}{{.Verdict}}{{end}}</p>
<table>
<tr><th><a class="term" href="#g-lyapunov">largest Lyapunov exponent</a> λ1</th><td>{{if .Lambda}}{{.Lambda.Text}}{{else}}no estimate{{end}}</td></tr>
<tr><th><a class="term" href="#g-d2">correlation dimension</a> D2</th><td>{{if .D2}}{{.D2.Text}}{{else}}no estimate{{end}}</td></tr>
<tr><th><a class="term" href="#g-embedding">embedding</a></th><td>{{.EmbeddingText}}</td></tr>
{{if .Units.Signal}}<tr><th>signal unit</th><td>{{.Units.Signal}}</td></tr>{{end}}
{{if .Cautions}}<tr><th>cautions</th><td><ul>{{range .Cautions}}<li>{{.}}</li>{{end}}</ul></td></tr>{{end}}
{{if .Figure}}<tr><th>look at this figure first</th><td class="first"><a href="#fig-{{.Figure}}">{{.FigureWhy}}</a></td></tr>{{end}}
</table>
<p class="judgement">These results support expert judgement; they do not replace it, nor local codes, certified methods or licensed practice.</p>
</section>{{end}}
<nav id="contents" aria-label="Contents"><ol>{{range .Sections}}<li><a href="#{{.Key}}">{{.Title}}</a>{{if .Error}} (no answer){{end}}</li>{{end}}<li><a href="#glossary">Glossary</a></li><li><a href="#provenance">Provenance</a></li></ol></nav>
{{range .Sections}}
<section id="{{.Key}}">
<h2>{{.Title}}</h2>
{{if .Error}}<p class="failed">No answer from this stage: {{.Error}}</p>{{end}}{{if .Skipped}}<p class="skipped">skipped: {{.Skipped}}</p>{{end}}
{{if .Rows}}<table>{{range .Rows}}<tr><th>{{if .Term}}<a class="term" href="#g-{{.Term}}">{{.Label}}</a>{{else}}{{.Label}}{{end}}</th><td>{{.Value}}</td></tr>{{end}}</table>{{end}}
{{if .Evidence}}<h3>Evidence</h3>
<table class="evidence"><tr><th>test</th><th>what it found</th><th>role in the verdict</th></tr>
{{range .Evidence}}<tr{{if not .Used}} class="unused"{{end}}><td>{{if .Term}}<a class="term" href="#g-{{.Term}}">{{.Name}}</a>{{else}}{{.Name}}{{end}}</td><td>{{.Sentence}}</td><td>{{.Role}}</td></tr>
{{end}}</table>{{end}}
{{if .Cautions}}<ul class="cautions">{{range .Cautions}}<li>{{.}}</li>{{end}}</ul>{{end}}
{{range .Figures}}<figure id="fig-{{.Name}}">{{.SVG}}<figcaption>{{.Caption}} <code>figures/{{.Name}}.svg</code></figcaption></figure>
{{end}}
</section>
{{end}}
<section id="glossary">
<h2>Glossary</h2>
<dl class="glossary">{{range .Glossary}}<dt id="g-{{.Key}}">{{.Term}}</dt><dd>{{.Text}}</dd>{{end}}</dl>
</section>
<section id="provenance">
<h2>Provenance</h2>
<table>
<tr><th>input</th><td><code>{{.Input.Path}}</code></td></tr>
<tr><th>input SHA-256</th><td><code>{{.Input.SHA256}}</code></td></tr>
<tr><th>units</th><td>time: {{or .Input.Units.Time "not stated"}}; signal: {{or .Input.Units.Signal "not stated"}}</td></tr>
<tr><th>version</th><td>{{.Version}}</td></tr>
<tr><th>commit</th><td><code>{{.Commit}}</code></td></tr>
<tr><th>command line</th><td><code>{{.CommandLine}}</code></td></tr>
<tr><th>seeds</th><td>{{.Seeds}}</td></tr>
<tr><th>started (UTC)</th><td>{{.Started}}</td></tr>
</table>
<div class="scroll"><table class="times"><tr><th>stage</th><th class="num">wall time (s)</th><th class="num">share</th><th>status</th></tr>
{{range .Times}}<tr><td>{{.Key}}</td><td class="num">{{.Seconds}}</td><td class="num">{{.Share}}</td><td>{{.Status}}</td></tr>
{{end}}</table></div>
<p>Every stage's numbers, curves and parameters are in <code>result.json</code>, under the stage's key.</p>
</section>
<footer>Written by unfold {{.Version}}. The page is self-contained: it fetches nothing. These results support expert judgement; they do not replace local codes, certified methods or licensed practice.</footer>
</body>
</html>
`

type pageSection struct {
	Key, Title, Error string
	Skipped           string
	Rows              []pageRow
	Cautions          []string
	Evidence          []EvidenceLine
	Figures           []pageFigure
}

// pageRow is one row of a section's table; Term is the glossary entry its label links to.
type pageRow struct{ Label, Value, Term string }

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
	Summary                                                               *Summary
	Glossary                                                              []GlossaryEntry
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
		Samples: r.Header.Input.Samples, Input: r.Header.Input, Summary: r.Summary, Glossary: Glossary}
	if d.Title == "" {
		d.Title = r.Header.Input.Path
	}
	for _, k := range r.Keys {
		ps := pageSection{Key: k, Title: r.Titles[k], Error: r.Errors[k], Skipped: r.Skipped[k]}
		if s, ok := r.Sections[k]; ok {
			ps.Cautions, ps.Evidence = s.Cautions, s.Evidence
			for _, row := range s.Summary {
				ps.Rows = append(ps.Rows, pageRow{Label: row[0], Value: row[1], Term: glossaryTerm(row[0])})
			}
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
