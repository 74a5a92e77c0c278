package sim

import (
	"encoding/json"
	"math"
	"os"
	"sync"
	"testing"

	"rampart/noise"
)

// maskKernels are the kernels of the inverse-engineered ramp on the
// benchmark ring, half a lap (ExampleSimulator_Kernels), computed once.
var maskKernels = sync.OnceValues(func() (*Kernels, error) {
	s, err := NewSimulator(inverseHalfLap())
	if err != nil {
		return nil, err
	}
	return s.Kernels(0)
})

func inverseHalfLap() Config {
	c := Config{Ring: Ring{Sites: 20, RadiusM: 5e-6, MassKg: Rb87MassU * AtomicMassUnit}, DepthHz: 20e3, RotationRadS: 1e-3}
	up, err := NewShape("inverse", 150e-6, 500, c.TrapRadS())
	if err != nil {
		panic(err)
	}
	if c.Sequence, err = NewSequence(up, 0.5); err != nil {
		panic(err)
	}
	return c
}

// TestAbsBiasP95 checks the folded normal's 95th percentile against
// SciPy's scipy.stats.foldnorm.ppf (testdata/reference/folded_normal.py,
// SciPy 1.10.1), and BiasStdForP95 as its inverse. Tolerance 1e-9
// relative: both are bisections run to the last bit.
func TestAbsBiasP95(t *testing.T) {
	data, err := os.ReadFile("../testdata/reference/folded_normal.json")
	if err != nil {
		t.Fatal(err)
	}
	var ref struct {
		Rows []struct{ Mean, P95 float64 }
	}
	if err := json.Unmarshal(data, &ref); err != nil {
		t.Fatal(err)
	}
	if len(ref.Rows) == 0 {
		t.Fatal("no reference rows")
	}
	const tol = 1e-9
	for _, r := range ref.Rows {
		for _, sigma := range []float64{1, 3e-4} {
			got := AbsBiasP95(sigma, r.Mean*sigma)
			if want := r.P95 * sigma; math.Abs(got-want) > tol*want {
				t.Errorf("AbsBiasP95(%g, %g) = %.12g, want %.12g (tol %g relative)", sigma, r.Mean*sigma, got, want, tol)
			}
			if got := BiasStdForP95(r.P95*sigma, r.Mean*sigma); math.Abs(got-sigma) > tol*sigma {
				t.Errorf("BiasStdForP95(%g, %g) = %.12g, want %g (tol %g relative)", r.P95*sigma, r.Mean*sigma, got, sigma, tol)
			}
		}
	}
	if got := BiasStdForP95(1, 1); got != -1 {
		t.Errorf("BiasStdForP95(1, 1) = %g, want -1 (the mean alone reaches the limit)", got)
	}
}

// TestLogBands checks the octave and decade cuts (exact cases).
func TestLogBands(t *testing.T) {
	for _, tc := range []struct {
		lo, hi, base float64
		want         []noise.Band
	}{
		{3, 2500, 10, []noise.Band{{LowHz: 3, HighHz: 10}, {LowHz: 10, HighHz: 100}, {LowHz: 100, HighHz: 1000}, {LowHz: 1000, HighHz: 2500}}},
		{10, 100, 10, []noise.Band{{LowHz: 10, HighHz: 100}}},
		{3, 16, 2, []noise.Band{{LowHz: 3, HighHz: 4}, {LowHz: 4, HighHz: 8}, {LowHz: 8, HighHz: 16}}},
	} {
		got := LogBands(tc.lo, tc.hi, tc.base)
		if len(got) != len(tc.want) {
			t.Errorf("LogBands(%g, %g, %g) = %v, want %v", tc.lo, tc.hi, tc.base, got, tc.want)
			continue
		}
		for i := range got {
			if math.Abs(got[i].LowHz-tc.want[i].LowHz) > 1e-9*tc.want[i].LowHz || math.Abs(got[i].HighHz-tc.want[i].HighHz) > 1e-9*tc.want[i].HighHz {
				t.Errorf("LogBands(%g, %g, %g)[%d] = %v, want %v (tol 1e-9 relative)", tc.lo, tc.hi, tc.base, i, got[i], tc.want[i])
			}
		}
	}
}

