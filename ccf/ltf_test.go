package ccf

import (
	"errors"
	"math"
	"strconv"
	"strings"
	"testing"

	"github.com/backshift/backshift/internal/testutil"
)

// TestDistributedLagAgainstR compares the joint distributed-lag fit with
// AR(1) noise against R 4.2.2 stats::arima(order = c(1,0,0), xreg = the
// lags 0..8 of two correlated inputs, method = "CSS", include.mean = TRUE)
// written by testdata/ccf/ltf.R. Both minimise the same conditional sum
// of squares; R's optimiser (BFGS, reltol 1e-14) stops near the minimum,
// so estimates are compared to 1e-5 absolute (about 3e-4 of their
// standard errors). R's standard errors come from the numerical Hessian
// of the whole objective with sigma2 = SSQ/(residuals), ours from the
// regression given phi with SSQ/(residuals - coefficients); after
// rescaling ours to R's divisor they agree to 1 % (the AR coefficient is
// nearly orthogonal to the weights).
func TestDistributedLagAgainstR(t *testing.T) {
	cols := readColumns(t, "../testdata/ccf/ltf_series.csv", "x1", "x2", "y")
	ref := testutil.ReadCSV(t, "testdata/ccf/ltf_fit.csv", "name")
	est, se := map[string]float64{}, map[string]float64{}
	for i, name := range ref.Text["name"] {
		est[name], se[name] = ref.Column(t, "estimate")[i], ref.Column(t, "se")[i]
	}
	res, err := DistributedLag(cols[2], [][]float64{cols[0], cols[1]}, &DistributedLagSettings{Lags: 8, Names: []string{"x1", "x2"}})
	if err != nil {
		t.Fatal(err)
	}
	if !res.Converged {
		t.Errorf("not converged after %d iterations", res.Iter)
	}
	nres := float64(res.Weights[0].N)
	ncoef := float64(1 + 2*9)
	toR := math.Sqrt((nres - ncoef) / nres)
	check := func(name string, got, gotSE float64) {
		t.Helper()
		gotSE *= toR
		if math.Abs(got-est[name]) > 1e-5 {
			t.Errorf("%s = %.10g, R arima CSS %.10g", name, got, est[name])
		}
		if gotSE > 0 && math.Abs(gotSE-se[name]) > 0.01*se[name] {
			t.Errorf("se(%s) = %.6g, R %.6g", name, gotSE, se[name])
		}
	}
	check("ar1", -res.AR[1], 0)
	check("intercept", res.Const, res.ConstSE)
	for i, w := range res.Weights {
		for k := range w.V {
			check("x"+strconv.Itoa(i+1)+"_"+strconv.Itoa(k), w.V[k], w.SE[k])
		}
	}
	// R's sigma2 for CSS is the residual sum of squares over the number
	// of residuals; ours divides by residuals minus coefficients.
	if got := res.Sigma2 * (nres - ncoef) / nres; math.Abs(got-est["sigma2"]) > 1e-6 {
		t.Errorf("sigma2 (R's divisor) = %.8g, R %.8g", got, est["sigma2"])
	}
	// The model: x1 enters at lag 2 with one denominator term, x2 at lag 1
	// with a numerator of degree 1 (testdata/ccf/ltf.R).
	for i, want := range []struct{ b, r, s int }{{2, 1, 0}, {1, 0, 1}} {
		id, err := Identify(res.Weights[i], nil)
		if err != nil {
			t.Fatal(err)
		}
		c := id.Forms[0]
		t.Logf("%s: top %s; corner (r,s) = (%d,%d)", res.Weights[i].Input, c, id.CornerR, id.CornerS)
		if id.DeadTime != want.b {
			t.Errorf("%s: dead time %d, want %d", res.Weights[i].Input, id.DeadTime, want.b)
		}
		found := false
		for _, c := range id.Forms[:3] {
			found = found || c.R == want.r && c.S == want.s
		}
		if !found {
			t.Errorf("%s: true (r,s) = (%d,%d) not in the top three", res.Weights[i].Input, want.r, want.s)
		}
	}
}

