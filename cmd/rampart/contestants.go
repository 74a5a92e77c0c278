package main

import (
	"encoding/json"
	"fmt"
	"path/filepath"
	"regexp"
	"slices"
	"strconv"
	"strings"

	"rampart/cmd/internal/scenario"
	"rampart/sim"
)

// contestant is one ramp of a ranking and the scenario that runs it.
type contestant struct {
	name string
	spec string // what defined it: a --ramp SPEC or a scenario file
	sc   *scenario.Scenario
	cfg  sim.Config
}

// rampName is what a contestant may be called: its runs are kept in a
// directory of that name.
var rampName = regexp.MustCompile(`^[A-Za-z0-9][A-Za-z0-9._-]*$`)

// contestants returns the ramps to rank: each --ramp NAME=SPEC on the base
// scenario, then, if files are given, the base scenario's own ramp and the
// ramp of each file, named after the files (without .toml). The files must
// agree with the base in everything but [ramp], so that the ramp is all
// that differs.
func contestants(base *scenario.Scenario, baseCfg sim.Config, ramps, files, sets []string) ([]contestant, error) {
	var out []contestant
	seen := map[string]string{}
	add := func(c contestant) error {
		if !rampName.MatchString(c.name) {
			return fmt.Errorf("%s: ramp name %q: want letters, digits, '.', '_' and '-' only, starting with a letter or digit", c.spec, c.name)
		}
		if prev, ok := seen[c.name]; ok {
			return fmt.Errorf("%s: the name %q is taken by %s: give each ramp its own name", c.spec, c.name, prev)
		}
		seen[c.name] = c.spec
		out = append(out, c)
		return nil
	}
	for _, arg := range ramps {
		name, spec, ok := strings.Cut(arg, "=")
		if !ok {
			return nil, fmt.Errorf("--ramp %s: want NAME=SPEC, such as fast=inverse or opt=file:opt.csv", arg)
		}
		sc, cfg, err := rampVariant(base, baseCfg, spec)
		if err != nil {
			return nil, fmt.Errorf("--ramp %s: %w", arg, err)
		}
		if err := add(contestant{name: name, spec: "--ramp " + arg, sc: sc, cfg: cfg}); err != nil {
			return nil, err
		}
	}
	if len(files) > 0 {
		if err := add(contestant{name: stem(base.Name), spec: base.Name, sc: base, cfg: baseCfg}); err != nil {
			return nil, err
		}
	}
	for _, f := range files {
		sc, cfg, err := loadScenario(f, sets)
		if err != nil {
			return nil, err
		}
		if err := sameButRamp(base, sc); err != nil {
			return nil, err
		}
		if err := add(contestant{name: stem(f), spec: f, sc: sc, cfg: cfg}); err != nil {
			return nil, err
		}
	}
	if len(out) < 2 {
		return nil, fmt.Errorf("%d ramp to rank: give at least two, as --ramp NAME=SPEC or as scenario files after the flags", len(out))
	}
	return out, nil
}

// rampSpecs are the accepted forms of a --ramp SPEC, for messages.
const rampSpecs = "sin2, minjerk, inverse, inverse:DESIGN_KHZ or file:PATH"

// rampVariant returns the base scenario with the ramp-up of spec: a shape
// (sin2, minjerk, inverse) of the base ramp's duration, the inverse ramp
// designed for another depth (inverse:DESIGN_KHZ), or a ramp file
// (file:PATH, relative to the current directory) of its own duration.
func rampVariant(base *scenario.Scenario, baseCfg sim.Config, spec string) (*scenario.Scenario, sim.Config, error) {
	r := scenario.Ramp{DurationUS: baseCfg.Sequence.Up.Duration() * 1e6}
	kind, arg, hasArg := strings.Cut(spec, ":")
	switch {
	case kind == "file" && hasArg && arg != "":
		r = scenario.Ramp{Shape: "file", File: arg}
	case kind == "inverse" && hasArg:
		khz, err := strconv.ParseFloat(arg, 64)
		if err != nil || !(khz > 0) || khz > 1e9 {
			return nil, sim.Config{}, fmt.Errorf("design depth %q: want a depth V0/h in kHz > 0, as in inverse:18", arg)
		}
		r.Shape, r.DesignDepthKHz = "inverse", khz
	case !hasArg && (kind == "sin2" || kind == "minjerk" || kind == "inverse"):
		r.Shape = kind
	default:
		return nil, sim.Config{}, fmt.Errorf("ramp %q: want %s", spec, rampSpecs)
	}
	sc := *base
	sc.Ramp = r
	cfg, err := sc.Config()
	if err != nil {
		return nil, sim.Config{}, err
	}
	return &sc, cfg, nil
}

// sameButRamp checks that scenario b differs from a at most in [ramp].
func sameButRamp(a, b *scenario.Scenario) error {
	tables := func(sc *scenario.Scenario) (map[string]json.RawMessage, error) {
		c := *sc
		c.Ramp = scenario.Ramp{}
		_, text, err := c.Fingerprint()
		if err != nil {
			return nil, err
		}
		var m map[string]json.RawMessage
		return m, json.Unmarshal([]byte(text), &m)
	}
	ta, err := tables(a)
	if err != nil {
		return err
	}
	tb, err := tables(b)
	if err != nil {
		return err
	}
	var diff []string
	for k, v := range ta {
		if string(tb[k]) != string(v) {
			diff = append(diff, "["+strings.ToLower(k)+"]")
		}
	}
	if len(diff) > 0 {
		slices.Sort(diff)
		return fmt.Errorf("scenario %q differs from %q in %s: the ramps are ranked on one scenario, so the files may differ in [ramp] only", b.Name, a.Name, strings.Join(diff, ", "))
	}
	return nil
}

// stem is a file's name without its directory and extension.
func stem(path string) string {
	base := filepath.Base(path)
	return strings.TrimSuffix(base, filepath.Ext(base))
}
