package design

import (
	"context"
	"fmt"
	"math"

	"rampart/internal/plural"
	"rampart/mc"
)

// Sample is an ensemble at one value of the searched key: its records, the
// nominal scale factor K (for a bias limit in deg/h) and its seed (for the
// bootstrap of a mean criterion).
type Sample struct {
	Records      []mc.Record
	ScaleFactorS float64
	Seed         uint64
	// LossPossible says that shots may be lost to photon scattering
	// (mc.Budget.LossPossible), for the mean contrast's bound.
	LossPossible bool
}

// Edge searches a key's range for the edge of a spec: the smallest value
// that meets the requirements (the shortest ramp, say) or, with Largest,
// the largest (the longest cruise, the largest error). The requirements are
// assumed to hold on one side of an edge inside [Lo, Hi] and not on the
// other (monotone in the key): above it for the smallest value, below it for
// the largest.
//
// The search evaluates the good end of the range (Hi for the smallest
// value), then the other end, then bisects the bracket between the best
// passing value and the nearest value not passing Steps times: at most
// Evaluations() = Steps + 2 qualifications. A point passes only with an
// mc.Qualify verdict of pass; fail and undecided both count as not passing,
// which moves the reported value towards the good end (conservative).
//
// Confidence. The reported value is one of the evaluated points, and it is
// wrongly reported (the requirements in truth not met there) only if that
// point wrongly passed. Each evaluation is therefore qualified at level
// alpha / m, m = Evaluations() and alpha = 1 - confidence (Bonferroni), so
// that by the union bound the probability that any evaluated point, and so
// the reported one, wrongly passes is at most alpha, whatever the order of
// the evaluations and the dependence between them (common random numbers).
// The Bonferroni split is used rather than the look spending of
// stats.LookAlpha because the number of evaluations is fixed in advance and
// the later, finer points of a bisection matter as much as the first.
// TestEdgeCoverage checks the false-pass rate by simulation.
//
// References:
//   - C. E. Bonferroni, "Teoria statistica delle classi e calcolo delle
//     probabilità", Pubbl. R. Ist. Sup. Sci. Econ. Comm. Firenze 8, 3
//     (1936).
//   - R. L. Berger, Technometrics 24, 295 (1982) (intersection-union
//     tests, as in mc.Qualify).
type Edge struct {
	Lo, Hi  float64
	Largest bool
	// Steps is the number of bisections after the two ends; the bracket
	// ends (Hi - Lo) / 2^Steps wide at most.
	Steps        int
	Requirements mc.Requirements
	// Sample runs the ensemble at value x of the key.
	Sample func(ctx context.Context, x float64) (Sample, error)
	// Evaluated, if not nil, is called after each qualification.
	Evaluated func(Evaluation)
}

// MaxSteps bounds Edge.Steps: 2^-30 of the range is below any key's
// meaningful resolution.
const MaxSteps = 30

// Evaluation is one qualified point of a search.
type Evaluation struct {
	Value         float64          `json:"value"`
	Qualification mc.Qualification `json:"qualification"`
}

// EdgeResult is the outcome of a search. Found reports that a passing value
// exists among those evaluated; Value is then the best of them (the smallest,
// or with Largest the largest), Bracket the interval between it and the
// nearest evaluated value not passing (both Value when the far end of the
// range passes), and At the qualification at Value. Confidence is the
// search's confidence, PointConfidence the one-sided confidence each point
// was qualified at.
type EdgeResult struct {
	Found           bool             `json:"found"`
	Value           float64          `json:"value"`
	Bracket         [2]float64       `json:"bracket"`
	At              mc.Qualification `json:"at"`
	Largest         bool             `json:"largest,omitempty"`
	Confidence      float64          `json:"confidence"`
	PointConfidence float64          `json:"point_confidence"`
	Evaluations     []Evaluation     `json:"evaluations"`
}

// Evaluations returns the largest number of qualifications the search makes.
func (e Edge) Evaluations() int { return e.Steps + 2 }

// PointRequirements returns the requirements each point is qualified with:
// those of the search with the confidence of one of Evaluations() points,
// 1 - alpha/m, on a first look (mc.Qualify spends stats.LookAlpha of the
// confidence it is given at look 1, so the confidence given is chosen to
// make that share alpha/m).
func (e Edge) PointRequirements() mc.Requirements {
	q := e.Requirements
	alpha := 1 - confidenceOf(q)
	pointAlpha := alpha / float64(e.Evaluations())
	// mc.Qualify tests look 1 at LookAlpha(a, 1) = a 6/pi^2.
	q.Confidence = 1 - pointAlpha*math.Pi*math.Pi/6
	q.Look = 1
	return q
}

func confidenceOf(q mc.Requirements) float64 {
	if q.Confidence == 0 {
		return mc.DefaultConfidence
	}
	return q.Confidence
}

// Validate checks the range, the steps and the requirements.
func (e Edge) Validate() error {
	switch {
	case math.IsNaN(e.Lo) || math.IsNaN(e.Hi) || math.IsInf(e.Lo, 0) || math.IsInf(e.Hi, 0) || !(e.Lo < e.Hi):
		return fmt.Errorf("range [%g, %g]: want finite ends, the first below the second", e.Lo, e.Hi)
	case e.Steps < 0 || e.Steps > MaxSteps:
		return fmt.Errorf("%s: want 0 to %d", plural.Count(e.Steps, "bisection step"), MaxSteps)
	case e.Requirements.Look > 1:
		return fmt.Errorf("look %d: a search qualifies fresh ensembles and spends its confidence over its own points", e.Requirements.Look)
	}
	return e.Requirements.Validate()
}

// Find runs the search. It panics if the search does not Validate; on an
// error of Sample (including the cancellation of ctx) it returns the
// evaluations made so far with the error.
func (e Edge) Find(ctx context.Context) (EdgeResult, error) {
	if err := e.Validate(); err != nil {
		panic("design: " + err.Error())
	}
	req := e.PointRequirements()
	res := EdgeResult{Largest: e.Largest, Confidence: confidenceOf(e.Requirements)}
	res.PointConfidence = 1 - (1-res.Confidence)/float64(e.Evaluations())
	eval := func(x float64) (bool, error) {
		s, err := e.Sample(ctx, x)
		if err != nil {
			return false, err
		}
		req := req
		req.LossPossible = s.LossPossible
		q := mc.Qualify(s.Records, req, s.ScaleFactorS, s.Seed)
		ev := Evaluation{Value: x, Qualification: q}
		res.Evaluations = append(res.Evaluations, ev)
		if e.Evaluated != nil {
			e.Evaluated(ev)
		}
		if q.Verdict == mc.Pass {
			res.Found, res.Value, res.At = true, x, q
			return true, nil
		}
		return false, nil
	}
	good, bad := e.Hi, e.Lo
	if e.Largest {
		good, bad = e.Lo, e.Hi
	}
	ok, err := eval(good)
	if err != nil || !ok {
		return res, err
	}
	if ok, err = eval(bad); err != nil {
		return res, err
	}
	if ok {
		res.Bracket = [2]float64{bad, bad}
		return res, nil
	}
	for range e.Steps {
		mid := bad + (good-bad)/2
		ok, err := eval(mid)
		if err != nil {
			return res, err
		}
		if ok {
			good = mid
		} else {
			bad = mid
		}
	}
	res.Bracket = [2]float64{min(good, bad), max(good, bad)}
	return res, nil
}
