package mc

import (
	"fmt"
	"math"

	"rampart/noise"
	"rampart/sim"
)

// Budget is the hardware noise a Monte Carlo ensemble draws from, in SI
// units. A zero field switches its source off. Each field is a row's of
// Sources (its Sigma or PSD points at it), and lives beside the table so
// that a new static source is a field here and a row below.
type Budget struct {
	// Static, shot-to-shot errors (standard deviations of normal draws).
	DepthCommonRel       float64 // relative depth error common to both spin states
	DepthDifferentialRel float64 // relative depth difference eps_+ - eps_- between the spin states
	ClockRel             float64 // waveform time-base error kappa: the profile plays (1+kappa) faster
	SpeedRel             float64 // drive-frequency scale error: speeds and angles scale by (1+k)
	SkewS                float64 // delay of the s = -1 arm's drive after the s = +1 arm's
	TemperatureSpreadK   float64 // shot-to-shot spread of the start temperature (clamped at 0 K)
	PulseAreaRel         float64 // relative area error of each pi/2 pulse, independent
	FieldOffsetG         float64 // shot-to-shot offset of the magnetic field from the bias, in gauss (the unit of sim.Zeeman)
	RadiusRel            float64 // relative error r of the ring radius: the true radius is R (1 + r)
	TiltRad              float64 // shot-to-shot change of the ring's tilt, rad, towards the azimuth of its lowest point
	RotationRadS         float64 // shot-to-shot rotation-rate noise of the platform, rad/s
	GradientGPerM        float64 // shot-to-shot change of the field gradient in the ring's plane, G/m
	SwapAreaRel          float64 // relative area error of the swap (pi) pulses of an echo sequence, one draw a shot shared by its swaps
	// MainsG is the amplitude of the mains field line's fundamental, G (an
	// amplitude, not a standard deviation: its draw is the line's phase);
	// Mains its frequency, harmonics and phase.
	MainsG float64
	Mains  Mains

	// Noise during the shot.
	// RIN is the one-sided PSD of the relative intensity noise eps(t) in
	// 1/Hz, common to both spin states (one laser); nil: none.
	RIN     noise.PSD
	RINBand noise.Band
	// Phase is the one-sided PSD S_alpha(f) in rad^2/Hz of each arm's drive
	// phase; the lattice angle moves by alpha/N. nil: none.
	Phase noise.PSD
	// PhaseCorrelation is the correlation coefficient of the two arms'
	// drive phase noise, in [-1, 1].
	PhaseCorrelation float64
	// FieldNoise is the one-sided PSD of the magnetic field's offset from
	// the bias during the shot, in G^2/Hz (nil: none); it acts through the
	// spin pair's Zeeman shift (Apparatus.Field.Zeeman).
	FieldNoise noise.PSD
	// RotationNoise is the one-sided PSD of the platform's rotation rate
	// during the shot, in (rad/s)^2/Hz (nil: none); it acts through the
	// arms' enclosed-area rate (sim.RotationNoisePhaseRad).
	RotationNoise noise.PSD

	// Apparatus is the shot every realisation starts from: the settings of
	// the apparatus that are not drawn (the spin pair's Zeeman
	// coefficients and a static field offset, the arms' photon scattering
	// rates, a radius error, the ring's tilt and depth harmonics; see
	// sim/apparatus.go and sim/ringpotential.go). The static rows add their
	// draws to it; Scaled leaves it alone. Its scattering is drawn per
	// realisation (Worker.ShotAt), whatever its Cloud says.
	Apparatus sim.Shot
}

// Kind is how a perturbation source enters a shot.
type Kind int

const (
	// Static sources are drawn once per shot: value = sigma * x, x standard
	// normal, one sampler coordinate per drawn input.
	Static Kind = iota
	// Process sources are noise processes during the shot, given by their
	// one-sided PSD and synthesised as time series.
	Process
)

func (k Kind) String() string {
	if k == Static {
		return "static"
	}
	return "process"
}

