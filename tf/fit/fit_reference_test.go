package fit

import (
	"context"
	"fmt"
	"math"
	"path/filepath"
	"strings"
	"testing"

	"github.com/backshift/backshift/arma"
	"github.com/backshift/backshift/internal/fixture"
	"github.com/backshift/backshift/internal/testutil"
	"github.com/backshift/backshift/tf"
	"gonum.org/v1/gonum/floats/scalar"
)

// scipyCase is one entry of testdata/fit/ref_fit.json, written by
// testdata/fit/ref_fit.py (scipy 1.10.1 optimize.least_squares on
// signal.lfilter residuals with the conditioning of Model).
type scipyCase struct {
	Name  string `json:"name"`
	File  string `json:"file"`
	Model struct {
		Output string       `json:"output"`
		Diff   []factorJSON `json:"diff"`
		Const  string       `json:"const"`
		Inputs []inputJSON  `json:"inputs"`
		MA     []factorJSON `json:"ma"`
		AR     []factorJSON `json:"ar"`
	} `json:"model"`
	Estimates  map[string]float64 `json:"estimates"`
	SSQ        float64            `json:"ssq"`
	NResid     int                `json:"n_resid"`
	First      int                `json:"first"`
	NoiseStart int                `json:"noise_start"`
	Forecast   struct {
		Origin int       `json:"origin"`
		H      int       `json:"h"`
		Mean   []float64 `json:"mean"`
		SE     []float64 `json:"se"`
		MeanAR []float64 `json:"mean_ar_inputs"`
		SEAR   []float64 `json:"se_ar_inputs"`
	} `json:"forecast"`
	Checks struct {
		LBLags int     `json:"lb_lags"`
		LBDF   int     `json:"lb_df"`
		LBQ    float64 `json:"lb_q"`
		LBP    float64 `json:"lb_p"`
		Cross  []struct {
			Input   string  `json:"input"`
			AROrder int     `json:"ar_order"`
			Lags    int     `json:"lags"`
			M       int     `json:"m"`
			S       float64 `json:"S"`
			DF      int     `json:"df"`
			P       float64 `json:"p"`
		} `json:"cross"`
	} `json:"checks"`
}

type inputJSON struct {
	Series string       `json:"series"`
	Diff   []factorJSON `json:"diff"`
	Delay  int          `json:"delay"`
	Num    []factorJSON `json:"num"`
	Den    []factorJSON `json:"den"`
}

type factorJSON struct {
	Exp   int `json:"exp"`
	Terms []struct {
		Power int     `json:"power"`
		Neg   bool    `json:"neg"`
		Name  string  `json:"name"`
		Value float64 `json:"value"`
	} `json:"terms"`
}

func polyOf(fs []factorJSON) tf.Poly {
	var p tf.Poly
	for _, f := range fs {
		fac := tf.Factor{Exp: f.Exp}
		for _, t := range f.Terms {
			fac.Terms = append(fac.Terms, fixture.Term(t.Neg, t.Name, t.Value, t.Power))
		}
		p.Factors = append(p.Factors, fac)
	}
	return p
}

func (c scipyCase) model() tf.Model {
	m := tf.Model{Output: c.Model.Output, Diff: polyOf(c.Model.Diff)}
	if c.Model.Const != "" {
		m.Const = &tf.Coef{Name: c.Model.Const, Free: true}
	}
	for _, in := range c.Model.Inputs {
		m.Inputs = append(m.Inputs, tf.Input{Series: in.Series, Diff: polyOf(in.Diff), Delay: in.Delay,
			Num: polyOf(in.Num), Den: polyOf(in.Den)})
	}
	m.Noise = &arma.Noise{MA: polyOf(c.Model.MA), AR: polyOf(c.Model.AR)}
	return m
}

// readScipyCases reads every case of testdata/fit/ref_fit.json.
func readScipyCases(t testing.TB) []scipyCase {
	t.Helper()
	var cs []scipyCase
	testutil.ReadJSON(t, "testdata/fit/ref_fit.json", &cs)
	if len(cs) == 0 {
		t.Fatal("testdata/fit/ref_fit.json holds no cases")
	}
	return cs
}

// scipyCaseNamed returns the case of ref_fit.json with the given name,
// failing the test when there is none.
func scipyCaseNamed(t testing.TB, name string) scipyCase {
	t.Helper()
	for _, c := range readScipyCases(t) {
		if c.Name == name {
			return c
		}
	}
	t.Fatalf("testdata/fit/ref_fit.json has no case %q", name)
	return scipyCase{}
}

// fit fits the case's model to its data with the default settings,
// failing the test on error, and returns the estimate and the data.
func (c scipyCase) fit(t testing.TB) (*Estimate, map[string][]float64) {
	t.Helper()
	data := c.data(t)
	est, err := Model(context.Background(), c.model(), data, nil)
	if err != nil {
		t.Fatal(err)
	}
	return est, data
}

