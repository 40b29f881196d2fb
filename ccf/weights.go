package ccf

import (
	"errors"
	"math"
	"strconv"

	"gonum.org/v1/gonum/mat"
)

// Weights are impulse-response weight estimates v_k of one input, for
// lags k = 0..len(V)-1 (in samples), with approximate standard errors.
type Weights struct {
	// Input names the input series.
	Input string
	// V[k] is the estimate of v_k, the output's response at lag k to a
	// unit impulse in the input; SE[k] its standard error.
	V, SE []float64
	// N is the number of samples behind the estimates.
	N int
	// Corr is the cross-correlation of the prewhitened series the
	// weights come from (nil for weights from DistributedLag).
	Corr *Correlation
	// Cov, when not nil, is the covariance matrix of V (lags 0..K), as
	// from DistributedLag, whose weights of neighbouring lags are
	// correlated; Identify then fits the forms by generalised least
	// squares. Nil means independent errors with standard errors SE.
	Cov *mat.SymDense
	// Feedback lists the negative lags at which the prewhitened
	// cross-correlation is significant at the 95 % level: the output
	// appears to lead the input there, which hints at feedback (closed
	// loop operation) or at an input that is not white after
	// prewhitening. Empty for weights from DistributedLag.
	Feedback []int
}

// T returns the ratio V[k]/SE[k]. It panics if k is outside 0..len(V)-1.
func (w *Weights) T(k int) float64 { return w.V[k] / w.SE[k] }

// ImpulseWeights estimates the impulse-response weights of an input from
// the prewhitened input alpha and the output beta passed through the same
// filter:
//
//	v_k = r_alpha,beta(k) s_beta / s_alpha,   se(v_k) = (s_beta / s_alpha) / sqrt(n)
//
// for k = 0..maxLag, with s the divisor-n standard deviations. Input
// names the input in the result and in errors (default "x"); s chooses the
// cross-correlation method (nil for Auto). The standard error is the one
// of r for a white alpha independent of the noise; when beta is strongly
// autocorrelated beyond the response it is optimistic.
//
// Errors are those of Cross, naming alpha by the input's name and beta
// "output" unless s.Names gives names; a constant series is reported as
// constant after the prewhitening filter.
func ImpulseWeights(alpha, beta []float64, maxLag int, input string, s *Settings) (*Weights, error) {
	r0, err := impulseWeights(alpha, beta, maxLag, input, s)
	return r0, withOp("ccf.ImpulseWeights", err)
}

func impulseWeights(alpha, beta []float64, maxLag int, input string, s *Settings) (*Weights, error) {
	if input == "" {
		input = "x"
	}
	if err := s.Validate(); err != nil {
		return nil, err
	}
	cs := Settings{Names: [2]string{input, "output"}}
	if s != nil {
		cs.Method = s.Method
		if s.Names[0] != "" {
			cs.Names[0] = s.Names[0]
		}
		if s.Names[1] != "" {
			cs.Names[1] = s.Names[1]
		}
	}
	c, err := Cross(alpha, beta, maxLag, &cs)
	if err != nil {
		// The series are filtered ones: say so, and do not print the
		// rounding noise a filtered constant is made of.
		var ce *SeriesError
		if errors.As(err, &ce) && ce.Kind == ErrConstant {
			ce.Detail = "after the prewhitening filter of input " + strconv.Quote(input) +
				": the series itself is constant, or only a trend that the filter's differencing removes; its correlations are undefined"
		}
		return nil, err
	}
	scale := c.SDY / c.SDX
	se := scale / math.Sqrt(float64(c.N))
	w := &Weights{Input: input, V: make([]float64, maxLag+1), SE: make([]float64, maxLag+1), N: c.N, Corr: c}
	for k := 0; k <= maxLag; k++ {
		w.V[k] = c.At(k) * scale
		w.SE[k] = se
	}
	band := c.Band(0.95)
	for k := -maxLag; k < 0; k++ {
		if math.Abs(c.At(k)) > band {
			w.Feedback = append(w.Feedback, k)
		}
	}
	return w, nil
}

// NoiseSeries returns the preliminary noise series
//
//	n_t = y_t - sum_i sum_k v_ik x_i,t-k
//
// of an output y given the input series xs and their weights ws (same
// order). The sum needs x_i at t-k for every lag k of every input, so
// n_t is defined from start = the longest weight lag; noise has len(y)
// samples and holds NaN before start. Series must have equal lengths and
// finite values (*SeriesError of kind ErrLength, *SampleError), be longer
// than the longest lag (*SeriesError, ErrShort), and len(xs) must equal
// len(ws) (*SettingError).
func NoiseSeries(y []float64, xs [][]float64, ws []*Weights) (noise []float64, start int, err error) {
	r0, r1, err := noiseSeries(y, xs, ws)
	return r0, r1, withOp("ccf.NoiseSeries", err)
}

func noiseSeries(y []float64, xs [][]float64, ws []*Weights) (noise []float64, start int, err error) {
	if len(xs) != len(ws) {
		return nil, 0, &SettingError{Setting: "len(ws)", Value: strconv.Itoa(len(ws)), Rule: "must equal len(xs) = " + strconv.Itoa(len(xs))}
	}
	if err := checkSeries("output", y); err != nil {
		return nil, 0, err
	}
	for i, x := range xs {
		name := inputName(ws[i], i)
		if len(x) != len(y) {
			return nil, 0, lengthError("output", name, len(y), len(x))
		}
		if err := checkSeries(name, x); err != nil {
			return nil, 0, err
		}
		if ws[i] == nil {
			return nil, 0, &SettingError{Setting: "ws[" + strconv.Itoa(i) + "]", Value: "nil", Rule: "must be weights"}
		}
		for k, v := range ws[i].V {
			if !finite(v) {
				return nil, 0, &SampleError{Series: name + " weights", Index: k, Value: v}
			}
		}
		start = max(start, len(ws[i].V)-1)
	}
	if len(y) <= start {
		return nil, 0, shortError("output", len(y), start+1, "for the weights' lags")
	}
	noise = make([]float64, len(y))
	for t := 0; t < start; t++ {
		noise[t] = math.NaN()
	}
	copy(noise[start:], y[start:])
	for i, x := range xs {
		for k, v := range ws[i].V {
			if v == 0 {
				continue
			}
			dst := noise[start:]
			src := x[start-k : len(x)-k]
			for t := range dst {
				dst[t] -= v * src[t]
			}
		}
	}
	return noise, start, nil
}

func inputName(w *Weights, i int) string {
	if w != nil && w.Input != "" {
		return w.Input
	}
	return "input " + strconv.Itoa(i+1)
}
