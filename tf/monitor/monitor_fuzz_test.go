package monitor

import (
	"encoding/binary"
	"errors"
	"math"
	"testing"

	"github.com/backshift/backshift/internal/testutil"
)

// fuzzFloat reads a float64 from 8 bytes of b at i (0 past the end).
func fuzzFloat(b []byte, i int) float64 {
	if i+8 > len(b) {
		return 0
	}
	return math.Float64frombits(binary.LittleEndian.Uint64(b[i:]))
}

// FuzzMonitor: settings from the first bytes (any float64 for Sigma,
// TargetARL, Shift, VarianceRatio and CorrelationShift, lags and the
// input memory from single bytes), then hostile samples (NaN, Inf,
// 1e300, constant runs) as errors and inputs. New and Update either
// return a typed error (ErrSetting, ErrSample, ErrLength) or work, and
// every statistic and threshold stays finite; never a panic.
func FuzzMonitor(f *testing.F) {
	f.Add(make([]byte, 48), []byte{0, 1, 9, 100, 24, 3, 5, 200, 0, 7})
	f.Add(append(make([]byte, 40), 2, 3, 1, 0, 5, 9, 1, 1), []byte{3, 1, 9, 127, 0, 0, 1, 1, 4, 4, 9, 9})
	f.Fuzz(func(t *testing.T, head, samples []byte) {
		s := Settings{
			Sigma: fuzzFloat(head, 0), TargetARL: fuzzFloat(head, 8), Shift: fuzzFloat(head, 16),
			VarianceRatio: fuzzFloat(head, 24), CorrelationShift: fuzzFloat(head, 32),
		}
		if len(head) > 40 {
			s.InputMemory = int(int8(head[40]))
			for i, b := range head[41:min(len(head), 47)] {
				if i%3 == 0 {
					s.Lags = append(s.Lags, nil)
				}
				s.Lags[len(s.Lags)-1] = append(s.Lags[len(s.Lags)-1], int(int8(b)))
			}
		}
		m, err := New(&s)
		if err != nil {
			if !errors.Is(err, ErrSetting) {
				t.Fatalf("New: untyped error %v", err)
			}
			return
		}
		th := m.Thresholds()
		for _, v := range []float64{th.Mean, th.MeanReference, th.VarianceUp, th.VarianceDown, th.Correlation} {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				t.Fatalf("settings %+v: threshold not finite: %+v", s, th)
			}
		}
		x := testutil.HostileSeries(samples, testutil.Hostile{Max: 400, Div: 16, Up: 1e6, Down: 1e-6})
		nin := len(s.Lags)
		for i := 0; i+nin < len(x); i += nin + 1 {
			_, err := m.Update(int64(i), x[i], x[i+1:i+1+nin])
			if err != nil && !errors.Is(err, ErrSample) && !errors.Is(err, ErrLength) {
				t.Fatalf("Update: untyped error %v", err)
			}
			st := m.Status()
			vals := append([]float64{st.MeanUp, st.MeanDown, st.VarianceUp, st.VarianceDown}, st.CorrelationUp...)
			for _, v := range append(vals, st.CorrelationDown...) {
				if math.IsNaN(v) || math.IsInf(v, 0) || v < 0 {
					t.Fatalf("sample %d: statistic %v in %+v", i, v, st)
				}
			}
		}
	})
}

// FuzzSnapshot: any bytes restored into a monitor watching two inputs
// are either refused with a *ModelError matching ErrFormat (the monitor
// unchanged) or give a state whose statistics stay finite and not
// negative over the samples that follow; never a panic.
func FuzzSnapshot(f *testing.F) {
	m := mustNew(f, &Settings{Lags: [][]int{{1, 3}, {2}}})
	for i := 0; i < 50; i++ {
		m.Update(int64(i), float64(i%5)-2, []float64{float64(i % 3), float64(i % 4)})
	}
	snap, _ := m.MarshalBinary()
	f.Add(snap)
	f.Add(snap[:len(snap)/2])
	f.Fuzz(func(t *testing.T, data []byte) {
		m := mustNew(t, &Settings{Lags: [][]int{{1, 3}, {2}}})
		if err := m.UnmarshalBinary(data); err != nil {
			if !errors.Is(err, ErrFormat) || m.Samples() != 0 {
				t.Fatalf("refused with %v, samples %d", err, m.Samples())
			}
			return
		}
		for i := 0; i < 20; i++ {
			if _, err := m.Update(int64(i), 3, []float64{float64(i), -float64(i)}); err != nil {
				t.Fatal(err)
			}
			st := m.Status()
			for _, v := range append(append([]float64{st.MeanUp, st.MeanDown, st.VarianceUp, st.VarianceDown}, st.CorrelationUp...), st.CorrelationDown...) {
				if !(v >= 0) || math.IsInf(v, 0) {
					t.Fatalf("restored state gives statistic %v", v)
				}
			}
		}
	})
}
