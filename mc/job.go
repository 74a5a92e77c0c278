package mc

import (
	"context"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"runtime"

	"rampart/internal/plural"
	"rampart/sim"
)

// Job is one stored run of an ensemble: records [from, to) of a runner,
// kept (when Dir is set) in a run directory that Resume continues and Merge
// combines with the directory's other shards.
//
// The caller identifies what is simulated: Fingerprint is a hash of the
// scenario and budget (two directories merge only when their fingerprints
// agree) and Scenario its text, for the record (scenario.Scenario.Fingerprint
// gives both for a scenario file).
type Job struct {
	Realiser *Realiser
	// Runner runs the records; nil: the Realiser itself. A sensitivity
	// design of the realiser's shots is another.
	Runner interface {
		Run(ctx context.Context, from, to, workers int, emit func(Record) error) (int, error)
	}
	// Records is the number of records of the whole (unsharded) job; 0:
	// the ensemble's Samples.
	Records int

	Fingerprint, Scenario string

	// Shard, if not nil, runs only that slice of the records.
	Shard *Shard
	// Dir keeps the records, if not empty; Resume continues the run there
	// instead of creating it.
	Dir    string
	Resume bool
	// Workers is the number of goroutines; 0: GOMAXPROCS.
	Workers int
	// YieldSpec and Confidence are what the run is summarised with; the
	// manifest records them so that merge reproduces the summary.
	YieldSpec  *Spec
	Confidence float64
	// NumericsError is the nominal shot's estimated numerical error, if
	// the caller checked it; the manifest records it and summaries of the
	// run (merged ones too) carry it.
	NumericsError *sim.ErrorEstimate

	// Started, if set, is called once the resumed records are read, with
	// the number of records of the run and of those resumed; Recorded after
	// each new record is kept.
	Started  func(total, resumed int)
	Recorded func()
}

// Within returns the job kept in the subdirectory sub of j.Dir, as a
// command that keeps several runs in one directory (one per ramp, or per
// amplitude tried) lays them out: resuming, a run there is continued (a
// complete one is reused as it is) and a missing one started, as an
// interrupted command leaves them; otherwise a new run is started there.
func (j Job) Within(sub string) Job {
	j.Dir = filepath.Join(j.Dir, sub)
	j.Resume = j.Resume && HasRun(j.Dir)
	return j
}

// HasRun reports whether dir holds a run (its manifest).
func HasRun(dir string) bool {
	_, err := os.Stat(filepath.Join(dir, ManifestFile))
	return err == nil
}

// JobResult is what a job ran: its manifest, the records of its range in
// index order (resumed ones first), and how many of them it simulated.
type JobResult struct {
	Manifest Manifest
	Records  []Record
	Fresh    int
	// Release, when the job kept a run directory, releases the lock that
	// Execute leaves held on it, so that the caller writes the summary and
	// figures under the same lock; the kernel releases it at exit in any
	// case.
	Release func() error
}

// Manifest returns the manifest of the job's run: the caller's fingerprint,
// the nominal sequence's scale factor K = 2 I phi(T) / hbar and Sagnac phase
// K Omega (docs/model.md, Interferometer and signs), the design and the
// record columns.
func (j Job) Manifest() Manifest {
	r := j.Realiser
	ens := r.Ensemble()
	c := r.Config()
	k := c.Ring.ScaleFactor(c.Sequence.TotalAngle())
	numerics := NumericsOf(c)
	m := Manifest{
		Format: ManifestFormat, Fingerprint: j.Fingerprint, Scenario: j.Scenario,
		SagnacRad: k * c.RotationRadS, ScaleFactorS: k,
		Seed: ens.Seed, Samples: j.records(), Sampler: ens.Sampler, Shard: j.Shard,
		Columns:  Columns(r.Params(), ens.Budget.RIN != nil, ens.Budget.Phase != nil),
		Numerics: &numerics, YieldSpec: j.YieldSpec, Confidence: j.Confidence,
		NumericsError: j.NumericsError,
	}
	if ens.ScaleFactor {
		m.Columns = WithScaleFactor(m.Columns)
	}
	m.LossPossible = ens.Budget.LossPossible()
	return m
}

// Summarise summarises records of the run m describes: their seed, Sagnac
// phase and scale factor come from the manifest (Summarise).
func (m Manifest) Summarise(recs []Record, confidence float64, spec Spec) Summary {
	return m.SummariseOutcomes(OutcomesOf(recs), confidence, spec)
}

