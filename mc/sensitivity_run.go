package mc

import (
	"context"
	"fmt"
	"slices"
	"strings"

	"rampart/internal/plural"
	"rampart/sim"
	"rampart/stats"
)

// SensitivityDesign is the Saltelli design of an ensemble's noise sources,
// whose points are shots: the inputs are the active static parameters of
// the budget (one input each, the two pulse areas separately) and, if
// present, each noise process during the shot as one group input. A
// static input's value is its standard normal variate; a noise process's
// value is the index of the noise stream its record is drawn from, so that
// rows of A use streams 0..n-1 and rows of B streams n..2n-1, and a row of
// A_B^(k) takes B's stream for process k and A's for the other. With n base
// rows and d inputs the design has n (d+2) shots.
//
// References:
//   - A. Saltelli et al., "Variance based sensitivity analysis of model
//     output. Design and estimator for the total sensitivity index", Comput.
//     Phys. Commun. 181, 259 (2010) (group inputs: section 2).
type SensitivityDesign struct {
	r        *Realiser
	saltelli *SaltelliDesign
	inputs   []string
	coord    []int // each input's coordinate of the static design, or coordRIN, coordPhase, coordField
}

const (
	coordRIN      = -1
	coordPhase    = -2
	coordField    = -3
	coordRotation = -4
)

// NewSensitivityDesign returns the design of n base rows for the ensemble of
// r. The static variates come from the ensemble's sampler kind ("sobol" is
// the best choice: Owen-scrambled Sobol' points of dimension 2 d_static)
// seeded with the ensemble's seed. It returns an error if the budget has no
// active source or n < 2.
func NewSensitivityDesign(r *Realiser, n int) (*SensitivityDesign, error) {
	if n < 2 {
		return nil, fmt.Errorf("sensitivity design of %s: want at least 2", plural.Count(n, "base row"))
	}
	e := r.Ensemble()
	d := &SensitivityDesign{r: r}
	for k, p := range e.Budget.allParams() {
		if p.Sigma > 0 {
			d.inputs = append(d.inputs, p.Name)
			d.coord = append(d.coord, k)
		}
	}
	ds := len(d.inputs)
	if e.Budget.RIN != nil {
		d.inputs = append(d.inputs, SourceRIN)
		d.coord = append(d.coord, coordRIN)
	}
	if e.Budget.Phase != nil {
		d.inputs = append(d.inputs, SourcePhase)
		d.coord = append(d.coord, coordPhase)
	}
	if e.Budget.FieldNoise != nil {
		d.inputs = append(d.inputs, SourceFieldNoise)
		d.coord = append(d.coord, coordField)
	}
	if e.Budget.RotationNoise != nil {
		d.inputs = append(d.inputs, SourceRotationPSD)
		d.coord = append(d.coord, coordRotation)
	}
	if len(d.inputs) == 0 {
		var keys []string
		for _, s := range Sources {
			keys = append(keys, s.Scenario)
		}
		return nil, fmt.Errorf("the noise budget has no active source, so there is no spread to apportion: set one or more of %s in the scenario or with --set (such as --set %s=10)", strings.Join(keys, ", "), mustSource(ParamSkew).Scenario)
	}
	base := &sensitivityBase{ds: ds, dd: len(d.inputs) - ds, n: n}
	if ds > 0 {
		switch e.Sampler {
		case "", "random":
			base.static = Normal(NewRandom(2*ds, n, e.Seed))
		case "lhs":
			base.static = Normal(NewLatinHypercube(2*ds, n, e.Seed))
		case "sobol":
			base.static = Normal(NewSobol(2*ds, n, e.Seed, Owen))
		default:
			return nil, fmt.Errorf("unknown sampler %q (want random, lhs or sobol)", e.Sampler)
		}
	}
	d.saltelli = NewSaltelliDesign(base)
	return d, nil
}

// sensitivityBase is the base design of a SensitivityDesign: in each half
// (A and B) the static normal variates, then the noise stream indices.
type sensitivityBase struct {
	static Sampler // of dimension 2 ds; nil if ds = 0
	ds, dd int     // static inputs, noise-process inputs
	n      int
}

func (b *sensitivityBase) Dim() int { return 2 * (b.ds + b.dd) }
func (b *sensitivityBase) Len() int { return b.n }