// psdsOf returns the PSDs a load puts on the channels for a process of
// PSD s, through PhaseNoise for the phase load (an independent path from
// Load's weights).
func psdsOf(load Load, rho float64, phase bool, s noise.PSD) map[Channel]noise.PSD {
	if phase {
		return PhaseNoise(s, rho)
	}
	out := map[Channel]noise.PSD{}
	for c := range load {
		out[c] = s
	}
	return out
}

// TestMaskAtLimit is the mask's outside check: at the white mask level,
// the predicted effect plus the rest of the budget meets the binding
// criterion exactly (mean contrast C0 - loss = ContrastMin, or the folded
// normal's p95 of |bias| = the limit) and keeps the other. The rest is
// white intensity noise at -130 dB/Hz on both arms; the nominal bias
// 2e-4 rad. Tolerance 1e-9 relative (rounding of the quotient).
func TestMaskAtLimit(t *testing.T) {
	k, err := maskKernels()
	if err != nil {
		t.Fatal(err)
	}
	band := noise.Band{LowHz: 1 / k.DurationS}
	rest := k.PredictAll(map[Channel]noise.PSD{IntensityCommon: noise.White{Level: noise.IntensityFromRIN(-130)}}, band)
	const bias0 = 2e-4
	for _, crit := range []MaskCriteria{
		{ContrastMin: k.Contrast - 1e-3, AbsBiasP95MaxRad: 1e-3},
		{ContrastMin: k.Contrast - 1e-5, AbsBiasP95MaxRad: 0.05},
		{AbsBiasP95MaxRad: 1e-3},
	} {
		room := crit.Room(k.Contrast, bias0, rest)
		for _, tc := range []struct {
			name  string
			load  Load
			phase bool
		}{
			{"phase rho=0.9", PhaseLoad(0.9), true},
			{"phase rho=0", PhaseLoad(0), true},
			{"intensity_differential", Load{IntensityDifferential: 1}, false},
			{"phase_plus", Load{PhasePlus: 1}, false},
		} {
			rho := 0.0
			if tc.name == "phase rho=0.9" {
				rho = 0.9
			}
			m, err := k.Mask(tc.load, room, band, nil, nil)
			if err != nil {
				t.Fatal(err)
			}
			l := m.White.LevelMax
			if math.IsInf(l, 1) || l <= 0 {
				t.Fatalf("%s %+v: white mask %g (%s), want a finite positive level", tc.name, crit, l, m.White.Binding)
			}
			p := k.PredictAll(psdsOf(tc.load, rho, tc.phase, noise.White{Level: l}), band)
			contrast := k.Contrast - rest.ContrastLoss - p.ContrastLoss
			p95 := AbsBiasP95(math.Hypot(rest.BiasStdRad, p.BiasStdRad), bias0)
			const tol = 1e-9
			switch m.White.Binding {
			case MaskContrast:
				if math.Abs(contrast-crit.ContrastMin) > tol*room.ContrastLoss {
					t.Errorf("%s %+v: mean contrast at the mask %.12g, want %.12g (tol %g of the room)", tc.name, crit, contrast, crit.ContrastMin, tol)
				}
				if crit.AbsBiasP95MaxRad > 0 && p95 > crit.AbsBiasP95MaxRad*(1+tol) {
					t.Errorf("%s %+v: |bias| p95 %g above its limit at the contrast mask", tc.name, crit, p95)
				}
			case MaskBias:
				if math.Abs(p95-crit.AbsBiasP95MaxRad) > tol*crit.AbsBiasP95MaxRad {
					t.Errorf("%s %+v: |bias| p95 at the mask %.12g, want %.12g (tol %g relative)", tc.name, crit, p95, crit.AbsBiasP95MaxRad, tol)
				}
				if crit.ContrastMin > 0 && contrast < crit.ContrastMin-tol*room.ContrastLoss {
					t.Errorf("%s %+v: contrast %g below its limit at the bias mask", tc.name, crit, contrast)
				}
			default:
				t.Errorf("%s %+v: binding %q, want contrast or bias", tc.name, crit, m.White.Binding)
			}
		}
	}
}

