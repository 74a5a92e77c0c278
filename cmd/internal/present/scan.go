package present

import (
	"bufio"
	"fmt"
	"io"
	"math"
	"path/filepath"
	"slices"
	"strings"

	"rampart/cmd/internal/plots"
	"rampart/design"
	"rampart/internal/atomicfile"
	"rampart/internal/plural"
	"rampart/sim"
)

// Files a scan writes to its output directory.
const (
	ScanCSVFile  = "scan.csv"
	ScanJSONFile = "scan.json"
)

// ScanReport is the result of rampart scan: one entry per point, the last
// key varying fastest (design.Grid).
type ScanReport struct {
	Scenario string   `json:"scenario"`
	Keys     []string `json:"keys"`
	// Ensemble reports a scan of ensemble figures under the noise budget
	// (Samples realisations from Seed at every point: common random
	// numbers); otherwise of the noise-free shot.
	Ensemble   bool    `json:"ensemble"`
	Samples    int     `json:"samples,omitempty"`
	Seed       uint64  `json:"seed,omitempty"`
	Confidence float64 `json:"confidence,omitempty"`
	// ContrastLimit and BiasLimitRad are the spec's contrast p05 and |bias|
	// p95 limits (zero: none), drawn as lines and contours.
	ContrastLimit float64     `json:"contrast_limit,omitempty"`
	BiasLimitRad  float64     `json:"bias_limit_rad,omitempty"`
	Points        []ScanPoint `json:"points"`
}

// ScanPoint is one point of a scan.
type ScanPoint struct {
	Values   []float64       `json:"values"`
	Nominal  *design.Nominal `json:"nominal,omitempty"`
	Ensemble *design.Metrics `json:"ensemble,omitempty"`
	// Numerics is an ensemble point's nominal shot's estimated numerical
	// error, checked before its ensemble ran (a noise-free point carries
	// its own in Nominal).
	Numerics *sim.ErrorEstimate `json:"numerics_error,omitempty"`
}

// NumericsError returns the point's estimate, nil if it was not checked.
func (p ScanPoint) NumericsError() *sim.ErrorEstimate {
	if p.Nominal != nil {
		return p.Nominal.Numerics
	}
	return p.Numerics
}

// ScanGrid returns the scan's table.
func ScanGrid(rep ScanReport) *Grid {
	header := append([]string{}, rep.Keys...)
	if !rep.Ensemble {
		g := NewGrid("Noise-free shot at each point", append(header, "Contrast", "Phase (rad)", "Phase - K Omega (rad)", "Ground +", "Ground -", "Peak speed (rad/s)")...)
		for _, p := range rep.Points {
			n := p.Nominal
			peak := Sig(n.PeakSpeedRadS, 5)
			if n.Reverses {
				peak += " (reverses)"
			}
			bias := Sci(n.BiasRad, 3)
			if belowResolution(p) {
				bias += " *"
			}
			g.Append(append(values(p), Fixed(n.Contrast, 5), Sci(n.PhaseRad, 6), bias, Fixed(n.Ground[0], 5), Fixed(n.Ground[1], 5), peak)...)
		}
		return g
	}
	conf := Sig(100*rep.Confidence, 3) + " %"
	g := NewGrid(fmt.Sprintf("Ensemble of %s at each point (seed %d at every point: common random numbers)", plural.Count(rep.Samples, "realisation"), rep.Seed),
		append(header, "Mean contrast", "Contrast p05", conf+" interval", "|bias| p95 (rad)", conf+" interval", "Yield", conf+" interval")...)
	for _, p := range rep.Points {
		m := p.Ensemble
		yield, yci := "-", ""
		if m.Yield != nil {
			yield, yci = Fixed(m.Yield.Value, 3), interval(m.Yield.Lo, m.Yield.Hi, func(x float64) string { return Fixed(x, 3) })
		}
		g.Append(append(values(p), Fixed(m.ContrastMean.Value, 5), Fixed(m.ContrastP05.Value, 5), boundedCell(m.ContrastP05, func(x float64) string { return Fixed(x, 5) }),
			Sci(m.AbsBiasP95.Value, 3), boundedCell(m.AbsBiasP95, func(x float64) string { return Sci(x, 3) }), yield, yci)...)
	}
	return g
}

