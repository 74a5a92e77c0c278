package main

import (
	"encoding/json"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"
)

// responseArgs is the small scenario of the response tests: the noise
// scenario (inverse ramp, RIN and a drive phase table) at half a lap,
// against the demo's spec.
var responseArgs = []string{"response", "--scenario", "testdata/scenarios/noise.toml", "--set", "motion.laps=0.5", "--spec", "testdata/demo/spec.toml"}

// TestGoldenResponse compares the tables of response with
// testdata/golden/response-noise.txt.
func TestGoldenResponse(t *testing.T) {
	stdout, stderr, code := execute(t, responseArgs...)
	if code != 0 || stderr != "" {
		t.Fatalf("exit %d, stderr %q", code, stderr)
	}
	golden(t, "response-noise.txt", stdout)
}

// TestResponseJSON checks the keys --json carries (issue 11: channels with
// name, frequency_hz, bias_kernel, contrast_kernel; predicted with
// contrast_loss, bias_std_rad, by_channel), that the totals are the sums
// of the channels (losses add, variances add; tolerance 1e-12 relative),
// and the shift channel's bias kernel against the free-evolution filter
// function of a phase that only accumulates, |G(f)|^2 = (2 pi)^2
// sin^2(pi f T)/(pi f)^2 for a shift in Hz (the sinc^2 of Cheinet et al.,
// IEEE Trans. Instrum. Meas. 57, 1141 (2008), and of Green, Uys and
// Biercuk, New J. Phys. 15, 095004 (2013), for free evolution), to 1e-9
// of its peak (2 pi T)^2 (the kernel is that integral's closed form summed
// with the levels' weights, which add to 1). The same run writes --out and
// --report, and a 4-shot --confirm (its keys and standard errors).
func TestResponseJSON(t *testing.T) {
	dir, rdir := t.TempDir(), t.TempDir()
	stdout, stderr, code := execute(t, append(responseArgs, "--json", "--out", dir, "--report", rdir, "--confirm", "4")...)
	if code != 0 {
		t.Fatalf("exit %d, stderr %q", code, stderr)
	}
	checkResponseOut(t, dir)
	page, err := os.ReadFile(filepath.Join(rdir, "report.html"))
	if err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{"Noise transfer functions", `id="response-phase-common"`, `id="response-mask-phase"`, `id="drive"`, "Noise masks against spec"} {
		if !strings.Contains(string(page), want) {
			t.Errorf("report lacks %q", want)
		}
	}
	var raw map[string]any
	if err := json.Unmarshal([]byte(stdout), &raw); err != nil {
		t.Fatal(err)
	}
	for _, k := range []string{"channels", "predicted", "masks", "trap_hz", "duration_s"} {
		if _, ok := raw[k]; !ok {
			t.Errorf("JSON lacks %q", k)
		}
	}
	var rep struct {
		Confirm *struct {
			Samples        int     `json:"samples"`
			ContrastLossSE float64 `json:"contrast_loss_se"`
			BiasStdRad     float64 `json:"bias_std_rad"`
			BiasStdSE      float64 `json:"bias_std_se"`
		} `json:"confirm"`
		DurationS float64 `json:"duration_s"`
		Channels  []struct {
			Name           string    `json:"name"`
			FrequencyHz    []float64 `json:"frequency_hz"`
			BiasKernel     []float64 `json:"bias_kernel"`
			ContrastKernel []float64 `json:"contrast_kernel"`
		} `json:"channels"`
		Predicted struct {
			ContrastLoss *float64 `json:"contrast_loss"`
			BiasStdRad   *float64 `json:"bias_std_rad"`
			ByChannel    []struct {
				Channel      string  `json:"channel"`
				ContrastLoss float64 `json:"contrast_loss"`
				BiasStdRad   float64 `json:"bias_std_rad"`
			} `json:"by_channel"`
		} `json:"predicted"`
	}
	if err := json.Unmarshal([]byte(stdout), &rep); err != nil {
		t.Fatal(err)
	}
	if c := rep.Confirm; c == nil || c.Samples != 4 || !(c.ContrastLossSE > 0) || !(c.BiasStdRad > 0) || math.Abs(c.BiasStdSE-c.BiasStdRad/math.Sqrt(6)) > 1e-12*c.BiasStdRad {
		t.Errorf("confirm %+v: want 4 samples, positive spreads, and the bias std's s.e. std/sqrt(2 (n-1))", rep.Confirm)
	}
	if len(rep.Channels) != 9 {
		t.Fatalf("%d channels, want 9 (eight channels of the lattice and the rotation channel)", len(rep.Channels))
	}
	for _, c := range rep.Channels {
		if c.Name == "" || len(c.FrequencyHz) < 2 || len(c.BiasKernel) != len(c.FrequencyHz) || len(c.ContrastKernel) != len(c.FrequencyHz) {
			t.Errorf("channel %q: %d frequencies, %d bias and %d contrast values", c.Name, len(c.FrequencyHz), len(c.BiasKernel), len(c.ContrastKernel))
		}
	}
	p := rep.Predicted
	if p.ContrastLoss == nil || p.BiasStdRad == nil || len(p.ByChannel) != 3 {
		t.Fatalf("predicted %+v: want contrast_loss, bias_std_rad and 3 channels (intensity_common and the two phase channels)", p)
	}
	var loss, v float64
	for _, c := range p.ByChannel {
		loss += c.ContrastLoss
		v += c.BiasStdRad * c.BiasStdRad
	}
	if math.Abs(loss-*p.ContrastLoss) > 1e-12*math.Abs(loss) || math.Abs(math.Sqrt(v)-*p.BiasStdRad) > 1e-12*math.Sqrt(v) {
		t.Errorf("totals loss %g, bias std %g; sums of the channels %g, %g (tol 1e-12 relative)", *p.ContrastLoss, *p.BiasStdRad, loss, math.Sqrt(v))
	}
	for _, c := range rep.Channels {
		if c.Name != "shift_differential" {
			continue
		}
		T := rep.DurationS
		peak := math.Pow(2*math.Pi*T, 2)
		for m, f := range c.FrequencyHz {
			want := peak
			if f > 0 {
				want = math.Pow(2*math.Sin(math.Pi*f*T)/f, 2)
			}
			if d := math.Abs(c.BiasKernel[m] - want); d > 1e-9*peak {
				t.Fatalf("shift kernel at %g Hz: %.10g, want %.10g (tol 1e-9 of the peak %g)", f, c.BiasKernel[m], want, peak)
			}
		}
	}
}

