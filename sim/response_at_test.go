package sim

import (
	"math"
	"testing"
)

// TestKernelsAt checks the band-limited interpolation of the kernels on
// the free-evolution filter function (2 pi T)^2 sinc^2(pi f T) (P. Cheinet
// et al., IEEE Trans. Instrum. Meas. 57, 1141 (2008)) sampled as Kernels
// samples it, at a step 1/(4 T) (twice its Nyquist rate), between grid
// points over the first ten lobes. Linear interpolation between the same
// points errs by up to 4 % of the peak near f = 0 (50 Hz on a 1.7 ms shot,
// the mains line); the windowed series must stay within 1e-4 of the peak
// (measured 2.2e-5).
func TestKernelsAt(t *testing.T) {
	const T = 1.72e-3
	step := 1 / (4 * T)
	filter := func(f float64) float64 {
		x := math.Pi * f * T
		return math.Pow(2*math.Pi*T*sinc(x), 2)
	}
	k := &Kernels{StepHz: step, DurationS: T}
	ck := ChannelKernel{Channel: ShiftDifferential}
	for m := range 400 {
		f := float64(m) * step
		k.FrequencyHz = append(k.FrequencyHz, f)
		ck.Bias, ck.Contrast = append(ck.Bias, filter(f)), append(ck.Contrast, 0)
	}
	k.Channels = []ChannelKernel{ck}
	peak := filter(0)
	var worst, worstLinear float64
	for i := range 4000 {
		f := (float64(i) + 0.37) * 40 * step / 4000
		got, _ := k.At(ShiftDifferential, f)
		worst = math.Max(worst, math.Abs(got-filter(f))/peak)
		m := int(f / step)
		u := f/step - float64(m)
		lin := ck.Bias[m]*(1-u) + ck.Bias[m+1]*u
		worstLinear = math.Max(worstLinear, math.Abs(lin-filter(f))/peak)
	}
	t.Logf("largest error of the peak: windowed sinc series %.2g, linear %.2g", worst, worstLinear)
	if worst > 1e-4 {
		t.Errorf("At errs by %.3g of the peak, want at most 1e-4", worst)
	}
	if got, _ := k.At(ShiftDifferential, 3*step); got != ck.Bias[3] {
		t.Errorf("At on a grid point %g, want the sample %g", got, ck.Bias[3])
	}
}
