package scenario

import (
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"fmt"

	"rampart/mc"
	"rampart/noise"
	"rampart/sim"
)

// Budget returns the Monte Carlo noise budget of the scenario's [noise.*]
// tables, converted from file units to SI: every static row of mc.Sources
// reads its key (mc.Source.Scenario) scaled by its FileScale; the noise
// processes read their level, band or table. Its Apparatus is the
// scenario's (Scenario.Apparatus).
func (sc *Scenario) Budget() (mc.Budget, error) {
	n := sc.Noise
	b := mc.Budget{PhaseCorrelation: n.Drive.Correlation}
	for _, s := range mc.Sources {
		if s.Kind != mc.Static {
			continue
		}
		v, ok := sc.Number(s.Scenario)
		if !ok {
			return mc.Budget{}, fmt.Errorf("scenario %q: source %s: no number key %q", sc.Name, s.Key, s.Scenario)
		}
		*s.Sigma(&b) = v * s.FileScale
	}
	switch {
	case n.Depth.RINTable != "":
		data, err := sc.ReadFile(n.Depth.RINTable)
		if err != nil {
			return mc.Budget{}, fmt.Errorf("scenario %q: noise.depth.rin_table: %w", sc.Name, err)
		}
		t, err := noise.ParseRIN(bytes.NewReader(data), n.Depth.RINTable)
		if err != nil {
			return mc.Budget{}, fmt.Errorf("scenario %q: noise.depth.rin_table: %w", sc.Name, err)
		}
		b.RIN = t
	case n.Depth.RINDBPerHz != 0:
		b.RIN = noise.White{Level: noise.IntensityFromRIN(n.Depth.RINDBPerHz)}
	}
	if b.RIN != nil {
		b.RINBand = noise.Band{LowHz: n.Depth.RINBandHz[0], HighHz: n.Depth.RINBandHz[1]}
	}
	switch {
	case n.Drive.PhaseTable != "":
		data, err := sc.ReadFile(n.Drive.PhaseTable)
		if err != nil {
			return mc.Budget{}, fmt.Errorf("scenario %q: noise.drive.phase_table: %w", sc.Name, err)
		}
		t, err := noise.ParsePhaseNoise(bytes.NewReader(data), n.Drive.PhaseTable)
		if err != nil {
			return mc.Budget{}, fmt.Errorf("scenario %q: noise.drive.phase_table: %w", sc.Name, err)
		}
		b.Phase = t
	case n.Drive.PhaseDBcPerHz != 0:
		b.Phase = noise.White{Level: noise.PhaseFromDBc(n.Drive.PhaseDBcPerHz)}
	}
	app, err := sc.Apparatus()
	if err != nil {
		return mc.Budget{}, err
	}
	b.Apparatus = app
	if n.FieldUG2PerHz > 0 {
		b.FieldNoise = noise.White{Level: n.FieldUG2PerHz * 1e-12} // uG^2 -> G^2
	}
	if err := b.Validate(); err != nil {
		return mc.Budget{}, fmt.Errorf("scenario %q: %w", sc.Name, err)
	}
	return b, nil
}

// LoadBudget reads the scenario file at path with its overrides and
// returns it with its simulation configuration and its noise budget.
func LoadBudget(path string, sets []string) (*Scenario, sim.Config, mc.Budget, error) {
	sc, cfg, err := LoadConfig(path, sets)
	if err != nil {
		return nil, sim.Config{}, mc.Budget{}, err
	}
	budget, err := sc.Budget()
	if err != nil {
		return nil, sim.Config{}, mc.Budget{}, err
	}
	return sc, cfg, budget, nil
}

// Fingerprint identifies what a scenario simulates: the effective values
// (after overrides) and the contents of the files it refers to, but not
// where those files are, so that shards run from different directories
// merge. It also returns the canonical text recorded in a run's manifest.
func (sc *Scenario) Fingerprint() (hash, text string, err error) {
	c := *sc
	c.Name = ""
	files := map[string]string{}
	for _, p := range []*string{&c.Ramp.File, &c.Noise.Drive.PhaseTable, &c.Noise.Depth.RINTable} {
		if *p == "" {
			continue
		}
		data, err := sc.ReadFile(*p)
		if err != nil {
			return "", "", err
		}
		sum := sha256.Sum256(data)
		files[*p] = hex.EncodeToString(sum[:])
		*p = "sha256:" + files[*p]
	}
	b, err := json.Marshal(c)
	if err != nil {
		return "", "", err
	}
	sum := sha256.Sum256(b)
	return hex.EncodeToString(sum[:]), string(b), nil
}

// WithTag extends a scenario's fingerprint and text by a tag: what, beside
// the scenario, sets a run's records apart from another's.
func WithTag(hash, text string, tag any) (string, string, error) {
	b, err := json.Marshal(tag)
	if err != nil {
		return "", "", err
	}
	sum := sha256.Sum256([]byte(hash + "\n" + string(b)))
	return hex.EncodeToString(sum[:]), text + "\n" + string(b), nil
}
