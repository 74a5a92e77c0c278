package main

import (
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"
)

// Outside checks of the goldens: each golden file's main numbers are
// recomputed here from their definitions, independently of the code that
// printed them, and compared within the precision they are printed with
// (half a unit of the last digit shown, the rounding bound: an error ten
// times the achieved one shows as a changed digit and fails).
//
// Constants (CODATA 2018; h exact in the 2019 SI): h = 6.62607015e-34 J s,
// m_u = 1.66053906660e-27 kg; the Rb-87 mass 86.909180520 u (Steck,
// "Rubidium 87 D Line Data", from memory).
const (
	checkH    = 6.62607015e-34
	checkHbar = checkH / (2 * math.Pi)
	checkMass = 86.909180520 * 1.66053906660e-27
	// 180/pi x 3600 deg/h per rad/s.
	degPerHPerRadS = 180 / math.Pi * 3600
)

// setup is what a golden's description line states about the sequence.
type setup struct {
	sites                                   int
	radiusM, depthHz, trapHz, rampS, cruise float64
	laps, rotation                          float64
	shape                                   string
}

var describeLine = regexp.MustCompile(`(\d+) sites of radius ([\d.]+) um, ([\d.]+) kHz deep \(trap ([\d.]+) kHz\); (.+?) ramps? of ([\d.]+) us to ([\d.]+) rad/s, ([\d.]+) laps?; rotation ([\d.e+-]+) rad/s`)

func parseSetup(t *testing.T, text string) (setup, string) {
	t.Helper()
	m := describeLine.FindStringSubmatch(text)
	if m == nil {
		t.Fatalf("no description line")
	}
	f := func(i int) float64 {
		v, err := strconv.ParseFloat(m[i], 64)
		if err != nil {
			t.Fatal(err)
		}
		return v
	}
	n, _ := strconv.Atoi(m[1])
	return setup{sites: n, radiusM: f(2) * 1e-6, depthHz: f(3) * 1e3, trapHz: f(4) * 1e3, shape: m[5],
		rampS: f(6) * 1e-6, cruise: f(7), laps: f(8), rotation: f(9)}, m[4]
}

// scaleFactor is K = 2 I phi(T) / hbar with I = m R^2 and phi(T) = 2 pi
// laps (docs/model.md, Interferometer and signs).
func (s setup) scaleFactor() float64 {
	return 2 * checkMass * s.radiusM * s.radiusM * 2 * math.Pi * s.laps / checkHbar
}

// trap is the harmonic frequency of a lattice site, h nu = 2 sqrt(V0 E_r)
// with E_r = hbar^2 k^2 / 2m and k = N / 2R (lattice period 2 pi R / N): a
// fact of the trade (e.g. Bloch, Dalibard and Zwerger, Rev. Mod. Phys. 80,
// 885 (2008), the harmonic approximation of a site).
func (s setup) trap() float64 {
	k := float64(s.sites) / (2 * s.radiusM)
	er := checkHbar * checkHbar * k * k / (2 * checkMass)
	return 2 * math.Sqrt(s.depthHz*checkH*er) / checkH
}

// printed parses a printed number and returns it with its rounding bound,
// half a unit of its last digit.
func printed(t *testing.T, s string) (v, half float64) {
	t.Helper()
	s = strings.TrimSpace(s)
	v, err := strconv.ParseFloat(s, 64)
	if err != nil {
		t.Fatalf("%q is not a number", s)
	}
	mant, exp := s, 0
	if i := strings.IndexAny(s, "eE"); i >= 0 {
		mant = s[:i]
		exp, _ = strconv.Atoi(s[i+1:])
	}
	decimals := 0
	if i := strings.IndexByte(mant, '.'); i >= 0 {
		decimals = len(mant) - i - 1
	}
	return v, 0.5 * math.Pow(10, float64(exp-decimals))
}

// cell returns cell col (0-based, after the label) of the table row whose
// label starts with label.
func cell(t *testing.T, text, label string, col int) string {
	t.Helper()
	for _, line := range strings.Split(text, "\n") {
		cells := strings.Split(line, "|")
		if len(cells) > col+2 && strings.HasPrefix(strings.TrimSpace(cells[1]), label) {
			return strings.TrimSpace(cells[col+2])
		}
	}
	t.Fatalf("no row %q", label)
	return ""
}

func near(t *testing.T, what, s string, want float64) { t.Helper(); nearWithin(t, what, s, want, 0) }

// nearWithin is near with an extra allowance, the rounding of the printed
// inputs want was derived from.
func nearWithin(t *testing.T, what, s string, want, extra float64) {
	t.Helper()
	v, half := printed(t, s)
	if math.Abs(v-want) > half*(1+1e-9)+extra {
		t.Errorf("%s: printed %s, outside value %.9g (rounding bound %.2g)", what, s, want, half)
	}
}