func values(p ScanPoint) []string {
	out := make([]string, len(p.Values))
	for i, v := range p.Values {
		out[i] = Sig(v, 6)
	}
	return out
}

// boundedCell shows an interval, or the size that would have one.
func boundedCell(b design.Bounded, f func(float64) string) string {
	if b.CI == nil {
		return noneBelow(b.NoBoundBelow)
	}
	return interval(b.CI[0], b.CI[1], f)
}

// belowResolution reports a noise-free point whose bias is smaller than
// its estimated phase error.
func belowResolution(p ScanPoint) bool {
	return p.Nominal != nil && p.Nominal.Numerics != nil && math.Abs(p.Nominal.BiasRad) < p.Nominal.Numerics.PhaseErrorRad
}

// ScanNumerics summarises the noise-free scan's numerical error: the
// largest estimated errors over the points, and the points whose
// estimates miss the targets (in scan order).
func ScanNumerics(rep ScanReport) (checked int, worstC, worstPhi float64, missed []ScanPoint) {
	for _, p := range rep.Points {
		e := p.NumericsError()
		if e == nil {
			continue
		}
		checked++
		worstC, worstPhi = math.Max(worstC, e.ContrastError), math.Max(worstPhi, e.PhaseErrorRad)
		if !e.Met {
			missed = append(missed, p)
		}
	}
	return checked, worstC, worstPhi, missed
}

// ScanPointName names a point by its keys' values, "ramp.duration_us=150".
func ScanPointName(rep ScanReport, p ScanPoint) string {
	var parts []string
	for i, k := range rep.Keys {
		parts = append(parts, k+"="+Sig(p.Values[i], 6))
	}
	return strings.Join(parts, " ")
}

// ScanNotes explain the scan table.
func ScanNotes(rep ScanReport) []string {
	if !rep.Ensemble {
		checked, worstC, worstPhi, missed := ScanNumerics(rep)
		which, more := fmt.Sprintf("at all %s", plural.Count(checked, "point")), ""
		if checked < len(rep.Points) {
			which, more = fmt.Sprintf("at the scan's corners and centre, %s", plural.Count(checked, "point")), "; --check estimates it at every point"
		}
		numerics := fmt.Sprintf("Numerics: automatic at each point; the estimated error (the shot against the same shot on twice the grid and half the step) is at most %s in contrast and %s rad in phase %s (targets %s, %s rad%s).",
			Sci(worstC, 2), Sci(worstPhi, 2), which, Sci(sim.ContrastTarget, 1), Sci(sim.PhaseTargetRad, 1), more)
		if len(missed) > 0 {
			verb := "miss"
			if len(missed) == 1 {
				verb = "misses"
			}
			numerics += fmt.Sprintf(" %s %s the targets, first %s: %s.", plural.Count(len(missed), "point"), verb, ScanPointName(rep, missed[0]), missed[0].NumericsError().Remedy)
		}
		notes := []string{numerics}
		if slices.ContainsFunc(rep.Points, belowResolution) {
			notes = append(notes, "*: the bias is below its point's estimated phase error, the numerical resolution: its digits are discretisation error, not a result (points not checked are not marked).")
		}
		return append(notes, "Each point is the noise-free shot rampart shot simulates, the apparatus's field offset and gradient, scattering, radius error and ring potential included. Phase - K Omega: the bias against the nominal scale factor K = 2 I phi(T) / hbar (CSV and JSON bias_rad); rampart shot's zero-rate bias subtracts the shot's own K_shot Omega instead and differs from it by (K_shot - K) Omega.",
			"Ground +/-: each arm's ground-band population after the ramp-up. Peak speed: the largest |Omega| of the ramp-up (above the cruise speed when the ramp overshoots).")
	}
	checked, worstC, worstPhi, _ := ScanNumerics(rep)
	var notes []string
	if checked > 0 {
		notes = append(notes, fmt.Sprintf("Numerics: each point's nominal shot was checked before its ensemble ran (against the same shot on twice the grid and half the step): estimated error at most %s in contrast and %s rad in phase over the %s (targets %s, %s rad).",
			Sci(worstC, 2), Sci(worstPhi, 2), plural.Count(checked, "point"), Sci(sim.ContrastTarget, 1), Sci(sim.PhaseTargetRad, 1)))
	}
	return append(notes, "Intervals are two-sided at the stated confidence: exact order-statistic intervals for the quantiles (\"none below N\": no interval exists from fewer than N realisations), Clopper-Pearson for the yield. They hold point by point, not jointly over the scan; use rampart edge for a decision over a range.")
}