// Source is one row of the table of perturbation sources: everything the
// library needs to parse, sample, apply, scale, search, tabulate and
// describe it. The sampler's coordinates are the static rows' Inputs in
// table order; a process has none.
type Source struct {
	// Key is the source's one name everywhere: tables, tolerance and
	// sensitivity results, figures, --sources and tolerance-curves.csv.
	// It is the scenario key without "noise.", "timing.skew_ns", so that
	// it carries the lab unit Unit in its suffix.
	Key     string
	Meaning string // one line, for help and tables

	// Scenario is the scenario key that sets it, "noise.timing.skew_ns",
	// and FileScale converts the file's value to SI (static sources).
	Scenario  string
	FileScale float64

	// Unit is the lab unit of the scenario key, the tables and reports.
	// A static amplitude in SI times Scale (1/FileScale) is in Unit; a
	// process amplitude is a white floor's level in Unit (Level converts a
	// one-sided PSD level to it, FromLevel back).
	Unit  string
	Scale float64
	// SIUnit is the unit of a static source's SI amplitude, "s", or
	// "1 (relative)" for a relative error (local derivatives are per it).
	SIUnit    string
	Level     func(psd float64) float64
	FromLevel func(level float64) float64

	Kind Kind

	// Inputs names the drawn inputs of a static source in sampler order
	// (the pulse area draws one per pi/2 pulse).
	Inputs []string
	// Sigma points at the static source's standard deviation in a budget
	// (SI units).
	Sigma func(b *Budget) *float64
	// Apply writes the value v of drawn input i of a static source into
	// the shot.
	Apply func(sh *sim.Shot, i int, v float64)
	// Waveform, set instead of Apply for a static source whose draw is the
	// phase of a waveform (the mains line), writes the waveform under
	// budget b for the standard normal variate z into the shot's field
	// record on the grid of n samples of stepS from the shot's start,
	// after the noise processes' records.
	Waveform func(sh *sim.Shot, b *Budget, z, stepS float64, n int)

	// PSD points at the process's PSD in a budget (nil: off).
	PSD func(b *Budget) *noise.PSD
	// ApplyNoise writes the process's records (in the unit of the shot's
	// field, one per arm) into the shot.
	ApplyNoise func(sh *sim.Shot, arms [2]*sim.Series)

	// Ref is where a tolerance search of a source the budget switches off
	// starts: an SI standard deviation, or a white level in Unit. Max is
	// the largest amplitude a search tries (SI; +Inf: none).
	Ref, Max float64

	// Line is the source's phrase in a budget line; "{}" stands for its
	// amplitude with its unit, "{correlation}" for the drive phase
	// correlation.
	Line string

	// Reference names where the model of its effect is written down.
	Reference string
}

// Static parameter names, in sampler order when active: a drawn input is
// named after its source (the draw is in the source's unit), the two pulse
// areas by the source's name and the pulse.
const (
	ParamDepthCommon       = "depth.common_rel"
	ParamDepthDifferential = "depth.differential_rel"
	ParamClock             = "timing.clock_ppm"
	ParamSpeed             = "timing.speed_ppm"
	ParamSkew              = "timing.skew_ns"
	ParamTemperature       = "temperature.spread_nk"
	ParamPulse1            = "pulses.area_rel.1"
	ParamPulse2            = "pulses.area_rel.2"
	ParamFieldOffset       = "field.offset_ug"
	ParamRadius            = "ring.radius_ppm"
	ParamTilt              = "ring.tilt_mrad"
	ParamRotation          = "platform.rotation_urad_s"
	ParamMains             = "field.mains_ug"
	ParamGradient          = "field.gradient_ug_um"
	ParamSwap              = "pulses.swap_area_rel"
)

// Tolerance sources: the static parameters by their budget names, the two
// noise processes, and the whole budget scaled together.
const (
	SourceTemperature = ParamTemperature
	SourcePulse       = "pulses.area_rel"
	SourceRIN         = "depth.rin_db_hz"
	SourcePhase       = "drive.phase_dbc_hz"
	SourceFieldNoise  = "field.noise_ug2_hz"
	SourceRotationPSD = "platform.rotation_noise_urad2_s2_hz"
	SourceBudget      = "budget"
)

