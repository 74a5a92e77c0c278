package present

import (
	"fmt"
	"io"
	"path/filepath"
	"slices"
	"strings"

	"rampart/cmd/internal/plots"
	"rampart/cmd/internal/report"
	"rampart/mc"
	"rampart/scenario"
	"rampart/sim"
)

// figure renders f for a report.
func figure(id, caption string, f *plots.Figure) (report.Figure, error) {
	svg, err := f.SVG()
	if err != nil {
		return report.Figure{}, err
	}
	return report.Figure{ID: id, Caption: caption, SVG: svg}, nil
}

// namedFigure is a figure that --out writes to DIR/NAME.png and .svg and
// a report shows with the id NAME, so that both go by one name.
type namedFigure struct {
	name, caption string
	fig           *plots.Figure
}

// figures renders named figures for a report; it passes on err, that of
// the figures' builder.
func figures(nfs []namedFigure, err error) ([]report.Figure, error) {
	if err != nil {
		return nil, err
	}
	out := make([]report.Figure, len(nfs))
	for i, nf := range nfs {
		f, err := figure(nf.name, nf.caption, nf.fig)
		if err != nil {
			return nil, err
		}
		out[i] = f
	}
	return out, nil
}

// writeFigures writes named figures to dir as PNG and SVG.
func writeFigures(dir string, nfs []namedFigure) error {
	for _, nf := range nfs {
		if err := nf.fig.WriteFiles(filepath.Join(dir, nf.name)); err != nil {
			return err
		}
	}
	return nil
}

// SetupText says in a report what was simulated (the scenario's sequence
// with ramp naming the ramp, and its noise budget) and then how, in lines
// such as the ensemble's: what the terminal shows above a command's tables;
// then a warning for each input outside the model's validity.
func SetupText(sc *scenario.Scenario, cfg sim.Config, ramp string, b mc.Budget, lines ...string) string {
	budget := "Noise budget: " + BudgetLine(b)
	if note := ClampNote(cfg, b); note != "" {
		budget += ". " + strings.TrimSuffix(note, ".")
	}
	paragraphs := append([]string{Describe(sc, cfg, ramp), budget}, lines...)
	text := strings.Join(paragraphs, ".\n\n") + "."
	// Inputs outside the model's validity (sim.Config.Warnings).
	for _, w := range cfg.Warnings() {
		text += "\n\nWarning: " + w + "."
	}
	return text
}

// NamedConfig is a ramp's configuration in a report.
type NamedConfig struct {
	Name   string
	Config sim.Config
}

// DriveAndDynamics returns the sections a report opens with: the drive
// profiles of cfgs and the co-moving dynamics of the nominal shot of the
// one named best.
func DriveAndDynamics(cfgs []NamedConfig, best string) ([]report.Section, error) {
	drive, err := DriveSection(cfgs)
	if err != nil {
		return nil, err
	}
	i := slices.IndexFunc(cfgs, func(c NamedConfig) bool { return c.Name == best })
	if i < 0 {
		panic("rampart: no configuration named " + best)
	}
	dyn, err := DynamicsSection(best, cfgs[i].Config)
	if err != nil {
		return nil, err
	}
	return []report.Section{drive, dyn}, nil
}

// OneRamp is the configuration of a command's one ramp, named after its
// shape, and that name.
func OneRamp(cfg sim.Config) ([]NamedConfig, string) {
	name := cfg.Sequence.Up.Name()
	return []NamedConfig{{name, cfg}}, name
}

// DriveSection plots the ramp-up of each configuration's drive.
func DriveSection(cfgs []NamedConfig) (report.Section, error) {
	var series []plots.Series
	t := NewGrid("The drives", "Ramp", "Ramp-up (us)", "Peak speed (rad/s)", "Reverses", "Cruise (ms)", "Total (ms)")
	for _, c := range cfgs {
		q := c.Config.Sequence
		tr := q.Up.Duration()
		const n = 400
		s := plots.Series{Name: c.Name, X: make([]float64, n+1), Y: make([]float64, n+1)}
		for i := range n + 1 {
			x := tr * float64(i) / n
			s.X[i], s.Y[i] = x*1e6, q.Speed(x)
		}
		series = append(series, s)
		peak, rev := sim.PeakSpeed(q.Up)
		t.Append(c.Name, Sig(tr*1e6, 6), Sig(peak, 5), YesNo(rev), Sig(q.CruiseS*1e3, 5), Sig(q.Duration()*1e3, 5))
	}
	f, err := plots.Lines(series, plots.LinesOptions{Title: "Ramp-up of the drive (the ramp-down is its mirror)", XLabel: "t (us)", YLabel: "Ω (rad/s)"})
	if err != nil {
		return report.Section{}, err
	}
	fig, err := figure("drive", "The lattice speed Omega(t) of arm s = +1 over the ramp-up; arm s = -1 runs at -Omega.", f)
	if err != nil {
		return report.Section{}, err
	}
	return report.Section{
		Heading: "Drive profiles",
		Text:    "Each arm's lattice ramps up to the cruise speed, cruises for the laps and ramps down as the time mirror of the ramp-up.",
		Tables:  []report.Table{t.Table()},
		Figures: []report.Figure{fig},
	}, nil
}

