package noise

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"io/fs"

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
// finite, below 0 dBc/Hz (as the white floor's key), and not so low that S_φ
// underflows (about -3000 dBc/Hz). Errors name the input and the line.
func ParsePhaseNoise(r io.Reader, name string) (*Table, error) {
	return parseLevelTable(r, name, phaseTable)
}
