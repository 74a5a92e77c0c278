package sim

import (
	"math"
	"runtime"
	"sort"
	"sync"
)

// rampSamples is one ramp's quadrature: sample times t_j = t0 + j h_r,
// their weights w (h_r times gregoryWeights) and the step h_r.
type rampSamples struct {
	t, w []float64
	h    float64
}

// minRampIntervals is the fewest intervals a ramp is sampled with (the
// end corrections of gregoryWeights need at least 5).
const minRampIntervals = 8

// newRampSamples returns the quadrature of [t0, t1] with a step at most h
// (none if the interval is empty).
func newRampSamples(t0, t1, h float64) rampSamples {
	var rs rampSamples
	if t1 <= t0 {
		return rs
	}
	n := max(minRampIntervals, int(math.Ceil((t1-t0)/h-1e-9)))
	rs.h = (t1 - t0) / float64(n)
	for j, g := range gregoryWeights(n) {
		t := t0 + float64(j)*rs.h
		if j == n {
			t = t1
		}
		rs.t = append(rs.t, t)
		rs.w = append(rs.w, rs.h*g)
	}
	return rs
}

// gregoryWeights returns the weights (in units of the step) of a rule on
// n+1 equally spaced points, exact for cubics (error O(h^4) for smooth
// integrands): for n >= 5 the trapezoid rule with Gregory's end
// corrections, 3/8, 7/6, 23/24, 1, ..., 1, 23/24, 7/6, 3/8 (W. H. Press
// et al., Numerical Recipes, 3rd ed., eq. 4.1.14); for n = 1 to 4 the
// trapezoid (n = 1: one interval, error O(h^3)), Simpson's, Simpson's 3/8
// and Boole's rules; none for n = 0.
func gregoryWeights(n int) []float64 {
	switch n {
	case 0:
		return []float64{0}
	case 1:
		return []float64{0.5, 0.5}
	case 2:
		return []float64{1.0 / 3, 4.0 / 3, 1.0 / 3}
	case 3:
		return []float64{3.0 / 8, 9.0 / 8, 9.0 / 8, 3.0 / 8}
	case 4:
		return []float64{14.0 / 45, 64.0 / 45, 24.0 / 45, 64.0 / 45, 14.0 / 45}
	}
	w := make([]float64, n+1)
	for i := range w {
		w[i] = 1
	}
	for i, e := range []float64{3.0 / 8, 7.0 / 6, 23.0 / 24} {
		w[i], w[n-i] = e, e
	}
	return w
}

// regionWalk propagates one arm's block unitary over its up ramp (samples
// ramps[0].t), through the cruise in one exact step, and over its down
// ramp (samples ramps[1].t), reporting U at each sample (region 0 up, 1
// down); the ramps are split as in responseWalk, at least one step per
// sample interval and none longer than the simulator's step. It returns
// the cruise's frame and U(T).
func (s *Simulator) regionWalk(p *propagator, d Drive, ramps [2]rampSamples, onRamp func(region, j int, u blockMat)) (*cruiseFrame, blockMat) {
	b := s.basis
	tm := d.times()
	f := identityField(b)
	tc := 0.0
	to := func(t float64) {
		if t > tc {
			p.splitSteps(f, d, tc, t, max(1, s.steps(t-tc)))
		}
		tc = t
	}
	for j, t := range ramps[0].t {
		to(t)
		onRamp(0, j, unitaryOf(f))
	}
	to(tm[1])
	es := diagonaliseFor(p, d.cruiseSpeed(), 1+d.DepthRel)
	cf := newCruiseFrame(b, es, unitaryOf(f))
	if tm[2] > tm[1] {
		p.exactStep(f, cf.es, d.cruiseSpeed(), 1+d.DepthRel, tm[2]-tm[1])
	}
	tc = tm[2]
	for j, t := range ramps[1].t {
		to(t)
		onRamp(1, j, unitaryOf(f))
	}
	to(tm[3])
	return cf, unitaryOf(f)
}

// cruiseTerms are the terms A e^{i gap s} of a cruise series in the
// cruise eigenbasis, component idx: A = (E^T W E)_{kk'} c_k', gap = g_k -
// g_k', for the state c's eigencomponents k', the smallest pruned (see
// responsePruneTol). Terms of one component are contiguous; z = e^{i gap
// tau}.
type cruiseTerms struct {
	idx   []int
	a     []complex128
	gap   []float64
	z     []complex128
	az    []complex128 // A z
	start []int        // per component, its first term; start[dim] = len(idx)
}

