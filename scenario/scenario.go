package scenario

import (
	"bytes"
	"errors"
	"fmt"
	"io/fs"
	"math"
	"path"
	"path/filepath"
	"rampart/internal/boundedread"
	"strings"

	"rampart/sim"
)

// Scenario is one scenario file, in the file's units.
type Scenario struct {
	// Name is the scenario file as the caller named it, used in messages.
	Name string

	Atom     Atom
	Ring     Ring
	Lattice  Lattice
	Motion   Motion
	Ramp     Ramp
	Start    Start
	Numerics Numerics
	Noise    Noise
	Readout  Readout

	// SourceNoise holds, by scenario key and in file units, the sigmas of
	// the static sources of mc.Sources that Noise has no field for: their
	// keys are made from the table (keys.go), so that adding a source
	// needs no change here. Empty (and absent from the fingerprint) unless
	// the file sets one.
	SourceNoise map[string]float64 `json:",omitempty"`

	fsys fs.FS // where File and PhaseTable are read; nil: the operating system
}

// Atom is the [atom] table.
type Atom struct {
	MassU float64 // atom mass in u (default: rubidium-87, sim.Rb87MassU)

	// The spin pair of the two arms, for the magnetic field (see
	// apparatus.go): a preset of atom.Presets (the F = 2 state in the arm
	// s = +1) at the bias field BiasFieldG, or the differential Zeeman
	// coefficients given directly. FieldOffsetUG is a static offset of
	// the field from the bias during the shot, uG.
	SpinPair               string  `json:",omitempty"`
	BiasFieldG             float64 `json:",omitempty"`
	ZeemanLinearHzPerG     float64 `json:",omitempty"`
	ZeemanQuadraticHzPerG2 float64 `json:",omitempty"`
	FieldOffsetUG          float64 `json:",omitempty"`
	// FieldGradientUGPerUM is a static field gradient in the ring's plane,
	// uG/um (= G/m), towards the azimuth FieldGradientDeg from the start
	// site (sim.FieldShift.GradientGPerM).
	FieldGradientUGPerUM float64 `json:",omitempty"`
	FieldGradientDeg     float64 `json:",omitempty"`
}

// Ring is the [ring] table.
type Ring struct {
	RadiusUM float64 // ring radius R in um
	Sites    int     // number of lattice sites N

	// The imperfect ring (see apparatus.go): the radius's error against
	// its calibration in ppm, the tilt from horizontal in mrad with the
	// azimuth of the lowest point from the start site in degrees, and one
	// angular harmonic of the lattice depth (order, relative amplitude,
	// phase in degrees).
	RadiusErrorPPM   float64 `json:",omitempty"`
	TiltMrad         float64 `json:",omitempty"`
	LowDeg           float64 `json:",omitempty"`
	HarmonicOrder    int     `json:",omitempty"`
	HarmonicRel      float64 `json:",omitempty"`
	HarmonicPhaseDeg float64 `json:",omitempty"`
}

// Lattice is the [lattice] table.
type Lattice struct {
	DepthKHz float64 // lattice depth V0/h in kHz

	// Photon scattering (see apparatus.go): the vacuum wavelength of the
	// lattice light in nm (rubidium-87), or each arm's rate at the nominal
	// depth in 1/s.
	WavelengthNM        float64 `json:",omitempty"`
	ScatteringPlusPerS  float64 `json:",omitempty"`
	ScatteringMinusPerS float64 `json:",omitempty"`
	// The degree of circular polarisation of the light that carries each
	// arm (0 linear, +1 sigma+, -1 sigma-): with the spin pair it sets
	// each arm's line shares and so its own scattering per unit depth.
	PolarisationPlus  float64 `json:",omitempty"`
	PolarisationMinus float64 `json:",omitempty"`
}

