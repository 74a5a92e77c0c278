//go:build ignore

// Generate writes optimal.csv, the demo's ramp from an optimiser: an
// invented stand-in for the output of the (fictional) Kestrel group's
// optimal-control code, exported as 61 rows with 6 significant digits. It is
// an inverse-engineered transport ramp built on the ninth-order smoothstep
// v(s) = Omega_0 (126 s^5 - 420 s^6 + 540 s^7 - 315 s^8 + 70 s^9), whose
// first four derivatives vanish at both ends, driven at
// Omega = v + v”/omega^2 with omega the harmonic trap frequency at a design
// depth of 19 kHz, 5 % below the lattice depth (the optimiser's robustness
// margin). Run from the repository root:
//
//	go run testdata/demo/generate.go
package main

import (
	"fmt"
	"math"
	"os"
	"strconv"
)

func main() {
	const (
		rows    = 61
		tr      = 150e-6 // s
		cruise  = 500.0  // rad/s
		sites   = 20
		radius  = 5e-6 // m
		massKg  = 86.909180520 * 1.66053906660e-27
		hbar    = 6.62607015e-34 / (2 * math.Pi)
		designV = 19e3 // Hz
	)
	erotHz := hbar / (4 * math.Pi * massKg * radius * radius)
	omega := 2 * math.Pi * sites * math.Sqrt(designV*erotHz)
	f, err := os.Create("testdata/demo/optimal.csv")
	if err != nil {
		panic(err)
	}
	defer f.Close()
	fmt.Fprintln(f, "# Ramp-up exported by the (fictional) Kestrel optimal-control code: t_r = 150 us,")
	fmt.Fprintln(f, "# Omega_0 = 500 rad/s, 61 rows, 6 significant digits (testdata/demo/generate.go).")
	fmt.Fprintln(f, "t_s,omega_rad_s")
	for i := range rows {
		s := float64(i) / (rows - 1)
		v := s * s * s * s * s * (126 + s*(-420+s*(540+s*(-315+70*s))))
		vpp := s * s * s * (2520 + s*(-12600+s*(22680+s*(-17640+5040*s))))
		w := cruise * (v + vpp/(tr*tr*omega*omega))
		if i == rows-1 {
			w = cruise
		}
		fmt.Fprintf(f, "%s,%s\n", strconv.FormatFloat(s*tr, 'g', 6, 64), strconv.FormatFloat(w, 'g', 6, 64))
	}
}