// newCruiseTerms returns the terms of the cruise series W~ v for the
// state v's eigen coefficients c (E^T F1 v) and the operator we = E^T W E.
func newCruiseTerms(bs Basis, cf *cruiseFrame, we blockMat, c []complex128, tol, tau float64) *cruiseTerms {
	k, n := bs.Block, bs.Sites
	// The smallest terms whose moduli add up to at most tol times the
	// terms' root-sum-square are dropped: the series moves by at most that
	// at every instant of the cruise.
	var mods []float64
	var ss float64
	for cl := range n {
		for kk := range k {
			for kp := range k {
				if a := cmplxAbs(we[cl][kk*k+kp] * c[n*kp+cl]); a > 0 {
					mods = append(mods, a)
					ss += a * a
				}
			}
		}
	}
	sort.Float64s(mods)
	cut, cum := 0.0, 0.0
	for _, a := range mods {
		cut = a
		if cum+a > tol*math.Sqrt(ss) {
			break
		}
		cum += a
	}
	ct := &cruiseTerms{start: make([]int, bs.Size()+1)}
	for kk := range k {
		for cl := range n {
			i := n*kk + cl
			ct.start[i] = len(ct.idx)
			for kp := range k {
				a := we[cl][kk*k+kp] * c[n*kp+cl]
				if a == 0 || cmplxAbs(a) < cut {
					continue
				}
				g := cf.es.vals[cl][kk] - cf.es.vals[cl][kp]
				ct.idx = append(ct.idx, i)
				ct.a = append(ct.a, a)
				ct.gap = append(ct.gap, g)
				ct.z = append(ct.z, cis(g*tau))
				ct.az = append(ct.az, a*cis(g*tau))
			}
		}
	}
	ct.start[bs.Size()] = len(ct.idx)
	return ct
}

// transform sets out_k = sum A I1(gap - w) over the terms (the cruise's
// transform int_0^tau e^{-i w s} y(s) ds), ew = e^{-i w tau}.
func (ct *cruiseTerms) transform(w, tau float64, ew complex128, out []complex128) {
	clear(out)
	small := 1e-2 / tau
	a := ct.a
	az, gap := ct.az[:len(a)], ct.gap[:len(a)]
	for t, i := range ct.idx[:len(a)] {
		x := gap[t] - w
		if math.Abs(x) < small {
			out[i] += a[t] * phaseInt(x, tau, ct.z[t]*ew)
			continue
		}
		// A (e^{i x tau} - 1) / (i x)
		v := az[t]*ew - a[t]
		r := 1 / x
		out[i] += complex(imag(v)*r, -real(v)*r)
	}
}

// armLevel is what one arm and start level contribute, in the arm's
// cruise eigenbasis: the ramps' series of Y = W~ psi0 and Lambda = W~ m
// (compressed), their ordered lag sums, the cruise's terms and the kick.
type armLevel struct {
	ramps   [2]rampSamples
	y, l    [2]lowRank      // [region]
	lagYY   [2][]complex128 // [region][lag] ordered lag sums of <Lambda|Y>
	lkick   [2][]complex128 // [region][j] <Lambda_j|kick>
	q       []complex128    // B^dagger m
	ty, tl  *cruiseTerms
	acc     []complex128 // per Y term A: A times the sum over the Lambda terms of its component of conj(A_L) I1(g_k'' - g_k')
	kick    []complex128 // B^dagger l psi0 (nil without a kick)
	kick0   complex128   // <l m|l psi0>/2
	t1, tau float64
	q2      complex128
	weight  float64
}

