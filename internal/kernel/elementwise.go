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