func readGolden(t *testing.T, name string) string {
	t.Helper()
	data, err := os.ReadFile(filepath.Join("..", "..", "testdata", "golden", name))
	if err != nil {
		t.Fatal(err)
	}
	return string(data)
}

// TestGoldenTrapFrequency checks the trap frequency of every golden's
// description line against h nu = 2 sqrt(V0 E_r).
func TestGoldenTrapFrequency(t *testing.T) {
	files, _ := filepath.Glob(filepath.Join("..", "..", "testdata", "golden", "*.txt"))
	for _, f := range files {
		text := readGolden(t, filepath.Base(f))
		s, trap := parseSetup(t, text)
		near(t, filepath.Base(f)+" trap (kHz)", trap, s.trap()/1e3)
	}
}

// TestGoldenSagnac checks the scale factor and Sagnac phase lines of the
// goldens against K = 2 I phi(T) / hbar and K Omega.
func TestGoldenSagnac(t *testing.T) {
	for _, name := range []string{"shot-benchmark.txt", "shot-thermal-check.txt", "shot-file.txt", "shot-noise.txt", "shot-set.txt"} {
		text := readGolden(t, name)
		s, _ := parseSetup(t, text)
		k := s.scaleFactor()
		near(t, name+" K", cell(t, text, "Scale factor K", 0), k)
		near(t, name+" Sagnac phase", cell(t, text, "Sagnac phase", 0), k*s.rotation)
		// The bias lines are the bias in rad over K, in rad/s and deg/h.
		b, hb := printed(t, cell(t, text, "Bias at zero rotation b = phase - K_shot Omega", 0))
		for _, line := range strings.Split(text, "\n") {
			if strings.Contains(line, "Bias as a rotation rate") && strings.Contains(line, "deg/h") {
				nearWithin(t, name+" bias deg/h", strings.Split(line, "|")[2], b/k*degPerHPerRadS, hb/k*degPerHPerRadS)
			}
		}
	}
	for _, name := range []string{"run-ensemble.txt", "qualify-ensemble.txt", "demo.txt"} {
		text := readGolden(t, name)
		s, _ := parseSetup(t, text)
		near(t, name+" K", cell(t, text, "Scale factor K", 0), s.scaleFactor())
	}
	// The JSON goldens print K in full: the same formula agrees to
	// rounding (measured: relative 1e-16; allowed 1e-14).
	for _, tt := range []struct {
		name, twin string
	}{{"shot-noise.json", "shot-noise.txt"}, {"run-ensemble.json", "run-ensemble.txt"}} {
		var v struct {
			K      float64  `json:"scale_factor_s"`
			Sagnac *float64 `json:"sagnac_rad"`
		}
		if err := json.Unmarshal([]byte(readGolden(t, tt.name)), &v); err != nil {
			t.Fatal(err)
		}
		s, _ := parseSetup(t, readGolden(t, tt.twin))
		if k := s.scaleFactor(); math.Abs(v.K-k) > 1e-14*k {
			t.Errorf("%s: K = %.17g, outside value %.17g", tt.name, v.K, k)
		}
		if v.Sagnac != nil {
			if want := s.scaleFactor() * s.rotation; math.Abs(*v.Sagnac-want) > 1e-14*want {
				t.Errorf("%s: Sagnac phase %.17g, outside value %.17g", tt.name, *v.Sagnac, want)
			}
		}
	}
}

// TestGoldenRampTables checks the drive tables of the ramp goldens: the
// drive offset N Omega_0 / 2 pi, the trap periods t_r nu, the angle of a
// sin^2 ramp Omega_0 t_r / 2 (the mean of sin^2), the cruise time
// (2 pi laps - 2 theta_r) / Omega_0 and the total time 2 t_r + cruise.
func TestGoldenRampTables(t *testing.T) {
	for _, name := range []string{"ramp-inverse.txt", "ramp-file-drive.txt", "ramp-throw.txt"} {
		text := readGolden(t, name)
		s, _ := parseSetup(t, text)
		near(t, name+" drive offset", cell(t, text, "Drive offset at cruise", 0), float64(s.sites)*s.cruise/(2*math.Pi))
		near(t, name+" trap periods", cell(t, text, "Trap periods in the ramp-up", 0), s.rampS*s.trap())
		theta, _ := printed(t, cell(t, text, "Angle of each ramp", 0))
		if s.shape == "sin2" || strings.HasPrefix(s.shape, "sin2-") {
			near(t, name+" ramp angle", cell(t, text, "Angle of each ramp", 0), s.cruise*s.rampS/2)
		}
		cruise := (2*math.Pi*s.laps - 2*theta) / s.cruise
		near(t, name+" cruise time (ms)", cell(t, text, "Cruise time", 0), cruise*1e3)
		near(t, name+" total time (ms)", cell(t, text, "Total time T", 0), (2*s.rampS+cruise)*1e3)
	}
}

