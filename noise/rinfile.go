package noise

import "io"

// RINHeader is the header line an intensity-noise table must start with.
const RINHeader = "f_hz,rin_db_hz"

var rinTable = levelTable{"intensity-noise table", RINHeader, "dB/Hz", "S_eps = %g 1/Hz", IntensityFromRIN}

// ParseRIN parses a table of the relative intensity noise and returns it
// as a Table of the one-sided PSD S_eps(f) = 10^(RIN/10) in 1/Hz (see
// IntensityFromRIN), interpolated log-log between rows and held constant
// outside them, as the phase-noise table. name is used in error messages.
//
// The format is that of ParsePhaseNoise with the header "f_hz,rin_db_hz"
// and RIN(f) = 10 log10 S_eps(f) in dB/Hz (one-sided, as laser data sheets
// quote it), for example
//
//	# lattice laser after the intensity servo
//	f_hz,rin_db_hz
//	10,-100
//	1e3,-125
//	1e5,-140
func ParseRIN(r io.Reader, name string) (*Table, error) {
	return parseLevelTable(r, name, rinTable)
}
