package arma

import (
	"math"
	"testing"

	"github.com/backshift/backshift/internal/testutil"
)

type arRef struct {
	Series      string `json:"series"`
	OrderMaxArg int    `json:"order_max_arg"`
	OrderMax    int    `json:"order_max"`
	Order       int    `json:"order"`
	AR          []jnum `json:"ar"`
	VarPred     []jnum `json:"var_pred"`
	XMean       []jnum `json:"x_mean"`
	AIC         []jnum `json:"aic"`
	PACF        []jnum `json:"partialacf"`
	Resid       []jnum `json:"resid"`
}

// TestYuleWalkerR checks YuleWalker against R 4.2.2 stats::ar(x, method =
// "yule-walker", aic = TRUE, order.max = K) for K = default and 10 on the
// R datasets lh, LakeHuron, Nile, WWWusage and a simulated ARMA(2,1):
// chosen order exactly, coefficients, var.pred, mean, residuals and
// partial autocorrelations to 1e-10 relative (same Levinson recursion in
// double precision), and R's aic vector (ours minus its minimum) to 1e-8
// absolute (differences of n log v values of size ~1e3).
func TestYuleWalkerR(t *testing.T) {
	ds := datasets(t)
	var refs []arRef
	testutil.ReadJSON(t, "testdata/arma/ar.json", &refs)
	if len(refs) != 12 {
		t.Fatalf("ar.json holds %d fits, want 12", len(refs))
	}
	for _, r := range refs {
		x := ds[r.Series]
		f, err := YuleWalker(x, r.OrderMaxArg)
		if err != nil {
			t.Fatal(r.Series, err)
		}
		what := r.Series + " order.max=" + itoa(r.OrderMax)
		if f.Order != r.Order || len(f.AIC) != r.OrderMax+1 {
			t.Errorf("%s: order %d (of %d), want %d (of %d)", what, f.Order, len(f.AIC)-1, r.Order, r.OrderMax)
			continue
		}
		checkSlice(t, what+" ar", f.Phi, floats(r.AR), 1e-10, 1e-12)
		checkSlice(t, what+" var.pred", []float64{f.Var}, floats(r.VarPred), 1e-10, 0)
		checkSlice(t, what+" x.mean", []float64{f.Mean}, floats(r.XMean), 1e-12, 0)
		checkSlice(t, what+" partialacf", f.PACF, floats(r.PACF), 1e-10, 1e-12)
		checkSlice(t, what+" resid", f.Residuals(x), floats(r.Resid), 1e-9, 1e-9*math.Sqrt(f.Var))
		minAIC := math.Inf(1)
		for _, v := range f.AIC {
			minAIC = math.Min(minAIC, v)
		}
		for k, v := range f.AIC {
			if math.Abs(v-minAIC-float64(r.AIC[k])) > 1e-8 {
				t.Errorf("%s aic[%d] = %.12g, want %.12g", what, k, v-minAIC, r.AIC[k])
			}
		}
	}
}
