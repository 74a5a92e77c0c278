package design

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"rampart/internal/plural"
)

// Axis is one scanned scenario key and the values it takes, in the key's
// file unit.
type Axis struct {
	Key    string
	Values []float64
}

// MaxPoints bounds the points of a scan (all axes together), so that a typo
// cannot ask for an endless run.
const MaxPoints = 10000

// ParseAxis reads an axis from its command-line form:
//
//	KEY=FROM:TO:N   N values evenly spaced from FROM to TO, both included
//	KEY=V1,V2,...   the values listed
//
// such as "ramp.duration_us=50:300:11" or "lattice.depth_khz=10,15,20".
// The key itself is checked by the scenario when a point is loaded.
func ParseAxis(s string) (Axis, error) {
	key, spec, ok := strings.Cut(s, "=")
	key = strings.TrimSpace(key)
	if !ok || key == "" || strings.TrimSpace(spec) == "" {
		return Axis{}, fmt.Errorf("axis %q: want KEY=FROM:TO:N or KEY=V1,V2,... such as ramp.duration_us=50:300:11", s)
	}
	if strings.Contains(spec, ":") {
		parts := strings.Split(spec, ":")
		if len(parts) != 3 {
			return Axis{}, fmt.Errorf("axis %q: range %q has %s: want FROM:TO:N", s, spec, plural.Count(len(parts), "part"))
		}
		from, err1 := parseFinite(parts[0])
		to, err2 := parseFinite(parts[1])
		n, err3 := strconv.Atoi(strings.TrimSpace(parts[2]))
		switch {
		case err1 != nil:
			return Axis{}, fmt.Errorf("axis %q: FROM %w", s, err1)
		case err2 != nil:
			return Axis{}, fmt.Errorf("axis %q: TO %w", s, err2)
		case err3 != nil || n < 2 || n > MaxPoints:
			return Axis{}, fmt.Errorf("axis %q: N %q is not a count from 2 to %d", s, parts[2], MaxPoints)
		case from == to:
			return Axis{}, fmt.Errorf("axis %q: FROM and TO are both %g: want a range, or list one value", s, from)
		}
		return Axis{Key: key, Values: Linspace(from, to, n)}, nil
	}
	var vs []float64
	for _, f := range strings.Split(spec, ",") {
		v, err := parseFinite(f)
		if err != nil {
			return Axis{}, fmt.Errorf("axis %q: value %w", s, err)
		}
		vs = append(vs, v)
	}
	if len(vs) > MaxPoints {
		return Axis{}, fmt.Errorf("axis %q: %d values, more than %d", s, len(vs), MaxPoints)
	}
	return Axis{Key: key, Values: vs}, nil
}

func parseFinite(s string) (float64, error) {
	v, err := strconv.ParseFloat(strings.TrimSpace(s), 64)
	if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
		return 0, fmt.Errorf("%q is not a finite number", s)
	}
	return v, nil
}

// Linspace returns n >= 2 values evenly spaced from a to b, both included
// (the last is b exactly).
func Linspace(a, b float64, n int) []float64 {
	if n < 2 {
		panic("design: Linspace of fewer than 2 values")
	}
	vs := make([]float64, n)
	for i := range vs {
		vs[i] = a + (b-a)*float64(i)/float64(n-1)
	}
	vs[n-1] = b
	return vs
}

// Point is one point of a scan: a value per axis and the scenario overrides
// that set them.
type Point struct {
	Values []float64
	Sets   []string
}

// Grid returns the points of the axes' Cartesian product, the last axis
// varying fastest (so for two axes, point i*len(y)+j is (x_i, y_j)). It
// returns an error for no axis, a key given twice, or more than MaxPoints
// points.
func Grid(axes []Axis) ([]Point, error) {
	if len(axes) == 0 {
		return nil, fmt.Errorf("no axis to scan: give a key and its values")
	}
	n := 1
	seen := map[string]bool{}
	for _, a := range axes {
		if seen[a.Key] {
			return nil, fmt.Errorf("key %s scanned twice: give each key one axis", a.Key)
		}
		seen[a.Key] = true
		if len(a.Values) == 0 {
			return nil, fmt.Errorf("key %s has no values", a.Key)
		}
		if n *= len(a.Values); n > MaxPoints {
			return nil, fmt.Errorf("the axes span more than %d points: scan fewer values", MaxPoints)
		}
	}
	pts := make([]Point, n)
	for i := range pts {
		rest := i
		vals := make([]float64, len(axes))
		sets := make([]string, len(axes))
		for k := len(axes) - 1; k >= 0; k-- {
			a := axes[k]
			vals[k] = a.Values[rest%len(a.Values)]
			rest /= len(a.Values)
			sets[k] = Set(a.Key, vals[k])
		}
		pts[i] = Point{Values: vals, Sets: sets}
	}
	return pts, nil
}

// Set returns the scenario override that gives key the value v, written
// with the shortest decimal that reads back as v.
func Set(key string, v float64) string {
	return key + "=" + strconv.FormatFloat(v, 'g', -1, 64)
}
