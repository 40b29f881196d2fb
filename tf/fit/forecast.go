package fit

import (
	"fmt"
	"maps"
	"math"
	"slices"
	"strconv"
	"strings"

	"github.com/backshift/backshift/arma"
	"github.com/backshift/backshift/internal/errs"
	"github.com/backshift/backshift/internal/filter"
	"github.com/backshift/backshift/internal/poly"
	"github.com/backshift/backshift/tf"
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
//	AR(B) (z_t - c) = MA(B) e_t,  var(e_t) = Sigma2,
//
// AR and MA stored as ascending coefficients with constant term 1 (nil
// for 1), signs as stored; C is the constant c, the level of z_t (the
// library's one name for a model's constant, as in a spec's "c"). From
// an arma.Model m fitted to z_t itself (no further differencing, m.D =
// m.SD = 0), use InputModel{AR: m.ARPoly(), MA: m.MAPoly(), C: its
// constant, Sigma2: m.Sigma2}.
type InputModel struct {
	AR, MA []float64
	C      float64
	Sigma2 float64
}

// ForecastSettings tunes Forecast. The zero value (or nil) gives the
// defaults.
type ForecastSettings struct {
	// Level is the coverage of the intervals, in (0, 1). Zero means 0.95.
	Level float64
	// Future holds known future values of inputs (at least h values each,
	// for indices n..n+h-1; values beyond h are not used). Inputs without
	// an entry are forecast from their own ARMA model. An entry for the
	// output is ignored (so that a map of all series' futures may be
	// passed); any other name that is not an input of the model is an
	// error (a misspelt name would otherwise leave the input to be
	// forecast silently).
	Future map[string][]float64
	// InputModels gives the ARMA model of an input to forecast it with
	// (see InputModel for what a usable model is). Inputs with neither a
	// Future nor a model get an autoregression fitted to their
	// differenced series by Yule-Walker with AIC order choice
	// (arma.YuleWalker). An input with both is taken as known (Future);
	// its model is still validated.
	InputModels map[string]InputModel
}

// Validate checks the settings by the library's settings rule and
// returns a *SettingError naming the field (ForecastSettings.Level, or
// ForecastSettings.InputModels["x"].AR for an unusable input model, see
// InputModel), or nil. What needs the model and the horizon (Future
// entries and their lengths, names that are not inputs) is checked by
// Forecast.
func (s ForecastSettings) Validate() (err error) {
	defer setOp("fit.ForecastSettings.Validate", &err)
	if err := errs.Probability("", "ForecastSettings.Level", s.Level, "0 means 0.95"); err != nil {
		return err
	}
	for _, name := range slices.Sorted(maps.Keys(s.InputModels)) {
		if err := s.InputModels[name].validate(name); err != nil {
			return err
		}
	}
	return nil
}

// validate reports a bad setting: the Level, a Future entry for a
// series that is neither an input nor the output of m, an InputModels
// entry for a series that is not an input, a Future shorter than h
// or holding a NaN, infinite or too large value, an unusable
// InputModel.
func (s ForecastSettings) validate(m tf.Model, h int) error {
	if err := errs.Probability("", "ForecastSettings.Level", s.Level, "0 means 0.95"); err != nil {
		return err
	}
	inputs := map[string]bool{}
	var names []string
	for _, in := range m.Inputs {
		inputs[in.Series] = true
		names = append(names, in.Series)
	}
	for _, name := range slices.Sorted(maps.Keys(s.Future)) {
		if name == m.Output {
			continue // the output's own future (say, held-out data) is not used
		}
		if !inputs[name] {
			return errs.UnknownInput("ForecastSettings.Future", name, names)
		}
		fut := s.Future[name]
		if len(fut) < h {
			return errs.Series(name, errs.ErrShort, len(fut), h, "its values in ForecastSettings.Future: one is needed for every step of the horizon")
		}
		for j, v := range fut[:h] {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				return &errs.SampleError{Series: "ForecastSettings.Future[" + name + "]", Index: j, Value: v}
			}
			if math.Abs(v) > MaxMagnitude {
				return &errs.SampleError{Series: "ForecastSettings.Future[" + name + "]", Index: j, Value: v, Limit: MaxMagnitude}
			}
		}
	}
	for _, name := range slices.Sorted(maps.Keys(s.InputModels)) {
		if !inputs[name] {
			return errs.UnknownInput("ForecastSettings.InputModels", name, names)
		}
		if err := s.InputModels[name].validate(name); err != nil {
			return err
		}
	}
	return nil
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
	// RecordMin and RecordMax are the smallest and largest value of the
	// input in the data the forecast starts from.
	RecordMin, RecordMax float64
}