// checkResponseOut checks the files --out wrote to dir: the kernels' CSV
// (a row per channel and frequency), the mask's CSV and the figures.
func checkResponseOut(t *testing.T, dir string) {
	t.Helper()
	for _, f := range []string{"response-kernels.csv", "response-mask.csv", "response-phase-common.svg", "response-phase-common.png", "response-mask-phase.svg"} {
		if _, err := os.Stat(filepath.Join(dir, f)); err != nil {
			t.Errorf("--out: %v", err)
		}
	}
	data, err := os.ReadFile(filepath.Join(dir, "response-kernels.csv"))
	if err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(strings.TrimSpace(string(data)), "\n")
	if lines[0] != "channel,unit,frequency_hz,bias_kernel,contrast_kernel" || (len(lines)-1)%9 != 0 {
		t.Errorf("kernels CSV: header %q and %d rows, want a row per channel (9) and frequency", lines[0], len(lines)-1)
	}
}

// TestResponseRefused checks that a sequence whose kernels would not fit
// the memory cap is refused before anything is computed, with the remedy,
// and the other bad options: exit 2, one line, nothing written.
func TestResponseRefused(t *testing.T) {
	dir := t.TempDir()
	out := filepath.Join(dir, "out")
	for _, row := range []struct {
		name string
		args []string
		msg  []string
	}{
		// 10000 laps of the benchmark ring: about 12 GiB with the headroom
		// (the frequency grid's 13 million points).
		{"10000 laps", []string{"response", "--scenario", "testdata/scenarios/benchmark.toml", "--set", "motion.laps=10000", "--out", out},
			[]string{"10000 laps", "more than --memory-mib 3072", "--set motion.laps=", "raise --memory-mib"}},
		{"small cap", []string{"response", "--scenario", "testdata/scenarios/benchmark.toml", "--memory-mib", "4", "--out", out},
			[]string{"more than --memory-mib 4", "even half a lap would not fit"}},
		{"confirm 1", []string{"response", "--scenario", "testdata/scenarios/benchmark.toml", "--confirm", "1"}, []string{"--confirm 1: need 0 (none) or from 2"}},
		{"bands", []string{"response", "--scenario", "testdata/scenarios/benchmark.toml", "--bands", "third"}, []string{`--bands "third": want decade or octave`}},
		{"shares without spec", []string{"response", "--scenario", "testdata/scenarios/benchmark.toml", "--band-share", "0.5,0.5"}, []string{"--band-share needs --spec"}},
	} {
		stdout, stderr, code := execute(t, row.args...)
		if code != 2 || stdout != "" || strings.Count(stderr, "\n") != 1 {
			t.Errorf("%s: exit %d, stdout %q, stderr %q: want 2, nothing, one line", row.name, code, stdout, stderr)
		}
		for _, m := range row.msg {
			if !strings.Contains(stderr, m) {
				t.Errorf("%s: stderr %q lacks %q", row.name, stderr, m)
			}
		}
		if entries, _ := os.ReadDir(dir); len(entries) != 0 {
			t.Errorf("%s: left %v behind", row.name, entries)
		}
	}
}

