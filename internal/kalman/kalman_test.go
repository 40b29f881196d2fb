package kalman

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// autocov returns the autocovariances gamma_0..gamma_{n-1} (sigma^2 = 1)
// of phi(B) u = theta(B) a from 4000 psi weights (the series used in the
// tests have |roots| giving psi_4000 below 1e-100).
func autocov(ar, ma []float64, n int) []float64 {
	const k = 4000
	psi := make([]float64, k)
	for j := 0; j < k; j++ {
		s := 0.0
		if j < len(ma) {
			s = ma[j]
		}
		for i := 1; i < len(ar) && i <= j; i++ {
			s -= ar[i] * psi[j-i]
		}
		psi[j] = s / ar[0]
	}
	g := make([]float64, n)
	for h := 0; h < n; h++ {
		for j := 0; j+h < k; j++ {
			g[h] += psi[j] * psi[j+h]
		}
	}
	return g
}

// denseLik returns the concentrated log-likelihood and the conditional
// means and variances (units of sigma^2) of the missing samples of a
// stationary Gaussian series with autocovariances g and mean mu, from
// the multivariate normal density and its conditional distribution
// (Anderson, T. W. (2003). An Introduction to Multivariate Statistical
// Analysis, 3rd ed., Theorem 2.5.1): an O(n^3) reference for the filter.
func denseLik(z []float64, mu float64, g []float64) (ll float64, cm, cv map[int]float64) {
	return denseGauss(z, mu, func(a, b int) float64 { return g[abs(a-b)] })
}

// denseGauss is denseLik for a series z with mean mu and the
// covariance cov(a, b) of samples a and b.
func denseGauss(z []float64, mu float64, cov func(a, b int) float64) (ll float64, cm, cv map[int]float64) {
	var obs, miss []int
	for t, v := range z {
		if math.IsNaN(v) {
			miss = append(miss, t)
		} else {
			obs = append(obs, t)
		}
	}
	no := len(obs)
	S := mat.NewSymDense(no, nil)
	for i, a := range obs {
		for j := i; j < no; j++ {
			S.SetSym(i, j, cov(a, obs[j]))
		}
	}
	var ch mat.Cholesky
	if !ch.Factorize(S) {
		panic("not positive definite")
	}
	y := mat.NewVecDense(no, nil)
	for i, a := range obs {
		y.SetVec(i, z[a]-mu)
	}
	var x mat.VecDense
	_ = ch.SolveVecTo(&x, y)
	q := mat.Dot(y, &x)
	n := float64(no)
	ll = -0.5*n*(math.Log(2*math.Pi*q/n)+1) - 0.5*ch.LogDet()
	cm, cv = map[int]float64{}, map[int]float64{}
	for _, t := range miss {
		c := mat.NewVecDense(no, nil)
		for i, a := range obs {
			c.SetVec(i, cov(a, t))
		}
		var w mat.VecDense
		_ = ch.SolveVecTo(&w, c)
		cm[t] = mu + mat.Dot(&w, y)
		cv[t] = cov(t, t) - mat.Dot(&w, c)
	}
	return ll, cm, cv
}

func abs(v int) int {
	if v < 0 {
		return -v
	}
	return v
}

// simulate returns n samples of phi(B)(u - mu) = theta(B) a after a
// burn-in of 500, seeded.
func simulate(ar, ma []float64, mu float64, n int, seed uint64) []float64 {
	rng := rand.New(rand.NewPCG(seed, 7))
	burn := 500
	u := make([]float64, n+burn)
	a := make([]float64, n+burn)
	for t := range u {
		a[t] = rng.NormFloat64()
		s := 0.0
		for j := 0; j < len(ma) && j <= t; j++ {
			s += ma[j] * a[t-j]
		}
		for i := 1; i < len(ar) && i <= t; i++ {
			s -= ar[i] * u[t-i]
		}
		u[t] = s / ar[0]
	}
	out := u[burn:]
	for t := range out {
		out[t] += mu
	}
	return out
}

