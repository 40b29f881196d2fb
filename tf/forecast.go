package tf

import (
	"math"
	"strconv"

	"github.com/backshift/backshift/arma"
	"github.com/backshift/backshift/internal/filter"
	"github.com/backshift/backshift/internal/poly"
	"gonum.org/v1/gonum/stat/distuv"
)

// MaxHorizon is the largest forecast horizon h, in steps, accepted by
// Forecast. Forecast allocates about a dozen float64 series of length
// n+h and computes psi weights in O(h) per polynomial, so h is memory and
// time the caller pays for; 2^20 steps (about 8 MiB per series) is far
// past the horizon at which the forecast of a stationary model has
// settled on its mean and its interval on the unconditional variance, and
// past which an integrated model's interval is no longer informative,
// while a mistaken huge h (such as 1<<40) fails at once with an error
// instead of exhausting memory.
const MaxHorizon = 1 << 20

// InputModel is an ARMA model of an input's differenced series z_t =
// D_i(B) x_t, used to forecast the input when its future is not known:
//
//	AR(B) (z_t - Mean) = MA(B) e_t,  var(e_t) = Sigma2,
//
// AR and MA stored as ascending coefficients with constant term 1 (nil
// for 1), signs as stored. From an arma.Model m fitted to z_t itself
// (no further differencing, m.D = m.SD = 0), use InputModel{AR:
// m.ARPoly(), MA: m.MAPoly(), Mean: m.Mean, Sigma2: m.Sigma2}.
type InputModel struct {
	AR, MA []float64
	Mean   float64
	Sigma2 float64
}

// ForecastSettings tunes Forecast. The zero value (or nil) gives the
// defaults.
type ForecastSettings struct {
	// Level is the coverage of the intervals, in (0, 1). Zero means 0.95.
	Level float64
	// Future holds known future values of inputs (at least h values each,
	// for indices n..n+h-1). Inputs without an entry are forecast from
	// their own ARMA model.
	Future map[string][]float64
	// InputModels gives the ARMA model of an input to forecast it with.
	// Inputs with neither a Future nor a model get an autoregression
	// fitted to their differenced series by Yule-Walker with AIC order
	// choice (arma.YuleWalker).
	InputModels map[string]InputModel
}

// InputForecast describes how one input's future was obtained.
type InputForecast struct {
	// Series names the input; Known reports whether its future was given.
	Series string
	Known  bool
	// Model is the ARMA model used when not Known.
	Model InputModel
	// Values holds the input values used for indices n..n+h-1 (given or
	// forecast), in the input's original units.
	Values []float64
}

// Forecast is the result of (*Estimate).Forecast: forecasts of the
// output in its original units (undifferenced) for indices Origin ..
// Origin+h-1, Origin = n being the first index after the data.
type Forecast struct {
	Origin int
	// Mean, SE, Lower and Upper hold, for step j+1 at index j, the
	// minimum-mean-square-error forecast, its standard error and the
	// Level interval Mean -/+ z SE (normal quantile z).
	Mean, SE, Lower, Upper []float64
	Level                  float64
	// Inputs lists how every input's future was obtained, in model order.
	Inputs []InputForecast
}