// closedSpectra returns the spectra of responseOps as spectraSampled
// does, with the cruise in closed form (docs/model.md, "Noise transfer
// functions", Computation): only the ramps are sampled, on their own
// grids with Gregory's end-corrected weights.
func (s *Simulator) closedSpectra(rs *responseSetup) [2]*opSpectra {
	b := rs.b
	dim := b.Size()
	M := rs.m
	var arms [2][len(responseOps)][]*armLevel
	var frames [2]*cruiseFrame
	for a := range 2 {
		arms[a], frames[a] = s.prepareArm(rs, a)
	}
	mp := rs.mapBetween(frames)
	dw := 2 * math.Pi / (float64(rs.l) * rs.h)
	// The frequencies are independent: each worker takes a contiguous
	// share of them with its own scratch, and sums over the start levels
	// in their order, so the result does not depend on the workers.
	workers := max(1, min(runtime.GOMAXPROCS(0), M+1))
	var res [2]*opSpectra
	for o := range responseOps {
		out := &opSpectra{}
		for a := range 2 {
			for sg := range 2 {
				out.r[a][sg] = make([]complex128, M+1)
				out.j[a][sg] = make([]complex128, M+1)
			}
			for _, al := range arms[a][o] {
				out.q2[a] += complex(al.weight, 0) * al.q2
			}
		}
		for sg := range 2 {
			out.x[sg] = make([]complex128, M+1)
		}
		var wg sync.WaitGroup
		for k := range workers {
			lo, hi := (M+1)*k/workers, (M+1)*(k+1)/workers
			wg.Go(func() {
				var ys [2][]complex128
				for a := range 2 {
					ys[a] = make([]complex128, dim)
				}
				ev := newArmEval(dim)
				tmp := make([]complex128, dim)
				for n, w0 := range rs.weights {
					pw := complex(w0, 0)
					for m := lo; m < hi; m++ {
						if rs.progress != nil && (m-lo)%64 == 63 {
							rs.progress(64)
						}
						for sg, w := range [2]float64{float64(m) * dw, -float64(m) * dw} {
							for a := range 2 {
								r, j := ev.eval(arms[a][o][n], w, ys[a])
								out.r[a][sg][m] += pw * r
								out.j[a][sg][m] += pw * j
							}
							mp.mul(b, ys[0], tmp)
							out.x[sg][m] += pw * dot(ys[1], tmp)
						}
					}
					if rs.progress != nil {
						rs.progress((hi - lo) % 64)
					}
				}
			})
		}
		wg.Wait()
		res[o] = out
	}
	return res
}

// mapBetween returns M' = B_-^dagger U_-(T)^dagger D U_+(T) B_+, the map M
// between the two arms' cruise eigenbases.
func (rs *responseSetup) mapBetween(cf [2]*cruiseFrame) blockMat {
	b := rs.b
	k, n, dim := b.Block, b.Sites, b.Size()
	out := make(blockMat, n)
	for c := range n {
		out[c] = make([]complex128, k*k)
	}
	v, x, y := make([]complex128, dim), make([]complex128, dim), make([]complex128, dim)
	for kk := range k {
		clear(v)
		for c := range n {
			v[n*kk+c] = 1
		}
		cf[0].b.mul(b, v, x)
		rs.ut[0].mul(b, x, y)
		for i := range y {
			y[i] *= cis(-float64(b.LMin()+i) * rs.da)
		}
		rs.ut[1].mulH(b, y, x)
		cf[1].b.mulH(b, x, y)
		for c := range n {
			for i := range k {
				out[c][i*k+kk] = y[n*i+c]
			}
		}
	}
	return out
}

// prepareArm samples arm a's ramps once and sets up, for every operator
// of responseOps and every start level, its ramp series and cruise terms.
func (s *Simulator) prepareArm(rs *responseSetup, a int) ([len(responseOps)][]*armLevel, *cruiseFrame) {
	b := rs.b
	dim := b.Size()
	lev := len(rs.starts)
	d := rs.drives[a]
	tm := d.times()
	ramps := [2]rampSamples{newRampSamples(0, tm[1], rs.h), newRampSamples(tm[2], tm[3], rs.h)}
	// raw[o][n][region][which][j]: Y (which 0) and Lambda (1) in the time-0 picture.
	nops := len(responseOps)
	raw := make([][][2][2][][]complex128, nops)
	q2r := make([][]complex128, nops)
	for o := range nops {
		raw[o] = make([][2][2][][]complex128, lev)
		q2r[o] = make([]complex128, lev)
	}
	phi, wv := make([]complex128, dim), make([]complex128, dim)
	cf, _ := s.regionWalk(rs.props[a], d, ramps, func(region, j int, u blockMat) {
		for n := range lev {
			for which, v := range [2][]complex128{rs.starts[n], rs.partner[a][n]} {
				u.mul(b, v, phi)
				for o, spec := range responseOps {
					y := make([]complex128, dim)
					spec.op.apply(b, rs.v0, phi, wv)
					u.mulH(b, wv, y)
					raw[o][n][region][which] = append(raw[o][n][region][which], y)
				}
			}
			for o, spec := range responseOps {
				if spec.second {
					y := make([]complex128, dim)
					u.mul(b, rs.starts[n], phi)
					opCurvature.apply(b, rs.v0, phi, wv)
					u.mul(b, rs.partner[a][n], y)
					q2r[o][n] += complex(ramps[region].w[j], 0) * dot(y, wv)
				}
			}
		}
	})
	var out [len(responseOps)][]*armLevel
	for o, spec := range responseOps {
		for n := range lev {
			out[o] = append(out[o], prepareLevel(rs, a, n, cf, spec, ramps, raw[o][n], q2r[o][n]))
		}
	}
	return out, cf
}

