package scenario

import (
	"fmt"
	"path/filepath"
	"reflect"
	"regexp"
	"slices"
	"strconv"
	"strings"

	"rampart/internal/plural"
	"rampart/sim"
)

// Contestant is one ramp of a ranking and the scenario that runs it.
type Contestant struct {
	Name     string
	Spec     string // what defined it: a --ramp SPEC or a scenario file
	Scenario *Scenario
	Config   sim.Config
}

// rampName is what a contestant may be called: its runs are kept in a
// directory of that name.
var rampName = regexp.MustCompile(`^[A-Za-z0-9][A-Za-z0-9._-]*$`)

// Contestants returns the ramps to rank: each --ramp NAME=SPEC on the base
// scenario, then, if files are given, the base scenario's own ramp and the
// ramp of each file, named after the files (without .toml). The files must
// agree with the base in everything but [ramp], so that the ramp is all
// that differs.
func Contestants(base *Scenario, baseCfg sim.Config, ramps, files, sets []string) ([]Contestant, error) {
	var out []Contestant
	seen := map[string]string{}
	add := func(c Contestant) error {
		if !rampName.MatchString(c.Name) {
			return fmt.Errorf("%s: ramp name %q: want letters, digits, '.', '_' and '-' only, starting with a letter or digit", c.Spec, c.Name)
		}
		if prev, ok := seen[c.Name]; ok {
			return fmt.Errorf("%s: the name %q is taken by %s: give each ramp its own name", c.Spec, c.Name, prev)
		}
		seen[c.Name] = c.Spec
		out = append(out, c)
		return nil
	}
	for _, arg := range ramps {
		name, spec, ok := strings.Cut(arg, "=")
		if !ok {
			return nil, fmt.Errorf("--ramp %s: want NAME=SPEC, such as fast=inverse or opt=file:opt.csv", arg)
		}
		sc, cfg, err := RampVariant(base, baseCfg, spec)
		if err != nil {
			return nil, fmt.Errorf("--ramp %s: %w", arg, err)
		}
		if err := add(Contestant{Name: name, Spec: "--ramp " + arg, Scenario: sc, Config: cfg}); err != nil {
			return nil, err
		}
	}
	if len(files) > 0 {
		if err := add(Contestant{Name: stem(base.Name), Spec: base.Name, Scenario: base, Config: baseCfg}); err != nil {
			return nil, err
		}
	}
	for _, f := range files {
		sc, cfg, err := LoadConfig(f, sets)
		if err != nil {
			return nil, err
		}
		if err := sameButRamp(base, sc); err != nil {
			return nil, err
		}
		if err := add(Contestant{Name: stem(f), Spec: f, Scenario: sc, Config: cfg}); err != nil {
			return nil, err
		}
	}
	if len(out) < 2 {
		return nil, fmt.Errorf("%s to rank: give at least two, as --ramp NAME=SPEC or as scenario files after the flags", plural.Count(len(out), "ramp"))
	}
	return out, nil
}

// RampSpecs are the accepted forms of a --ramp SPEC, for help and
// messages: the registered shapes (sim.Shapes), a designed shape with its
// design depth, or a ramp file.
var RampSpecs = rampSpecs()

func rampSpecs() string {
	var forms []string
	for _, s := range sim.Shapes {
		forms = append(forms, s.Name)
		if s.Designed {
			forms = append(forms, s.Name+":DESIGN_KHZ")
		}
	}
	return strings.Join(forms, ", ") + " or file:PATH"
}

// RampVariant returns the base scenario with the ramp-up of spec: a shape
// (sin2, minjerk, inverse) of the base ramp's duration, the inverse ramp
// designed for another depth (inverse:DESIGN_KHZ), or a ramp file
// (file:PATH, relative to the current directory) of its own duration.
func RampVariant(base *Scenario, baseCfg sim.Config, spec string) (*Scenario, sim.Config, error) {
	r := Ramp{DurationUS: baseCfg.Sequence.Up.Duration() * 1e6}
	kind, arg, hasArg := strings.Cut(spec, ":")
	switch {
	case kind == "file" && hasArg && arg != "":
		r = Ramp{Shape: "file", File: arg}
	case designed(kind) && hasArg:
		khz, err := strconv.ParseFloat(arg, 64)
		if err != nil || !(khz > 0) || khz > 1e9 {
			return nil, sim.Config{}, fmt.Errorf("design depth %q: want a depth V0/h in kHz > 0, as in %s:18", arg, kind)
		}
		r.Shape, r.DesignDepthKHz = kind, khz
	case !hasArg && slices.Contains(sim.ShapeNames(), kind):
		r.Shape = kind
	default:
		return nil, sim.Config{}, fmt.Errorf("ramp %q: want %s", spec, RampSpecs)
	}
	sc := *base
	sc.Ramp = r
	cfg, kerr := sc.config()
	if kerr != nil {
		if strings.HasPrefix(kerr.key, "ramp.") {
			// The ramp came from spec, not from the scenario file: the
			// caller names the flag.
			return nil, sim.Config{}, kerr.err
		}
		return nil, sim.Config{}, &Error{File: sc.Name, Key: kerr.key, Err: kerr.err}
	}
	return &sc, cfg, nil
}

// designedShapes returns the names of the registered shapes with a design
// depth.
func designedShapes() []string {
	var out []string
	for _, s := range sim.Shapes {
		if s.Designed {
			out = append(out, s.Name)
		}
	}
	return out
}

// designed reports whether kind is a registered shape with a design depth.
func designed(kind string) bool {
	s, err := sim.LookupShape(kind)
	return err == nil && s.Designed
}

// sameButRamp checks that scenario b differs from a at most in [ramp]
// (the files it refers to compared by their contents), and names the keys
// in which it differs.
func sameButRamp(a, b *Scenario) error {
	ca, err := a.canonical()
	if err != nil {
		return err
	}
	cb, err := b.canonical()
	if err != nil {
		return err
	}
	ca.Ramp, cb.Ramp = Ramp{}, Ramp{}
	diff := differingKeys(&ca, &cb)
	if len(diff) == 0 && !reflect.DeepEqual(ca, cb) {
		// Every value of a scenario has a key (TestKeysCoverScenario), so
		// this is not reached; should a field lack one, still refuse.
		diff = []string{"a value without a key"}
	}
	if len(diff) > 0 {
		return fmt.Errorf("scenario %q differs from %q in %s: the ramps are ranked on one scenario, so the files may differ in [ramp] only", b.Name, a.Name, strings.Join(diff, ", "))
	}
	return nil
}

// differingKeys returns the keys outside [ramp] whose values differ
// between a and b, in schema order.
func differingKeys(a, b *Scenario) []string {
	var out []string
	for _, k := range keys {
		if k.table() == "ramp" {
			continue
		}
		if !reflect.DeepEqual(k.value(a), k.value(b)) {
			out = append(out, k.name)
		}
	}
	return out
}

// stem is a file's name without its directory and extension.
func stem(path string) string {
	base := filepath.Base(path)
	return strings.TrimSuffix(base, filepath.Ext(base))
}

// LoadConfig reads the scenario file at path with its overrides and
// returns it with its simulation configuration.
func LoadConfig(path string, sets []string) (*Scenario, sim.Config, error) {
	sc, err := Load(path, sets)
	if err != nil {
		return nil, sim.Config{}, err
	}
	cfg, err := sc.Config()
	if err != nil {
		return nil, sim.Config{}, err
	}
	return sc, cfg, nil
}
