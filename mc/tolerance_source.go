package mc

import (
	"fmt"
	"math"
	"strings"

	"rampart/noise"
)

// source is one axis of a tolerance search: the budget with that source at
// search amplitude a (an SI standard deviation for a static source, the rms
// scale of a reference PSD for a noise process, the factor of Budget.Scaled
// for the whole budget), and the unit an engineer buys hardware in.
type source struct {
	name, unit string
	nominal    float64 // the budget's amplitude; 0 if off
	ref        float64 // where the search starts
	max        float64 // the largest amplitude searched; +Inf: none
	set        func(a float64) Budget
	display    func(a float64) float64 // a in unit
	// measure, if set, turns the records of the ensemble at amplitude a
	// (run with seed) into those the requirements judge: the measured
	// signal of the detection axis (SourceDetection).
	measure func(a float64, recs []Record, seed uint64) []Record
}

// newSource returns the search axis of the named source of budget b, the
// others held at their values in b.
func newSource(b Budget, name string) (source, error) {
	if name == SourceBudget {
		return budgetSource(b)
	}
	row, ok := LookupSource(name)
	if !ok {
		return source{}, fmt.Errorf("unknown noise source %q: want one of %s, or %s for the whole budget", name, strings.Join(SourceKeys(), ", "), SourceBudget)
	}
	if row.Kind == Process {
		return psdSource(name, *row.PSD(&b), noise.White{Level: row.FromLevel(row.Ref)}, row.Unit, row.Level,
			func(p noise.PSD) Budget { c := b; *row.PSD(&c) = p; return c }), nil
	}
	s := source{name: name, unit: row.Unit, nominal: *row.Sigma(&b), ref: row.Ref, max: row.Max,
		display: func(a float64) float64 { return row.Scale * a }}
	if s.nominal > 0 {
		s.ref = s.nominal
	}
	s.set = func(a float64) Budget { c := b; *row.Sigma(&c) = a; return c }
	return s, nil
}

// psdSource is the axis of a noise process: the search amplitude a scales
// the rms of the nominal PSD (or of def, a white floor, if the budget has
// none), so the PSD is a^2 S. A white PSD is reported as its level in unit
// (level converts a density to it); a table as the scale factor a.
func psdSource(name string, nominal, def noise.PSD, unit string, level func(float64) float64, set func(noise.PSD) Budget) source {
	s := source{name: name, ref: 1, max: math.Inf(1)}
	base := def
	if nominal != nil {
		s.nominal, base = 1, nominal
	}
	s.set = func(a float64) Budget {
		if a == 0 {
			return set(nil)
		}
		return set(scalePSD(base, a*a))
	}
	if w, ok := base.(noise.White); ok {
		s.unit = unit
		s.display = func(a float64) float64 { return level(a * a * w.Level) }
	} else {
		s.unit = "x rms"
		s.display = func(a float64) float64 { return a }
	}
	return s
}

// budgetSource is the axis of the whole budget scaled by a, up to the scale
// at which the first static source reaches its largest amplitude.
func budgetSource(b Budget) (source, error) {
	s := source{name: SourceBudget, unit: "x budget", nominal: 1, ref: 1, max: math.Inf(1),
		display: func(a float64) float64 { return a }}
	active := b.Dynamic()
	for _, row := range Sources {
		if row.Kind != Static {
			continue
		}
		one, _ := newSource(b, row.Key)
		if one.nominal > 0 {
			active = true
			s.max = math.Min(s.max, one.max/one.nominal)
		}
	}
	if !active {
		return source{}, fmt.Errorf("the budget has no active noise source to scale")
	}
	s.set = func(a float64) Budget {
		c := b.Scaled(a)
		if a == 0 {
			for _, row := range Sources {
				if row.Kind == Process {
					*row.PSD(&c) = nil
				}
			}
		}
		return c
	}
	return s, nil
}

// highest returns the largest amplitude a search of s tries: Range above
// the start, but not beyond the source's largest sensible amplitude unless
// the start already is.
func (s source) highest(o ToleranceOptions) float64 {
	return math.Max(s.ref, math.Min(s.ref*o.Range, s.max))
}
