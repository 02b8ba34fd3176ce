package figure

import (
	"bytes"
	"encoding/xml"
	"fmt"
	"image/color"
	"image/png"
	"io"
	"math"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgimg"
)

func hex(c color.Color) string {
	r, g, b, _ := c.RGBA()
	return fmt.Sprintf("#%02x%02x%02x", r>>8, g>>8, b>>8)
}

func parseHex(s string) [3]float64 {
	v, _ := strconv.ParseUint(s[1:], 16, 32)
	return [3]float64{float64(v >> 16 & 0xff), float64(v >> 8 & 0xff), float64(v & 0xff)}
}

// TestPaletteOkabeIto checks the palette: exactly the eight colours of Okabe & Ito (2008,
// "Color Universal Design", the CUD set: black E69F00 56B4E9 009E73 F0E442 0072B2 D55E00
// CC79A7), in the project's own order (blue, vermillion, bluish green, reddish purple, sky
// blue, orange, black, yellow: style.go), and role colours that are palette colours or neutral
// greys.
func TestPaletteOkabeIto(t *testing.T) {
	order := []string{"#0072b2", "#d55e00", "#009e73", "#cc79a7", "#56b4e9", "#e69f00", "#000000", "#f0e442"}
	cud := map[string]bool{}
	for _, h := range order {
		cud[h] = true
	}
	cs := Colors()
	if len(cs) != len(order) {
		t.Fatalf("%d colours, want the 8 of the CUD set", len(cs))
	}
	for i, c := range cs {
		if h := hex(c); h != order[i] {
			t.Errorf("colour %d is %s, want %s (the project's order of the CUD set)", i, h, order[i])
		}
	}
	for _, c := range []color.Color{Main(), Second(), Mark()} {
		if !cud[hex(c)] {
			t.Errorf("role colour %s is not an Okabe–Ito colour", hex(c))
		}
	}
	for _, c := range []color.Color{Guide(), GridColor()} {
		if p := parseHex(hex(c)); p[0] != p[1] || p[1] != p[2] {
			t.Errorf("reference colour %s is not a neutral grey", hex(c))
		}
	}
	if f := hex(Faint(Main(), 0)); f != "#ffffff" {
		t.Errorf("Faint(c, 0) = %s, want white", f)
	}
}

// TestTicksLinear checks the linear marker: no trailing zeros, at most MaxLabels labels, nice
// steps (1, 2, 5 × 10^k: common practice).
func TestTicksLinear(t *testing.T) {
	cases := []struct {
		lo, hi float64
		want   []string // the labels, when given
	}{
		{0, 1000, []string{"0", "200", "400", "600", "800", "1000"}},
		{0, 250, []string{"0", "50", "100", "150", "200", "250"}},
		{-1, 1, []string{"-1", "-0.5", "0", "0.5", "1"}},
		{0.001, 0.0042, nil},
		{-3.7e7, 4.1e7, nil},
		{2e-5, 9e-5, nil},
		{0.3, 0.3000001, nil},
		{12, 12, nil},
		{-1e-300, 1e-300, nil},
	}
	trailing := regexp.MustCompile(`\.\d*0$|\.0+e|\.$`)
	for _, c := range cases {
		ticks := Ticks{}.Ticks(c.lo, c.hi)
		labels := labelsOf(ticks)
		if len(labels) == 0 || len(labels) > MaxLabels {
			t.Errorf("[%g, %g]: %d labels %q, want 1…%d", c.lo, c.hi, len(labels), labels, MaxLabels)
		}
		for _, l := range labels {
			if trailing.MatchString(l) {
				t.Errorf("[%g, %g]: label %q has a spurious decimal", c.lo, c.hi, l)
			}
		}
		seen := map[string]bool{}
		for _, l := range labels {
			if seen[l] {
				t.Errorf("[%g, %g]: label %q twice in %q", c.lo, c.hi, l, labels)
			}
			seen[l] = true
		}
		if c.want != nil && strings.Join(labels, " ") != strings.Join(c.want, " ") {
			t.Errorf("[%g, %g]: labels %q, want %q", c.lo, c.hi, labels, c.want)
		}
	}
	for _, r := range [][2]float64{{math.NaN(), 1}, {0, math.Inf(1)}} {
		_ = Ticks{}.Ticks(r[0], r[1]) // must not panic
	}
}

func labelsOf(ticks []plot.Tick) []string {
	var l []string
	for _, t := range ticks {
		if t.Label != "" {
			l = append(l, t.Label)
		}
	}
	return l
}