// TestAgainstDense: the filter's likelihood and smoothed missing samples
// equal the dense multivariate-normal computation (Anderson 2003, Thm
// 2.5.1) to 1e-9, for ARMA(1,1), AR(2) and MA(2) models with gaps at the
// start, inside and at the end. Tolerance: the dense reference loses
// about cond(Sigma) eps, below 1e-10 for these models.
func TestAgainstDense(t *testing.T) {
	cases := []struct {
		name   string
		ar, ma []float64
	}{
		{"arma11", []float64{1, -0.7}, []float64{1, 0.4}},
		{"ar2", []float64{1, -0.5, 0.3}, []float64{1}},
		{"ma2", []float64{1}, []float64{1, 0.9, 0.2}},
		{"scaled", []float64{2, -1.2}, []float64{0.5, 0.2}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			z := simulate(c.ar, c.ma, 3, 120, 11)
			for _, i := range []int{0, 1, 30, 31, 32, 60, 119} {
				z[i] = math.NaN()
			}
			f, err := New(c.ar, c.ma, nil)
			if err != nil {
				t.Fatal(err)
			}
			g := autocov(c.ar, c.ma, len(z))
			want, cm, cv := denseLik(z, 3, g)
			st, err := f.Run(z, 3, nil, nil)
			if err != nil {
				t.Fatal(err)
			}
			if d := math.Abs(st.LogLik() - want); d > 1e-9*math.Abs(want) {
				t.Errorf("loglik %.12g, dense %.12g", st.LogLik(), want)
			}
			fill, vr, _, err := f.Smooth(z, 3)
			if err != nil {
				t.Fatal(err)
			}
			for tm, m := range cm {
				if math.Abs(fill[tm]-m) > 1e-9*(1+math.Abs(m)) || math.Abs(vr[tm]-cv[tm]) > 1e-9*(1+cv[tm]) {
					t.Errorf("t=%d: smoothed %.12g var %.12g, dense %.12g var %.12g", tm, fill[tm], vr[tm], m, cv[tm])
				}
			}
		})
	}
}

// TestDifferenced: with diff = 1 - B the filter conditions on the first
// sample; z_t = z_0 + sum_{s=1..t} w_s with w the ARMA(1,1) series of
// mean mu, so the dense reference is the normal density of the partial
// sums (covariance sum_{a<=i, b<=j} gamma_|a-b|, mean z_0 + t mu;
// Anderson 2003, Thm 2.5.1). Without gaps the likelihood must equal that
// of the differenced series. Tolerance 1e-9 relative as above.
func TestDifferenced(t *testing.T) {
	ar, ma, mu := []float64{1, -0.5}, []float64{1, 0.3}, 0.2
	w := simulate(ar, ma, mu, 80, 5)
	z := make([]float64, 81)
	z[0] = 10
	for i, v := range w {
		z[i+1] = z[i] + v
	}
	f, err := New(ar, ma, []float64{1, -1})
	if err != nil {
		t.Fatal(err)
	}
	g := autocov(ar, ma, len(w))
	t.Run("no gaps", func(t *testing.T) {
		want, _, _ := denseLik(w, mu, g)
		st, err := f.Run(z, mu, nil, nil)
		if err != nil {
			t.Fatal(err)
		}
		if st.Start != 1 || st.NObs != 80 || math.Abs(st.LogLik()-want) > 1e-9*math.Abs(want) {
			t.Errorf("start %d nobs %d loglik %.12g, differenced series %.12g", st.Start, st.NObs, st.LogLik(), want)
		}
	})
	t.Run("gaps", func(t *testing.T) {
		zg := append([]float64(nil), z...)
		for _, i := range []int{5, 6, 7, 40, 80} {
			zg[i] = math.NaN()
		}
		n := len(w)
		cs := make([]float64, n*n) // covariance of partial sums
		for i := 0; i < n; i++ {
			for j := 0; j < n; j++ {
				s := 0.0
				for a := 0; a <= i; a++ {
					for b := 0; b <= j; b++ {
						s += g[abs(a-b)]
					}
				}
				cs[i*n+j] = s
			}
		}
		// Reuse denseLik through a shifted series: subtract the mean
		// path, then call a covariance-matrix form.
		y := make([]float64, n)
		for i := range y {
			y[i] = zg[i+1] - z[0] - float64(i+1)*mu
		}
		want, cm, cv := denseLikCov(y, cs, n)
		st, err := f.Run(zg, mu, nil, nil)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(st.LogLik()-want) > 1e-9*math.Abs(want) {
			t.Errorf("loglik %.12g, dense %.12g", st.LogLik(), want)
		}
		fill, vr, _, err := f.Smooth(zg, mu)
		if err != nil {
			t.Fatal(err)
		}
		for i, m := range cm {
			m += z[0] + float64(i+1)*mu
			if math.Abs(fill[i+1]-m) > 1e-9*(1+math.Abs(m)) || math.Abs(vr[i+1]-cv[i]) > 1e-9*(1+cv[i]) {
				t.Errorf("t=%d: smoothed %.12g var %.12g, dense %.12g var %.12g", i+1, fill[i+1], vr[i+1], m, cv[i])
			}
		}
	})
}

