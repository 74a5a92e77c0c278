//go:build ignore

// Generate writes the ramp files of this directory: the sin^2 ramp of the
// benchmark scenario (t_r = 150 us, Omega_0 = 500 rad/s, 20 sites) sampled
// at 41 equally spaced times, once as omega_rad_s and once as drive_hz with
// the columns the other way round. Run from the repository root:
//
//	go run testdata/ramps/generate.go
package main

import (
	"fmt"
	"math"
	"os"
	"strconv"
)

// g is the shortest decimal that reads back as x.
func g(x float64) string { return strconv.FormatFloat(x, 'g', -1, 64) }

func main() {
	const (
		rows   = 41
		tr     = 150e-6
		cruise = 500.0
		sites  = 20
	)
	omega, err := os.Create("testdata/ramps/sin2-41.csv")
	if err != nil {
		panic(err)
	}
	drive, err := os.Create("testdata/ramps/sin2-41-drive.csv")
	if err != nil {
		panic(err)
	}
	fmt.Fprintln(omega, "# sin^2 ramp, t_r = 150 us, Omega_0 = 500 rad/s, 41 rows (testdata/ramps/generate.go)")
	fmt.Fprintln(omega, "t_s,omega_rad_s")
	fmt.Fprintln(drive, "# sin^2 ramp, t_r = 150 us, Omega_0 = 500 rad/s on 20 sites, as the drive offset N Omega / 2 pi (testdata/ramps/generate.go)")
	fmt.Fprintln(drive, "drive_hz,t_s")
	for i := range rows {
		t := tr * float64(i) / (rows - 1)
		s := math.Sin(math.Pi / 2 * float64(i) / (rows - 1))
		w := cruise * s * s
		fmt.Fprintf(omega, "%s,%s\n", g(t), g(w))
		fmt.Fprintf(drive, "%s,%s\n", g(sites*w/(2*math.Pi)), g(t))
	}
	for _, f := range []*os.File{omega, drive} {
		if err := f.Close(); err != nil {
			panic(err)
		}
	}
}