// Motion is the [motion] table.
type Motion struct {
	CruiseRadS   float64 // each arm's cruise speed Omega_0 in the apparatus frame, rad/s
	Laps         float64 // each arm's one-way angle phi(T) in turns; 2 Laps is a whole number
	RotationRadS float64 // background rotation Omega_bg being measured, rad/s (default 0)

	// EchoSegments is the number of echo segments (0 or 1: none); EchoHoldUS
	// the rest between segments, with the swap pulse at its middle, in us
	// (sim.NewEcho).
	EchoSegments int     `json:",omitempty"`
	EchoHoldUS   float64 `json:",omitempty"`
}

// Ramp is the [ramp] table.
type Ramp struct {
	Shape string // "sin2", "minjerk", "inverse" or "file"
	// DurationUS is the ramp-up time t_r in us. For the "file" shape zero
	// means the time of the file's last row.
	DurationUS float64
	// DesignDepthKHz is the depth V0/h in kHz at whose harmonic trap
	// frequency the "inverse" ramp is designed. Zero means the lattice depth.
	DesignDepthKHz float64
	// File is the ramp table of the "file" shape: a path relative to the
	// scenario file's directory in the file, already joined to that
	// directory here. Read it with Scenario.ReadFile.
	File string

	// The ramp-down, if it is not the mirror of the ramp-up: the keys of
	// the ramp-up for a ramp-up played backwards in time (sim.Sequence.Down).
	// An empty DownShape means the mirror.
	DownShape          string  `json:",omitempty"`
	DownDurationUS     float64 `json:",omitempty"`
	DownDesignDepthKHz float64 `json:",omitempty"`
	DownFile           string  `json:",omitempty"`
}

// Start is the [start] table.
type Start struct {
	TemperatureNK float64 // 0: the ground state; otherwise a thermal mixture over the site's levels
}

// Numerics is the [numerics] table. Zero values mean automatic choices
// (sim.AutoNumerics).
type Numerics struct {
	Grid   int     // momentum states in all, a multiple of 2 Sites
	StepUS float64 // split-step time step in us
}

// Noise is the [noise.*] tables: the hardware noise budget of an ensemble.
// A zero field switches its source off.
type Noise struct {
	Depth       DepthNoise
	Drive       DriveNoise
	Timing      TimingNoise
	Temperature TemperatureNoise
	Pulses      PulseNoise
	// FieldUG2PerHz is the white one-sided PSD of the magnetic field during
	// the shot, uG^2/Hz ([noise.field] noise_ug2_hz; 0: none).
	FieldUG2PerHz float64 `json:",omitempty"`
	// FieldFlickerUG2 and FieldRandomWalkUG2Hz are the power-law terms
	// h_-1 / f and h_-2 / f^2 of the field's PSD (IEEE Std 1139 forms),
	// h_-1 in uG^2 and h_-2 in uG^2 Hz ([noise.field] flicker_ug2 and
	// random_walk_ug2_hz; 0: none), added to the white FieldUG2PerHz.
	FieldFlickerUG2      float64 `json:",omitempty"`
	FieldRandomWalkUG2Hz float64 `json:",omitempty"`
	// RotationURad2S2PerHz is the white one-sided PSD of the platform's
	// rotation rate during the shot, (urad/s)^2/Hz ([noise.platform]
	// rotation_noise_urad2_s2_hz; 0: none).
	RotationURad2S2PerHz float64 `json:",omitempty"`
	// Mains is the shape of the mains field line ([noise.field] mains_*;
	// its fundamental's amplitude mains_ug is the row mc.ParamMains).
	Mains MainsNoise `json:",omitempty"`
}

// MainsNoise is the mains line's keys of [noise.field] besides mains_ug.
type MainsNoise struct {
	Hz       float64 `json:",omitempty"` // line frequency, Hz (0: 50)
	H2UG     float64 `json:",omitempty"` // amplitude of the second harmonic, uG
	H3UG     float64 `json:",omitempty"` // amplitude of the third harmonic, uG
	Phase    string  `json:",omitempty"` // "random" (default) or "fixed"
	PhaseRad float64 `json:",omitempty"` // the phase of a fixed line at the shot's start, rad
}

