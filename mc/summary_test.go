package mc

import (
	"encoding/json"
	"math"
	"slices"
	"testing"

	"rampart/stats"
)

func TestSummaryQuantileIntervalsAreOrderStatistics(t *testing.T) {
	// n = 100: the two-sided 95 % intervals of p05, p50 and p95 exist (each
	// end at 97.5 % needs 72 realisations, stats.MinSamplesLower(1, 0.05,
	// 0.975) = ceil(ln 0.025 / ln 0.95) = ceil(71.92)); those of p01 and p99 need
	// ceil(ln 0.025 / ln 0.99) = ceil(367.04) = 368 and are absent.
	recs := synthetic(100, 3, func(z1, z2 float64) (float64, float64) { return 0.9 + 0.01*z1, 1e-3 * z2 })
	s := Summarise(recs, 1, 0, 1, 0.95, Spec{})
	c := make([]float64, len(recs))
	for i, r := range recs {
		c[i] = r.Contrast
	}
	slices.Sort(c)
	for _, q := range []struct {
		key string
		p   float64
	}{{"p05", 0.05}, {"p50", 0.5}, {"p95", 0.95}} {
		lo, hi := stats.QuantileInterval(c, q.p, 0.95)
		if got := s.Contrast.CI[q.key]; got != [2]float64{lo.Value, hi.Value} {
			t.Errorf("%s: CI %v, want the order statistics [X(%d), X(%d)] = [%v, %v]", q.key, got, lo.Rank, hi.Rank, lo.Value, hi.Value)
		}
	}
	for _, key := range []string{"p01", "p99"} {
		if _, ok := s.Contrast.CI[key]; ok || s.Contrast.NoBoundBelow[key] != 368 {
			t.Errorf("%s at n = 100: CI %v, no bound below %d; want none, 368", key, s.Contrast.CI[key], s.Contrast.NoBoundBelow[key])
		}
	}
	if lo, hi := s.Contrast.CI["mean"][0], s.Contrast.CI["mean"][1]; !(lo < s.Contrast.Mean && s.Contrast.Mean < hi) {
		t.Errorf("mean %v outside its bootstrap-t interval [%v, %v]", s.Contrast.Mean, lo, hi)
	}
	if _, err := json.Marshal(s); err != nil {
		t.Errorf("summary does not marshal: %v", err)
	}
}

func TestSummaryCircularBias(t *testing.T) {
	// Four shots at +-(pi - 0.1) and sixteen at 0.01 rad, each of contrast
	// 0.5, plus one at bias 0 with contrast 0.05. The linear mean is pulled
	// towards zero by the cancelling +-pi values while the circular
	// resultant is (16 cos 0.01 + 1 - 4 cos 0.1)/21 (by hand): five shots are
	// inverted (four by |bias| > pi/2, one by contrast below 0.1).
	var recs []Record
	add := func(c, b float64) { recs = append(recs, Record{Index: len(recs), Contrast: c, BiasRad: b}) }
	for i := range 4 {
		add(0.5, math.Copysign(math.Pi-0.1, float64(2*(i%2)-1)))
	}
	for range 16 {
		add(0.5, 0.01)
	}
	add(0.05, 0)
	s := Summarise(recs, 1, 0, 1, 0.95, Spec{})
	cb := s.BiasCircular
	c := (16*math.Cos(0.01) + 1 - 4*math.Cos(0.1)) / 21
	sn := 16 * math.Sin(0.01) / 21
	if want := math.Hypot(c, sn); math.Abs(cb.MeanResultantLength-want) > 1e-14 {
		t.Errorf("R %v, want %v (tol 1e-14)", cb.MeanResultantLength, want)
	}
	if want := math.Atan2(sn, c); math.Abs(cb.MeanDirection-want) > 1e-14 {
		t.Errorf("mean direction %v, want %v (tol 1e-14)", cb.MeanDirection, want)
	}
	if cb.Inverted != 5 || cb.ContrastFloor != UsableContrastFloor {
		t.Errorf("inverted %d (floor %v), want 5 (floor %v)", cb.Inverted, cb.ContrastFloor, UsableContrastFloor)
	}
}

// TestStdReplicatesAsBootstrapReplicates: the standard deviation's
// replicates gathered into a scratch column are those of
// stats.BootstrapReplicates on the same draws, bit for bit (the summary's
// outputs, and so the goldens, depend on it).
func TestStdReplicatesAsBootstrapReplicates(t *testing.T) {
	x := make([]float64, 257)
	for i := range x {
		x[i] = benchRecord(i).BiasRad
	}
	got := stdReplicates(x, make([]float64, len(x)), Substream(1, 0, "test"))
	want := stats.BootstrapReplicates(len(x), BootstrapResamples, Substream(1, 0, "test"), func(idx []int) float64 {
		var s, s2 float64
		for _, i := range idx {
			s += x[i]
		}
		mean := s / float64(len(idx))
		for _, i := range idx {
			s2 += (x[i] - mean) * (x[i] - mean)
		}
		return math.Sqrt(s2 / float64(len(idx)-1))
	})
	if !slices.Equal(got, want) {
		t.Errorf("replicates differ from stats.BootstrapReplicates: first %v, want %v", got[:3], want[:3])
	}
}
