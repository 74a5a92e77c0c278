package main

import (
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"fmt"

	"rampart/cmd/internal/scenario"
	"rampart/mc"
	"rampart/noise"
)

// budgetOf converts a scenario's [noise.*] tables (file units) to the
// Monte Carlo noise budget (SI units).
func budgetOf(sc *scenario.Scenario) (mc.Budget, error) {
	n := sc.Noise
	b := mc.Budget{
		DepthCommonRel:       n.Depth.CommonRel,
		DepthDifferentialRel: n.Depth.DifferentialRel,
		ClockRel:             n.Timing.ClockPPM * 1e-6,
		SpeedRel:             n.Timing.SpeedPPM * 1e-6,
		SkewS:                n.Timing.SkewNS * 1e-9,
		TemperatureSpreadK:   n.Temperature.SpreadNK * 1e-9,
		PulseAreaRel:         n.Pulses.AreaRel,
		PhaseCorrelation:     n.Drive.Correlation,
	}
	if n.Depth.RINDBPerHz != 0 {
		b.RIN = noise.White{Level: noise.IntensityFromRIN(n.Depth.RINDBPerHz)}
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
	if err := b.Validate(); err != nil {
		return mc.Budget{}, fmt.Errorf("scenario %q: %w", sc.Name, err)
	}
	return b, nil
}

// fingerprint identifies what a scenario simulates: the effective values
// (after overrides) and the contents of the files it refers to, but not
// where those files are, so that shards run from different directories
// merge. It also returns the canonical text recorded in a run's manifest.
func fingerprint(sc *scenario.Scenario) (hash, text string, err error) {
	c := *sc
	c.Name = ""
	files := map[string]string{}
	for _, p := range []*string{&c.Ramp.File, &c.Noise.Drive.PhaseTable} {
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

// withTag extends a scenario's fingerprint and text by a tag: what, beside
// the scenario, sets a run's records apart from another's.
func withTag(hash, text string, tag any) (string, string, error) {
	b, err := json.Marshal(tag)
	if err != nil {
		return "", "", err
	}
	sum := sha256.Sum256([]byte(hash + "\n" + string(b)))
	return hex.EncodeToString(sum[:]), text + "\n" + string(b), nil
}
