package present

import (
	"fmt"
	"io"
	"math"
	"path/filepath"
	"strconv"
	"strings"

	"rampart/internal/atomicfile"
	"rampart/mc"
	"rampart/sim"
)

// WriteResults writes the summary and the histograms of an ensemble to dir.
func WriteResults(dir string, sum mc.Summary, recs []mc.Record, spec mc.Spec) error {
	return WriteOutcomeResults(dir, sum, mc.OutcomesOf(recs), spec)
}

// WriteOutcomeResults is WriteResults from the ensemble's output columns
// (mc.Outcomes), for ensembles read in bounded memory.
func WriteOutcomeResults(dir string, sum mc.Summary, o *mc.Outcomes, spec mc.Spec) error {
	if err := atomicfile.Write(filepath.Join(dir, SummaryFile), func(w io.Writer) error { return WriteJSON(w, sum) }); err != nil {
		return err
	}
	return writeHistograms(dir, sum, o, spec)
}

// BudgetLine lists the active noise sources of a budget.
func BudgetLine(b mc.Budget) string {
	var parts []string
	for _, s := range mc.Sources {
		if !s.On(b) {
			continue
		}
		line := s.Line
		if s.Kind == mc.Static {
			line = strings.ReplaceAll(line, "{}", Amount(s, *s.Sigma(&b)))
		}
		parts = append(parts, strings.ReplaceAll(line, "{correlation}", Sig(b.PhaseCorrelation, 3)))
	}
	if len(parts) == 0 {
		return "none (every realisation is the nominal shot)"
	}
	return strings.Join(parts, ", ") + " (standard deviations)"
}

// interval formats an interval of values formatted by f.
func interval(lo, hi float64, f func(float64) string) string {
	return "[" + f(lo) + ", " + f(hi) + "]"
}

// noneBelow is the cell of a bound or interval that does not exist at this
// ensemble size, with the smallest size n that has it (as run prints a
// quantile's missing interval).
func noneBelow(n int) string { return fmt.Sprintf("none below %d", n) }

// boundCell formats one bound, or noneBelow(none) when it does not exist
// (none > 0, mc.Criterion.NoLo and NoHi).
func boundCell(v float64, none int, f func(float64) string) string {
	if none > 0 {
		return noneBelow(none)
	}
	return f(v)
}

// criterionBounds formats a criterion's lower and upper bounds as an
// interval, a missing one as noneBelow.
func criterionBounds(c mc.Criterion, f func(float64) string) string {
	return "[" + boundCell(c.Lo, c.NoLo, f) + ", " + boundCell(c.Hi, c.NoHi, f) + "]"
}

// ciCell formats the interval of a distribution's entry, or says how many
// realisations would give one.
func ciCell(d mc.Distribution, key string, f func(float64) string) string {
	if ci, ok := d.CI[key]; ok {
		return interval(ci[0], ci[1], f)
	}
	return noneBelow(d.NoBoundBelow[key])
}

func PrintSummary(w io.Writer, s mc.Summary) error {
	for i, g := range summaryGrids(s) {
		if i > 0 {
			fmt.Fprintln(w)
		}
		if err := g.Render(w); err != nil {
			return err
		}
	}
	notes := ResolutionNotes(s)
	if n := InvertedNote(s); n != "" {
		notes = append(notes, n)
	}
	if len(notes) > 0 {
		fmt.Fprintln(w)
		for _, n := range notes {
			fmt.Fprintln(w, n)
		}
	}
	return nil
}

// notARate stands in a deg/h cell for a bias that is no rotation rate.
const notARate = "n/a, inverted"

// InvertedNote explains, when an ensemble has inverted shots, why some of
// its biases are not converted to rotation rates; empty otherwise.
func InvertedNote(s mc.Summary) string {
	cb := s.BiasCircular
	if cb.Inverted == 0 {
		return ""
	}
	return fmt.Sprintf("%d of the shots with a fringe are inverted (|bias| > pi/2, a fringe read upside down, or contrast below %s): "+
		"a sign flip, not a rotation, so the linear mean and std of the bias, quantiles beyond pi/2 and the mean bias as a rate are not given in deg/h (%q). "+
		"The circular mean direction (%s rad) is the bias of the typical shot; the inverted ones are a defect of the sequence (docs/model.md, Interferometer and signs, Echo sequences).",
		cb.Inverted, Sig(cb.ContrastFloor, 3), notARate, Sci(cb.MeanDirection, 3))
}

