package report

import (
	"bytes"
	"context"
	"flag"
	"fmt"
	"image"
	"image/png"
	"math"
	"math/rand/v2"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"slices"
	"strings"
	"testing"
	"time"

	"rampart/cmd/internal/plots"
)

var screenshotOut = flag.String("screenshot", "", "save the browser test's screenshot of the sample report to this PNG `file`")

// chromium returns the path of Debian's chromium. Outside CI a missing
// browser skips the test; in CI (CI=true) it fails it, since .ci/run
// installs the browser.
func chromium(t *testing.T) string {
	t.Helper()
	for _, p := range []string{"/usr/bin/chromium", "chromium"} {
		if path, err := exec.LookPath(p); err == nil {
			return path
		}
	}
	if os.Getenv("CI") == "true" {
		t.Fatal("chromium not found, and CI=true: CI must run the browser test (.ci/run installs Debian's chromium package)")
	}
	t.Skip("chromium not found: the report's browser test is skipped (apt-get install chromium to run it)")
	return ""
}

// runChromium runs headless chromium on the file at page with a fresh
// profile and the given extra flags, and returns its stdout and stderr.
// The flags keep it off the network and write the page's console to stderr.
func runChromium(t *testing.T, bin, page string, extra ...string) (stdout, stderr []byte) {
	t.Helper()
	// A safety net against a hung browser, not a timing requirement.
	ctx, cancel := context.WithTimeout(context.Background(), 60*time.Second)
	defer cancel()
	args := append([]string{
		"--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
		"--disable-background-networking", "--disable-component-update", "--disable-sync",
		"--user-data-dir=" + t.TempDir(),
		"--enable-logging=stderr", "--v=0",
	}, extra...)
	args = append(args, "file://"+page)
	cmd := exec.CommandContext(ctx, bin, args...)
	var out, errOut bytes.Buffer
	cmd.Stdout, cmd.Stderr = &out, &errOut
	if err := cmd.Run(); err != nil {
		t.Fatalf("chromium %s: %v\n%s", strings.Join(extra, " "), err, errOut.Bytes())
	}
	return out.Bytes(), errOut.Bytes()
}

// consoleLine matches chromium's log line for a console message of the page,
// e.g. `[61:61:1201/184559.997352:INFO:CONSOLE:1] "text", source: file:///...`
// (older builds write CONSOLE(1)).
var consoleLine = regexp.MustCompile(`(?m)^\[[^\]]*:CONSOLE[:(][0-9]*\)?\] (.*)$`)

// consoleMessages returns the page's console messages in chromium's stderr.
// The log gives every message the same level, so all of them count: the
// report has no script, so anything in its console comes from the browser
// itself (a blocked load, a policy violation, a parse error).
func consoleMessages(stderr []byte) []string {
	var out []string
	for _, m := range consoleLine.FindAllSubmatch(stderr, -1) {
		out = append(out, string(m[1]))
	}
	return out
}

// loadPage opens the page in chromium and returns its DOM after load and its
// console messages.
func loadPage(t *testing.T, bin, page string) (dom []byte, console []string) {
	t.Helper()
	stdout, stderr := runChromium(t, bin, page, "--dump-dom")
	return stdout, consoleMessages(stderr)
}

// TestConsoleCheck shows that the console check catches what it must: a
// script's console.error, an uncaught exception, and a load that the
// report's Content-Security-Policy blocks; and that a clean page passes.
func TestConsoleCheck(t *testing.T) {
	t.Parallel()
	bin := chromium(t)
	csp := `<meta http-equiv="Content-Security-Policy" content="default-src 'none'; style-src 'unsafe-inline'; img-src data:">`
	for _, tc := range []struct {
		name, head, body string
		want             []string // substrings of the expected messages, in order
	}{
		{"console.error", "", `<p>x</p><script>console.error("deliberate console error")</script>`, []string{"deliberate console error"}},
		{"exception", "", `<script>undefinedFunction()</script>`, []string{"undefinedFunction"}},
		{"blocked load", csp, `<img src="http://127.0.0.1:9/none.png" alt="">`, []string{"Loading the image 'http://127.0.0.1:9/none.png' violates"}},
		{"clean", csp + `<link rel="icon" href="data:,">`, `<p>fine</p>`, nil},
	} {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			page := filepath.Join(t.TempDir(), "fixture.html")
			html := "<!DOCTYPE html><html><head><meta charset=\"utf-8\">" + tc.head + "<title>fixture</title></head><body>" + tc.body + "</body></html>"
			if err := os.WriteFile(page, []byte(html), 0o644); err != nil {
				t.Fatal(err)
			}
			_, got := loadPage(t, bin, page)
			if len(got) != len(tc.want) {
				t.Fatalf("got %d console messages %q, want %d", len(got), got, len(tc.want))
			}
			for i, w := range tc.want {
				if !strings.Contains(got[i], w) {
					t.Errorf("message %d is %q, want one with %q", i, got[i], w)
				}
			}
		})
	}
}

