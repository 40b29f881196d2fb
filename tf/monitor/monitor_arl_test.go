package monitor

import (
	"math"
	"math/rand/v2"
	"testing"
)

// The run-length checks: seeded simulations of a Monitor against the
// approximations that set its thresholds. Every test resets itself after
// an alarm, so in one long stream the samples between two alarms of a
// test are independent run lengths started from zero: the average run
// length is estimated as samples / alarms of that test, and its standard
// error is about ARL/sqrt(alarms) (run lengths are close to geometric).
// With at least 1500 alarms that is under 2.6 %, so a tolerance of 10 %
// is about 4 standard errors plus the approximation's own error (under
// 1 % for Siegmund's, TestCusumARLReference; under 0.1 % for the chain).

// source says what stream feeds a monitor: errors shift + scale z_t
// (standard normal z_t) plus gain * u_{t-lag} of input 0, and inputs
// u_t = ar u_{t-1} + v_t (standard normal v_t; ar = 0.9 makes them
// correlated, as plant inputs are).
type source struct {
	seed         uint64
	n            int
	shift, scale float64
	ar           float64
	gain         float64
	lag          int
}

// stream feeds the samples of src to m.
func stream(t *testing.T, m *Monitor, src source) {
	t.Helper()
	rng := rand.New(rand.NewPCG(src.seed, 99))
	u := make([]float64, len(m.level))
	var hist [64]float64
	for i := 0; i < src.n; i++ {
		for j := range u {
			u[j] = src.ar*u[j] + rng.NormFloat64()
		}
		e := rng.NormFloat64()*src.scale + src.shift
		if len(u) > 0 {
			hist[i&63] = u[0]
			if i >= src.lag {
				e += src.gain * hist[(i-src.lag)&63]
			}
		}
		if _, err := m.Update(int64(i), e, u); err != nil {
			t.Fatal(err)
		}
	}
}

// counted returns a monitor for s that counts its alarms into c.
func counted(t *testing.T, s Settings, c *[4]int) *Monitor {
	t.Helper()
	s.OnAlarm = func(a Alarm) { c[a.Kind]++ }
	return mustNew(t, &s)
}

// In control, each test's false alarms come at the target rate: the mean
// and correlation tests (Siegmund's approximation, both sides combined by
// adding their rates) and the variance test (the chain) at targets of 500
// and 10080 samples, with two AR(1) inputs watched at lags {1, 2, 3} and
// {5}. Measured (seeds as below): see the log lines; all within 10 %.
func TestInControlARL(t *testing.T) {
	for _, c := range []struct {
		target float64
		n      int
		seed   uint64
	}{{500, 1_500_000, 1}, {DefaultTargetARL, 20_000_000, 2}} {
		if (testing.Short() || raceEnabled) && c.target > 1000 {
			continue
		}
		var count [4]int
		m := counted(t, Settings{TargetARL: c.target, Lags: [][]int{{1, 2, 3}, {5}}}, &count)
		stream(t, m, source{seed: c.seed, n: c.n, scale: 1, ar: 0.9})
		for _, k := range []Kind{Mean, Variance, Correlation} {
			arl := float64(c.n) / float64(count[k])
			t.Logf("target %v: %v test ARL0 %.1f (%d alarms, %+.1f %%)", c.target, k, arl, count[k], 100*(arl/c.target-1))
			if math.Abs(arl/c.target-1) > 0.10 {
				t.Errorf("target %v: %v test in-control ARL %.1f, off by more than 10 %%", c.target, k, arl)
			}
		}
	}
}

