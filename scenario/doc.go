// Package scenario reads rampart scenario files: the TOML description of one
// interferometer sequence (atom, ring, lattice, motion, ramp, start state,
// numerics), the hardware noise budget of an ensemble, and the read-out that
// turns a phase into gyroscope figures.
//
// The file is strict: an unknown table or key, a value of the wrong type, an
// out-of-range value and a missing required key are errors of type *Error,
// which name the file, the line (where the TOML decoder knows it), the key and
// what would be accepted. Values given on the command line as
// "table.key=value" overrides are checked the same way and their errors name
// the override instead of a line.
//
// Scenario fields hold the values in the file's units, which the key names
// carry (radius_um is in micrometres, depth_khz is V0/h in kHz, duration_us
// in microseconds, temperature_nk in nanokelvin). Scenario.Config converts
// them to the SI units of package sim.
//
// A scenario gives what a Go user needs to run it without the command line:
// its simulation configuration (Config), its noise budget (Budget, one
// static row of mc.Sources at a time) and its fingerprint (Fingerprint, what
// an mc.Job records so that only shards of one ensemble merge); see
// Example_shards. Contestants and RampVariant build the ramps of a ranking
// from the registry of shapes (sim.Shapes).
//
// A ramp file ("file" shape) is a CSV table of the ramp-up, read by ParseRamp:
// a header row naming the columns t_s and either omega_rad_s or drive_hz (the
// drive frequency offset N Omega / 2 pi), then one row per sample. Between
// rows the speed is the monotone piecewise-cubic Hermite (PCHIP) interpolant
// of sim.Tabulated.
package scenario
