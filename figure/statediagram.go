package figure

import (
	"bufio"
	"fmt"
	"html"
	"io"
	"math"

	"unfold/states"
)

// Okabe & Ito (2008), "Color universal design", colours used by the state diagram.
const (
	diagramFill   = "#56B4E9" // sky blue
	diagramStroke = "#0072B2" // blue
	diagramEdge   = "#444444"
	diagramLoop   = "#D55E00" // vermillion, for self-loops
)

// StateDiagram writes the state-transition diagram of a causal-state machine as a standalone
// SVG: states on a circle, each a circle whose area grows with its probability and labelled
// with its number and probability; every transition an arrow labelled "symbol | probability",
// curved so that A→B and B→A lie on opposite sides; self-loops drawn outside the circle.
// alphabet names the symbols (numbers when it is too short).
func StateDiagram(w io.Writer, r *states.Result, alphabet string) error {
	const size, margin = 640.0, 40.0
	n := len(r.States)
	cx, cy := size/2, size/2+margin/2
	ring := size/2 - 170 // room for loops and their labels outside the ring
	switch {
	case n == 1:
		ring = 0
	case n == 2:
		ring = 120
	case n > 8:
		ring = size/2 - 110
	}
	xs, ys, rad := make([]float64, n), make([]float64, n), make([]float64, n)
	for i, s := range r.States {
		a := -math.Pi/2 + 2*math.Pi*float64(i)/float64(max(n, 1))
		if n == 2 {
			a = math.Pi * float64(1-i) // side by side: loops go left and right
		}
		xs[i], ys[i] = cx+ring*math.Cos(a), cy+ring*math.Sin(a)
		rad[i] = 24 + 26*math.Sqrt(max(s.Probability, 0))
		if n > 8 {
			rad[i] = 8 + 16*math.Sqrt(max(s.Probability, 0))
		}
	}
	// centre the nodes vertically (a ring of an odd count is lopsided)
	if n > 1 {
		lo, hi := ys[0], ys[0]
		for _, y := range ys {
			lo, hi = min(lo, y), max(hi, y)
		}
		for i := range ys {
			ys[i] += cy - (lo+hi)/2
		}
	}
	bw := bufio.NewWriter(w)
	fmt.Fprintf(bw, `<?xml version="1.0" encoding="UTF-8"?>
<svg xmlns="http://www.w3.org/2000/svg" width="%g" height="%g" viewBox="0 0 %g %g" font-family="sans-serif" font-size="11pt">
<defs><marker id="arrow" viewBox="0 0 10 10" refX="9" refY="5" markerWidth="7" markerHeight="7" orient="auto-start-reverse"><path d="M0,0 L10,5 L0,10 z" fill="%s"/></marker>
<marker id="arrowloop" viewBox="0 0 10 10" refX="9" refY="5" markerWidth="7" markerHeight="7" orient="auto-start-reverse"><path d="M0,0 L10,5 L0,10 z" fill="%s"/></marker></defs>
<rect width="100%%" height="100%%" fill="white"/>
<text x="%g" y="24" text-anchor="middle" font-size="12pt">causal states: Cμ = %.3f bit, hμ = %.3f bit/symbol, L = %d</text>
`, size, size+margin, size, size+margin, diagramEdge, diagramLoop, size/2, r.StatisticalComplexity, r.EntropyRate, r.HistoryLength)
	// parallel edges (same pair, several symbols) get growing bends
	seen := map[[2]int]int{}
	loops := make([][]string, n) // self-loop labels per state: one loop, labels stacked
	for _, t := range r.Transitions {
		if t.From < 0 || t.From >= n || t.To < 0 || t.To >= n {
			continue
		}
		k := seen[[2]int{t.From, t.To}]
		seen[[2]int{t.From, t.To}] = k + 1
		label := html.EscapeString(states.SymbolName(t.Symbol, alphabet)) + fmt.Sprintf(" | %.3f", t.Probability)
		if t.From == t.To {
			loops[t.From] = append(loops[t.From], label)
			continue
		}
		writeArc(bw, xs[t.From], ys[t.From], rad[t.From], xs[t.To], ys[t.To], rad[t.To], k, label)
	}
	for i, ls := range loops {
		if len(ls) > 0 {
			writeLoop(bw, xs[i], ys[i], rad[i], cx, cy, ls)
		}
	}
	for i, s := range r.States {
		fmt.Fprintf(bw, `<circle cx="%.1f" cy="%.1f" r="%.1f" fill="%s" fill-opacity="0.85" stroke="%s" stroke-width="2"/>
<text x="%.1f" y="%.1f" text-anchor="middle" font-size="11pt"><tspan font-weight="bold">%d</tspan><tspan x="%.1f" dy="1.2em">%.3f</tspan></text>
`, xs[i], ys[i], rad[i], diagramFill, diagramStroke, xs[i], ys[i]-3, s.ID, xs[i], s.Probability)
	}
	fmt.Fprintf(bw, "</svg>\n")
	return bw.Flush()
}

