package stats

// AdditionalTrials estimates how many trials beyond n would bring the
// Clopper-Pearson interval at the given confidence clear of threshold, after k
// successes in n trials, for an undecided yield verdict. It assumes the
// observed fraction p = k/n stays as it is: the interval after N trials is
// taken as that of p N successes (the Beta quantiles of [ClopperPearson] with
// a real number of successes), and the result is the smallest N - n for which
// it excludes threshold, found by doubling and bisection (the interval narrows
// steadily with N at fixed p).
//
// It returns 0 if the interval is already clear, and ok = false if no number of
// trials would do under this model (p equals threshold) or more than 2^40 in
// all would be needed. As with [AdditionalSamples], the estimate is a guide:
// check the verdict again after the extra trials.
func AdditionalTrials(k, n int, confidence, threshold float64) (extra int, ok bool) {
	checkTrials(k, n)
	checkConfidence(confidence)
	p := float64(k) / float64(n)
	clear := func(trials int) bool {
		t := float64(trials)
		lo, hi := clopperPearson(p*t, t, confidence)
		return threshold < lo || threshold > hi
	}
	if clear(n) {
		return 0, true
	}
	if p == threshold {
		return 0, false
	}
	lo, hi := n, 2*n
	for !clear(hi) {
		if hi > maxSamples {
			return 0, false
		}
		lo, hi = hi, 2*hi
	}
	for hi-lo > 1 {
		mid := lo + (hi-lo)/2
		if clear(mid) {
			hi = mid
		} else {
			lo = mid
		}
	}
	return hi - n, true
}