// DepthNoise is the [noise.depth] table.
type DepthNoise struct {
	CommonRel       float64 // sigma of the shot-to-shot relative depth error of both spin states
	DifferentialRel float64 // sigma of the relative depth difference between the spin states
	RINDBPerHz      float64 // white relative intensity noise, one-sided, dB/Hz (negative)
	// RINBandHz is the [low, high] band of the intensity noise in Hz.
	// The zero value means the band the time grid resolves.
	RINBandHz [2]float64
	// RINTable is a CSV table of f_hz, rin_db_hz used instead of a white
	// level, joined to the scenario's directory like Ramp.File.
	RINTable string `json:",omitempty"`
}

// DriveNoise is the [noise.drive] table.
type DriveNoise struct {
	PhaseDBcPerHz float64 // white single-sideband phase noise L(f) of each arm's drive, dBc/Hz (negative)
	// PhaseTable is a CSV table of f_hz, l_dbc_hz used instead of a white
	// floor, joined to the scenario's directory like Ramp.File.
	PhaseTable  string
	Correlation float64 // correlation of the two arms' drive phase noise, -1 to 1
}

// TimingNoise is the [noise.timing] table.
type TimingNoise struct {
	ClockPPM float64 // sigma of the waveform time-base error, ppm (the profile plays faster, angle kept)
	SpeedPPM float64 // sigma of the drive-frequency scale error, ppm (speed and angle scale)
	SkewNS   float64 // sigma of the delay between the two arms' drives, ns
}

// TemperatureNoise is the [noise.temperature] table.
type TemperatureNoise struct {
	SpreadNK float64 // sigma of the shot-to-shot temperature, nK
}

// PulseNoise is the [noise.pulses] table.
type PulseNoise struct {
	AreaRel float64 // sigma of the relative area error of each pi/2 pulse
}

// Readout is the [readout] table, for gyroscope figures. Both fields are
// zero (no read-out given) or both positive.
type Readout struct {
	Atoms  float64 // atoms detected per shot
	CycleS float64 // cycle time of one shot, s
	// DetectionAtoms is the detection noise, atoms rms on the measured
	// difference N_1 - N_2 (0: projection noise alone; needs Atoms).
	DetectionAtoms float64
}

// Load reads the scenario file at path from the operating system and applies
// the overrides, each "table.key=value" (see Override). Relative paths in the
// file are taken relative to the file's directory.
func Load(path string, overrides []string) (*Scenario, error) {
	data, err := boundedread.ReadFile(path, boundedread.TextCap)
	if err != nil {
		return nil, &Error{File: path, Err: readError(err)}
	}
	return parse(nil, path, data, overrides)
}

// LoadFS is Load for a scenario held in fsys, such as the embedded demo.
func LoadFS(fsys fs.FS, name string, overrides []string) (*Scenario, error) {
	data, err := boundedread.ReadFS(fsys, name, boundedread.TextCap)
	if err != nil {
		return nil, &Error{File: name, Err: readError(err)}
	}
	return parse(fsys, name, data, overrides)
}

// readError drops the path an fs.PathError repeats, which messages already name.
func readError(err error) error {
	var pe *fs.PathError
	if errors.As(err, &pe) {
		return fmt.Errorf("cannot read the file: %w", pe.Err)
	}
	return err
}

// ReadFile reads a file the scenario refers to (Ramp.File, Noise.Drive.PhaseTable,
// Noise.Depth.RINTable)
// from where the scenario was loaded. Only a regular file of at most
// boundedread.TableCap bytes is read (see package boundedread).
func (s *Scenario) ReadFile(name string) ([]byte, error) {
	if s.fsys != nil {
		return boundedread.ReadFS(s.fsys, name, boundedread.TableCap)
	}
	data, err := boundedread.ReadFile(name, boundedread.TableCap)
	if err != nil && !filepath.IsAbs(name) {
		// A relative path is read from the working directory (a --set
		// value) or the scenario file's (already joined): say where.
		if abs, aerr := filepath.Abs(name); aerr == nil {
			return nil, fmt.Errorf("%w (looked for %s)", readError(err), abs)
		}
	}
	return data, err
}