// writeArc draws a quadratic curve from state a to state b bent to the right of the direction
// of travel, so the reverse edge bends the other way.
func writeArc(w io.Writer, ax, ay, ar, bx, by, br float64, k int, label string) {
	dx, dy := bx-ax, by-ay
	d := math.Hypot(dx, dy)
	if d == 0 {
		return
	}
	ux, uy := dx/d, dy/d
	px, py := -uy, ux // right-hand normal in SVG coordinates
	bend := (0.2 + 0.32*float64(k)) * d
	mx, my := (ax+bx)/2+px*bend, (ay+by)/2+py*bend
	// start and end on the circles, aimed at the control point
	sx, sy := toward(ax, ay, mx, my, ar)
	ex, ey := toward(bx, by, mx, my, br+2)
	fmt.Fprintf(w, `<path d="M%.1f,%.1f Q%.1f,%.1f %.1f,%.1f" fill="none" stroke="%s" stroke-width="1.5" marker-end="url(#arrow)"/>
`, sx, sy, mx, my, ex, ey, diagramEdge)
	lx, ly := 0.25*sx+0.5*mx+0.25*ex, 0.25*sy+0.5*my+0.25*ey
	fmt.Fprintf(w, `<text x="%.1f" y="%.1f" text-anchor="middle">%s</text>
`, lx+px*12, ly+py*12+4, label)
}

// writeLoop draws a self-loop on the side of the state away from the diagram's centre, with the
// labels of all the symbols that return to the state stacked beyond it.
func writeLoop(w io.Writer, x, y, r, cx, cy float64, labels []string) {
	ox, oy := x-cx, y-cy
	d := math.Hypot(ox, oy)
	if d == 0 {
		ox, oy, d = 0, -1, 1
	}
	ux, uy := ox/d, oy/d
	px, py := -uy, ux
	reach := r + 50
	spread := 0.6
	cs, sn := math.Cos(spread), math.Sin(spread)
	sx, sy := x+r*(ux*cs-px*sn), y+r*(uy*cs-py*sn)
	ex, ey := x+(r+2)*(ux*cs+px*sn), y+(r+2)*(uy*cs+py*sn)
	c1x, c1y := x+reach*ux-px*reach*0.75, y+reach*uy-py*reach*0.75
	c2x, c2y := x+reach*ux+px*reach*0.75, y+reach*uy+py*reach*0.75
	fmt.Fprintf(w, `<path d="M%.1f,%.1f C%.1f,%.1f %.1f,%.1f %.1f,%.1f" fill="none" stroke="%s" stroke-width="1.5" marker-end="url(#arrowloop)"/>
`, sx, sy, c1x, c1y, c2x, c2y, ex, ey, diagramLoop)
	// the label sits just outside the loop's apex, (2r·cos s + 6·reach)/8 from the centre
	apex := (2*r*cs+6*reach)/8 + 12
	anchor := "middle"
	if ux > 0.5 {
		anchor = "start"
	} else if ux < -0.5 {
		anchor = "end"
	}
	for j, label := range labels {
		d := apex + 18*float64(j)
		dx, dy := ux*d, uy*d
		if anchor != "middle" { // beside the loop, stacked downwards
			dx, dy = ux*(apex-4), 18*(float64(j)-float64(len(labels)-1)/2)
		}
		fmt.Fprintf(w, `<text x="%.1f" y="%.1f" text-anchor="%s" dominant-baseline="middle">%s</text>
`, x+dx, y+dy, anchor, label)
	}
}

// toward returns the point at distance r from (x, y) in the direction of (tx, ty).
func toward(x, y, tx, ty, r float64) (float64, float64) {
	dx, dy := tx-x, ty-y
	d := math.Hypot(dx, dy)
	if d == 0 {
		return x, y
	}
	return x + r*dx/d, y + r*dy/d
}