// prepareLevel sets up one operator's terms for arm a and start level n
// from the ramps' samples raw[region][which][j] (Y, Lambda).
func prepareLevel(rs *responseSetup, a, n int, cf *cruiseFrame, spec opSpec, ramps [2]rampSamples, raw [2][2][][]complex128, q2 complex128) *armLevel {
	b := rs.b
	dim := b.Size()
	tm := rs.drives[a].times()
	t1, tau := tm[1], tm[2]-tm[1]
	we := cf.operatorInEigenbasis(b, spec.op, rs.v0)
	al := &armLevel{ramps: ramps, t1: t1, tau: tau, weight: rs.weights[n], q2: q2}
	p := cf.eigenCoefficients(b, rs.starts[n])
	al.q = cf.eigenCoefficients(b, rs.partner[a][n])
	al.ty = newCruiseTerms(b, cf, we, p, responsePruneTol, tau)
	al.tl = newCruiseTerms(b, cf, we, al.q, responsePruneTol, tau)
	if spec.kick {
		yi, li := make([]complex128, dim), make([]complex128, dim)
		opMomentum.apply(b, 0, rs.starts[n], yi)
		opMomentum.apply(b, 0, rs.partner[a][n], li)
		al.kick0 = 0.5 * dot(li, yi)
		al.kick = make([]complex128, dim)
		cf.b.mulH(b, yi, al.kick)
	}
	for region := range 2 {
		var cols [2][][]complex128
		for which := range 2 {
			for _, v := range raw[region][which] {
				e := make([]complex128, dim)
				cf.b.mulH(b, v, e)
				cols[which] = append(cols[which], e)
			}
		}
		al.lagYY[region] = lagSums(cols[1], cols[0], ramps[region].w)
		if spec.kick {
			for _, v := range cols[1] {
				al.lkick[region] = append(al.lkick[region], dot(v, al.kick))
			}
		}
		al.y[region] = lowRankOf(cols[0], responseRampTol)
		if region == 1 {
			// Lambda's transform is needed on the down ramp only (J_du, J_dc);
			// on the up ramp its ordered lag sums and the kick's overlaps do.
			al.l[region] = lowRankOf(cols[1], responseRampTol)
		}
	}
	// acc per Y term (k, k'): A times the sum over the Lambda terms (k, k'')
	// of conj(A_L) I1(g_k'' - g_k') = conj(A_L) I1(gapY - gapL).
	al.acc = make([]complex128, len(al.ty.idx))
	for t, i := range al.ty.idx {
		var cc complex128
		for u := al.tl.start[i]; u < al.tl.start[i+1]; u++ {
			x := al.ty.gap[t] - al.tl.gap[u]
			cc += complexConj(al.tl.a[u]) * phaseInt(x, tau, cis(x*tau))
		}
		al.acc[t] = al.ty.a[t] * cc
	}
	if spec.second {
		// int_0^tau <m|U^+ W2 U|psi0> ds = sum conj(q_k) W2_kk' p_k' I1(g_k - g_k').
		w2e := cf.operatorInEigenbasis(b, opCurvature, rs.v0)
		k, nn := b.Block, b.Sites
		for c := range nn {
			for kk := range k {
				for kp := range k {
					x := cf.es.vals[c][kk] - cf.es.vals[c][kp]
					al.q2 += complexConj(al.q[nn*kk+c]) * w2e[c][kk*k+kp] * p[nn*kp+c] * phaseInt(x, tau, cis(x*tau))
				}
			}
		}
	}
	return al
}

// lagSums returns c(k) = sum_j w_{j+k} w_j <l_{j+k}|y_j>, k = 0 .. n,
// c(0) halved: the ordered double integral over one ramp at lag k, by the
// rule whose ordered and anti-ordered sums add up to the product of the
// single sums (w_j w_i off the diagonal, w_j^2/2 on it), as the sampled
// reference's. The cancellations that make a pure phase leave the contrast
// alone (the ordered terms against the squared first order, Kernels) then
// hold exactly on the grid. (An inner rule of higher order, gregoryWeights
// up to t_j, broke them by its error on the near-Nyquist Bohr frequencies
// of the series, magnified by the cancellation into 4e-3 of the contrast
// kernel at 2 nu on the benchmark ring.)
func lagSums(l, y [][]complex128, w []float64) []complex128 {
	n := len(y)
	out := make([]complex128, n)
	for k := range n {
		for j := 0; j+k < n; j++ {
			out[k] += complex(w[j+k]*w[j], 0) * dot(l[j+k], y[j])
		}
	}
	if n > 0 {
		out[0] /= 2
	}
	return out
}

