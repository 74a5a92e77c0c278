package mc

import (
	"encoding/json"
	"errors"
	"fmt"
	"math/bits"
	"slices"
	"strconv"
	"strings"

	"rampart/internal/plural"
	"rampart/internal/version"
	"rampart/sim"
)

// ManifestFormat names the layout of an ensemble directory. Format 2 added
// the build, the numerics, the yield spec, the per-row checksums and the
// digest of the records; directories of format 1 are refused.
const ManifestFormat = "rampart-ensemble/2"

// MaxSamples bounds the realisations of an ensemble. Merge and summaries
// stream the records and keep only the output columns (Outcomes, 32 bytes
// a realisation, 48 while a summary runs), so 10^9 realisations need about
// 48 GB, a large cluster node; an ensemble that size is run in shards (a
// command that runs an ensemble in one process still keeps its records,
// about 200 bytes each). Shard ranges are computed in 128 bits (see
// Shard.Range), so no index product overflows at any size.
const MaxSamples = 1_000_000_000

// MaxInProcess bounds the realisations one process runs: a run keeps its
// records in memory (about 200 bytes each with their inputs; 2 GB at the
// bound) for its summary and decisions, while merge streams them. Larger
// ensembles run as shards.
const MaxInProcess = 10_000_000

// Shard is slice Index (1-based) of Count of an ensemble: the contiguous
// realisations [from, to) given by Range.
type Shard struct {
	Index int `json:"index"`
	Count int `json:"count"`
}

// Range returns the realisations of the shard in an ensemble of samples,
// [(k-1) samples / n, k samples / n), computed in 128 bits so that no
// product overflows whatever the sizes.
func (s Shard) Range(samples int) (from, to int) {
	return mulDiv(s.Index-1, samples, s.Count), mulDiv(s.Index, samples, s.Count)
}

// mulDiv returns floor(a b / c) for 0 <= a <= c, b >= 0 and c > 0, exactly.
func mulDiv(a, b, c int) int {
	hi, lo := bits.Mul64(uint64(a), uint64(b))
	q, _ := bits.Div64(hi, lo, uint64(c)) // hi < c because a b / c <= b
	return int(q)
}

// ParseShard reads "k/n" with 1 <= k <= n.
func ParseShard(s string) (Shard, error) {
	bad := fmt.Errorf("shard %q is not k/n with 1 <= k <= n (e.g. 2/8)", excerpt(s))
	ks, ns, ok := strings.Cut(s, "/")
	if !ok {
		return Shard{}, bad
	}
	k, err1 := strconv.Atoi(strings.TrimSpace(ks))
	n, err2 := strconv.Atoi(strings.TrimSpace(ns))
	if err1 != nil || err2 != nil || n < 1 || k < 1 || k > n {
		return Shard{}, bad
	}
	return Shard{Index: k, Count: n}, nil
}

// Numerics are the discretisation a run's shots used, as resolved by the
// simulator. Runs with different numerics are different ensembles.
type Numerics struct {
	Grid   int     `json:"grid"`
	StepS  float64 `json:"step_s"`
	Levels int     `json:"levels"`
	// Scheme names the split-step composition. sim does not export its
	// choice; this is the name of sim's defaultScheme (docs/model.md,
	// Numerics) and the build's revision covers a change of it.
	Scheme string `json:"scheme"`
}

// SplitScheme is the name recorded for sim's split-step scheme.
const SplitScheme = "blanes-moan-s6"

// NumericsOf returns the numerics of a configuration resolved by a
// simulator (sim.Simulator.Config, Realiser.Config).
func NumericsOf(c sim.Config) Numerics {
	return Numerics{Grid: c.Grid, StepS: c.StepS, Levels: c.Levels, Scheme: SplitScheme}
}

