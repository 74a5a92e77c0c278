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
