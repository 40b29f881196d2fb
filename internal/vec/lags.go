package vec

// LagSums adds sum_{i<len(a)} a[i] b[i+j] to out[j] for every lag
// j < len(out); b must hold at least len(a)+len(out)-1 values (LagSums
// panics otherwise, a programmer error). Where the processor has AVX2
// and FMA (HasAVX2FMA) groups of eight lags run through an assembly
// kernel (lags_amd64.s) with fused multiply-adds, and the lags left
// over through LagSumsGo's loops; elsewhere, and under the purego build
// tag, LagSumsGo does all of it. Unlike Dot, the two paths round
// differently: each is within m 2^-52 sum|a_i b_{i+j}| of the exact sum
// (m = len(a); tested against math/big).
func LagSums(out, a, b []float64) {
	if len(a) == 0 || len(out) == 0 {
		return
	}
	_ = b[len(a)+len(out)-2]
	j := 0
	if useFMA {
		j = lagSums8(out, a, b)
	}
	lagSumsGo(out[j:], a, b[j:])
}

// LagSumsGo is LagSums in plain Go on every platform: groups of four
// lags with four independent accumulators (which keep the adder busy),
// then one lag at a time by Dot.
func LagSumsGo(out, a, b []float64) {
	if len(a) == 0 || len(out) == 0 {
		return
	}
	_ = b[len(a)+len(out)-2]
	lagSumsGo(out, a, b)
}

// lagSumsGo is the loop of LagSumsGo.
func lagSumsGo(out, a, b []float64) {
	m := len(a)
	L := len(out)
	j := 0
	for ; j+4 <= L; j += 4 {
		s := lagDot4(a, b[j:j+m+3])
		for q, v := range s {
			out[j+q] += v
		}
	}
	for ; j < L; j++ {
		out[j] += Dot(a, b[j:j+m])
	}
}

// lagDot4 returns sum_i a[i] b[i+q] for q = 0..3; len(b) >= len(a)+3.
func lagDot4(a, b []float64) [4]float64 {
	var s0, s1, s2, s3 float64
	m := len(a)
	b0, b1, b2, b3 := b[0:m], b[1:m+1], b[2:m+2], b[3:m+3]
	for i, av := range a {
		s0 += av * b0[i]
		s1 += av * b1[i]
		s2 += av * b2[i]
		s3 += av * b3[i]
	}
	return [4]float64{s0, s1, s2, s3}
}
