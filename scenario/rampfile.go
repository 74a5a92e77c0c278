package scenario

import (
	"bufio"
	"bytes"
	"errors"
	"fmt"
	"io"
	"math"
	"path/filepath"

	"rampart/internal/boundedread"
	"rampart/internal/plural"
	"rampart/sim"
	"strconv"
	"strings"
)

// Ramp file columns.
const (
	timeColumn  = "t_s"         // time from the start of the ramp, s
	omegaColumn = "omega_rad_s" // lattice speed Omega, rad/s
	driveColumn = "drive_hz"    // drive frequency offset N Omega / (2 pi), Hz
)

// maxRampLine is the longest line a ramp file may have, in bytes.
const maxRampLine = 1 << 20

// MaxRampRows bounds the data rows of a ramp file: 10^6 rows sample a
// 1 ms ramp every nanosecond, beyond any optimiser's output.
const MaxRampRows = 1_000_000

// RampError is a problem with a ramp file.
type RampError struct {
	File string // the ramp file as named by the caller
	Line int    // 0: the file as a whole
	Err  error
}

func (e *RampError) Error() string {
	file := boundedread.Excerpt(e.File, maxPath)
	if e.Line > 0 {
		return fmt.Sprintf("ramp file %q line %d: %v", file, e.Line, e.Err)
	}
	return fmt.Sprintf("ramp file %q: %v", file, e.Err)
}

func (e *RampError) Unwrap() error { return e.Err }

// ReadRamp reads the ramp file at path (see ParseRamp).
func ReadRamp(path string, sites int, cruiseRadS float64) (*sim.Tabulated, error) {
	data, err := boundedread.ReadFile(path, boundedread.TableCap)
	if err != nil {
		return nil, &RampError{File: path, Err: readError(err)}
	}
	return ParseRamp(bytes.NewReader(data), path, sites, cruiseRadS)
}

// ParseRamp reads a ramp-up table for a ring of the given number of sites
// whose cruise speed is cruiseRadS. name labels the ramp and its errors,
// usually the file's path.
//
// The format is CSV, separated by commas (a file separated by semicolons,
// as some spreadsheets export, is refused with a message saying so); a
// UTF-8 byte-order mark at the start is skipped. Blank lines and comments (from # to the end of a line)
// are ignored. The first other line is the header, naming the two columns in
// either order: t_s, the time in s, and either omega_rad_s, the lattice speed
// Omega in rad/s, or drive_hz, the drive frequency offset in Hz,
//
//	Omega = 2 pi drive_hz / N.
//
// Each further line is one row. The times start at 0 and increase strictly;
// the speed starts at 0 and the last row's speed is the cruise speed within a
// relative sim.CruiseTolerance. Between rows the speed is the PCHIP
// interpolant of sim.Tabulated. Errors are of type *RampError.
func ParseRamp(r io.Reader, name string, sites int, cruiseRadS float64) (*sim.Tabulated, error) {
	if sites < 1 || !(cruiseRadS > 0) || math.IsInf(cruiseRadS, 0) {
		panic("scenario: ParseRamp needs sites >= 1 and a positive finite cruise speed")
	}
	p := rampParser{name: name, sites: sites, cruise: cruiseRadS}
	sc := bufio.NewScanner(r)
	sc.Buffer(make([]byte, 0, 4096), maxRampLine)
	for sc.Scan() {
		p.line++
		line := sc.Text()
		if p.line == 1 {
			line = strings.TrimPrefix(line, "\ufeff") // byte-order mark of some spreadsheet exports
		}
		text, _, _ := strings.Cut(line, "#")
		text = strings.TrimSpace(text)
		if text == "" {
			continue
		}
		fields := strings.Split(text, ",")
		for i := range fields {
			fields[i] = strings.TrimSpace(fields[i])
		}
		var err error
		switch {
		case longField(fields) > 0:
			err = fmt.Errorf("field %d is %s long: want a number or a column name", longField(fields), plural.Count(len(fields[longField(fields)-1]), "byte"))
		case strings.Contains(text, ";"):
			err = fmt.Errorf("the columns are separated by semicolons: rampart reads comma-separated values with decimal points (%s,%s as 1.5e-4,250.5); export the table with commas between columns and points in numbers", timeColumn, omegaColumn)
		case p.speedColumn == "":
			err = p.header(fields)
		case len(p.t) == MaxRampRows:
			err = fmt.Errorf("more than %d data rows, the cap for a ramp table", MaxRampRows)
		default:
			err = p.row(fields)
		}
		if err != nil {
			return nil, &RampError{File: name, Line: p.line, Err: err}
		}
	}
	if err := sc.Err(); err != nil {
		if errors.Is(err, bufio.ErrTooLong) {
			return nil, &RampError{File: name, Line: p.line + 1, Err: fmt.Errorf("line longer than %d bytes", maxRampLine)}
		}
		return nil, &RampError{File: name, Err: err}
	}
	return p.finish()
}

type rampParser struct {
	name   string
	sites  int
	cruise float64
	line   int

	speedColumn string // omegaColumn or driveColumn once the header is read
	timeIndex   int    // column of the time
	t, omega    []float64
	tText       []string // times as written, for messages
	speedText   string   // the last speed as written
	lastLine    int
}

