package present

import (
	"fmt"
	"io"
	"math"
	"path/filepath"
	"strings"

	"rampart/cmd/internal/plots"
	"rampart/cmd/internal/report"
	"rampart/internal/atomicfile"
	"rampart/internal/plural"
	"rampart/mc"
	"rampart/sim"
)

// SensitivityReport is what sensitivity --json prints.
type SensitivityReport struct {
	Inputs       []string        `json:"inputs"`
	BaseRows     int             `json:"base_rows"`
	Shots        int             `json:"shots"`
	Seed         uint64          `json:"seed"`
	Sampler      string          `json:"sampler"`
	ScaleFactorS float64         `json:"scale_factor_s"`
	Indices      mc.SobolResult  `json:"indices"`
	Derivatives  []mc.Derivative `json:"derivatives"`
	// Numerics is the nominal shot's estimated numerical error.
	Numerics *sim.ErrorEstimate `json:"numerics_error,omitempty"`
}

func PrintSensitivity(w io.Writer, rep SensitivityReport) error {
	if err := sobolGrid(rep).Render(w); err != nil {
		return err
	}
	fmt.Fprintf(w, "\n%s\n\n", sobolNote(rep))
	d := derivativeGrid(rep)
	if d == nil {
		fmt.Fprintln(w, noDerivatives)
		return nil
	}
	fmt.Fprintln(w, derivativesLead)
	if err := d.Render(w); err != nil {
		return err
	}
	if roundingCells(rep) {
		fmt.Fprintln(w, roundingNote)
	}
	return nil
}

// roundingCells reports whether a derivative cell reads belowRounding.
func roundingCells(rep SensitivityReport) bool {
	for _, d := range rep.Derivatives {
		for _, ch := range []float64{d.Contrast * d.Step, d.ContrastSecond * d.Step * d.Step, d.BiasRad * d.Step} {
			if ch != 0 && math.Abs(ch) < roundingFloor {
				return true
			}
		}
	}
	return false
}

// roundingNote explains the belowRounding cells.
const roundingNote = "\"rounding\": the two shots differ by less than 1e-13 over the step, their rounding, not a sensitivity (--json keeps the value)."

// sobolGrid returns the table of the Sobol' indices, a row per input. An
// index is a share of a variance, in [0, 1]: estimates and bounds are shown
// clipped to it, an estimate that sampling error put outside it is marked
// "*", and an interval wholly outside it "!" (the JSON keeps the raw
// values).
func sobolGrid(rep SensitivityReport) *Grid {
	conf := Sig(100*rep.Indices.Confidence, 3) + " % interval"
	t := NewGrid(fmt.Sprintf("Sobol' indices of contrast and bias, %s", plural.Count(rep.Shots, "shot")), "Input", "Contrast S1", conf, "Contrast ST", conf, "Bias S1", conf, "Bias ST", conf)
	for _, in := range rep.Indices.Inputs {
		row := []string{in.Name}
		for _, i := range []mc.Interval{in.ContrastFirst, in.ContrastTotal, in.BiasFirst, in.BiasTotal} {
			row = append(row, indexCell(i.Value), indexInterval(i.Lo, i.Hi))
		}
		t.Append(row...)
	}
	return t
}

// indexCell formats a Sobol' index clipped to [0, 1], marked "*" if the
// estimate lay outside by more than the printed rounding.
func indexCell(v float64) string {
	s := Fixed(clip01(v), 3)
	if s != Fixed(v, 3) {
		s += "*"
	}
	return s
}

// indexInterval formats an interval of a Sobol' index clipped to [0, 1],
// marked "!" if it excludes [0, 1] altogether.
func indexInterval(lo, hi float64) string {
	s := interval(clip01(lo), clip01(hi), func(x float64) string { return Fixed(x, 3) })
	if hi < 0 || lo > 1 {
		s += "!"
	}
	return s
}

func clip01(x float64) float64 { return math.Min(1, math.Max(0, x)) }

// sobolNote explains the indices and gives the spread they apportion.
func sobolNote(rep SensitivityReport) string {
	biasStd := math.Sqrt(rep.Indices.BiasVariance)
	return fmt.Sprintf("S1: the share of the variance an input causes alone; ST: with all its interactions (ST >= S1; 1 - sum S1 is the share of interactions). Spread over the design: contrast std %s, bias std %s rad (%s deg/h). Bootstrap intervals over the %d rows. Indices lie in [0, 1] and are shown clipped to it: * marks an estimate that sampling error put outside (the JSON keeps it), ! an interval wholly outside, which more base rows (--base) would resolve.",
		Sci(math.Sqrt(rep.Indices.ContrastVariance), 3), Sci(biasStd, 3), Sci(mc.BiasDegPerH(biasStd, rep.ScaleFactorS), 3), rep.BaseRows)
}

