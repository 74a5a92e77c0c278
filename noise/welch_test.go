package noise

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"
)

func TestWelchParseval(t *testing.T) {
	// Invariant (Parseval): the estimate integrates (trapezoidal rule) to the
	// window-weighted mean square of the mean-removed segments, to rounding.
	rng := rand.New(rand.NewPCG(1, 1))
	const n, l, dt = 1000, 64, 1e-3
	x := make([]float64, n)
	for i := range x {
		x[i] = rng.NormFloat64() + 0.3*math.Sin(float64(i))
	}
	_, s := Welch(x, dt, l)
	integral := trapezoid(s, 1/(l*dt))
	var want, u float64
	k := 0
	for start := 0; start+l <= n; start += l / 2 {
		var mean float64
		for _, v := range x[start : start+l] {
			mean += v / l
		}
		for i, v := range x[start : start+l] {
			w := math.Pow(math.Sin(math.Pi*float64(i)/l), 2)
			want += (w * (v - mean)) * (w * (v - mean))
			if k == 0 {
				u += w * w
			}
		}
		k++
	}
	want /= float64(k) * u
	if relErr(integral, want) > 1e-12 {
		t.Errorf("integral of the estimate: got %v, want %v (rel tol 1e-12)", integral, want)
	}
}

func TestWelchSine(t *testing.T) {
	// A sine of amplitude A with a whole number of cycles per segment: its
	// windowed mean square is exactly A²/2 (Σ_k w_k² cos(2θk) = 0 for the
	// periodic Hann window away from bins 0 and 1), and the peak is at its bin.
	const (
		n, l, dt = 4096, 256, 1e-4
		bin      = 20
		a        = 3.0
	)
	f0 := bin / (l * dt)
	x := make([]float64, n)
	for i := range x {
		x[i] = a * math.Sin(2*math.Pi*f0*float64(i)*dt)
	}
	freq, s := Welch(x, dt, l)
	integral := trapezoid(s, 1/(l*dt))
	peak := 0
	for j, v := range s {
		if v > s[peak] {
			peak = j
		}
	}
	if relErr(integral, a*a/2) > 1e-12 {
		t.Errorf("integral: got %v, want %v (rel tol 1e-12)", integral, a*a/2)
	}
	if peak != bin || freq[peak] != f0 {
		t.Errorf("peak at bin %d (%v Hz), want bin %d (%v Hz)", peak, freq[peak], bin, f0)
	}
}

func TestWelchWhite(t *testing.T) {
	// Independent N(0, σ²) samples every dt have the one-sided density
	// S = 2 σ² dt (the variance spread over 0 .. 1/(2 dt)).
	// K = 8191 segments give a per-bin relative standard error of
	// sqrt(1.06/K) = 1.1% (Welch.go doc: Harris 1978 overlap correlation, from
	// memory), sqrt(2) more at the Nyquist bin; each bin must be within 5
	// standard errors. Bins 0 and 1 are expected at 1/3 and 5/6 of S (mean
	// removal: E|Σ w_k (x_k - x̄)|² = σ² (Σ w_k² - (Σ w_k)²/L) = σ² L/8 at bin
	// 0 and σ² (3L/8 - L/16) at bin 1, derived from the window's DFT
	// (L/2, -L/4, -L/4 at bins 0, ±1)).
	const (
		l, k  = 128, 8191
		n     = (k + 1) * l / 2
		dt    = 1e-3
		sigma = 2.0
	)
	rng := rand.New(rand.NewPCG(2, 1))
	x := make([]float64, n)
	for i := range x {
		x[i] = sigma * rng.NormFloat64()
	}
	_, s := Welch(x, dt, l)
	want := 2 * sigma * sigma * dt
	se := math.Sqrt(1.06 / k)
	for j, v := range s {
		w, tol := want, 5*se
		switch j {
		case 0:
			w, tol = want/3, tol*math.Sqrt2 // a real coefficient, like Nyquist
		case 1:
			w = want * 5 / 6
		case l / 2:
			tol *= math.Sqrt2 // the Nyquist coefficient is real: half the degrees of freedom
		}
		if math.Abs(v-w)/want > tol {
			t.Errorf("bin %d: got %v, want %v (tol %g of S)", j, v, w, tol)
		}
	}
}

// trapezoid integrates samples spaced df apart by the trapezoidal rule.
func trapezoid(s []float64, df float64) float64 {
	var sum float64
	for _, v := range s {
		sum += v
	}
	return (sum - (s[0]+s[len(s)-1])/2) * df
}

func TestWelchPanics(t *testing.T) {
	x := make([]float64, 100)
	for _, l := range []int{0, 2, 7, 102} {
		func() {
			defer func() {
				if recover() == nil {
					t.Errorf("segment %d: Welch did not panic", l)
				}
			}()
			Welch(x, 1, l)
		}()
	}
}

func BenchmarkWelch(b *testing.B) {
	for _, n := range []int{4096, 16384, 65536} {
		b.Run(fmt.Sprintf("n=%d/segment=256", n), func(b *testing.B) {
			rng := rand.New(rand.NewPCG(1, 2))
			x := make([]float64, n)
			for i := range x {
				x[i] = rng.NormFloat64()
			}
			for b.Loop() {
				Welch(x, 1e-3, 256)
			}
		})
	}
}