func (b *sensitivityBase) Point(i int, dst []float64) {
	d := b.ds + b.dd
	if b.static != nil {
		buf := make([]float64, 2*b.ds)
		b.static.Point(i, buf)
		copy(dst[:b.ds], buf[:b.ds])
		copy(dst[d:d+b.ds], buf[b.ds:])
	}
	for k := range b.dd {
		dst[b.ds+k] = float64(i)
		dst[d+b.ds+k] = float64(b.n + i)
	}
}

// Inputs returns the names of the inputs: static parameter names (Param
// names) and SourceRIN, SourcePhase, SourceFieldNoise, SourceRotationPSD
// for the noise processes.
func (d *SensitivityDesign) Inputs() []string { return d.inputs }

// BaseLen returns n, the number of base rows.
func (d *SensitivityDesign) BaseLen() int { return d.saltelli.BaseLen() }

// Len returns the number of shots, n (d+2).
func (d *SensitivityDesign) Len() int { return d.saltelli.Len() }

// Shot returns the perturbation of design point j and its record's inputs
// (Record.Index = j), for a Worker of the design's Realiser.
func (d *SensitivityDesign) Shot(w *Worker, j int) (sim.Shot, Record) {
	if w.r != d.r {
		panic("mc: SensitivityDesign.Shot with a worker of another realiser")
	}
	x := make([]float64, d.saltelli.Dim())
	d.saltelli.Point(j, x)
	z := make([]float64, StaticDim)
	var streams [4]int
	for k, c := range d.coord {
		switch c {
		case coordRIN:
			streams[0] = int(x[k])
		case coordPhase:
			streams[1] = int(x[k])
		case coordField:
			streams[2] = int(x[k])
		case coordRotation:
			streams[3] = int(x[k])
		default:
			z[c] = x[k]
		}
	}
	sh, rec := w.ShotAt(j, z, streams)
	// Photon scattering is no input of the design: its per-atom draw would
	// add variance that no input explains, so a design point stands for the
	// mean of a cloud (docs/model.md, Perturbations, photon scattering).
	sh.Scattering.Cloud = true
	return sh, rec
}

// Run runs the design points [from, to) on workers goroutines (all cores
// if workers < 1) and calls emit with the records in index order, as
// Realiser.Run does for realisations, so that a run can be stored, resumed
// and sharded the same way.
func (d *SensitivityDesign) Run(ctx context.Context, from, to, workers int, emit func(Record) error) (int, error) {
	if from < 0 || to > d.Len() {
		panic(fmt.Sprintf("mc: design points [%d, %d) outside [0, %d)", from, to, d.Len()))
	}
	return runOrdered(ctx, from, to, workers, func() func(int) Record {
		w := d.r.NewWorker()
		return func(j int) Record { return w.RunShot(d.Shot(w, j)) }
	}, emit)
}

// SobolInput is the sensitivity of contrast and bias to one input: first
// order and total Sobol' indices with their bootstrap intervals.
type SobolInput struct {
	Name          string   `json:"name"`
	ContrastFirst Interval `json:"contrast_first"`
	ContrastTotal Interval `json:"contrast_total"`
	BiasFirst     Interval `json:"bias_first"`
	BiasTotal     Interval `json:"bias_total"`
}

// SobolResult is the sensitivity table of an ensemble.
type SobolResult struct {
	Rows             int          `json:"rows"`
	Evaluations      int          `json:"evaluations"`
	Confidence       float64      `json:"confidence"`
	ContrastVariance float64      `json:"contrast_variance"`
	BiasVariance     float64      `json:"bias_variance_rad2"`
	Inputs           []SobolInput `json:"inputs"`
}

