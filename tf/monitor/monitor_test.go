package monitor

import (
	"errors"
	"math"
	"math/rand/v2"
	"strconv"
	"strings"
	"sync"
	"testing"
)

func mustNew(t testing.TB, s *Settings) *Monitor {
	t.Helper()
	m, err := New(s)
	if err != nil {
		t.Fatal(err)
	}
	return m
}

// Each setting that breaks its rule is refused with a *SettingError that
// names the field (and matches ErrSetting), from New as from Validate.
func TestNewBadSettings(t *testing.T) {
	for _, c := range []struct {
		s     Settings
		field string
	}{
		{Settings{Sigma: -1}, "Settings.Sigma"},
		{Settings{Sigma: math.Inf(1)}, "Settings.Sigma"},
		{Settings{Sigma: math.NaN()}, "Settings.Sigma"},
		{Settings{Sigma: 1e-200}, "Settings.Sigma"},
		{Settings{TargetARL: 49}, "Settings.TargetARL"},
		{Settings{TargetARL: 2e9}, "Settings.TargetARL"},
		{Settings{TargetARL: math.NaN()}, "Settings.TargetARL"},
		{Settings{Shift: -0.5}, "Settings.Shift"},
		{Settings{Shift: 5}, "Settings.Shift"},
		{Settings{VarianceRatio: 1}, "Settings.VarianceRatio"},
		{Settings{VarianceRatio: 0.5}, "Settings.VarianceRatio"},
		{Settings{VarianceRatio: 101}, "Settings.VarianceRatio"},
		{Settings{CorrelationShift: math.Inf(1)}, "Settings.CorrelationShift"},
		{Settings{InputMemory: -1}, "Settings.InputMemory"},
		{Settings{Lags: [][]int{{1}, {2, -1}}}, "Settings.Lags[1][1]"},
		{Settings{Lags: [][]int{{MaxLag + 1}}}, "Settings.Lags[0][0]"},
		{Settings{Lags: [][]int{{3, 4, 3}}}, "Settings.Lags[0][2]"},
	} {
		_, err := New(&c.s)
		var se *SettingError
		if !errors.As(err, &se) || se.Setting != c.field || !errors.Is(err, ErrSetting) {
			t.Errorf("%+v: got %v, want a *SettingError naming %s", c.s, err, c.field)
			continue
		}
		if !strings.HasPrefix(err.Error(), "monitor.New: "+c.field+" = ") {
			t.Errorf("%s: message %q", c.field, err)
		}
	}
	if err := (*Settings)(nil).Validate(); err != nil {
		t.Errorf("nil settings: %v", err)
	}
}

// The defaults: Sigma 1, target 10080, k = 0.5, ratio 2, correlation
// reference 0.25; the mean threshold follows from Siegmund's
// approximation at twice the target, and no pairs means no correlation
// threshold.
func TestNewDefaults(t *testing.T) {
	th := mustNew(t, nil).Thresholds()
	ku, kd := varianceReference(2)
	if th.MeanReference != 0.5 || th.Mean != CusumThreshold(0.5, 2*DefaultTargetARL) ||
		th.VarianceUpReference != ku || th.VarianceDownReference != kd || th.Correlation != 0 {
		t.Errorf("default thresholds %+v", th)
	}
	th = mustNew(t, &Settings{Lags: [][]int{{1, 2}, nil, {0}}}).Thresholds()
	if th.CorrelationReference != 0.25 || th.Correlation != CusumThreshold(0.25, 2*3*DefaultTargetARL) {
		t.Errorf("three pairs: %+v", th)
	}
}

// A sample Update refuses leaves the monitor as it was: the count, the
// statistics and the inputs' history.
func TestUpdateBadInput(t *testing.T) {
	m := mustNew(t, &Settings{Lags: [][]int{{1}, {2}}})
	for i := 0; i < 10; i++ {
		if _, err := m.Update(int64(i), 0.3, []float64{float64(i), 1}); err != nil {
			t.Fatal(err)
		}
	}
	before := m.Status()
	signs := append([]float64(nil), m.signs...)
	for _, c := range []struct {
		e      float64
		u      []float64
		kind   error
		series string
	}{
		{0, []float64{1}, ErrLength, "inputs"},
		{0, []float64{1, 2, 3}, ErrLength, "inputs"},
		{math.Inf(1), []float64{1, 2}, ErrSample, "error"},
		{0, []float64{math.NaN(), 2}, ErrSample, "input 0"},
		{0, []float64{1, math.Inf(-1)}, ErrSample, "input 1"},
		{0, []float64{1, 2e150}, ErrSample, "input 1"},
	} {
		_, err := m.Update(99, c.e, c.u)
		if !errors.Is(err, c.kind) || !strings.Contains(err.Error(), strconv.Quote(c.series)) {
			t.Errorf("e %v u %v: %v, want %v naming %q", c.e, c.u, err, c.kind, c.series)
		}
		var se *SampleError
		if errors.As(err, &se) && se.Index != 10 {
			t.Errorf("e %v u %v: index %d, want 10", c.e, c.u, se.Index)
		}
	}
	if after := m.Status(); after.Samples != before.Samples || after.MeanUp != before.MeanUp || after.CorrelationUp[0] != before.CorrelationUp[0] {
		t.Errorf("refused samples changed the monitor: %+v -> %+v", before, after)
	}
	for i := range signs {
		if signs[i] != m.signs[i] {
			t.Fatal("refused samples changed the inputs' history")
		}
	}
}

