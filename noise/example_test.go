package noise_test

import (
	"fmt"
	"log"
	"math/rand/v2"
	"strings"

	"rampart/noise"
)

func ExamplePhaseFromDBc() {
	fmt.Printf("%.3g rad^2/Hz\n", noise.PhaseFromDBc(-100))
	fmt.Printf("%.1f dBc/Hz\n", noise.DBcFromPhase(2e-13))
	// Output:
	// 2e-10 rad^2/Hz
	// -130.0 dBc/Hz
}

func ExampleSynthesizer() {
	// Drive phase noise with a -100 dBc/Hz white floor on a 1 µs grid of 1000
	// samples: the default band is 1 kHz .. 500 kHz.
	psd := noise.White{Level: noise.PhaseFromDBc(-100)}
	z, err := noise.NewSynthesizer(psd, 1000, 1e-6, noise.Band{})
	if err != nil {
		log.Fatal(err)
	}
	b := z.Band()
	fmt.Printf("band %g .. %g Hz, FFT length %d\n", b.LowHz, b.HighHz, z.FFTLength())
	fmt.Printf("RMS phase %.4f rad\n", noise.RMS(psd, b.LowHz, b.HighHz))

	// One realisation per Monte Carlo shot, into a reused buffer, with the
	// shot's own seeded generator.
	phase := make([]float64, z.Len())
	for shot := range 3 {
		rng := rand.New(rand.NewPCG(2024, uint64(shot)))
		z.Synthesize(phase, rng)
	}
	// Output:
	// band 1000 .. 500000 Hz, FFT length 4000
	// RMS phase 0.0100 rad
}

func ExampleParsePhaseNoise() {
	const csv = `# beat-note measurement
f_hz,l_dbc_hz
10,-90
1000,-130
1e5,-130
`
	tab, err := noise.ParsePhaseNoise(strings.NewReader(csv), "example.csv")
	if err != nil {
		log.Fatal(err)
	}
	fmt.Printf("S_phi(100 Hz) = %.3g rad^2/Hz\n", tab.Density(100))
	fmt.Printf("RMS over 10 Hz .. 100 kHz = %.3g rad\n", noise.RMS(tab, 10, 1e5))

	_, err = noise.ParsePhaseNoise(strings.NewReader("f_hz,l_dbc_hz\n10,-90\n10,-95\n"), "bad.csv")
	fmt.Println(err)
	// Output:
	// S_phi(100 Hz) = 2e-11 rad^2/Hz
	// RMS over 10 Hz .. 100 kHz = 0.000199 rad
	// phase-noise table "bad.csv" line 3: frequency 10 Hz is not above the previous row's (10 Hz, line 2)
}

func ExampleAllanDeviation() {
	// A linear frequency drift of 1e-9 per second: σ_y(τ) = D τ/√2.
	y := make([]float64, 100)
	for i := range y {
		y[i] = 1e-9 * (float64(i) + 0.5)
	}
	m := noise.OctaveFactors(len(y))
	for i, a := range noise.AllanDeviation(y, 1, m) {
		fmt.Printf("tau %2d s: %.3g\n", m[i], a)
	}
	// Output:
	// tau  1 s: 7.07e-10
	// tau  2 s: 1.41e-09
	// tau  4 s: 2.83e-09
	// tau  8 s: 5.66e-09
	// tau 16 s: 1.13e-08
	// tau 32 s: 2.26e-08
}
