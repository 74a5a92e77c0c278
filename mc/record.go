package mc

import (
	"errors"
	"fmt"
	"hash/crc32"
	"math"
	"strconv"
	"strings"
	"sync"

	"rampart/internal/plural"
)

// Record is the outcome of one realisation with the inputs it drew.
type Record struct {
	Index    int
	Inputs   []float64  // static parameters, in the order of Budget.Params
	RINRms   float64    // rms of the synthesised relative intensity noise
	PhaseRms [2]float64 // rms of each arm's synthesised drive phase noise, rad
	Contrast float64
	// PhaseRad and BiasRad are 0 for a lost shot (Lost), which has no
	// phase; its row in a records file leaves them empty.
	PhaseRad float64
	BiasRad  float64
	Z        complex128
	Ground   [2]float64 // each arm's ground-band population after the ramp-up
	// ScaleFactorErrorPPM is K_shot / K - 1 in ppm, the shot's own scale
	// factor from a central difference in Omega (sim.Simulator.Gyro);
	// HasScaleFactor says that it was measured (Ensemble.ScaleFactor) and
	// that the record has the column ScaleFactorColumn.
	ScaleFactorErrorPPM float64
	HasScaleFactor      bool
}

// ScaleFactorColumn is the optional column of a records file with the
// realisation's scale-factor error in ppm, after ground_minus. Runs written
// without it (before it existed, or without Ensemble.ScaleFactor) read as
// they were, with HasScaleFactor false.
const ScaleFactorColumn = "scale_factor_error_ppm"

// WithScaleFactor returns the columns cols (of Columns) with
// ScaleFactorColumn before the checksum.
func WithScaleFactor(cols []string) []string {
	out := append([]string(nil), cols[:len(cols)-1]...)
	return append(out, ScaleFactorColumn, ChecksumColumn)
}

// Columns returns the CSV header of records of an ensemble with the given
// static parameters and noise sources.
func Columns(params []Param, rin, phase bool) []string {
	cols := []string{"index"}
	for _, p := range params {
		cols = append(cols, RecordColumn(p.Name))
	}
	if rin {
		cols = append(cols, "rin_rms_rel")
	}
	if phase {
		cols = append(cols, "phase_rms_plus_rad", "phase_rms_minus_rad")
	}
	return append(cols, "contrast", "phase_rad", "bias_rad", "z_re", "z_im", "ground_plus", "ground_minus", ChecksumColumn)
}

// RecordColumn returns the records' column of the static input name. A
// record holds the draws in the simulation's units (a source's SIUnit:
// fractions, s, K, G, rad, rad/s, G/m), which its resume and merge read
// back bit for bit, so the column names that unit where it differs from
// the lab unit in the source's key: "timing.skew_ns" is the column
// "timing.skew_s", "pulses.area_rel.1" stays. A name of no source is
// kept.
func RecordColumn(name string) string {
	for _, s := range Sources {
		for _, in := range s.Inputs {
			if in != name || s.Scale == 1 {
				continue
			}
			base, ok := strings.CutSuffix(s.Key, "_"+unitSuffix(s.Unit))
			if !ok {
				return name
			}
			return base + "_" + unitSuffix(s.SIUnit) + strings.TrimPrefix(name, s.Key)
		}
	}
	return name
}

// unitSuffix spells a unit as a key's suffix: "urad/s" -> "urad_s",
// "nK" -> "nk", a relative error -> "rel".
func unitSuffix(u string) string {
	if u == Relative || u == relative {
		return "rel"
	}
	return strings.ToLower(strings.ReplaceAll(u, "/", "_"))
}

// ChecksumColumn is the last column of a records file: the CRC-32C
// (Castagnoli) of the row's text before it, as eight hex digits. A row
// altered after it was written (a flipped bit, an edit, an interleaved
// write) fails it: CRC-32C detects every error of up to 3 bits in a row of
// these lengths and all but 2^-32 of longer ones (Castagnoli, Braeuer and
// Herrmann, IEEE Trans. Commun. 41, 883 (1993)).
const ChecksumColumn = "crc32c"

// castagnoli builds the CRC-32C tables when a row is first checked, not at
// start-up (0.14 ms and 9 kB, the package's whole init cost otherwise).
var castagnoli = sync.OnceValue(func() *crc32.Table { return crc32.MakeTable(crc32.Castagnoli) })

// rowChecksum is the checksum column of a row's text.
func rowChecksum(text string) string {
	return fmt.Sprintf("%08x", crc32.Checksum([]byte(text), castagnoli()))
}

// physicalSlack is how far above 1 a contrast, |z| or ground population may
// round (they are norms of unit-norm states; 1e-9 is about 10^7 float64
// roundings, common practice for such checks).
const physicalSlack = 1e-9

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
	put(rec.Contrast)
	if rec.Lost() {
		// No phase, hence no bias: the two fields are left empty, the
		// files' convention for a value that is not defined.
		b.WriteString(",,")
	} else {
		put(rec.PhaseRad)
		put(rec.BiasRad)
	}
	for _, x := range []float64{real(rec.Z), imag(rec.Z), rec.Ground[0], rec.Ground[1]} {
		put(x)
	}
	if rec.HasScaleFactor {
		put(rec.ScaleFactorErrorPPM)
	}
	sum := rowChecksum(b.String())
	b.WriteByte(',')
	b.WriteString(sum)
	b.WriteByte('\n')
	return b.String()
}