// derivativeGrid returns the table of local derivatives, nil without a
// static error in the budget. Steps and derivatives are per the lab unit
// of each input's source, the unit of its tolerance.
func derivativeGrid(rep SensitivityReport) *Grid {
	if len(rep.Derivatives) == 0 {
		return nil
	}
	t := NewGrid(strings.TrimSuffix(derivativesLead, ":"), "Input", "Step h", "Unit", "dC/dx (per unit)", "d2C/dx2 (per unit^2)", "Contrast change C'' h^2/2",
		"db/dx (rad per unit)", "Bias shift b' h (rad)", "Bias shift b' h (deg/h)")
	for _, d := range rep.Derivatives {
		shift := d.BiasRad * d.Step
		// Each derivative is a difference of shots over one step h: a
		// difference below roundingFloor is the shots' rounding, not a
		// sensitivity (the JSON keeps the value).
		cell := func(x, change float64) string {
			if change != 0 && math.Abs(change) < roundingFloor {
				return belowRounding
			}
			return Sci(x, 3)
		}
		c1, c2 := d.Contrast*d.Step, d.ContrastSecond*d.Step*d.Step
		t.Append(d.Input, Sig(d.Step, 4), d.Unit, cell(d.Contrast, c1), cell(d.ContrastSecond, c2), cell(c2/2, c2),
			cell(d.BiasRad, shift), cell(shift, shift), cell(mc.BiasDegPerH(shift, rep.ScaleFactorS), shift))
	}
	return t
}

// roundingFloor is the change of a contrast or a phase (rad) over one step
// below which a finite difference of two shots is rounding: about 500
// units in the last place of numbers of order one, where the shots' own
// rounding (a few hundred operations on each amplitude) lies.
const roundingFloor = 1e-13

// belowRounding stands in a derivative cell whose difference is rounding.
const belowRounding = "rounding"

// SensitivitySection takes what sensitivity --json prints and shows the
// Sobol' index table with its bar charts and the local derivatives.
func SensitivitySection(rep SensitivityReport) (report.Section, error) {
	figs, err := figures(sensitivityFigures(rep))
	if err != nil {
		return report.Section{}, err
	}
	sec := report.Section{
		Heading: "Sensitivity",
		Text:    sobolNote(rep),
		Tables:  []report.Table{sobolGrid(rep).Table()},
		Figures: figs,
	}
	if d := derivativeGrid(rep); d != nil {
		sec.Tables = append(sec.Tables, d.Table())
		if roundingCells(rep) {
			sec.Text += "\n\n" + roundingNote
		}
	} else {
		sec.Text += "\n\n" + noDerivatives
	}
	return sec, nil
}

// WriteSensitivity writes the indices and their bar charts to dir.
func WriteSensitivity(dir string, rep SensitivityReport) error {
	if err := atomicfile.Write(filepath.Join(dir, SensitivityFile), func(w io.Writer) error { return WriteJSON(w, rep) }); err != nil {
		return err
	}
	nfs, err := sensitivityFigures(rep)
	if err != nil {
		return err
	}
	return writeFigures(dir, nfs)
}

// sensitivityFigures returns the bar charts of the indices of the contrast
// and of the bias, named sensitivity-contrast and sensitivity-bias.
func sensitivityFigures(rep SensitivityReport) ([]namedFigure, error) {
	var out []namedFigure
	for _, output := range []struct {
		name, label string
		first       func(mc.SobolInput) mc.Interval
		total       func(mc.SobolInput) mc.Interval
	}{
		{"contrast", "contrast", func(i mc.SobolInput) mc.Interval { return i.ContrastFirst }, func(i mc.SobolInput) mc.Interval { return i.ContrastTotal }},
		{"bias", "bias", func(i mc.SobolInput) mc.Interval { return i.BiasFirst }, func(i mc.SobolInput) mc.Interval { return i.BiasTotal }},
	} {
		first := plots.BarSeries{Name: "first order S1"}
		total := plots.BarSeries{Name: "total ST"}
		for _, in := range rep.Indices.Inputs {
			for _, s := range []struct {
				b *plots.BarSeries
				i mc.Interval
			}{{&first, output.first(in)}, {&total, output.total(in)}} {
				s.b.Values, s.b.Lo, s.b.Hi = append(s.b.Values, clip01(s.i.Value)), append(s.b.Lo, clip01(s.i.Lo)), append(s.b.Hi, clip01(s.i.Hi))
			}
		}
		fig, err := plots.Bars(rep.Inputs, []plots.BarSeries{first, total}, plots.BarsOptions{
			Title:      fmt.Sprintf("Sobol' indices of the %s, %s", output.label, plural.Count(rep.Shots, "shot")),
			ValueLabel: "share of the variance of the " + output.label,
			Horizontal: true,
		})
		if err != nil {
			return nil, fmt.Errorf("bar chart of the %s indices: %w", output.label, err)
		}
		caption := fmt.Sprintf("First-order and total Sobol' indices of the %s for each input, with their %s %% bootstrap intervals, clipped to [0, 1].", output.label, Sig(100*rep.Indices.Confidence, 3))
		out = append(out, namedFigure{name: "sensitivity-" + output.name, caption: caption, fig: fig})
	}
	return out, nil
}

// SensitivityFile holds the indices and derivatives in the output directory.
const SensitivityFile = "sensitivity.json"

// noDerivatives and derivativesLead introduce the table of local
// derivatives, or say why there is none.
const (
	noDerivatives   = "No static errors in the budget: no local derivatives."
	derivativesLead = "Local derivatives of one shot at nominal, central differences over the step h (one budget standard deviation):"
)
