package mc

import (
	"fmt"
	"strconv"
	"strings"
)

// Record is the outcome of one realisation with the inputs it drew.
type Record struct {
	Index    int
	Inputs   []float64  // static parameters, in the order of Budget.Params
	RINRms   float64    // rms of the synthesised relative intensity noise
	PhaseRms [2]float64 // rms of each arm's synthesised drive phase noise, rad
	Contrast float64
	PhaseRad float64
	BiasRad  float64
	Z        complex128
	Ground   [2]float64 // each arm's ground-band population after the ramp-up
}

// Columns returns the CSV header of records of an ensemble with the given
// static parameters and noise sources.
func Columns(params []Param, rin, phase bool) []string {
	cols := []string{"index"}
	for _, p := range params {
		cols = append(cols, p.Name)
	}
	if rin {
		cols = append(cols, "rin_rms_rel")
	}
	if phase {
		cols = append(cols, "phase_rms_plus_rad", "phase_rms_minus_rad")
	}
	return append(cols, "contrast", "phase_rad", "bias_rad", "z_re", "z_im", "ground_plus", "ground_minus")
}

// format writes rec as one CSV row. Floats use the shortest representation
// that reads back to the same bits, so a row read from disk reproduces the
// record exactly (which makes resumed and merged runs byte-identical).
func (rec Record) format(rin, phase bool) string {
	var b strings.Builder
	b.WriteString(strconv.Itoa(rec.Index))
	put := func(x float64) {
		b.WriteByte(',')
		b.WriteString(strconv.FormatFloat(x, 'g', -1, 64))
	}
	for _, x := range rec.Inputs {
		put(x)
	}
	if rin {
		put(rec.RINRms)
	}
	if phase {
		put(rec.PhaseRms[0])
		put(rec.PhaseRms[1])
	}
	for _, x := range []float64{rec.Contrast, rec.PhaseRad, rec.BiasRad, real(rec.Z), imag(rec.Z), rec.Ground[0], rec.Ground[1]} {
		put(x)
	}
	b.WriteByte('\n')
	return b.String()
}

// parseRecord reads a row written by format.
func parseRecord(line string, nInputs int, rin, phase bool) (Record, error) {
	f := strings.Split(strings.TrimRight(line, "\r\n"), ",")
	want := 1 + nInputs + 7
	if rin {
		want++
	}
	if phase {
		want += 2
	}
	if len(f) != want {
		return Record{}, fmt.Errorf("%d fields, want %d", len(f), want)
	}
	idx, err := strconv.Atoi(f[0])
	if err != nil || idx < 0 {
		return Record{}, fmt.Errorf("index %q is not a non-negative integer", f[0])
	}
	v := make([]float64, len(f)-1)
	for i, s := range f[1:] {
		if v[i], err = strconv.ParseFloat(s, 64); err != nil {
			return Record{}, fmt.Errorf("field %d: %q is not a number", i+2, s)
		}
	}
	rec := Record{Index: idx, Inputs: append([]float64(nil), v[:nInputs]...)}
	v = v[nInputs:]
	if rin {
		rec.RINRms, v = v[0], v[1:]
	}
	if phase {
		rec.PhaseRms, v = [2]float64{v[0], v[1]}, v[2:]
	}
	rec.Contrast, rec.PhaseRad, rec.BiasRad = v[0], v[1], v[2]
	rec.Z = complex(v[3], v[4])
	rec.Ground = [2]float64{v[5], v[6]}
	return rec, nil
}
