package browser

import (
	"context"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"runtime"
	"testing"
	"time"

	"github.com/chromedp/cdproto/cdp"
	"github.com/chromedp/cdproto/emulation"
	"github.com/chromedp/chromedp"
)

// The test runs where deploy/browser/test.sh has installed Chromium and set
// UNFOLD_BROWSER_TEST=1; elsewhere it skips and says so.
//
// The page's layout contract, shared with report/html.go: the summary block is the element
// with id "summary" and the table of contents is the <nav id="contents">.

// chromium finds the browser: $UNFOLD_CHROMIUM, then the Debian package's binaries. It skips
// with the reason where there is none.
func chromium(t *testing.T) string {
	t.Helper()
	if os.Getenv("UNFOLD_BROWSER_TEST") == "" {
		t.Skip("SKIP: report page browser test: runs from bash deploy/browser/test.sh, which installs Debian's chromium and sets UNFOLD_BROWSER_TEST=1 (CI runs it)")
	}
	if p := os.Getenv("UNFOLD_CHROMIUM"); p != "" {
		return p
	}
	for _, name := range []string{"chromium", "chromium-browser", "chrome-headless-shell"} {
		if p, err := exec.LookPath(name); err == nil {
			return p
		}
	}
	t.Fatal("UNFOLD_BROWSER_TEST is set but no Chromium was found (set UNFOLD_CHROMIUM)")
	return ""
}

// demoReport builds unfold and writes the demo report into a temporary folder.
func demoReport(t *testing.T) string {
	t.Helper()
	_, file, _, _ := runtime.Caller(0)
	repo := filepath.Join(filepath.Dir(file), "..", "..")
	dir := t.TempDir()
	bin := filepath.Join(dir, "unfold")
	build := exec.Command("go", "build", "-o", bin, "./cmd/unfold")
	build.Dir = repo
	if out, err := build.CombinedOutput(); err != nil {
		t.Fatalf("go build: %v\n%s", err, out)
	}
	out := filepath.Join(dir, "demo-report")
	rep := exec.Command(bin, "report", "--demo", "--quiet", "-o", out)
	if b, err := rep.CombinedOutput(); err != nil {
		// exit 1 (a stage without an answer) still writes the page
		if ee, ok := err.(*exec.ExitError); !ok || ee.ExitCode() != 1 {
			t.Fatalf("unfold report --demo: %v\n%s", err, b)
		}
	}
	return filepath.Join(out, "report.html")
}

// layout is what the test reads off the rendered page.
type layout struct {
	SummaryTop    float64  `json:"summaryTop"`
	SummaryBottom float64  `json:"summaryBottom"`
	HasSummary    bool     `json:"hasSummary"`
	ScrollWidth   float64  `json:"scrollWidth"`
	ClientWidth   float64  `json:"clientWidth"`
	Wide          []string `json:"wide"`
	TOCShown      bool     `json:"tocShown"`
	HasTOC        bool     `json:"hasTOC"`
}

const measure = `(() => {
  const s = document.getElementById('summary');
  const r = s ? s.getBoundingClientRect() : null;
  const de = document.documentElement;
  const wide = [];
  for (const el of document.body.querySelectorAll('*')) {
    const b = el.getBoundingClientRect();
    if (b.right > de.clientWidth + 1 && wide.length < 5) {
      wide.push(el.tagName.toLowerCase() + (el.id ? '#' + el.id : '') + (el.className && el.className.baseVal === undefined ? '.' + el.className : '') + ' right=' + Math.round(b.right));
    }
  }
  const nav = document.querySelector('nav#contents');
  return {
    hasSummary: !!s, summaryTop: r ? r.top + window.scrollY : -1, summaryBottom: r ? r.bottom + window.scrollY : -1,
    scrollWidth: de.scrollWidth, clientWidth: de.clientWidth, wide: wide,
    hasTOC: !!nav, tocShown: !!nav && getComputedStyle(nav).display !== 'none' && nav.getBoundingClientRect().height > 0,
  };
})()`

