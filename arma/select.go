package arma

import (
	"context"
	"errors"
	"fmt"
	"math"
	"runtime"
	"runtime/debug"
	"sort"
	"strconv"
	"sync"
)

// Criterion is the information criterion that ranks candidate orders.
type Criterion int

const (
	// ByBIC ranks by the Bayesian (Schwarz) criterion, the default, as
	// identify.Candidates ranks: its penalty, log(N) per parameter, grows with
	// the record, so that on long records it does not keep adding
	// coefficients that barely lower the sum of squares (a noise model
	// for a controller should be small).
	ByBIC Criterion = iota
	// ByAICc ranks by the small-sample corrected AIC.
	ByAICc
	// ByAIC ranks by Akaike's criterion.
	ByAIC
)

// String returns the criterion's usual name ("AICc", "BIC", "AIC").
func (c Criterion) String() string {
	switch c {
	case ByAICc:
		return "AICc"
	case ByBIC:
		return "BIC"
	case ByAIC:
		return "AIC"
	}
	return "Criterion(" + itoa(int(c)) + ")"
}

// Grid is the set of orders Select tries: every (p, q) with 0 <= p <=
// MaxP and 0 <= q <= MaxQ, with the same differencing D and seasonal part
// (SP, SD, SQ, Period) for all.
type Grid struct {
	// MaxP and MaxQ bound the ordinary AR and MA orders tried.
	MaxP, MaxQ int
	// D is the ordinary differencing of every candidate.
	D int
	// SP, SD, SQ and Period give the seasonal part of every candidate.
	SP, SD, SQ int
	Period     int
	// Criterion ranks the candidates (default ByBIC).
	Criterion Criterion
	// Workers bounds the number of fits run at once; zero means
	// runtime.GOMAXPROCS(0), negative is a *SettingError.
	Workers int
}

// OrderFit is one fitted order of a Select grid: the order, its fit and
// the value of the criterion that ranked it.
type OrderFit struct {
	Order Order
	// Criterion is the criterion Score is a value of.
	Criterion Criterion
	// Score is the criterion value (+Inf when the fit failed).
	Score float64
	// Result is the fit (nil when Err is not a *ConvergenceError).
	Result *Result
	// Err is the fit's error, nil on success.
	Err error
}

// Select fits every order of the grid to y with Fit (opt for every
// candidate: conditional least squares by default, exact maximum
// likelihood with opt.Method ExactML) on a bounded number of goroutines
// and returns all candidates ranked: converged fits by increasing score,
// then converged fits with boundary flags (roots on or outside the unit
// circle: typically cancelling, over-parameterised models), then fits
// that stopped without converging, then failures.
//
// So that the criteria compare likelihoods of the same residuals, every
// least-squares candidate sums its residuals from the same index: the
// largest default start of the grid (MaxP + SP*Period + D + SD*Period),
// or opt.First if larger. Under ExactML every candidate's likelihood
// is that of all observed samples (the common index sets only the
// least-squares start), and NaN samples are missing values, skipped
// exactly.
//
// The error is a *SettingError for an invalid grid or settings
// (Grid.Validate, FitSettings.Validate), the *SampleError of Fit for an
// infinite or too large sample, or a NaN one under least squares
// (no candidate is fitted), ctx's error when ctx is done (candidates
// fitted so far are still returned), and, when no candidate produced a
// result at all (a series too short or constant, for example),
// the error of the first candidate, with all candidates returned. A panic
// in a fit (a bug) is recovered on its worker goroutine into an
// *InternalError, which is that candidate's Err and, with all candidates,
// Select's error.
func Select(ctx context.Context, y []float64, g Grid, opt *FitSettings) (fits []OrderFit, err error) {
	defer withOp("arma.Select", &err)
	return selectOrders(ctx, y, g, opt, fit)
}

// orderFit fits one order of a grid: fit, or in a test a function that
// injects a fault on the worker goroutine.
type orderFit func(ctx context.Context, y []float64, ord Order, opt *FitSettings) (*Result, error)

// selectOrders is Select with the function that fits each candidate.
func selectOrders(ctx context.Context, y []float64, g Grid, opt *FitSettings, fitOrder orderFit) ([]OrderFit, error) {
	if ctx == nil {
		ctx = context.Background()
	}
	if err := g.validate(); err != nil {
		return nil, err
	}
	if err := opt.validate(); err != nil {
		return nil, err
	}
	var o FitSettings
	if opt != nil {
		o = *opt
	}
	if err := checkSelectSeries(y, o); err != nil {
		return nil, err
	}
	s := max(g.Period, 1)
	o.First = max(o.First, g.MaxP+g.SP*s+g.D+g.SD*s)
	cands := g.candidates()
	cerr := fitAll(ctx, y, cands, o, g, fitOrder)
	if cerr == nil {
		cerr = gridErr(cands)
	}
	sort.SliceStable(cands, func(i, j int) bool {
		ri, rj := rank(cands[i]), rank(cands[j])
		if ri != rj {
			return ri < rj
		}
		return cands[i].Score < cands[j].Score
	})
	return cands, cerr
}