// Reference amplitudes: where a search of a source that the budget switches
// off starts. They are typical of a well-built apparatus (common practice,
// not measurements): a 0.1% depth stabilisation, a 1 ppm clock and drive
// frequency, 10 ns of skew, 10 nK of temperature spread, 1% pulse area,
// and white intensity and phase noise floors at -120 dB/Hz and -120 dBc/Hz.
const (
	RefDepthRel      = 1e-3
	RefClockRel      = 1e-6
	RefSpeedRel      = 1e-6
	RefSkewS         = 10e-9
	RefTemperatureK  = 10e-9
	RefPulseAreaRel  = 1e-2
	RefRINDBPerHz    = -120
	RefPhaseDBcPerHz = -120
	// A white field noise of 1e-4 uG^2/Hz (10 nG per root hertz): a quiet
	// magnetically shielded apparatus (common practice, from memory).
	RefFieldNoiseUG2Hz = 1e-4
	// A white rotation-rate noise of 1e-2 (urad/s)^2/Hz (0.1 urad/s per
	// root hertz, an angle random walk of about 3.4e-4 deg/sqrt(h)): a
	// quiet laboratory floor (from memory).
	RefRotationNoiseURad2S2Hz = 1e-2
	// A magnetically shielded apparatus holds its field to about 1 uG shot
	// to shot, a ring's radius is calibrated to about 100 ppm, and a
	// levelled table holds its tilt to about 0.1 mrad (common practice,
	// from memory).
	RefFieldOffsetG = 1e-6
	RefRadiusRel    = 1e-4
	RefTiltRad      = 1e-4
	// A platform held to 1e-7 rad/s (about the Earth's rate over 700)
	// from shot to shot: a quiet laboratory floor (from memory).
	RefRotationRadS = 1e-7
	// A mains line of 1 uG at the atoms: a shielded apparatus (common
	// practice, from memory; unshielded laboratories see 10 to 100 times
	// more).
	RefMainsG = 1e-6
	// A field gradient of 1e-3 uG/um (1 uG across a millimetre, 1e-5
	// G/cm) in a magnetically shielded apparatus (common practice, from
	// memory; unshielded laboratories see mG/cm).
	RefGradientGPerM = 1e-3
)

// DrawSigmas is how many standard deviations a static draw may reach and
// still be physical: a scenario whose DrawSigmas-sigma draw is not (a
// negative lattice depth) is refused. A normal draw passes 5 sigma once
// in 1.7 million.
const DrawSigmas = 5

// The largest amplitudes a search tries, whatever its Range: beyond them a
// static error is no longer a small perturbation of the sequence.
const (
	maxDepthSigma    = 1.0 / DrawSigmas // a 5-sigma draw reaches zero depth
	maxRelativeSigma = 0.3              // pulse area errors
	maxRateSigma     = 0.1              // clock and drive-frequency errors, 1e5 ppm
	maxSkewS         = 10e-6            // a tenth of a typical ramp
	maxTemperatureK  = 1e-6             // far above a lattice-loaded start
	// 1 mG: the linear Zeeman coefficient of a stretched pair turns it into
	// 2 kHz, and the quadratic term about its bias still holds.
	maxFieldOffsetG = 1e-3
	maxRadiusRel    = 0.1 // six of them stay far from a vanishing ring (r > -1)
	// Six of 1.5 mrad stay within the 10 mrad where the first-order
	// treatment of the tilt is tested (sim.RingPotential.Validate).
	maxTiltRad = 1.5e-3
	// 1 rad/s: far beyond any platform a Sagnac sensor sits on, still far
	// below a cruise speed.
	maxRotationRadS = 1
	// 1 mG, as the field offset.
	maxMainsG = 1e-3
	// 1 G/m (0.1 G/cm, 100 uG/um): a gradient that shifts a stretched
	// pair by kHz across a 5 um ring, far beyond a shielded apparatus.
	maxGradientGPerM = 1
)

// relative is the SI unit of a relative error.
const relative = "1 (relative)"

// Relative is the lab unit of a relative error, the scenario key's "_rel":
// a fraction, not a percentage.
const Relative = "relative"

