package scenario

import (
	"math"
	"strconv"
	"strings"
	"testing"
	"testing/fstest"

	"rampart/atom"
	"rampart/sim"
)

func withSets(t *testing.T, sets ...string) *Scenario {
	t.Helper()
	s, err := parse(fstest.MapFS{}, "s.toml", []byte(minimal), sets)
	if err != nil {
		t.Fatal(err)
	}
	return s
}

// TestApparatusZeeman: a preset's coefficients reach the shot, checked
// against D. A. Steck, "Rubidium 87 D Line Data" (rev. 2.1.5): the clock
// pair's 575.15 Hz/G^2 at zero field (table 2, quoted to 0.005 Hz/G^2,
// tolerance 0.01), and the stretched pair's linear limit
// (g_F(2) (-2) - g_F(1) (-1)) mu_B/h = -(3 g_J + g_I)/4 mu_B/h with
// g_J = 2.002 331 13, g_I = -0.000 995 141 4, mu_B/h = 1.399 624 604 MHz/G
// (table 3 and eq. (35)), -2.101 535 MHz/G; that state pair's shift is
// linear in B exactly (|2,-2> is a stretched state, and |1,-1> has its
// quadratic term), so only the linear coefficient is compared, to 1 Hz/G
// (the constants' last digits). Given coefficients pass through as they
// are, and the field offset is in uG.
func TestApparatusZeeman(t *testing.T) {
	sh, err := withSets(t, "atom.spin_pair=rb87-clock").Apparatus()
	if err != nil {
		t.Fatal(err)
	}
	if z := sh.Field.Zeeman; z.LinearHzPerG != 0 || math.Abs(z.QuadraticHzPerG2-575.15) > 0.01 {
		t.Errorf("clock pair: %+v, want 0 Hz/G and 575.15 Hz/G^2", z)
	}
	sh, err = withSets(t, "atom.spin_pair=rb87-stretched", "atom.field_offset_ug=2").Apparatus()
	if err != nil {
		t.Fatal(err)
	}
	const gJ, gI, muB = 2.00233113, -0.0009951414, 1.399624604e6
	if want := -(3*gJ + gI) / 4 * muB; math.Abs(sh.Field.Zeeman.LinearHzPerG-want) > 1 {
		t.Errorf("stretched pair: %g Hz/G, want %g", sh.Field.Zeeman.LinearHzPerG, want)
	}
	if sh.Field.OffsetG != 2e-6 {
		t.Errorf("field offset %g G, want 2e-6 G", sh.Field.OffsetG)
	}
	sh, err = withSets(t, "atom.zeeman_linear_hz_g=-1400", "atom.zeeman_quadratic_hz_g2=431").Apparatus()
	if err != nil {
		t.Fatal(err)
	}
	if z := sh.Field.Zeeman; z.LinearHzPerG != -1400 || z.QuadraticHzPerG2 != 431 {
		t.Errorf("given coefficients: %+v", z)
	}
}

// TestApparatusScattering: from the wavelength, the rate of a 20 E_r
// lattice at 1064 nm is issue 12's 0.007 per second (Grimm, Weidemueller
// & Ovchinnikov 2000, the figure quoted to one digit: tolerance 0.0005/s);
// the per-arm rates pass through; a shot takes the cloud's mean.
func TestApparatusScattering(t *testing.T) {
	// E_r/h = h/(2 m lambda^2) at 1064 nm, rubidium-87.
	er := sim.Planck / (2 * sim.Rb87MassU * sim.AtomicMassUnit * 1064e-9 * 1064e-9)
	depthKHz := 20 * er / 1e3
	s := withSets(t, "lattice.wavelength_nm=1064", "lattice.depth_khz="+strconv.FormatFloat(depthKHz, 'g', -1, 64))
	sh, err := s.Apparatus()
	if err != nil {
		t.Fatal(err)
	}
	if r := sh.Scattering.RateS; r[0] != r[1] || math.Abs(r[0]-0.007) > 0.0005 || !sh.Scattering.Cloud {
		t.Errorf("1064 nm, 20 E_r: rates %v /s (cloud %v), want 0.007 /s each, as a cloud", r, sh.Scattering.Cloud)
	}
	sh, _ = withSets(t, "lattice.scattering_plus_per_s=3", "lattice.scattering_minus_per_s=5").Apparatus()
	if sh.Scattering.RateS != [2]float64{3, 5} {
		t.Errorf("given rates: %v, want [3 5]", sh.Scattering.RateS)
	}
}

// TestApparatusPolarisedScattering: with a spin pair and each arm's
// polarisation, each arm scatters at its own state's rate per unit depth
// (atom.StateScatteringPerDepth, which atom's tests check against the
// damped-oscillator sum of testdata/reference/scattering.py): sigma- on
// |2,-2> for the arm s = +1 (the F = 2 state rides it) and sigma+ on
// |1,-1> for the arm s = -1, at 785 nm and 20 kHz.
func TestApparatusPolarisedScattering(t *testing.T) {
	s := withSets(t, "atom.spin_pair=rb87-stretched", "lattice.wavelength_nm=785", "lattice.depth_khz=20",
		"lattice.polarisation_plus=-1", "lattice.polarisation_minus=1")
	sh, err := s.Apparatus()
	if err != nil {
		t.Fatal(err)
	}
	for a, c := range []struct {
		p  float64
		st atom.State
	}{{-1, atom.State{F: 2, M: -2}}, {1, atom.State{F: 1, M: -1}}} {
		r, err := atom.StateScatteringPerDepth(atom.Light{WavelengthM: 785e-9, Polarisation: c.p}, c.st)
		if err != nil {
			t.Fatal(err)
		}
		if got, want := sh.Scattering.RateS[a], r*20e3; math.Abs(got/want-1) > 1e-12 {
			t.Errorf("arm %d: %g /s, want %g /s (%v, polarisation %g)", a, got, want, c.st, c.p)
		}
	}
	// sigma- on |2,-2> couples to D2 alone, so it scatters less per unit
	// depth than linear light at 785 nm (D1 lies red of the light and
	// takes depth away from D2's): 0.32/s against 0.47/s.
	lin := withSets(t, "atom.spin_pair=rb87-stretched", "lattice.wavelength_nm=785", "lattice.depth_khz=20")
	shl, _ := lin.Apparatus()
	if !(sh.Scattering.RateS[0] < shl.Scattering.RateS[0]) {
		t.Errorf("sigma- on |2,-2>: %g /s, not below linear light's %g /s", sh.Scattering.RateS[0], shl.Scattering.RateS[0])
	}
}

