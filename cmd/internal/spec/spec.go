package spec

import (
	"errors"
	"fmt"
	"io/fs"
	"math"
	"rampart/internal/boundedread"
	"rampart/internal/tomlguard"
	"rampart/internal/tomlpos"
	"strconv"
	"strings"

	"github.com/BurntSushi/toml"

	"rampart/mc"
)

// Error is a problem with a spec file: a TOML syntax error, an unknown key,
// a wrong type, a value out of range or keys that do not fit together.
type Error struct {
	File string // the spec file as named by the caller
	Line int    // line of the offending key, 0 if the decoder does not give one
	Key  string // dotted key such as "contrast.p05_min"; empty for the file as a whole
	Err  error  // what is wrong and what would be accepted
}

func (e *Error) Error() string {
	where := fmt.Sprintf("spec %q", e.File)
	if e.Line > 0 {
		where += fmt.Sprintf(" line %d", e.Line)
	}
	return where + ": " + e.Err.Error()
}

func (e *Error) Unwrap() error { return e.Err }

// key is one number of the spec file, with its accepted range.
type key struct {
	name    string
	lo, hi  float64 // the accepted range
	loOpen  bool    // lo itself is not accepted
	hiOpen  bool
	meaning string
	set     func(*mc.Requirements, float64)
}

// want says what the key accepts: "a number in (0, 1] for the least mean
// contrast".
func (k key) want() string {
	l, r := "[", "]"
	if k.loOpen {
		l = "("
	}
	if k.hiOpen {
		r = ")"
	}
	hi := strconv.FormatFloat(k.hi, 'g', 6, 64)
	if math.IsInf(k.hi, 1) {
		return fmt.Sprintf("a finite number > %g for %s", k.lo, k.meaning)
	}
	if k.hi == math.Pi {
		hi = "pi"
	}
	return fmt.Sprintf("a number in %s%g, %s%s for %s", l, k.lo, hi, r, k.meaning)
}

func (k key) ok(x float64) bool {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return false
	}
	return (x > k.lo || !k.loOpen && x == k.lo) && (x < k.hi || !k.hiOpen && x == k.hi)
}

var keys = []key{
	{"confidence", 0.5, 1, true, true, "the one-sided confidence of every verdict",
		func(r *mc.Requirements, x float64) { r.Confidence = x }},
	{"contrast.mean_min", 0, 1, true, false, "the least mean contrast",
		func(r *mc.Requirements, x float64) { r.ContrastMeanMin = x }},
	{"contrast.p05_min", 0, 1, true, false, "the least 5th-percentile contrast",
		func(r *mc.Requirements, x float64) { r.ContrastP05Min = x }},
	{"bias.abs_p95_max_rad", 0, math.Pi, true, false, "the largest 95th percentile of |bias| in rad",
		func(r *mc.Requirements, x float64) { r.AbsBiasP95MaxRad = x }},
	{"bias.abs_p95_max_deg_per_h", 0, math.Inf(1), true, true, "the largest 95th percentile of |bias| as a rotation rate in deg/h",
		func(r *mc.Requirements, x float64) { r.AbsBiasP95MaxDegPerH = x }},
	{"scale_factor.abs_p95_max_ppm", 0, math.Inf(1), true, true, "the largest 95th percentile of the scale-factor error |K_shot / K - 1| in ppm",
		func(r *mc.Requirements, x float64) { r.AbsScaleFactorP95MaxPPM = x }},
	{"yield.min", 0, 1, true, true, "the least fraction of realisations inside the yield limits",
		func(r *mc.Requirements, x float64) { r.YieldMin = x }},
	{"yield.contrast_min", 0, 1, true, false, "the least contrast of a realisation inside the yield",
		func(r *mc.Requirements, x float64) { r.Yield.MinContrast = x }},
	{"yield.bias_max_rad", 0, math.Pi, true, false, "the largest |bias| in rad of a realisation inside the yield",
		func(r *mc.Requirements, x float64) { r.Yield.MaxAbsBiasRad = x }},
}

var tables = []string{"contrast", "bias", "scale_factor", "yield"}

func keyNamed(name string) (key, bool) {
	for _, k := range keys {
		if k.name == name {
			return k, true
		}
	}
	return key{}, false
}

// keysOf lists the keys of a table ("" for the top level) for messages.
func keysOf(table string) string {
	var out []string
	for _, k := range keys {
		t, leaf, ok := strings.Cut(k.name, ".")
		switch {
		case table == "" && !ok:
			out = append(out, k.name)
		case ok && t == table:
			out = append(out, leaf)
		}
	}
	if table == "" {
		for _, t := range tables {
			out = append(out, "["+t+"]")
		}
	}
	return strings.Join(out, ", ")
}

// Read reads the spec file at path.
func Read(path string) (mc.Requirements, error) {
	data, err := boundedread.ReadFile(path, boundedread.TextCap)
	if err != nil {
		var pe *fs.PathError
		if errors.As(err, &pe) {
			err = fmt.Errorf("cannot read the spec file (--spec; a TOML file of [contrast], [bias], [yield] or [scale_factor] criteria, README: Spec reference): %w", pe.Err)
		}
		return mc.Requirements{}, &Error{File: path, Err: err}
	}
	return Parse(path, data)
}

