package noise

import (
	"bufio"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"rampart/internal/plural"
)

// levelTable describes a CSV table of a noise level in decibels against
// frequency: the drive phase-noise table and the intensity-noise table
// share its reader.
type levelTable struct {
	what    string                  // "phase-noise table"
	header  string                  // "f_hz,l_dbc_hz"
	unit    string                  // the level's unit, "dBc/Hz"
	density string                  // the density and its unit in messages, "S_phi = %g rad^2/Hz"
	toPSD   func(l float64) float64 // level to one-sided PSD
}

var phaseTable = levelTable{"phase-noise table", PhaseNoiseHeader, "dBc/Hz", "S_phi = %g rad^2/Hz", PhaseFromDBc}

// parseLevelTable reads a table as ParsePhaseNoise describes, with the
// header, unit and conversion of t.
func parseLevelTable(r io.Reader, name string, t levelTable) (*Table, error) {
	var (
		freq, dens []float64
		header     bool
		prevLine   int
	)
	sc := bufio.NewScanner(r)
	for line := 1; sc.Scan(); line++ {
		text := sc.Text()
		if line == 1 {
			text = strings.TrimPrefix(text, "\ufeff") // byte-order mark of some spreadsheet exports
		}
		text = strings.TrimSpace(text)
		if text == "" || strings.HasPrefix(text, "#") {
			continue
		}
		fail := func(format string, args ...any) error {
			return fmt.Errorf("%s %q line %d: %s", t.what, name, line, fmt.Sprintf(format, args...))
		}
		fields := strings.Split(text, ",")
		for i := range fields {
			fields[i] = strings.TrimSpace(fields[i])
		}
		if !header {
			if strings.Contains(text, ";") && !strings.Contains(text, ",") {
				return nil, fail("the columns are separated by semicolons: rampart reads comma-separated values with decimal points (%s as 1e3,-110); export the table with commas between columns and points in numbers", t.header)
			}
			if strings.Join(fields, ",") != t.header {
				// Not quoted: the file may be anything the user pointed at.
				return nil, fail("the first line that is not blank or a comment is not the header: want %q", t.header)
			}
			header = true
			continue
		}
		if len(fields) != 2 {
			return nil, fail("%s, want 2 (%s)", plural.Count(len(fields), "field"), t.header)
		}
		if len(freq) == MaxPhaseNoiseRows {
			return nil, fail("more than %d rows, the cap for a %s", MaxPhaseNoiseRows, t.what)
		}
		f, err := strconv.ParseFloat(fields[0], 64)
		if err != nil {
			return nil, fail("frequency %q is not a number: want a positive frequency in Hz, such as 1e3", excerpt(fields[0]))
		}
		l, err := strconv.ParseFloat(fields[1], 64)
		if err != nil {
			return nil, fail("level %q is not a number: want a level in %s below 0, such as -110", excerpt(fields[1]), t.unit)
		}
		s := t.toPSD(l)
		switch {
		case math.IsNaN(f) || math.IsInf(f, 0):
			return nil, fail("frequency %v is not finite", f)
		case f <= 0:
			return nil, fail("frequency %g Hz is not positive", f)
		case len(freq) > 0 && f <= freq[len(freq)-1]:
			return nil, fail("frequency %g Hz is not above the previous row's (%g Hz, line %d)", f, freq[len(freq)-1], prevLine)
		case math.IsNaN(l) || math.IsInf(l, 0):
			return nil, fail("level %v %s is not finite", l, t.unit)
		case s == 0 || math.IsInf(s, 1):
			return nil, fail("level %g %s is out of range ("+t.density+")", l, t.unit, s)
		case l >= 0:
			// As the white floor's key: at 0 dB/Hz and above the density
			// is of order one per hertz, where the small-perturbation
			// model of the noise (and the table's meaning) fails.
			return nil, fail("level %g %s: want a level below 0 %s, as the white floor's key takes (a density of order one per hertz or more is not a small perturbation)", l, t.unit, t.unit)
		}
		freq = append(freq, f)
		dens = append(dens, s)
		prevLine = line
	}
	if err := sc.Err(); err != nil {
		return nil, fmt.Errorf("%s %q: %w", t.what, name, err)
	}
	if !header {
		return nil, fmt.Errorf("%s %q: empty, want the header %q and at least one row", t.what, name, t.header)
	}
	if len(freq) == 0 {
		return nil, fmt.Errorf("%s %q: no rows after the header", t.what, name)
	}
	return newTable(freq, dens), nil
}
