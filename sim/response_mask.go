package sim

import (
	"fmt"
	"math"

	"rampart/noise"
)

// Load is how one noise process reaches the channels: a process of
// one-sided PSD S feeds channel c with the PSD w_c S. A channel's own
// noise is Load{c: 1}; drive phase noise on each arm with correlation rho
// is PhaseLoad(rho).
type Load map[Channel]float64

// PhaseLoad is drive phase noise of PSD S on each arm with correlation rho
// between the arms: S (1+rho)/2 on the common channel and 2 S (1-rho) on
// the differential one (as PhaseNoise).
func PhaseLoad(rho float64) Load {
	return Load{PhaseCommon: (1 + rho) / 2, PhaseDifferential: 2 * (1 - rho)}
}

// MaskCriteria are the criteria a noise mask keeps, in the quantities the
// linear prediction gives.
type MaskCriteria struct {
	// ContrastMin is the least allowed mean contrast; zero: no contrast
	// criterion.
	ContrastMin float64
	// AbsBiasP95MaxRad is the largest allowed 95th percentile of |bias|;
	// zero: no bias criterion.
	AbsBiasP95MaxRad float64
}

// MaskRoom is what one noise process may add to the effect of the rest
// of the budget: a mean contrast loss and a bias variance. +Inf: no limit;
// negative: the rest of the budget alone already breaks the criterion.
type MaskRoom struct {
	ContrastLoss float64
	BiasVarRad2  float64
}

// Room returns the room the criteria leave to one noise process when the
// nominal shot has contrast c0 and bias bias0 (rad) and the rest of the
// budget is predicted to cost rest:
//
//	contrast:  c0 - rest.ContrastLoss - ContrastMin
//	bias:      sigma_max^2 - rest.BiasStdRad^2,  sigma_max = BiasStdForP95(AbsBiasP95MaxRad, bias0)
//
// The bias is treated as Gaussian of mean bias0 and the predicted std. To
// the linear order of the prediction this is exact: the bias is a linear
// functional of Gaussian noise, hence Gaussian.
func (c MaskCriteria) Room(c0, bias0 float64, rest Prediction) MaskRoom {
	r := MaskRoom{ContrastLoss: math.Inf(1), BiasVarRad2: math.Inf(1)}
	if c.ContrastMin > 0 {
		r.ContrastLoss = c0 - rest.ContrastLoss - c.ContrastMin
	}
	if c.AbsBiasP95MaxRad > 0 {
		s := BiasStdForP95(c.AbsBiasP95MaxRad, bias0)
		if s < 0 {
			r.BiasVarRad2 = -1
		} else {
			r.BiasVarRad2 = s*s - rest.BiasStdRad*rest.BiasStdRad
		}
	}
	return r
}

// AbsBiasP95 returns the 95th percentile of |X| for X normal of mean b and
// standard deviation sigma (the folded normal distribution): the q with
//
//	Phi((q-b)/sigma) - Phi((-q-b)/sigma) = 0.95.
//
// For b = 0 it is z_0.975 sigma = 1.959964 sigma.
//
// References:
//
//	F. C. Leone, L. S. Nelson and R. B. Nottingham, "The folded normal
//	distribution", Technometrics 3, 543 (1961).
func AbsBiasP95(sigma, b float64) float64 {
	b = math.Abs(b)
	if sigma == 0 {
		return b
	}
	lo, hi := b, b+3*sigma
	for range 200 {
		q := (lo + hi) / 2
		if foldedCDF(q, b, sigma) < 0.95 {
			lo = q
		} else {
			hi = q
		}
	}
	return (lo + hi) / 2
}

// BiasStdForP95 returns the largest sigma for which the 95th percentile of
// |X|, X normal of mean b, is at most limit; -1 when |b| >= limit (no
// sigma will do).
func BiasStdForP95(limit, b float64) float64 {
	b = math.Abs(b)
	if b >= limit {
		return -1
	}
	lo, hi := 0.0, limit/1.9599639845400538
	for range 200 {
		s := (lo + hi) / 2
		if foldedCDF(limit, b, s) >= 0.95 {
			lo = s
		} else {
			hi = s
		}
	}
	return lo
}

// foldedCDF is P(|X| <= q) for X normal of mean b and std s.
func foldedCDF(q, b, s float64) float64 {
	phi := func(x float64) float64 { return 0.5 * math.Erfc(-x/math.Sqrt2) }
	return phi((q-b)/s) - phi((-q-b)/s)
}

// Mask criteria names, as MaskLevel.Binding gives them.
const (
	MaskContrast = "contrast"   // the mean contrast criterion binds
	MaskBias     = "bias"       // the |bias| p95 criterion binds
	MaskNone     = "none"       // neither: the process does not reach the criteria in this band
	MaskRest     = "rest-fails" // the rest of the budget alone breaks a criterion
)