// SummariseOutcomes summarises the outputs of the run m describes
// (SummariseOutcomes), in the memory of their columns.
func (m Manifest) SummariseOutcomes(o *Outcomes, confidence float64, spec Spec) Summary {
	o.LossPossible = o.LossPossible || m.LossPossible
	s := SummariseOutcomes(o, m.Seed, m.SagnacRad, m.ScaleFactorS, confidence, spec)
	s.Numerics = m.NumericsError
	return s
}

func (j Job) records() int {
	if j.Records > 0 {
		return j.Records
	}
	return j.Realiser.Ensemble().Samples
}

// Execute runs (or resumes) the job. On an error, including the
// cancellation of ctx, the result holds the records run so far, all of
// them kept in Dir.
func (j Job) Execute(ctx context.Context) (*JobResult, error) {
	m := j.Manifest()
	if m.Samples > MaxSamples {
		return nil, fmt.Errorf("%s in one run, more than the %d a run directory holds: use fewer realisations or base rows", plural.Count(m.Samples, "shot"), MaxSamples)
	}
	if j.Shard != nil && j.Shard.Count > m.Samples {
		return nil, fmt.Errorf("shard %d/%d: more shards than the %s", j.Shard.Index, j.Shard.Count, plural.Count(m.Samples, "realisation"))
	}
	if from, to := m.Range(); to-from > MaxInProcess {
		return nil, fmt.Errorf("%s in one process, more than the %d it holds in memory (about 200 bytes each): run it in slices with --shard k/n and combine them with rampart merge, which streams", plural.Count(to-from, "realisation"), MaxInProcess)
	}
	res := &JobResult{Manifest: m}
	emit := func(rec Record) error { res.Records = append(res.Records, rec); return nil }
	if j.Dir != "" {
		var st *Store
		var err error
		if j.Resume {
			st, res.Records, err = Resume(j.Dir, m)
		} else {
			st, err = Create(j.Dir, m)
		}
		if err != nil {
			return nil, err
		}
		if res.Release, err = LockDir(j.Dir); err != nil { // counted: held past the store's close
			st.Close()
			return nil, err
		}
		defer st.Close()
		emit = func(rec Record) error {
			if err := st.Append(rec); err != nil {
				return err
			}
			res.Records = append(res.Records, rec)
			return nil
		}
	}
	from, to := m.Range()
	if j.Started != nil {
		j.Started(to-from, len(res.Records))
	}
	workers := j.Workers
	if workers == 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	var runner = j.Runner
	if runner == nil {
		runner = j.Realiser
	}
	n, err := runner.Run(ctx, from+len(res.Records), to, workers, func(rec Record) error {
		if err := emit(rec); err != nil {
			return err
		}
		if j.Recorded != nil {
			j.Recorded()
		}
		return nil
	})
	res.Fresh = n
	return res, err
}

// CheckDecidable refuses records whose contrast or bias is not a number
// (a shot whose arms do not overlap at all has no phase), on which no
// statistic can be decided.
func CheckDecidable(recs []Record) error {
	for _, r := range recs {
		if r.Contrast != r.Contrast || r.BiasRad != r.BiasRad {
			return fmt.Errorf("realisation %d has contrast %g and bias %g rad: no statistic is defined over it; the noise budget is too large for this sequence", r.Index, r.Contrast, r.BiasRad)
		}
	}
	return nil
}

// NoiseGrid is the noise grid that ensembles compared on common random
// numbers share (Ensemble.NoiseStepS and NoiseDurationS).
type NoiseGrid struct {
	StepS     float64 `json:"noise_step_s"`
	DurationS float64 `json:"noise_duration_s"`
}

// SharedGrid returns the grid that serves every configuration in cfgs under
// budget b (the widest a comparison runs): the finest of their noise steps
// (a quarter of the split step) over the longest of their shots.
func SharedGrid(cfgs []sim.Config, b Budget) (NoiseGrid, error) {
	g := NoiseGrid{StepS: math.Inf(1)}
	for _, cfg := range cfgs {
		s, err := sim.NewSimulator(cfg)
		if err != nil {
			return NoiseGrid{}, err
		}
		g.StepS = math.Min(g.StepS, s.Config().StepS/NoiseSamplesPerStep)
		g.DurationS = math.Max(g.DurationS, NoiseDuration(cfg, b))
	}
	return g, nil
}

// Apply sets the grid of ens, and returns the tag that records it in a
// fingerprint: the grid shapes the noise records only when the budget has
// noise during the shot, so that an ensemble without any is tagged by
// nothing and keeps the fingerprint of a plain run.
func (g NoiseGrid) Apply(ens *Ensemble) any {
	ens.NoiseStepS, ens.NoiseDurationS = g.StepS, g.DurationS
	if !ens.Budget.Dynamic() {
		return nil
	}
	return g
}
