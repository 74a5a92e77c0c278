package kernel

// AxpyTo sets dst[i] = y[i] + a x[i] for i < len(dst), each complex
// product a x[i] formed as Go forms it, (ar xr - ai xi, ar xi + ai xr)
// with every product and sum rounded (no fused multiply-add), so the
// vector kernel on amd64 with AVX returns exactly the bits of the loop
// (and of gonum's cmplxs.AddScaledTo). x and y must hold len(dst)
// elements; dst may be y.
func AxpyTo(dst, y []complex128, a complex128, x []complex128) {
	if len(x) < len(dst) || len(y) < len(dst) {
		panic("kernel: AxpyTo with x or y shorter than dst")
	}
	if len(dst) == 0 {
		return
	}
	axpyTo(dst, y, a, x)
}

// axpyToGo is the portable loop.
func axpyToGo(dst, y []complex128, a complex128, x []complex128) {
	for i := range dst {
		dst[i] = y[i] + a*x[i]
	}
}

// Axpy2To sets dst[i] = (y[i] + a xa[i]) + b xb[i] for i < len(dst), the
// sums in that order and each product as in AxpyTo: the bits of AxpyTo(dst,
// y, a, xa) followed by AxpyTo(dst, dst, b, xb), in one pass over dst
// (the pair of taps +-s of a banded Toeplitz operator). xa, xb and y must
// hold len(dst) elements; dst may be y, but neither xa nor xb.
func Axpy2To(dst, y []complex128, a complex128, xa []complex128, b complex128, xb []complex128) {
	if len(xa) < len(dst) || len(xb) < len(dst) || len(y) < len(dst) {
		panic("kernel: Axpy2To with xa, xb or y shorter than dst")
	}
	if len(dst) == 0 {
		return
	}
	axpy2To(dst, y, a, xa, b, xb)
}

// axpy2ToGo is the portable loop.
func axpy2ToGo(dst, y []complex128, a complex128, xa []complex128, b complex128, xb []complex128) {
	for i := range dst {
		dst[i] = (y[i] + a*xa[i]) + b*xb[i]
	}
}

// Axpy2Planes is Axpy2To on complex vectors held as planes of real and
// imaginary parts: for i < len(dr),
//
//	dr[i] + i di[i] = ((yr[i] + i yi[i]) + a (xar[i] + i xai[i])) + b (xbr[i] + i xbi[i]),
//
// each product and sum as in AxpyTo (the same bits as Axpy2To on the
// interleaved vectors). Every slice must hold len(dr) elements; dr and di
// may be yr and yi, but not any of the x planes.
func Axpy2Planes(dr, di, yr, yi []float64, a complex128, xar, xai []float64, b complex128, xbr, xbi []float64) {
	n := len(dr)
	if len(di) < n || len(yr) < n || len(yi) < n || len(xar) < n || len(xai) < n || len(xbr) < n || len(xbi) < n {
		panic("kernel: Axpy2Planes with a plane shorter than dr")
	}
	if n == 0 {
		return
	}
	axpy2Planes(dr, di, yr, yi, a, xar, xai, b, xbr, xbi)
}

// axpy2PlanesGo is the portable loop.
func axpy2PlanesGo(dr, di, yr, yi []float64, a complex128, xar, xai []float64, b complex128, xbr, xbi []float64) {
	ar, ai, br, bi := real(a), imag(a), real(b), imag(b)
	for i := range dr {
		pr, pi := ar*xar[i]-ai*xai[i], ar*xai[i]+ai*xar[i]
		qr, qi := br*xbr[i]-bi*xbi[i], br*xbi[i]+bi*xbr[i]
		dr[i], di[i] = (yr[i]+pr)+qr, (yi[i]+pi)+qi
	}
}

// AxpyPlanes is AxpyTo on planes of real and imaginary parts, dr + i di =
// (yr + i yi) + a (xr + i xi), the same bits; a plain loop, for the short
// stretches around Axpy2Planes.
func AxpyPlanes(dr, di, yr, yi []float64, a complex128, xr, xi []float64) {
	ar, ai := real(a), imag(a)
	_, _, _, _, _ = di[len(dr)-1:], yr[len(dr)-1:], yi[len(dr)-1:], xr[len(dr)-1:], xi[len(dr)-1:]
	for i := range dr {
		dr[i], di[i] = yr[i]+(ar*xr[i]-ai*xi[i]), yi[i]+(ar*xi[i]+ai*xr[i])
	}
}