// ResolutionNotes says which of an ensemble's printed biases (the mean,
// the median and the averaged fringe's) lie below the estimated phase error
// of the nominal shot: their digits are discretisation error, not a
// result (BelowResolution). None without an estimate.
func ResolutionNotes(s mc.Summary) []string {
	var out []string
	for _, b := range []struct {
		what string
		x    float64
	}{
		{"the mean bias", s.BiasRad.Mean},
		{"the median bias", s.BiasRad.P50},
		{"the averaged-fringe bias", s.FringeBiasRad.Value},
	} {
		if BelowResolution(b.x, s.Numerics) {
			out = append(out, ResolutionNote(b.what, b.x, s.Numerics))
		}
	}
	return out
}

// summaryGrids returns the tables of an ensemble summary: the
// distributions, then the fringe, bias spread, scale factor and yield.
func summaryGrids(s mc.Summary) []*Grid {
	conf := fmt.Sprintf("%s %% interval", Sig(100*s.Confidence, 3))
	c5 := func(x float64) string { return Fixed(x, 5) }
	b3 := func(x float64) string { return Sci(x, 3) }
	title := "Distributions over the realisations, with intervals: mean bootstrap-t, std percentile bootstrap, quantiles exact order statistics"
	if s.IntervalMethod != "" {
		title = "Distributions over the realisations, with intervals: mean skewness-corrected t, std delta method (closed forms, n >= " + strconv.Itoa(mc.AsymptoticMin) + "), quantiles exact order statistics"
	}
	t := NewGrid(title,
		"Statistic", "Contrast", conf, "Bias (rad)", conf, "Bias (deg/h)")
	rows := []struct {
		name, key string
		c, b, d   float64
	}{
		{"mean", "mean", s.Contrast.Mean, s.BiasRad.Mean, s.BiasDegPerH.Mean},
		{"std", "std", s.Contrast.Std, s.BiasRad.Std, s.BiasDegPerH.Std},
		{"p01", "p01", s.Contrast.P01, s.BiasRad.P01, s.BiasDegPerH.P01},
		{"p05", "p05", s.Contrast.P05, s.BiasRad.P05, s.BiasDegPerH.P05},
		{"p50 (median)", "p50", s.Contrast.P50, s.BiasRad.P50, s.BiasDegPerH.P50},
		{"p95", "p95", s.Contrast.P95, s.BiasRad.P95, s.BiasDegPerH.P95},
		{"p99", "p99", s.Contrast.P99, s.BiasRad.P99, s.BiasDegPerH.P99},
	}
	inverted := s.BiasCircular.Inverted > 0
	for _, r := range rows {
		d := b3(r.d)
		// An inverted fringe is a sign flip, not a rotation: with inverted
		// shots among the realisations the linear mean and std, and any
		// quantile beyond pi/2, are no rotation rate (InvertedNote).
		if inverted && (r.key == "mean" || r.key == "std" || math.Abs(r.b) > math.Pi/2) {
			d = notARate
		}
		t.Append(r.name, c5(r.c), ciCell(s.Contrast, r.key, c5), b3(r.b), ciCell(s.BiasRad, r.key, b3), d)
	}
	u := NewGrid("The averaged fringe, the bias spread and the yield", "Quantity", "Value", conf, "Unit")
	u.Append("Averaged-fringe contrast |mean z|", c5(s.FringeContrast.Value), interval(s.FringeContrast.Lo, s.FringeContrast.Hi, c5), "")
	u.Append("Averaged-fringe bias arg(mean z) - Sagnac", b3(s.FringeBiasRad.Value), interval(s.FringeBiasRad.Lo, s.FringeBiasRad.Hi, b3), "rad")
	u.Append("|bias| p95", b3(s.AbsBiasRad.P95), ciCell(s.AbsBiasRad, "p95", b3), "rad")
	cb := s.BiasCircular
	u.Append("Bias as an angle: mean direction (circular std)", b3(cb.MeanDirection), "("+b3(cb.StdDev)+")", "rad")
	u.Append("Inverted shots: |bias| > pi/2 or contrast < "+Sig(cb.ContrastFloor, 3), strconv.Itoa(cb.Inverted), "", "")
	if s.Lost > 0 {
		// docs/model.md, Perturbations, photon scattering.
		u.Append("Lost shots: the atom scattered a photon (z = 0, no bias; outside the yield)", strconv.Itoa(s.Lost), "", "")
	}
	u.Append("Scale factor K", Sig(s.ScaleFactorS, 6), "", "s (rad per rad/s)")
	if y := s.Yield; y != nil {
		var lim []string
		if y.Spec.MinContrast > 0 {
			lim = append(lim, "contrast >= "+Sig(y.Spec.MinContrast, 6))
		}
		if y.Spec.MaxAbsBiasRad > 0 {
			lim = append(lim, "|bias| <= "+Sig(y.Spec.MaxAbsBiasRad, 6)+" rad")
		}
		u.Append(fmt.Sprintf("Yield (%s): %d of %d", strings.Join(lim, ", "), y.Inside, s.Samples), Fixed(y.Value, 4),
			interval(y.Lo, y.Hi, func(x float64) string { return Fixed(x, 4) })+" exact", "")
	}
	grids := []*Grid{t, u}
	if sf := s.ScaleFactorErrorPPM; sf != nil {
		grids = append(grids, scaleFactorGrid(*sf, *s.AbsScaleFactorErrorPPM, conf))
	}
	if m := s.Measured; m != nil {
		grids = append(grids, measuredGrid(s, m, conf))
	}
	return grids
}