// The textbook scheme: with the target chosen so that h = 4 (and 5) at
// k = 0.5, the simulated two-sided in-control run length and the delay
// for a shift of one standard deviation match the table values (h = 4:
// 168 and 8.38; h = 5: 465 and 10.4; Montgomery, Introduction to
// Statistical Quality Control, the table of the tabular CUSUM with
// k = 1/2: from memory) within 10 % (in control) and 5 % (the delay:
// with 10^5 alarms its standard error is under 0.5 %), and Siegmund's
// approximation within the same.
func TestTextbookScheme(t *testing.T) {
	for _, c := range []struct {
		h, arl0, arl1 float64
	}{{4, 168, 8.38}, {5, 465, 10.4}} {
		target := CusumARL(0.5, c.h, 0) / 2
		var in, out [4]int
		m := counted(t, Settings{TargetARL: target}, &in)
		if h := m.Thresholds().Mean; math.Abs(h-c.h) > 1e-9 {
			t.Fatalf("threshold %v, want %v", h, c.h)
		}
		const n = 1_000_000
		stream(t, m, source{seed: 3, n: n, scale: 1})
		m = counted(t, Settings{TargetARL: target}, &out)
		stream(t, m, source{seed: 4, n: n, shift: 1, scale: 1})
		arl0, arl1 := n/float64(in[Mean]), n/float64(out[Mean])
		sieg1 := 1 / (1/CusumARL(0.5, c.h, 1) + 1/CusumARL(0.5, c.h, -1))
		t.Logf("h %v: ARL0 %.1f (table %v, Siegmund %.1f), delay at 1 sigma %.2f (table %v, Siegmund %.2f)",
			c.h, arl0, c.arl0, target, arl1, c.arl1, sieg1)
		if math.Abs(arl0/c.arl0-1) > 0.10 || math.Abs(arl0/target-1) > 0.10 {
			t.Errorf("h %v: in-control ARL %.1f against table %v and Siegmund %.1f", c.h, arl0, c.arl0, target)
		}
		if math.Abs(arl1/c.arl1-1) > 0.05 || math.Abs(arl1/sieg1-1) > 0.05 {
			t.Errorf("h %v: delay %.2f against table %v and Siegmund %.2f", c.h, arl1, c.arl1, sieg1)
		}
	}
}

// The variance test's delays: for a doubled variance (the ratio the up
// side is tuned to) and a halved one (the down side), the simulated
// run lengths from zero against the chain's (the two sides' rates
// added), at the default target. Measured: see the log lines; within
// 5 % (about 2 * 10^4 alarms each: a standard error under 1 %).
func TestVarianceDelay(t *testing.T) {
	for _, c := range []struct {
		ratio float64
		seed  uint64
	}{{2, 5}, {0.5, 6}} {
		var count [4]int
		m := counted(t, Settings{}, &count)
		const n = 1_000_000
		stream(t, m, source{seed: c.seed, n: n, scale: math.Sqrt(c.ratio)})
		th := m.Thresholds()
		up := varianceARL(true, th.VarianceUpReference, th.VarianceUp, c.ratio)
		down := varianceARL(false, th.VarianceDownReference, th.VarianceDown, c.ratio)
		want := 1 / (1/up + 1/down)
		got := n / float64(count[Variance])
		t.Logf("variance ratio %v: delay %.2f samples (%d alarms), chain %.2f (%+.1f %%)", c.ratio, got, count[Variance], want, 100*(got/want-1))
		if math.Abs(got/want-1) > 0.05 {
			t.Errorf("variance ratio %v: delay %.2f, chain %.2f", c.ratio, got, want)
		}
	}
}

