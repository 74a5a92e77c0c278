package present

import (
	"bufio"
	"bytes"
	"encoding/json"
	"fmt"
	"io"
	"math"
	"strconv"
	"time"

	"rampart/internal/plural"
	"rampart/internal/version"
	"rampart/mc"
	"rampart/scenario"
	"rampart/sim"
)

// Describe says in one line what the scenario simulates; ramp names the ramp.
func Describe(sc *scenario.Scenario, cfg sim.Config, ramp string) string {
	atom := fmt.Sprintf("atom of %s u", Sig(sc.Atom.MassU, 6))
	if sc.Atom.MassU == sim.Rb87MassU {
		atom = "Rb-87 atom"
	}
	start := "ground-state start"
	if sc.Thermal() {
		start = fmt.Sprintf("thermal start at %s nK", Sig(sc.Start.TemperatureNK, 6))
	}
	laps := "laps"
	if sc.Motion.Laps == 1 {
		laps = "lap"
	}
	q := cfg.Sequence
	down := ""
	if q.Down != nil {
		down = fmt.Sprintf(", ramp-down %s of %s us", q.Down.Name(), Sig(q.Down.Duration()*1e6, 6))
	}
	if q.Segments >= 2 {
		laps += fmt.Sprintf(" in each of %d echo segments (swap pulses between, hold %s us)", q.Segments, Sig(q.HoldS*1e6, 6))
	}
	return fmt.Sprintf("%s, %s of radius %s um, %s kHz deep (trap %s kHz); %s of %s us to %s rad/s%s, %s %s; rotation %s rad/s; %s",
		atom, plural.Count(sc.Ring.Sites, "site"), Sig(sc.Ring.RadiusUM, 6), Sig(sc.Lattice.DepthKHz, 6), Sig(cfg.Ring.TrapHz(cfg.DepthHz)/1e3, 4),
		ramp, Sig(q.Up.Duration()*1e6, 6), Sig(sc.Motion.CruiseRadS, 6), down, Sig(sc.Motion.Laps, 6), laps,
		Sig(sc.Motion.RotationRadS, 6), start)
}

// Duration formats an elapsed time in ms, or in s from one second on.
func Duration(d time.Duration) (value, unit string) {
	if d >= time.Second {
		return Sig(d.Seconds(), 3), "s"
	}
	return Sig(d.Seconds()*1e3, 3), "ms"
}

// WriteJSON writes v as indented JSON. A JSON object gains a first member
// "rampart" naming the build that wrote it (version.Info), so that every
// result says what produced it.
func WriteJSON(w io.Writer, v any) error {
	b, err := stampVersion(v)
	if err != nil {
		return err
	}
	var out bytes.Buffer
	if err := json.Indent(&out, b, "", "  "); err != nil {
		return err
	}
	out.WriteByte('\n')
	_, err = out.WriteTo(w)
	return err
}

// stampVersion marshals v; a JSON object gets the build as its first
// member, "rampart": {"version": ..., "revision": ...}.
func stampVersion(v any) ([]byte, error) {
	b, err := json.Marshal(v)
	if err != nil || len(b) < 2 || b[0] != '{' {
		return b, err
	}
	stamp, err := json.Marshal(version.Get())
	if err != nil {
		return nil, err
	}
	out := append([]byte(`{"rampart":`), stamp...)
	if string(b) != "{}" {
		out = append(out, ',')
	}
	return append(out, b[1:]...), nil
}

// WriteTrace writes the observer's diagnostics as CSV, arm s = +1 or -1.
func WriteTrace(w io.Writer, rows []sim.Diagnostics) error {
	bw := bufio.NewWriter(w)
	fmt.Fprintln(bw, "time_s,arm,offset_rad,width_rad,velocity_error_rad_s,ground_band,norm")
	for _, d := range rows {
		arm := 1
		if d.Arm == 1 {
			arm = -1
		}
		fmt.Fprintf(bw, "%s,%d,%s,%s,%s,%s,%s\n", Sig(d.TimeS, -1), arm, Sig(d.OffsetRad, -1), Sig(d.WidthRad, -1),
			Sig(d.VelocityErrRadS, -1), Sig(d.GroundBand, -1), Sig(d.Norm, -1))
	}
	return bw.Flush()
}