// Manifest identifies an ensemble run: what was simulated, by which build
// and with which numerics, and how it was drawn. Two directories belong to
// the same ensemble when their manifests agree but for the shard (and for
// what cannot change a record: the yield spec, the confidence, the digest).
type Manifest struct {
	Format string `json:"format"`
	// Rampart is the build that wrote the records.
	Rampart version.Info `json:"rampart"`
	// Fingerprint identifies the scenario and noise budget (the caller's
	// hash of them); Scenario is their text, for the record.
	Fingerprint string `json:"fingerprint"`
	Scenario    string `json:"scenario,omitempty"`
	// Numerics are those of the shots (nil: not recorded by the caller).
	Numerics *Numerics `json:"numerics,omitempty"`
	// NumericsError is the nominal shot's estimated numerical error
	// (sim.EstimateError), checked before the run (nil: not recorded).
	NumericsError *sim.ErrorEstimate `json:"numerics_error,omitempty"`
	// LossPossible says that the budget's photon scattering can lose
	// shots (Record.Lost), so that summaries allow for losses a sample
	// happens not to show.
	LossPossible bool `json:"loss_possible,omitempty"`
	// SagnacRad and ScaleFactorS are those of the nominal sequence, for
	// summaries of the records.
	SagnacRad    float64  `json:"sagnac_rad"`
	ScaleFactorS float64  `json:"scale_factor_s"`
	Seed         uint64   `json:"seed"`
	Samples      int      `json:"samples"`
	Sampler      string   `json:"sampler"`
	Shard        *Shard   `json:"shard,omitempty"`
	Columns      []string `json:"columns"`
	// YieldSpec and Confidence are those the run was summarised with, so
	// that a merge of shards reproduces the unsharded summary. They do not
	// change a record, so resume accepts new ones (and records them).
	YieldSpec  *Spec   `json:"yield_spec,omitempty"`
	Confidence float64 `json:"confidence,omitempty"`
	// RecordsSHA256 is the SHA-256 of the whole records file, set when the
	// run is complete.
	RecordsSHA256 string `json:"records_sha256,omitempty"`
	// Looks is the number of qualifications taken on the ensemble so far
	// (the last look number, RecordLook), kept as the run is topped up, so
	// that the next qualification spends the next look's share of the
	// confidence (NextLook, stats.LookAlpha). Like the yield spec it
	// changes no record.
	Looks int `json:"looks,omitempty"`
}

// NextLook returns the look number of a qualification of the run m
// describes: given, if it is not zero, else the one after the looks
// recorded. A given look below the recorded count is refused: it would
// spend again a share of the confidence already spent, and the sequence of
// verdicts would no longer hold its level. Repeating the last look (given
// equal to Looks) is accepted.
func (m Manifest) NextLook(given int) (int, error) {
	if given == 0 {
		return m.Looks + 1, nil
	}
	if given < m.Looks {
		return 0, fmt.Errorf("--look %d: this ensemble was already qualified %s; give --look %d (or leave --look out), since a look number spent again would break the confidence of the sequence", given, plural.Count(m.Looks, "time"), m.Looks+1)
	}
	return given, nil
}

// canTopUp returns an error unless the run old may be topped up to the
// samples of m: an unsharded run of the random sampler, whose realisation i
// depends only on the seed and i (docs/model.md, Statistics), grown. A
// Latin hypercube or Sobol' design depends on its size: more points are
// another design.
func canTopUp(old, m Manifest) error {
	switch {
	case m.Samples < old.Samples:
		return fmt.Errorf("%s, not %d (an ensemble grows, it does not shrink)", plural.Count(old.Samples, "sample"), m.Samples)
	case old.Shard != nil || m.Shard != nil:
		return fmt.Errorf("%s, not %d: a shard is not topped up (merge the shards, then top up the merged run)", plural.Count(old.Samples, "sample"), m.Samples)
	case old.Sampler != "random":
		return fmt.Errorf("%s of a %s design, not %d: its points depend on its size, so only a random-sampler ensemble is topped up", plural.Count(old.Samples, "sample"), old.Sampler, m.Samples)
	}
	return nil
}

// Range returns the realisations the manifest's run covers.
func (m Manifest) Range() (from, to int) {
	if m.Shard == nil {
		return 0, m.Samples
	}
	return m.Shard.Range(m.Samples)
}

// validate checks what a manifest read from disk must satisfy before its
// counts are used.
func (m Manifest) validate() error {
	switch {
	case m.Format != ManifestFormat:
		return fmt.Errorf("format %q, not %q (a directory written by another rampart: rerun it with this one)", excerpt(m.Format), ManifestFormat)
	case len(m.Columns) < 9 || m.Columns[len(m.Columns)-1] != ChecksumColumn:
		return errors.New("its columns are not those of a records file")
	case m.Samples < 1 || m.Samples > MaxSamples:
		return fmt.Errorf("samples = %d, outside [1, %d]", m.Samples, MaxSamples)
	case m.Shard != nil && (m.Shard.Count < 1 || m.Shard.Index < 1 || m.Shard.Index > m.Shard.Count || m.Shard.Count > m.Samples):
		return fmt.Errorf("shard %d/%d of %s is not a shard", m.Shard.Index, m.Shard.Count, plural.Count(m.Samples, "sample"))
	}
	return nil
}

