//go:build !noasm

package kernel

import "golang.org/x/sys/cpu"

var useAVX = cpu.X86.HasAVX

func combine(y, x []float64, stride int, c []float64) {
	if useAVX {
		combineAVX(y, x, stride, c)
		return
	}
	combineGo(y, x, stride, c)
}

// combineAVX is combineGo with four (sixteen) elements of y at a time in
// YMM registers; the lanes are independent, so each element sees the same
// operations in the same order.
//
//go:noescape
func combineAVX(y, x []float64, stride int, c []float64)

func fold(s, d, a, b []float64) {
	if useAVX {
		foldAVX(s, d, a, b)
		return
	}
	foldGo(s, d, a, b)
}

func rotate(re, im []float64, c, s float64) {
	if useAVX {
		rotateAVX(re, im, c, s)
		return
	}
	rotateGo(re, im, c, s)
}

// foldAVX is foldGo four elements at a time; len(s) elements of each.
//
//go:noescape
func foldAVX(s, d, a, b []float64)

// rotateAVX is rotateGo four elements at a time; len(re) elements of each.
//
//go:noescape
func rotateAVX(re, im []float64, c, s float64)

func rotateBy(re, im, cr, ci []float64) {
	if useAVX {
		rotateByAVX(re, im, cr, ci)
		return
	}
	rotateByGo(re, im, cr, ci)
}

// rotateByAVX is rotateByGo four elements at a time; len(re) elements of
// each.
//
//go:noescape
func rotateByAVX(re, im, cr, ci []float64)

func rotateTwiceTo(dr, di, sr, si, cr, ci []float64) {
	if useAVX {
		rotateTwiceToAVX(dr, di, sr, si, cr, ci)
		return
	}
	rotateTwiceToGo(dr, di, sr, si, cr, ci)
}

// rotateTwiceToAVX is rotateTwiceToGo four elements at a time; len(dr)
// elements of each.
//
//go:noescape
func rotateTwiceToAVX(dr, di, sr, si, cr, ci []float64)

func phaseRotate(re, im, cr, ci, tr, ti []float64) {
	if useAVX {
		phaseRotateAVX(re, im, cr, ci, tr, ti)
		return
	}
	phaseRotateGo(re, im, cr, ci, tr, ti)
}

// phaseRotateAVX is phaseRotateGo four elements at a time; len(re)
// elements of each.
//
//go:noescape
func phaseRotateAVX(re, im, cr, ci, tr, ti []float64)

func axpyTo(dst, y []complex128, a complex128, x []complex128) {
	if useAVX {
		axpyToAVX(dst, y, a, x)
		return
	}
	axpyToGo(dst, y, a, x)
}

// axpyToAVX is axpyToGo two elements at a time (VADDSUBPD of the products
// with a's real part and, on the swapped pairs, its imaginary part);
// len(dst) elements of each.
//
//go:noescape
func axpyToAVX(dst, y []complex128, a complex128, x []complex128)

func axpy2To(dst, y []complex128, a complex128, xa []complex128, b complex128, xb []complex128) {
	if useAVX {
		axpy2ToAVX(dst, y, a, xa, b, xb)
		return
	}
	axpy2ToGo(dst, y, a, xa, b, xb)
}

// axpy2ToAVX is axpy2ToGo two elements at a time, each product as in
// axpyToAVX; len(dst) elements of each.
//
//go:noescape
func axpy2ToAVX(dst, y []complex128, a complex128, xa []complex128, b complex128, xb []complex128)

func axpy2Planes(dr, di, yr, yi []float64, a complex128, xar, xai []float64, b complex128, xbr, xbi []float64) {
	if useAVX {
		axpy2PlanesAVX(dr, di, yr, yi, a, xar, xai, b, xbr, xbi)
		return
	}
	axpy2PlanesGo(dr, di, yr, yi, a, xar, xai, b, xbr, xbi)
}

// axpy2PlanesAVX is axpy2PlanesGo four elements at a time (and one at a
// time for the rest); the lanes are independent, so each element sees the
// loop's operations in its order. len(dr) elements of each.
//
//go:noescape
func axpy2PlanesAVX(dr, di, yr, yi []float64, a complex128, xar, xai []float64, b complex128, xbr, xbi []float64)

var useFMA = cpu.X86.HasAVX && cpu.X86.HasFMA

func combineFused(y, x []float64, stride int, c []float64) {
	if useFMA {
		combineFMA(y, x, stride, c)
		return
	}
	combineFusedGo(y, x, stride, c)
}

// combineFMA is combineFusedGo with the lanes of combineAVX, each
// multiply-add fused (VFMADD231PD).
//
//go:noescape
func combineFMA(y, x []float64, stride int, c []float64)

func blockRow4(yr, yi, a, x []float64, k, n int) {
	if useAVX {
		blockRowAVX(yr, yi, a, x, k, n)
		return
	}
	for c := 0; c < len(yr); c += 4 {
		blockRowGo(yr[:c+4], yi[:c+4], a, x, k, n, c)
	}
}

// blockRowAVX is blockRowGo four lanes at a time, on the len(yr) lanes
// (a multiple of four); each lane sees the loop's operations in its order.
//
//go:noescape
func blockRowAVX(yr, yi, a, x []float64, k, n int)