// ShotRun is one simulated shot.
type ShotRun struct {
	Config  sim.Config // with the numerics in use filled in
	Result  sim.Result
	Elapsed time.Duration
	// Gyro is the shot's zero-rate bias and own scale factor
	// (sim.Simulator.Gyro), nil if not measured.
	Gyro *sim.Gyro
}

// ShotReport is the output of `rampart shot`, the object --json prints.
type ShotReport struct {
	Scenario     string  `json:"scenario"`
	Ramp         string  `json:"ramp"`
	Contrast     float64 `json:"contrast"`
	PhaseRad     float64 `json:"phase_rad"`
	SagnacRad    float64 `json:"sagnac_rad"`
	BiasRad      float64 `json:"bias_rad"` // the bias at zero rotation, phase - K_shot Omega (SetGyro)
	BiasRadS     float64 `json:"bias_rad_s"`
	BiasDegPerH  float64 `json:"bias_deg_per_h"`
	ScaleFactorS float64 `json:"scale_factor_s"`
	// ScaleFactorErrorPPM is K_shot/K - 1 in ppm, K_shot = dPhi/dOmega of
	// the shot (sim.Simulator.Gyro).
	ScaleFactorErrorPPM *float64 `json:"scale_factor_error_ppm,omitempty"`
	// Numerics is the estimated numerical error of the shot (against the
	// shot on twice the grid and half the step); BiasBelowResolution says
	// that |bias_rad| is below its phase error, so the bias is not resolved.
	Numerics            *sim.ErrorEstimate `json:"numerics_error,omitempty"`
	BiasBelowResolution bool               `json:"bias_below_resolution"`
	GroundBand          [2]float64         `json:"ground_band_after_rampup"`
	// ScatteringPerS is each arm's photon scattering rate at the lattice
	// depth (arm s = +1, s = -1), and ScatteringFactor the cloud's mean
	// factor exp(-(L_+ + L_-)/2) on z that Contrast includes
	// (docs/model.md, Perturbations: photon scattering); absent without
	// scattering.
	ScatteringPerS   *[2]float64    `json:"scattering_per_s,omitempty"`
	ScatteringFactor float64        `json:"scattering_factor,omitempty"`
	Grid             int            `json:"grid"`
	StepS            float64        `json:"step_s"`
	TemperatureK     float64        `json:"temperature_k"`
	Levels           []LevelReport  `json:"levels"`
	ElapsedS         float64        `json:"elapsed_s"`
	Readout          *ReadoutReport `json:"readout,omitempty"`
	Check            *CheckReport   `json:"check,omitempty"`
}

// LevelReport is one of the site's levels of a thermal start.
type LevelReport struct {
	Band         int     `json:"band"`
	Weight       float64 `json:"weight"`        // Boltzmann weight p_n
	EnergyHz     float64 `json:"energy_hz"`     // band mean energy E_n/h, including the lattice's -V0/2
	ExcitationHz float64 `json:"excitation_hz"` // (E_n - E_0)/h
	AbsZ         float64 `json:"abs_z"`         // |z_n|, the contrast of this level alone
	ArgZRad      float64 `json:"arg_z_rad"`     // arg z_n
}

// ReadoutReport holds the gyroscope figures of the [readout] table.
type ReadoutReport struct {
	Atoms             float64 `json:"atoms"`
	CycleS            float64 `json:"cycle_s"`
	ProjectionRadS    float64 `json:"projection_noise_rad_s"`
	ProjectionDegPerH float64 `json:"projection_noise_deg_per_h"`
	ARWDegPerSqrtH    float64 `json:"angle_random_walk_deg_per_sqrt_h"`
}

