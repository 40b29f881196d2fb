package prewhiten_test

import (
	"encoding/csv"
	"math"
	"os"
	"strconv"
	"testing"

	"github.com/backshift/backshift/internal/testutil"
	"github.com/backshift/backshift/prewhiten"
)

// TestFitAgainstR checks the prewhitening autoregression against R 4.2.2
// stats::ar(s, aic = TRUE, order.max = m, method = "yule-walker")
// (testdata/ccf/reference.R): the chosen order, the coefficients, the
// innovation variance (var.pred), the mean, and the filtered series
// against ar()$resid. Series: x (an AR(2) simulated in R), the first
// differences of BJsales.lead (R datasets, Series M of Box, Jenkins &
// Reinsel; here through Settings.Diff = 1 - B), and a white series w.
// Tolerance 1e-10 relative: the same Durbin-Levinson recursion on the
// same autocovariances in double precision.
func TestFitAgainstR(t *testing.T) {
	series := map[string][]float64{}
	series["x"] = testutil.ReadCSV(t, "testdata/ccf/series.csv").Column(t, "x")
	series["w"] = testutil.ReadCSV(t, "testdata/ccf/white.csv").Column(t, "w")
	series["lead"] = testutil.ReadCSV(t, "testdata/bjsales/bjsales.csv").Column(t, "lead")

	f, err := os.Open("../testdata/ccf/ar.csv")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rd := csv.NewReader(f)
	rd.FieldsPerRecord = -1
	rows, err := rd.ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	resid := residColumns(t)
	for _, row := range rows[1:] {
		name := row[0]
		maxOrder, err1 := strconv.Atoi(row[1])
		order, err2 := strconv.Atoi(row[2])
		if err1 != nil || err2 != nil {
			t.Fatalf("ar.csv line %q: order_max or order is not an integer", row)
		}
		want := make([]float64, 0, len(row)-3)
		for _, s := range row[3:] {
			v, err := strconv.ParseFloat(s, 64)
			if err != nil {
				t.Fatal(err)
			}
			want = append(want, v)
		}
		varPred, mean, coef := want[0], want[1], want[2:]
		x := series[name]
		set := &prewhiten.Settings{MaxOrder: maxOrder, Name: name}
		if name == "dlead" {
			x = series["lead"]
			set.Diff = []float64{1, -1}
		}
		flt, err := prewhiten.Fit(x, set)
		if err != nil {
			t.Fatal(err)
		}
		if flt.Order() != order {
			t.Errorf("%s order.max %d: order %d, R ar gives %d", name, maxOrder, flt.Order(), order)
			continue
		}
		for k, v := range coef {
			// ar()$ar holds phi_k of x_t = sum phi_k x_{t-k} + e_t; AR
			// stores phi(B) = 1 - sum phi_k B^k.
			if got := -flt.AR[k+1]; !close(got, v, 1e-10) {
				t.Errorf("%s order.max %d: phi_%d = %.15g, R %.15g", name, maxOrder, k+1, got, v)
			}
		}
		if !close(flt.Sigma2, varPred, 1e-10) || !close(flt.Mean, mean, 1e-10) {
			t.Errorf("%s: var %.15g mean %.15g, R var.pred %.15g x.mean %.15g", name, flt.Sigma2, flt.Mean, varPred, mean)
		}
		t.Logf("%s order.max %d: order %d, phi %v (R ar: order %d)", name, maxOrder, flt.Order(), flt.AR, order)
		out, start, err := flt.Apply(x, name)
		if err != nil {
			t.Fatal(err)
		}
		// R's resid for the differenced lead has one sample less: it is
		// indexed from the first difference, ours from the level series.
		rr := resid[name+"/"+row[1]]
		d := len(flt.Diff) - 1
		for i, v := range rr {
			got := out[i+d]
			if math.IsNaN(v) {
				if i+d >= start {
					t.Errorf("%s: index %d valid, R has NA", name, i+d)
				}
				continue
			}
			if !close(got, v, 1e-9) {
				t.Errorf("%s: filtered[%d] = %.15g, R resid %.15g", name, i+d, got, v)
				break
			}
		}
	}
}

func close(a, b, rel float64) bool {
	return math.Abs(a-b) <= rel*math.Max(1, math.Abs(b))
}

// residColumns reads R's ar()$resid from testdata/ccf/ar_resid.csv (one
// line per series, order.max and time index; NA before the first
// residual) into series keyed "name/order.max".
func residColumns(t *testing.T) map[string][]float64 {
	tb := testutil.ReadCSV(t, "testdata/ccf/ar_resid.csv", "series", "order_max")
	names, orders, resid := tb.Text["series"], tb.Text["order_max"], tb.Column(t, "resid")
	out := map[string][]float64{}
	for i, v := range resid {
		key := names[i] + "/" + orders[i]
		out[key] = append(out[key], v)
	}
	return out
}