// ForecastWarningKind classifies a ForecastWarning.
type ForecastWarningKind int

const (
	// PlanOutsideRecord: the known future values of an input leave the
	// range of that input seen in the data, so the forecast extrapolates
	// the model beyond what the record showed of it.
	PlanOutsideRecord ForecastWarningKind = iota + 1
	// UnsoundEstimate: the estimate fails one of the tests of
	// Estimate.Soundness, so the forecast inherits its faults.
	UnsoundEstimate
)

// String names the kind in a few words.
func (k ForecastWarningKind) String() string {
	switch k {
	case PlanOutsideRecord:
		return "planned input outside the record"
	case UnsoundEstimate:
		return "estimate not to be trusted"
	}
	return "ForecastWarningKind(" + strconv.Itoa(int(k)) + ")"
}

// ForecastWarning is one reason to doubt a forecast: its Kind, a
// sentence for people, and for PlanOutsideRecord the input and the two
// ranges.
type ForecastWarning struct {
	Kind    ForecastWarningKind
	Message string
	// Input names the input (PlanOutsideRecord).
	Input string
	// RecordMin, RecordMax are the range of the input in the data;
	// PlanMin, PlanMax that of its known future values (PlanOutsideRecord).
	RecordMin, RecordMax, PlanMin, PlanMax float64
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
	// Warnings lists reasons to doubt the forecast (known future inputs
	// outside the range of the record, an unsound estimate); empty when
	// none.
	Warnings []ForecastWarning
}

// Forecast returns h-step forecasts of the output from the end of data
// (the series of the fit, or newer data with the same series; residuals
// are recomputed from data with the estimates and the fit's own
// conditioning, Conditioning.First and Conditioning.ZeroPreSample: an
// input without differencing is taken as held at the first sample of
// data before it, or as zero when the fit took it so). Inputs whose
// future is given in s.Future are used as known; the others are
// forecast from their own ARMA models and their forecast errors enter
// the variance. The future of an event input (a step or a pulse at a
// known time) is known from the model and needs no Future, also when
// data are shorter than the fit's record and the event falls after
// their end, in the horizon (its size is the estimate's) or beyond it
// (its indicator is zero over the horizon).
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
// The result carries warnings (Forecast.Warnings) when a known future
// input leaves the range of that input in data (PlanOutsideRecord,
// naming the input and both ranges) and when the estimate is not sound
// (UnsoundEstimate, see Estimate.Soundness).
//
// An ExactML estimate forecasts the noise from the Kalman filter's state
// at the end of data (missing outputs skipped, also at the end):
// the conditional mean given every observed sample and its variance,
// which includes the uncertainty of the state where the last outputs
// are missing; the inputs' terms and their forecast errors are added
// as above.
//
// Errors (the shared shapes, Op "fit.Estimate.Forecast"): *SettingError
// for h < 1 or h > MaxHorizon, a bad ForecastSettings.Level or an
// unusable input model (ForecastSettings.InputModels["x"].AR, see
// InputModel); *ModelError for a nil estimate, a coefficient or Sigma2
// that is not finite; *SeriesError of kind ErrName for a Future or
// InputModels entry naming a series that is not an input, of kind
// ErrShort for a Future shorter than h; *SampleError for a future value
// that is not finite or above MaxMagnitude (Series "future x"); the
// data errors of Model; *SeriesError of kind ErrOverflow when the
// residuals or the forecast overflow float64 (never NaN or infinite
// numbers with a nil error); *StageError wrapping the error of the
// automatic input autoregression.
//
// References: Box, G. E. P., Jenkins, G. M., Reinsel, G. C. and Ljung,
// G. M. (2015). Time Series Analysis, 5th ed., Wiley: the chapter on
// forecasting with transfer-function models.
func (e *Estimate) Forecast(data map[string][]float64, h int, s *ForecastSettings) (_ *Forecast, err error) {
	defer setOp("fit.Estimate.Forecast", &err)
	defer errs.Recover("fit.Estimate.Forecast", &err)
	var set ForecastSettings
	if s != nil {
		set = *s
	}
	if err := e.checkForecast(data, h, &set); err != nil {
		return nil, err
	}
	if set.Future, err = eventFutures(e, set.Future, len(data[e.Model.Output]), h); err != nil {
		return nil, err
	}
	if fc, done, err := e.forecastEventsAhead(data, h, set); done || err != nil {
		return fc, err
	}
	if e.Method == ExactML {
		return e.forecastML(data, h, set)
	}
	w, err := e.residualsForForecast(data)
	if err != nil {
		return nil, err
	}
	n := w.n
	fc := &Forecast{Origin: n, Level: set.Level, Mean: make([]float64, h), SE: make([]float64, h),
		Lower: make([]float64, h), Upper: make([]float64, h)}
	dc := w.m.Diff.Coeffs()
	vr, err := noiseErrorVariance(w.arC, w.maC, dc, e.Sigma2, h)
	if err != nil {
		return nil, err
	}
	c := 0.0
	if w.m.Const != nil {
		c = w.m.Const.Value
	}
	what := make([]float64, h) // forecast of D(B) y
	for j := range what {
		what[j] = c
	}
	if err := fc.addInputs(w, set, n, h, dc, vr, what); err != nil {
		return nil, err
	}
	w.addNoiseForecast(what)
	ye := integrate(w.y, what, dc)
	if err := fc.setIntervals(ye[n:], vr, e); err != nil {
		return nil, err
	}
	if bad := e.Soundness(); len(bad) > 0 {
		fc.Warnings = append(fc.Warnings, ForecastWarning{Kind: UnsoundEstimate,
			Message: "the estimate is not to be trusted, nor forecasts from it: " + strings.Join(bad, "; ")})
	}
	return fc, nil
}

