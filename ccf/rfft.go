package ccf

import (
	"math"
	"math/bits"
)

// rfft is a real FFT of length M = 2N (N a power of two, N >= 2) for the
// blocked cross-correlation: the M real samples are packed as N complex
// ones, transformed by an iterative radix-2 complex FFT, and unpacked
// into the M/2+1 non-negative-frequency coefficients; the inverse runs the
// same steps backwards. Unnormalised, with the sign convention of
// gonum dsp/fourier (forward e^{-2 pi i f t / M}). Not safe for concurrent
// use; each call of Cross makes its own.
type rfft struct {
	n    int          // complex length N
	lg   int          // log2 N
	tw   []complex128 // e^{-2 pi i k / N}, k < N/2
	post []complex128 // e^{-2 pi i f / M}, f <= N/2
	rev  []int32      // bit reversal of 0..N-1
	work []complex128
}

func newRFFT(m int) *rfft {
	n := m / 2
	if n < 2 || n&(n-1) != 0 {
		panic("ccf: rfft length must be a power of two >= 4")
	}
	t := &rfft{n: n, lg: bits.Len(uint(n)) - 1}
	t.tw = make([]complex128, n/2)
	for k := range t.tw {
		s, c := math.Sincos(-2 * math.Pi * float64(k) / float64(n))
		t.tw[k] = complex(c, s)
	}
	t.post = make([]complex128, n/2+1)
	for f := range t.post {
		s, c := math.Sincos(-2 * math.Pi * float64(f) / float64(m))
		t.post[f] = complex(c, s)
	}
	t.rev = make([]int32, n)
	shift := 64 - t.lg
	for i := range t.rev {
		t.rev[i] = int32(bits.Reverse64(uint64(i)) >> shift)
	}
	t.work = make([]complex128, n)
	return t
}

// transform runs the in-place radix-2 FFT of z (already in bit-reversed
// order); inverse uses the conjugate twiddles. The first two stages,
// whose twiddles are 1 and -i, are done together without
// multiplications.
func (t *rfft) transform(z []complex128, inverse bool) {
	n := t.n
	z = z[:n]
	// Stages of size 2 and 4.
	if n >= 4 {
		for s := 0; s+4 <= n; s += 4 {
			q := z[s : s+4 : s+4]
			a0, a1 := q[0]+q[1], q[0]-q[1]
			b0, b1 := q[2]+q[3], q[2]-q[3]
			// b1 times -i (forward) or +i (inverse).
			if inverse {
				b1 = complex(-imag(b1), real(b1))
			} else {
				b1 = complex(imag(b1), -real(b1))
			}
			q[0], q[2] = a0+b0, a0-b0
			q[1], q[3] = a1+b1, a1-b1
		}
	} else {
		z[0], z[1] = z[0]+z[1], z[0]-z[1]
		return
	}
	tw := t.tw
	for size := 8; size <= n; size <<= 1 {
		half := size >> 1
		step := n / size
		for start := 0; start < n; start += size {
			a := z[start : start+half : start+half]
			b := z[start+half : start+size : start+size]
			if inverse {
				for k := range a {
					w := tw[k*step]
					u, v := a[k], b[k]
					vr := real(v)*real(w) + imag(v)*imag(w)
					vi := imag(v)*real(w) - real(v)*imag(w)
					a[k] = complex(real(u)+vr, imag(u)+vi)
					b[k] = complex(real(u)-vr, imag(u)-vi)
				}
				continue
			}
			for k := range a {
				w := tw[k*step]
				u, v := a[k], b[k]
				vr := real(v)*real(w) - imag(v)*imag(w)
				vi := real(v)*imag(w) + imag(v)*real(w)
				a[k] = complex(real(u)+vr, imag(u)+vi)
				b[k] = complex(real(u)-vr, imag(u)-vi)
			}
		}
	}
}

// forward writes the M/2+1 coefficients X[f] = sum_t x_t e^{-2 pi i f t/M}
// of the real sequence x (length M) into dst.
func (t *rfft) forward(dst []complex128, x []float64) {
	n := t.n
	z := t.work
	for k := 0; k < n; k++ {
		z[t.rev[k]] = complex(x[2*k], x[2*k+1])
	}
	t.transform(z, false)
	// Unpack: E = (Z_f + conj Z_{N-f})/2, O = (Z_f - conj Z_{N-f})/(2i),
	// X_f = E + W^f O, X_{N-f} = conj(E) - conj(W^f O)... computed for
	// f and N-f together.
	z0 := z[0]
	dst[0] = complex(real(z0)+imag(z0), 0)
	dst[n] = complex(real(z0)-imag(z0), 0)
	for f := 1; f <= n/2; f++ {
		a := z[f]
		b := z[n-f]
		bc := complex(real(b), -imag(b))
		e := (a + bc) * 0.5
		o := (a - bc) * complex(0, -0.5)
		wo := t.post[f] * o
		dst[f] = e + wo
		if f != n-f {
			// X_{N-f} = conj(E_f) - conj(W^f O_f) (W^{N-f} = -conj(W^f)).
			dst[n-f] = complex(real(e), -imag(e)) - complex(real(wo), -imag(wo))
		}
	}
}

// inverse writes the real sequence x (length M) with coefficients X
// (M/2+1 values, X[0] and X[M/2] real) into dst, unnormalised: the
// forward transform followed by inverse multiplies by M.
func (t *rfft) inverse(dst []float64, X []complex128) {
	n := t.n
	z := t.work
	// E_f = (X_f + conj X_{N-f})/2, O_f = (X_f - conj X_{N-f}) / (2 W^f),
	// Z_f = E_f + i O_f; then z = inverse FFT of Z (times N), and the real
	// sequence is x_{2k} = Re z_k, x_{2k+1} = Im z_k, times 2 for the
	// unnormalised convention of length M.
	for f := 0; f < n; f++ {
		a := X[f]
		b := X[n-f]
		bc := complex(real(b), -imag(b))
		e := a + bc
		var w complex128
		if f <= n/2 {
			w = t.post[f]
		} else {
			// W^f for f > N/2: W^f = -conj(W^{N-f}).
			p := t.post[n-f]
			w = complex(-real(p), imag(p))
		}
		wc := complex(real(w), -imag(w)) // 1/W^f
		o := (a - bc) * wc
		z[t.rev[f]] = e + complex(-imag(o), real(o)) // e + i o
	}
	t.transform(z, true)
	for k := 0; k < n; k++ {
		dst[2*k] = real(z[k])
		dst[2*k+1] = imag(z[k])
	}
}
