package present

import (
	"bufio"
	"fmt"
	"io"
	"math"
	"path/filepath"

	"rampart/cmd/internal/plots"
	"rampart/internal/atomicfile"
	"rampart/noise"
	"rampart/sim"
)

// ResponseMaskFile holds the masks in response --out's directory.
const ResponseMaskFile = "response-mask.csv"

// ResponseMasks are the noise masks against a spec.
type ResponseMasks struct {
	Spec string `json:"spec"`
	// ContrastMin is the least mean contrast kept, from the spec key
	// ContrastFrom; null: no contrast criterion.
	ContrastMin      *float64       `json:"contrast_min"`
	ContrastFrom     string         `json:"contrast_from,omitempty"`
	AbsBiasP95MaxRad *float64       `json:"bias_abs_p95_max_rad"`
	Targets          []ResponseMask `json:"targets"`
}

// ResponseMask is the mask of one process of the budget or one channel.
type ResponseMask struct {
	Name string `json:"name"`
	Kind string `json:"kind"` // "process" or "channel"
	Unit string `json:"unit"` // of the signal; levels in unit^2/Hz
	// The room the rest of the budget leaves (null: no criterion).
	RoomContrastLoss *float64            `json:"room_contrast_loss"`
	RoomBiasVarRad2  *float64            `json:"room_bias_var_rad2"`
	White            ResponseMaskLevel   `json:"white"`
	Bands            []ResponseMaskLevel `json:"bands"`
	// Growth is the factor by which the budget's spectrum of this process
	// may grow (null: no spectrum given, or no limit).
	Growth        *float64 `json:"growth,omitempty"`
	GrowthBinding string   `json:"growth_binding,omitempty"`
	// Given is the budget's spectrum sampled for the figure.
	GivenFrequencyHz []float64 `json:"given_frequency_hz,omitempty"`
	GivenPSD         []float64 `json:"given_psd,omitempty"`
}

// ResponseMaskLevel is the largest level in a band.
type ResponseMaskLevel struct {
	LowHz   float64  `json:"low_hz"`
	HighHz  float64  `json:"high_hz"`
	Share   float64  `json:"share"`
	Level   *float64 `json:"level"` // unit^2/Hz; null: no limit
	Binding string   `json:"binding"`
}

// finite returns &x, or nil for an infinite x (which JSON cannot carry).
func finite(x float64) *float64 {
	if math.IsInf(x, 0) || math.IsNaN(x) {
		return nil
	}
	return &x
}

// NewResponseMask converts a library mask; given (may be nil) is the
// budget's spectrum of the process, sampled at 200 log-spaced frequencies
// over band.
func NewResponseMask(name, kind, unit string, room sim.MaskRoom, m sim.Mask, given noise.PSD, band noise.Band) ResponseMask {
	level := func(l sim.MaskLevel) ResponseMaskLevel {
		return ResponseMaskLevel{LowHz: l.Band.LowHz, HighHz: l.Band.HighHz, Share: l.Share, Level: finite(l.LevelMax), Binding: l.Binding}
	}
	out := ResponseMask{Name: name, Kind: kind, Unit: unit, RoomContrastLoss: finite(room.ContrastLoss), RoomBiasVarRad2: finite(room.BiasVarRad2),
		White: level(m.White), Bands: []ResponseMaskLevel{}}
	for _, b := range m.Bands {
		out.Bands = append(out.Bands, level(b))
	}
	if given != nil && band.LowHz > 0 && band.HighHz > band.LowHz {
		const n = 200
		for i := range n {
			f := band.LowHz * math.Pow(band.HighHz/band.LowHz, float64(i)/(n-1))
			out.GivenFrequencyHz = append(out.GivenFrequencyHz, f)
			out.GivenPSD = append(out.GivenPSD, given.Density(f))
		}
	}
	return out
}

// InLabUnit re-expresses m, computed for a signal in its SI unit, in the
// lab unit the budget and tolerance use (uG for a field, urad/s for a
// rotation rate), scale lab units per SI unit: its levels and the given
// spectrum are PSDs, so they scale by scale^2; the growth factor is a
// ratio and stays.
func (m *ResponseMask) InLabUnit(unit string, scale float64) {
	s2 := scale * scale
	m.Unit = unit
	mul := func(l *ResponseMaskLevel) {
		if l.Level != nil {
			v := *l.Level * s2
			l.Level = &v
		}
	}
	mul(&m.White)
	for i := range m.Bands {
		mul(&m.Bands[i])
	}
	for i := range m.GivenPSD {
		m.GivenPSD[i] *= s2
	}
}

