package control

import (
	"math"
	"math/rand/v2"
	"strconv"

	"github.com/backshift/backshift/tf"
)

// ModelDraw returns a Draw of the plant path of the model m from the
// input series named input: the whole path to the output y itself,
// tf.Model.Path, with the model's output differencing and the input's
// differencing included (for (1 - B) y = G(B) u the plant is the
// integrating G(B)/(1 - B), not G(B)), with the parameters named in names drawn
// from the normal distribution with mean their values in m and
// covariance cov (cov[i][j] the covariance of names[i] and names[j], in
// the model's own units, as an estimate reports it). Parameters not
// named keep their values; the dead time is not drawn. Each draw uses
// len(names) standard normals of rng (rng.NormFloat64) and the
// lower Cholesky factor of cov, computed once.
//
// The draws are of the linearised sampling distribution of the
// estimate: a drawn plant may be unstable, which Robust counts as an
// unstable loop. m and names are copied, never kept or modified: a
// caller may reuse its slice after the call without changing later
// draws.
//
// Errors (Op "control.ModelDraw"): a *SettingError for an unknown input
// or parameter name, a name given twice, a covariance that is not square of len(names),
// not finite, not symmetric (to 1e-9 of its diagonal) or not positive
// semi-definite (a pivot below -1e-9 of its diagonal); the errors of
// tf.Model.Path for the model's own path (Op "tf.Model.Path"). A drawn
// plant returns Path's errors for its drawn values.
//
// Over 60 lines: the checks of the model and the covariance, then the
// drawing function, which closes over what the checks computed.
func ModelDraw(m tf.Model, input string, names []string, cov [][]float64) (Draw, error) {
	const op = "control.ModelDraw"
	m = m.Clone()
	names = append([]string(nil), names...)
	idx := -1
	for i, in := range m.Inputs {
		if in.Series == input {
			idx = i
		}
	}
	if idx < 0 {
		return nil, &SettingError{Op: op, Setting: "input", Value: strconv.Quote(input), Rule: "must name an input series of the model"}
	}
	if _, err := m.Path(input); err != nil {
		return nil, err
	}
	// The model of the one path, cloned afresh for each draw.
	one := tf.Model{Output: m.Output, Diff: m.Diff, Inputs: []tf.Input{m.Inputs[idx]}}
	mean := make([]float64, len(names))
	known := map[string]float64{}
	for _, c := range m.Params() {
		known[c.Name] = c.Value
	}
	first := map[string]int{}
	for i, nm := range names {
		if j, dup := first[nm]; dup {
			return nil, &SettingError{Op: op, Setting: "names[" + strconv.Itoa(i) + "]", Value: strconv.Quote(nm), Rule: "repeats names[" + strconv.Itoa(j) + "]: name each parameter once (its variance and covariances are one row and column of cov)"}
		}
		first[nm] = i
		v, ok := known[nm]
		if !ok {
			return nil, &SettingError{Op: op, Setting: "names[" + strconv.Itoa(i) + "]", Value: strconv.Quote(nm), Rule: "must name a parameter of the model"}
		}
		mean[i] = v
	}
	chol, err := cholesky(op, cov, len(names))
	if err != nil {
		return nil, err
	}
	return func(rng *rand.Rand) (tf.Rational, error) {
		z := make([]float64, len(names))
		for i := range z {
			z[i] = rng.NormFloat64()
		}
		vals := map[string]float64{}
		for i, nm := range names {
			v := mean[i]
			for j := 0; j <= i; j++ {
				v += chol[i][j] * z[j]
			}
			vals[nm] = v
		}
		d := one.Clone()
		d.EachParam(func(c *tf.Coef) {
			if v, ok := vals[c.Name]; ok && c.Name != "" {
				c.Value = v
			}
		})
		return d.Path(input)
	}, nil
}

// cholesky returns the lower factor L of cov = L L', n x n, checking
// shape, finiteness, symmetry and positive semi-definiteness (a pivot
// within 1e-9 of its diagonal of zero counts as zero: that direction is
// not drawn).
func cholesky(op string, cov [][]float64, n int) ([][]float64, error) {
	bad := func(i, j int, rule string) error {
		v := math.NaN()
		if i < len(cov) && j < len(cov[i]) {
			v = cov[i][j]
		}
		return fsetting(op, "cov["+strconv.Itoa(i)+"]["+strconv.Itoa(j)+"]", v, rule)
	}
	if len(cov) != n {
		return nil, &SettingError{Op: op, Setting: "cov", Value: strconv.Itoa(len(cov)) + " rows", Rule: "must have one row and column per name (" + strconv.Itoa(n) + ")"}
	}
	for i := range cov {
		if len(cov[i]) != n {
			return nil, &SettingError{Op: op, Setting: "cov[" + strconv.Itoa(i) + "]", Value: strconv.Itoa(len(cov[i])) + " columns", Rule: "must have one column per name (" + strconv.Itoa(n) + ")"}
		}
		for j, v := range cov[i] {
			if !finite(v) {
				return nil, bad(i, j, "must be finite")
			}
			if math.Abs(v-cov[j][i]) > 1e-9*math.Sqrt(math.Abs(cov[i][i]*cov[j][j])) {
				return nil, bad(i, j, "must equal cov[j][i]: a covariance matrix is symmetric")
			}
		}
	}
	l := make([][]float64, n)
	for i := range l {
		l[i] = make([]float64, n)
		for j := 0; j <= i; j++ {
			s := cov[i][j]
			for k := 0; k < j; k++ {
				s -= l[i][k] * l[j][k]
			}
			if i == j {
				if s < -1e-9*math.Abs(cov[i][i]) || (s < 0 && cov[i][i] == 0) {
					return nil, bad(i, i, "the covariance is not positive semi-definite at this pivot (left "+fmtG(s)+")")
				}
				l[i][i] = math.Sqrt(math.Max(s, 0))
				continue
			}
			if l[j][j] > 0 {
				l[i][j] = s / l[j][j]
			}
		}
	}
	return l, nil
}
