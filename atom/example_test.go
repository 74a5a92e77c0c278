package atom_test

import (
	"fmt"

	"rampart/atom"
)

func ExamplePair_Coefficients() {
	p, _ := atom.LookupPreset("rb87-stretched")
	lin, quad := p.Pair.Coefficients(0)
	fmt.Printf("%v: %.4f MHz/G, %.1f Hz/G^2\n", p.Pair, lin/1e6, quad)
	// Output: |1,-1>-|2,-2>: -2.1015 MHz/G, 215.7 Hz/G^2
}

func ExampleScatteringPerDepth() {
	for _, nm := range []float64{785, 790, 1064} {
		l := nm * 1e-9
		fmt.Printf("%g nm: %.3g /s at 20 E_r\n", nm, atom.ScatteringPerDepth(l)*20*atom.RecoilHz(l))
	}
	// Output:
	// 785 nm: 1.77 /s at 20 E_r
	// 790 nm: 207 /s at 20 E_r
	// 1064 nm: 0.00703 /s at 20 E_r
}