// PrintScan prints the scan's table with its notes.
func PrintScan(w io.Writer, rep ScanReport) error {
	return ScanGrid(rep).RenderNoted(w, ScanNotes(rep))
}

// WriteScanCSV writes the scan as CSV: the keys, then the figures (for an
// ensemble, each quantile with its interval; an absent interval is empty).
func WriteScanCSV(w io.Writer, rep ScanReport) error {
	bw := bufio.NewWriter(w)
	cols := append([]string{}, rep.Keys...)
	if rep.Ensemble {
		cols = append(cols, "contrast_mean", "contrast_p05", "contrast_p05_lo", "contrast_p05_hi", "abs_bias_p95_rad", "abs_bias_p95_lo_rad", "abs_bias_p95_hi_rad", "yield", "yield_lo", "yield_hi")
	} else {
		cols = append(cols, "contrast", "phase_rad", "bias_rad", "ground_plus", "ground_minus", "peak_speed_rad_s", "reverses", "contrast_error", "phase_error_rad")
	}
	fmt.Fprintln(bw, strings.Join(cols, ","))
	num := func(x float64) string { return Sig(x, -1) }
	ci := func(b design.Bounded) []string {
		if b.CI == nil {
			return []string{"", ""}
		}
		return []string{num(b.CI[0]), num(b.CI[1])}
	}
	for _, p := range rep.Points {
		row := make([]string, 0, len(cols))
		for _, v := range p.Values {
			row = append(row, num(v))
		}
		if m := p.Ensemble; m != nil {
			row = append(row, num(m.ContrastMean.Value), num(m.ContrastP05.Value))
			row = append(row, ci(m.ContrastP05)...)
			row = append(row, num(m.AbsBiasP95.Value))
			row = append(row, ci(m.AbsBiasP95)...)
			if m.Yield != nil {
				row = append(row, num(m.Yield.Value), num(m.Yield.Lo), num(m.Yield.Hi))
			} else {
				row = append(row, "", "", "")
			}
		} else {
			n := p.Nominal
			row = append(row, num(n.Contrast), num(n.PhaseRad), num(n.BiasRad), num(n.Ground[0]), num(n.Ground[1]), num(n.PeakSpeedRadS), fmt.Sprint(n.Reverses))
			if e := n.Numerics; e != nil {
				row = append(row, num(e.ContrastError), num(e.PhaseErrorRad))
			} else {
				row = append(row, "", "") // not checked
			}
		}
		fmt.Fprintln(bw, strings.Join(row, ","))
	}
	return bw.Flush()
}

// WriteScan writes the CSV, the JSON and the figures of a scan to dir.
func WriteScan(dir string, rep ScanReport) error {
	if err := atomicfile.Write(filepath.Join(dir, ScanCSVFile), func(w io.Writer) error { return WriteScanCSV(w, rep) }); err != nil {
		return err
	}
	if err := atomicfile.Write(filepath.Join(dir, ScanJSONFile), func(w io.Writer) error { return WriteJSON(w, rep) }); err != nil {
		return err
	}
	nfs, err := ScanFigures(rep)
	if err != nil {
		return err
	}
	return writeFigures(dir, nfs)
}