// Parse reads a spec from data; name is the file's name for messages.
func Parse(name string, data []byte) (mc.Requirements, error) {
	p := parser{name: name, data: data}
	if err := tomlguard.Check(data); err != nil {
		ge := err.(*tomlguard.Error)
		return mc.Requirements{}, &Error{File: name, Line: ge.Line, Err: errors.New(ge.Msg)}
	}
	var raw map[string]any
	md, err := toml.Decode(string(data), &raw)
	if err != nil {
		var pe toml.ParseError
		if errors.As(err, &pe) {
			return mc.Requirements{}, &Error{File: name, Line: tomlpos.ErrorLine(data, pe.Position), Err: fmt.Errorf("not valid TOML: %s", boundedread.Excerpt(pe.Message, 80))}
		}
		return mc.Requirements{}, &Error{File: name, Err: fmt.Errorf("not valid TOML: %w", err)}
	}
	p.md = md
	req := mc.Requirements{Confidence: mc.DefaultConfidence}
	given := map[string]bool{}
	for _, path := range md.Keys() {
		dotted := strings.Join(path, ".")
		// Unknown names are file content: messages quote only an excerpt.
		shown, top := boundedread.Excerpt(dotted, 80), boundedread.Excerpt(path[0], 80)
		v := tomlpos.Lookup(raw, path)
		fail := func(format string, a ...any) error {
			return &Error{File: name, Line: tomlpos.Line(p.data, p.md, path), Key: dotted, Err: fmt.Errorf(format, a...)}
		}
		if len(path) == 1 && isTable(path[0]) {
			if _, ok := v.(map[string]any); !ok {
				return mc.Requirements{}, fail("%s must be a table [%s] of %s, got %s", shown, shown, keysOf(dotted), tomlpos.TypeName(v))
			}
			continue
		}
		k, known := keyNamed(dotted)
		if !known {
			_, isMap := v.(map[string]any)
			switch {
			case len(path) == 1 && isMap:
				return mc.Requirements{}, fail("unknown table [%s]: a spec holds %s", shown, keysOf(""))
			case len(path) == 1:
				return mc.Requirements{}, fail("unknown key %s: a spec holds %s", shown, keysOf(""))
			case !isTable(path[0]):
				return mc.Requirements{}, fail("unknown table [%s]: a spec holds %s", top, keysOf(""))
			case isMap:
				return mc.Requirements{}, fail("unknown table [%s]: [%s] takes %s", shown, top, keysOf(path[0]))
			}
			return mc.Requirements{}, fail("unknown key %s: [%s] takes %s", shown, top, keysOf(path[0]))
		}
		var x float64
		switch n := v.(type) {
		case int64:
			x = float64(n)
		case float64:
			x = n
		default:
			return mc.Requirements{}, fail("%s = %s: want %s, got %s", shown, tomlpos.Show(v), k.want(), tomlpos.TypeName(v))
		}
		if !k.ok(x) {
			return mc.Requirements{}, fail("%s = %s is out of range: want %s", shown, tomlpos.Show(v), k.want())
		}
		k.set(&req, x)
		given[dotted] = true
	}
	if err := p.check(req, given); err != nil {
		return mc.Requirements{}, err
	}
	if err := req.Validate(); err != nil {
		return mc.Requirements{}, &Error{File: name, Err: err}
	}
	return req, nil
}

type parser struct {
	name string
	data []byte
	md   toml.MetaData
}

// check tests what single keys cannot: that there is a criterion, and that
// the yield's keys come together.
func (p parser) check(req mc.Requirements, given map[string]bool) error {
	fail := func(dotted, format string, a ...any) error {
		return &Error{File: p.name, Line: tomlpos.Line(p.data, p.md, strings.Split(dotted, ".")), Key: dotted, Err: fmt.Errorf(format, a...)}
	}
	limits := given["yield.contrast_min"] || given["yield.bias_max_rad"]
	switch {
	case given["yield.min"] && !limits:
		return fail("yield.min", "yield.min needs yield.contrast_min or yield.bias_max_rad, the limits a realisation must meet to count towards the yield")
	case limits && !given["yield.min"]:
		k := "yield.contrast_min"
		if !given[k] {
			k = "yield.bias_max_rad"
		}
		return fail(k, "%s is given without yield.min: want yield.min, the least fraction of realisations inside the yield limits, in (0, 1)", k)
	}
	for _, k := range []string{"contrast.mean_min", "contrast.p05_min", "bias.abs_p95_max_rad", "bias.abs_p95_max_deg_per_h", "scale_factor.abs_p95_max_ppm", "yield.min"} {
		if given[k] {
			return nil
		}
	}
	return &Error{File: p.name, Err: fmt.Errorf("no criterion: give at least one of contrast.mean_min, contrast.p05_min, bias.abs_p95_max_rad, bias.abs_p95_max_deg_per_h, scale_factor.abs_p95_max_ppm or yield.min")}
}

func isTable(name string) bool {
	for _, t := range tables {
		if t == name {
			return true
		}
	}
	return false
}