// parseRecord reads a row written by format, checks its checksum and that
// its values are physical (see Record.check).
func parseRecord(line string, nInputs int, rin, phase bool) (Record, error) {
	text := strings.TrimSuffix(line, "\n")
	body, sum, ok := cutLast(text, ',')
	if !ok {
		return Record{}, errors.New("no checksum column")
	}
	if got := rowChecksum(body); sum != got {
		return Record{}, fmt.Errorf("checksum %q does not match the row (CRC-32C %s): the row was altered after it was written", excerpt(sum), got)
	}
	f := strings.Split(body, ",")
	want := 1 + nInputs + 7
	if rin {
		want++
	}
	if phase {
		want += 2
	}
	// A row one field longer carries ScaleFactorColumn. Whether the run
	// has that column is held by its header, which the reader compares
	// with the manifest's columns; a row of the other length passes only
	// if it was written so with a valid checksum (the summary then leaves
	// the scale factor out, see Summarise).
	sf := len(f) == want+1
	if len(f) != want && !sf {
		return Record{}, fmt.Errorf("%s, want %d", plural.Count(len(f), "field"), want)
	}
	idx, err := strconv.Atoi(f[0])
	if err != nil || idx < 0 {
		return Record{}, fmt.Errorf("index %q is not a non-negative integer", excerpt(f[0]))
	}
	v := make([]float64, len(f)-1)
	// The phase and bias fields, empty in the row of a lost shot.
	phaseField := nInputs
	if rin {
		phaseField++
	}
	if phase {
		phaseField += 2
	}
	phaseField++ // after contrast
	empty := 0
	for i, s := range f[1:] {
		if s == "" && (i == phaseField || i == phaseField+1) {
			empty++
			continue // read as 0, Record's value for a lost shot
		}
		if v[i], err = strconv.ParseFloat(s, 64); err != nil {
			return Record{}, fmt.Errorf("field %d: %q is not a number", i+2, excerpt(s))
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
	if sf {
		rec.ScaleFactorErrorPPM, rec.HasScaleFactor = v[7], true
	}
	if empty > 0 && (empty != 2 || !rec.Lost()) {
		return Record{}, fmt.Errorf("phase_rad and bias_rad: %d of the two fields empty, in a row with contrast %g and z %g: only a lost shot (contrast and z exactly 0) leaves both empty", empty, rec.Contrast, rec.Z)
	}
	return rec, rec.check()
}

// check returns an error naming the first value of rec that no shot can
// produce: every value finite; contrast, |z| and the ground populations in
// [0, 1] (up to physicalSlack); the noise rms values non-negative.
func (rec Record) check() error {
	for i, x := range rec.Inputs {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return fmt.Errorf("input %d is %g, not a finite number", i+1, x)
		}
	}
	named := []struct {
		name   string
		x      float64
		lo, hi float64
	}{
		{"rin_rms_rel", rec.RINRms, 0, math.Inf(1)},
		{"phase_rms_plus_rad", rec.PhaseRms[0], 0, math.Inf(1)},
		{"phase_rms_minus_rad", rec.PhaseRms[1], 0, math.Inf(1)},
		{"contrast", rec.Contrast, 0, 1 + physicalSlack},
		{"phase_rad", rec.PhaseRad, math.Inf(-1), math.Inf(1)},
		{"bias_rad", rec.BiasRad, math.Inf(-1), math.Inf(1)},
		{"|z|", cmplxAbs(rec.Z), 0, 1 + physicalSlack},
		{"ground_plus", rec.Ground[0], 0, 1 + physicalSlack},
		{"ground_minus", rec.Ground[1], 0, 1 + physicalSlack},
		{ScaleFactorColumn, rec.ScaleFactorErrorPPM, math.Inf(-1), math.Inf(1)},
	}
	for _, c := range named {
		if math.IsNaN(c.x) || math.IsInf(c.x, 0) {
			return fmt.Errorf("%s is %g, not a finite number", c.name, c.x)
		}
		if c.x < c.lo || c.x > c.hi {
			return fmt.Errorf("%s = %g is outside [%g, %g], where every shot's value lies", c.name, c.x, c.lo, math.Min(c.hi, 1))
		}
	}
	return nil
}

func cmplxAbs(z complex128) float64 { return math.Hypot(real(z), imag(z)) }

// cutLast splits s around the last sep.
func cutLast(s string, sep byte) (before, after string, found bool) {
	i := strings.LastIndexByte(s, sep)
	if i < 0 {
		return s, "", false
	}
	return s[:i], s[i+1:], true
}

// excerpt cuts text quoted in a message to a few dozen bytes.
func excerpt(s string) string {
	const n = 40
	if len(s) <= n {
		return s
	}
	return s[:n] + "..."
}
