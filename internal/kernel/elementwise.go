package kernel

// Fold sets s[q] = a[q] + b[q] and d[q] = a[q] - b[q] for q < len(s): the
// even and odd combinations of two rows of a symmetric transform.
func Fold(s, d, a, b []float64) {
	n := len(s)
	if len(d) < n || len(a) < n || len(b) < n {
		panic("kernel: Fold of slices shorter than s")
	}
	if n > 0 {
		fold(s[:n], d[:n], a[:n], b[:n])
	}
}

// Rotate multiplies the complex numbers re[q] + i im[q], q < len(re), by
// c + i s:
//
//	re[q], im[q] = c re[q] - s im[q], s re[q] + c im[q].
func Rotate(re, im []float64, c, s float64) {
	n := len(re)
	if len(im) < n {
		panic("kernel: Rotate with im shorter than re")
	}
	if n > 0 {
		rotate(re[:n], im[:n], c, s)
	}
}

func foldGo(s, d, a, b []float64) {
	for q := range s {
		s[q] = a[q] + b[q]
		d[q] = a[q] - b[q]
	}
}

func rotateGo(re, im []float64, c, s float64) {
	for q := range re {
		a, b := re[q], im[q]
		re[q] = c*a - s*b
		im[q] = s*a + c*b
	}
}

// PhaseRotate multiplies re[q] + i im[q], q < len(re), by the product of
// c[q] = cr[q] + i ci[q] and t[q] = tr[q] + i ti[q], in Go's order: first
// p = c t = (cr tr - ci ti) + i (cr ti + ci tr), then (re + i im) p as
// Rotate does.
func PhaseRotate(re, im, cr, ci, tr, ti []float64) {
	n := len(re)
	if len(im) < n || len(cr) < n || len(ci) < n || len(tr) < n || len(ti) < n {
		panic("kernel: PhaseRotate of slices shorter than re")
	}
	if n > 0 {
		phaseRotate(re[:n], im[:n], cr[:n], ci[:n], tr[:n], ti[:n])
	}
}

func phaseRotateGo(re, im, cr, ci, tr, ti []float64) {
	for q := range re {
		ph := complex(cr[q], ci[q]) * complex(tr[q], ti[q])
		cs, sn := real(ph), imag(ph)
		a, b := re[q], im[q]
		re[q] = cs*a - sn*b
		im[q] = sn*a + cs*b
	}
}

// RotateBy multiplies re[q] + i im[q], q < len(re), by cr[q] + i ci[q],
// as Rotate does with one factor: (cr re - ci im) + i (ci re + cr im).
func RotateBy(re, im, cr, ci []float64) {
	n := len(re)
	if len(im) < n || len(cr) < n || len(ci) < n {
		panic("kernel: RotateBy of slices shorter than re")
	}
	if n > 0 {
		rotateBy(re[:n], im[:n], cr[:n], ci[:n])
	}
}

func rotateByGo(re, im, cr, ci []float64) {
	for q := range re {
		c, s := cr[q], ci[q]
		a, b := re[q], im[q]
		re[q] = c*a - s*b
		im[q] = s*a + c*b
	}
}

// RotateTwiceTo sets dr[q] + i di[q] to (sr[q] + i si[q]) multiplied by
// cr[q] + i ci[q] twice, q < len(dr): the bits of copying s to d and
// applying RotateBy twice, in one pass (the two half kicks of a noisy
// interval, applied as the block step reads its input). d must not
// overlap s unless it is s.
func RotateTwiceTo(dr, di, sr, si, cr, ci []float64) {
	n := len(dr)
	if len(di) < n || len(sr) < n || len(si) < n || len(cr) < n || len(ci) < n {
		panic("kernel: RotateTwiceTo of slices shorter than dr")
	}
	if n > 0 {
		rotateTwiceTo(dr[:n], di[:n], sr[:n], si[:n], cr[:n], ci[:n])
	}
}

func rotateTwiceToGo(dr, di, sr, si, cr, ci []float64) {
	for q := range dr {
		c, s := cr[q], ci[q]
		a, b := sr[q], si[q]
		r1 := c*a - s*b
		i1 := s*a + c*b
		dr[q] = c*r1 - s*i1
		di[q] = s*r1 + c*i1
	}
}
