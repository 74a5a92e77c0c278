// Package kernel holds the inner loops of the lattice factor in sim: linear
// combinations of the rows of a matrix,
//
//	y[q] = sum_j c[j] x[j*stride + q],   q = 0 .. len(y)-1,
//
// the inner loop of the lattice factor's discrete sine transforms in sim.
// The sum is taken in a fixed order, groups of four rows and then single
// rows,
//
//	y = (...((0 + g_0) + g_1) + ...) + c[4G] x_4G + ...,
//	g_i = ((c[4i] x_4i + c[4i+1] x_4i+1) + c[4i+2] x_4i+2) + c[4i+3] x_4i+3,
//
// with every product and sum rounded as in Go (no fused multiply-add), so
// the vector kernel used on amd64 processors with AVX returns exactly the
// bits of the portable loop.
package kernel
