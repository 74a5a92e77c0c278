package plots

import (
	"math"
	"strconv"
	"strings"

	"gonum.org/v1/plot"
)

// ticker places ticks (linearTicks, or gonum/plot's LogTicks when log is
// set) and labels them so that the labels of one axis share one notation and
// the fewest decimals that tell them apart.
type ticker struct{ log bool }

func (t ticker) Ticks(min, max float64) []plot.Tick {
	if t.log {
		if ts := logTicks(min, max); len(ts) >= 2 {
			relabel(ts, true)
			return ts
		}
		// A log axis shorter than the step from one mantissa to the next
		// (2e-8 to 2.9e-8) is read on linear ticks.
	}
	ts := linearTicks(min, max)
	relabel(ts, false)
	return ts
}

// logTicks returns the ticks of a log axis on [min, max]: every m 10^k
// (m = 1, ..., 9) inside it, once each, labelled at the powers of ten.
// gonum/plot's LogTicks runs out to whole decades, gives a range inside
// one decade a single tick outside it, and repeats each power of ten.
// With one power of ten inside, the ticks at 1, 2 and 5 times a power of
// ten are labelled as well; with none (or failing two labels), every tick.
func logTicks(min, max float64) []plot.Tick {
	if !(min > 0) || !(max > min) {
		return nil
	}
	var ts []plot.Tick
	for k := int(math.Floor(math.Log10(min))); k <= int(math.Ceil(math.Log10(max))); k++ {
		for m := 1; m <= 9; m++ {
			// Parsed, so that 3e-8 is the float64 nearest 3e-8.
			v, _ := strconv.ParseFloat(strconv.Itoa(m)+"e"+strconv.Itoa(k), 64)
			if v < min*(1-1e-9) || v > max*(1+1e-9) {
				continue
			}
			t := plot.Tick{Value: v}
			if m == 1 {
				t.Label = "x" // replaced by relabel
			}
			ts = append(ts, t)
		}
	}
	marks := []func(m float64) bool{
		func(m float64) bool { return m == 1 || m == 2 || m == 5 },
		func(float64) bool { return true },
	}
	if labelled(ts) == 0 {
		marks = marks[1:] // inside one decade: at most nine labels
	}
	for _, marks := range marks {
		if labelled(ts) >= 2 {
			break
		}
		for i := range ts {
			m := ts[i].Value / math.Pow(10, math.Floor(math.Log10(ts[i].Value)+1e-9))
			if marks(math.Round(m)) {
				ts[i].Label = "x"
			}
		}
	}
	return ts
}

// labelled counts the labelled ticks.
func labelled(ts []plot.Tick) int {
	n := 0
	for _, t := range ts {
		if t.Label != "" {
			n++
		}
	}
	return n
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
	if log {
		// A log axis over many decades ends in labels such as
		// 0.0000000000000000000000001 in fixed notation.
		for _, v := range vs {
			if v != 0 && math.Abs(v) < 1e-3 {
				notation = 'e'
			}
		}
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
