package present

import (
	"fmt"
	"io"
	"strings"

	"rampart/cmd/internal/report"
	"rampart/internal/plural"
	"rampart/mc"
)

// QualifyReport is what qualify --json prints.
type QualifyReport struct {
	mc.Qualification
	Spec    string     `json:"spec"`
	Summary mc.Summary `json:"summary"`
	Gyro    *mc.Gyro   `json:"gyro,omitempty"`
	// MeasuredSignal is the qualification of the measured signal (each
	// realisation's bias with the read-out's projection and detection
	// noise, mc.Readout.MeasuredRecords); nil without a read-out. The
	// embedded Qualification is that of the true, simulated signal.
	MeasuredSignal *mc.Qualification `json:"measured_signal,omitempty"`
	// Signal names the verdict that sets the exit code: "true" or
	// "measured"; empty where no exit code depends on it (the demo).
	Signal string `json:"signal,omitempty"`
	// Kernel is the noise transfer functions' prediction for the budget's
	// noise processes, stated beside the verdict; nil when it has none.
	Kernel *KernelPrediction `json:"kernel_prediction,omitempty"`
}

// Gating returns the qualification whose verdict sets the exit code: the
// measured signal's if Signal is "measured" and there is one, else the
// true signal's.
func (rep QualifyReport) Gating() mc.Qualification {
	if rep.Signal == "measured" && rep.MeasuredSignal != nil {
		return *rep.MeasuredSignal
	}
	return rep.Qualification
}

// Deciding lists the criteria behind an overall verdict other than pass:
// those that fail, or else those undecided with what would decide them.
func Deciding(q mc.Qualification) []string {
	var out []string
	for _, c := range q.Criteria {
		if c.Verdict != q.Verdict {
			continue
		}
		s := c.Name
		if c.Verdict == mc.Undecided {
			s += " (" + toDecide(c, q.LookConfidence) + ")"
		}
		out = append(out, s)
	}
	return out
}

// toDecide says how many more realisations would decide an undecided
// criterion; conf is the look's one-sided confidence.
func toDecide(c mc.Criterion, conf float64) string {
	switch {
	case c.Verdict != mc.Undecided:
		return ""
	case c.NoBoundBelow > 0:
		return fmt.Sprintf("no %s %% bound below %d realisations: about %d more", Sig(100*conf, 4), c.NoBoundBelow, c.Extra)
	case c.OutOfReach:
		return "out of reach: the value sits on the limit"
	}
	return fmt.Sprintf("about %d more %s", c.Extra, plural.Noun(c.Extra, "realisation"))
}

// criterionLabels name the statistics of the criteria in figures.
var criterionLabels = map[string]string{
	mc.CriterionContrastMean: "mean contrast",
	mc.CriterionContrastP05:  "contrast p05",
	mc.CriterionBiasRad:      "|bias| p95 (rad)",
	mc.CriterionBiasDegPerH:  "|bias| p95 (deg/h)",
	mc.CriterionYield:        "yield",
	mc.CriterionScaleFactor:  "|scale-factor error| p95 (ppm)",
}

// criterionFormat formats the values of a criterion in its unit.
func criterionFormat(c mc.Criterion) func(float64) string {
	if c.Unit == "" {
		return func(x float64) string { return Fixed(x, 5) }
	}
	return func(x float64) string { return Sci(x, 3) }
}

func PrintQualification(w io.Writer, rep QualifyReport) error {
	for i, g := range criteriaGrids(rep) {
		if rep.MeasuredSignal != nil {
			if i > 0 {
				fmt.Fprintln(w)
			}
			fmt.Fprintln(w, "Against the "+strings.TrimPrefix(g.caption, "The criteria of spec "+rep.Spec+" against the ")+":")
		}
		if err := g.Render(w); err != nil {
			return err
		}
	}
	for _, line := range criteriaNotes(rep) {
		fmt.Fprintln(w, line)
	}
	if s := rep.Summary; s.Lost > 0 {
		fmt.Fprintf(w, "%d of %d shots were lost to photon scattering (z = 0, no bias; outside the yield; docs/model.md, Perturbations).\n", s.Lost, s.Samples)
	}
	if n := InvertedNote(rep.Summary); n != "" {
		fmt.Fprintln(w, n)
	}
	fmt.Fprintln(w)
	if err := GyroGrid(rep.Summary, rep.Gyro).Render(w); err != nil {
		return err
	}
	if rep.Gyro == nil {
		fmt.Fprintln(w, NoReadout)
	}
	fmt.Fprintln(w)
	for _, line := range verdictLines(rep) {
		fmt.Fprintln(w, line)
	}
	return nil
}

// criteriaGrids returns the criteria table of the true signal and, with a
// read-out, that of the measured signal, each labelled.
func criteriaGrids(rep QualifyReport) []*Grid {
	if rep.MeasuredSignal == nil {
		return []*Grid{criteriaGrid(rep.Qualification, rep.Summary, "The criteria of spec "+rep.Spec+" against the ensemble")}
	}
	return []*Grid{
		criteriaGrid(rep.Qualification, rep.Summary, "The criteria of spec "+rep.Spec+" against the true (simulated) signal"),
		criteriaGrid(*rep.MeasuredSignal, rep.Summary, "The criteria of spec "+rep.Spec+" against the measured signal ("+readoutNoise(rep.Summary.Measured)+")"),
	}
}

// readoutNoise describes the read-out noise of the measured signal.
func readoutNoise(m *mc.Measured) string {
	if m == nil {
		return "read-out noise"
	}
	s := "projection noise of " + Sig(m.Atoms, 6) + " atoms"
	if m.DetectionAtoms > 0 {
		s += ", detection noise " + Sig(m.DetectionAtoms, 6) + " atoms rms"
	}
	return s
}