// checkSelectSeries checks y once for every candidate as Fit would:
// NaN samples are missing values under ExactML (checkInputsML) and a
// *SampleError under least squares, as infinite or too large ones are.
func checkSelectSeries(y []float64, o FitSettings) error {
	if o.Method == ExactML {
		return checkInputsML(y, o)
	}
	return checkFinite(o.Name, y)
}

// candidates lists the orders of the grid, p and then q increasing.
func (g Grid) candidates() []OrderFit {
	var cands []OrderFit
	for p := 0; p <= g.MaxP; p++ {
		for q := 0; q <= g.MaxQ; q++ {
			cands = append(cands, OrderFit{Order: Order{P: p, D: g.D, Q: q, SP: g.SP, SD: g.SD, SQ: g.SQ, Period: g.Period}, Criterion: g.Criterion})
		}
	}
	return cands
}

// fitAll fits every candidate with fitOrder on Grid.Workers goroutines
// (default GOMAXPROCS) and returns ctx's error when ctx is done
// (candidates not started get it as their Err, with a score of +Inf).
func fitAll(ctx context.Context, y []float64, cands []OrderFit, o FitSettings, g Grid, fitOrder orderFit) error {
	workers := g.Workers
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	jobs := make(chan int)
	var wg sync.WaitGroup
	for w := 0; w < min(workers, len(cands)); w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := range jobs {
				selectOne(ctx, y, &cands[i], o, g.Criterion, fitOrder)
			}
		}()
	}
	var cerr error
feed:
	for i := range cands {
		select {
		case jobs <- i:
		case <-ctx.Done():
			cerr = ctx.Err()
			for j := i; j < len(cands); j++ {
				cands[j].Err, cands[j].Score = cerr, math.Inf(1)
			}
			break feed
		}
	}
	close(jobs)
	wg.Wait()
	if cerr == nil {
		cerr = ctx.Err()
	}
	return cerr
}

// gridErr returns Select's error from its fitted candidates: the first
// recovered panic (a bug that must not pass unseen), else the error of
// the first candidate when no candidate produced a result, else nil.
func gridErr(cands []OrderFit) error {
	for _, c := range cands {
		var ie *InternalError
		if errors.As(c.Err, &ie) {
			return c.Err
		}
	}
	for _, c := range cands {
		if c.Result != nil {
			return nil
		}
	}
	return cands[0].Err
}

// selectOne fits one candidate of Select with fitOrder on a worker
// goroutine. A panic (a bug) is recovered into an *InternalError in
// c.Err, so that it cannot end the caller's process.
func selectOne(ctx context.Context, y []float64, c *OrderFit, o FitSettings, crit Criterion, fitOrder orderFit) {
	defer func() {
		if r := recover(); r != nil {
			c.Result, c.Score = nil, math.Inf(1)
			c.Err = &InternalError{Op: "arma.Select", Value: "fit of order " + c.Order.String() + " to " + seriesName(o.Name) + ": " + fmt.Sprint(r), Stack: debug.Stack()}
		}
	}()
	res, err := fitOrder(ctx, y, c.Order, &o)
	c.Result, c.Err, c.Score = res, err, math.Inf(1)
	if res != nil {
		c.Score = score(res, crit)
	}
}

func score(r *Result, c Criterion) float64 {
	switch c {
	case ByBIC:
		return r.BIC
	case ByAICc:
		return r.AICc
	}
	return r.AIC
}

// String prints the fitted order and its criterion by name, as
// "ARIMA(1,0,1) BIC 1234.56", or the error of a failed fit.
func (c OrderFit) String() string {
	s := "ARIMA" + c.Order.String()
	if c.Err != nil && c.Result == nil {
		return s + " failed: " + c.Err.Error()
	}
	s += " " + c.Criterion.String() + " " + strconv.FormatFloat(c.Score, 'f', 2, 64)
	if c.Err != nil {
		s += " (" + c.Err.Error() + ")"
	}
	return s
}

func rank(c OrderFit) int {
	if c.Err == nil {
		if len(c.Result.Boundary) > 0 {
			return 1
		}
		return 0
	}
	var ce *ConvergenceError
	if errors.As(c.Err, &ce) {
		return 2
	}
	return 3
}
