package scenario_test

import (
	"fmt"
	"log"

	"rampart/scenario"
)

func ExampleLoad() {
	s, err := scenario.Load("../testdata/scenarios/benchmark.toml", []string{"ramp.shape=inverse"})
	if err != nil {
		log.Fatal(err)
	}
	cfg, err := s.Config()
	if err != nil {
		log.Fatal(err)
	}
	fmt.Printf("%s ramp, %g us up, %d sites of radius %g um\n", cfg.Sequence.Up.Name(), s.Ramp.DurationUS, cfg.Ring.Sites, s.Ring.RadiusUM)
	fmt.Printf("trap frequency %.1f Hz, sequence %.3f ms\n", cfg.Ring.TrapHz(cfg.DepthHz), cfg.Sequence.Duration()*1e3)

	_, err = scenario.Load("../testdata/scenarios/benchmark.toml", []string{"motion.laps=0.7"})
	fmt.Println(err)
	// Output:
	// inverse ramp, 150 us up, 20 sites of radius 5 um
	// trap frequency 4313.7 Hz, sequence 12.716 ms
	// --set motion.laps=0.7: the arms do not recombine: with laps = 0.7 they end 8 sites apart on the 20-site ring (2*laps must be a whole number); laps = 0.5 or 1 would close
}