// levelText formats a level: "none" without a limit.
func levelText(l *float64) string {
	if l == nil {
		return "none"
	}
	return Sci(*l, 3)
}

// levelDB gives a process's level in the trade's decibels.
func levelDB(name string, l *float64) string {
	if l == nil || *l <= 0 {
		return ""
	}
	switch name {
	case "rin":
		return Fixed(noise.RINFromIntensity(*l), 1) + " dB/Hz"
	case "phase":
		return Fixed(noise.DBcFromPhase(*l), 1) + " dBc/Hz"
	}
	return ""
}

// maskGrid is the white masks and growth factors.
func maskGrid(rep ResponseReport) *Grid {
	t := NewGrid("Noise masks against spec "+rep.Masks.Spec+": the largest white level over the band, the rest of the budget as it is",
		"Mask of", "Kind", "Signal unit", "White level (unit^2/Hz)", "In dB", "Binding", "Spectrum may grow by", "Binding")
	for _, m := range rep.Masks.Targets {
		growth, gb := "-", ""
		if m.GrowthBinding != "" {
			growth, gb = levelText(m.Growth), m.GrowthBinding
		}
		t.Append(m.Name, m.Kind, m.Unit, levelText(m.White.Level), levelDB(m.Name, m.White.Level), m.White.Binding, growth, gb)
	}
	return t
}

// maskBandGrid is the masks per band, a column per band.
func maskBandGrid(rep ResponseReport) *Grid {
	header := []string{"Mask of", "Signal unit"}
	first := rep.Masks.Targets[0]
	for _, b := range first.Bands {
		header = append(header, fmt.Sprintf("%s-%s Hz (share %s)", Sig(b.LowHz, 3), Sig(b.HighHz, 3), Sig(b.Share, 3)))
	}
	t := NewGrid("Noise masks per band (unit^2/Hz; c: the contrast criterion binds, b: the bias criterion)", header...)
	for _, m := range rep.Masks.Targets {
		row := []string{m.Name, m.Unit}
		for _, b := range m.Bands {
			cell := levelText(b.Level)
			switch b.Binding {
			case sim.MaskContrast:
				cell += " c"
			case sim.MaskBias:
				cell += " b"
			}
			row = append(row, cell)
		}
		t.Append(row...)
	}
	return t
}

// maskNotes state how the masks were made and what they assume.
func maskNotes(rep ResponseReport) []string {
	ms := rep.Masks
	crit := "Criteria:"
	if ms.ContrastMin != nil {
		crit += fmt.Sprintf(" mean contrast at least %s (from %s", Fixed(*ms.ContrastMin, 4), ms.ContrastFrom)
		if ms.ContrastFrom != "contrast.mean_min" {
			crit += ", applied to the mean: necessary, not sufficient, for the percentile"
		}
		crit += ");"
	}
	if ms.AbsBiasP95MaxRad != nil {
		crit += fmt.Sprintf(" |bias| p95 at most %s rad, the bias taken as normal with the nominal bias %s rad as mean and the predicted std (p95 = 1.96 std at zero mean; at linear order the bias is a linear functional of Gaussian noise, hence normal).",
			Sci(*ms.AbsBiasP95MaxRad, 3), Sci(rep.BiasRad, 3))
	}
	out := []string{
		crit,
		"The rest of the budget is the scenario's other noise processes as predicted by the kernels; the static shot-to-shot sources (depth, timing, temperature, pulse errors) are not part of it, so a mask holds for the noise processes with the nominal shot, and qualify or tolerance must still check the whole budget.",
		"Band masks: each band gets its share of the room (equal shares unless --band-share gives them), so noise at the mask level in every band at once still meets the criteria. rest-fails: the rest of the budget alone breaks a criterion.",
	}
	// A nominal shot that breaks a criterion by itself leaves no room to
	// any noise: say so, rather than blame the rest of the budget.
	if ms.ContrastMin != nil && rep.Contrast < *ms.ContrastMin {
		out = append(out, fmt.Sprintf("The nominal shot alone breaks the contrast criterion (contrast %s against at least %s): no noise level keeps the spec, so every mask is 0; change the ramp or the spec.", Fixed(rep.Contrast, 4), Fixed(*ms.ContrastMin, 4)))
	}
	if ms.AbsBiasP95MaxRad != nil && math.Abs(rep.BiasRad) >= *ms.AbsBiasP95MaxRad {
		out = append(out, fmt.Sprintf("The nominal shot alone breaks the bias criterion (|bias| %s rad against at most %s rad): no noise level keeps the spec, so every mask is 0; change the ramp or the spec.", Sci(math.Abs(rep.BiasRad), 3), Sci(*ms.AbsBiasP95MaxRad, 3)))
	}
	return out
}