// forecastEventsAhead forecasts with the events still ahead of data's
// end passed on as known series (done true), or does nothing (done
// false) when e has no such event.
func (e *Estimate) forecastEventsAhead(data map[string][]float64, h int, set ForecastSettings) (fc *Forecast, done bool, err error) {
	if !hasEvents(e.Model) {
		return nil, false, nil
	}
	e2, d2, err := eventsAhead(e, data, len(data[e.Model.Output]))
	if err != nil || e2 == e {
		return nil, err != nil, err
	}
	if fc, err = e2.Forecast(d2, h, &set); err != nil {
		return nil, true, err
	}
	dropEventPlanWarnings(e.Model, fc)
	return fc, true, nil
}

// checkForecast checks the horizon, the estimate, the settings (setting
// the default Level) and the data against the estimate's conditioning.
func (e *Estimate) checkForecast(data map[string][]float64, h int, set *ForecastSettings) error {
	if h < 1 {
		return errs.Setting("h", strconv.Itoa(h), "the horizon must be at least 1")
	}
	if h > MaxHorizon {
		return errs.Setting("h", strconv.Itoa(h), "the horizon must be at most tf.MaxHorizon ("+strconv.Itoa(MaxHorizon)+" steps)")
	}
	if err := estimateUsable("Forecast", e); err != nil {
		return err
	}
	if math.IsNaN(e.Sigma2) || math.IsInf(e.Sigma2, 0) || e.Sigma2 < 0 {
		return estimateErr("Sigma2", e.Sigma2, "the noise variance must be zero or positive and finite")
	}
	if err := set.validate(e.Model, h); err != nil {
		return err
	}
	if set.Level == 0 {
		set.Level = 0.95
	}
	return condCheck(e, data)
}

// residualsForForecast recomputes the series of the estimate on data with
// its conditioning (u_i, n_t, a_t at the estimates) and refuses residuals
// that are not finite.
func (e *Estimate) residualsForForecast(data map[string][]float64) (*work, error) {
	w, err := newWork(e.Model, data, Settings{IgnoreExtra: true, First: e.Conditioning.First, ZeroPreSample: e.Conditioning.ZeroPreSample, Start: e.Conditioning.Start, InputGaps: e.Conditioning.InputGaps})
	if err != nil {
		return nil, err
	}
	w.set(w.params())
	w.noiseSeries()
	w.resid()
	for t := w.cond.First; t < w.n; t++ {
		if v := w.a[t]; math.IsNaN(v) || math.IsInf(v, 0) {
			return nil, overflowErr("residuals", t, v, divergeHint(e))
		}
	}
	return w, nil
}