// CheckReport compares a shot with one on a doubled grid and a halved step.
type CheckReport struct {
	Grid           int     `json:"grid"`
	StepS          float64 `json:"step_s"`
	ContrastChange float64 `json:"contrast_change"`
	PhaseChangeRad float64 `json:"phase_change_rad"`
	// ContrastError and PhaseErrorRad bound the shot's errors by the
	// changes (sim.CompareNumerics); they are held to the tolerances.
	ContrastError     float64 `json:"contrast_error"`
	PhaseErrorRad     float64 `json:"phase_error_rad"`
	ContrastTolerance float64 `json:"contrast_tolerance"`
	PhaseToleranceRad float64 `json:"phase_tolerance_rad"`
	Converged         bool    `json:"converged"`
}

// NewShotReport returns the report of a shot with the gyroscope figures
// of read-out ro (none if zero).
func NewShotReport(sc *scenario.Scenario, run ShotRun, ro mc.Readout) *ShotReport {
	r := run.Result
	rep := &ShotReport{
		Scenario:     sc.Name,
		Ramp:         run.Config.Sequence.Up.Name(),
		Contrast:     r.Contrast,
		PhaseRad:     r.PhaseRad,
		SagnacRad:    r.SagnacRad,
		BiasRad:      r.BiasRad,
		BiasRadS:     r.BiasRadS,
		BiasDegPerH:  r.BiasDegPerH,
		ScaleFactorS: r.ScaleFactorS,
		GroundBand:   r.GroundAfterRampUp,
		Grid:         r.Grid,
		StepS:        r.StepS,
		TemperatureK: run.Config.TemperatureK,
		ElapsedS:     run.Elapsed.Seconds(),
	}
	if rates := sc.ScatteringRates(); rates[0] > 0 || rates[1] > 0 {
		// The nominal shot holds its depth, so L_s = Gamma_s T.
		t := run.Config.Sequence.Duration()
		rep.ScatteringPerS = &rates
		rep.ScatteringFactor = math.Exp(-(rates[0] + rates[1]) * t / 2)
	}
	for _, l := range r.Levels {
		rep.Levels = append(rep.Levels, LevelReport{
			Band:         l.Band,
			Weight:       l.Weight,
			EnergyHz:     l.EnergyHz,
			ExcitationHz: l.EnergyHz - r.Levels[0].EnergyHz,
			AbsZ:         math.Hypot(real(l.Z), imag(l.Z)),
			ArgZRad:      math.Atan2(imag(l.Z), real(l.Z)),
		})
	}
	if ro.Atoms > 0 && r.Contrast > 0 && r.ScaleFactorS > 0 {
		g := mc.GyroFigures(r.ScaleFactorS, r.Contrast, ro.Atoms, ro.CycleS)
		rep.Readout = &ReadoutReport{
			Atoms:             g.Atoms,
			CycleS:            g.CycleS,
			ProjectionRadS:    g.ShotNoiseRadS,
			ProjectionDegPerH: g.ShotNoiseDegPerH,
			ARWDegPerSqrtH:    g.AngleRandomWalkDegPerSqrtH,
		}
	}
	return rep
}

// SetGyro replaces the bias by the bias at zero rotation b_0 = phase -
// K_shot Omega (and its rates b_0 / K) and adds the scale-factor error of
// the shot's own K_shot (sim.Gyro).
func (rep *ShotReport) SetGyro(g sim.Gyro) {
	ppm := g.ScaleFactorErrorPPM
	rep.BiasRad, rep.ScaleFactorErrorPPM = g.ZeroRateBiasRad, &ppm
	rep.BiasRadS = g.ZeroRateBiasRad / rep.ScaleFactorS
	rep.BiasDegPerH = sim.RadPerSToDegPerH(rep.BiasRadS)
}

// SetNumerics records the shot's estimated numerical error and whether
// the bias lies below it (call after SetGyro).
func (rep *ShotReport) SetNumerics(est sim.ErrorEstimate) {
	rep.Numerics = &est
	rep.BiasBelowResolution = BelowResolution(rep.BiasRad, &est)
}

// BelowResolution reports whether a phase x (a bias) is smaller in
// magnitude than the estimated phase error of est: its digits are then
// discretisation error, not a result (docs/model.md, Numerics).
func BelowResolution(x float64, est *sim.ErrorEstimate) bool {
	return est != nil && math.Abs(x) < est.PhaseErrorRad
}

