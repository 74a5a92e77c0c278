//go:build !amd64 || noasm

package kernel

func combine(y, x []float64, stride int, c []float64) { combineGo(y, x, stride, c) }

func fold(s, d, a, b []float64) { foldGo(s, d, a, b) }

func rotate(re, im []float64, c, s float64) { rotateGo(re, im, c, s) }

func phaseRotate(re, im, cr, ci, tr, ti []float64) { phaseRotateGo(re, im, cr, ci, tr, ti) }

func axpyTo(dst, y []complex128, a complex128, x []complex128) { axpyToGo(dst, y, a, x) }

func axpy2To(dst, y []complex128, a complex128, xa []complex128, b complex128, xb []complex128) {
	axpy2ToGo(dst, y, a, xa, b, xb)
}

func axpy2Planes(dr, di, yr, yi []float64, a complex128, xar, xai []float64, b complex128, xbr, xbi []float64) {
	axpy2PlanesGo(dr, di, yr, yi, a, xar, xai, b, xbr, xbi)
}

func combineFused(y, x []float64, stride int, c []float64) { combineFusedGo(y, x, stride, c) }

// blockRow4 is BlockRow on the lanes below len(yr), a multiple of four.
func blockRow4(yr, yi, a, x []float64, k, n int) { blockRowGo(yr, yi, a, x, k, n, 0) }

func rotateBy(re, im, cr, ci []float64) { rotateByGo(re, im, cr, ci) }

func rotateTwiceTo(dr, di, sr, si, cr, ci []float64) { rotateTwiceToGo(dr, di, sr, si, cr, ci) }
