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
//
// A Stream is not safe for concurrent use; Clone it for each goroutine.
type Stream struct {
	b, a       []float64 // owned copies
	d          int
	xbuf, ybuf []float64 // 2*lx and 2*ly values
	lx, ly     int
	xpos, ypos int
	a0         float64
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
	return s
}

// Reset returns the stream to rest: all past inputs and outputs zero.
func (s *Stream) Reset() {
	clear(s.xbuf)
	clear(s.ybuf)
	s.xpos, s.ypos = 0, 0
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
}

// Step feeds input x_t and returns y_t. With d = 0 and b_0 != 0 the
// output depends on the input of the same step.
func (s *Stream) Step(x float64) float64 {
	lx := s.lx
	p := s.xpos - 1
	if p < 0 {
		p += lx
	}
	s.xpos = p
	s.xbuf[p] = x
	s.xbuf[p+lx] = x
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
		q := s.ypos - 1
		if q < 0 {
			q += ly
		}
		s.ypos = q
		s.ybuf[q] = sum
		s.ybuf[q+ly] = sum
	}
	return sum
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
	return c
}