func (m Manifest) layout() (nInputs int, rin, phase bool) {
	for _, c := range m.Columns[1:] {
		switch c {
		case "rin_rms_rel":
			rin = true
		case "phase_rms_plus_rad":
			phase = true
		case "phase_rms_minus_rad", "contrast", "phase_rad", "bias_rad", "z_re", "z_im", "ground_plus", "ground_minus", ScaleFactorColumn, ChecksumColumn:
		default:
			nInputs++
		}
	}
	return nInputs, rin, phase
}

// sameEnsemble returns an error naming the first field in which m and o
// differ, the shard, yield spec, confidence and digest aside. A different
// build is refused even when its numerics agree: any change of the code
// may change a shot. Two builds that both lack VCS information ("devel",
// "unknown") cannot be told apart and are accepted.
func (m Manifest) sameEnsemble(o Manifest) error {
	switch {
	case m.Format != o.Format:
		return fmt.Errorf("format %q, want %q", o.Format, m.Format)
	case m.Rampart != o.Rampart:
		return fmt.Errorf("records of rampart %s, not %s: finish and merge runs with one build", o.Rampart, m.Rampart)
	case m.Fingerprint != o.Fingerprint:
		if d := scenarioDiff(o.Scenario, m.Scenario, 4); d != "" {
			return fmt.Errorf("a different scenario or noise budget (%s)", d)
		}
		return errors.New("a different scenario or noise budget")
	case (m.Numerics == nil) != (o.Numerics == nil) || (m.Numerics != nil && *m.Numerics != *o.Numerics):
		return fmt.Errorf("numerics %s, not %s", o.Numerics.String(), m.Numerics.String())
	case m.Seed != o.Seed:
		return fmt.Errorf("seed %d, not %d", o.Seed, m.Seed)
	case m.Samples != o.Samples:
		return fmt.Errorf("%s, not %d", plural.Count(o.Samples, "sample"), m.Samples)
	case m.Sampler != o.Sampler:
		return fmt.Errorf("sampler %q, not %q", o.Sampler, m.Sampler)
	case slices.Contains(m.Columns, ScaleFactorColumn) != slices.Contains(o.Columns, ScaleFactorColumn):
		have := map[bool]string{true: "with", false: "without"}
		return fmt.Errorf("records %s scale-factor errors, not %s them (a scale-factor criterion or --scale-factor measures them; run both the same way)",
			have[slices.Contains(o.Columns, ScaleFactorColumn)], have[slices.Contains(m.Columns, ScaleFactorColumn)])
	case !slices.Equal(m.Columns, o.Columns):
		return errors.New("different columns")
	}
	return nil
}

func (n *Numerics) String() string {
	if n == nil {
		return "not recorded"
	}
	return fmt.Sprintf("grid %d, step %g s, %s, %s", n.Grid, n.StepS, plural.Count(n.Levels, "level"), n.Scheme)
}

// scenarioDiff names up to max of the fields in which the scenario texts
// (JSON, as Manifest.Scenario records them) old and new differ, "Ring.Sites
// 20, not 24", or returns "" when either is not such a text or they do not
// differ.
func scenarioDiff(old, new string, max int) string {
	var a, b any
	if json.Unmarshal([]byte(old), &a) != nil || json.Unmarshal([]byte(new), &b) != nil {
		return ""
	}
	var out []string
	var walk func(path string, x, y any)
	walk = func(path string, x, y any) {
		xm, xok := x.(map[string]any)
		ym, yok := y.(map[string]any)
		if xok && yok {
			keys := make([]string, 0, len(xm)+len(ym))
			for k := range xm {
				keys = append(keys, k)
			}
			for k := range ym {
				if _, dup := xm[k]; !dup {
					keys = append(keys, k)
				}
			}
			slices.Sort(keys)
			for _, k := range keys {
				p := k
				if path != "" {
					p = path + "." + k
				}
				walk(p, xm[k], ym[k])
			}
			return
		}
		xs, _ := json.Marshal(x)
		ys, _ := json.Marshal(y)
		if string(xs) != string(ys) {
			out = append(out, fmt.Sprintf("%s %s, not %s", path, excerpt(string(xs)), excerpt(string(ys))))
		}
	}
	walk("", a, b)
	if len(out) > max {
		out = append(out[:max], fmt.Sprintf("and %d more", len(out)-max))
	}
	return strings.Join(out, "; ")
}