// noiseErrorVariance returns the variance of the noise's forecast error
// at steps 1..h, sigma2 times the partial sums of the squared psi weights
// of theta(B)/(phi(B) D(B)).
func noiseErrorVariance(arC, maC, dc []float64, sigma2 float64, h int) ([]float64, error) {
	psi, err := poly.Divide(maC, poly.Mul(arC, dc), h)
	if err != nil {
		return nil, &errs.ModelError{Part: "noise of the estimate", Problem: "its psi weights do not exist (" + err.Error() + "): the noise AR polynomial times the differencing must have a non-zero constant term", Err: err}
	}
	vr := make([]float64, h)
	acc := 0.0
	for j := 0; j < h; j++ {
		acc += psi[j] * psi[j]
		vr[j] = sigma2 * acc
	}
	return vr, nil
}

// addInputs adds every input's forecast term over the horizon h after n
// samples to what (the forecast of D(B) y, dc the coefficients of D)
// and its forecast-error variance to vr (forecastInput), and records
// each input's forecast and warning in fc.
func (fc *Forecast) addInputs(w *work, set ForecastSettings, n, h int, dc, vr, what []float64) error {
	for i := range w.ins {
		ifc, warn, err := forecastInput(&w.ins[i], set, n, h, dc, vr, what)
		if err != nil {
			return err
		}
		if warn != nil {
			fc.Warnings = append(fc.Warnings, *warn)
		}
		fc.Inputs = append(fc.Inputs, ifc)
	}
	return nil
}

// forecastInput extends input fi over the horizon (its planned future
// from set.Future, or a forecast by its input model), adds its
// contribution to what (the forecast of D(B) y) and, for a forecast
// input, its forecast-error variance to vr. The warning is non-nil for a
// plan outside the range of the record.
func forecastInput(fi *inputState, set ForecastSettings, n, h int, dc, vr, what []float64) (InputForecast, *ForecastWarning, error) {
	in := fi.in
	L := n + h
	ifc := InputForecast{Series: in.Series}
	ifc.RecordMin, ifc.RecordMax = valueRange(fi.x)
	xe := make([]float64, L)
	copy(xe, fi.x)
	var warn *ForecastWarning
	if fut, ok := set.Future[in.Series]; ok {
		copy(xe[n:], fut[:h])
		ifc.Known = true
		if lo, hi := valueRange(fut[:h]); n > 0 && (lo < ifc.RecordMin || hi > ifc.RecordMax) {
			warn = &ForecastWarning{Kind: PlanOutsideRecord, Input: in.Series,
				RecordMin: ifc.RecordMin, RecordMax: ifc.RecordMax, PlanMin: lo, PlanMax: hi,
				Message: fmt.Sprintf("input %q: the planned values span %s .. %s, outside the range %s .. %s seen in the record; the forecast extrapolates the model beyond what the data showed of it",
					in.Series, formatSig(lo, 6), formatSig(hi, 6), formatSig(ifc.RecordMin, 6), formatSig(ifc.RecordMax, 6))}
		}
	} else {
		im, err := inputModelFor(fi, set)
		if err != nil {
			return ifc, nil, err
		}
		ifc.Model = im
		if err := predictInput(fi, im, xe, n, h, dc, vr); err != nil {
			return ifc, nil, err
		}
	}
	ifc.Values = append([]float64(nil), xe[n:]...)
	// u over the extended series with the fitted filter, as in Model.
	ze := applyDiff(xe, in.Diff.Coeffs())
	for t := fi.d; t < L; t++ {
		ze[t] -= fi.z0
	}
	se := make([]float64, L)
	if in.Delay < L {
		filter.Run(se[in.Delay:], unitPoly, fi.denC, ze[:L-in.Delay])
	}
	ue := make([]float64, L)
	fir(ue, fi.numC, se, 0, false)
	for j := 0; j < h; j++ {
		what[j] += ue[n+j] + fi.gain*fi.z0
	}
	return ifc, warn, nil
}

// inputModelFor returns the model that forecasts input fi: the one in
// set.InputModels, or an autoregression fitted to its differenced
// values by Yule-Walker, with empty polynomials as 1 and copies of the
// caller's coefficients.
func inputModelFor(fi *inputState, set ForecastSettings) (InputModel, error) {
	im, ok := set.InputModels[fi.in.Series]
	if !ok {
		yw, err := arma.YuleWalker(fi.z[fi.d:], 0)
		if err != nil {
			return im, &StageError{Stage: fmt.Sprintf("fitting an autoregression to forecast input %q (give its future in ForecastSettings.Future or a model in ForecastSettings.InputModels)", fi.in.Series), Err: err}
		}
		im = InputModel{AR: yw.Poly(), MA: []float64{1}, C: yw.Mean, Sigma2: yw.Var}
	}
	if len(im.AR) == 0 {
		im.AR = []float64{1}
	}
	if len(im.MA) == 0 {
		im.MA = []float64{1}
	}
	im.AR = append([]float64(nil), im.AR...)
	im.MA = append([]float64(nil), im.MA...)
	return im, nil
}

