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
	b.FieldNoise = fieldPSD(n)
	if n.RotationURad2S2PerHz > 0 {
		b.RotationNoise = noise.White{Level: mc.RotationNoiseFromURad2S2Hz(n.RotationURad2S2PerHz)}
	}
	mains, err := sc.mains(b.MainsG)
	if err != nil {
		return mc.Budget{}, fmt.Errorf("scenario %q: %w", sc.Name, err)
	}
	b.Mains = mains
	if err := b.Validate(); err != nil {
		return mc.Budget{}, fmt.Errorf("scenario %q: %w", sc.Name, err)
	}
	if err := sc.checkDraws(b); err != nil {
		return mc.Budget{}, fmt.Errorf("scenario %q: %w", sc.Name, err)
	}
	return b, nil
}

// checkDraws refuses amplitudes whose mc.DrawSigmas-sigma draws are
// unphysical: a negative lattice depth, 1 + eps_common - |eps_diff|/2 < 0
// (docs/model.md, Perturbations), and a temperature spread above the start
// temperature, which would clamp more than one draw in six at 0 K. Smaller
// spreads can still draw below 0 K (beyond T/sigma standard deviations);
// those draws are clamped at 0 K, as the header of an ensemble says.
func (sc *Scenario) checkDraws(b mc.Budget) error {
	if worst := mc.DrawSigmas * (b.DepthCommonRel + b.DepthDifferentialRel/2); worst >= 1 {
		return fmt.Errorf("noise.depth.common_rel = %g with differential_rel = %g: a %d-sigma draw makes a lattice depth negative (1 - %.3g < 0); want common_rel + differential_rel/2 below %g",
			b.DepthCommonRel, b.DepthDifferentialRel, mc.DrawSigmas, worst, 1.0/mc.DrawSigmas)
	}
	if t, spread := sc.Start.TemperatureNK, sc.Noise.Temperature.SpreadNK; spread > 0 && t == 0 {
		return fmt.Errorf("noise.temperature.spread_nk = %g with a ground-state start (start.temperature_nk = 0): half the draws would be below 0 K; set start.temperature_nk to the mean temperature, at least the spread", spread)
	} else if spread > t {
		return fmt.Errorf("noise.temperature.spread_nk = %g is above the start temperature start.temperature_nk = %g: more than one draw in six would be below 0 K and clamped there; want a spread of at most %g nK",
			spread, t, t)
	}
	return nil
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
	c, err := sc.canonical()
	if err != nil {
		return "", "", err
	}
	b, err := json.Marshal(c)
	if err != nil {
		return "", "", err
	}
	sum := sha256.Sum256(b)
	return hex.EncodeToString(sum[:]), string(b), nil
}

// canonical returns the scenario as its fingerprint sees it: without its
// name, each file it refers to replaced by the SHA-256 of its contents.
func (sc *Scenario) canonical() (Scenario, error) {
	c := *sc
	c.Name = ""
	for _, p := range []*string{&c.Ramp.File, &c.Ramp.DownFile, &c.Noise.Drive.PhaseTable, &c.Noise.Depth.RINTable} {
		if *p == "" {
			continue
		}
		data, err := sc.ReadFile(*p)
		if err != nil {
			return Scenario{}, err
		}
		sum := sha256.Sum256(data)
		*p = "sha256:" + hex.EncodeToString(sum[:])
	}
	return c, nil
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

// mains returns the shape of the mains line of fundamental amplitude a
// (G): its harmonics relative to the fundamental, so that a tolerance
// search scales them with it.
func (sc *Scenario) mains(a float64) (mc.Mains, error) {
	m := sc.Noise.Mains
	out := mc.Mains{Hz: m.Hz, FixedPhase: m.Phase == "fixed", PhaseRad: m.PhaseRad}
	if m.H2UG > 0 || m.H3UG > 0 {
		if a == 0 {
			return mc.Mains{}, fmt.Errorf("noise.field.mains_h2_ug = %g, mains_h3_ug = %g: harmonics need the fundamental noise.field.mains_ug > 0", m.H2UG, m.H3UG)
		}
		out.HarmonicsRel = []float64{m.H2UG * 1e-6 / a, m.H3UG * 1e-6 / a}
	}
	return out, nil
}

// fieldPSD returns the field's PSD during the shot in G^2/Hz, the IEEE Std
// 1139 power-law form
//
//	S_B(f) = h_0 + h_-1 / f + h_-2 / f^2
//
// from noise_ug2_hz, flicker_ug2 and random_walk_ug2_hz (uG^2 -> G^2),
// nil if all are zero; a single term is that term alone.
func fieldPSD(n Noise) noise.PSD {
	const g2 = 1e-12 // uG^2 -> G^2
	var terms noise.Sum
	if n.FieldUG2PerHz > 0 {
		terms = append(terms, noise.White{Level: n.FieldUG2PerHz * g2})
	}
	if n.FieldFlickerUG2 > 0 {
		terms = append(terms, noise.PowerLaw{H: n.FieldFlickerUG2 * g2, Alpha: -1})
	}
	if n.FieldRandomWalkUG2Hz > 0 {
		terms = append(terms, noise.PowerLaw{H: n.FieldRandomWalkUG2Hz * g2, Alpha: -2})
	}
	switch len(terms) {
	case 0:
		return nil
	case 1:
		return terms[0]
	}
	return terms
}
