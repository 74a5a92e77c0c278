package main

import "rampart/mc"

// writeHistograms writes the contrast and bias histograms of an ensemble
// to dir as PNG and SVG.
func writeHistograms(dir string, sum mc.Summary, recs []mc.Record, spec mc.Spec) error {
	return nil // filled in with the plots package
}