func (p *rampParser) header(fields []string) error {
	want := fmt.Sprintf("want the columns %s and one of %s, %s", timeColumn, omegaColumn, driveColumn)
	if _, err := strconv.ParseFloat(fields[0], 64); err == nil {
		return fmt.Errorf("no header row before the numbers: the first row must name the columns, %s", want)
	}
	if len(fields) != 2 {
		return fmt.Errorf("the header names %s: %s", plural.Count(len(fields), "column"), want)
	}
	seen := map[string]bool{}
	for i, f := range fields {
		switch f {
		case timeColumn:
			p.timeIndex = i
		case omegaColumn, driveColumn:
			p.speedColumn = f
		default:
			p.speedColumn = ""
			return fmt.Errorf("unknown column %q in the header: %s", f, want)
		}
		if seen[f] {
			p.speedColumn = ""
			return fmt.Errorf("the header names %s twice: %s", f, want)
		}
		seen[f] = true
	}
	if !seen[timeColumn] || p.speedColumn == "" {
		p.speedColumn = ""
		return fmt.Errorf("the header names %s and %s: %s", fields[0], fields[1], want)
	}
	return nil
}

func (p *rampParser) row(fields []string) error {
	if len(fields) != 2 {
		err := fmt.Errorf("%s, want 2 (%s, %s)", count(len(fields), "field"), p.columns()[0], p.columns()[1])
		if len(fields) > 2 && decimalCommas(fields) {
			err = fmt.Errorf("%w: the numbers seem to have decimal commas; write them with decimal points (0.5, not 0,5)", err)
		}
		return err
	}
	tText, sText := fields[p.timeIndex], fields[1-p.timeIndex]
	t, err := finite(timeColumn, tText)
	if err != nil {
		return err
	}
	s, err := finite(p.speedColumn, sText)
	if err != nil {
		return err
	}
	omega := s
	if p.speedColumn == driveColumn {
		omega = 2 * math.Pi * s / float64(p.sites)
	}
	if n := len(p.t); n == 0 {
		if t != 0 {
			return fmt.Errorf("the first row is at %s = %s: the ramp must start at t = 0", timeColumn, tText)
		}
		if s != 0 {
			return fmt.Errorf("the first row has %s = %s: the ramp must start at rest (0)", p.speedColumn, sText)
		}
	} else if !(t > p.t[n-1]) {
		return fmt.Errorf("time %s s is not after the previous row (%s s)", tText, p.tText[n-1])
	}
	p.t = append(p.t, t)
	p.omega = append(p.omega, omega)
	p.tText = append(p.tText, tText)
	p.speedText, p.lastLine = sText, p.line
	return nil
}

func (p *rampParser) columns() [2]string {
	c := [2]string{timeColumn, p.speedColumn}
	if p.timeIndex == 1 {
		c[0], c[1] = c[1], c[0]
	}
	return c
}

func (p *rampParser) finish() (*sim.Tabulated, error) {
	if p.speedColumn == "" {
		return nil, &RampError{File: p.name, Err: fmt.Errorf("no header row: the first line that is not blank or a comment must name the columns %s and one of %s, %s",
			timeColumn, omegaColumn, driveColumn)}
	}
	if len(p.t) < 2 {
		return nil, &RampError{File: p.name, Err: fmt.Errorf("%s, want at least 2: the start (t = 0 at rest) and the end at the cruise speed", count(len(p.t), "data row"))}
	}
	last := p.omega[len(p.omega)-1]
	if d := math.Abs(last-p.cruise) / p.cruise; d > sim.CruiseTolerance {
		msg := fmt.Errorf("the ramp ends at %s = %s but the cruise speed (motion.cruise_rad_s) is %.9g rad/s: the last row must match it within a relative %g",
			p.speedColumn, p.speedText, p.cruise, sim.CruiseTolerance)
		if p.speedColumn == driveColumn {
			msg = fmt.Errorf("the ramp ends at %s = %s (%.9g rad/s on %s) but the cruise speed (motion.cruise_rad_s) is %.9g rad/s, drive_hz = %.9g: the last row must match it within a relative %g",
				driveColumn, p.speedText, last, plural.Count(p.sites, "site"), p.cruise, p.cruise*float64(p.sites)/(2*math.Pi), sim.CruiseTolerance)
		}
		return nil, &RampError{File: p.name, Line: p.lastLine, Err: msg}
	}
	tab, err := sim.NewTabulated(filepath.Base(p.name), p.t, p.omega, p.cruise)
	if err != nil {
		return nil, &RampError{File: p.name, Err: err}
	}
	return tab, nil
}

// maxRampField is the longest field of a ramp file: a float64 needs at most
// 24 characters, so 64 leaves room for padding zeros. Longer fields are
// refused without being quoted.
const maxRampField = 64

// longField returns the 1-based position of the first field longer than
// maxRampField, or 0.
func longField(fields []string) int {
	for i, f := range fields {
		if len(f) > maxRampField {
			return i + 1
		}
	}
	return 0
}

// finite parses a number of a ramp file column.
func finite(column, s string) (float64, error) {
	if s == "" {
		return 0, fmt.Errorf("%s is empty: want a number", column)
	}
	x, err := strconv.ParseFloat(s, 64)
	switch {
	case errors.Is(err, strconv.ErrRange):
		return 0, fmt.Errorf("%s = %s is beyond the range of a float64", column, s)
	case err != nil:
		return 0, fmt.Errorf("%s = %q is not a number", column, s)
	case math.IsNaN(x) || math.IsInf(x, 0):
		return 0, fmt.Errorf("%s = %s: want a finite number", column, s)
	}
	return x, nil
}

// count says how many of a thing: "1 field", "3 fields".
func count(n int, thing string) string {
	if n == 1 {
		return "1 " + thing
	}
	return fmt.Sprintf("%d %ss", n, thing)
}

// decimalCommas reports whether a row split at commas looks like numbers
// written with decimal commas: every field digits only, as "0,5,250,25"
// splits.
func decimalCommas(fields []string) bool {
	for _, f := range fields {
		if f == "" || strings.Trim(f, "0123456789") != "" {
			return false
		}
	}
	return true
}