// verdictLines state the verdict, and with a read-out both verdicts, each
// labelled, with the one that sets the exit code named.
func verdictLines(rep QualifyReport) []string {
	if rep.MeasuredSignal == nil {
		return []string{verdictLine(rep.Qualification)}
	}
	gate := func(s string) string {
		if rep.Signal == s {
			return " (sets the exit code)"
		}
		return ""
	}
	return []string{
		"True signal" + gate("true") + ": " + verdictLine(rep.Qualification),
		"Measured signal" + gate("measured") + ": " + verdictLine(*rep.MeasuredSignal),
	}
}

// criteriaGrid returns the table of a qualification's criteria, titled.
// Its "Value" is the statistic of the ensemble (not the measured signal,
// which has its own table).
func criteriaGrid(q mc.Qualification, s mc.Summary, title string) *Grid {
	conf := Sig(100*q.LookConfidence, 4) + " %"
	t := NewGrid(title, "Criterion", "Limit", "Unit", "Value",
		"Lower bound ("+conf+" one-sided)", "Upper bound ("+conf+" one-sided)", "Margin", "Verdict", "To decide", "Value (deg/h)")
	for _, c := range q.Criteria {
		f := criterionFormat(c)
		limit := "<= " + f(c.Limit)
		if c.AtLeast {
			limit = ">= " + f(c.Limit)
		}
		degPerH := ""
		if c.Unit == "rad" {
			degPerH = Sci(mc.BiasDegPerH(c.Value, s.ScaleFactorS), 3)
		}
		t.Append(c.Name, limit, c.Unit, f(c.Value), boundCell(c.Lo, c.NoLo, f), boundCell(c.Hi, c.NoHi, f), f(c.Margin), c.Verdict.String(), toDecide(c, q.LookConfidence), degPerH)
	}
	return t
}

// criteriaNotes explain the criteria table: the yield's count and how a
// bound decides.
func criteriaNotes(rep QualifyReport) []string {
	var out []string
	if s := rep.Summary; s.Yield != nil {
		out = append(out, fmt.Sprintf("Yield: %d of %s inside %s.", s.Yield.Inside, plural.Count(s.Samples, "realisation"), yieldLimits(s.Yield.Spec, s.ScaleFactorS)))
	}
	q := rep.Qualification
	out = append(out, "A limit \"at least\" passes when the lower bound clears it and fails when the upper bound misses it; \"at most\" the other way round.")
	for _, c := range q.Criteria {
		if c.Method == mc.MethodLostMixture {
			out = append(out, "The mean contrast allows for shots lost to photon scattering: a Clopper-Pearson bound on the lost fraction times the bootstrap-t of the shots with a fringe, each at half the tail (docs/model.md, Statistics).")
			break
		}
	}
	if note := kernelPredictionNote(rep.Kernel); note != "" {
		out = append(out, note)
	}
	return append(out, fmt.Sprintf("Look %d: each bound is one-sided at %s %%, this look's share of the %s %% claim, so that qualifying again after topping up the ensemble keeps it; the advice in \"To decide\" is for the next look. Quantiles have exact order-statistic bounds, the mean a bootstrap-t, the yield Clopper-Pearson; a fail is corrected for the number of criteria (Holm).",
		q.Look, Sig(100*q.LookConfidence, 4), Sig(100*q.Confidence, 3)))
}

// verdictLine states the overall verdict and what decides it.
func verdictLine(q mc.Qualification) string {
	conf := Sig(100*q.Confidence, 3) + " %"
	switch q.Verdict {
	case mc.Pass:
		return fmt.Sprintf("Verdict: pass. Every criterion is met with %s confidence over %s.", conf, plural.Count(q.Samples, "realisation"))
	case mc.Fail:
		return fmt.Sprintf("Verdict: fail. Missed with %s confidence: %s.", conf, strings.Join(Deciding(q), ", "))
	}
	return fmt.Sprintf("Verdict: undecided. Not decided at %s confidence over %s: %s.", conf, plural.Count(q.Samples, "realisation"), strings.Join(Deciding(q), ", "))
}

// QualifySection takes what qualify --json prints and shows the verdict,
// the criteria table and the gyroscope figures; the ensemble's own section
// is the caller's to add.
func QualifySection(q QualifyReport) (report.Section, error) {
	text := append(verdictLines(q), criteriaNotes(q)...)
	if q.Gyro == nil {
		text = append(text, NoReadout)
	}
	var tables []report.Table
	for _, g := range criteriaGrids(q) {
		tables = append(tables, g.Table())
	}
	return report.Section{
		Heading: "Qualification against " + q.Spec,
		Text:    strings.Join(text, "\n\n"),
		Tables:  append(tables, GyroGrid(q.Summary, q.Gyro).Table()),
	}, nil
}

// yieldLimits describes a yield spec, with its bias limit as a rotation rate.
func yieldLimits(y mc.Spec, scaleFactorS float64) string {
	var lim []string
	if y.MinContrast > 0 {
		lim = append(lim, "contrast >= "+Sig(y.MinContrast, 6))
	}
	if y.MaxAbsBiasRad > 0 {
		lim = append(lim, fmt.Sprintf("|bias| <= %s rad (%s deg/h)", Sig(y.MaxAbsBiasRad, 6), Sig(mc.BiasDegPerH(y.MaxAbsBiasRad, scaleFactorS), 3)))
	}
	return strings.Join(lim, " and ")
}

// QualificationFile is the verdict in the output directory of qualify.
const QualificationFile = "qualification.json"