// scaleFactorGrid returns the distribution of the realisations'
// scale-factor errors K_shot / K - 1 and of their magnitude, in ppm.
func scaleFactorGrid(sf, abs mc.Distribution, conf string) *Grid {
	f := func(x float64) string { return Sci(x, 3) }
	g := NewGrid("Scale-factor error K_shot / K - 1 over the realisations (ppm; K_shot from shots at Omega +- h)",
		"Statistic", "Scale-factor error (ppm)", conf, "|Scale-factor error| (ppm)", conf)
	for _, r := range []struct {
		name, key string
		a, b      float64
	}{
		{"mean", "mean", sf.Mean, abs.Mean},
		{"std", "std", sf.Std, abs.Std},
		{"p01", "p01", sf.P01, abs.P01},
		{"p05", "p05", sf.P05, abs.P05},
		{"p50 (median)", "p50", sf.P50, abs.P50},
		{"p95", "p95", sf.P95, abs.P95},
		{"p99", "p99", sf.P99, abs.P99},
	} {
		g.Append(r.name, f(r.a), ciCell(sf, r.key, f), f(r.b), ciCell(abs, r.key, f))
	}
	return g
}

// AbsBiasP95DegPerH is the 95th percentile of |bias| of a summary as a
// rotation-rate error.
func AbsBiasP95DegPerH(s mc.Summary) float64 { return mc.BiasDegPerH(s.AbsBiasRad.P95, s.ScaleFactorS) }

// GyroGrid returns the gyroscope figures of an ensemble: its biases as
// rotation rates and, with a read-out, the projection-noise limit and the
// angle random walk (docs/model.md, Gyroscope figures).
func GyroGrid(s mc.Summary, g *mc.Gyro) *Grid {
	b3 := func(x float64) string { return Sci(x, 3) }
	t := NewGrid("Gyroscope figures", "Gyroscope figure", "Value", "Unit")
	t.Append("Scale factor K = 2 I phi(T) / hbar", Sig(s.ScaleFactorS, 6), "s (rad per rad/s)")
	mean, p95 := b3(s.BiasDegPerH.Mean), b3(AbsBiasP95DegPerH(s))
	if s.BiasCircular.Inverted > 0 {
		mean = notARate
		if s.AbsBiasRad.P95 > math.Pi/2 {
			p95 = notARate
		}
	}
	t.Append("Mean bias as a rotation rate", mean, "deg/h")
	t.Append("|bias| p95 as a rotation rate", p95, "deg/h")
	if g != nil {
		t.Append(fmt.Sprintf("Projection-noise limit per shot, %s atoms at contrast %s", Sig(g.Atoms, 6), Fixed(g.Contrast, 4)), b3(g.ShotNoiseDegPerH), "deg/h")
		t.Append(fmt.Sprintf("Angle random walk, one shot per %s s", Sig(g.CycleS, 6)), b3(g.AngleRandomWalkDegPerSqrtH), "deg/sqrt(h)")
	}
	return t
}