// denseLikCov is denseLik for a zero-mean series y with the covariance
// matrix cs (n x n, row-major).
func denseLikCov(y, cs []float64, n int) (ll float64, cm, cv map[int]float64) {
	return denseGauss(y, 0, func(a, b int) float64 { return cs[a*n+b] })
}

// TestRunAllocs: a pass of the filter, gaps included, allocates nothing
// once the Filter is built, and Set with the same degrees neither.
func TestRunAllocs(t *testing.T) {
	z := simulate([]float64{1, -0.6, 0.3}, []float64{1, 0.4}, 0, 2000, 3)
	for i := 100; i < 110; i++ {
		z[i] = math.NaN()
	}
	f, err := New([]float64{1, -0.6, 0.3}, []float64{1, 0.4}, []float64{1, -1})
	if err != nil {
		t.Fatal(err)
	}
	std := make([]float64, len(z))
	if a := testing.AllocsPerRun(10, func() {
		if err := f.Set([]float64{1, -0.5, 0.2}, []float64{1, 0.3}); err != nil {
			t.Fatal(err)
		}
		if _, err := f.Run(z, 0, std, nil); err != nil {
			t.Fatal(err)
		}
	}); a != 0 {
		t.Errorf("%v allocations per Set+Run", a)
	}
}

// TestRefused: a non-stationary AR part, a zero constant term and a
// series with no observed sample are errors.
func TestRefused(t *testing.T) {
	if _, err := New([]float64{1, -1.01}, []float64{1}, nil); err == nil {
		t.Error("explosive AR accepted")
	}
	if _, err := New([]float64{0, 1}, []float64{1}, nil); err == nil {
		t.Error("zero constant term accepted")
	}
	f, _ := New([]float64{1, -0.5}, []float64{1}, []float64{1, -1})
	if _, err := f.Run([]float64{math.NaN(), 1, math.NaN(), math.NaN()}, 0, nil, nil); err == nil {
		t.Error("no observation after conditioning accepted")
	}
}

func BenchmarkRun(b *testing.B) {
	z := simulate([]float64{1, -0.6, 0.3}, []float64{1, 0.4}, 0, 100000, 3)
	f, _ := New([]float64{1, -0.6, 0.3}, []float64{1, 0.4}, nil)
	b.ReportAllocs()
	for b.Loop() {
		_, _ = f.Run(z, 0, nil, nil)
	}
}