// binomTail returns P(X >= k) for X ~ Binomial(n, p), summed term by term.
func binomTail(k, n int, p float64) float64 {
	var s float64
	for j := k; j <= n; j++ {
		lg, _ := math.Lgamma(float64(n + 1))
		a, _ := math.Lgamma(float64(j + 1))
		b, _ := math.Lgamma(float64(n - j + 1))
		s += math.Exp(lg - a - b + float64(j)*math.Log(p) + float64(n-j)*math.Log1p(-p))
	}
	return s
}

// bracketed checks that the root in p of f(p) = target lies within the
// rounding interval of the printed p (f monotone).
func bracketed(t *testing.T, what, s string, f func(p float64) float64, target float64) {
	t.Helper()
	v, half := printed(t, s)
	lo, hi := f(v-half)-target, f(v+half)-target
	if lo*hi > 0 {
		t.Errorf("%s: printed %s, but the root of the defining equation is outside [%g, %g] (residuals %.3g, %.3g)", what, s, v-half, v+half, lo, hi)
	}
}

// TestGoldenYield checks the yield bounds of the goldens against the
// definition of the Clopper-Pearson interval (Clopper and Pearson,
// Biometrika 26, 404 (1934)): the lower bound p_L of k of n solves
// P(X >= k; p_L) = alpha, the upper p_U solves P(X <= k; p_U) = alpha, with
// alpha the one-sided level; at k = 0 and k = n they are closed forms.
func TestGoldenYield(t *testing.T) {
	// run: 0 of 16, two-sided 95 %: p_U = 1 - 0.025^(1/16) = 0.2059.
	text := readGolden(t, "run-ensemble.txt")
	ci := cell(t, text, "Yield (contrast >= 0.95): 0 of 16", 1)
	hi := strings.TrimSuffix(strings.Fields(ci)[1], "]")
	near(t, "run yield upper", hi, 1-math.Pow(0.025, 1.0/16))

	// The first look of a qualification bounds each side at the look's
	// share alpha_1 = 0.05 * 6 / pi^2 of the 95 % claim (stats.LookAlpha;
	// docs/model.md, Statistics).
	alpha1 := 0.05 * 6 / (math.Pi * math.Pi)

	// demo: 100 of 100, one-sided: p_L = alpha_1^(1/100).
	text = readGolden(t, "demo.txt")
	near(t, "demo yield lower", cell(t, text, "yield.min", 3), math.Pow(alpha1, 1.0/100))

	// qualify: 7 of 80, one-sided at alpha_1 each side.
	text = readGolden(t, "qualify-ensemble.txt")
	near(t, "qualify yield", cell(t, text, "yield.min", 2), 7.0/80)
	bracketed(t, "qualify yield lower", cell(t, text, "yield.min", 3), func(p float64) float64 { return binomTail(7, 80, p) }, alpha1)
	bracketed(t, "qualify yield upper", cell(t, text, "yield.min", 4), func(p float64) float64 { return 1 - binomTail(8, 80, p) }, alpha1)
}

var projectionLabel = regexp.MustCompile(`Projection-noise limit per shot, ([\d.e+]+) atoms at contrast ([\d.]+)`)
var arwLabel = regexp.MustCompile(`Angle random walk, one shot per ([\d.]+) s`)

// TestGoldenGyroFigures checks the read-out lines of the goldens: the
// projection-noise limit of one shot delta Omega = 1 / (K C sqrt(N_at)) and
// the angle random walk delta Omega sqrt(T_c) (docs/model.md, Gyroscope
// figures), from the printed K, C, N_at and T_c, allowing for their
// rounding.
func TestGoldenGyroFigures(t *testing.T) {
	for _, name := range []string{"qualify-ensemble.txt", "demo.txt"} {
		text := readGolden(t, name)
		k, hk := printed(t, cell(t, text, "Scale factor K", 0))
		var lines []string
		for _, line := range strings.Split(text, "\n") {
			if projectionLabel.MatchString(line) || arwLabel.MatchString(line) {
				lines = append(lines, line)
			}
		}
		if len(lines) != 2 {
			t.Fatalf("%s: %d read-out lines, want 2", name, len(lines))
		}
		m := projectionLabel.FindStringSubmatch(lines[0])
		atoms, _ := strconv.ParseFloat(m[1], 64)
		c, hc := printed(t, m[2])
		limit := 1 / (k * c * math.Sqrt(atoms)) * degPerHPerRadS
		rel := hk/k + hc/c
		nearWithin(t, name+" projection limit (deg/h)", strings.Split(lines[0], "|")[2], limit, rel*limit)
		cycle, _ := strconv.ParseFloat(arwLabel.FindStringSubmatch(lines[1])[1], 64)
		arw := limit * math.Sqrt(cycle/3600)
		nearWithin(t, name+" angle random walk (deg/sqrt(h))", strings.Split(lines[1], "|")[2], arw, rel*arw)
	}
}
