package vec

// Dot returns sum_i a[i] b[i] over i < len(a); b must be at least as long
// as a (Dot panics otherwise, a programmer error). The sum is taken in
// four interleaved partial sums, combined as (s0 + s1) + (s2 + s3).
func Dot(a, b []float64) float64 {
	b = b[:len(a)]
	var s0, s1, s2, s3 float64
	i := 0
	for ; i+4 <= len(a); i += 4 {
		s0 += a[i] * b[i]
		s1 += a[i+1] * b[i+1]
		s2 += a[i+2] * b[i+2]
		s3 += a[i+3] * b[i+3]
	}
	for ; i < len(a); i++ {
		s0 += a[i] * b[i]
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
		s0 += a0 * b[i]
		s1 += a1 * b[i+1]
		s2 += a2 * b[i+2]
		s3 += a3 * b[i+3]
		t0 += a0 * c[i]
		t1 += a1 * c[i+1]
		t2 += a2 * c[i+2]
		t3 += a3 * c[i+3]
	}
	for ; i < len(a); i++ {
		s0 += a[i] * b[i]
		t0 += a[i] * c[i]
	}
	return (s0 + s1) + (s2 + s3), (t0 + t1) + (t2 + t3)
}