// bandPSD is white noise at a level per band, zero outside them.
type bandPSD []MaskLevel

func (p bandPSD) Density(f float64) float64 {
	for _, b := range p {
		if f >= b.Band.LowHz && f < b.Band.HighHz {
			return b.LevelMax
		}
	}
	return 0
}

// TestMaskBandsTogether checks that noise at the band mask levels in every
// band at once keeps both criteria (equal shares, and shares given), that
// a band's level with the whole room is its share's level over the share,
// and that bad shares are refused. Tolerance: the band PSD is integrated
// numerically by Predict (its quarters of the grid interval straddle band
// edges), so 1e-3 of the room.
func TestMaskBandsTogether(t *testing.T) {
	k, err := maskKernels()
	if err != nil {
		t.Fatal(err)
	}
	band := noise.Band{LowHz: 1 / k.DurationS}
	top := k.FrequencyHz[len(k.FrequencyHz)-1]
	bands := LogBands(band.LowHz, top, 10)
	crit := MaskCriteria{ContrastMin: k.Contrast - 1e-3, AbsBiasP95MaxRad: 1e-3}
	room := crit.Room(k.Contrast, 0, Prediction{})
	for _, shares := range [][]float64{nil, {0.2, 0.3, 0.5}} {
		if shares != nil && len(shares) != len(bands) {
			t.Fatalf("%d bands, want %d for the shares row", len(bands), len(shares))
		}
		m, err := k.Mask(PhaseLoad(0.5), room, band, bands, shares)
		if err != nil {
			t.Fatal(err)
		}
		p := k.PredictAll(PhaseNoise(bandPSD(m.Bands), 0.5), band)
		if p.ContrastLoss > room.ContrastLoss*(1+1e-3) {
			t.Errorf("shares %v: loss %g with every band at its mask, room %g (tol 1e-3)", shares, p.ContrastLoss, room.ContrastLoss)
		}
		if v := p.BiasStdRad * p.BiasStdRad; v > room.BiasVarRad2*(1+1e-3) {
			t.Errorf("shares %v: bias variance %g with every band at its mask, room %g (tol 1e-3)", shares, v, room.BiasVarRad2)
		}
		for i, b := range m.Bands {
			whole := k.level(PhaseLoad(0.5), room, b.Band, 1)
			if math.Abs(b.LevelMax/b.Share-whole.LevelMax) > 1e-12*whole.LevelMax {
				t.Errorf("band %d: level %g at share %g, whole room %g (tol 1e-4 relative)", i, b.LevelMax, b.Share, whole.LevelMax)
			}
		}
	}
	for _, bad := range [][]float64{{1}, {0.5, 0.5, 0.5}, {0, 0.5, 0.5}} {
		if _, err := k.Mask(PhaseLoad(0.5), room, band, bands, bad); err == nil {
			t.Errorf("shares %v accepted, want an error", bad)
		}
	}
}

// TestGrowth checks that a table spectrum grown by the factor found meets
// the binding criterion exactly (tolerance 1e-9 of the room), and that a
// rest that already breaks a criterion gives 0.
func TestGrowth(t *testing.T) {
	k, err := maskKernels()
	if err != nil {
		t.Fatal(err)
	}
	band := noise.Band{LowHz: 1 / k.DurationS}
	table, err := noise.NewTable([]float64{10, 100, 1e3, 1e4, 1e5}, []float64{1e-9, 1e-10, 1e-11, 1e-12, 1e-12})
	if err != nil {
		t.Fatal(err)
	}
	crit := MaskCriteria{ContrastMin: k.Contrast - 1e-3, AbsBiasP95MaxRad: 1e-3}
	room := crit.Room(k.Contrast, 0, Prediction{})
	g, bind := k.Growth(PhaseLoad(0.9), table, band, room)
	p := k.PredictAll(PhaseNoise(scaledPSD{table, g}, 0.9), band)
	switch bind {
	case MaskContrast:
		if math.Abs(p.ContrastLoss-room.ContrastLoss) > 1e-9*room.ContrastLoss {
			t.Errorf("loss at growth %g: %g, room %g (tol 1e-9 relative)", g, p.ContrastLoss, room.ContrastLoss)
		}
	case MaskBias:
		if v := p.BiasStdRad * p.BiasStdRad; math.Abs(v-room.BiasVarRad2) > 1e-9*room.BiasVarRad2 {
			t.Errorf("bias variance at growth %g: %g, room %g (tol 1e-9 relative)", g, v, room.BiasVarRad2)
		}
	default:
		t.Errorf("growth %g binding %q, want contrast or bias", g, bind)
	}
	if g, bind := k.Growth(PhaseLoad(0.9), table, band, MaskRoom{ContrastLoss: -1e-3, BiasVarRad2: 1}); g != 0 || bind != MaskRest {
		t.Errorf("growth with a broken rest %g %q, want 0 %q", g, bind, MaskRest)
	}
}