// TestResponseFlags checks the parsing of response's flags apart from
// running.
func TestResponseFlags(t *testing.T) {
	var got responseOptions
	cmd := newResponseCmd(env{}, func(_ env, _, _ io.Writer, o responseOptions) error { got = o; return nil })
	if err := parse(t, cmd, "--scenario", "s.toml", "--set", "motion.laps=2", "--json", "--out", "D", "--report", "R", "--max-hz", "5e4",
		"--memory-mib", "512", "--confirm", "50", "--seed", "7", "--workers", "2", "--spec", "q.toml", "--bands", "octave", "--band-share", "0.5,0.25,0.25",
		"--spectrum", "rin=white:1e-12+powerlaw:1e-9:-1", "--spectrum", "phase=table:p.csv"); err != nil {
		t.Fatal(err)
	}
	want := responseOptions{scenario: "s.toml", sets: []string{"motion.laps=2"}, json: true, out: "D", report: "R", maxHz: 5e4, memoryMiB: 512,
		confirm: 50, seed: 7, workers: 2, spec: "q.toml", bands: "octave", shares: []float64{0.5, 0.25, 0.25},
		spectra: []string{"rin=white:1e-12+powerlaw:1e-9:-1", "phase=table:p.csv"}}
	if !reflect.DeepEqual(got, want) {
		t.Errorf("got %+v\nwant %+v", got, want)
	}
}