func (c scipyCase) data(t testing.TB) map[string][]float64 {
	t.Helper()
	d := testutil.ReadCSV(t, filepath.Join("testdata", "fit", c.File)).Num
	delete(d, "t")
	return d
}

// TestModelAgainstScipy fits the models of ref_fit.json from our own
// computed start values (the spec's free values are all zero) and
// compares with the independent scipy 1.10.1 least_squares fits started
// elsewhere: estimates and sum of squares agree to 1e-6 relative (both
// optimisers stop at relative sum-of-squares changes near 1e-15, which
// places the estimates within ~1e-7 of the minimum in units of their own
// scale).
func TestModelAgainstScipy(t *testing.T) {
	for _, c := range readScipyCases(t) {
		t.Run(c.Name, func(t *testing.T) {
			est, _ := c.fit(t)
			if est.N != c.NResid || est.Conditioning.First != c.First || est.Conditioning.NoiseStart != c.NoiseStart {
				t.Errorf("conditioning: N %d first %d start %d, scipy script N %d first %d start %d",
					est.N, est.Conditioning.First, est.Conditioning.NoiseStart, c.NResid, c.First, c.NoiseStart)
			}
			if !scalar.EqualWithinRel(est.SSQ, c.SSQ, 1e-6) {
				t.Errorf("SSQ %.12g, scipy %.12g", est.SSQ, c.SSQ)
			}
			for name, want := range c.Estimates {
				p, ok := est.Param(name)
				if !ok {
					t.Fatalf("no parameter %s", name)
				}
				if !scalar.EqualWithinAbsOrRel(p.Value, want, 1e-9, 1e-6) {
					t.Errorf("%s = %.10g, scipy %.10g (diff %.3g, SE %.3g)", name, p.Value, want, p.Value-want, p.SE)
				}
			}
			if !est.Converged {
				t.Errorf("not converged: %s", est.Reason)
			}
			t.Logf("%s: SSQ %.10g iter %d evals %d starts %d", c.Name, est.SSQ, est.Iter, est.Evals, est.StartsTried)
		})
	}
}

// TestModelBJsalesPublished compares the BJsales fit with the estimates
// published for Series M (Box, Jenkins & Reinsel), recalled from memory:
// c ~ 0.035, w0 ~ 4.82, d1 ~ 0.72, t1 ~ 0.54. d1 must agree within 0.01
// and c within one standard error. w0 and t1 depend on the estimation
// method and start-up convention (the MA coefficient moves by about 0.1
// between reasonable conventions); they are checked against scipy in
// TestModelAgainstScipy and only recorded here.
func TestModelBJsalesPublished(t *testing.T) {
	est, _ := scipyCaseNamed(t, "bjsales").fit(t)
	d1, _ := est.Param("d1")
	cc, _ := est.Param("c")
	if math.Abs(d1.Value-0.72) > 0.01 {
		t.Errorf("d1 = %.4f, published 0.72 (from memory)", d1.Value)
	}
	if math.Abs(cc.Value-0.035) > cc.SE {
		t.Errorf("c = %.4f (SE %.4f), published 0.035 (from memory)", cc.Value, cc.SE)
	}
	w0, _ := est.Param("w0")
	t1, _ := est.Param("t1")
	t.Logf("w0 = %.3f (published ~4.82, from memory), t1 = %.3f (published ~0.54, from memory)", w0.Value, t1.Value)
}

// TestEstimateStringWording checks that the report of the BJsales fit
// names the method, the columns of the coefficient table and the noise
// variance with the counts it is formed from, and that every coefficient
// has a row.
func TestEstimateStringWording(t *testing.T) {
	est, _ := scipyCaseNamed(t, "bjsales").fit(t)
	s := est.String()
	k := len(est.Params)
	want := []string{
		"Model of " + est.Model.Output + " with coefficients estimated by conditional least squares\n",
		"  as a spec:  " + est.Model.String() + "\n",
		fmt.Sprintf("the %d residuals from index %d on", est.N, est.Conditioning.First),
		"coefficient", "value", "standard error", "value/se",
		fmt.Sprintf("noise variance %s from %d residuals less %d coefficients (sum of squares %s / %d)",
			formatSig(est.Sigma2, 5), est.N, k, formatSig(est.SSQ, 6), est.N-k),
		"information criteria AIC",
	}
	for _, p := range est.Params {
		want = append(want, "\n  "+p.Name+" ")
	}
	for _, w := range want {
		if !strings.Contains(s, w) {
			t.Errorf("report lacks %q:\n%s", w, s)
		}
	}
}