// TestMaskMonteCarlo runs rampart's own Monte Carlo (ensembleStats: noise
// records as mc draws them, 64 realisations with antithetic pairs) with
// independent white drive phase noise on the two arms at the white mask
// level of each criterion alone, and compares the ensemble's mean
// contrast loss and bias std with the room the mask fills. Tolerance: 3
// standard errors plus 10 % (TestResponseMonteCarlo measured the Monte
// Carlo up to 10 % from the prediction where the band's lower edge
// dominates, a property of the synthesiser). Measured: loss 2.09e-3 +-
// 0.29e-3 at the contrast mask (room 2e-3), bias std 2.94e-3 +- 0.26e-3
// rad at the bias mask (5e-3/1.96 = 2.55e-3 rad).
func TestMaskMonteCarlo(t *testing.T) {
	if testing.Short() {
		t.Skip("Monte Carlo ensembles")
	}
	k, err := maskKernels()
	if err != nil {
		t.Fatal(err)
	}
	s, err := NewSimulator(inverseHalfLap())
	if err != nil {
		t.Fatal(err)
	}
	// The band and filter of the records (ensembleStats with no noise
	// returns them without running shots).
	_, _, _, _, rec := ensembleStats(t, s, 0, 0, 0, 2, 1)
	band := rec.band
	for _, crit := range []MaskCriteria{
		{ContrastMin: k.Contrast - 2e-3},
		{AbsBiasP95MaxRad: 5e-3},
	} {
		room := crit.Room(k.Contrast, 0, Prediction{})
		m, err := k.Mask(PhaseLoad(0), room, band, nil, nil)
		if err != nil {
			t.Fatal(err)
		}
		level := m.White.LevelMax
		loss, lossSE, std, stdSE, _ := ensembleStats(t, s, 0, 0, level, 64, 11)
		t.Logf("%+v: mask %.3g rad^2/Hz (%.1f dBc/Hz); Monte Carlo loss %.3g +- %.2g, bias std %.3g +- %.2g rad", crit, level, noise.DBcFromPhase(level), loss, lossSE, std, stdSE)
		if crit.ContrastMin > 0 {
			if d := math.Abs(loss - room.ContrastLoss); d > 3*lossSE+0.1*room.ContrastLoss {
				t.Errorf("contrast mask: Monte Carlo loss %g +- %g, room %g (tol 3 s.e. + 10 %%)", loss, lossSE, room.ContrastLoss)
			}
		} else {
			want := math.Sqrt(room.BiasVarRad2)
			if d := math.Abs(std - want); d > 3*stdSE+0.1*want {
				t.Errorf("bias mask: Monte Carlo bias std %g +- %g, mask's %g (tol 3 s.e. + 10 %%)", std, stdSE, want)
			}
		}
	}
}

// BenchmarkMask times the masks of every channel of the benchmark
// scenario's kernels (one lap): the white level and the decades, from
// kernels computed outside the loop.
func BenchmarkMask(b *testing.B) {
	s, err := NewSimulator(benchConfig(b, 1))
	if err != nil {
		b.Fatal(err)
	}
	k, err := s.Kernels(0)
	if err != nil {
		b.Fatal(err)
	}
	band := noise.Band{LowHz: 1 / k.DurationS}
	bands := LogBands(band.LowHz, k.FrequencyHz[len(k.FrequencyHz)-1], 10)
	room := MaskCriteria{ContrastMin: k.Contrast - 1e-3, AbsBiasP95MaxRad: 1e-3}.Room(k.Contrast, 0, Prediction{})
	for b.Loop() {
		for c := range numChannels {
			if _, err := k.Mask(Load{c: 1}, room, band, bands, nil); err != nil {
				b.Fatal(err)
			}
		}
	}
}