// TestLogTicks checks the log marker: at most MaxLabels labels over every range from 1e-6 to
// 1e15 (the spectrum axis of issue 15 had 21), decade labels only when the range spans
// decades, and two or more labels on a range inside one decade.
func TestLogTicks(t *testing.T) {
	for a := -6; a <= 15; a++ {
		for b := a; b <= 15; b++ {
			lo, hi := math.Pow(10, float64(a))*0.7, math.Pow(10, float64(b))*3
			labels := labelsOf(LogTicks{}.Ticks(lo, hi))
			if len(labels) > MaxLabels || len(labels) < 1 {
				t.Fatalf("[%g, %g]: %d labels %q, want 1…%d", lo, hi, len(labels), labels, MaxLabels)
			}
			if b-a >= 2 && len(labels) < 2 {
				t.Errorf("[%g, %g]: only %q", lo, hi, labels)
			}
		}
	}
	if l := labelsOf(LogTicks{}.Ticks(1e-6, 1e15)); len(l) > MaxLabels || l[0] != "1e-6" {
		t.Errorf("1e-6…1e15: %q", l)
	}
	if l := labelsOf(LogTicks{}.Ticks(0.01, 100)); strings.Join(l, " ") != "0.01 0.1 1 10 100" {
		t.Errorf("0.01…100: %q", l)
	}
	if l := labelsOf(LogTicks{}.Ticks(3, 7)); len(l) < 2 {
		t.Errorf("3…7: %q, want at least two labels", l)
	}
	for _, r := range [][2]float64{{0, 1}, {-1, 10}, {1, math.Inf(1)}, {math.NaN(), 2}} {
		_ = LogTicks{}.Ticks(r[0], r[1]) // must not panic
	}
}

// checkSVG parses an SVG document with encoding/xml and checks the root's viewBox and that
// every font-size is at least MinTextSize; it returns the number of text elements.
func checkSVG(t *testing.T, name string, b []byte) int {
	t.Helper()
	dec := xml.NewDecoder(bytes.NewReader(b))
	var root bool
	texts := 0
	size := regexp.MustCompile(`font-size:([0-9.]+)px`)
	for {
		tok, err := dec.Token()
		if err == io.EOF {
			break
		}
		if err != nil {
			t.Fatalf("%s: SVG does not parse: %v", name, err)
		}
		se, ok := tok.(xml.StartElement)
		if !ok {
			continue
		}
		if !root {
			root = true
			var vb, w, h bool
			for _, a := range se.Attr {
				vb = vb || a.Name.Local == "viewBox"
				w = w || a.Name.Local == "width"
				h = h || a.Name.Local == "height"
			}
			if se.Name.Local != "svg" || !vb || !w || !h {
				t.Errorf("%s: root <%s> lacks viewBox, width or height", name, se.Name.Local)
			}
		}
		if se.Name.Local != "text" {
			continue
		}
		texts++
		for _, a := range se.Attr {
			if a.Name.Local == "font-size" {
				t.Errorf("%s: font-size attribute %q: want it in the style", name, a.Value)
			}
			if a.Name.Local != "style" {
				continue
			}
			m := size.FindStringSubmatch(a.Value)
			if m == nil {
				t.Errorf("%s: text without a font size: %q", name, a.Value)
				continue
			}
			if v, _ := strconv.ParseFloat(m[1], 64); v < MinTextSize.Points()-1e-9 {
				t.Errorf("%s: text at %s pt, want at least %g", name, m[1], MinTextSize.Points())
			}
			if !strings.Contains(a.Value, "sans-serif") {
				t.Errorf("%s: text not in a sans-serif family: %q", name, a.Value)
			}
		}
	}
	return texts
}

// TestWriteStyle draws a plot with a legend and checks the SVG (viewBox, text sizes, sans
// serif), the legend above the data area, the PNG size at PNGDPI, and that the plot is given
// back unchanged.
func TestWriteStyle(t *testing.T) {
	p := New("title", "x [s]", "y [V]")
	if err := AddCurve(p, []float64{0, 1, 2, math.NaN()}, []float64{1, 3, 2, 4}, Main(), "curve", true); err != nil {
		t.Fatal(err)
	}
	HLine(p, 2.5, Guide(), "level")
	var buf bytes.Buffer
	if err := Write(&buf, "svg", Width, Height, [][]*plot.Plot{{p}}); err != nil {
		t.Fatal(err)
	}
	if n := checkSVG(t, "style", buf.Bytes()); n < 6 {
		t.Errorf("%d texts, want title, labels, ticks and legend", n)
	}
	if p.Legend.Rectangle(p.DataCanvas(drawCanvas())).Max.Y == 0 || p.Title.Text != "title" {
		t.Error("Write did not give the legend and title back")
	}
	buf.Reset()
	if err := Write(&buf, "png", Width, Height, [][]*plot.Plot{{p}}); err != nil {
		t.Fatal(err)
	}
	img, err := png.Decode(&buf)
	if err != nil {
		t.Fatal(err)
	}
	if b := img.Bounds(); b.Dx() != int((Width.Points()/72)*PNGDPI+0.5) || b.Dy() != int((Height.Points()/72)*PNGDPI+0.5) {
		t.Errorf("PNG %v, want %g × %g in at %d dpi", b, (Width.Points() / 72), (Height.Points() / 72), PNGDPI)
	}
	if err := Write(io.Discard, "gif", Width, Height, [][]*plot.Plot{{p}}); err == nil {
		t.Error("gif: want an error")
	}
	if err := Write(io.Discard, "svg", Width, Height, nil); err == nil {
		t.Error("no plot: want an error")
	}
	if err := Write(io.Discard, "svg", Width, Height, [][]*plot.Plot{{p, p}, {p}}); err == nil {
		t.Error("ragged rows: want an error")
	}
}

