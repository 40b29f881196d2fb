package filter

// Stream is the filter b(B)/a(B) with its input delayed by d samples,
//
//	y_t = (sum_{k=0..q} b_k x_{t-d-k} - sum_{k=p..1} a_k y_{t-k}) / a_0,
//
// fed one sample at a time. It keeps the last d+q+1 inputs and p outputs
// in doubled ring buffers (each value stored twice, so that the window of
// recent values is one contiguous slice), which makes a step cost
// O(p + q) with no allocation and no modulo. Sums are formed in the same
// order as Run, so a Stream from rest reproduces Run bit for bit.
// Filters with a_0 = 1 and degrees up to 2 (the common process models)
// take a shorter path: the previous two values of the delayed input and
// of the output live in fields, and the dead time in a plain ring.
//
// A Stream is not safe for concurrent use; Clone it for each goroutine.
type Stream struct {
	b, a       []float64 // owned copies
	d          int
	xbuf, ybuf []float64 // 2*lx and 2*ly values
	lx, ly     int
	xpos, ypos int
	a0         float64

	// Short path for a_0 = 1, len(b) <= 3, len(a) <= 3.
	small          bool
	c0, c1, c2     float64 // b, zero padded
	e1, e2         float64 // a_1, a_2, zero padded
	x1, x2, y1, y2 float64 // delayed inputs and outputs one and two back
	ring           []float64
	rpos           int
}

// NewStream returns a Stream at rest (all past values zero) for b/a with
// input delay d. b and a are copied. It panics if a is empty, a[0] == 0 or
// d < 0 (programmer errors).
func NewStream(b, a []float64, d int) *Stream {
	if len(a) == 0 || a[0] == 0 {
		panic("filter: a[0] must be non-zero")
	}
	if d < 0 {
		panic("filter: negative delay")
	}
	s := &Stream{d: d, a0: a[0]}
	s.lx = d + max(len(b), 1)
	s.ly = len(a) - 1
	buf := make([]float64, len(b)+len(a)+2*s.lx+2*s.ly)
	s.b = buf[:len(b):len(b)]
	s.a = buf[len(b) : len(b)+len(a) : len(b)+len(a)]
	copy(s.b, b)
	copy(s.a, a)
	rest := buf[len(b)+len(a):]
	s.xbuf = rest[: 2*s.lx : 2*s.lx]
	s.ybuf = rest[2*s.lx:]
	if a[0] == 1 && len(b) <= 3 && len(a) <= 3 {
		s.small = true
		var c, e [3]float64
		copy(c[:], b)
		copy(e[:], a)
		s.c0, s.c1, s.c2, s.e1, s.e2 = c[0], c[1], c[2], e[1], e[2]
		if d > 0 {
			s.ring = make([]float64, d)
		}
	}
	return s
}

// Reset returns the stream to rest: all past inputs and outputs zero.
func (s *Stream) Reset() {
	clear(s.xbuf)
	clear(s.ybuf)
	s.xpos, s.ypos = 0, 0
	clear(s.ring)
	s.rpos = 0
	s.x1, s.x2, s.y1, s.y2 = 0, 0, 0, 0
}

// SetHistory sets the past: xHist and yHist hold the inputs and outputs
// before the next step, oldest first (last element = the most recent).
// Missing older values are zero; extra older values are ignored.
func (s *Stream) SetHistory(xHist, yHist []float64) {
	s.Reset()
	for k := 1; k <= s.lx && k <= len(xHist); k++ {
		// Window index k-1 is the value k steps back from the next input.
		v := xHist[len(xHist)-k]
		s.xbuf[k-1], s.xbuf[k-1+s.lx] = v, v
	}
	for k := 1; k <= s.ly && k <= len(yHist); k++ {
		v := yHist[len(yHist)-k]
		s.ybuf[k-1], s.ybuf[k-1+s.ly] = v, v
	}
	// The next Step moves the window start back by one (to lx-1, ly-1)
	// and writes there; by the doubling, the values set above then sit at
	// window indices 1, 2, ... as they should.
	s.xpos, s.ypos = 0, 0
	if s.small {
		// ring[i] holds x_{-d+i}, read oldest first; x1, x2 are the
		// delayed inputs x_{-1-d}, x_{-2-d}.
		for i := range s.ring {
			s.ring[i] = hist(xHist, s.d-i)
		}
		s.x1, s.x2 = hist(xHist, s.d+1), hist(xHist, s.d+2)
		s.y1, s.y2 = hist(yHist, 1), hist(yHist, 2)
	}
}

// Step feeds input x_t and returns y_t. With d = 0 and b_0 != 0 the
// output depends on the input of the same step.
func (s *Stream) Step(x float64) float64 {
	if s.small {
		v := x
		if len(s.ring) > 0 {
			r := s.rpos
			v, s.ring[r] = s.ring[r], x
			r++
			if r == len(s.ring) {
				r = 0
			}
			s.rpos = r
		}
		y := s.c0*v + s.c1*s.x1 + s.c2*s.x2 - s.e2*s.y2 - s.e1*s.y1
		s.x2, s.x1 = s.x1, v
		s.y2, s.y1 = s.y1, y
		return y
	}
	lx := s.lx
	p := pushRing(s.xbuf, s.xpos, lx, x)
	s.xpos = p
	w := s.xbuf[p+s.d : p+lx]
	sum := 0.0
	b := s.b
	if len(b) > len(w) {
		return 0 // unreachable: lx = d + len(b); helps bounds-check elimination
	}
	for k, c := range b {
		sum += c * w[k]
	}
	ly := s.ly
	if ly > 0 {
		yw := s.ybuf[s.ypos : s.ypos+ly]
		a := s.a[1:]
		if len(a) > len(yw) {
			return 0 // unreachable
		}
		for k := len(a) - 1; k >= 0; k-- {
			sum -= a[k] * yw[k]
		}
	}
	if s.a0 != 1 {
		sum /= s.a0
	}
	if ly > 0 {
		s.ypos = pushRing(s.ybuf, s.ypos, ly, sum)
	}
	return sum
}

// pushRing stores v as the newest value of a doubled ring buffer of l
// values (buf has 2l): at pos - 1, wrapped to l - 1, and l places on,
// so that buf[p:p+l] holds the last l values newest first without a
// wrap; it returns that new position p.
func pushRing(buf []float64, pos, l int, v float64) int {
	p := pos - 1
	if p < 0 {
		p += l
	}
	buf[p] = v
	buf[p+l] = v
	return p
}

// run filters a whole series through the stream, continuing from its
// current state. dst may be x.
func (s *Stream) run(dst, x []float64) uint64 {
	x = x[:len(dst)]
	acc := uint64(0)
	for i, v := range x {
		dst[i] = s.Step(v)
		acc |= finiteBits(v)
	}
	return acc
}

// Clone returns an independent copy of s in its current state.
func (s *Stream) Clone() *Stream {
	c := NewStream(s.b, s.a, s.d)
	copy(c.xbuf, s.xbuf)
	copy(c.ybuf, s.ybuf)
	c.xpos, c.ypos = s.xpos, s.ypos
	copy(c.ring, s.ring)
	c.rpos = s.rpos
	c.x1, c.x2, c.y1, c.y2 = s.x1, s.x2, s.y1, s.y2
	return c
}
