package mc

import (
	"fmt"
	"math"
	"testing"
)

// TestGyroFigures checks the figures against hand-worked numbers
// (docs/model.md, Gyroscope figures; 180/pi x 3600 = 206264.806 deg/h per rad/s and
// 180/pi x 60 = 3437.747 deg/sqrt(h) per rad/sqrt(s)).
//
//	K = 100 s, C = 0.5, N = 1e4:  dOmega = 1 / (100 x 0.5 x 100) = 2e-4 rad/s
//	                              = 2e-4 x 206264.806 = 41.25296 deg/h;
//	T_c = 4 s:                    ARW = 2e-4 x 2 = 4e-4 rad/sqrt(s)
//	                              = 4e-4 x 3437.747 = 1.375099 deg/sqrt(h).
//	K = 0.215 s (the test ring's half lap), C = 0.645, N = 1e6, T_c = 1 s:
//	                              dOmega = 1 / (0.138675 x 1000) = 7.21111e-3 rad/s
//	                              = 1487.397 deg/h; ARW = 7.21111e-3 x 1 x 3437.747
//	                              = 24.78995 deg/sqrt(h).
func TestGyroFigures(t *testing.T) {
	for _, tt := range []struct {
		k, c, atoms, cycle   float64
		shot, shotDeg, arwDg float64
	}{
		{100, 0.5, 1e4, 4, 2e-4, 41.25296, 1.375099},
		{0.215, 0.645, 1e6, 1, 7.21111e-3, 1487.397, 24.78995},
	} {
		g := GyroFigures(tt.k, tt.c, tt.atoms, tt.cycle)
		const tol = 1e-5 // relative: the rounding of the hand values
		for _, v := range []struct {
			name      string
			got, want float64
		}{
			{"shot noise rad/s", g.ShotNoiseRadS, tt.shot},
			{"shot noise deg/h", g.ShotNoiseDegPerH, tt.shotDeg},
			{"ARW deg/sqrt(h)", g.AngleRandomWalkDegPerSqrtH, tt.arwDg},
		} {
			if math.Abs(v.got-v.want) > tol*v.want {
				t.Errorf("K %v, C %v, N %v, T_c %v: %s got %v, want %v (rel tol %g)", tt.k, tt.c, tt.atoms, tt.cycle, v.name, v.got, v.want, tol)
			}
		}
	}
	// A bias of 1e-3 rad at K = 0.2 s is 5e-3 rad/s = 1031.324 deg/h.
	if got, want := BiasDegPerH(1e-3, 0.2), 1031.324; math.Abs(got-want) > 1e-6*want {
		t.Errorf("bias deg/h: got %v, want %v (rel tol 1e-6)", got, want)
	}
	// The summary's figures use its mean shot contrast.
	s := Summary{ScaleFactorS: 100, Contrast: Distribution{Mean: 0.5}}
	if g := s.Gyro(1e4, 4); g != GyroFigures(100, 0.5, 1e4, 4) {
		t.Errorf("Summary.Gyro: got %+v", g)
	}
}

func ExampleGyroFigures() {
	g := GyroFigures(100, 0.5, 1e4, 4) // K = 100 s, C = 0.5, 1e4 atoms per 4 s cycle
	fmt.Printf("%.3g rad/s per shot, %.4g deg/h, ARW %.4g deg/sqrt(h)\n", g.ShotNoiseRadS, g.ShotNoiseDegPerH, g.AngleRandomWalkDegPerSqrtH)
	// Output: 0.0002 rad/s per shot, 41.25 deg/h, ARW 1.375 deg/sqrt(h)
}