// PrintResponseMasks prints the mask tables.
func PrintResponseMasks(w io.Writer, rep ResponseReport) error {
	if err := maskGrid(rep).Render(w); err != nil {
		return err
	}
	fmt.Fprintln(w)
	return maskBandGrid(rep).RenderNoted(w, maskNotes(rep))
}

// writeMaskCSV writes every mask, white and per band, to dir.
func writeMaskCSV(dir string, rep ResponseReport) error {
	return atomicfile.Write(filepath.Join(dir, ResponseMaskFile), func(w io.Writer) error {
		bw := bufio.NewWriter(w)
		fmt.Fprintln(bw, "target,kind,unit,band,low_hz,high_hz,share,level_max,binding")
		row := func(m ResponseMask, what string, l ResponseMaskLevel) {
			level := "inf"
			if l.Level != nil {
				level = Sig(*l.Level, -1)
			}
			fmt.Fprintf(bw, "%s,%s,%s,%s,%s,%s,%s,%s,%s\n", m.Name, m.Kind, m.Unit, what, Sig(l.LowHz, -1), Sig(l.HighHz, -1), Sig(l.Share, -1), level, l.Binding)
		}
		for _, m := range rep.Masks.Targets {
			row(m, "white", m.White)
			for _, b := range m.Bands {
				row(m, "band", b)
			}
		}
		return bw.Flush()
	})
}

// maskFigures draw each process's mask, white and per band, against the
// budget's spectrum of it.
func maskFigures(rep ResponseReport) ([]namedFigure, error) {
	var out []namedFigure
	for _, m := range rep.Masks.Targets {
		if m.Kind != "process" {
			continue
		}
		var series []plots.Series
		if m.White.Level != nil && *m.White.Level > 0 {
			series = append(series, plots.Series{Name: "white mask", X: []float64{m.White.LowHz, m.White.HighHz}, Y: []float64{*m.White.Level, *m.White.Level}})
		}
		var bx, by []float64
		for _, b := range m.Bands {
			if b.Level != nil && *b.Level > 0 {
				bx, by = append(bx, b.LowHz, b.HighHz), append(by, *b.Level, *b.Level)
			}
		}
		if len(bx) >= 2 {
			series = append(series, plots.Series{Name: "band mask", X: bx, Y: by})
		}
		var gx, gy []float64
		for i, f := range m.GivenFrequencyHz {
			if m.GivenPSD[i] > 0 {
				gx, gy = append(gx, f), append(gy, m.GivenPSD[i])
			}
		}
		if len(gx) >= 2 {
			series = append(series, plots.Series{Name: "the budget's spectrum", X: gx, Y: gy})
		}
		// Without a mask (the rest fails, or no criterion is reached) or
		// with one level only there is nothing to draw on a log axis.
		lo, hi := math.Inf(1), math.Inf(-1)
		for _, s := range series {
			for _, y := range s.Y {
				lo, hi = math.Min(lo, y), math.Max(hi, y)
			}
		}
		if len(series) == 0 || !(hi > lo) || (m.White.Level == nil && len(bx) == 0) {
			continue
		}
		fig, err := plots.Lines(series, plots.LinesOptions{Title: "Noise mask: " + m.Name, XLabel: "f (Hz)", YLabel: "PSD (" + m.Unit + "^2/Hz)",
			LogX: true, LogY: true, VLines: []plots.Marker{{Label: "nu", Value: rep.TrapHz}, {Label: "2 nu", Value: 2 * rep.TrapHz}}})
		if err != nil {
			return nil, fmt.Errorf("mask of %s: %w", m.Name, err)
		}
		out = append(out, namedFigure{"response-mask-" + m.Name, "The largest allowed spectrum of " + m.Name + " noise (white over the band, and per band) against the scenario's own.", fig})
	}
	return out, nil
}