// armEval holds the work vectors of one evaluation.
type armEval struct {
	sy, sl, yu, yd, ld []complex128
	c                  [2][]complex128 // per ramp, w_j e^{-i w t_j}
}

func newArmEval(dim int) *armEval {
	mk := func() []complex128 { return make([]complex128, dim) }
	return &armEval{sy: mk(), sl: mk(), yu: mk(), yd: mk(), ld: mk()}
}

// rampWeights sets ev.c[region] to the trapezoid weights of each ramp
// times e^{-i w t_j} (by the recurrence e^{-i w t_{j+1}} = e^{-i w t_j}
// e^{-i w h_r}, renewed every 64 samples).
func (ev *armEval) rampWeights(rp [2]rampSamples, w float64) {
	for region, r := range rp {
		n := len(r.t)
		if cap(ev.c[region]) < n {
			ev.c[region] = make([]complex128, n)
		}
		c := ev.c[region][:n]
		if n == 0 {
			ev.c[region] = c
			continue
		}
		step := cis(-w * (r.t[min(1, n-1)] - r.t[0]))
		var e complex128
		for j, t := range r.t {
			if j%64 == 0 {
				e = cis(-w * t)
			}
			c[j] = complex(r.w[j], 0) * e
			e *= step
		}
		ev.c[region] = c
	}
}

// rampTransform sets out = sum_j c_j v_j for the compressed samples v.
func rampTransform(lr lowRank, c, out []complex128) {
	clear(out)
	for i, row := range lr.r {
		var s complex128
		for j, x := range row[:len(c)] {
			s += x * c[j]
		}
		axpy(s, lr.q[i], out)
	}
}

// eval returns R(w) = <m|Yhat(w)> and J(w) for one arm and level and sets
// y to the arm's Yhat(w) (the kick included) in its cruise eigenbasis.
func (ev *armEval) eval(al *armLevel, w float64, y []complex128) (complex128, complex128) {
	tau := al.tau
	ew := cis(-w * tau)
	al.ty.transform(w, tau, ew, ev.sy)
	al.tl.transform(w, tau, ew, ev.sl)
	// J over cruise x cruise: A_Y (cc - conj(S_L,k)) / (i beta) far from
	// resonance, the ordered integral I2 summed over the Lambda terms near it.
	var jcc complex128
	for t, i := range al.ty.idx {
		beta := al.ty.gap[t] - w
		if math.Abs(beta*tau) >= 0.5 {
			// (A cc - A conj(S_L)) (-i/beta)
			v := al.acc[t] - al.ty.a[t]*complexConj(ev.sl[i])
			r := 1 / beta
			jcc += complex(imag(v)*r, -real(v)*r)
			continue
		}
		var s complex128
		for u := al.tl.start[i]; u < al.tl.start[i+1]; u++ {
			s += complexConj(al.tl.a[u]) * orderedPhaseInt(w-al.tl.gap[u], beta, tau)
		}
		jcc += al.ty.a[t] * s
	}
	e1 := cis(-w * al.t1)
	ev.rampWeights(al.ramps, w)
	rampTransform(al.y[0], ev.c[0], ev.yu)
	rampTransform(al.y[1], ev.c[1], ev.yd)
	rampTransform(al.l[1], ev.c[1], ev.ld)
	var j complex128
	// Same-region ramp pairs: their ordered lag sums.
	for region := range 2 {
		hr := al.ramps[region].h
		for k, c := range al.lagYY[region] {
			j += cis(w*float64(k)*hr) * c
		}
	}
	// Cross-region pairs (t later than t'): products of the transforms.
	var jc, jd, jdc complex128
	for i := range y {
		scr := e1 * ev.sy[i]
		lcr := e1 * ev.sl[i]
		jc += complexConj(lcr) * ev.yu[i]
		jd += complexConj(ev.ld[i]) * ev.yu[i]
		jdc += complexConj(ev.ld[i]) * scr
		y[i] = ev.yu[i] + scr + ev.yd[i]
	}
	j += jcc + jc + jd + jdc
	if al.kick != nil {
		// The kick at t = 0 precedes every sample: <Lambdahat(w)|kick>, and
		// its own ordered square <l m|l psi0>/2.
		var lk complex128
		for region := range 2 {
			for jj, v := range al.lkick[region] {
				lk += complexConj(ev.c[region][jj]) * v
			}
		}
		lk += complexConj(e1) * dot(ev.sl, al.kick)
		j += lk + al.kick0
		axpy(1, al.kick, y)
	}
	return dot(al.q, y), j
}