// predictInput writes the forecast of input fi by im into xe[n:n+h]
// (integrating its differencing) and adds its forecast errors, carried
// through omega B^b MA/(delta AR D), to vr.
func predictInput(fi *inputState, im InputModel, xe []float64, n, h int, dc, vr []float64) error {
	in := fi.in
	dx := in.Diff.Coeffs()
	zf := forecastARMA(fi.z, fi.d, im, h)
	for j := 0; j < h; j++ {
		t := n + j
		v := zf[j]
		for k := 1; k < len(dx); k++ {
			v -= dx[k] * xe[t-k]
		}
		xe[t] = v / dx[0]
		if math.IsNaN(xe[t]) || math.IsInf(xe[t], 0) {
			return overflowErr("forecast of input "+strconv.Quote(in.Series), t, xe[t],
				"the input's forecast overflowed float64; give its future in ForecastSettings.Future or a stationary model in ForecastSettings.InputModels, or shorten the horizon")
		}
	}
	num := poly.Mul(poly.Shift(fi.numC, in.Delay), im.MA)
	den := poly.Mul(poly.Mul(fi.denC, im.AR), dc)
	ps, err := poly.Divide(num, den, h)
	if err != nil {
		return &errs.ModelError{Part: "input " + strconv.Quote(in.Series), Problem: "the psi weights of its forecast errors do not exist (" + err.Error() + "): its denominator, its input model's AR and the differencing must have non-zero constant terms", Err: err}
	}
	acc := 0.0
	for j := 0; j < h; j++ {
		acc += ps[j] * ps[j]
		vr[j] += im.Sigma2 * acc
	}
	return nil
}

// integrate returns y extended by the forecast what of D(B) y,
// integrating the differencing dc with the observed outputs.
func integrate(y, what, dc []float64) []float64 {
	n := len(y)
	L := n + len(what)
	ye := make([]float64, L)
	copy(ye, y)
	for t := n; t < L; t++ {
		v := what[t-n]
		for k := 1; k < len(dc); k++ {
			v -= dc[k] * ye[t-k]
		}
		ye[t] = v / dc[0]
	}
	return ye
}

// setIntervals sets the forecast means (mean), standard errors (from
// the variances vr) and limits at fc.Level, and refuses a value that
// overflowed.
func (fc *Forecast) setIntervals(mean, vr []float64, e *Estimate) error {
	n := fc.Origin
	z := distuv.UnitNormal.Quantile(0.5 + fc.Level/2)
	for j := range mean {
		fc.Mean[j] = mean[j]
		fc.SE[j] = math.Sqrt(vr[j])
		fc.Lower[j] = fc.Mean[j] - z*fc.SE[j]
		fc.Upper[j] = fc.Mean[j] + z*fc.SE[j]
		for _, r := range []struct {
			name string
			v    float64
		}{{"forecast mean", fc.Mean[j]}, {"forecast standard error", fc.SE[j]}, {"lower forecast limit", fc.Lower[j]}, {"upper forecast limit", fc.Upper[j]}} {
			if math.IsNaN(r.v) || math.IsInf(r.v, 0) {
				return overflowErr(r.name, n+j, r.v,
					fmt.Sprintf("the forecast overflowed float64 at step %d; %s", j+1, divergeHint(e)))
			}
		}
	}
	return nil
}

// valueRange returns the smallest and largest value of x (0, 0 when empty).
func valueRange(x []float64) (lo, hi float64) {
	if len(x) == 0 {
		return 0, 0
	}
	lo, hi = x[0], x[0]
	for _, v := range x {
		lo, hi = math.Min(lo, v), math.Max(hi, v)
	}
	return lo, hi
}

// forecastARMA forecasts z (valid from index d) h steps ahead from its ARMA
// model: innovations by filtering from d with zero pre-sample values,
// future innovations zero.
func forecastARMA(z []float64, d int, im InputModel, h int) []float64 {
	n := len(z)
	zc := make([]float64, n+h)
	for t := d; t < n; t++ {
		zc[t] = z[t] - im.C
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
		out[t-n] = zc[t] + im.C
	}
	return out
}
