package kernel

import "math"

// Combine sets y[q] = sum_j c[j] x[j*stride+q] for q < len(y), in the
// order the package documents. x must hold len(c) rows of stride elements,
// stride >= len(y).
func Combine(y, x []float64, stride int, c []float64) {
	if len(c) > 0 && (stride < len(y) || len(x) < (len(c)-1)*stride+len(y)) {
		panic("kernel: x is shorter than len(c) rows of stride")
	}
	if len(y) == 0 {
		return
	}
	if len(c) == 0 {
		clear(y)
		return
	}
	combine(y, x, stride, c)
}

// combineGo is the portable loop.
func combineGo(y, x []float64, stride int, c []float64) {
	clear(y)
	n := len(y)
	j := 0
	for ; j+4 <= len(c); j += 4 {
		c0, c1, c2, c3 := c[j], c[j+1], c[j+2], c[j+3]
		r0 := x[j*stride : j*stride+n]
		r1 := x[(j+1)*stride : (j+1)*stride+n]
		r2 := x[(j+2)*stride : (j+2)*stride+n]
		r3 := x[(j+3)*stride : (j+3)*stride+n]
		for q, v := range r0 {
			y[q] += c0*v + c1*r1[q] + c2*r2[q] + c3*r3[q]
		}
	}
	for ; j < len(c); j++ {
		cj := c[j]
		row := x[j*stride : j*stride+n]
		for q, v := range row {
			y[q] += cj * v
		}
	}
}

// CombineFused is Combine with fused multiply-adds: y[q] = sum_j c[j]
// x[j*stride+q], each group of four rows j..j+3 summed as
//
//	t = c[j] x_j;  t = fma(c[j+1], x_j+1, t);  t = fma(c[j+2], x_j+2, t);  t = fma(c[j+3], x_j+3, t);  y += t
//
// and each remaining row as y = fma(c[j], x_j, y) (fma rounded once, as
// math.FMA). It is for products whose bits no golden output pins: on
// amd64 with FMA the vector kernel runs about 1.6 times faster than
// Combine's, and everywhere else the loop with math.FMA gives the same
// bits.
func CombineFused(y, x []float64, stride int, c []float64) {
	if len(c) > 0 && (stride < len(y) || len(x) < (len(c)-1)*stride+len(y)) {
		panic("kernel: x is shorter than len(c) rows of stride")
	}
	if len(y) == 0 {
		return
	}
	if len(c) == 0 {
		clear(y)
		return
	}
	combineFused(y, x, stride, c)
}

// combineFusedGo is the portable loop.
func combineFusedGo(y, x []float64, stride int, c []float64) {
	clear(y)
	n := len(y)
	j := 0
	for ; j+4 <= len(c); j += 4 {
		c0, c1, c2, c3 := c[j], c[j+1], c[j+2], c[j+3]
		r0 := x[j*stride : j*stride+n]
		r1 := x[(j+1)*stride : (j+1)*stride+n]
		r2 := x[(j+2)*stride : (j+2)*stride+n]
		r3 := x[(j+3)*stride : (j+3)*stride+n]
		for q, v := range r0 {
			t := c0 * v
			t = math.FMA(c1, r1[q], t)
			t = math.FMA(c2, r2[q], t)
			t = math.FMA(c3, r3[q], t)
			y[q] += t
		}
	}
	for ; j < len(c); j++ {
		cj := c[j]
		row := x[j*stride : j*stride+n]
		for q, v := range row {
			y[q] = math.FMA(cj, v, y[q])
		}
	}
}