// TestApparatusRing: tilt, lowest point, harmonic and radius error in
// their file units reach the shot in SI (mrad, degrees, ppm).
func TestApparatusRing(t *testing.T) {
	sh, err := withSets(t, "ring.tilt_mrad=2", "ring.low_deg=90", "ring.harmonic_order=3", "ring.harmonic_rel=1e-3",
		"ring.harmonic_phase_deg=180", "ring.radius_error_ppm=-50").Apparatus()
	if err != nil {
		t.Fatal(err)
	}
	p := sh.Potential
	if p.TiltRad != 2e-3 || math.Abs(p.LowRad-math.Pi/2) > 1e-15 || len(p.Harmonics) != 1 ||
		p.Harmonics[0].Order != 3 || p.Harmonics[0].Rel != 1e-3 || math.Abs(p.Harmonics[0].PhaseRad-math.Pi) > 1e-15 {
		t.Errorf("ring potential %+v", p)
	}
	if math.Abs(sh.RadiusRel+50e-6) > 1e-20 {
		t.Errorf("radius error %g, want -5e-5", sh.RadiusRel)
	}
	b, err := withSets(t, "ring.tilt_mrad=2", "noise.ring.tilt_mrad=0.5", "noise.ring.radius_ppm=20").Budget()
	if err != nil {
		t.Fatal(err)
	}
	if b.TiltRad != 0.5e-3 || math.Abs(b.RadiusRel-20e-6) > 1e-20 || b.Apparatus.Potential.TiltRad != 2e-3 {
		t.Errorf("budget tilt %g rad, radius %g, apparatus tilt %g", b.TiltRad, b.RadiusRel, b.Apparatus.Potential.TiltRad)
	}
}

// TestApparatusBad: keys that do not fit together are refused with the
// key and what would be accepted.
func TestApparatusBad(t *testing.T) {
	for _, row := range []struct {
		sets []string
		key  string
		msg  string
	}{
		{[]string{"atom.spin_pair=rb87-clock", "atom.zeeman_linear_hz_g=5"}, "atom.zeeman_linear_hz_g", "both given"},
		{[]string{"atom.spin_pair=rb87"}, "atom.spin_pair", `"rb87-clock"`},
		{[]string{"atom.bias_field_g=1"}, "atom.bias_field_g", "without atom.spin_pair"},
		{[]string{"atom.spin_pair=rb87-clock", "atom.mass_u=40"}, "atom.spin_pair", "not rubidium-87"},
		{[]string{"noise.field.offset_ug=1"}, "noise.field.offset_ug", "give atom.spin_pair"},
		{[]string{"atom.field_offset_ug=1"}, "atom.field_offset_ug", "give atom.spin_pair"},
		{[]string{"lattice.wavelength_nm=780.5"}, "lattice.wavelength_nm", "within 1 nm of the D2 line"},
		{[]string{"lattice.wavelength_nm=785", "lattice.scattering_plus_per_s=1"}, "lattice.scattering_plus_per_s", "both given"},
		{[]string{"ring.tilt_mrad=11"}, "ring.tilt_mrad", "from -10 to 10"},
		{[]string{"ring.harmonic_order=2"}, "ring.harmonic_order", "needs ring.harmonic_rel"},
		{[]string{"ring.harmonic_rel=1e-3"}, "ring.harmonic_rel", "needs ring.harmonic_order"},
		{[]string{"ring.harmonic_order=2", "ring.harmonic_rel=0.02"}, "ring.harmonic_rel", "from -0.01 to 0.01"},
		{[]string{"noise.ring.tilt_mrad=-1"}, "noise.ring.tilt_mrad", ">= 0"},
		{[]string{"lattice.wavelength_nm=785", "lattice.polarisation_plus=1"}, "lattice.polarisation_plus", "needs lattice.wavelength_nm and atom.spin_pair"},
		{[]string{"atom.spin_pair=rb87-stretched", "lattice.polarisation_minus=0.5"}, "lattice.polarisation_minus", "needs lattice.wavelength_nm"},
		{[]string{"atom.spin_pair=rb87-stretched", "lattice.wavelength_nm=785", "lattice.polarisation_plus=1.5"}, "lattice.polarisation_plus", "from -1 to 1"},
	} {
		_, err := parse(fstest.MapFS{}, "s.toml", []byte(minimal), row.sets)
		if err == nil {
			t.Errorf("%v: accepted", row.sets)
			continue
		}
		e, ok := err.(*Error)
		if !ok || e.Key != row.key || !strings.Contains(err.Error(), row.msg) {
			t.Errorf("%v: %v (key %q), want key %q and %q", row.sets, err, keyOf(err), row.key, row.msg)
		}
	}
}

func keyOf(err error) string {
	if e, ok := err.(*Error); ok {
		return e.Key
	}
	return ""
}
