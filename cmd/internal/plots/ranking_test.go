package plots

import (
	"math"
	"testing"
)

var ranked = []Estimate{
	{Name: "inverse", Value: 0.962, Lo: 0.955, Hi: 0.968},
	{Name: "minjerk", Value: 0.951, Lo: 0.940, Hi: 0.958},
	{Name: "file:best.csv", Value: 0.949, Lo: 0.930, Hi: 0.955},
}

func TestRankingElements(t *testing.T) {
	f, err := Ranking(ranked, RankingOptions{Title: "Ranking", ValueLabel: "contrast p05", Markers: []Marker{{Label: "spec", Value: 0.95}}})
	if err != nil {
		t.Fatal(err)
	}
	d := render(t, f)
	wantTexts(t, d, "Ranking", "contrast p05", "spec", "inverse", "minjerk", "file:best.csv")
	// A dot (a filled circle) and three whisker strokes per estimate.
	if got := d.count("fill:#4477AA"); got != len(ranked) {
		t.Errorf("got %d dots, want %d", got, len(ranked))
	}
	if got := d.count("stroke:#4477AA"); got != 3*len(ranked) {
		t.Errorf("got %d whisker strokes, want %d", got, 3*len(ranked))
	}
	for i := 1; i < len(ranked); i++ {
		above, _ := d.text(ranked[i-1].Name)
		below, _ := d.text(ranked[i].Name)
		if above.Y >= below.Y {
			t.Errorf("%q at y %v is not above %q at y %v", ranked[i-1].Name, above.Y, ranked[i].Name, below.Y)
		}
	}
}

func TestRankingErrors(t *testing.T) {
	for _, tc := range []struct {
		name  string
		items []Estimate
		want  []string
	}{
		{"empty", nil, []string{"without estimates"}},
		{"NaN", []Estimate{{Name: "a", Value: math.NaN()}}, []string{`estimate 0 ("a")`, "finite"}},
		{"lo above hi", []Estimate{ranked[0], {Name: "b", Value: 1, Lo: 2, Hi: 0}}, []string{`estimate 1 ("b")`, "lo is above hi"}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, err := Ranking(tc.items, RankingOptions{})
			wantError(t, err, tc.want...)
		})
	}
}

// TestRankingOpenEnds: an end that does not exist is drawn without its
// cap, so an estimate open below has two whisker strokes, not three.
func TestRankingOpenEnds(t *testing.T) {
	ranked := []Estimate{{Name: "a", Value: 0.98, Lo: 0.97, Hi: 0.99}, {Name: "b", Value: 0.95, Lo: 0, Hi: 0.96, OpenLo: true}}
	f, err := Ranking(ranked, RankingOptions{Title: "Ranking", ValueLabel: "contrast p05"})
	if err != nil {
		t.Fatal(err)
	}
	if got := render(t, f).count("stroke:#4477AA"); got != 3+2 {
		t.Errorf("got %d whisker strokes, want 5 (3 for the closed interval, 2 for the one open below)", got)
	}
}
