package plots

import (
	"bytes"
	"image/png"
	"maps"
	"os"
	"path/filepath"
	"slices"
	"testing"
)

// builders make one figure of each kind, afresh on every call.
var builders = map[string]func() (*Figure, error){
	"histogram": func() (*Figure, error) {
		return Histogram([]float64{0.91, 0.95, 0.97, 0.975, 0.98, 0.99}, HistogramOptions{XLabel: "contrast", Markers: []Marker{{Label: "spec", Value: 0.95}}})
	},
	"lines": func() (*Figure, error) {
		return Lines([]Series{ramp("a", 1), ramp("b", 2)}, LinesOptions{XLabel: "t (ms)", YLabel: "Ω (rad/s)"})
	},
	"bars": func() (*Figure, error) {
		return Bars(sources, sobol(), BarsOptions{ValueLabel: "index", Horizontal: true})
	},
	"ranking": func() (*Figure, error) {
		return Ranking(ranked, RankingOptions{ValueLabel: "contrast p05"})
	},
}

// TestDeterministic renders each kind of figure twice from one Figure and
// once from a second Figure built from the same data: all renders must be
// identical bytes, in SVG and in PNG.
func TestDeterministic(t *testing.T) {
	for _, name := range slices.Sorted(maps.Keys(builders)) {
		t.Run(name, func(t *testing.T) {
			f1, err := builders[name]()
			if err != nil {
				t.Fatal(err)
			}
			f2, _ := builders[name]()
			svg := [3][]byte{must(f1.SVG()), must(f1.SVG()), must(f2.SVG())}
			img := [3][]byte{must(f1.PNG(72)), must(f1.PNG(72)), must(f2.PNG(72))}
			for i := 1; i < 3; i++ {
				if !bytes.Equal(svg[0], svg[i]) {
					t.Errorf("SVG render %d differs from the first", i)
				}
				if !bytes.Equal(img[0], img[i]) {
					t.Errorf("PNG render %d differs from the first", i)
				}
			}
		})
	}
}

// TestSVGFonts checks that every text names Liberation Sans with metric-
// compatible fallbacks, so that a browser without Liberation keeps the
// layout.
func TestSVGFonts(t *testing.T) {
	f, _ := builders["lines"]()
	svg := must(f.SVG())
	if bytes.Contains(svg, []byte("font-family:Liberation Sans;")) {
		t.Error("SVG names Liberation Sans without fallbacks")
	}
	texts := bytes.Count(svg, []byte("<text"))
	fallback := bytes.Count(svg, []byte("font-family:'Liberation Sans',Arial,Helvetica,sans-serif;"))
	if texts == 0 || fallback != texts {
		t.Errorf("%d of %d texts have the fallback fonts", fallback, texts)
	}
}

func TestPNGSize(t *testing.T) {
	f, _ := builders["lines"]()
	for _, tc := range []struct{ dpi, w, h int }{
		{100, 640, 380},     // 6.4 in by 3.8 in
		{0, 960, 570},       // FileDPI = 150
		{FileDPI, 960, 570}, // the same
	} {
		img, err := png.Decode(bytes.NewReader(must(f.PNG(tc.dpi))))
		if err != nil {
			t.Fatalf("%d dpi: %v", tc.dpi, err)
		}
		if b := img.Bounds(); b.Dx() != tc.w || b.Dy() != tc.h {
			t.Errorf("%d dpi: got %d x %d pixels, want %d x %d", tc.dpi, b.Dx(), b.Dy(), tc.w, tc.h)
		}
	}
	if _, err := f.PNG(-1); err == nil {
		t.Error("PNG(-1): got no error")
	}
}

func TestWriteFiles(t *testing.T) {
	dir := t.TempDir()
	f, _ := builders["histogram"]()
	base := filepath.Join(dir, "contrast")
	if err := f.WriteFiles(base); err != nil {
		t.Fatal(err)
	}
	for ext, want := range map[string][]byte{".svg": must(f.SVG()), ".png": must(f.PNG(FileDPI))} {
		got, err := os.ReadFile(base + ext)
		if err != nil {
			t.Fatal(err)
		}
		if !bytes.Equal(got, want) {
			t.Errorf("%s: file differs from the render", ext)
		}
	}
	entries, _ := os.ReadDir(dir)
	if len(entries) != 2 {
		t.Errorf("directory holds %d entries, want the 2 files and no temporary ones", len(entries))
	}

	if err := f.WriteFiles(filepath.Join(dir, "missing", "contrast")); err == nil {
		t.Error("writing into a missing directory: got no error")
	}
	if _, err := os.Stat(filepath.Join(dir, "missing")); !os.IsNotExist(err) {
		t.Errorf("a failed write left %v behind", err)
	}
}

func must(b []byte, err error) []byte {
	if err != nil {
		panic(err)
	}
	return b
}