// TestAR1Closed: for an AR(1) the filter's outputs have closed forms
// (Harvey 1989, sec. 3.4; Box, Jenkins, Reinsel & Ljung 2016, sec. 5.2):
// F_0 = 1/(1 - phi^2), F_t = 1 after it, innovations z_t - mu - phi
// (z_{t-1} - mu), a missing sample's prediction variance 1 + phi^2 one
// step on, and h-step forecasts mu + phi^h (z_n - mu) with variance
// sum_{j<h} phi^(2j). Tolerance 1e-12 (rounding).
func TestAR1Closed(t *testing.T) {
	phi, mu := 0.6, 2.0
	z := []float64{2.5, 1.0, 3.0, math.NaN(), 2.2, 1.7}
	f, err := New([]float64{1, -phi}, []float64{1}, nil)
	if err != nil {
		t.Fatal(err)
	}
	std := make([]float64, len(z))
	fv := make([]float64, len(z))
	if _, err := f.Run(z, mu, std, fv); err != nil {
		t.Fatal(err)
	}
	wantF := []float64{1 / (1 - phi*phi), 1, 1, 1, 1 + phi*phi, 1}
	for i := range z {
		if math.Abs(fv[i]-wantF[i]) > 1e-12 {
			t.Errorf("F[%d] = %v, want %v", i, fv[i], wantF[i])
		}
	}
	for _, i := range []int{1, 2, 5} {
		want := z[i] - mu - phi*(z[i-1]-mu)
		if math.Abs(std[i]-want) > 1e-12 {
			t.Errorf("innovation %d = %v, want %v", i, std[i], want)
		}
	}
	if !math.IsNaN(std[3]) {
		t.Errorf("innovation at the missing sample %v", std[3])
	}
	mean, vr, err := f.Forecast(z, mu, 3)
	if err != nil {
		t.Fatal(err)
	}
	acc := 0.0
	for h := 1; h <= 3; h++ {
		acc += math.Pow(phi, float64(2*(h-1)))
		want := mu + math.Pow(phi, float64(h))*(z[5]-mu)
		if math.Abs(mean[h-1]-want) > 1e-12 || math.Abs(vr[h-1]-acc) > 1e-12 {
			t.Errorf("h=%d: %v var %v, want %v var %v", h, mean[h-1], vr[h-1], want, acc)
		}
	}
}

// TestScaled: the scaled innovations are the standardised innovations of
// the observed samples times (prod F)^(1/(2 NObs)), and their mean square
// is Stats.Objective (the identity LogLik = -NObs/2 (log(2 pi
// Objective) + 1) of the concentrated likelihood; Harvey 1989, eq.
// 3.4.10 with sigma^2 concentrated out). No allocation after the first
// call.
func TestScaled(t *testing.T) {
	z := simulate([]float64{1, -0.5}, []float64{1, 0.4}, 1, 300, 9)
	z[50], z[51], z[200] = math.NaN(), math.NaN(), math.NaN()
	f, _ := New([]float64{1, -0.5}, []float64{1, 0.4}, nil)
	dst := make([]float64, len(z))
	st, err := f.Scaled(dst, z, 1)
	if err != nil {
		t.Fatal(err)
	}
	ss := 0.0
	for _, v := range dst[:st.NObs] {
		ss += v * v
	}
	if math.Abs(ss/float64(st.NObs)-st.Objective()) > 1e-12*st.Objective() {
		t.Errorf("mean square %v, Objective %v", ss/float64(st.NObs), st.Objective())
	}
	n := float64(st.NObs)
	if ll := -n / 2 * (math.Log(2*math.Pi*st.Objective()) + 1); math.Abs(ll-st.LogLik()) > 1e-9*math.Abs(ll) {
		t.Errorf("loglik from Objective %v, LogLik %v", ll, st.LogLik())
	}
	if a := testing.AllocsPerRun(5, func() { _, _ = f.Scaled(dst, z, 1) }); a != 0 {
		t.Errorf("%v allocations", a)
	}
}