// render opens the page at the given viewport (and media) and reads its layout; it saves a
// screenshot beside the test's temporary files for a person to look at.
func render(t *testing.T, exe, url string, width, height int64, media string, shot string) layout {
	t.Helper()
	opts := append(chromedp.DefaultExecAllocatorOptions[:],
		chromedp.ExecPath(exe), chromedp.NoSandbox, chromedp.Headless, chromedp.DisableGPU,
		chromedp.WindowSize(int(width), int(height)))
	actx, cancel := chromedp.NewExecAllocator(context.Background(), opts...)
	defer cancel()
	ctx, cancel2 := chromedp.NewContext(actx)
	defer cancel2()
	ctx, cancel3 := context.WithTimeout(ctx, 90*time.Second)
	defer cancel3()
	setMedia := chromedp.Func(func(ctx context.Context, tg *chromedp.Target) error {
		_, err := cdp.Call(ctx, tg, emulation.SetEmulatedMedia, emulation.SetEmulatedMediaParams{Media: media})
		return err
	})
	err := chromedp.Do(ctx,
		chromedp.EmulateViewport(width, height, chromedp.EmulatePortrait),
		setMedia,
		chromedp.Navigate(url),
		chromedp.WaitReady("body"),
	)
	if err != nil {
		t.Fatalf("chromium at %d px (%s): %v", width, media, err)
	}
	l, err := chromedp.Run(ctx, chromedp.Evaluate[layout](measure))
	if err != nil {
		t.Fatalf("chromium at %d px (%s): reading the layout: %v", width, media, err)
	}
	png, err := chromedp.Run(ctx, chromedp.CaptureScreenshot())
	if err != nil {
		t.Fatalf("chromium at %d px (%s): screenshot: %v", width, media, err)
	}
	if shot != "" {
		_ = os.WriteFile(shot, png, 0o644)
	}
	return l
}

// TestReportPageInBrowser renders the demo report as a newcomer would see it.
func TestReportPageInBrowser(t *testing.T) {
	exe := chromium(t)
	if testing.Short() {
		t.Skip("SKIP: report page browser test: -short")
	}
	html := demoReport(t)
	url := "file://" + html
	shots := os.Getenv("UNFOLD_BROWSER_SHOTS") // a folder to keep the screenshots in
	shot := func(name string) string {
		if shots == "" {
			return ""
		}
		return filepath.Join(shots, name)
	}

	// Desktop: the summary (verdict, headline numbers, what to look at first) is in the first
	// screen without scrolling (the "Done when").
	const h = 800
	d := render(t, exe, url, 1280, h, "screen", shot("report-1280.png"))
	if !d.HasSummary {
		t.Fatal("1280 px: the page has no element with id=summary")
	}
	if d.SummaryTop < 0 || d.SummaryTop > h*0.6 {
		t.Errorf("1280 px: the summary starts at %.0f px, want it in the first screen (top within %d px)", d.SummaryTop, int(h*0.6))
	}
	if d.ScrollWidth > d.ClientWidth+1 {
		t.Errorf("1280 px: the page scrolls sideways (%.0f > %.0f): %v", d.ScrollWidth, d.ClientWidth, d.Wide)
	}

	// Phone width: nothing overflows horizontally, and the summary still starts in the first
	// screen.
	const ph = 850
	p := render(t, exe, url, 400, ph, "screen", shot("report-400.png"))
	if p.ScrollWidth > p.ClientWidth+1 {
		t.Errorf("400 px: the page overflows horizontally (scrollWidth %.0f > %.0f); widest elements: %v", p.ScrollWidth, p.ClientWidth, p.Wide)
	}
	if !p.HasSummary || p.SummaryTop > ph*0.8 {
		t.Errorf("400 px: the summary starts at %.0f px, want it in the first screen (%d px)", p.SummaryTop, ph)
	}

	// Print: the table of contents is kept.
	pr := render(t, exe, url, 794, 1123, "print", "")
	if !pr.HasTOC {
		t.Fatal("print: the page has no <nav id=contents>")
	}
	if !pr.TOCShown {
		t.Error("print: the table of contents is hidden in print")
	}
	if math.IsNaN(pr.SummaryTop) {
		t.Error("print: no layout")
	}
	printsToPDF(t, exe, html)
}

// printsToPDF prints the page as a browser would and checks that a PDF comes out.
func printsToPDF(t *testing.T, exe, html string) {
	opts := append(chromedp.DefaultExecAllocatorOptions[:], chromedp.ExecPath(exe), chromedp.NoSandbox, chromedp.Headless, chromedp.DisableGPU)
	actx, cancel := chromedp.NewExecAllocator(context.Background(), opts...)
	defer cancel()
	ctx, cancel2 := chromedp.NewContext(actx)
	defer cancel2()
	ctx, cancel3 := context.WithTimeout(ctx, 90*time.Second)
	defer cancel3()
	if err := chromedp.Do(ctx, chromedp.Navigate("file://"+html), chromedp.WaitReady("body")); err != nil {
		t.Fatalf("open the page: %v", err)
	}
	pdf, err := chromedp.Run(ctx, chromedp.PrintToPDF(chromedp.PDFPaper(chromedp.PaperA4)))
	if err != nil {
		t.Fatalf("print to PDF: %v", err)
	}
	if len(pdf) < 1000 || string(pdf[:5]) != "%PDF-" {
		t.Fatalf("print to PDF: %d bytes, want a PDF document", len(pdf))
	}
	if dir := os.Getenv("UNFOLD_BROWSER_SHOTS"); dir != "" {
		_ = os.WriteFile(filepath.Join(dir, "report.pdf"), pdf, 0o644)
	}
}
