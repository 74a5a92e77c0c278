package main

import (
	"math"
	"testing"
)

func TestGyroFigures(t *testing.T) {
	// Hand-computed: K = 1 s, C = 0.5, 100 atoms give 1/(1 0.5 10) = 0.2 rad/s;
	// one shot every 4 s gives 0.2 sqrt(4) = 0.4 rad/sqrt(s)
	// = 0.4 (180/pi) 60 = 1375.0987... deg/sqrt(h).
	const tol = 1e-12 // relative
	if got, want := projectionNoise(1, 0.5, 100), 0.2; math.Abs(got-want) > tol*want {
		t.Errorf("projection noise: got %v, want %v (tol %g relative)", got, want, tol)
	}
	if got, want := angleRandomWalk(0.2, 4), 0.4*180/math.Pi*60; math.Abs(got-want) > tol*want {
		t.Errorf("angle random walk: got %v, want %v (tol %g relative)", got, want, tol)
	}
}