// TestReportInBrowser writes a report with one figure of each kind and
// opens it in headless chromium: it must render with no console message,
// show the title and every figure, each with its SVG, and its screenshot
// must not be blank.
func TestReportInBrowser(t *testing.T) {
	t.Parallel()
	bin := chromium(t)
	r, err := browserSample()
	if err != nil {
		t.Fatal(err)
	}
	path, err := r.Write(t.TempDir())
	if err != nil {
		t.Fatal(err)
	}

	dom, console := loadPage(t, bin, path)
	for _, m := range console {
		t.Errorf("console: %s", m)
	}
	d, err := parseDOM(dom)
	if err != nil {
		t.Fatal(err)
	}
	if d.title != r.Title {
		t.Errorf("rendered title %q, want %q", d.title, r.Title)
	}
	var want []string
	for _, s := range r.Sections {
		for _, f := range s.Figures {
			want = append(want, f.ID)
		}
	}
	if got := d.figureIDs(); !slices.Equal(got, want) {
		t.Errorf("rendered figures %q, want %q", got, want)
	}
	for _, f := range d.figures {
		if f.svgs != 1 || f.captions != 1 {
			t.Errorf("rendered figure %q holds %d <svg> and %d <figcaption>, want 1 of each", f.id, f.svgs, f.captions)
		}
	}
	if !bytes.Contains(dom, []byte("laser safety officer")) {
		t.Error("rendered page lacks the caution line")
	}

	shot := filepath.Join(t.TempDir(), "report.png")
	runChromium(t, bin, path, "--hide-scrollbars", "--window-size=1280,2400", "--screenshot="+shot)
	img := decodePNG(t, shot)
	if b := img.Bounds(); b.Dx() != 1280 || b.Dy() != 2400 {
		t.Errorf("screenshot is %d x %d pixels, want 1280 x 2400", b.Dx(), b.Dy())
	}
	if f := inkFraction(img); f < 0.01 {
		t.Errorf("screenshot is %.4f ink: the page looks blank", f)
	}
	if *screenshotOut != "" {
		data, _ := os.ReadFile(shot)
		if err := os.WriteFile(*screenshotOut, data, 0o644); err != nil {
			t.Error(err)
		}
	}
}

func decodePNG(t *testing.T, path string) image.Image {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatalf("screenshot: %v", err)
	}
	defer f.Close()
	img, err := png.Decode(f)
	if err != nil {
		t.Fatalf("screenshot: %v", err)
	}
	return img
}

// inkFraction returns the fraction of pixels that are not near white.
func inkFraction(img image.Image) float64 {
	b := img.Bounds()
	ink := 0
	for y := b.Min.Y; y < b.Max.Y; y++ {
		for x := b.Min.X; x < b.Max.X; x++ {
			r, g, bl, _ := img.At(x, y).RGBA()
			if r < 0xE000 || g < 0xE000 || bl < 0xE000 {
				ink++
			}
		}
	}
	return float64(ink) / float64(b.Dx()*b.Dy())
}