// A missing output (NaN error) advances the count and records the
// inputs, and leaves the statistics alone.
func TestMissingOutput(t *testing.T) {
	m := mustNew(t, &Settings{Lags: [][]int{{0, 1}}})
	m.Update(0, 2, []float64{1})
	before := m.Status()
	if n, err := m.Update(1, math.NaN(), []float64{5}); n != 0 || err != nil {
		t.Fatalf("missing output: %d alarms, %v", n, err)
	}
	after := m.Status()
	if after.Samples != 2 || after.MeanUp != before.MeanUp || after.VarianceUp != before.VarianceUp || after.CorrelationUp[0] != before.CorrelationUp[0] {
		t.Errorf("missing output: %+v -> %+v", before, after)
	}
	if m.signs[1] != 1 {
		t.Errorf("the input of the missing sample was not recorded")
	}
}

// Errors of +3 standard deviations (Sigma 2, e = 6): the mean test's up
// side grows by 3 - 0.5 a sample and crosses its threshold at the first
// n with 2.5 n > h; the variance test's by 9 - r ln r/(r - 1). The alarm
// carries the sample's index and stamp, the statistic and the threshold,
// and the test starts again from zero, so the next alarm comes the same
// number of samples later.
func TestAlarmFields(t *testing.T) {
	for _, dir := range []int{1, -1} {
		var got []Alarm
		m := mustNew(t, &Settings{Sigma: 2, OnAlarm: func(a Alarm) { got = append(got, a) }})
		th := m.Thresholds()
		for i := 0; i < 40; i++ {
			m.Update(int64(1000+i), float64(6*dir), nil)
		}
		nMean := int(math.Floor(th.Mean/2.5)) + 1
		nVar := int(math.Floor(th.VarianceUp/(9-th.VarianceUpReference))) + 1
		var mean, variance []Alarm
		for _, a := range got {
			switch a.Kind {
			case Mean:
				mean = append(mean, a)
			case Variance:
				variance = append(variance, a)
			}
		}
		if len(mean) != 40/nMean || len(variance) != 40/nVar {
			t.Fatalf("direction %d: %d mean and %d variance alarms, want %d and %d", dir, len(mean), len(variance), 40/nMean, 40/nVar)
		}
		a := mean[0]
		want := Alarm{Kind: Mean, Direction: dir, Input: -1, Lag: -1, Index: int64(nMean - 1), Stamp: int64(1000 + nMean - 1),
			Statistic: 2.5 * float64(nMean), Threshold: th.Mean}
		if math.Abs(a.Statistic-want.Statistic) > 1e-12 {
			t.Errorf("statistic %v, want %v", a.Statistic, want.Statistic)
		}
		a.Statistic = want.Statistic
		if a != want {
			t.Errorf("direction %d: first mean alarm %+v, want %+v", dir, a, want)
		}
		if mean[1].Index != int64(2*nMean-1) {
			t.Errorf("direction %d: second mean alarm at %d, want %d (reset after the first)", dir, mean[1].Index, 2*nMean-1)
		}
		if v := variance[0]; v.Direction != 1 || v.Index != int64(nVar-1) || v.Threshold != th.VarianceUp {
			t.Errorf("direction %d: first variance alarm %+v", dir, v)
		}
	}
}

// The correlation statistic follows its definition on a hand-made
// record: with InputMemory 1 the level is the previous input, so the
// sign is that of the input's last move (and alternates, starting at
// -1, when the input does not move); the pair at lag 1 adds
// sign_{t-1} z_t - k to its up side.
func TestCorrelationDefinition(t *testing.T) {
	m := mustNew(t, &Settings{Lags: [][]int{{1}}, InputMemory: 1})
	u := []float64{0, 0, 1, 3, 2, 2, 2, 5}
	z := []float64{0.3, 1.2, -0.4, 0.9, 2.0, -1.5, 0.7, 0.1}
	sign := []float64{-1, 1, 1, 1, -1, -1, 1, 1} // first: no move (flip to -1), then no move (+1), ...
	k := m.Thresholds().CorrelationReference
	up, down := 0.0, 0.0
	for i := range u {
		if _, err := m.Update(int64(i), z[i], u[i:i+1]); err != nil {
			t.Fatal(err)
		}
		if i >= 1 {
			w := sign[i-1] * z[i]
			up, down = math.Max(0, up+w-k), math.Max(0, down-w-k)
		}
		st := m.Status()
		if math.Abs(st.CorrelationUp[0]-up) > 1e-15 || math.Abs(st.CorrelationDown[0]-down) > 1e-15 {
			t.Fatalf("sample %d: statistics %v, %v, want %v, %v", i, st.CorrelationUp[0], st.CorrelationDown[0], up, down)
		}
	}
}

