package design

import (
	"context"
	"fmt"
	"runtime"
	"slices"
	"sync"

	"rampart/mc"
	"rampart/sim"
)

// Nominal is the noise-free shot at one point of a scan (sim.Result) with
// the drive's peak speed.
type Nominal struct {
	Contrast float64 `json:"contrast"`
	PhaseRad float64 `json:"phase_rad"`
	BiasRad  float64 `json:"bias_rad"`
	// Ground is each arm's ground-band population after the ramp-up.
	Ground [2]float64 `json:"ground_after_ramp_up"`
	// PeakSpeedRadS is the largest |Omega| of the ramp-up (sim.PeakSpeed),
	// above the cruise speed for a ramp that overshoots; Reverses reports a
	// ramp whose speed changes sign.
	PeakSpeedRadS float64 `json:"peak_speed_rad_s"`
	Reverses      bool    `json:"reverses,omitempty"`
	// Numerics, when the point was checked (NominalShot.Check), is the
	// estimate of the shot's numerical error: the same shot with twice the
	// grid and half the step (sim.CompareNumerics).
	Numerics *sim.ErrorEstimate `json:"numerics_error,omitempty"`
}

// NominalShot is the noise-free shot at one point of a scan: the
// configuration and the shot its apparatus makes without noise (the field
// offset, photon scattering, radius error and ring potential of
// scenario.Scenario.Apparatus, docs/model.md, Perturbations), the shot
// rampart shot simulates.
type NominalShot struct {
	Config    sim.Config
	Apparatus sim.Shot
	// Check asks for the estimate of the shot's numerical error (one
	// refined shot more, three to eight times the shot's cost).
	Check bool
}

// NominalOf returns the scan figures of the noise-free shot n, with the
// estimate of their numerical error when n.Check asks for it. BiasRad is
// that of sim.Result, wrap(phase - K Omega) with K the nominal scale factor
// 2 I phi(T) / hbar (docs/model.md, Gyroscope figures), not the zero-rate
// bias phase - K_shot Omega of sim.Simulator.Gyro, which measures the
// shot's own scale factor with two more shots; the two agree at Omega = 0.
func NominalOf(n NominalShot) (Nominal, error) {
	cfg := n.Config
	s, err := sim.NewSimulator(cfg)
	if err != nil {
		return Nominal{}, err
	}
	r := s.Run(n.Apparatus, nil)
	peak, rev := sim.PeakSpeed(cfg.Sequence.Up)
	out := Nominal{Contrast: r.Contrast, PhaseRad: r.PhaseRad, BiasRad: r.BiasRad,
		Ground: r.GroundAfterRampUp, PeakSpeedRadS: peak, Reverses: rev}
	if n.Check {
		f, err := sim.NewSimulator(sim.Refine(s.Config()))
		if err != nil {
			return Nominal{}, fmt.Errorf("cannot refine the numerics to estimate their error: %w", err)
		}
		est := sim.CompareNumerics(r, f.Run(n.Apparatus, nil))
		out.Numerics = &est
	}
	return out, nil
}

// CheckPoints returns which points of a grid of values (each point's
// values, one per axis) a scan checks by default: its corners (every value
// the lowest or highest of its axis) and its centre (every value the
// median of its axis, where the axes have odd lengths): a sample of the
// scan's numerics, not its worst point (on the demo's 20 x 20 map of ramp
// time and depth the largest error over all points was 8 times the
// corners'; rampart scan --check estimates every point).
func CheckPoints(values [][]float64) []bool {
	out := make([]bool, len(values))
	if len(values) == 0 {
		return out
	}
	d := len(values[0])
	axes := make([][]float64, d)
	for k := range d {
		for _, v := range values {
			axes[k] = append(axes[k], v[k])
		}
		slices.Sort(axes[k])
		axes[k] = slices.Compact(axes[k])
	}
	for i, v := range values {
		corner, centre := true, true
		for k, x := range v {
			a := axes[k]
			corner = corner && (x == a[0] || x == a[len(a)-1])
			centre = centre && len(a)%2 == 1 && x == a[len(a)/2]
		}
		out[i] = corner || centre
	}
	return out
}

// ScanNominal runs every noise-free shot on workers goroutines (all cores
// if workers < 1) and returns the results in the order of shots; done, if not nil, is called after each shot (from any
// goroutine, one call at a time). The points are independent, so the
// result does not depend on workers. On an error, or the cancellation of
// ctx, it returns the first error met.
func ScanNominal(ctx context.Context, shots []NominalShot, workers int, done func()) ([]Nominal, error) {
	if workers < 1 {
		workers = runtime.GOMAXPROCS(0)
	}
	out := make([]Nominal, len(shots))
	errs := make([]error, len(shots))
	next := make(chan int)
	var wg sync.WaitGroup
	var mu sync.Mutex
	for range min(workers, len(shots)) {
		wg.Go(func() {
			for i := range next {
				out[i], errs[i] = NominalOf(shots[i])
				if done != nil {
					mu.Lock()
					done()
					mu.Unlock()
				}
			}
		})
	}
feed:
	for i := range shots {
		select {
		case next <- i:
		case <-ctx.Done():
			break feed
		}
	}
	close(next)
	wg.Wait()
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	for _, err := range errs {
		if err != nil {
			return nil, err
		}
	}
	return out, nil
}

// Bounded is an ensemble statistic with its two-sided confidence interval
// at the summary's confidence; CI is nil when no interval exists at this
// ensemble size, and NoBoundBelow then gives the size that would have one.
type Bounded struct {
	Value        float64     `json:"value"`
	CI           *[2]float64 `json:"ci,omitempty"`
	NoBoundBelow int         `json:"no_bound_below,omitempty"`
}

// Metrics are the ensemble figures of one point of a scan, taken from its
// summary (mc.Summarise): the 5th-percentile contrast and the 95th
// percentile of |bias| with their exact distribution-free order-statistic
// intervals (stats.QuantileInterval), the mean contrast with its
// bootstrap-t interval, and the yield inside the spec with its
// Clopper-Pearson interval (nil without a spec).
type Metrics struct {
	Samples      int             `json:"samples"`
	Confidence   float64         `json:"confidence"`
	ContrastMean Bounded         `json:"contrast_mean"`
	ContrastP05  Bounded         `json:"contrast_p05"`
	AbsBiasP95   Bounded         `json:"abs_bias_p95_rad"`
	Yield        *mc.YieldResult `json:"yield,omitempty"`
}

// MetricsOf returns the scan figures of an ensemble summary.
func MetricsOf(s mc.Summary) Metrics {
	return Metrics{Samples: s.Samples, Confidence: s.Confidence,
		ContrastMean: bounded(s.Contrast, "mean", s.Contrast.Mean),
		ContrastP05:  bounded(s.Contrast, "p05", s.Contrast.P05),
		AbsBiasP95:   bounded(s.AbsBiasRad, "p95", s.AbsBiasRad.P95),
		Yield:        s.Yield}
}

func bounded(d mc.Distribution, key string, v float64) Bounded {
	b := Bounded{Value: v, NoBoundBelow: d.NoBoundBelow[key]}
	if ci, ok := d.CI[key]; ok {
		b.CI = &ci
	}
	return b
}
