package arma

import (
	"errors"
	"math"
	"testing"

	"github.com/backshift/backshift/internal/testutil"
)

type corrRef struct {
	LagMax int    `json:"lag_max"`
	ACF    []jnum `json:"acf"`
	ACov   []jnum `json:"acov"`
	PACF   []jnum `json:"pacf"`
	Box    []struct {
		Lag    int    `json:"lag"`
		Fitted int    `json:"fitdf"` // R argument name in the reference file
		Q      []jnum `json:"q"`
		DF     []jnum `json:"df"`
		P      []jnum `json:"p"`
	} `json:"box"`
}

// TestACFPACFLjungBoxR checks ACF, PACF and LjungBox against R 4.2.2
// stats::acf, stats::pacf and stats::Box.test(type = "Ljung-Box") on the
// datasets lh, LakeHuron, Nile, WWWusage (R datasets package) and a
// simulated ARMA(2,1). Tolerance 1e-10 relative (floor 1e-12 for
// values near zero): both sides sum the same products in double
// precision, so only rounding order differs.
func TestACFPACFLjungBoxR(t *testing.T) {
	ds := datasets(t)
	var ref map[string]corrRef
	testutil.ReadJSON(t, "testdata/arma/corr.json", &ref)
	if len(ref) != 6 {
		t.Fatalf("corr.json holds %d series, want 6", len(ref))
	}
	for name, r := range ref {
		x := ds[name]
		c, err := ACF(x, r.LagMax)
		if err != nil {
			t.Fatal(name, err)
		}
		checkSlice(t, name+" acf", c.R, floats(r.ACF), 1e-10, 1e-12)
		checkSlice(t, name+" acov", c.Cov, floats(r.ACov), 1e-10, 1e-12*c.Cov[0])
		p, err := PACF(x, r.LagMax)
		if err != nil {
			t.Fatal(name, err)
		}
		checkSlice(t, name+" pacf", p.R, floats(r.PACF), 1e-10, 1e-12)
		for _, b := range r.Box {
			lb, err := LjungBox(x, b.Lag, b.Fitted)
			if err != nil {
				t.Fatal(name, err)
			}
			if !closeTo(lb.Q, float64(b.Q[0]), 1e-10, 0) || lb.DF != int(b.DF[0]) {
				t.Errorf("%s Ljung-Box lag %d: Q=%.15g df=%d, want %.15g df=%v", name, b.Lag, lb.Q, lb.DF, b.Q[0], b.DF[0])
			}
			// p-values: 1e-10 relative, with an absolute floor of 1e-14:
			// R computes 1 - pchisq(Q, df), which carries an absolute
			// rounding error of ~1e-16 (it returns 0 for p ~ 6e-18), while
			// gonum's ChiSquared.Survival keeps relative accuracy.
			if !closeTo(lb.P, float64(b.P[0]), 1e-10, 1e-4) {
				t.Errorf("%s Ljung-Box lag %d: p=%.15g, want %.15g", name, b.Lag, lb.P, b.P[0])
			}
		}
	}
}

// TestACFBands checks the Bartlett standard errors against their
// definition (common practice: Box, Jenkins & Reinsel, eq. 2.1.15) and
// the white-noise band 1/sqrt(n).
func TestACFBands(t *testing.T) {
	x := datasets(t)["lh"]
	c, err := ACF(x, 5)
	if err != nil {
		t.Fatal(err)
	}
	n := float64(len(x))
	if math.Abs(c.White-1/math.Sqrt(n)) > 1e-15 {
		t.Errorf("White = %v", c.White)
	}
	want2 := math.Sqrt((1 + 2*c.R[1]*c.R[1]) / n)
	if math.Abs(c.Bartlett[1]-c.White) > 1e-15 || math.Abs(c.Bartlett[2]-want2) > 1e-15 {
		t.Errorf("Bartlett = %v", c.Bartlett[:3])
	}
}

// TestACFBadInput: a NaN, a constant or a short series and out-of-range
// lags give ACF, PACF and LjungBox's typed errors with index, kind and
// counts.
func TestACFBadInput(t *testing.T) {
	var de *SampleError
	if _, err := ACF([]float64{1, 2, math.NaN(), 4}, 1); !errors.As(err, &de) || de.Index != 2 {
		t.Errorf("NaN: got %v", err)
	}
	var ce *SeriesError
	if _, err := ACF([]float64{3, 3, 3, 3}, 1); !errors.As(err, &ce) || !errors.Is(err, ErrConstant) ||
		err.Error() != `arma.ACF: series "series" is constant (every sample is 3 over its 4 samples)` {
		t.Errorf("constant: got %v", err)
	}
	var se *SeriesError
	if _, err := ACF([]float64{1, 2, 3}, 3); !errors.As(err, &se) || !errors.Is(err, ErrShort) || se.Have != 3 || se.Need != 4 {
		t.Errorf("short: got %v", err)
	}
	var ae *SettingError
	if _, err := LjungBox([]float64{1, 2, 3, 5, 4}, 2, 2); !errors.As(err, &ae) ||
		err.Error() != "arma.LjungBox: fitted = 2: must be in 0..lags-1 = 1" {
		t.Errorf("fitted >= lags: got %v", err)
	}
	if _, err := PACF([]float64{1, 2, 3, 5, 4}, 0); !errors.As(err, &ae) || ae.Op != "arma.PACF" || !errors.Is(err, ErrSetting) {
		t.Errorf("pacf lag 0: got %v", err)
	}
}