// A full channel drops alarms and counts them; Update never waits, and
// Dropped may be read from another goroutine meanwhile (go test -race).
func TestChannelDrops(t *testing.T) {
	ch := make(chan Alarm, 2)
	m := mustNew(t, &Settings{Alarms: ch})
	var wg sync.WaitGroup
	wg.Add(1)
	go func() {
		defer wg.Done()
		for i := 0; i < 100; i++ {
			_ = m.Dropped()
		}
	}()
	total := 0
	for i := 0; i < 50; i++ {
		n, err := m.Update(int64(i), 100, nil)
		if err != nil {
			t.Fatal(err)
		}
		total += n
	}
	wg.Wait()
	if len(ch) != 2 || m.Dropped() != int64(total-2) || total < 50 {
		t.Errorf("%d alarms, %d in the channel, %d dropped", total, len(ch), m.Dropped())
	}
}

// Update allocates nothing, with a callback, a channel and watched
// inputs (testing.AllocsPerRun).
func TestUpdateAllocs(t *testing.T) {
	ch := make(chan Alarm, 1)
	n := 0
	m := mustNew(t, &Settings{Lags: [][]int{{1, 2, 3}, {4}}, Alarms: ch, OnAlarm: func(Alarm) { n++ }})
	rng := rand.New(rand.NewPCG(1, 1))
	u := []float64{0, 0}
	i := int64(0)
	allocs := testing.AllocsPerRun(10000, func() {
		u[0], u[1] = rng.NormFloat64(), rng.NormFloat64()
		m.Update(i, 3*rng.NormFloat64(), u)
		i++
	})
	if allocs != 0 || n == 0 {
		t.Errorf("%v allocations per Update (%d alarms raised)", allocs, n)
	}
}

// Reset zeroes the statistics and keeps the count.
func TestReset(t *testing.T) {
	m := mustNew(t, &Settings{Lags: [][]int{{0}}})
	for i := 0; i < 5; i++ {
		m.Update(int64(i), 1.5, []float64{float64(i)})
	}
	m.Reset()
	st := m.Status()
	if st.Samples != 5 || st.MeanUp != 0 || st.MeanDown != 0 || st.VarianceUp != 0 || st.VarianceDown != 0 || st.CorrelationUp[0] != 0 || st.CorrelationDown[0] != 0 {
		t.Errorf("after Reset: %+v", st)
	}
}

// Kind and Alarm print plainly; the alarm's line carries the caution.
func TestAlarmString(t *testing.T) {
	a := Alarm{Kind: Variance, Direction: -1, Input: -1, Lag: -1, Index: 12, Stamp: 34, Statistic: 9.876, Threshold: 9.5}
	want := "variance down at sample 12 (stamp 34): statistic 9.88 > threshold 9.50; advice to an operator, not an interlock"
	if a.String() != want {
		t.Errorf("got %q\nwant %q", a.String(), want)
	}
	if Kind(7).String() != "kind(7)" || Mean.String() != "mean" {
		t.Error("kind names")
	}
}

// One Update with the default settings; no inputs, one input at three
// lags, two inputs at two lags each.
func BenchmarkUpdate(b *testing.B) {
	for _, lags := range [][][]int{nil, {{3, 4, 5}}, {{1, 2}, {4, 5}}} {
		name := "pairs" + strconv.Itoa(len(lags))
		for _, l := range lags {
			name += "-" + strconv.Itoa(len(l))
		}
		b.Run(name, func(b *testing.B) {
			m := mustNew(b, &Settings{Lags: lags})
			rng := rand.New(rand.NewPCG(1, 2))
			const n = 4096
			e := make([]float64, n)
			u := make([]float64, n+2)
			for i := range e {
				e[i] = rng.NormFloat64()
			}
			for i := range u {
				u[i] = rng.NormFloat64()
			}
			nin := len(lags)
			b.ReportAllocs()
			b.ResetTimer()
			for i := 0; i < b.N; i++ {
				j := i & (n - 1)
				m.Update(int64(i), e[j], u[j:j+nin])
			}
		})
	}
}

// The memory of one monitor (B/op): the default settings and one input
// watched at three lags (the variance thresholds come from the cache
// after the first call).
func BenchmarkNew(b *testing.B) {
	s := &Settings{Lags: [][]int{{3, 4, 5}}}
	mustNew(b, s)
	b.ReportAllocs()
	for i := 0; i < b.N; i++ {
		mustNew(b, s)
	}
}