func drawCanvas() draw.Canvas {
	return draw.New(vgimg.New(Width, Height))
}

// TestLegendAboveData checks that Write draws the legend above the data area: every legend
// text sits higher on the page than every tick label (the highest y tick marks the top of the
// data area), and below the title.
func TestLegendAboveData(t *testing.T) {
	p := New("the title", "x", "y")
	if err := AddCurve(p, []float64{0, 1, 2, 3}, []float64{1, 4, 2, 3}, Main(), "first legend entry", true); err != nil {
		t.Fatal(err)
	}
	HLine(p, 2.5, Guide(), "second legend entry")
	var buf bytes.Buffer
	if err := Write(&buf, "svg", Width, Height, [][]*plot.Plot{{p}}); err != nil {
		t.Fatal(err)
	}
	// vgsvg writes <text x=".." y="-Y" transform="scale(1, -1)"> inside a flipped group, so Y
	// is the height above the bottom of the canvas.
	re := regexp.MustCompile(`<text x="[-0-9.e]+" y="(-?[0-9.e+-]+)"[^>]*>([^<]*)</text>`)
	var legend, ticks []float64
	title := math.NaN()
	for _, m := range re.FindAllStringSubmatch(buf.String(), -1) {
		y, err := strconv.ParseFloat(m[1], 64)
		if err != nil {
			t.Fatal(err)
		}
		y = -y
		switch {
		case strings.Contains(m[2], "legend entry"):
			legend = append(legend, y)
		case m[2] == "the title":
			title = y
		default:
			if _, err := strconv.ParseFloat(m[2], 64); err == nil {
				ticks = append(ticks, y)
			}
		}
	}
	if len(legend) != 2 || len(ticks) < 4 || math.IsNaN(title) {
		t.Fatalf("found %d legend texts, %d tick labels, title at %g", len(legend), len(ticks), title)
	}
	top := maxOf(ticks)
	for _, y := range legend {
		if y <= top+MinTextSize.Points()/2 || y >= title {
			t.Errorf("legend text at %.1f pt: want it above the data (highest tick label at %.1f) and below the title (%.1f)", y, top, title)
		}
	}
}

// TestLogAxisLabelLayout checks the layout of a log axis with a long centred label: the data
// area reaches as high as without the label (gonum/plot alone reserved room for the label near
// the top of a log axis), and Write gives the log scale back.
func TestLogAxisLabelLayout(t *testing.T) {
	mk := func(label string) *plot.Plot {
		p := New("", "x", label)
		LogAxis(&p.Y)
		if err := AddCurve(p, []float64{1, 2, 3}, []float64{1e-2, 1, 8e4}, Main(), "", false); err != nil {
			t.Fatal(err)
		}
		return p
	}
	long, none := mk("a long label on the power axis [V² s]"), mk("")
	c := drawCanvas()
	centreLogLabels(long)
	if a, b := long.DataCanvas(c).Max.Y, none.DataCanvas(c).Max.Y; math.Abs(float64(a-b)) > 1 {
		t.Errorf("data area top at %.1f pt with the label, %.1f without", a, b)
	}
	p := mk("a long label on the power axis [V² s]")
	if err := Write(io.Discard, "svg", Width, Height, [][]*plot.Plot{{p}}); err != nil {
		t.Fatal(err)
	}
	if _, ok := p.Y.Scale.(plot.LogScale); !ok {
		t.Errorf("scale %T after Write, want plot.LogScale", p.Y.Scale)
	}
	if v := (layoutLogScale{}).Normalize(1, 100, 10); math.Abs(v-0.5) > 1e-12 {
		t.Errorf("layoutLogScale(1, 100, 10) = %g, want 0.5 (a log scale)", v)
	}
}

// TestOffStyle: the palette, greys and light tints pass; any other colour, written as hex or
// as rgb(), is reported.
func TestOffStyle(t *testing.T) {
	ok := `<path style="stroke:#0072B2;fill:rgb(213,94,0)"/><rect fill="#E2E2E2"/><rect fill="#f1f5f8"/>`
	if off := OffStyle(ok); len(off) != 0 {
		t.Errorf("palette, grey and tint reported: %v", off)
	}
	bad := `<path style="stroke:#123456"/><path style="fill:rgb(10,200,30)"/>`
	if off := OffStyle(bad); len(off) != 2 {
		t.Errorf("OffStyle(%q) = %v, want both colours", bad, off)
	}
}