// ResolutionNote is the note on a bias below the numerical resolution.
func ResolutionNote(what string, x float64, est *sim.ErrorEstimate) string {
	return fmt.Sprintf("Note: %s, %s rad, is below the numerical resolution of %s rad (the estimated phase error of the nominal shot): its digits are discretisation error, not a result.",
		what, Sci(x, 2), Sci(est.PhaseErrorRad, 2))
}

// NewCheckReport reports a numerics estimate (the shot against the same
// shot on a refined grid and step) against the accuracy targets.
func NewCheckReport(est sim.ErrorEstimate) *CheckReport {
	return &CheckReport{
		Grid:              est.RefinedGrid,
		StepS:             est.RefinedStepS,
		ContrastChange:    est.ContrastChange,
		PhaseChangeRad:    est.PhaseChangeRad,
		ContrastError:     est.ContrastError,
		PhaseErrorRad:     est.PhaseErrorRad,
		ContrastTolerance: est.ContrastTarget,
		PhaseToleranceRad: est.PhaseTargetRad,
		Converged:         est.Met,
	}
}

// NotCarriedBelow is the ground-band population after the ramp-up below
// which shot says the lattice does not carry the atom: half the atom, a
// choice of ours (the demo's fastest ramp keeps 0.92).
const NotCarriedBelow = 0.5

