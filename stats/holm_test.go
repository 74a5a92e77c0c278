package stats

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

func TestHolm(t *testing.T) {
	// Worked by hand from the definition (Holm 1979): at alpha = 0.05 with
	// m = 4 the thresholds are 0.0125, 0.0167, 0.025, 0.05.
	for _, c := range []struct {
		name string
		p    []float64
		want []bool
	}{
		{"all", []float64{0.01, 0.04, 0.02, 0.005}, []bool{true, true, true, true}},
		{"stops at the third (0.03 > 0.025)", []float64{0.01, 0.04, 0.03, 0.005}, []bool{true, false, false, true}},
		{"first only", []float64{0.01, 0.04, 0.03, 0.02}, []bool{true, false, false, false}},
		{"none: smallest above alpha/m", []float64{0.013, 0.014, 0.015, 0.016}, []bool{false, false, false, false}},
		{"NaN never rejected", []float64{math.NaN(), 0.001}, []bool{false, true}},
		{"empty", nil, []bool{}},
	} {
		if got := Holm(c.p, 0.05); !slices.Equal(got, c.want) {
			t.Errorf("%s: got %v, want %v", c.name, got, c.want)
		}
	}
}

func TestHolmFamilyWise(t *testing.T) {
	// m = 5 true hypotheses with independent uniform p-values: Holm rejects
	// any with probability 1 - (1 - 0.05/5)^5 = 0.0490 (any rejection happens
	// exactly when the smallest is below alpha/m). R = 20000; tolerance 3
	// standard errors, 0.0046. Uncorrected tests would reject any 0.226 of
	// the time.
	const reps = 20000
	rng := rand.New(rand.NewPCG(4, 4))
	p := make([]float64, 5)
	any := 0
	for range reps {
		for i := range p {
			p[i] = rng.Float64()
		}
		if slices.Contains(Holm(p, 0.05), true) {
			any++
		}
	}
	got, want := float64(any)/reps, 1-math.Pow(0.99, 5)
	if se := math.Sqrt(want * (1 - want) / reps); math.Abs(got-want) > 3*se {
		t.Errorf("family-wise rate %.4f, want %.4f (tol 3 se = %.4f)", got, want, 3*se)
	}
}

func TestLookAlpha(t *testing.T) {
	// sum_k 6/(pi^2 k^2) = 1 (Euler); partial sums below 1.
	var s float64
	for k := 1; k <= 100000; k++ {
		s += LookAlpha(0.05, k)
	}
	// The tail beyond K is about 6/(pi^2 K) alpha = 3.0e-7.
	if !(s <= 0.05) || 0.05-s > 3.1e-7 {
		t.Errorf("sum of 1e5 looks %v, want just under 0.05 (tail 3.0e-7)", s)
	}
	if got, want := LookAlpha(0.05, 1), 0.030396355092701; math.Abs(got-want) > 1e-15 { // 0.3/pi^2 by hand
		t.Errorf("look 1: %v, want %v", got, want)
	}
	if got, want := LookAlpha(0.05, 2), LookAlpha(0.05, 1)/4; math.Abs(got-want) > 1e-18 {
		t.Errorf("look 2: %v, want a quarter of look 1, %v", got, want)
	}
}

func TestCircularStats(t *testing.T) {
	// Exact cases (by hand) and Fisher (1993) sec. 2.3: the angles 350 and
	// 10 degrees have mean direction 0, not the linear mean 180.
	deg := math.Pi / 180
	for _, c := range []struct {
		name     string
		theta    []float64
		dir, r   float64
		std, tol float64
	}{
		{"across +-pi", []float64{math.Pi - 0.1, -math.Pi + 0.1}, math.Pi, math.Cos(0.1), math.Sqrt(-2 * math.Log(math.Cos(0.1))), 1e-15},
		{"350 and 10 deg", []float64{350 * deg, 10 * deg}, 0, math.Cos(10 * deg), math.Sqrt(-2 * math.Log(math.Cos(10*deg))), 1e-15},
		{"identical", []float64{0.3, 0.3, 0.3}, 0.3, 1, 0, 1e-15},
		{"quarter turns", []float64{0, math.Pi / 2}, math.Pi / 4, math.Sqrt(0.5), math.Sqrt(math.Log(2)), 1e-15},
	} {
		got := CircularStats(c.theta)
		d := math.Remainder(got.MeanDirection-c.dir, 2*math.Pi)
		if math.Abs(d) > c.tol || math.Abs(got.MeanResultantLength-c.r) > c.tol || math.Abs(got.StdDev-c.std) > 1e-7 {
			t.Errorf("%s: got %+v, want direction %v, R %v, std %v (tol %g)", c.name, got, c.dir, c.r, c.std, c.tol)
		}
	}
	// For a wrapped normal with sigma 0.2, R = exp(-sigma^2/2) and the
	// circular std is sigma (Mardia and Jupp 2000, sec. 3.5.7). N = 1e5: the
	// std of R is about sigma^2/sqrt(2N) relative, 1e-4; tolerance 5e-3
	// absolute on the std.
	rng := rand.New(rand.NewPCG(6, 6))
	x := make([]float64, 100000)
	for i := range x {
		x[i] = math.Remainder(2+0.2*rng.NormFloat64(), 2*math.Pi)
	}
	if got := CircularStats(x); math.Abs(got.StdDev-0.2) > 5e-3 || math.Abs(got.MeanDirection-2) > 5e-3 {
		t.Errorf("wrapped normal: got %+v, want direction 2, std 0.2 (tol 5e-3)", got)
	}
}