// The correlation test's delay after a gain change: errors
// e_t = z_t + d u_{t-3} with a white standard normal input watched at
// lags {2, 3, 4}; d = 0.5 / sqrt(2/pi) makes the mean of the signed
// errors w_t = sign(u_{t-3}) e_t equal to CorrelationShift (0.5, the
// default), with variance 1 + d^2 (1 - 2/pi). Siegmund's approximation
// for the CUSUM of w_t / sd(w) (a normal approximation of w, which is a
// mixture) against the simulated delay at lag 3: measured in the log
// line, within 10 %. The pairs at lags 2 and 4 see no correlation (white
// input) but errors of variance 1 + d^2 (the unmodelled part of the
// output): their run lengths against Siegmund's for zero mean and that
// variance, within 20 % (about 500 alarms each: a standard error near
// 5 %).
func TestCorrelationDelay(t *testing.T) {
	d := 0.5 / math.Sqrt(2/math.Pi)
	var byLag [5]int
	s := Settings{Lags: [][]int{{2, 3, 4}}}
	s.OnAlarm = func(a Alarm) {
		if a.Kind == Correlation {
			byLag[a.Lag]++
		}
	}
	m := mustNew(t, &s)
	const n = 2_000_000
	stream(t, m, source{seed: 7, n: n, scale: 1, gain: d, lag: 3})
	th := m.Thresholds()
	sd := math.Sqrt(1 + d*d*(1-2/math.Pi))
	k, h := th.CorrelationReference/sd, th.Correlation/sd
	want := 1 / (1/CusumARL(k, h, 0.5/sd) + 1/CusumARL(k, h, -0.5/sd))
	got := n / float64(byLag[3])
	t.Logf("gain change: delay at lag 3 %.2f samples (%d alarms), Siegmund %.2f (%+.1f %%)", got, byLag[3], want, 100*(got/want-1))
	if math.Abs(got/want-1) > 0.10 {
		t.Errorf("delay %.2f, Siegmund %.2f", got, want)
	}
	sd0 := math.Sqrt(1 + d*d)
	k0, h0 := th.CorrelationReference/sd0, th.Correlation/sd0
	arl := CusumARL(k0, h0, 0) / 2
	for _, l := range []int{2, 4} {
		got := n / float64(byLag[l])
		t.Logf("lag %d: ARL %.0f (%d alarms), Siegmund %.0f (%+.1f %%)", l, got, byLag[l], arl, 100*(got/arl-1))
		if math.Abs(got/arl-1) > 0.20 {
			t.Errorf("lag %d: ARL %.0f, Siegmund %.0f", l, got, arl)
		}
	}
}

// The mean test's delay for a shift of one standard deviation at the
// default target (10080 samples, k = 0.5): from zero, the simulated
// delay against Siegmund's approximation (both sides' rates added),
// within 5 % (about 6 * 10^4 alarms: a standard error under 0.5 %).
// Then the delay an operator sees: the shift planted at sample 500 of an
// in-control stream (trials with a false mean alarm before it are left
// out), counted from the first shifted sample to the alarm. A CUSUM's run
// length falls as its starting value rises, and at the change the
// statistic is at zero or above, so this delay is at most the one from
// zero (checked with 3 % for the Monte Carlo error: 4000 trials, a
// standard error near 1 %); the log line gives the measured ratio.
func TestMeanDelay(t *testing.T) {
	var count [4]int
	m := counted(t, Settings{}, &count)
	const n = 1_000_000
	stream(t, m, source{seed: 8, n: n, shift: 1, scale: 1})
	th := m.Thresholds()
	want := 1 / (1/CusumARL(th.MeanReference, th.Mean, 1) + 1/CusumARL(th.MeanReference, th.Mean, -1))
	got := n / float64(count[Mean])
	t.Logf("1-sigma shift, from zero: delay %.2f samples (%d alarms), Siegmund %.2f (%+.1f %%)", got, count[Mean], want, 100*(got/want-1))
	if math.Abs(got/want-1) > 0.05 {
		t.Errorf("delay from zero %.2f, Siegmund %.2f", got, want)
	}

	rng := rand.New(rand.NewPCG(9, 99))
	const change, trials = 500, 4000
	sum, used := 0.0, 0
	for trial := 0; trial < trials; trial++ {
		first := int64(-1)
		s := Settings{OnAlarm: func(a Alarm) {
			if a.Kind == Mean && first < 0 {
				first = a.Index
			}
		}}
		m := mustNew(t, &s)
		for i := 0; first < 0; i++ {
			e := rng.NormFloat64()
			if i >= change {
				e++
			}
			m.Update(int64(i), e, nil)
		}
		if first >= change {
			sum += float64(first - change + 1)
			used++
		}
	}
	steady := sum / float64(used)
	t.Logf("1-sigma shift at sample %d: delay %.2f samples (%d of %d trials), %.2f of the delay from zero", change, steady, used, trials, steady/got)
	if steady > 1.03*got {
		t.Errorf("delay after an in-control stretch %.2f, above the delay from zero %.2f", steady, got)
	}
}