// model is the section of the model document every source cites.
const model = "docs/model.md, Perturbations: "

// Sources is the table of perturbation sources, grouped by what they
// perturb (depth, drive, timing, temperature, pulses; then the apparatus:
// magnetic field, ring radius, ring tilt). The static rows'
// order is the order of the sampler's coordinates: a new static source goes
// last among them (after the pulses), so that earlier coordinates, and the
// draws of every existing budget, stay.
var Sources = []Source{
	{
		Key: ParamDepthCommon, Meaning: "relative depth error common to both spin states",
		Scenario: "noise.depth.common_rel", FileScale: 1,
		Unit: Relative, Scale: 1, SIUnit: relative, Kind: Static, Inputs: []string{ParamDepthCommon},
		Sigma: func(b *Budget) *float64 { return &b.DepthCommonRel },
		Apply: func(sh *sim.Shot, _ int, v float64) { sh.DepthRel[0] += v; sh.DepthRel[1] += v },
		Ref:   RefDepthRel, Max: maxDepthSigma,
		Line: "depth {} common", Reference: model + "lattice depth",
	},
	{
		Key: ParamDepthDifferential, Meaning: "relative depth difference eps_+ - eps_- between the spin states",
		Scenario: "noise.depth.differential_rel", FileScale: 1,
		Unit: Relative, Scale: 1, SIUnit: relative, Kind: Static, Inputs: []string{ParamDepthDifferential},
		Sigma: func(b *Budget) *float64 { return &b.DepthDifferentialRel },
		Apply: func(sh *sim.Shot, _ int, v float64) { sh.DepthRel[0] += v / 2; sh.DepthRel[1] -= v / 2 },
		Ref:   RefDepthRel, Max: maxDepthSigma,
		Line: "{} differential", Reference: model + "lattice depth",
	},
	{
		Key: SourceRIN, Meaning: "relative intensity noise of the lattice light, common to both spin states",
		Scenario: "noise.depth.rin_db_hz",
		Unit:     "dB/Hz", Level: noise.RINFromIntensity, FromLevel: noise.IntensityFromRIN, Kind: Process,
		PSD:        func(b *Budget) *noise.PSD { return &b.RIN },
		ApplyNoise: func(sh *sim.Shot, arms [2]*sim.Series) { sh.DepthNoise = arms },
		Ref:        RefRINDBPerHz, Max: math.Inf(1),
		Line: "intensity noise", Reference: model + "intensity noise",
	},
	{
		Key: SourcePhase, Meaning: "phase noise of each arm's drive; the lattice angle moves by alpha/N",
		Scenario: "noise.drive.phase_dbc_hz",
		Unit:     "dBc/Hz", Level: noise.DBcFromPhase, FromLevel: noise.PhaseFromDBc, Kind: Process,
		PSD:        func(b *Budget) *noise.PSD { return &b.Phase },
		ApplyNoise: func(sh *sim.Shot, arms [2]*sim.Series) { sh.Jitter = arms },
		Ref:        RefPhaseDBcPerHz, Max: math.Inf(1),
		Line: "drive phase noise (correlation {correlation})", Reference: model + "drive phase noise",
	},
	{
		Key: SourceFieldNoise, Meaning: "magnetic field noise during the shot, through the spin pair's Zeeman shift",
		Scenario: "noise.field.noise_ug2_hz",
		Unit:     "uG^2/Hz", Level: FieldNoiseUG2Hz, FromLevel: FieldNoiseFromUG2Hz, Kind: Process,
		PSD:        func(b *Budget) *noise.PSD { return &b.FieldNoise },
		ApplyNoise: func(sh *sim.Shot, arms [2]*sim.Series) { sh.Field.Noise = arms[0] },
		Ref:        RefFieldNoiseUG2Hz, Max: math.Inf(1),
		Line: "field noise", Reference: model + "magnetic field",
	},
	{
		Key: SourceRotationPSD, Meaning: "rotation-rate noise of the platform during the shot, through the arms' enclosed-area rate",
		Scenario: "noise.platform.rotation_noise_urad2_s2_hz",
		Unit:     "(urad/s)^2/Hz", Level: RotationNoiseURad2S2Hz, FromLevel: RotationNoiseFromURad2S2Hz, Kind: Process,
		PSD:        func(b *Budget) *noise.PSD { return &b.RotationNoise },
		ApplyNoise: func(sh *sim.Shot, arms [2]*sim.Series) { sh.RotationNoise = arms[0] },
		Ref:        RefRotationNoiseURad2S2Hz, Max: math.Inf(1),
		Line: "rotation noise", Reference: model + "platform rotation",
	},
	{
		Key: ParamClock, Meaning: "waveform time-base error kappa: the profile plays (1+kappa) faster",
		Scenario: "noise.timing.clock_ppm", FileScale: 1e-6,
		Unit: "ppm", Scale: 1e6, SIUnit: relative, Kind: Static, Inputs: []string{ParamClock},
		Sigma: func(b *Budget) *float64 { return &b.ClockRel },
		Apply: func(sh *sim.Shot, _ int, v float64) { sh.ClockRel = v },
		Ref:   RefClockRel, Max: maxRateSigma,
		Line: "clock {}", Reference: model + "timing",
	},
	{
		Key: ParamSpeed, Meaning: "drive-frequency scale error: speeds and angles scale by (1+k)",
		Scenario: "noise.timing.speed_ppm", FileScale: 1e-6,
		Unit: "ppm", Scale: 1e6, SIUnit: relative, Kind: Static, Inputs: []string{ParamSpeed},
		Sigma: func(b *Budget) *float64 { return &b.SpeedRel },
		Apply: func(sh *sim.Shot, _ int, v float64) { sh.SpeedRel = v },
		Ref:   RefSpeedRel, Max: maxRateSigma,
		Line: "speed {}", Reference: model + "timing",
	},
	{
		Key: ParamSkew, Meaning: "delay of the s = -1 arm's drive after the s = +1 arm's",
		Scenario: "noise.timing.skew_ns", FileScale: 1e-9,
		Unit: "ns", Scale: 1e9, SIUnit: "s", Kind: Static, Inputs: []string{ParamSkew},
		Sigma: func(b *Budget) *float64 { return &b.SkewS },
		Apply: func(sh *sim.Shot, _ int, v float64) { sh.SkewS = v },
		Ref:   RefSkewS, Max: maxSkewS,
		Line: "skew {}", Reference: model + "timing",
	},
	{
		Key: SourceTemperature, Meaning: "shot-to-shot spread of the start temperature (clamped at 0 K)",
		Scenario: "noise.temperature.spread_nk", FileScale: 1e-9,
		Unit: "nK", Scale: 1e9, SIUnit: "K", Kind: Static, Inputs: []string{ParamTemperature},
		Sigma: func(b *Budget) *float64 { return &b.TemperatureSpreadK },
		Apply: func(sh *sim.Shot, _ int, v float64) { sh.TemperatureOffsetK = v },
		Ref:   RefTemperatureK, Max: maxTemperatureK,
		Line: "temperature spread {}", Reference: model + "start temperature",
	},
	{
		Key: SourcePulse, Meaning: "relative area error of each pi/2 pulse, independent",
		Scenario: "noise.pulses.area_rel", FileScale: 1,
		Unit: Relative, Scale: 1, SIUnit: relative, Kind: Static, Inputs: []string{ParamPulse1, ParamPulse2},
		Sigma: func(b *Budget) *float64 { return &b.PulseAreaRel },
		Apply: func(sh *sim.Shot, i int, v float64) { sh.PulseAreaRel[i] = v },
		Ref:   RefPulseAreaRel, Max: maxRelativeSigma,
		Line: "pulse area {}", Reference: model + "pulses",
	},
	{
		Key: ParamFieldOffset, Meaning: "shot-to-shot offset of the magnetic field from the bias, through the spin pair's Zeeman coefficients",
		Scenario: "noise.field.offset_ug", FileScale: 1e-6,
		Unit: "uG", Scale: 1e6, SIUnit: "G", Kind: Static, Inputs: []string{ParamFieldOffset},
		Sigma: func(b *Budget) *float64 { return &b.FieldOffsetG },
		Apply: func(sh *sim.Shot, _ int, v float64) { sh.Field.OffsetG += v },
		Ref:   RefFieldOffsetG, Max: maxFieldOffsetG,
		Line: "field offset {}", Reference: model + "magnetic field",
	},
	{
		Key: ParamRadius, Meaning: "relative error of the ring radius against its calibration: a scale-factor error 2r + r^2",
		Scenario: "noise.ring.radius_ppm", FileScale: 1e-6,
		Unit: "ppm", Scale: 1e6, SIUnit: relative, Kind: Static, Inputs: []string{ParamRadius},
		Sigma: func(b *Budget) *float64 { return &b.RadiusRel },
		Apply: func(sh *sim.Shot, _ int, v float64) { sh.RadiusRel += v },
		Ref:   RefRadiusRel, Max: maxRadiusRel,
		Line: "radius {}", Reference: model + "radius calibration",
	},
	{
		Key: ParamTilt, Meaning: "shot-to-shot change of the ring's tilt from horizontal, towards the azimuth of its lowest point",
		Scenario: "noise.ring.tilt_mrad", FileScale: 1e-3,
		Unit: "mrad", Scale: 1e3, SIUnit: "rad", Kind: Static, Inputs: []string{ParamTilt},
		Sigma: func(b *Budget) *float64 { return &b.TiltRad },
		Apply: func(sh *sim.Shot, _ int, v float64) { sh.Potential.TiltRad += v },
		Ref:   RefTiltRad, Max: maxTiltRad,
		Line: "tilt {}", Reference: model + "gravity and an imperfect ring",
	},
	{
		Key: ParamRotation, Meaning: "shot-to-shot rotation-rate noise of the platform about the ring's axis",
		Scenario: "noise.platform.rotation_urad_s", FileScale: 1e-6,
		Unit: "urad/s", Scale: 1e6, SIUnit: "rad/s", Kind: Static, Inputs: []string{ParamRotation},
		Sigma: func(b *Budget) *float64 { return &b.RotationRadS },
		Apply: func(sh *sim.Shot, _ int, v float64) { sh.RotationOffsetRadS += v },
		Ref:   RefRotationRadS, Max: maxRotationRadS,
		Line: "rotation {}", Reference: model + "platform rotation",
	},
	{
		Key: ParamMains, Meaning: "amplitude of the mains field line's fundamental (random or fixed phase per shot, harmonics locked to it), through the spin pair's Zeeman coefficients",
		Scenario: "noise.field.mains_ug", FileScale: 1e-6,
		Unit: "uG", Scale: 1e6, SIUnit: "G", Kind: Static, Inputs: []string{ParamMains},
		Sigma: func(b *Budget) *float64 { return &b.MainsG },
		Waveform: func(sh *sim.Shot, b *Budget, z, stepS float64, n int) {
			b.Mains.addMains(sh, b.MainsG, b.Mains.Phase(z), stepS, n)
		},
		Ref: RefMainsG, Max: maxMainsG,
		Line: "mains line {} amplitude", Reference: model + "magnetic field",
	},
	{
		Key: ParamGradient, Meaning: "shot-to-shot change of the field gradient in the ring's plane (towards atom.field_gradient_deg), a spin-dependent ring potential through the spin pair's Zeeman coefficients",
		Scenario: "noise.field.gradient_ug_um", FileScale: 1, // uG/um is G/m
		Unit: "uG/um", Scale: 1, SIUnit: "G/m", Kind: Static, Inputs: []string{ParamGradient},
		Sigma: func(b *Budget) *float64 { return &b.GradientGPerM },
		Apply: func(sh *sim.Shot, _ int, v float64) { sh.Field.GradientGPerM += v },
		Ref:   RefGradientGPerM, Max: maxGradientGPerM,
		Line: "field gradient {}", Reference: model + "field gradient",
	},
	{
		Key: ParamSwap, Meaning: "relative area error of the swap (pi) pulses of an echo sequence, one draw a shot shared by all its swaps",
		Scenario: "noise.pulses.swap_area_rel", FileScale: 1,
		Unit: Relative, Scale: 1, SIUnit: relative, Kind: Static, Inputs: []string{ParamSwap},
		Sigma: func(b *Budget) *float64 { return &b.SwapAreaRel },
		Apply: func(sh *sim.Shot, _ int, v float64) { sh.SwapAreaRel = v },
		Ref:   RefPulseAreaRel, Max: maxRelativeSigma,
		Line: "swap area {}", Reference: model + "pulses",
	},
}