// resolve joins a path written in the scenario file to the file's directory.
func (s *Scenario) resolve(p string) string {
	if p == "" {
		return ""
	}
	if s.fsys != nil {
		return path.Join(path.Dir(s.Name), p)
	}
	if filepath.IsAbs(p) {
		return p
	}
	return filepath.Join(filepath.Dir(s.Name), p)
}

// Thermal reports whether the start is a thermal mixture.
func (s *Scenario) Thermal() bool { return s.Start.TemperatureNK > 0 }

// Config returns the simulation configuration of the scenario in SI units:
//
//	radius m = radius_um 1e-6, mass kg = mass_u m_u, depth Hz = depth_khz 1e3,
//	t_r s = duration_us 1e-6, step s = step_us 1e-6, T K = temperature_nk 1e-9.
//
// The ramp comes from sim.NewShape or, for the "file" shape, from the ramp
// file; the inverse ramp is designed for omega = 2 pi sim.Ring.TrapHz at the
// design depth. The sequence is sim.NewSequence(ramp, laps).
func (s *Scenario) Config() (sim.Config, error) {
	cfg, err := s.config()
	if err != nil {
		return sim.Config{}, &Error{File: s.Name, Key: err.key, Err: err.err}
	}
	return cfg, nil
}

// RampUp returns the ramp-up of the scenario's drive.
func (s *Scenario) RampUp() (sim.Ramp, error) {
	r, err := s.rampUp()
	if err != nil {
		return nil, &Error{File: s.Name, Key: err.key, Err: err.err}
	}
	return r, nil
}

// simRing returns the ring of the scenario in SI units.
func (s *Scenario) simRing() sim.Ring {
	return sim.Ring{
		Sites:   s.Ring.Sites,
		RadiusM: s.Ring.RadiusUM * 1e-6,
		MassKg:  s.Atom.MassU * sim.AtomicMassUnit,
	}
}

// designDepthHz returns the depth V0/h in Hz the inverse ramp is designed for.
func (s *Scenario) designDepthHz() float64 {
	if s.Ramp.DesignDepthKHz != 0 {
		return s.Ramp.DesignDepthKHz * 1e3
	}
	return s.Lattice.DepthKHz * 1e3
}

// keyError is an error attached to the key whose value caused it. also
// lists the other keys whose values take part in it: when key comes from
// the file and one of them from --set, the message points at that flag
// (decoder.blame).
type keyError struct {
	key  string
	err  error
	also []string
}

// sequenceKeys are the keys that set the angle of the ramps and the cruise
// (sim.NewSequenceDown), beside motion.laps.
var sequenceKeys = []string{"motion.cruise_rad_s", "ramp.shape", "ramp.duration_us", "ramp.file", "ramp.design_depth_khz",
	"ramp.down_shape", "ramp.down_duration_us", "ramp.down_file", "ramp.down_design_depth_khz"}