// TestPredictProcesses checks a budget of band-limited processes against
// PredictAll channel by channel (independent path: the PSDs put on the
// channels by hand), and Without's rest. Tolerance 1e-4 relative: where a
// band edge cuts a quarter of a grid interval, Predict with a band weights
// the kernels at the centre of the part inside, PredictProcesses at the
// quarter's centre (measured 4e-5 on the bias variance, 1e-7 on the loss).
func TestPredictProcesses(t *testing.T) {
	k, err := maskKernels()
	if err != nil {
		t.Fatal(err)
	}
	lo := 1 / k.DurationS
	rin := noise.White{Level: noise.IntensityFromRIN(-110)}
	phase := noise.Sum{noise.PowerLaw{H: 1e-8, Alpha: -1}, noise.White{Level: noise.PhaseFromDBc(-110)}}
	ps := []Process{
		{Name: "rin", Load: Load{IntensityCommon: 1}, PSD: rin, Band: noise.Band{LowHz: lo, HighHz: 2e4}},
		{Name: "phase", Load: PhaseLoad(0.9), PSD: phase, Band: noise.Band{LowHz: lo}},
	}
	got := k.PredictProcesses(ps)
	r := k.Predict(IntensityCommon, rin, noise.Band{LowHz: lo, HighHz: 2e4})
	pc := k.Predict(PhaseCommon, phase, noise.Band{LowHz: lo})
	pd := k.Predict(PhaseDifferential, phase, noise.Band{LowHz: lo})
	wantLoss := r.ContrastLoss + 0.95*pc.ContrastLoss + 0.2*pd.ContrastLoss
	wantVar := r.BiasVarRad2 + 0.95*pc.BiasVarRad2 + 0.2*pd.BiasVarRad2
	if math.Abs(got.ContrastLoss-wantLoss) > 1e-4*math.Abs(wantLoss) {
		t.Errorf("loss %.15g, want %.15g (tol 1e-4 relative)", got.ContrastLoss, wantLoss)
	}
	if v := got.BiasStdRad * got.BiasStdRad; math.Abs(v-wantVar) > 1e-4*wantVar {
		t.Errorf("bias variance %.15g, want %.15g (tol 1e-4 relative)", v, wantVar)
	}
	rest := k.PredictProcesses(Without(ps, Load{PhaseCommon: 1}))
	wantLoss -= 0.95 * pc.ContrastLoss
	if math.Abs(rest.ContrastLoss-wantLoss) > 1e-4*math.Abs(wantLoss) {
		t.Errorf("rest loss %.15g, want %.15g (tol 1e-4 relative)", rest.ContrastLoss, wantLoss)
	}
}

// BenchmarkPredictProcesses times the prediction of a budget like the
// noise scenario's (testdata/scenarios/noise.toml): white RIN in a band on
// the common intensity channel and a drive phase table on the common and
// differential phase channels, from the benchmark scenario's kernels.
func BenchmarkPredictProcesses(b *testing.B) {
	s, err := NewSimulator(benchConfig(b, 1))
	if err != nil {
		b.Fatal(err)
	}
	k, err := s.Kernels(0)
	if err != nil {
		b.Fatal(err)
	}
	table, err := noise.NewTable([]float64{10, 100, 1e3, 1e4, 1e5}, []float64{1e-8, 1e-9, 1e-10, 1e-11, 1e-11})
	if err != nil {
		b.Fatal(err)
	}
	lo := 1 / k.DurationS
	ps := []Process{
		{Name: "rin", Load: Load{IntensityCommon: 1}, PSD: noise.White{Level: noise.IntensityFromRIN(-130)}, Band: noise.Band{LowHz: lo, HighHz: 1e5}},
		{Name: "phase", Load: PhaseLoad(0.9), PSD: table, Band: noise.Band{LowHz: lo}},
	}
	for b.Loop() {
		k.PredictProcesses(ps)
	}
}