// StaticDim is the dimension of the static parameters' design: one
// coordinate per drawn input of the static rows of Sources.
var StaticDim = staticDim()

func staticDim() int {
	n := 0
	for _, s := range Sources {
		n += len(s.Inputs)
	}
	return n
}

// SourceKeys returns the keys a tolerance search can vary one at a time:
// the static sources, then the noise processes, each in table order.
func SourceKeys() []string {
	var keys []string
	for _, k := range []Kind{Static, Process} {
		for _, s := range Sources {
			if s.Kind == k {
				keys = append(keys, s.Key)
			}
		}
	}
	return keys
}

// LookupSource returns the row of Sources with the given key.
func LookupSource(key string) (Source, bool) {
	for _, s := range Sources {
		if s.Key == key {
			return s, true
		}
	}
	return Source{}, false
}

// InputSource returns the static source of a drawn input (a name of
// Inputs), and whether there is such an input.
func InputSource(input string) (Source, bool) {
	for _, s := range Sources {
		for _, in := range s.Inputs {
			if in == input {
				return s, true
			}
		}
	}
	return Source{}, false
}

// On reports whether budget b switches the source on.
func (s Source) On(b Budget) bool {
	if s.Kind == Static {
		return *s.Sigma(&b) > 0
	}
	return *s.PSD(&b) != nil
}