// TestGoldenResponseCheck recomputes numbers of the response golden from
// their definitions, within the rounding of the printed digits (3
// significant figures: 0.5 % each, so 1 % on a combination):
//   - the phase mask in dBc/Hz is 10 log10(S/2), L(f) = S_phi(f)/2 (IEEE Std
//     1139-2008);
//   - the white mask is the harmonic combination of the band masks when
//     the bands tile the white band and the same criterion binds in every
//     one: 1/L_white = (1/n) sum_j 1/L_j for n equal shares (L_j v_j =
//     room/n in band j, L_white sum_j v_j = room);
//   - the total contrast loss is the sum of the channels'.
func TestGoldenResponseCheck(t *testing.T) {
	data, err := os.ReadFile(filepath.Join(repoRoot, "testdata", "golden", "response-noise.txt"))
	if err != nil {
		t.Fatal(err)
	}
	rows := map[string][][]string{}
	for _, line := range strings.Split(string(data), "\n") {
		if !strings.HasPrefix(line, "| ") {
			continue
		}
		var cells []string
		for _, c := range strings.Split(strings.Trim(line, "|"), "|") {
			cells = append(cells, strings.TrimSpace(c))
		}
		rows[cells[0]] = append(rows[cells[0]], cells)
	}
	num := func(s string) float64 {
		t.Helper()
		var x float64
		if _, err := fmt.Sscan(strings.Fields(s)[0], &x); err != nil {
			t.Fatalf("number %q: %v", s, err)
		}
		return x
	}
	phase := rows["phase"]
	if len(phase) != 2 {
		t.Fatalf("%d phase rows, want the white and the band mask", len(phase))
	}
	white, db := num(phase[0][3]), num(phase[0][4])
	if want := 10 * math.Log10(white/2); math.Abs(db-want) > 0.05 {
		t.Errorf("phase mask %g rad^2/Hz printed as %g dBc/Hz, want %.2f (tol 0.05 dB)", white, db, want)
	}
	var inv float64
	bands := phase[1][2:]
	for _, c := range bands {
		if !strings.HasSuffix(c, " b") {
			t.Fatalf("band cell %q: the check needs the bias criterion binding in every band", c)
		}
		inv += 1 / num(c)
	}
	if want := float64(len(bands)) / inv; math.Abs(white-want) > 0.01*want {
		t.Errorf("white phase mask %g, harmonic combination of the bands %g (tol 1 %%)", white, want)
	}
	var loss float64
	for _, ch := range []string{"intensity_common", "phase_common", "phase_differential"} {
		r := rows[ch]
		if len(r) == 0 {
			t.Fatalf("no prediction row for %s", ch)
		}
		// The prediction's row ends in its Resolved cell.
		for _, cells := range r {
			if len(cells) == 5 && (cells[4] == "yes" || cells[4] == "no") {
				loss += num(cells[1])
			}
		}
	}
	if total := num(rows["total"][0][1]); math.Abs(total-loss) > 0.01*loss {
		t.Errorf("total loss %g, sum of the channels %g (tol 1 %%)", total, loss)
	}
}