func TestDistributedLagBadInput(t *testing.T) {
	x := make([]float64, 60)
	y := make([]float64, 60)
	for i := range x {
		x[i] = math.Sin(float64(i)) + float64(i%7)
		y[i] = math.Cos(float64(i)) + float64(i%5)
	}
	var ae *SettingError
	if _, err := DistributedLag(y, nil, nil); !errors.As(err, &ae) || ae.Setting != "xs" || ae.Op != "ccf.DistributedLag" {
		t.Errorf("no inputs: %v", err)
	}
	var le *SeriesError
	if _, err := DistributedLag(y, [][]float64{x[:50]}, nil); !errors.As(err, &le) || !errors.Is(err, ErrLength) || le.Have != 50 || le.Need != 60 || le.Series != "x1" {
		t.Errorf("lengths: %v", err)
	}
	bad := append([]float64(nil), x...)
	bad[17] = math.Inf(1)
	var ve *SampleError
	if _, err := DistributedLag(y, [][]float64{x, bad}, &DistributedLagSettings{Names: []string{"valve", "outdoor"}}); !errors.As(err, &ve) || ve.Series != "outdoor" || ve.Index != 17 {
		t.Errorf("Inf: %v", err)
	}
	var se *SeriesError
	if _, err := DistributedLag(y, [][]float64{x}, &DistributedLagSettings{Lags: 30}); !errors.As(err, &se) || !errors.Is(err, ErrShort) {
		t.Errorf("short: %v", err)
	}
	var sg *ModelError
	if _, err := DistributedLag(y, [][]float64{x, x}, &DistributedLagSettings{Lags: 3}); !errors.As(err, &sg) || !errors.Is(err, ErrModel) ||
		err.Error() != "ccf.DistributedLag: the distributed-lag regression on inputs x1, x2: singular: an input is a linear combination of the lags of the others; drop one of them" {
		t.Errorf("collinear inputs: %v", err)
	}
	if _, err := DistributedLag(y, [][]float64{make([]float64, 60)}, nil); !errors.As(err, &se) || !errors.Is(err, ErrConstant) || se.Series != "x1" {
		t.Errorf("constant: %v", err)
	}
	// Lags and orders beyond the series: typed errors whose "need at
	// least" counts do not overflow (Need is math.MaxInt, not negative).
	if _, err := DistributedLag(y, [][]float64{x}, &DistributedLagSettings{Lags: math.MaxInt}); !errors.As(err, &se) || se.Need != math.MaxInt {
		t.Errorf("Lags = MaxInt: %v", err)
	}
	if _, err := DistributedLag(y, [][]float64{x}, &DistributedLagSettings{ARP: math.MaxInt}); !errors.As(err, &ae) {
		t.Errorf("ARP = MaxInt: %v", err)
	}
}

// TestDistributedLagExactFit: an output that the lags explain exactly,
// y_t = 2 + 0.5 x_{t-1} + 0.25 x_{t-2}, makes the Gram matrix of the
// extended design singular (y is a combination of the lags of x); the
// fit still returns the weights (to 1e-9, about 1e7 times the rounding
// of the sums of a few hundred products of unit-size values, common
// practice) with a residual variance at the rounding floor (below 1e-12
// of the output's variance: the sums of squares of n = 300 products
// carry relative errors of about n eps = 7e-14), not an error.
func TestDistributedLagExactFit(t *testing.T) {
	n := 300
	x := make([]float64, n)
	y := make([]float64, n)
	for i := range x {
		x[i] = math.Sin(0.37*float64(i)) + 0.5*math.Cos(1.3*float64(i)) + float64(i%7)/7
	}
	for i := 2; i < n; i++ {
		y[i] = 2 + 0.5*x[i-1] + 0.25*x[i-2]
	}
	y[0], y[1] = y[2], y[3]
	for _, arp := range []int{-1, 1} {
		res, err := DistributedLag(y[2:], [][]float64{x[2:]}, &DistributedLagSettings{Lags: 4, ARP: arp})
		if err != nil {
			t.Fatalf("ARP %d: %v", arp, err)
		}
		want := []float64{0, 0.5, 0.25, 0, 0}
		for k, v := range res.Weights[0].V {
			if math.Abs(v-want[k]) > 1e-9 {
				t.Errorf("ARP %d: v_%d = %.12g, want %g", arp, k, v, want[k])
			}
		}
		if math.Abs(res.Const-2) > 1e-9 || !(res.Sigma2 < 1e-12*testutil.Variance(y[2:])) {
			t.Errorf("ARP %d: constant %.12g (want 2), sigma2 %g (want about 0)", arp, res.Const, res.Sigma2)
		}
	}
}

// TestDistributedLagOverflow: an output of magnitude 1e160 (beyond
// sqrt(MaxFloat64/n) = 7.7e152 for n = 300) overflows the sums of
// products; the fit says so with a *SeriesError of kind ErrOverflow
// naming the series and the limit, and no numbers.
func TestDistributedLagOverflow(t *testing.T) {
	n := 300
	x := make([]float64, n)
	y := make([]float64, n)
	for i := range x {
		x[i] = math.Sin(0.37*float64(i)) + float64(i%7)/7
		y[i] = 1e160 * (math.Cos(0.11*float64(i)) + float64(i%5))
	}
	res, err := DistributedLag(y, [][]float64{x}, &DistributedLagSettings{Lags: 4, Names: []string{"valve"}, Output: "flow"})
	var se *SeriesError
	if res != nil || !errors.As(err, &se) || !errors.Is(err, ErrOverflow) || se.Series != "flow, valve" ||
		!strings.Contains(err.Error(), "keep magnitudes below about 7.74e+152: rescale the series") {
		t.Errorf("overflowing output: %v, %v", res, err)
	}
}