// ActiveSources returns the keys of the sources budget b switches on, in
// the order of SourceKeys.
func ActiveSources(b Budget) []string {
	var out []string
	for _, key := range SourceKeys() {
		if s, _ := LookupSource(key); s.On(b) {
			out = append(out, key)
		}
	}
	return out
}

// validApparatus checks the settings every realisation starts from.
func (b Budget) validApparatus() error {
	a := b.Apparatus
	if err := a.Field.Validate(); err != nil {
		return fmt.Errorf("apparatus: %w", err)
	}
	sc := a.Scattering
	sc.Uniform = 0 // drawn per realisation
	if err := sc.Validate(); err != nil {
		return fmt.Errorf("apparatus: %w", err)
	}
	if err := sim.ValidateRadiusRel(a.RadiusRel); err != nil {
		return fmt.Errorf("apparatus: %w", err)
	}
	if err := a.Potential.Validate(); err != nil {
		return fmt.Errorf("apparatus: %w", err)
	}
	if err := b.Mains.Validate(); err != nil {
		return err
	}
	if a.Field.Noise != nil || a.RotationNoise != nil || a.Jitter != [2]*sim.Series{} || a.DepthNoise != [2]*sim.Series{} {
		return fmt.Errorf("apparatus: a noise record in the starting shot (records come from the budget's processes)")
	}
	return nil
}

// FieldNoiseUG2Hz converts a field-noise PSD level in G^2/Hz to the lab
// unit uG^2/Hz.
func FieldNoiseUG2Hz(g2PerHz float64) float64 { return g2PerHz * 1e12 }

// FieldNoiseFromUG2Hz converts a level in uG^2/Hz to G^2/Hz.
func FieldNoiseFromUG2Hz(ug2PerHz float64) float64 { return ug2PerHz * 1e-12 }

// RotationNoiseURad2S2Hz converts a rotation-noise PSD level in
// (rad/s)^2/Hz to the lab unit (urad/s)^2/Hz.
func RotationNoiseURad2S2Hz(perHz float64) float64 { return perHz * 1e12 }

// RotationNoiseFromURad2S2Hz converts a level in (urad/s)^2/Hz to
// (rad/s)^2/Hz.
func RotationNoiseFromURad2S2Hz(level float64) float64 { return level * 1e-12 }