// Print writes the shot report as the terminal tables of rampart shot.
func (rep *ShotReport) Print(w io.Writer, sc *scenario.Scenario, cfg sim.Config) error {
	fmt.Fprintf(w, "Scenario %s\n%s\n\n", sc.Name, Describe(sc, cfg, cfg.Sequence.Up.Name()+" ramp"))
	t := NewTable(w, "Quantity", "Value", "Unit")
	t.Append("Contrast C = |z|", Fixed(rep.Contrast, 5), "")
	t.Append("Interferometer phase arg z", Sci(rep.PhaseRad, 7), "rad")
	t.Append("Sagnac phase 2 I phi(T) Omega_bg / hbar", Sci(rep.SagnacRad, 7), "rad")
	t.Append("Bias at zero rotation b = phase - K_shot Omega", Sci(rep.BiasRad, 3), "rad")
	inverted := math.Abs(rep.BiasRad) > math.Pi/2
	rate := func(x float64) string {
		if inverted {
			return notARate
		}
		return Sci(x, 3)
	}
	t.Append("Bias as a rotation rate b / K", rate(rep.BiasRadS), "rad/s")
	t.Append("Bias as a rotation rate b / K", rate(rep.BiasDegPerH), "deg/h")
	t.Append("Scale factor K = 2 I phi(T) / hbar", Sig(rep.ScaleFactorS, 6), "s (rad per rad/s)")
	if rep.ScaleFactorErrorPPM != nil {
		t.Append("Scale-factor error K_shot / K - 1", Sci(*rep.ScaleFactorErrorPPM, 3), "ppm")
	}
	t.Append("Ground band after ramp-up, arm s = +1", Fixed(rep.GroundBand[0], 5), "")
	t.Append("Ground band after ramp-up, arm s = -1", Fixed(rep.GroundBand[1], 5), "")
	if r := rep.ScatteringPerS; r != nil {
		t.Append("Photon scattering rate, arm s = +1", Sig(r[0], 3), "1/s")
		t.Append("Photon scattering rate, arm s = -1", Sig(r[1], 3), "1/s")
		t.Append("Cloud's scattering factor exp(-(L_+ + L_-)/2), in C", Fixed(rep.ScatteringFactor, 5), "")
	}
	if ro := rep.Readout; ro != nil {
		t.Append(fmt.Sprintf("Projection-noise limit per shot, %s atoms", Sig(ro.Atoms, 6)), Sci(ro.ProjectionRadS, 3), "rad/s")
		t.Append(fmt.Sprintf("Projection-noise limit per shot, %s atoms", Sig(ro.Atoms, 6)), Sci(ro.ProjectionDegPerH, 3), "deg/h")
		t.Append(fmt.Sprintf("Angle random walk, one shot per %s s", Sig(ro.CycleS, 6)), Sci(ro.ARWDegPerSqrtH, 3), "deg/sqrt(h)")
	}
	t.Append("Momentum grid", strconv.Itoa(rep.Grid), "states")
	t.Append("Time step while the drive changes", Sig(rep.StepS*1e6, 4), "us")
	if len(rep.Levels) > 1 {
		t.Append("Levels of the site propagated", strconv.Itoa(len(rep.Levels)), "")
	}
	el, unit := Duration(time.Duration(rep.ElapsedS * float64(time.Second)))
	t.Append("Elapsed (one shot)", el, unit)
	if err := t.Render(); err != nil {
		return err
	}
	if rep.BiasBelowResolution {
		fmt.Fprintln(w, "\n"+ResolutionNote("the bias at zero rotation", rep.BiasRad, rep.Numerics))
	}
	if est := rep.Numerics; est != nil && est.ModelBiasRad > 0 {
		fmt.Fprintf(w, "\nNote: the ring potential's treatment leaves out a bias of order %s rad (the Magnus terms beyond the first over the cruise; in an echo sequence, the excited packets' bias of the first order; docs/model.md, Perturbations): the bias carries this model error beside the numerical one.\n", Sci(est.ModelBiasRad, 1))
	}
	if sc.Noise != (scenario.Noise{}) || len(sc.SourceNoise) > 0 {
		fmt.Fprintln(w, "\nNote: the scenario's [noise.*] tables describe an ensemble; this shot is noise-free.")
	}
	if g := math.Min(rep.GroundBand[0], rep.GroundBand[1]); g < NotCarriedBelow {
		fmt.Fprintf(w, "\nNote: only %s of the atom is in the moving lattice's ground band after the ramp-up: the lattice does not carry it (a ramp too fast, or a cruise speed too high, for this depth), so the interferometer's numbers describe an atom left behind; lengthen the ramp, lower the cruise speed or deepen the lattice.\n", Fixed(g, 5))
	}
	if inverted {
		fmt.Fprintln(w, "\nNote: the fringe is inverted (|bias| > pi/2): the arms' overlap has turned over, a defect of the sequence (an echo's packets left with odd parity, docs/model.md, Interferometer and signs, Echo sequences), not a rotation, so the bias is not given as a rate.")
	}
	if sc.Thermal() {
		fmt.Fprintf(w, "\nThermal start at %s nK: the levels of the site\n", Sig(sc.Start.TemperatureNK, 6))
		lt := NewTable(w, "Band n", "Weight p_n", "(E_n - E_0)/h (kHz)", "|z_n|", "arg z_n (rad)")
		for _, l := range rep.Levels {
			lt.Append(strconv.Itoa(l.Band), Sci(l.Weight, 4), Fixed(l.ExcitationHz/1e3, 3), Fixed(l.AbsZ, 5), Sci(l.ArgZRad, 7))
		}
		if err := lt.Render(); err != nil {
			return err
		}
	}
	if c := rep.Check; c != nil {
		fmt.Fprintf(w, "\nNumerics check: grid %d and step %s us against grid %d and step %s us\n",
			c.Grid, Sig(c.StepS*1e6, 4), rep.Grid, Sig(rep.StepS*1e6, 4))
		ct := NewTable(w, "Change", "Value", "Tolerance", "Within")
		// Within: the error the change bounds (16/15 of it) is within the
		// tolerance, the test that --check's exit code makes.
		ct.Append("Contrast", Sci(c.ContrastChange, 2), Sci(c.ContrastTolerance, 1), YesNo(c.ContrastError <= c.ContrastTolerance))
		ct.Append("Phase (rad)", Sci(c.PhaseChangeRad, 2), Sci(c.PhaseToleranceRad, 1), YesNo(c.PhaseErrorRad <= c.PhaseToleranceRad))
		if err := ct.Render(); err != nil {
			return err
		}
	}
	return nil
}
