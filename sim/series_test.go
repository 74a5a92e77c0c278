package sim

import (
	"math/rand/v2"
	"testing"

	"rampart/noise"
)

func TestSeriesStreamedMatchesStored(t *testing.T) {
	// A streamed Series gives exactly what the stored record of the same
	// samples gives, read forward with small steps back (as the split steps
	// do), across window boundaries, past the end, and after a jump back to
	// the start (a rewound stream reproduces its samples).
	z, err := noise.NewStreamSynthesizer(noise.White{Level: 1e-6}, 1e-6, noise.Band{LowHz: 2e3})
	if err != nil {
		t.Fatal(err)
	}
	src := func() *rand.Rand { return rand.New(rand.NewPCG(5, 6)) }
	const n = 3*seriesWindow + 123
	stored := &Series{StepS: 1e-6, Values: make([]float64, n)}
	z.NewStream(src).Read(stored.Values)
	streamed := &Series{StepS: 1e-6, Stream: z.NewStream(src), N: n}
	if streamed.Len() != n {
		t.Fatalf("Len = %d, want %d", streamed.Len(), n)
	}
	var times []float64
	for t0 := -2e-6; t0 < float64(n+5)*1e-6; t0 += 0.37e-6 {
		times = append(times, t0, t0-0.05e-6)
	}
	times = append(times, 0.5e-6, 7000.25e-6, 12e-6, float64(n)*1e-6)
	for _, x := range times {
		if a, b := stored.At(x), streamed.At(x); a != b {
			t.Fatalf("At(%g): stored %v, streamed %v", x, a, b)
		}
	}
	lin0, sq0 := seriesIntegrals(stored, 0, 1e-3)
	lin1, sq1 := seriesIntegrals(streamed, 0, 1e-3)
	if lin0 != lin1 || sq0 != sq1 {
		t.Errorf("integrals: stored %v %v, streamed %v %v", lin0, sq0, lin1, sq1)
	}
}
