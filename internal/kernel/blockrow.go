package kernel

// BlockRow sets, for every lane c < len(yr),
//
//	yr[c] + i yi[c] = sum_j (a_r[j][c] + i a_i[j][c]) (x_r[j][c] + i x_i[j][c]),  j = 0 ... k-1,
//
// the sum taken in the order of j from zero, each term as Go forms
// yr += ar*xr - ai*xi and yi += ar*xi + ai*xr (no fused multiply-add), so
// the vector kernel on amd64 returns the bits of the loop. Row j of a is
// a[j*2n : (j+1)*2n] = [a_r[j] | a_i[j]] and likewise for x, n = len(yr):
// one row of the block exponentials of n classes at once, the lanes being
// the classes (sim's blockExp).
func BlockRow(yr, yi, a, x []float64, k int) {
	n := len(yr)
	if len(yi) < n || len(a) < 2*n*k || len(x) < 2*n*k {
		panic("kernel: BlockRow with yi, a or x too short")
	}
	if n == 0 {
		return
	}
	if k == 0 {
		clear(yr)
		clear(yi[:n])
		return
	}
	m := n &^ 3
	if m > 0 {
		blockRow4(yr[:m], yi[:m], a, x, k, n)
	}
	blockRowGo(yr, yi, a, x, k, n, m)
}

// blockRowGo is the portable loop over the lanes c0 <= c < len(yr) of n.
func blockRowGo(yr, yi, a, x []float64, k, n, c0 int) {
	for c := c0; c < len(yr); c++ {
		var sr, si float64
		for j := range k {
			ar, ai := a[j*2*n+c], a[j*2*n+n+c]
			xr, xi := x[j*2*n+c], x[j*2*n+n+c]
			sr += ar*xr - ai*xi
			si += ar*xi + ai*xr
		}
		yr[c], yi[c] = sr, si
	}
}