// MaskLevel is the largest allowed level of a process in one band.
type MaskLevel struct {
	Band  noise.Band
	Share float64 // of the room, in (0, 1]
	// LevelMax is the largest white level in the band (unit^2/Hz of the
	// process) that keeps the criteria: +Inf when neither is reached, 0
	// when the rest of the budget already breaks one.
	LevelMax float64
	Binding  string
	// Per unit level (1 unit^2/Hz white across the band):
	LossPerLevel    float64
	BiasVarPerLevel float64
}

// Mask is the noise mask of one process: the largest white level over
// the whole band, and the largest level in each band given.
type Mask struct {
	White MaskLevel
	Bands []MaskLevel
}

// effect returns the process's mean contrast loss and bias variance for
// PSD psd on the load, over band.
func (k *Kernels) effect(load Load, psd noise.PSD, band noise.Band) (loss, v float64) {
	for c := range numChannels {
		w, ok := load[c]
		if !ok || w == 0 {
			continue
		}
		p := k.Predict(c, psd, band)
		loss += w * p.ContrastLoss
		v += w * p.BiasVarRad2
	}
	return loss, v
}

// level returns the largest white level in band that keeps a share of the
// room.
func (k *Kernels) level(load Load, room MaskRoom, band noise.Band, share float64) MaskLevel {
	loss, v := k.effect(load, noise.White{Level: 1}, band)
	out := MaskLevel{Band: band, Share: share, LossPerLevel: loss, BiasVarPerLevel: v}
	if room.ContrastLoss < 0 || room.BiasVarRad2 < 0 {
		out.Binding = MaskRest
		return out
	}
	out.LevelMax, out.Binding = math.Inf(1), MaskNone
	if loss > 0 && !math.IsInf(room.ContrastLoss, 1) {
		out.LevelMax, out.Binding = share*room.ContrastLoss/loss, MaskContrast
	}
	if v > 0 && !math.IsInf(room.BiasVarRad2, 1) {
		if l := share * room.BiasVarRad2 / v; l < out.LevelMax {
			out.LevelMax, out.Binding = l, MaskBias
		}
	}
	return out
}

// Mask returns the noise mask of a process reaching the channels as load:
// over band (zero edges as in Predict) the largest white level that keeps
// the room, and in each of bands the largest white level that keeps the
// share given of it (shares nil: each band an equal share, so that noise at
// the mask level in every band at once still keeps the criteria; shares
// must be positive and sum to at most 1).
//
// Effects add linearly in the PSD (first-order bias variance, second-order
// contrast loss), so a level L in a band costs L times the effect of unit
// white noise there, and the mask is a quotient.
func (k *Kernels) Mask(load Load, room MaskRoom, band noise.Band, bands []noise.Band, shares []float64) (Mask, error) {
	if shares == nil {
		for range bands {
			shares = append(shares, 1/float64(len(bands)))
		}
	}
	if len(shares) != len(bands) {
		return Mask{}, fmt.Errorf("%d band shares for %d bands", len(shares), len(bands))
	}
	var sum float64
	for i, s := range shares {
		if !(s > 0 && s <= 1) {
			return Mask{}, fmt.Errorf("share %g of band %d is not in (0, 1]", s, i+1)
		}
		sum += s
	}
	if sum > 1+1e-9 {
		return Mask{}, fmt.Errorf("band shares sum to %g, more than 1", sum)
	}
	m := Mask{White: k.level(load, room, band, 1)}
	for i, b := range bands {
		m.Bands = append(m.Bands, k.level(load, room, b, shares[i]))
	}
	return m, nil
}

// Growth returns the largest factor by which a process of PSD psd on the
// load may be scaled and still keep the room, with the binding criterion:
// +Inf and MaskNone when it reaches neither, 0 and MaskRest when the rest
// of the budget already breaks one.
func (k *Kernels) Growth(load Load, psd noise.PSD, band noise.Band, room MaskRoom) (float64, string) {
	if room.ContrastLoss < 0 || room.BiasVarRad2 < 0 {
		return 0, MaskRest
	}
	loss, v := k.effect(load, psd, band)
	g, bind := math.Inf(1), MaskNone
	if loss > 0 && !math.IsInf(room.ContrastLoss, 1) {
		g, bind = room.ContrastLoss/loss, MaskContrast
	}
	if v > 0 && !math.IsInf(room.BiasVarRad2, 1) {
		if x := room.BiasVarRad2 / v; x < g {
			g, bind = x, MaskBias
		}
	}
	return g, bind
}

// LogBands cuts [lo, hi] at the powers of base (2: octaves, 10: decades);
// the first and last bands end at lo and hi.
func LogBands(lo, hi, base float64) []noise.Band {
	if !(lo > 0 && hi > lo && base > 1) {
		panic(fmt.Sprintf("sim: LogBands(%g, %g, %g) needs 0 < lo < hi and base > 1", lo, hi, base))
	}
	var out []noise.Band
	e := math.Pow(base, math.Floor(math.Log(lo)/math.Log(base)+1e-12))
	for a := lo; a < hi; {
		for e <= a*(1+1e-12) {
			e *= base
		}
		b := math.Min(e, hi)
		out = append(out, noise.Band{LowHz: a, HighHz: b})
		a = b
	}
	return out
}
