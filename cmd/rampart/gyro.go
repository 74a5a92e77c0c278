package main

import "math"

// projectionNoise returns the quantum projection-noise limit of one shot on
// the rotation rate, in rad/s,
//
//	delta Omega = 1 / (K C sqrt(N_at)),
//
// for a scale factor K in s, a contrast C and N_at atoms detected per shot
// (PHYSICS.md section 8).
func projectionNoise(scaleFactorS, contrast, atoms float64) float64 {
	return 1 / (scaleFactorS * contrast * math.Sqrt(atoms))
}

// angleRandomWalk returns the angle random walk of one shot every cycleS
// seconds with a per-shot noise of projRadS, in deg/sqrt(h):
//
//	ARW = delta Omega sqrt(T_c),  1 rad/sqrt(s) = (180/pi) 60 deg/sqrt(h).
//
// Shots every T_c with a per-shot noise delta Omega average over a time tau
// to delta Omega sqrt(T_c / tau); the angle random walk is that figure at
// tau = 1 (IEEE Std 952-1997 reads it off the Allan deviation at tau = 1 on
// the -1/2 slope).
func angleRandomWalk(projRadS, cycleS float64) float64 {
	return projRadS * math.Sqrt(cycleS) * 180 / math.Pi * 60
}
