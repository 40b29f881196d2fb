package kalman

import (
	"math"
	"testing"
)

// FuzzFilter: polynomials of degree up to 3 and a differencing of order
// up to 2 from the first bytes, a short series with NaN samples from the
// rest; New refuses or builds a filter, and then Run, Smooth and
// Forecast give an error or finite results (non-negative variances,
// every missing sample from Start on estimated), never a panic.
func FuzzFilter(f *testing.F) {
	f.Add([]byte{1, 1, 0, 60, 200, 30, 10, 20, 0, 40, 50, 0, 0, 70, 20})
	f.Add([]byte{3, 2, 2, 10, 250, 128, 90, 5, 40, 0, 30, 20, 0, 60, 80, 1, 0, 5})
	f.Fuzz(func(t *testing.T, data []byte) {
		if len(data) < 3 {
			return
		}
		p, q, d := int(data[0]%4), int(data[1]%4), int(data[2]%3)
		data = data[3:]
		coef := func(k int) float64 {
			if k < len(data) {
				return (float64(data[k]) - 128) / 100
			}
			return 0
		}
		ar, ma := []float64{1}, []float64{1}
		for i := 0; i < p; i++ {
			ar = append(ar, coef(i))
		}
		for i := 0; i < q; i++ {
			ma = append(ma, coef(p+i))
		}
		diff := []float64{1}
		for i := 0; i < d; i++ {
			diff = append(diff, 0)
			for k := len(diff) - 1; k > 0; k-- {
				diff[k] -= diff[k-1]
			}
		}
		var z []float64
		for _, b := range data[min(p+q, len(data)):] {
			if b%7 == 0 {
				z = append(z, math.NaN())
			} else {
				z = append(z, float64(int8(b))/10)
			}
		}
		fl, err := New(ar, ma, diff)
		if err != nil {
			return
		}
		st, err := fl.Run(z, 0.1, make([]float64, len(z)), make([]float64, len(z)))
		if err != nil {
			return
		}
		if math.IsNaN(st.SSQ) || math.IsInf(st.SSQ, 0) || st.SSQ < 0 || math.IsNaN(st.SumLogF) {
			t.Fatalf("stats %+v", st)
		}
		fill, vr, _, err := fl.Smooth(z, 0.1)
		if err != nil {
			t.Fatalf("Smooth after a good Run: %v", err)
		}
		for i := st.Start; i < len(z); i++ {
			if math.IsNaN(fill[i]) || math.IsInf(fill[i], 0) || !(vr[i] >= 0) {
				t.Fatalf("sample %d: %v var %v", i, fill[i], vr[i])
			}
		}
		mean, fv, err := fl.Forecast(z, 0.1, 3)
		if err != nil {
			t.Fatalf("Forecast after a good Run: %v", err)
		}
		for h := range mean {
			if math.IsNaN(mean[h]) || !(fv[h] >= 0) {
				t.Fatalf("forecast %d: %v var %v", h, mean[h], fv[h])
			}
		}
	})
}