func (s *Scenario) config() (sim.Config, *keyError) {
	if err := sim.CheckClosure(s.Motion.Laps, s.Ring.Sites); err != nil {
		return sim.Config{}, &keyError{key: "motion.laps", err: err}
	}
	up, kerr := s.rampUp()
	if kerr != nil {
		return sim.Config{}, kerr
	}
	var down sim.Ramp
	if s.Ramp.DownShape != "" {
		r := s.Ramp
		if down, kerr = s.ramp(rampKeys{r.DownShape, r.DownDurationUS, r.DownDesignDepthKHz, r.DownFile, "ramp.down_"}); kerr != nil {
			return sim.Config{}, kerr
		}
	}
	seq, err := sim.NewSequenceDown(up, down, s.Motion.Laps)
	if err != nil {
		return sim.Config{}, &keyError{key: "motion.laps", err: err, also: sequenceKeys}
	}
	if n := s.Motion.EchoSegments; n >= 2 {
		if seq, err = sim.NewEcho(seq, n, s.Motion.EchoHoldUS*1e-6); err != nil {
			return sim.Config{}, &keyError{key: "motion.echo_segments", err: err}
		}
	}
	cfg := sim.Config{
		Ring:         s.simRing(),
		DepthHz:      s.Lattice.DepthKHz * 1e3,
		Sequence:     seq,
		RotationRadS: s.Motion.RotationRadS,
		TemperatureK: s.Start.TemperatureNK * 1e-9,
		Grid:         s.Numerics.Grid,
		StepS:        s.Numerics.StepUS * 1e-6,
	}
	if err := cfg.Validate(); err != nil {
		var ce *sim.ClosureError
		if errors.As(err, &ce) {
			return sim.Config{}, &keyError{key: "motion.laps", err: err}
		}
		return sim.Config{}, &keyError{key: "", err: err}
	}
	if kerr := checkGrid(cfg, s.Start.TemperatureNK > 0); kerr != nil {
		return sim.Config{}, kerr
	}
	return cfg, nil
}

// durationAgreement is the relative difference allowed between
// ramp.duration_us and the last time of a ramp file.
const durationAgreement = 1e-6

func (s *Scenario) rampUp() (sim.Ramp, *keyError) {
	r := s.Ramp
	return s.ramp(rampKeys{r.Shape, r.DurationUS, r.DesignDepthKHz, r.File, "ramp."})
}

// rampKeys are the keys of one ramp: the ramp-up's, or the ramp-down's
// (prefix "ramp.down_").
type rampKeys struct {
	shape          string
	durationUS     float64
	designDepthKHz float64
	file           string
	prefix         string
}

func (s *Scenario) ramp(k rampKeys) (sim.Ramp, *keyError) {
	dur := k.durationUS * 1e-6
	cruise := s.Motion.CruiseRadS
	switch k.shape {
	case "file":
		data, err := s.ReadFile(k.file)
		if err != nil {
			return nil, &keyError{key: k.prefix + "file", err: fmt.Errorf("ramp file %q: %w", boundedread.Excerpt(k.file, maxPath), readError(err))}
		}
		tab, err := ParseRamp(bytes.NewReader(data), k.file, s.Ring.Sites, cruise)
		if err != nil {
			return nil, &keyError{key: k.prefix + "file", err: err}
		}
		if dur != 0 && math.Abs(tab.Duration()-dur) > durationAgreement*tab.Duration() {
			return nil, &keyError{key: k.prefix + "duration_us", err: fmt.Errorf(
				"%sduration_us = %g but the ramp file %q ends at t = %g s (%g us): give that time or leave duration_us out",
				k.prefix, k.durationUS, k.file, tab.Duration(), tab.Duration()*1e6)}
		}
		return tab, nil
	}
	shape, err := sim.LookupShape(k.shape)
	if err != nil {
		return nil, &keyError{key: strings.TrimSuffix(strings.TrimSuffix(k.prefix, "."), "_"), err: err}
	}
	depth := s.designDepthHz()
	if k.prefix != "ramp." {
		depth = s.Lattice.DepthKHz * 1e3
		if k.designDepthKHz != 0 {
			depth = k.designDepthKHz * 1e3
		}
	}
	r, err := shape.New(s.simRing(), dur, cruise, depth)
	if err != nil {
		return nil, &keyError{key: strings.TrimSuffix(strings.TrimSuffix(k.prefix, "."), "_"), err: err}
	}
	return r, nil
}

// Inputs returns the paths of the files the scenario reads: the scenario
// file and, when given, its ramp table and phase-noise table (as they are
// read: relative to the scenario file, or to the working directory when
// set on the command line). A command refuses to write an output over one
// of them.
func (s *Scenario) Inputs() []string {
	out := []string{s.Name}
	for _, p := range []string{s.Ramp.File, s.Ramp.DownFile, s.Noise.Drive.PhaseTable} {
		if p != "" {
			out = append(out, p)
		}
	}
	return out
}
