package present

import (
	"bufio"
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

// ResponseKernelsFile holds the kernels in response --out's directory.
const ResponseKernelsFile = "response-kernels.csv"

// ResponseReport is what response --json prints.
type ResponseReport struct {
	Scenario     string             `json:"scenario"`
	TrapHz       float64            `json:"trap_hz"`
	DurationS    float64            `json:"duration_s"`
	StepHz       float64            `json:"step_hz"`
	Contrast     float64            `json:"contrast"` // C0 of the nominal shot
	BiasRad      float64            `json:"bias_rad"` // bias of the nominal shot
	ScaleFactorS float64            `json:"scale_factor_s"`
	MemoryMiB    float64            `json:"memory_estimate_mib"`
	Channels     []ResponseChannel  `json:"channels"`
	Processes    []ResponseProcess  `json:"processes"`
	Predicted    ResponsePrediction `json:"predicted"`
	Confirm      *ResponseConfirm   `json:"confirm,omitempty"`
	Masks        *ResponseMasks     `json:"masks,omitempty"`
}

// ResponseChannel is one channel's kernels and where they matter.
type ResponseChannel struct {
	Name string `json:"name"`
	// Unit of the channel's signal; its PSD is in unit^2/Hz, the bias
	// kernel in rad^2/unit^2 and the contrast kernel in 1/unit^2.
	Unit           string    `json:"unit"`
	FrequencyHz    []float64 `json:"frequency_hz"`
	BiasKernel     []float64 `json:"bias_kernel"`
	ContrastKernel []float64 `json:"contrast_kernel"`

	BiasPeakHz     float64 `json:"bias_peak_hz"`
	BiasPeak       float64 `json:"bias_peak"`
	ContrastPeakHz float64 `json:"contrast_peak_hz"`
	ContrastPeak   float64 `json:"contrast_peak"` // largest |K_C|, with its sign
	// The kernels at nu and 2 nu; null beyond the grid (--max-hz below).
	BiasAtTrap          *float64 `json:"bias_at_trap"`
	BiasAtTwiceTrap     *float64 `json:"bias_at_twice_trap"`
	ContrastAtTrap      *float64 `json:"contrast_at_trap"`
	ContrastAtTwiceTrap *float64 `json:"contrast_at_twice_trap"`
}

// ResponseProcess is a noise process of the scenario's budget.
type ResponseProcess struct {
	Name     string  `json:"name"`
	Unit     string  `json:"unit"` // of the process's signal
	Channels string  `json:"channels"`
	LowHz    float64 `json:"band_low_hz"`
	HighHz   float64 `json:"band_high_hz"`
}

// ResponsePrediction is the kernels' prediction for the budget.
type ResponsePrediction struct {
	ContrastLoss   float64                 `json:"contrast_loss"`
	BiasStdRad     float64                 `json:"bias_std_rad"`
	BiasStdDegPerH float64                 `json:"bias_std_deg_per_h"`
	ByChannel      []ResponseChannelEffect `json:"by_channel"`
	Warnings       []string                `json:"warnings"`
}

// ResponseChannelEffect is one channel's predicted effect.
type ResponseChannelEffect struct {
	Channel      string  `json:"channel"`
	ContrastLoss float64 `json:"contrast_loss"`
	BiasStdRad   float64 `json:"bias_std_rad"`
	Unresolved   bool    `json:"unresolved"`
}

// ResponseConfirm is a Monte Carlo ensemble of the budget's noise
// processes beside the prediction.
type ResponseConfirm struct {
	Samples        int     `json:"samples"`
	Seed           uint64  `json:"seed"`
	ContrastLoss   float64 `json:"contrast_loss"`
	ContrastLossSE float64 `json:"contrast_loss_se"`
	BiasStdRad     float64 `json:"bias_std_rad"`
	BiasStdSE      float64 `json:"bias_std_se"`
}

// NewResponseReport gathers the kernels, the nominal shot and the
// prediction for the budget's processes.
func NewResponseReport(name string, k *sim.Kernels, nominal sim.Result, ps []sim.Process, p sim.Prediction, memoryBytes int64) ResponseReport {
	rep := ResponseReport{
		Scenario: name, TrapHz: k.TrapHz, DurationS: k.DurationS, StepHz: k.StepHz,
		Contrast: nominal.Contrast, BiasRad: nominal.BiasRad, ScaleFactorS: nominal.ScaleFactorS,
		MemoryMiB: float64(memoryBytes) / (1 << 20),
	}
	for _, ck := range k.Channels {
		c := ResponseChannel{Name: ck.Channel.String(), Unit: ck.Channel.Unit(), FrequencyHz: k.FrequencyHz,
			BiasKernel: ck.Bias, ContrastKernel: ck.Contrast}
		c.BiasPeakHz, c.BiasPeak = kernelPeak(k.FrequencyHz, ck.Bias)
		c.ContrastPeakHz, c.ContrastPeak = kernelPeak(k.FrequencyHz, ck.Contrast)
		c.BiasAtTrap, c.BiasAtTwiceTrap = kernelAt(k, ck.Bias, k.TrapHz), kernelAt(k, ck.Bias, 2*k.TrapHz)
		c.ContrastAtTrap, c.ContrastAtTwiceTrap = kernelAt(k, ck.Contrast, k.TrapHz), kernelAt(k, ck.Contrast, 2*k.TrapHz)
		rep.Channels = append(rep.Channels, c)
	}
	top := k.FrequencyHz[len(k.FrequencyHz)-1]
	for _, pr := range ps {
		hi := pr.Band.HighHz
		if hi == 0 || hi > top {
			hi = top
		}
		var chs []string
		for _, ck := range k.Channels {
			if w, ok := pr.Load[ck.Channel]; ok && w != 0 {
				chs = append(chs, fmt.Sprintf("%s x %s", Sig(w, 3), ck.Channel))
			}
		}
		rep.Processes = append(rep.Processes, ResponseProcess{Name: pr.Name, Unit: pr.Unit, Channels: strings.Join(chs, ", "), LowHz: pr.Band.LowHz, HighHz: hi})
	}
	rep.Predicted = ResponsePrediction{ContrastLoss: p.ContrastLoss, BiasStdRad: p.BiasStdRad,
		BiasStdDegPerH: mc.BiasDegPerH(p.BiasStdRad, nominal.ScaleFactorS), Warnings: p.Warnings}
	if rep.Predicted.Warnings == nil {
		rep.Predicted.Warnings = []string{}
	}
	if top < 2*k.TrapHz {
		// The resonances of the trap (intensity noise heats at 2 nu,
		// position noise at nu: Savard et al. 1997) are where the kernels
		// are largest; a band that stops short of them leaves them out.
		rep.Predicted.Warnings = append(rep.Predicted.Warnings, fmt.Sprintf("the kernels' grid ends at %s Hz, below twice the trap frequency (2 nu = %s Hz): the trap's resonances, where noise heats the atom most, are left out of the prediction; raise --max-hz above %s Hz (0: the simulator's noise band)",
			Sig(top, 4), Sig(2*k.TrapHz, 4), Sig(2*k.TrapHz, 4)))
	}
	rep.Predicted.ByChannel = []ResponseChannelEffect{}
	for _, c := range p.Channels {
		rep.Predicted.ByChannel = append(rep.Predicted.ByChannel, ResponseChannelEffect{Channel: c.Channel.String(),
			ContrastLoss: c.ContrastLoss, BiasStdRad: c.BiasStdRad, Unresolved: c.Unresolved})
	}
	return rep
}

// kernelPeak returns where |ker| is largest above zero frequency, and its
// signed value there.
func kernelPeak(f, ker []float64) (float64, float64) {
	best := 1
	for m := 1; m < len(ker); m++ {
		if math.Abs(ker[m]) > math.Abs(ker[best]) {
			best = m
		}
	}
	if best >= len(ker) {
		return 0, 0
	}
	return f[best], ker[best]
}

// kernelAt interpolates ker linearly at f (nil beyond the grid).
func kernelAt(k *sim.Kernels, ker []float64, f float64) *float64 {
	x := f / k.StepHz
	m := int(math.Floor(x))
	if m < 0 || m+1 >= len(ker) {
		return nil
	}
	u := x - float64(m)
	v := ker[m]*(1-u) + ker[m+1]*u
	return &v
}

// atCell prints a kernel value at nu or 2 nu.
func atCell(v *float64) string {
	if v == nil {
		return "beyond grid"
	}
	return Sci(*v, 3)
}

// trapMark says whether f is the trap frequency or its second harmonic, to
// within two grid steps.
func trapMark(rep ResponseReport, f float64) string {
	tol := 2 * rep.StepHz
	switch {
	case math.Abs(f-rep.TrapHz) <= tol:
		return " (nu)"
	case math.Abs(f-2*rep.TrapHz) <= tol:
		return " (2 nu)"
	}
	return ""
}

// ResponseKernelGrid returns the summary of each channel's kernels.
func ResponseKernelGrid(rep ResponseReport) *Grid {
	t := NewGrid(fmt.Sprintf("Noise transfer functions: where each kernel peaks, and its value at the trap frequency nu = %s Hz and at 2 nu", Sig(rep.TrapHz, 4)),
		"Channel", "Signal unit", "Bias peak at (Hz)", "Bias peak (rad^2/unit^2)", "Bias at nu", "Bias at 2 nu",
		"Contrast peak at (Hz)", "Contrast peak (1/unit^2)", "Contrast at nu", "Contrast at 2 nu")
	for _, c := range rep.Channels {
		t.Append(c.Name, c.Unit, Sig(c.BiasPeakHz, 4)+trapMark(rep, c.BiasPeakHz), Sci(c.BiasPeak, 3), atCell(c.BiasAtTrap), atCell(c.BiasAtTwiceTrap),
			Sig(c.ContrastPeakHz, 4)+trapMark(rep, c.ContrastPeakHz), Sci(c.ContrastPeak, 3), atCell(c.ContrastAtTrap), atCell(c.ContrastAtTwiceTrap))
	}
	return t
}

// ResponseKernelNotes explain the kernel table.
func ResponseKernelNotes(rep ResponseReport) []string {
	return []string{
		fmt.Sprintf("For a one-sided PSD S(f) of a channel's signal (unit^2/Hz): bias variance = int S |G_phi|^2 df, mean contrast loss = int S K_C df (docs/model.md, Noise transfer functions). Grid 0 to %s Hz in steps of %s Hz; shot duration T = %s s; the bare nominal shot (the apparatus's scattering, field, ring potential and radius error left out): contrast %s, phase - K Omega %s rad (K the nominal scale factor; rampart shot's zero-rate bias is another figure).",
			Sig(rep.Channels[0].FrequencyHz[len(rep.Channels[0].FrequencyHz)-1], 4), Sig(rep.StepHz, 4), Sig(rep.DurationS, 4), Fixed(rep.Contrast, 6), Sci(rep.BiasRad, 3)),
		"Peaks are searched above zero frequency; (nu) and (2 nu) mark a peak within two grid steps of the trap frequency or its second harmonic. A negative contrast kernel is a gain of contrast.",
	}
}

// ResponsePredictionGrid returns the predicted effect of the budget per
// channel and in total.
func ResponsePredictionGrid(rep ResponseReport) *Grid {
	t := NewGrid("Predicted effect of the scenario's noise processes (linear response)", "Channel", "Mean contrast loss", "Bias std (rad)", "Bias std (deg/h)", "Resolved")
	for _, c := range rep.Predicted.ByChannel {
		t.Append(c.Channel, Sci(c.ContrastLoss, 3), Sci(c.BiasStdRad, 3), Sci(mc.BiasDegPerH(c.BiasStdRad, rep.ScaleFactorS), 3), YesNo(!c.Unresolved))
	}
	p := rep.Predicted
	t.Append("total", Sci(p.ContrastLoss, 3), Sci(p.BiasStdRad, 3), Sci(p.BiasStdDegPerH, 3), "")
	return t
}

// ResponsePredictionNotes say which processes were predicted and where
// the answer cannot be trusted.
func ResponsePredictionNotes(rep ResponseReport) []string {
	var out []string
	if len(rep.Processes) == 0 {
		out = append(out, "The budget has no noise during the shot (no [noise.depth] rin_db_hz, no [noise.drive] phase): nothing to predict; the masks below still say what the hardware may have.")
	}
	for _, p := range rep.Processes {
		out = append(out, fmt.Sprintf("%s: %s, band %s to %s Hz.", p.Name, p.Channels, Sig(p.LowHz, 4), Sig(p.HighHz, 4)))
	}
	out = append(out, "Independent channels add: the losses, and the bias variances. Totals are trusted while the loss stays below "+Sig(sim.MaxLinearContrastLoss, 3)+" and the bias std below "+Sig(sim.MaxLinearPhaseStdRad, 3)+" rad.")
	for _, w := range rep.Predicted.Warnings {
		out = append(out, "Warning: "+w+".")
	}
	return out
}

// ResponseConfirmGrid puts the Monte Carlo beside the prediction.
func ResponseConfirmGrid(rep ResponseReport) *Grid {
	c := rep.Confirm
	t := NewGrid(fmt.Sprintf("Prediction and Monte Carlo (%s, seed %d, the budget's noise processes only)", plural.Count(c.Samples, "shot"), c.Seed),
		"Quantity", "Predicted", "Monte Carlo", "Standard error", "(MC - predicted)/s.e.")
	z := func(mcv, se, pred float64) string {
		if se == 0 {
			return "-"
		}
		return Fixed((mcv-pred)/se, 2)
	}
	t.Append("mean contrast loss", Sci(rep.Predicted.ContrastLoss, 3), Sci(c.ContrastLoss, 3), Sci(c.ContrastLossSE, 2), z(c.ContrastLoss, c.ContrastLossSE, rep.Predicted.ContrastLoss))
	t.Append("bias std (rad)", Sci(rep.Predicted.BiasStdRad, 3), Sci(c.BiasStdRad, 3), Sci(c.BiasStdSE, 2), z(c.BiasStdRad, c.BiasStdSE, rep.Predicted.BiasStdRad))
	return t
}

// responseConfirmNote explains the Monte Carlo's statistics.
const responseConfirmNote = "Monte Carlo: loss = C0 - mean contrast, its standard error s/sqrt(n); bias std about the nominal bias, its standard error std/sqrt(2(n-1)) (normal theory). The records are band-limited and interpolated as every ensemble draws them (their sinc^4 filter costs 0.3 % at 2 nu), and the simulator's noise-during-cruise method is good to 2e-6 to 3e-5 in contrast (TestNoisyCruiseAccuracy): a smaller loss is not resolved by the Monte Carlo."

// PrintResponse prints the kernels' summary, the prediction, the Monte
// Carlo confirmation and the masks.
func PrintResponse(w io.Writer, rep ResponseReport) error {
	if err := ResponseKernelGrid(rep).RenderNoted(w, ResponseKernelNotes(rep)); err != nil {
		return err
	}
	fmt.Fprintln(w)
	if err := ResponsePredictionGrid(rep).RenderNoted(w, ResponsePredictionNotes(rep)); err != nil {
		return err
	}
	if rep.Confirm != nil {
		fmt.Fprintln(w)
		if err := ResponseConfirmGrid(rep).RenderNoted(w, []string{responseConfirmNote}); err != nil {
			return err
		}
	}
	if rep.Masks != nil {
		fmt.Fprintln(w)
		return PrintResponseMasks(w, rep)
	}
	return nil
}

// ResponseSection is the report's section: the kernels, the prediction,
// the confirmation and the masks, with their figures.
func ResponseSection(rep ResponseReport) (report.Section, error) {
	figs, err := figures(responseFigures(rep))
	if err != nil {
		return report.Section{}, err
	}
	text := append(ResponseKernelNotes(rep), ResponsePredictionNotes(rep)...)
	tables := []report.Table{ResponseKernelGrid(rep).Table(), ResponsePredictionGrid(rep).Table()}
	if rep.Confirm != nil {
		tables = append(tables, ResponseConfirmGrid(rep).Table())
		text = append(text, responseConfirmNote)
	}
	if rep.Masks != nil {
		tables = append(tables, maskGrid(rep).Table(), maskBandGrid(rep).Table())
		text = append(text, maskNotes(rep)...)
	}
	return report.Section{Heading: "Noise transfer functions", Text: strings.Join(text, "\n\n"), Tables: tables, Figures: figs}, nil
}

// WriteResponse writes the kernels (and the mask, if any) as CSV, and the
// figures, to dir.
func WriteResponse(dir string, rep ResponseReport) error {
	if err := atomicfile.Write(filepath.Join(dir, ResponseKernelsFile), func(w io.Writer) error {
		bw := bufio.NewWriter(w)
		fmt.Fprintln(bw, "channel,unit,frequency_hz,bias_kernel,contrast_kernel")
		for _, c := range rep.Channels {
			for m, f := range c.FrequencyHz {
				fmt.Fprintf(bw, "%s,%s,%s,%s,%s\n", c.Name, c.Unit, Sig(f, -1), Sig(c.BiasKernel[m], -1), Sig(c.ContrastKernel[m], -1))
			}
		}
		return bw.Flush()
	}); err != nil {
		return err
	}
	if rep.Masks != nil {
		if err := writeMaskCSV(dir, rep); err != nil {
			return err
		}
	}
	nfs, err := responseFigures(rep)
	if err != nil {
		return err
	}
	return writeFigures(dir, nfs)
}

// responseFigures are the log-log kernels of each channel (the trap
// frequency and its second harmonic marked) and the masks.
func responseFigures(rep ResponseReport) ([]namedFigure, error) {
	var out []namedFigure
	marks := []plots.Marker{{Label: "nu = " + Sig(rep.TrapHz, 4) + " Hz", Value: rep.TrapHz}, {Label: "2 nu", Value: 2 * rep.TrapHz}}
	for _, c := range rep.Channels {
		var series []plots.Series
		u2 := c.Unit + "^2"
		if strings.Contains(c.Unit, "/") {
			u2 = "(" + c.Unit + ")^2" // rad/s: (rad/s)^2
		}
		for _, s := range []struct {
			name string
			ker  []float64
		}{{"bias |G_phi|^2 (rad^2/" + u2 + ")", c.BiasKernel}, {"contrast |K_C| (1/" + u2 + ")", c.ContrastKernel}} {
			var x, y []float64
			for m, f := range c.FrequencyHz {
				if v := math.Abs(s.ker[m]); f > 0 && v > 0 {
					x, y = append(x, f), append(y, v)
				}
			}
			if len(x) >= 2 {
				series = append(series, plots.Series{Name: s.name, X: x, Y: y})
			}
		}
		if len(series) == 0 {
			continue
		}
		var vl []plots.Marker
		top := c.FrequencyHz[len(c.FrequencyHz)-1]
		for _, m := range marks {
			if m.Value < top {
				vl = append(vl, m)
			}
		}
		fig, err := plots.Lines(series, plots.LinesOptions{Title: "Noise transfer functions: " + c.Name, XLabel: "f (Hz)",
			YLabel: "kernel (per " + u2 + " of the signal)", LogX: true, LogY: true, VLines: vl})
		if err != nil {
			return nil, fmt.Errorf("kernels of %s: %w", c.Name, err)
		}
		out = append(out, namedFigure{"response-" + strings.ReplaceAll(c.Name, "_", "-"),
			"The bias and contrast kernels of " + c.Name + " noise, log-log; the vertical lines mark the trap frequency and its second harmonic.", fig})
	}
	if rep.Masks != nil {
		m, err := maskFigures(rep)
		if err != nil {
			return nil, err
		}
		out = append(out, m...)
	}
	return out, nil
}
