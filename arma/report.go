package arma

import (
	"fmt"
	"math"
	"strings"
)

// LjungBox tests the fit's residuals (from Start) for whiteness up to lag
// lags, with the degrees of freedom reduced by the number of estimated
// ARMA coefficients (the constant and regressors do not count). Errors
// are those of the package-level LjungBox, and a *ModelError for a nil
// Result or one whose Start is outside its residuals (the zero Result).
func (r *Result) LjungBox(lags int) (pm Portmanteau, err error) {
	defer withOp("arma.Result.LjungBox", &err)
	if r == nil || r.Start < 0 || r.Start >= len(r.Resid) {
		return Portmanteau{}, modelErr("result", "LjungBox needs a result of Fit or FitNoise")
	}
	res := r.Resid[r.Start:]
	if r.Method == ExactML {
		// Missing samples have no innovation: the test runs on the
		// available standardised innovations placed end to end (their
		// lags across a gap are taken as adjacent; common practice, the
		// treatment of R's Box.test on na.omit'ted residuals).
		res = dropNaN(res)
	}
	return ljungBox(res, lags, r.narma)
}

// String returns a short report for people: the model, the estimates
// with standard errors (sd) and their ratios, the innovation variance, the
// criteria, the optimiser's outcome and any boundary flags. Numbers are
// rounded for reading; use the fields for computation. A nil Result
// prints as "<nil arma.Result>".
func (r *Result) String() string {
	if r == nil {
		return "<nil arma.Result>"
	}
	var b strings.Builder
	what := "noise model"
	if r.byOrder {
		what = "ARIMA" + r.Order.String()
	}
	if r.Method == ExactML {
		fmt.Fprintf(&b, "%s fitted by exact maximum likelihood (Kalman filter) to %d samples (likelihood from %d, %d observed, %d missing)\n",
			what, r.N, r.Start, r.NUsed, len(r.Missing))
		fmt.Fprintf(&b, "  sd from the observed information (numerical Hessian of the log-likelihood)\n")
	} else {
		fmt.Fprintf(&b, "%s fitted by conditional least squares to %d samples (residuals %d..%d, %d summed)\n",
			what, r.N, r.Start, r.N-1, r.NUsed)
	}
	if len(r.Params) > 0 {
		fmt.Fprintf(&b, "  %-10s %12s %12s %9s\n", "name", "value", "sd(value)", "value/sd")
		for _, p := range r.Params {
			fmt.Fprintf(&b, "  %-10s %12.5g %12.3g %9.2f\n", p.Name, p.Value, p.SE, p.T)
		}
	}
	fmt.Fprintf(&b, "  innovation variance %.5g, sum of squares %.6g\n", r.Sigma2, r.SSQ)
	for i, m := range r.Missing {
		if i == 5 {
			fmt.Fprintf(&b, "  ... and %d more missing samples\n", len(r.Missing)-5)
			break
		}
		fmt.Fprintf(&b, "  missing sample %d: estimate %.5g, sd %.3g\n", m.Index, m.Value, m.SE)
	}
	fmt.Fprintf(&b, "  log-likelihood %.2f; AIC %.2f, AICc %.2f, BIC %.2f\n", r.LogLik, r.AIC, r.AICc, r.BIC)
	fmt.Fprintf(&b, "  %s after %d iterations\n", r.Reason, r.Iter)
	for _, f := range r.Boundary {
		part := "AR part not stationary"
		if f.Part == "MA" {
			part = "MA part not invertible"
		}
		mods := make([]string, len(f.Roots))
		for i, z := range f.Roots {
			mods[i] = fmt.Sprintf("%.4g", math.Hypot(real(z), imag(z)))
		}
		fmt.Fprintf(&b, "  warning: %s: z-plane roots of modulus %s\n", part, strings.Join(mods, ", "))
	}
	return b.String()
}

// EquationConstant returns the constant k of the difference-equation
// form
//
//	phi*(B) w_t = k + theta*(B) a_t,  k = phi*(1) c,
//
// c the constant (Model.Mean, the mean of the differenced series), and
// its standard error by the delta method from Cov (NaN when Cov has NaN
// entries; zero when neither c nor any AR coefficient was estimated).
// Both are NaN for a nil Result.
func (r *Result) EquationConstant() (k, se float64) {
	if r == nil {
		return math.NaN(), math.NaN()
	}
	idx := map[string]int{}
	for i, p := range r.Params {
		idx[p.Name] = i
	}
	np := len(r.Params)
	phi, d := r.Noise.AR.Grad(func(name string) int {
		if k, ok := idx[name]; ok {
			return k
		}
		return -1
	}, np)
	p1 := 0.0
	for _, v := range phi {
		p1 += v
	}
	k = p1 * r.Model.Mean
	grad := make([]float64, np)
	for i, di := range d {
		for _, v := range di {
			grad[i] += v * r.Model.Mean
		}
	}
	if i, ok := idx["c"]; ok {
		grad[i] = p1
	}
	if len(r.Cov) != np {
		return k, math.NaN()
	}
	v := 0.0
	for i := range grad {
		for j := range grad {
			if grad[i] != 0 && grad[j] != 0 {
				v += grad[i] * r.Cov[i][j] * grad[j]
			}
		}
	}
	if math.IsNaN(v) {
		return k, math.NaN()
	}
	return k, math.Sqrt(math.Max(v, 0))
}

// dropNaN returns the non-NaN values of x.
func dropNaN(x []float64) []float64 {
	out := make([]float64, 0, len(x))
	for _, v := range x {
		if !math.IsNaN(v) {
			out = append(out, v)
		}
	}
	return out
}
