package predict

import "math"

// advanceSmall is advance for a plan whose polynomials all fit the small
// kernel (plan.small): the same recursions on zero-padded coefficients
// of fixed length, so that the loops unroll and the histories are read
// at fixed places. Padding adds exact zeros: its results equal
// advance's bit for bit.
func (pl *plan) advanceSmall(st []float64, pos []int, tmp []float64, t, gap int, x []float64, y float64) (Step, int, bool) {
	off := st[pl.offC]
	if t == 0 {
		off = pl.startOffset(x)
	}
	var bad uint64
	tmp = tmp[:2*len(pl.ins)]
	for i := range pl.ins {
		ip := &pl.ins[i]
		xv := x[ip.col]
		z0 := st[ip.off+1]
		if t == 0 && ip.hold {
			z0 = xv
		}
		v := xv - z0
		if ip.delay > 0 {
			tmp[2*i] = v
			v = st[ip.ring+pos[i]]
		}
		h := (*[2]float64)(st[ip.sh:])
		k := &ip.k
		s := v - k[4]*h[1] - k[3]*h[0]
		tmp[2*i+1] = s
		bad |= finiteBits(s)
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
			n -= pl.ins[i].output(st, tmp[2*i+1])
		}
	}
	step := Step{Index: t, Error: math.NaN(), Innov: math.NaN()}
	step.Point = Point{math.NaN(), math.NaN(), math.NaN(), math.NaN()}
	if t >= pl.first {
		nhat := nk[5]*ah[1] + nk[4]*ah[0] - nk[3]*nh[1] - nk[2]*nh[0]
		pred := off
		for i := range pl.ins {
			pred += pl.ins[i].output(st, tmp[2*i+1])
		}
		pred += nhat
		pred = pred - nk[0]*yh[0] - nk[1]*yh[1]
		step.Point = pl.newPoint(pred, pl.sd*math.Sqrt(st[pl.psiS]))
		if missing {
			n, y = nhat, pred
		} else {
			a = n + nk[2]*nh[0] + nk[3]*nh[1] - nk[5]*ah[1] - nk[4]*ah[0]
			step.Error, step.Innov = y-pred, a
		}
		bad |= finiteBits(pred) | finiteBits(step.Upper) | finiteBits(step.Lower)
	}
	bad |= finiteBits(n) | finiteBits(a) | finiteBits(off)
	if bad>>63 != 0 {
		return Step{}, gap, false
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
			st[ip.ring+r] = tmp[2*i]
			if r++; r == d {
				r = 0
			}
			pos[i] = r
		}
		h := (*[2]float64)(st[ip.sh:])
		h[1], h[0] = h[0], tmp[2*i+1]
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
	return step, gap, true
}

// output returns u_t = omega_0 s_t + omega_1 s_{t-1} + omega_2 s_{t-2}
// of a small-kernel term (s the new s_t).
func (ip *inputPlan) output(st []float64, s float64) float64 {
	h := (*[2]float64)(st[ip.sh:])
	return ip.k[0]*s + ip.k[1]*h[0] + ip.k[2]*h[1]
}