// browserSample is a report like the ones rampart writes, on invented data
// drawn from a seeded generator: a ranking, an ensemble's histograms, drive
// profiles, a tolerance curve and Sobol' indices.
func browserSample() (*Report, error) {
	rng := rand.New(rand.NewPCG(3, 4))
	contrast, bias := make([]float64, 500), make([]float64, 500)
	for i := range contrast {
		contrast[i] = 1 - 0.02*math.Abs(rng.NormFloat64())
		bias[i] = 4e-7 * rng.NormFloat64()
	}
	var figs []Figure
	add := func(id, caption string, f *plots.Figure, err error) error {
		if err != nil {
			return fmt.Errorf("figure %s: %w", id, err)
		}
		svg, err := f.SVG()
		if err != nil {
			return err
		}
		figs = append(figs, Figure{ID: id, Caption: caption, SVG: svg})
		return nil
	}

	ranking := []plots.Estimate{
		{Name: "inverse", Value: 0.962, Lo: 0.955, Hi: 0.968},
		{Name: "sin2", Value: 0.951, Lo: 0.940, Hi: 0.958},
		{Name: "file:optimised.csv", Value: 0.949, Lo: 0.930, Hi: 0.955},
	}
	f, err := plots.Ranking(ranking, plots.RankingOptions{ValueLabel: "contrast p05", Markers: []plots.Marker{{Label: "spec 0.95", Value: 0.95}}})
	if err := add("ranking", "Contrast p05 of each ramp with its 95 % bootstrap interval; the dashed line is the spec.", f, err); err != nil {
		return nil, err
	}
	f, err = plots.Histogram(contrast, plots.HistogramOptions{XLabel: "contrast", Markers: []plots.Marker{{Label: "spec ≥ 0.95", Value: 0.95}}})
	if err := add("contrast", "Contrast of 500 realisations.", f, err); err != nil {
		return nil, err
	}
	f, err = plots.Histogram(bias, plots.HistogramOptions{XLabel: "bias (rad)"})
	if err := add("bias", "Bias of 500 realisations.", f, err); err != nil {
		return nil, err
	}
	var profiles []plots.Series
	for k, name := range []string{"sin2", "minjerk"} {
		s := plots.Series{Name: name}
		for i := 0; i <= 50; i++ {
			x := float64(i) / 50
			s.X = append(s.X, 2*x)
			s.Y = append(s.Y, 12.6*math.Pow(math.Sin(math.Pi*x/2), float64(2+k)))
		}
		profiles = append(profiles, s)
	}
	f, err = plots.Lines(profiles, plots.LinesOptions{XLabel: "t (ms)", YLabel: "Ω (rad/s)"})
	if err := add("drive", "Drive profiles of the ramp-up.", f, err); err != nil {
		return nil, err
	}
	tol := plots.Series{Name: "contrast p05"}
	band := plots.Band{Name: "95 % interval"}
	for i := 0; i <= 12; i++ {
		a := math.Pow(10, -2+3*float64(i)/12)
		m := 1 / (1 + a*a)
		tol.X, tol.Y = append(tol.X, a), append(tol.Y, m)
		band.X, band.Lo, band.Hi = append(band.X, a), append(band.Lo, m-0.02), append(band.Hi, math.Min(1, m+0.02))
	}
	f, err = plots.Lines([]plots.Series{tol}, plots.LinesOptions{XLabel: "skew σ (ns)", YLabel: "contrast p05", LogX: true,
		Bands: []plots.Band{band}, HLines: []plots.Marker{{Label: "spec", Value: 0.95}}})
	if err := add("tolerance-skew", "Contrast p05 against the skew between the arms' drives.", f, err); err != nil {
		return nil, err
	}
	sources := []string{"depth common", "depth differential", "skew", "temperature"}
	f, err = plots.Bars(sources, []plots.BarSeries{
		{Name: "first order", Values: []float64{0.05, 0.3, 0.5, 0.02}, Lo: []float64{0.01, 0.25, 0.44, 0}, Hi: []float64{0.09, 0.35, 0.56, 0.05}},
		{Name: "total", Values: []float64{0.07, 0.36, 0.6, 0.03}, Lo: []float64{0.03, 0.3, 0.53, 0.01}, Hi: []float64{0.11, 0.42, 0.66, 0.06}},
	}, plots.BarsOptions{ValueLabel: "Sobol' index of contrast", Horizontal: true})
	if err := add("sobol", "Sobol' indices of contrast per noise source with 95 % bootstrap intervals.", f, err); err != nil {
		return nil, err
	}

	return &Report{
		Title:    "rampart rank: demo scenario",
		Subtitle: "3 ramps, 500 realisations each on common random numbers",
		Command:  "rampart rank --scenario demo.toml --ramp inverse=inverse --ramp sin2=sin2 --ramp file=file:optimised.csv --samples 500 --seed 42 --report out",
		Seed:     42,
		Scenario: "[ring]\nsites = 12\nradius_um = 50\n\n[lattice]\ndepth_khz = 40\n",
		Sections: []Section{
			{
				Heading: "Ranking",
				Text:    "Ramps ranked by the 5th-percentile contrast. Every ramp saw the same noise draws.",
				Tables: []Table{{
					Caption: "Ranking, best first; differences are to the best ramp.",
					Header:  []string{"rank", "ramp", "contrast p05", "95 % interval", "difference", "resolved"},
					Rows: [][]string{
						{"1", "inverse", "0.962", "[0.955, 0.968]", "—", "yes"},
						{"2", "sin2", "0.951", "[0.940, 0.958]", "−0.011", "yes"},
						{"3", "file:optimised.csv", "0.949", "[0.930, 0.955]", "−0.013", "no"},
					},
				}},
				Figures: figs[:1],
			},
			{Heading: "Ensemble of the best ramp", Text: "Distributions over the noise realisations.", Figures: figs[1:3]},
			{Heading: "Dynamics", Figures: figs[3:4]},
			{Heading: "Tolerances", Figures: figs[4:5]},
			{Heading: "Sensitivity", Figures: figs[5:6]},
		},
	}, nil
}