// Forecast returns h-step forecasts of the output from the end of data
// (the series of the fit, or newer data with the same series; residuals
// are recomputed from data with the estimates and the fit's
// conditioning, including the steady pre-sample level of each input
// taken from the first sample of data). Inputs whose future is given in s.Future are used as
// known; the others are forecast from their own ARMA models and their
// forecast errors enter the variance.
//
// With psi_j the weights of theta(B)/(phi(B) D(B)) and, for an input
// forecast from AR_i(B) z = MA_i(B) e, psi*_ij the weights of
// omega_i(B) B^b_i MA_i(B) / (delta_i(B) AR_i(B) D(B)),
//
//	var(e_h) = sigma^2 sum_{j<h} psi_j^2 + sum_i sigma_i^2 sum_{j<h} psi*_ij^2,
//
// the noise and input innovations being independent; Sigma2 of the
// estimate is sigma^2. Point forecasts set future innovations to zero
// and integrate the differencing with the observed outputs.
//
// Errors: *ArgError for h < 1 or h > MaxHorizon, or a Level outside
// (0, 1); *FitError (BadFuture) for a Future shorter than h,
// *SampleError for a non-finite future value; the data errors of Fit.
//
// References: Box, G. E. P., Jenkins, G. M., Reinsel, G. C. and Ljung,
// G. M. (2015). Time Series Analysis, 5th ed., Wiley: the chapter on
// forecasting with transfer-function models.
func (e *Estimate) Forecast(data map[string][]float64, h int, s *ForecastSettings) (*Forecast, error) {
	var set ForecastSettings
	if s != nil {
		set = *s
	}
	if h < 1 {
		return nil, &ArgError{Arg: "h", Value: float64(h), Rule: "must be at least 1"}
	}
	if h > MaxHorizon {
		return nil, &ArgError{Arg: "h", Value: float64(h), Rule: "must be at most tf.MaxHorizon (" + strconv.Itoa(MaxHorizon) + " steps)"}
	}
	if set.Level == 0 {
		set.Level = 0.95
	}
	if !(set.Level > 0 && set.Level < 1) {
		return nil, &ArgError{Arg: "Level", Value: set.Level, Rule: "must lie in (0, 1)"}
	}
	w, err := fitPrepare(e.Model, data, FitSettings{IgnoreExtra: true, First: e.Conditioning.First})
	if err != nil {
		return nil, err
	}
	w.set(w.params())
	w.noiseSeries()
	w.resid()
	n := w.n
	L := n + h
	fc := &Forecast{Origin: n, Level: set.Level, Mean: make([]float64, h), SE: make([]float64, h),
		Lower: make([]float64, h), Upper: make([]float64, h)}
	dc := w.m.Diff.Coeffs()
	psiDen := poly.Mul(w.arC, dc)
	psi, err := poly.Divide(w.maC, psiDen, h)
	if err != nil {
		return nil, err
	}
	vr := make([]float64, h)
	acc := 0.0
	for j := 0; j < h; j++ {
		acc += psi[j] * psi[j]
		vr[j] = e.Sigma2 * acc
	}
	c := 0.0
	if w.m.Const != nil {
		c = w.m.Const.Value
	}
	what := make([]float64, h) // forecast of D(B) y
	for j := range what {
		what[j] = c
	}
	for i := range w.ins {
		fi := &w.ins[i]
		in := fi.in
		ifc := InputForecast{Series: in.Series}
		xe := make([]float64, L)
		copy(xe, fi.x)
		dx := in.Diff.Coeffs()
		if fut, ok := set.Future[in.Series]; ok {
			if len(fut) < h {
				return nil, &FitError{Problem: BadFuture, Series: in.Series, Len: len(fut), Want: h}
			}
			for j := 0; j < h; j++ {
				if v := fut[j]; math.IsNaN(v) || math.IsInf(v, 0) {
					return nil, &SampleError{Series: "future " + in.Series, Index: j, Value: v}
				}
			}
			copy(xe[n:], fut[:h])
			ifc.Known = true
		} else {
			im, ok := set.InputModels[in.Series]
			if !ok {
				yw, err := arma.YuleWalker(fi.z[fi.d:], 0)
				if err != nil {
					return nil, err
				}
				im = InputModel{AR: yw.Poly(), MA: []float64{1}, Mean: yw.Mean, Sigma2: yw.Var}
			}
			if len(im.AR) == 0 {
				im.AR = []float64{1}
			}
			if len(im.MA) == 0 {
				im.MA = []float64{1}
			}
			if im.AR[0] == 0 || im.MA[0] == 0 {
				return nil, &FitError{Problem: BadDenominator, Series: in.Series, Detail: "input model"}
			}
			ifc.Model = im
			zf := fcARMA(fi.z, fi.d, im, h)
			for j := 0; j < h; j++ {
				t := n + j
				v := zf[j]
				for k := 1; k < len(dx); k++ {
					v -= dx[k] * xe[t-k]
				}
				xe[t] = v / dx[0]
			}
			// Input forecast errors through omega B^b MA/(delta AR D).
			num := poly.Mul(poly.Shift(fi.numC, in.Delay), im.MA)
			den := poly.Mul(poly.Mul(fi.denC, im.AR), dc)
			ps, err := poly.Divide(num, den, h)
			if err != nil {
				return nil, err
			}
			acc := 0.0
			for j := 0; j < h; j++ {
				acc += ps[j] * ps[j]
				vr[j] += im.Sigma2 * acc
			}
		}
		ifc.Values = append([]float64(nil), xe[n:]...)
		fc.Inputs = append(fc.Inputs, ifc)
		// u over the extended series with the fitted filter, as in Fit.
		ze := fitDiff(xe, dx)
		for t := fi.d; t < L; t++ {
			ze[t] -= fi.z0
		}
		se := make([]float64, L)
		if in.Delay < L {
			filter.Run(se[in.Delay:], fitOne, fi.denC, ze[:L-in.Delay])
		}
		ue := make([]float64, L)
		fitFIR(ue, fi.numC, se, 0, false)
		for j := 0; j < h; j++ {
			what[j] += ue[n+j] + fi.gain*fi.z0
		}
	}
	// Noise forecast: phi(B) n_t = theta(B) a_t, future a = 0.
	ts, t0 := w.cond.NoiseStart, w.cond.First
	ne := make([]float64, L)
	copy(ne[ts:n], w.nn[ts:n])
	ae := make([]float64, L)
	copy(ae[t0:n], w.a[t0:n])
	for t := n; t < L; t++ {
		v := 0.0
		for k := 1; k < len(w.arC) && t-k >= 0; k++ {
			v -= w.arC[k] * ne[t-k]
		}
		for k := 1; k < len(w.maC) && t-k >= 0; k++ {
			v += w.maC[k] * ae[t-k]
		}
		ne[t] = v / w.arC[0]
		what[t-n] += ne[t]
	}
	// Integrate the differencing with the observed outputs.
	ye := make([]float64, L)
	copy(ye, w.y)
	for t := n; t < L; t++ {
		v := what[t-n]
		for k := 1; k < len(dc); k++ {
			v -= dc[k] * ye[t-k]
		}
		ye[t] = v / dc[0]
	}
	z := distuv.UnitNormal.Quantile(0.5 + set.Level/2)
	for j := 0; j < h; j++ {
		fc.Mean[j] = ye[n+j]
		fc.SE[j] = math.Sqrt(vr[j])
		fc.Lower[j] = fc.Mean[j] - z*fc.SE[j]
		fc.Upper[j] = fc.Mean[j] + z*fc.SE[j]
	}
	return fc, nil
}

// fcARMA forecasts z (valid from index d) h steps ahead from its ARMA
// model: innovations by filtering from d with zero pre-sample values,
// future innovations zero.
func fcARMA(z []float64, d int, im InputModel, h int) []float64 {
	n := len(z)
	zc := make([]float64, n+h)
	for t := d; t < n; t++ {
		zc[t] = z[t] - im.Mean
	}
	e := make([]float64, n+h)
	filter.Run(e[d:n], im.AR, im.MA, zc[d:n])
	out := make([]float64, h)
	for t := n; t < n+h; t++ {
		v := 0.0
		for k := 1; k < len(im.AR) && t-k >= d; k++ {
			v -= im.AR[k] * zc[t-k]
		}
		for k := 1; k < len(im.MA) && t-k >= d; k++ {
			v += im.MA[k] * e[t-k]
		}
		zc[t] = v / im.AR[0]
		out[t-n] = zc[t] + im.Mean
	}
	return out
}