// NoReadout says what the gyroscope figures lack without a read-out.
const NoReadout = "(For the projection-noise limit and the angle random walk, give the scenario a [readout] table or --atoms and --cycle-s.)"

// SummaryFile is the JSON summary in an output directory.
const SummaryFile = "summary.json"

// NumericsLine says in one line what numerics a nominal shot used and its
// estimated numerical error (sim.EstimateError): the errors bound by the
// change on twice the grid and half the step, against the targets.
func NumericsLine(est *sim.ErrorEstimate) string {
	if est == nil {
		return "Numerics: not checked"
	}
	line := fmt.Sprintf("Numerics: grid %d, step %s us; estimated error (against grid %d, step %s us) contrast %s, phase %s rad (targets %s, %s rad)",
		est.Grid, Sig(est.StepS*1e6, 4), est.RefinedGrid, Sig(est.RefinedStepS*1e6, 4),
		Sci(est.ContrastError, 2), Sci(est.PhaseErrorRad, 2), Sci(est.ContrastTarget, 1), Sci(est.PhaseTargetRad, 1))
	if est.ModelBiasRad > 0 {
		// docs/model.md, Perturbations: the ring potential's treatment.
		line += fmt.Sprintf("; ring potential model: bias left out of order %s rad", Sci(est.ModelBiasRad, 1))
	}
	return line
}

// RampNumericsLines is NumericsLine for each ramp of a ranking, named.
func RampNumericsLines(rep RankReport) []string {
	var out []string
	for _, r := range rep.Ramps {
		out = append(out, strings.Replace(NumericsLine(r.Summary.Numerics), "Numerics:", "Numerics of "+r.Name+":", 1))
	}
	return out
}

// measuredGrid returns the measured signal (mc.Measured: the bias with the
// read-out's projection and detection noise, docs/model.md, Gyroscope
// figures) beside the true, simulated one.
func measuredGrid(s mc.Summary, m *mc.Measured, conf string) *Grid {
	b3 := func(x float64) string { return Sci(x, 3) }
	noise := readoutNoise(m)
	g := NewGrid("The measured signal: the true (simulated) bias read out with "+noise,
		"Read-out: "+noise, "True", "Measured", conf+" (measured)", "Unit")
	g.Append("bias std", b3(s.BiasRad.Std), b3(m.BiasRad.Std), ciCell(m.BiasRad, "std", b3), "rad")
	g.Append("|bias| p50", b3(s.AbsBiasRad.P50), b3(m.AbsBiasRad.P50), ciCell(m.AbsBiasRad, "p50", b3), "rad")
	g.Append("|bias| p95", b3(s.AbsBiasRad.P95), b3(m.AbsBiasRad.P95), ciCell(m.AbsBiasRad, "p95", b3), "rad")
	if y, yt := m.Yield, s.Yield; y != nil && yt != nil {
		var lim []string
		if y.Spec.MinContrast > 0 {
			lim = append(lim, "contrast >= "+Sig(y.Spec.MinContrast, 6))
		}
		if y.Spec.MaxAbsBiasRad > 0 {
			lim = append(lim, "|bias| <= "+Sig(y.Spec.MaxAbsBiasRad, 6)+" rad")
		}
		g.Append(fmt.Sprintf("yield (%s): %d and %d of %d", strings.Join(lim, ", "), yt.Inside, y.Inside, s.Samples),
			Fixed(yt.Value, 4), Fixed(y.Value, 4), interval(y.Lo, y.Hi, func(x float64) string { return Fixed(x, 4) })+" exact", "")
	}
	return g
}
