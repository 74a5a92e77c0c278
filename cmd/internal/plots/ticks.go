package plots

import (
	"math"
	"slices"
	"strconv"
	"strings"

	"gonum.org/v1/plot"
)

// ticker places ticks (linearTicks, or gonum/plot's LogTicks when log is
// set) and labels them so that the labels of one axis share one notation and
// the fewest decimals that tell them apart.
type ticker struct{ log bool }

func (t ticker) Ticks(min, max float64) []plot.Tick {
	var ts []plot.Tick
	if t.log {
		// LogTicks runs out to whole decades; ticks outside the axis are
		// not drawn but would widen the labels' precision and space.
		ts = slices.DeleteFunc(plot.LogTicks{}.Ticks(min, max), func(t plot.Tick) bool {
			return t.Value < min*(1-1e-9) || t.Value > max*(1+1e-9)
		})
		labelInnerDecade(ts)
	} else {
		ts = linearTicks(min, max)
	}
	relabel(ts, t.log)
	return ts
}

// linearTicks returns three to seven labelled ticks on [min, max] at multiples
// of the least step of 1, 2, 2.5 or 5 times a power of ten that makes at most
// six intervals, with unlabelled minor ticks between them. gonum/plot's
// DefaultTicks aims at three, too few to read values off a figure.
func linearTicks(min, max float64) []plot.Tick {
	const intervals = 6
	raw := (max - min) / intervals
	mag := math.Pow(10, math.Floor(math.Log10(raw)))
	step, minors := 10*mag, 5
	for _, c := range []struct {
		mult   float64
		minors int
	}{{1, 5}, {2, 4}, {2.5, 5}, {5, 5}} {
		if c.mult*mag >= raw {
			step, minors = c.mult*mag, c.minors
			break
		}
	}
	minor := step / float64(minors)
	var ts []plot.Tick
	for k := math.Ceil(min/minor - 1e-9); k*minor <= max+1e-9*minor; k++ {
		t := plot.Tick{Value: k * minor}
		if math.Mod(k, float64(minors)) == 0 {
			t.Label = "x" // replaced by relabel
		}
		ts = append(ts, t)
	}
	return ts
}

// labelInnerDecade labels every tick of a log axis whose range holds fewer
// than two powers of ten, which would otherwise show one label or none.
func labelInnerDecade(ts []plot.Tick) {
	n := 0
	for _, t := range ts {
		if t.Label != "" {
			n++
		}
	}
	if n >= 2 {
		return
	}
	for i := range ts {
		ts[i].Label = "x" // replaced by relabel
	}
}

// relabel rewrites the labels of the labelled ticks in ts. Fixed notation is
// used while the largest magnitude lies in [1e-3, 1e5), scientific otherwise.
// On a linear axis the precision is the least that reproduces every labelled
// value to within a millionth of the smallest spacing between them, so that
// the labels line up ("0.90", "0.95", "1.00"); on a log axis each label is
// as short as it can be ("0.01", "0.1", "1").
func relabel(ts []plot.Tick, log bool) {
	var vs []float64
	for _, t := range ts {
		if t.Label != "" {
			vs = append(vs, t.Value)
		}
	}
	if len(vs) == 0 {
		return
	}
	big, step := 0.0, math.Inf(1)
	for i, v := range vs {
		big = math.Max(big, math.Abs(v))
		for _, w := range vs[:i] {
			if d := math.Abs(v - w); d > 0 {
				step = math.Min(step, d)
			}
		}
	}
	if math.IsInf(step, 1) {
		step = math.Max(big, 1)
	}
	// Tick arithmetic leaves zero as a round-off residue such as -1.4e-17.
	for i := range ts {
		if math.Abs(ts[i].Value) < 1e-9*step {
			ts[i].Value = 0
		}
	}
	for i := range vs {
		if math.Abs(vs[i]) < 1e-9*step {
			vs[i] = 0
		}
	}
	notation := byte('f')
	if big != 0 && (big < 1e-3 || big >= 1e5) {
		notation = 'e'
	}
	prec := 0
	if log {
		prec = -1
	}
	for ; !log && prec < 15; prec++ {
		if reproduces(vs, notation, prec, 1e-6*step) {
			break
		}
	}
	for i := range ts {
		if ts[i].Label != "" {
			ts[i].Label = formatTick(ts[i].Value, notation, prec)
		}
	}
}

// reproduces reports whether every value in vs, formatted with notation and
// prec, parses back to within tol of itself.
func reproduces(vs []float64, notation byte, prec int, tol float64) bool {
	for _, v := range vs {
		got, err := strconv.ParseFloat(strconv.FormatFloat(v, notation, prec, 64), 64)
		if err != nil || math.Abs(got-v) > tol {
			return false
		}
	}
	return true
}

// formatTick formats v for a tick label: a true minus sign, no negative
// zero, and a short exponent ("2.5e−7" rather than "2.5e-07").
func formatTick(v float64, notation byte, prec int) string {
	s := strconv.FormatFloat(v, notation, prec, 64)
	if notation == 'e' {
		mant, exp, _ := strings.Cut(s, "e")
		sign := ""
		if exp[0] == '-' {
			sign = "-"
		}
		exp = strings.TrimLeft(exp[1:], "0")
		if exp == "" {
			exp = "0"
		}
		s = mant + "e" + sign + exp
		if v == 0 {
			s = "0"
		}
	} else if z, _ := strconv.ParseFloat(s, 64); z == 0 {
		s = strings.TrimPrefix(s, "-")
	}
	return strings.ReplaceAll(s, "-", "\u2212")
}