// DynamicsSection traces the nominal shot of cfg and plots each arm's
// motion in the frame co-moving with its lattice: the offset and velocity
// error around the ramp-up and around the ramp-down (the cruise between is
// one exact step, over which the motion the ramp-up left goes on), and the
// ground-band population over the whole sequence.
func DynamicsSection(name string, cfg sim.Config) (report.Section, error) {
	s, err := sim.NewSimulator(cfg)
	if err != nil {
		return report.Section{}, err
	}
	var rows []sim.Diagnostics
	s.Run(sim.Shot{}, func(d sim.Diagnostics) { rows = append(rows, d) })
	q := cfg.Sequence
	edge := q.Up.Duration() + sim.EdgePeriods/cfg.Ring.TrapHz(cfg.DepthHz)
	up := [2]float64{0, edge}
	down := [2]float64{q.Duration() - edge, q.Duration()}
	all := [2]float64{0, q.Duration()}
	type panel struct {
		id, label, caption string
		window             [2]float64
		get                func(sim.Diagnostics) float64
	}
	offset := func(d sim.Diagnostics) float64 { return 1e3 * d.OffsetRad }
	velocity := func(d sim.Diagnostics) float64 { return d.VelocityErrRadS }
	panels := []panel{
		{"offset-up", "offset from the lattice minimum (mrad)", "Mean angular offset of each packet from its lattice minimum, over the ramp-up and the first trap periods of the cruise.", up, offset},
		{"offset-down", "offset from the lattice minimum (mrad)", "The same over the last trap periods of the cruise and the ramp-down: what is left at the end is lost contrast.", down, offset},
		{"velocity-up", "velocity error (rad/s)", "Each packet's angular velocity <L>/I less its lattice's, over the ramp-up.", up, velocity},
		{"velocity-down", "velocity error (rad/s)", "The same over the ramp-down.", down, velocity},
		{"ground", "ground-band population", "Population in the lowest band of the moving lattice over the whole sequence.", all,
			func(d sim.Diagnostics) float64 { return d.GroundBand }},
	}
	sec := report.Section{
		Heading: "Co-moving dynamics, nominal shot (" + name + ")",
		Text: "The lowest level of each arm of the noise-free shot, in the frame that moves with its lattice. " +
			"Over the cruise the motion the ramp-up left oscillates at the trap frequency (the cruise is one exact step); " +
			"the ramp-down adds its own, and the two interfere.",
	}
	for _, pn := range panels {
		var series []plots.Series
		for arm, label := range []string{"arm s = +1", "arm s = −1"} {
			sr := plots.Series{Name: label}
			for _, d := range rows {
				if d.Arm == arm && d.TimeS >= pn.window[0] && d.TimeS <= pn.window[1] {
					sr.X = append(sr.X, d.TimeS*1e3)
					sr.Y = append(sr.Y, pn.get(d))
				}
			}
			series = append(series, sr)
		}
		f, err := plots.Lines(series, plots.LinesOptions{XLabel: "t (ms)", YLabel: pn.label})
		if err != nil {
			return report.Section{}, err
		}
		fig, err := figure("dynamics-"+pn.id, pn.caption, f)
		if err != nil {
			return report.Section{}, err
		}
		sec.Figures = append(sec.Figures, fig)
	}
	return sec, nil
}

// EnsembleSection shows an ensemble's summary tables and histograms.
func EnsembleSection(heading, idPrefix string, sum mc.Summary, recs []mc.Record, spec mc.Spec, text string) (report.Section, error) {
	c, b, err := ensembleFigures(sum, recs, spec)
	if err != nil {
		return report.Section{}, err
	}
	fc, err := figure(idPrefix+"contrast", "Contrast of the realisations.", c)
	if err != nil {
		return report.Section{}, err
	}
	fb, err := figure(idPrefix+"bias", "Bias of the realisations (interferometer phase less the Sagnac phase).", b)
	if err != nil {
		return report.Section{}, err
	}
	notes := ResolutionNotes(sum)
	if n := InvertedNote(sum); n != "" {
		notes = append(notes, n)
	}
	if len(notes) > 0 {
		text = strings.TrimSpace(text + "\n\n" + strings.Join(notes, "\n\n"))
	}
	sec := report.Section{Heading: heading, Text: text, Figures: []report.Figure{fc, fb}}
	for _, g := range summaryGrids(sum) {
		sec.Tables = append(sec.Tables, g.Table())
	}
	return sec, nil
}

// PrintHeader says what was simulated: the scenario, its sequence (with
// ramp naming the ramp) and its noise budget, then how, in lines such as
// the ensemble's, and a blank line (setupText says the same in a report).
func PrintHeader(w io.Writer, sc *scenario.Scenario, cfg sim.Config, ramp string, b mc.Budget, lines ...string) {
	fmt.Fprintf(w, "Scenario %s\n%s\n", sc.Name, Describe(sc, cfg, ramp))
	fmt.Fprintf(w, "Noise budget: %s\n", BudgetLine(b))
	if note := ClampNote(cfg, b); note != "" {
		fmt.Fprintln(w, note)
	}
	for _, line := range lines {
		fmt.Fprintln(w, line)
	}
	fmt.Fprintln(w)
}
