package predict

// smallTerm is an input term of a plan that fits the small kernel: its
// padded coefficients omega_0..2, delta_1..2 and where its state lives
// (off: x_{t-1}, z0, s_{t-1}, s_{t-2}; ring: the dead-time ring).
type smallTerm struct {
	k                     [5]float64
	off, ring, delay, col int
}

// fast reports whether the next sample, with output y, takes
// advanceSmall: a plan whose polynomials all fit the small kernel
// (plan.small), and the common case: a sample after the first, from
// First on, with its output, after an observed output, with the held
// history exact (no uncertainty left by a gap, see gap.go).
func (pl *plan) fast(s *state, y float64) bool {
	return pl.small && s.t > 0 && s.t >= pl.first && s.gap == 0 && y == y && s.st[pl.unc] == 0
}

// advanceSmall is advance for a sample that fast admits; it returns the
// prediction's mean and standard error and the innovation (the step's
// other fields follow from them and y), or false with the state
// unchanged when a value left float64 range. The recursions are
// advance's on zero-padded coefficients of fixed length (padding adds
// exact zeros, so the results are equal bit for bit), written into the
// state as they are formed and undone on overflow.
func (pl *plan) advanceSmall(s *state, tmp []float64, x []float64, y float64) (mean, se, a float64, ok bool) {
	t := s.t
	st, pos := s.st, s.pos
	nk := &pl.nk
	yh := (*[2]float64)(st[pl.yh:])
	nh := (*[2]float64)(st[pl.nh:])
	ah := (*[2]float64)(st[pl.ah:])
	off := st[pl.offC]
	n := y + nk[0]*yh[0] + nk[1]*yh[1] - off
	usum := off
	terms := pl.terms
	tmp = tmp[:4*len(terms)]
	for i := range terms {
		tm := &terms[i]
		v4 := (*[4]float64)(st[tm.off:])
		xv := x[tm.col]
		v := xv - v4[1]
		if d := tm.delay; d > 0 {
			r := pos[i]
			slot := &st[tm.ring+r]
			v, *slot = *slot, v
			if r++; r == d {
				r = 0
			}
			pos[i] = r
		}
		k := &tm.k
		s1, s2 := v4[2], v4[3]
		sv := v - k[4]*s2 - k[3]*s1
		u := k[0]*sv + k[1]*s1 + k[2]*s2
		tmp[4*i], tmp[4*i+1], tmp[4*i+2] = v4[0], s2, v
		v4[0], v4[2], v4[3] = xv, sv, s1
		usum += u
		n -= u
	}
	nhat := nk[5]*ah[1] + nk[4]*ah[0] - nk[3]*nh[1] - nk[2]*nh[0]
	mean = usum + nhat - nk[0]*yh[0] - nk[1]*yh[1]
	a = n + nk[2]*nh[0] + nk[3]*nh[1] - nk[5]*ah[1] - nk[4]*ah[0]
	se = pl.se0
	lo, hi := mean-pl.z*se, mean+pl.z*se
	// One test for all: a NaN or infinite s_t reaches n through u (0 *
	// Inf is NaN), mean reaches the limits, and a sum of finite values
	// overflows only beyond about 1e307, itself an overflow of the
	// states for this purpose.
	if finiteBits((n+a)+(lo+hi))>>63 != 0 {
		pl.undoSmall(st, pos, tmp)
		return 0, 0, 0, false
	}
	yh[1], yh[0] = yh[0], y
	nh[1], nh[0] = nh[0], n
	ah[1], ah[0] = ah[0], a
	s.t = t + 1
	return mean, se, a, true
}

// undoSmall restores the input terms' state that advanceSmall changed,
// from what it kept in tmp.
func (pl *plan) undoSmall(st []float64, pos []int, tmp []float64) {
	for i, tm := range pl.terms {
		v4 := (*[4]float64)(st[tm.off:])
		v4[0], v4[2], v4[3] = tmp[4*i], v4[3], tmp[4*i+1]
		if d := tm.delay; d > 0 {
			r := pos[i] - 1
			if r < 0 {
				r = d - 1
			}
			st[tm.ring+r] = tmp[4*i+2]
			pos[i] = r
		}
	}
}