// Indices returns the Sobol' indices of contrast and bias from the records
// of every design point (in any order), by SobolIndices with
// BootstrapResamples resamples at the given confidence, drawn from
// Substream(seed, 0, "sensitivity/contrast") and ".../bias" with the
// ensemble's seed. An output that does not vary at all (variance 0, as the
// bias of a budget of symmetric errors can be) has every index 0: no input
// moves it. It returns an error if a design point is missing or repeated.
func (d *SensitivityDesign) Indices(recs []Record, confidence float64) (SobolResult, error) {
	if len(recs) != d.Len() {
		return SobolResult{}, fmt.Errorf("%d records for a sensitivity design of %d points", len(recs), d.Len())
	}
	sorted := slices.Clone(recs)
	slices.SortFunc(sorted, func(a, b Record) int { return a.Index - b.Index })
	c, b := make([]float64, len(sorted)), make([]float64, len(sorted))
	for j, r := range sorted {
		if r.Index != j {
			return SobolResult{}, fmt.Errorf("sensitivity design point %d is missing or repeated", j)
		}
		c[j], b[j] = r.Contrast, r.BiasRad
	}
	seed := d.r.Ensemble().Seed
	sc := SobolIndices(d.saltelli, c, BootstrapResamples, confidence, Substream(seed, 0, "sensitivity/contrast"))
	sb := SobolIndices(d.saltelli, b, BootstrapResamples, confidence, Substream(seed, 0, "sensitivity/bias"))
	res := SobolResult{Rows: d.BaseLen(), Evaluations: d.Len(), Confidence: confidence,
		ContrastVariance: sc.Variance, BiasVariance: sb.Variance}
	in := func(s Sensitivity, e stats.Estimate) Interval {
		if s.Variance == 0 {
			return Interval{}
		}
		return Interval{Value: e.Value, Lo: e.Lo, Hi: e.Hi}
	}
	for k, name := range d.inputs {
		res.Inputs = append(res.Inputs, SobolInput{Name: name,
			ContrastFirst: in(sc, sc.First[k]), ContrastTotal: in(sc, sc.Total[k]),
			BiasFirst: in(sb, sb.First[k]), BiasTotal: in(sb, sb.Total[k])})
	}
	return res, nil
}

// Derivative is the local response of one shot to one static parameter at
// the nominal point, by central finite differences with step h,
//
//	C'  = (C(+h) - C(-h)) / (2h),      C'' = (C(+h) - 2 C(0) + C(-h)) / h^2,
//
// and likewise for the bias b (differences wrapped to (-pi, pi]). Contrast
// is usually at a maximum at nominal, where C' ~ 0 and C” h^2 / 2 is the
// loss of a one-step error. h and the derivatives are in the lab unit of
// the parameter's source (Unit, the unit of its tolerance), so that C' is
// per ns of skew and C” per nK^2 of temperature.
type Derivative struct {
	Input string `json:"input"` // a Param name
	// Step is h, the parameter's standard deviation in the budget, in Unit.
	Step           float64 `json:"step"`
	Unit           string  `json:"unit"`
	Contrast       float64 `json:"dcontrast"`
	ContrastSecond float64 `json:"d2contrast"`
	BiasRad        float64 `json:"dbias_rad"`
	BiasRadSecond  float64 `json:"d2bias_rad"`
}

// LocalDerivatives returns the derivatives of contrast and bias of a single
// shot with respect to each active static parameter of r's budget, per unit
// of the parameter's lab unit, at the nominal shot (every other parameter
// zero, no noise during the shot). The step is one budget standard
// deviation: a secant over the scale the ensemble explores rather than a
// tangent, which is what matters for a budget and is well clear of the
// simulation's rounding.
func LocalDerivatives(r *Realiser) []Derivative {
	w := r.NewWorker()
	// The apparatus's settings stay; its photon scattering enters as the
	// mean of a cloud, so that the derivatives are those of smooth functions.
	base := r.Ensemble().Budget.Apparatus
	base.Scattering.Cloud = true
	nominal := w.RunShot(base, Record{})
	var out []Derivative
	z := make([]float64, StaticDim)
	shot := func(k int, x float64) Record {
		z[k] = x
		sh, rec := w.ShotAt(0, z, [4]int{})
		z[k] = 0
		sh.DepthNoise, sh.Jitter, sh.Field.Noise = [2]*sim.Series{}, [2]*sim.Series{}, nil
		sh.Scattering.Cloud = true
		return w.RunShot(sh, rec)
	}
	for k, p := range r.Ensemble().Budget.allParams() {
		if p.Sigma == 0 {
			continue
		}
		plus, minus := shot(k, 1), shot(k, -1)
		src, _ := InputSource(p.Name)
		h := src.Scale * p.Sigma
		d := Derivative{Input: p.Name, Step: h, Unit: src.Unit}
		d.Contrast = (plus.Contrast - minus.Contrast) / (2 * h)
		d.ContrastSecond = (plus.Contrast - 2*nominal.Contrast + minus.Contrast) / (h * h)
		d.BiasRad = sim.Wrap(plus.BiasRad-minus.BiasRad) / (2 * h)
		d.BiasRadSecond = (sim.Wrap(plus.BiasRad-nominal.BiasRad) - sim.Wrap(nominal.BiasRad-minus.BiasRad)) / (h * h)
		out = append(out, d)
	}
	return out
}
