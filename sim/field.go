package sim

// field holds several states (levels) of one arm in the layout the
// propagator works in: a Block x 2W real matrix, W = Sites*levels, with row
// j holding the real parts of state j of every class and level in columns
// [0, W) and the imaginary parts in [W, 2W); column q = level*Sites + c.
// One lattice step is then a handful of long, contiguous row operations.
type field struct {
	b      Basis
	levels int
	x      []float64
}

func newField(b Basis, levels int) *field {
	return &field{b: b, levels: levels, x: make([]float64, 2*b.Size()*levels)}
}

// width returns W, the number of complex columns.
func (f *field) width() int { return f.b.Sites * f.levels }

// set stores state s as level lev.
func (f *field) set(lev int, s State) {
	if s.Basis != f.b {
		panic("sim: state basis does not match the propagator's")
	}
	n, w := f.b.Sites, f.width()
	for j := range f.b.Block {
		row := f.x[2*w*j:]
		for c := range n {
			a := s.Amp[n*j+c]
			row[lev*n+c] = real(a)
			row[w+lev*n+c] = imag(a)
		}
	}
}

// get returns level lev as a State.
func (f *field) get(lev int) State {
	n, w := f.b.Sites, f.width()
	amp := make([]complex128, f.b.Size())
	for j := range f.b.Block {
		row := f.x[2*w*j:]
		for c := range n {
			amp[n*j+c] = complex(row[lev*n+c], row[w+lev*n+c])
		}
	}
	return State{Basis: f.b, Amp: amp}
}

func (f *field) copyFrom(g *field) { copy(f.x, g.x) }