// TestResponseRINTable checks that response predicts for a scenario's
// intensity-noise table (noise.depth.rin_table, dB/Hz): a table flat at
// -130 dB/Hz (held constant outside its rows, noise.ParseRIN) is white
// noise of that level, so its prediction must equal the white level's
// (rin_db_hz = -130) to rounding (1e-12 relative).
func TestResponseRINTable(t *testing.T) {
	dir := t.TempDir()
	base, err := os.ReadFile(filepath.Join(repoRoot, ensembleScenario))
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(dir, "rin.csv"), []byte("f_hz,rin_db_hz\n10,-130\n1e5,-130\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	losses := map[string]float64{}
	for name, key := range map[string]string{"table": "rin_table = \"rin.csv\"", "white": "rin_db_hz = -130.0"} {
		path := filepath.Join(dir, name+".toml")
		text := strings.Replace(string(base), "[noise.depth]\n", "[noise.depth]\n"+key+"\n", 1)
		if err := os.WriteFile(path, []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
		stdout, stderr, code := execute(t, "response", "--scenario", path, "--set", "ring.sites=10", "--set", "ring.radius_um=2.5", "--json")
		if code != 0 {
			t.Fatalf("%s: exit %d: %s", name, code, stderr)
		}
		var rep struct {
			Processes []struct{ Name string }
			Predicted struct {
				ContrastLoss float64 `json:"contrast_loss"`
			}
		}
		if err := json.Unmarshal([]byte(stdout), &rep); err != nil {
			t.Fatal(err)
		}
		if len(rep.Processes) != 1 || rep.Processes[0].Name != "rin" || !(rep.Predicted.ContrastLoss > 0) {
			t.Fatalf("%s: processes %+v, loss %g: want rin alone and a positive loss", name, rep.Processes, rep.Predicted.ContrastLoss)
		}
		losses[name] = rep.Predicted.ContrastLoss
	}
	if math.Abs(losses["table"]/losses["white"]-1) > 1e-12 {
		t.Errorf("contrast loss of the flat table %.15g, of the white level %.15g (tol 1e-12 relative)", losses["table"], losses["white"])
	}
}

// TestResponseMaskLabUnits: the masks of field and rotation-rate noise are
// in the budget's lab units (uG, urad/s, as tolerance and the scenario
// give them; a new user found G and rad/s). The check ties the units
// together: for a white budget spectrum the mask's white level is the
// growth factor times the budget's own level, as the scenario wrote it.
func TestResponseMaskLabUnits(t *testing.T) {
	if testing.Short() {
		t.Skip("kernels of the demo")
	}
	stdout, stderr, code := execute(t, "response", "--scenario", "testdata/demo/demo.toml", "--spec", "testdata/demo/spec.toml",
		"--set", "noise.field.noise_ug2_hz=1e-2", "--json")
	if code != 0 {
		t.Fatalf("exit %d, stderr %q", code, stderr)
	}
	var rep struct {
		Masks struct {
			Targets []struct {
				Name   string   `json:"name"`
				Unit   string   `json:"unit"`
				Growth *float64 `json:"growth"`
				White  struct {
					Level *float64 `json:"level"`
				} `json:"white"`
				GivenPSD []float64 `json:"given_psd"`
			} `json:"targets"`
		} `json:"masks"`
	}
	if err := json.Unmarshal([]byte(stdout), &rep); err != nil {
		t.Fatal(err)
	}
	// The demo's rotation noise is 1 (urad/s)^2/Hz (testdata/demo/demo.toml).
	want := map[string]struct {
		unit  string
		given float64
	}{"field": {"uG", 1e-2}, "rotation": {"urad/s", 1}}
	seen := 0
	for _, m := range rep.Masks.Targets {
		w, ok := want[m.Name]
		if !ok {
			continue
		}
		seen++
		if m.Unit != w.unit || len(m.GivenPSD) == 0 || math.Abs(m.GivenPSD[0]/w.given-1) > 1e-12 {
			t.Errorf("%s: unit %q, given PSD %v; want %q and %g", m.Name, m.Unit, m.GivenPSD[:min(1, len(m.GivenPSD))], w.unit, w.given)
			continue
		}
		if m.Growth == nil || m.White.Level == nil || math.Abs(*m.White.Level/(*m.Growth*w.given)-1) > 1e-9 {
			t.Errorf("%s: white level %v, growth %v: want level = growth x %g", m.Name, m.White.Level, m.Growth, w.given)
		}
	}
	if seen != 2 {
		t.Errorf("%d of the field and rotation masks found", seen)
	}
}

// TestResponseBandBelowTrap checks that kernels cut below the trap's
// resonances say so: the values at nu and 2 nu read "beyond grid" (null in
// the JSON, not 0), and the prediction carries a warning with the remedy.
func TestResponseBandBelowTrap(t *testing.T) {
	args := []string{"response", "--scenario", "testdata/scenarios/noise.toml", "--set", "motion.laps=0.5", "--max-hz", "3000"}
	stdout, stderr, code := execute(t, args...)
	// 2 nu: twice the trap frequency rampart prints for this ring (4.314
	// kHz, harmonic approximation of the lattice well, docs/model.md).
	if code != 0 || !strings.Contains(stdout, "beyond grid") || !strings.Contains(stdout, "below twice the trap frequency (2 nu = 8627 Hz)") {
		t.Fatalf("exit %d, stderr %q, stdout:\n%s", code, stderr, stdout)
	}
	stdout, _, _ = execute(t, append(args, "--json")...)
	if !strings.Contains(stdout, `"bias_at_trap": null`) || !strings.Contains(stdout, "raise --max-hz above 8627 Hz") {
		t.Errorf("JSON lacks the null values or the warning:\n%.2000s", stdout)
	}
}

// TestResponseMasksNominalFails: when the nominal shot alone breaks the
// spec (contrast 0.48 against a p05 limit of 0.95), the masks' notes say
// so instead of leaving "rest-fails" to blame a budget with no noise.
func TestResponseMasksNominalFails(t *testing.T) {
	stdout, stderr, code := execute(t, "response", "--scenario", ensembleScenario, "--spec", "testdata/demo/spec.toml")
	// 0.4814: this scenario's nominal contrast as rampart computes it
	// (TestScanNominal holds scan and shot to the same shot), 0.95 the
	// demo spec's contrast.p05_min.
	if code != 0 || !strings.Contains(stdout, "The nominal shot alone breaks the contrast criterion (contrast 0.4814 against at least 0.9500)") {
		t.Errorf("exit %d, stderr %q, stdout:\n%s", code, stderr, stdout)
	}
}
