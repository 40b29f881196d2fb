package predict

import "math"

// advanceSmall is advance for a plan whose polynomials all fit the small
// kernel (plan.small): the same recursions on zero-padded coefficients
// of fixed length, so that the loops unroll and the histories are read
// at fixed places. Padding adds exact zeros: its results equal
// advance's bit for bit.
func (pl *plan) advanceSmall(s *state, tmp []float64, x []float64, y float64) (Step, bool) {
	st, pos, t, gap := s.st, s.pos, s.t, s.gap
	off := st[pl.offC]
	if t == 0 {
		off = pl.startOffset(x)
	}
	var bad uint64
	tmp = tmp[:3*len(pl.ins)]
	usum := off
	for i := range pl.ins {
		ip := &pl.ins[i]
		xv := x[ip.col]
		z0 := st[ip.off+1]
		if t == 0 && ip.hold {
			z0 = xv
		}
		v := xv - z0
		if ip.delay > 0 {
			tmp[3*i] = v
			v = st[ip.ring+pos[i]]
		}
		h := (*[2]float64)(st[ip.sh:])
		k := &ip.k
		sv := v - k[4]*h[1] - k[3]*h[0]
		u := k[0]*sv + k[1]*h[0] + k[2]*h[1]
		tmp[3*i+1], tmp[3*i+2] = sv, u
		usum += u
		bad |= finiteBits(sv)
	}
	missing := y != y
	nk := &pl.nk
	yh := (*[2]float64)(st[pl.yh:])
	nh := (*[2]float64)(st[pl.nh:])
	ah := (*[2]float64)(st[pl.ah:])
	var n, a float64
	if !missing {
		w := 0.0
		if t >= len(pl.dc)-1 {
			w = y + nk[0]*yh[0] + nk[1]*yh[1]
		}
		n = w - off
		for i := range pl.ins {
			n -= tmp[3*i+2]
		}
	}
	nan := math.NaN()
	mean, se, lo, hi, e, innov := nan, nan, nan, nan, nan, nan
	if t >= pl.first {
		nhat := nk[5]*ah[1] + nk[4]*ah[0] - nk[3]*nh[1] - nk[2]*nh[0]
		mean = usum + nhat - nk[0]*yh[0] - nk[1]*yh[1]
		se = pl.se0
		if gap > 0 {
			se = pl.sd * math.Sqrt(st[pl.psiS])
		}
		lo, hi = mean-pl.z*se, mean+pl.z*se
		if missing {
			n, y = nhat, mean
		} else {
			a = n + nk[2]*nh[0] + nk[3]*nh[1] - nk[5]*ah[1] - nk[4]*ah[0]
			e, innov = y-mean, a
		}
		bad |= finiteBits(mean) | finiteBits(hi) | finiteBits(lo)
	}
	bad |= finiteBits(n) | finiteBits(a) | finiteBits(off)
	if bad>>63 != 0 {
		return Step{}, false
	}
	for i := range pl.ins {
		ip := &pl.ins[i]
		xv := x[ip.col]
		st[ip.off] = xv
		if t == 0 && ip.hold {
			st[ip.off+1] = xv
		}
		if d := ip.delay; d > 0 {
			r := pos[i]
			st[ip.ring+r] = tmp[3*i]
			if r++; r == d {
				r = 0
			}
			pos[i] = r
		}
		h := (*[2]float64)(st[ip.sh:])
		h[1], h[0] = h[0], tmp[3*i+1]
	}
	st[pl.offC] = off
	yh[1], yh[0] = yh[0], y
	nh[1], nh[0] = nh[0], n
	ah[1], ah[0] = ah[0], a
	if missing {
		gap++
		pl.nextPsi(st, gap)
	} else if gap > 0 {
		pl.resetPsi(st)
		gap = 0
	}
	s.t, s.gap = t+1, gap
	return Step{Point: Point{Mean: mean, SE: se, Lower: lo, Upper: hi}, Index: t, Error: e, Innov: innov}, true
}
