package noise

import (
	"bufio"
	"bytes"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"math"
	"strconv"
	"strings"

	"rampart/internal/boundedread"
)

// excerpt cuts a field quoted in a message to a few dozen bytes.
func excerpt(s string) string { return boundedread.Excerpt(s, 40) }

// PhaseNoiseHeader is the header line a phase-noise table file must start with.
const PhaseNoiseHeader = "f_hz,l_dbc_hz"

// MaxPhaseNoiseRows bounds the rows of a phase-noise table: a measured
// spectrum has hundreds of points, a synthesised one a few thousand.
const MaxPhaseNoiseRows = 1_000_000

// ReadPhaseNoise reads a phase-noise table from the CSV file at path and
// returns it as a Table of S_φ(f) in rad^2/Hz (see ParsePhaseNoise). Only a
// regular file of at most boundedread.TableCap bytes is read.
func ReadPhaseNoise(path string) (*Table, error) {
	data, err := boundedread.ReadFile(path, boundedread.TableCap)
	if err != nil {
		var pe *fs.PathError
		if errors.As(err, &pe) {
			err = pe.Err
		}
		return nil, fmt.Errorf("phase-noise table %q: cannot read the file: %w", path, err)
	}
	return ParsePhaseNoise(bytes.NewReader(data), path)
}

// ParsePhaseNoise parses a phase-noise table and returns it as a Table of
// S_φ(f) = 2·10^(L/10) in rad^2/Hz (see PhaseFromDBc). name is used in error
// messages, usually the file's path.
//
// The format is CSV with the header line "f_hz,l_dbc_hz", then one row per
// offset frequency: the frequency in Hz and L(f) in dBc/Hz, for example
//
//	# laser A, beat note measured 2024-05-02
//	f_hz,l_dbc_hz
//	10,-80
//	1e3,-110
//	1e5,-130
//
// Blank lines and lines starting with # are ignored; spaces around fields are
// allowed. Frequencies must be positive, finite and strictly increasing; levels
// finite, and small enough in magnitude that S_φ is a positive finite float64
// (|L| up to about 3000 dB). Errors name the input and the line.
func ParsePhaseNoise(r io.Reader, name string) (*Table, error) {
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
			return fmt.Errorf("phase-noise table %q line %d: %s", name, line, fmt.Sprintf(format, args...))
		}
		fields := strings.Split(text, ",")
		for i := range fields {
			fields[i] = strings.TrimSpace(fields[i])
		}
		if !header {
			if strings.Join(fields, ",") != PhaseNoiseHeader {
				// Not quoted: the file may be anything the user pointed at.
				return nil, fail("the first line that is not blank or a comment is not the header: want %q", PhaseNoiseHeader)
			}
			header = true
			continue
		}
		if len(fields) != 2 {
			return nil, fail("%d fields, want 2 (%s)", len(fields), PhaseNoiseHeader)
		}
		if len(freq) == MaxPhaseNoiseRows {
			return nil, fail("more than %d rows, the cap for a phase-noise table", MaxPhaseNoiseRows)
		}
		f, err := strconv.ParseFloat(fields[0], 64)
		if err != nil {
			return nil, fail("frequency %q is not a number", excerpt(fields[0]))
		}
		l, err := strconv.ParseFloat(fields[1], 64)
		if err != nil {
			return nil, fail("level %q is not a number", excerpt(fields[1]))
		}
		s := PhaseFromDBc(l)
		switch {
		case math.IsNaN(f) || math.IsInf(f, 0):
			return nil, fail("frequency %v is not finite", f)
		case f <= 0:
			return nil, fail("frequency %g Hz is not positive", f)
		case len(freq) > 0 && f <= freq[len(freq)-1]:
			return nil, fail("frequency %g Hz is not above the previous row's (%g Hz, line %d)", f, freq[len(freq)-1], prevLine)
		case math.IsNaN(l) || math.IsInf(l, 0):
			return nil, fail("level %v dBc/Hz is not finite", l)
		case s == 0 || math.IsInf(s, 1):
			return nil, fail("level %g dBc/Hz is out of range (S_phi = %g rad^2/Hz)", l, s)
		}
		freq = append(freq, f)
		dens = append(dens, s)
		prevLine = line
	}
	if err := sc.Err(); err != nil {
		return nil, fmt.Errorf("phase-noise table %q: %w", name, err)
	}
	if !header {
		return nil, fmt.Errorf("phase-noise table %q: empty, want the header %q and at least one row", name, PhaseNoiseHeader)
	}
	if len(freq) == 0 {
		return nil, fmt.Errorf("phase-noise table %q: no rows after the header", name)
	}
	return newTable(freq, dens), nil
}