// ScanFigures returns the scan's figures, scan-contrast and scan-bias:
// lines against the key for one key (with the ensemble's intervals as a
// band and the spec limit as a line), a colour map for two keys (with the
// spec limit as a contour).
func ScanFigures(rep ScanReport) ([]namedFigure, error) {
	if len(rep.Points) < 2 {
		return nil, nil
	}
	contrast := func(p ScanPoint) (v, lo, hi float64) {
		if p.Ensemble != nil {
			return withCI(p.Ensemble.ContrastP05)
		}
		return p.Nominal.Contrast, math.NaN(), math.NaN()
	}
	bias := func(p ScanPoint) (v, lo, hi float64) {
		if p.Ensemble != nil {
			return withCI(p.Ensemble.AbsBiasP95)
		}
		return math.Abs(p.Nominal.BiasRad), math.NaN(), math.NaN()
	}
	cLabel, bLabel := "contrast", "|phase - K Omega| (rad)"
	if rep.Ensemble {
		cLabel, bLabel = "contrast p05", "|bias| p95 (rad)"
	}
	var out []namedFigure
	for _, f := range []struct {
		name, label string
		limit       float64
		of          func(ScanPoint) (float64, float64, float64)
	}{
		{"scan-contrast", cLabel, rep.ContrastLimit, contrast},
		{"scan-bias", bLabel, rep.BiasLimitRad, bias},
	} {
		var fig *plots.Figure
		var err error
		var caption string
		if len(rep.Keys) == 1 {
			fig, err = scanLines(rep, f.label, f.limit, f.of)
			caption = fmt.Sprintf("The %s against %s.", f.label, rep.Keys[0])
		} else {
			fig, err = scanMap(rep, f.label, f.limit, f.of)
			caption = fmt.Sprintf("The %s over %s and %s.", f.label, rep.Keys[0], rep.Keys[1])
		}
		if err != nil {
			return nil, fmt.Errorf("figure %s: %w", f.name, err)
		}
		if fig == nil {
			continue
		}
		if f.limit > 0 {
			caption += fmt.Sprintf(" The spec limit %s is drawn.", Sig(f.limit, 4))
		}
		out = append(out, namedFigure{name: f.name, caption: caption, fig: fig})
	}
	return out, nil
}

func withCI(b design.Bounded) (v, lo, hi float64) {
	if b.CI == nil {
		return b.Value, math.NaN(), math.NaN()
	}
	return b.Value, b.CI[0], b.CI[1]
}

func scanLines(rep ScanReport, label string, limit float64, of func(ScanPoint) (float64, float64, float64)) (*plots.Figure, error) {
	s := plots.Series{Name: label}
	var band plots.Band
	for _, p := range rep.Points {
		v, lo, hi := of(p)
		s.X, s.Y = append(s.X, p.Values[0]), append(s.Y, v)
		if !math.IsNaN(lo) {
			band.X, band.Lo, band.Hi = append(band.X, p.Values[0]), append(band.Lo, lo), append(band.Hi, hi)
		}
	}
	opts := plots.LinesOptions{Title: "Scan of " + rep.Scenario, XLabel: rep.Keys[0], YLabel: label}
	if len(band.X) >= 2 {
		band.Name = Sig(100*rep.Confidence, 3) + " % interval"
		opts.Bands = []plots.Band{band}
	}
	if limit > 0 {
		opts.HLines = []plots.Marker{{Label: "spec limit " + Sig(limit, 4), Value: limit}}
	}
	return plots.Lines([]plots.Series{s}, opts)
}

// scanMap draws a two-key scan; it returns nil when either axis is not
// increasing (a listed axis out of order), as a map needs.
func scanMap(rep ScanReport, label string, limit float64, of func(ScanPoint) (float64, float64, float64)) (*plots.Figure, error) {
	var x, y []float64
	for _, p := range rep.Points {
		if len(x) == 0 || p.Values[0] != x[len(x)-1] {
			x = append(x, p.Values[0])
		}
		if len(x) == 1 {
			y = append(y, p.Values[1])
		}
	}
	if len(x) < 2 || len(y) < 2 || len(x)*len(y) != len(rep.Points) || !ascending(x) || !ascending(y) {
		return nil, nil
	}
	z := make([][]float64, len(x))
	for i := range x {
		z[i] = make([]float64, len(y))
		for j := range y {
			z[i][j], _, _ = of(rep.Points[i*len(y)+j])
		}
	}
	opts := plots.MapOptions{Title: "Scan of " + rep.Scenario, XLabel: rep.Keys[0], YLabel: rep.Keys[1], ZLabel: label}
	if limit > 0 {
		opts.Contour = &plots.Marker{Label: "spec limit " + Sig(limit, 4), Value: limit}
	}
	return plots.Map(x, y, z, opts)
}

func ascending(v []float64) bool {
	for i := 1; i < len(v); i++ {
		if !(v[i] > v[i-1]) {
			return false
		}
	}
	return true
}
