package vec

// Dot returns sum_i a[i] b[i] over i < len(a); b must be at least as long
// as a (Dot panics otherwise, a programmer error). The sum is taken in
// four interleaved partial sums, combined as (s0 + s1) + (s2 + s3). Every
// product is rounded before it is added (no fused multiply-add, whatever
// GOAMD64 says), so that every kernel here rounds alike.
func Dot(a, b []float64) float64 {
	b = b[:len(a)]
	var s0, s1, s2, s3 float64
	i := 0
	for ; i+4 <= len(a); i += 4 {
		s0 += float64(a[i] * b[i])
		s1 += float64(a[i+1] * b[i+1])
		s2 += float64(a[i+2] * b[i+2])
		s3 += float64(a[i+3] * b[i+3])
	}
	for ; i < len(a); i++ {
		s0 += float64(a[i] * b[i])
	}
	return (s0 + s1) + (s2 + s3)
}

// Dot2 returns (Dot(a, b), Dot(a, c)), reading a once for both; each
// product is summed exactly as Dot sums it.
func Dot2(a, b, c []float64) (float64, float64) {
	b = b[:len(a)]
	c = c[:len(a)]
	var s0, s1, s2, s3, t0, t1, t2, t3 float64
	i := 0
	for ; i+4 <= len(a); i += 4 {
		a0, a1, a2, a3 := a[i], a[i+1], a[i+2], a[i+3]
		s0 += float64(a0 * b[i])
		s1 += float64(a1 * b[i+1])
		s2 += float64(a2 * b[i+2])
		s3 += float64(a3 * b[i+3])
		t0 += float64(a0 * c[i])
		t1 += float64(a1 * c[i+1])
		t2 += float64(a2 * c[i+2])
		t3 += float64(a3 * c[i+3])
	}
	for ; i < len(a); i++ {
		s0 += float64(a[i] * b[i])
		t0 += float64(a[i] * c[i])
	}
	return (s0 + s1) + (s2 + s3), (t0 + t1) + (t2 + t3)
}

// Dot4 returns (Dot(a, b0), Dot(a, b1), Dot(a, b2), Dot(a, b3)), reading a
// once for all four; every b must be at least as long as a. Each product
// is summed exactly as Dot sums it, so the results are bit-identical to
// four calls of Dot; on amd64 with AVX the four-lane partial sums are
// formed by an AVX kernel (one vector accumulator per product).
func Dot4(a, b0, b1, b2, b3 []float64) [4]float64 {
	n := len(a)
	b0, b1, b2, b3 = b0[:n], b1[:n], b2[:n], b3[:n]
	var l [16]float64
	n4 := n &^ 3
	if n4 > 0 {
		dot4Lanes(a[:n4], b0[:n4], b1[:n4], b2[:n4], b3[:n4], &l)
	}
	for i := n4; i < n; i++ {
		l[0] += float64(a[i] * b0[i])
		l[4] += float64(a[i] * b1[i])
		l[8] += float64(a[i] * b2[i])
		l[12] += float64(a[i] * b3[i])
	}
	return [4]float64{(l[0] + l[1]) + (l[2] + l[3]), (l[4] + l[5]) + (l[6] + l[7]),
		(l[8] + l[9]) + (l[10] + l[11]), (l[12] + l[13]) + (l[14] + l[15])}
}

// dot4Go is the Go loop of Dot4 over len(a), a multiple of 4: out[4p+l]
// is lane l of product p.
func dot4Go(a, b0, b1, b2, b3 []float64, out *[16]float64) {
	n := len(a)
	b0, b1, b2, b3 = b0[:n], b1[:n], b2[:n], b3[:n]
	var s [16]float64
	for i := 0; i+4 <= n; i += 4 {
		for l := 0; l < 4; l++ {
			av := a[i+l]
			s[l] += float64(av * b0[i+l])
			s[4+l] += float64(av * b1[i+l])
			s[8+l] += float64(av * b2[i+l])
			s[12+l] += float64(av * b3[i+l])
		}
	}
	*out = s
}
