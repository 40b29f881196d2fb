package identify

import (
	"context"
	"errors"
	"fmt"
	"math"
	"runtime"
	"runtime/debug"
	"slices"
	"sort"
	"strconv"
	"strings"
	"sync"

	"github.com/backshift/backshift/arma"
	"github.com/backshift/backshift/ccf"
	"github.com/backshift/backshift/internal/errs"
	"github.com/backshift/backshift/internal/filter"
	"github.com/backshift/backshift/internal/sym"
	"github.com/backshift/backshift/prewhiten"
	"github.com/backshift/backshift/tf"
	"github.com/backshift/backshift/tf/fit"
)

// Settings tunes Candidates. The zero value (or nil) gives the
// defaults.
type Settings struct {
	// OutputDiff is the differencing D(B) of the output, ascending powers
	// of B ({1, -1} for 1 - B); nil for none.
	OutputDiff []float64
	// InputDiff gives the differencing of each input by name; an input
	// without an entry is differenced like the output (the usual
	// practice, so that both sides of the model are stationary). A name
	// that is not an input is a *SeriesError of kind ErrName. Every differencing
	// operator (OutputDiff too) must have finite coefficients, constant
	// term 1 and a degree below half the record.
	InputDiff map[string][]float64
	// MaxLag is the largest lag of the impulse-response weights. Zero
	// means max(10, min(36, n/6)).
	MaxLag int
	// MaxR and MaxS bound the denominator and numerator degrees tried
	// (ccf.Identify); zero means 2, a negative value order zero only.
	MaxR, MaxS int
	// Forms is the number of (b, r, s) forms kept per input; zero
	// means 2.
	Forms int
	// MaxP and MaxQ bound the noise AR and MA orders tried
	// (prewhiten.IdentifyNoise); zero means 2 and a negative value
	// means order zero only (no AR, or no MA, part).
	//
	// The rule for every number of Settings: zero means the
	// default; a negative count (MaxLag, Forms, NoiseOrders,
	// MaxCandidates, Workers) is a *SettingError naming the field, while a
	// negative order bound (MaxR, MaxS, MaxP, MaxQ) means order zero
	// only, as in packages ccf and prewhiten.
	MaxP, MaxQ int
	// NoiseOrders is the number of noise orders kept; zero means 2.
	NoiseOrders int
	// MaxCandidates caps the number of models fitted; zero means 24.
	MaxCandidates int
	// ByAIC ranks the candidates by AIC instead of BIC.
	ByAIC bool
	// Workers is the number of concurrent fits; zero means GOMAXPROCS.
	Workers int
	// NoSettle keeps the automatic first residual index. By default the
	// common first index is moved past the start-up transient of the
	// preliminary fit's input poles (ln 0.01 / ln |z|max samples, see
	// fit.Settings.Settle), capped at n/10, which keeps a transient of
	// the pre-sample assumption (typical of closed-loop records) out of
	// the noise model.
	NoSettle bool
	// NoRefine skips the refinement rounds, in which the lower-order
	// neighbours of the best fit (one numerator, denominator or noise
	// coefficient fewer, started from its estimates) are fitted and
	// ranked with the others, again from the new best while the score
	// improves (at most 4 rounds).
	NoRefine bool
	// Progress, when not nil, is called after every fit with the
	// number of fits done and the number planned (which may grow by the
	// second round); calls do not overlap.
	Progress func(done, total int)
	// Fit and Check are passed to fit.Model and fit.Check for every candidate
	// (Fit.First is overridden so that all candidates sum the same
	// residuals); their bad fields are reported as
	// Settings.Fit.X and Settings.Check.X.
	Fit   *fit.Settings
	Check *fit.CheckSettings
}

// Candidate is one model structure proposed by Candidates, fitted
// and checked, with its place in the ranking.
type Candidate struct {
	// Rank is the position in the ranking, 1 for the best.
	Rank int
	// Structure is the model as proposed: its dead times, orders and
	// coefficient names, the free coefficients holding the start values
	// the identification gave them. The fitted model, with the
	// estimates, is Estimate.Model.
	Structure tf.Model
	// Estimate is the fit (nil when Err is not nil) and Diagnostics its
	// checks (nil when they could not run; CheckErr says why).
	Estimate    *fit.Estimate
	Diagnostics *fit.Diagnostics
	CheckErr    error
	// Criterion names the ranking criterion, "BIC" (or "AIC" with
	// Settings.ByAIC), and Score is its value for this fit,
	// +Inf when the fit failed; lower is better.
	Criterion string
	Score     float64
	// Err is the fit's error, nil on success: a typed error of fit.Model, a
	// *ModelError when the criterion is not a finite number (so that
	// such a fit is never ranked first), an *InternalError when the fit
	// or its checks panicked, or ctx's error. Candidates with an Err are
	// ranked last, their reason kept here.
	Err error
	// Identification holds, per input, what the identification saw:
	// the impulse-response weights, dead time and ranked forms
	// (ccf.Identify). It is shared by all candidates of one call and
	// must not be modified.
	Identification []*ccf.Identification
}

// Label describes the candidate's structure in a few words, for
// example "valve (b=3, r=1, s=0), outdoor (b=1, r=1, s=0), noise
// ARMA(1, 1)" (see StructureLabel).
func (c Candidate) Label() string { return tf.StructureLabel(c.Structure) }

// String returns a one-line summary (rank, criterion by name and value,
// structure) followed by the fit's and the checks' reports.
func (c Candidate) String() string {
	if c.Err != nil || c.Estimate == nil {
		return fmt.Sprintf("#%d %s\n  fit failed: %v\n", c.Rank, c.Label(), c.Err)
	}
	crit := c.Criterion
	if crit == "" {
		crit = "criterion"
	}
	s := fmt.Sprintf("#%d %s %.2f  %s\n", c.Rank, crit, c.Score, c.Label()) + c.Estimate.String()
	if c.Diagnostics != nil {
		s += c.Diagnostics.String()
	} else if c.CheckErr != nil {
		s += "checks failed to run: " + c.CheckErr.Error() + "\n"
	}
	return s
}

// Candidates goes from named series to a ranked list of fitted candidate
// models in one call, by the steps set out in the package doc: output
// names the output series and inputs the input series of data (all of
// one length, index 0 oldest); s may be nil for the defaults. data is not
// modified. The candidates are returned ranked by BIC (or AIC), failed
// fits last; each carries its estimate, its checks and its report.
//
// Coefficients are named w0.., d1.. (with the input name and "_" before
// them when there are several inputs), phi1.., theta1.. and c.
//
// Errors (the shared shapes, Op "identify.Candidates"): the data errors of fit.Model;
// for missing (NaN) samples of the output or an input, a *SampleError
// of the first joined with a *SeriesError of kind ErrSample that lists
// the gaps and names the longest gap-free stretch (see GapFree and the
// package doc, "Records with gaps"); a *SampleError for an infinite
// sample or one above 1e140 in magnitude and a
// *SeriesError of kind ErrConstant for a series that varies by less
// than 1e-140 (rescale it); a *SeriesError of kind ErrName for an input
// listed twice, empty or equal to the output, or a name a spec cannot
// hold; a *SettingError (or a *SeriesError of kind ErrName for an
// InputDiff entry that is not an input) for a bad setting (see
// Settings); a *SeriesError of kind ErrConstant naming the
// series when the output or an input is
// constant (after its differencing); *fit.StageError wrapping the errors of
// packages prewhiten and ccf, with the step and series in the caller's
// words, when an input shows no response (*ccf.NoResponseError) or a
// series is too short; when every candidate failed, the best-ranked
// candidate's error. When ctx is done, Candidates stops and returns ctx's
// error with the candidates fitted so far (ranked, possibly none). A
// prewhitening filter that leaves the input visibly coloured does not
// stop the identification.
func Candidates(ctx context.Context, output string, inputs []string, data map[string][]float64, s *Settings) (cands []Candidate, err error) {
	// Over 60 lines as the one place where the stages read in order
	// (checks, defaults, forms, noise orders, candidates, fits,
	// refinement, ranking); each stage is a function of its own.
	defer setOp("identify.Candidates", &err)
	defer func() {
		if r := recover(); r != nil {
			cands, err = nil, &errs.InternalError{Op: "identify.Candidates", Value: r, Stack: debug.Stack()}
		}
	}()
	var set Settings
	if s != nil {
		set = *s
	}
	if ctx == nil {
		ctx = context.Background()
	}
	if err := validateData(output, inputs, data); err != nil {
		return nil, err
	}
	if err := set.validate(append([]string{}, inputs...), len(data[output])); err != nil {
		return nil, err
	}
	set.fillDefaults()
	diffs, err := inputDiffs(output, inputs, data, set)
	if err != nil {
		return nil, err
	}
	outDiff := sym.FromCoeffs(set.OutputDiff)
	if len(set.OutputDiff) <= 1 {
		outDiff = tf.Poly{}
	}
	// Faults of the record that may explain a failed stage.
	hints := recordHints(output, data[output])
	forms, scores, ids, err := inputForms(output, inputs, data, diffs, set, hints)
	if err != nil {
		return nil, err
	}
	fs := set.settingsOfFits()
	pre := tf.Model{Output: output, Diff: outDiff, Const: &tf.Coef{Name: "c", Free: true}, Noise: &arma.Noise{}}
	for i := range inputs {
		pre.Inputs = append(pre.Inputs, forms[i][0]) // the best form of each input
	}
	noises, settleFirst, err := noiseOrders(ctx, pre, data, fs, set)
	if err != nil {
		return nil, err
	}
	models := candidateModels(output, outDiff, forms, formCombos(scores, set.MaxCandidates), noises, set.MaxCandidates)
	fs.First = max(commonFirst(models, data, fs.First), settleFirst)
	total := len(models)
	if !set.NoRefine {
		total += 2 * (len(inputs) + 1)
	}
	prog := &progress{fn: set.Progress, total: total}
	out := scoreCandidates(ctx, models, data, fs, set, prog)
	if !set.NoRefine {
		out = refineNeighbours(ctx, out, models, data, fs, set, prog)
	}
	rank(out, ids)
	if err := ctx.Err(); err != nil {
		return out, err
	}
	if len(out) > 0 && out[0].Err != nil {
		return out, out[0].Err
	}
	return out, nil
}

// settingsOfFits returns the settings of Candidates' fits: set.Fit, with
// extra series in the data allowed.
func (set Settings) settingsOfFits() fit.Settings {
	fs := fit.Settings{IgnoreExtra: true}
	if set.Fit != nil {
		fs = *set.Fit
		fs.IgnoreExtra = true
	}
	return fs
}

// recordHints returns the messages of the faults screened in the output
// y (named output), which may explain a failed stage of Candidates.
func recordHints(output string, y []float64) []string {
	var hints []string
	for _, w := range fit.Screen(output, y) {
		hints = append(hints, w.Message)
	}
	return hints
}

// rank sorts the candidates by score (stable, so ties keep their order),
// numbers them from 1, attaches the identifications and sets the Op of
// their errors.
func rank(out []Candidate, ids []*ccf.Identification) {
	sort.SliceStable(out, func(i, j int) bool { return out[i].Score < out[j].Score })
	for i := range out {
		out[i].Rank = i + 1
		out[i].Identification = ids
		setOp("identify.Candidates", &out[i].Err)
		setOp("identify.Candidates", &out[i].CheckErr)
	}
}

// fillDefaults replaces the zero values of the settings Candidates reads
// by their documented defaults.
func (set *Settings) fillDefaults() {
	def := func(v *int, d int) {
		if *v == 0 {
			*v = d
		}
	}
	def(&set.MaxR, 2)
	def(&set.MaxS, 2)
	def(&set.Forms, 2)
	def(&set.MaxP, 2)
	def(&set.MaxQ, 2)
	def(&set.NoiseOrders, 2)
	def(&set.MaxCandidates, 24)
	if set.Workers == 0 {
		set.Workers = runtime.GOMAXPROCS(0)
	}
}

// inputDiffs returns the differencing of each input (the output's unless
// set.InputDiff names one; nil for none), and refuses an output or input
// that is constant after its differencing.
func inputDiffs(output string, inputs []string, data map[string][]float64, set Settings) ([][]float64, error) {
	if err := fit.CheckSeries(output, "output", data[output], set.OutputDiff); err != nil {
		return nil, err
	}
	diffs := make([][]float64, len(inputs))
	for i, name := range inputs {
		diff, ok := set.InputDiff[name]
		if !ok {
			diff = set.OutputDiff
		}
		if len(diff) <= 1 {
			diff = nil
		}
		diffs[i] = diff
		if err := fit.CheckSeries(name, "input", data[name], diff); err != nil {
			return nil, err
		}
	}
	return diffs, nil
}

// inputForms estimates the impulse response of the output to each input
// (prewhitened one at a time, or jointly with several inputs, valid when
// the inputs are correlated with one another), chooses dead times and
// orders from it, and returns per input the set.Forms best input terms
// with their scores, and the identifications.
func inputForms(output string, inputs []string, data map[string][]float64, diffs [][]float64, set Settings, hints []string) (forms [][]tf.Input, scores [][]float64, ids []*ccf.Identification, err error) {
	y := data[output]
	n := len(y)
	maxLag := set.MaxLag
	if maxLag <= 0 {
		maxLag = max(10, min(36, n/6))
	}
	var joint []*ccf.Weights
	if len(inputs) > 1 {
		joint, err = jointWeights(output, inputs, data, set.OutputDiff, diffs, maxLag)
		if err != nil {
			return nil, nil, nil, &fit.StageError{Stage: fmt.Sprintf("estimating the impulse responses of %q to all inputs jointly", output), Err: err, Hints: hints}
		}
	}
	forms = make([][]tf.Input, len(inputs))
	scores = make([][]float64, len(inputs))
	penalty := math.Log(float64(n)) // BIC-like weight, as the final ranking
	if set.ByAIC {
		penalty = 2
	}
	for i, name := range inputs {
		diff := diffs[i]
		var w *ccf.Weights
		if joint != nil {
			w = joint[i]
		} else {
			pr, err := prewhiten.Pair(data[name], y, output, &prewhiten.Settings{Diff: diff, Name: name})
			var nw *prewhiten.NotWhiteError
			if err != nil && !errors.As(err, &nw) {
				return nil, nil, nil, &fit.StageError{Stage: fmt.Sprintf("prewhitening input %q and output %q", name, output), Err: err, Hints: hints}
			}
			w, err = ccf.ImpulseWeights(pr.Alpha[pr.Start:], pr.Beta[pr.Start:], min(maxLag, n-pr.Start-2), name, nil)
			if err != nil {
				return nil, nil, nil, &fit.StageError{Stage: fmt.Sprintf("estimating the impulse response of %q to input %q", output, name), Err: err, Hints: hints}
			}
		}
		id, err := ccf.Identify(w, &ccf.IdentifySettings{MaxR: set.MaxR, MaxS: set.MaxS, Input: name, Penalty: penalty})
		if err != nil {
			return nil, nil, nil, &fit.StageError{Stage: fmt.Sprintf("choosing the dead time and orders of input %q", name), Err: err, Hints: hints}
		}
		ids = append(ids, id)
		dp := tf.Poly{}
		if diff != nil {
			dp = sym.FromCoeffs(diff)
		}
		for k, c := range id.Forms {
			if k >= set.Forms {
				break
			}
			forms[i] = append(forms[i], formInput(name, len(inputs) > 1, dp, c))
			scores[i] = append(scores[i], c.Score)
		}
	}
	return forms, scores, ids, nil
}

// noiseOrders fits pre (the best forms with white noise) and returns the
// set.NoiseOrders best noise models of its residuals (white noise alone
// when that fit or the noise identification fails) and, unless
// set.NoSettle, the first residual index past the start-up transient of
// its estimated poles. A bad setting in set.Fit is returned under its
// Settings name; a done context ends the search.
func noiseOrders(ctx context.Context, pre tf.Model, data map[string][]float64, fs fit.Settings, set Settings) (noises []*arma.Noise, settleFirst int, err error) {
	noises = []*arma.Noise{{}}
	est, ferr := modelFit(ctx, pre, data, &fs)
	if cerr := ctx.Err(); cerr != nil {
		return nil, 0, cerr
	}
	var se *errs.SettingError
	if ferr != nil && errors.As(ferr, &se) && strings.HasPrefix(se.Setting, "Settings.") {
		c := *se
		c.Setting = "Settings.Fit." + strings.TrimPrefix(se.Setting, "Settings.")
		return nil, 0, &c
	}
	if ferr != nil {
		return noises, 0, nil
	}
	if !set.NoSettle {
		k := fit.SettleSamples(est.Model)
		settleFirst = min(est.Conditioning.NoiseStart+max(set.MaxP, 0)+k, len(est.Resid)/10)
	}
	r := est.Resid[est.Conditioning.First:]
	nid, nerr := prewhiten.IdentifyNoise(ctx, r, &prewhiten.NoiseSettings{MaxP: set.MaxP, MaxQ: set.MaxQ})
	if cerr := ctx.Err(); cerr != nil {
		return nil, 0, cerr
	}
	if nerr != nil {
		return noises, settleFirst, nil
	}
	noises = noises[:0]
	for _, c := range nid.Candidates {
		if c.Err != nil || len(noises) >= set.NoiseOrders {
			continue
		}
		noises = append(noises, noiseOfOrder(c.Order.P, c.Order.Q))
	}
	if len(noises) == 0 {
		noises = append(noises, &arma.Noise{})
	}
	return noises, settleFirst, nil
}

// candidateModels combines each combination of input forms with each
// noise model, at most limit models, each with a free constant and its
// own copies of the polynomials.
func candidateModels(output string, outDiff tf.Poly, forms [][]tf.Input, combos [][]int, noises []*arma.Noise, limit int) []tf.Model {
	var models []tf.Model
	for _, cb := range combos {
		for _, nz := range noises {
			if len(models) >= limit {
				break
			}
			c := tf.Coef{Name: "c", Free: true}
			nc := nz.Clone()
			m := tf.Model{Output: output, Diff: outDiff.Clone(), Const: &c, Noise: &nc}
			for i, k := range cb {
				in := forms[i][k]
				m.Inputs = append(m.Inputs, tf.Input{Series: in.Series, Diff: in.Diff.Clone(), Num: in.Num.Clone(), Den: in.Den.Clone(), Delay: in.Delay})
			}
			models = append(models, m)
		}
	}
	return models
}

// commonFirst returns the largest automatic first residual index of the
// models (at least first), so that their criteria compare over the same
// residuals.
func commonFirst(models []tf.Model, data map[string][]float64, first int) int {
	for _, m := range models {
		if c, err := fit.ConditioningOf(m, data, &fit.Settings{IgnoreExtra: true}); err == nil {
			first = max(first, c.First)
		}
	}
	return first
}

// refineNeighbours fits lower-order neighbours of the best fit, started
// from its estimates: it drops the highest-power coefficient of one
// numerator, denominator or noise polynomial at a time, and repeats from
// the new best while that improves the score (at most refineRounds
// rounds). It returns out with the new candidates appended.
func refineNeighbours(ctx context.Context, out []Candidate, models []tf.Model, data map[string][]float64, fs fit.Settings, set Settings, prog *progress) []Candidate {
	seen := map[string]bool{}
	for _, m := range models {
		seen[structureKey(m)] = true
	}
	planned := len(models)
	for round := 0; round < refineRounds && ctx.Err() == nil; round++ {
		b := bestCandidate(out)
		if b == nil {
			break
		}
		var more []tf.Model
		for _, m := range lowerNeighbours(b.Estimate.Model) {
			if k := structureKey(m); !seen[k] {
				seen[k] = true
				more = append(more, m)
			}
		}
		if len(more) == 0 {
			break
		}
		planned += len(more)
		prog.setTotal(planned)
		before := b.Score
		out = append(out, scoreCandidates(ctx, more, data, fs, set, prog)...)
		if nb := bestCandidate(out); nb == nil || nb.Score >= before {
			break
		}
	}
	return out
}

// refineRounds bounds the rounds of lower-order neighbours.
const refineRounds = 4

// progress reports finished fits to the caller's callback, one call
// at a time.
type progress struct {
	mu          sync.Mutex
	fn          func(done, total int)
	done, total int
}

func (p *progress) setTotal(t int) {
	p.mu.Lock()
	p.total = t
	p.mu.Unlock()
}

func (p *progress) tick() {
	p.mu.Lock()
	defer p.mu.Unlock()
	p.done++
	if p.fn != nil {
		p.fn(p.done, max(p.total, p.done))
	}
}

// scoreCandidates fits and checks the models on at most set.Workers
// goroutines.
func scoreCandidates(ctx context.Context, models []tf.Model, data map[string][]float64, fs fit.Settings, set Settings, prog *progress) []Candidate {
	crit := "BIC"
	if set.ByAIC {
		crit = "AIC"
	}
	out := make([]Candidate, len(models))
	var wg sync.WaitGroup
	sem := make(chan struct{}, set.Workers)
	for k := range models {
		wg.Add(1)
		go func(k int) {
			defer wg.Done()
			sem <- struct{}{}
			defer func() { <-sem }()
			defer func() {
				// The caller's Progress callback runs here: a panic in it
				// must not kill the process either.
				defer func() {
					if r := recover(); r != nil {
						out[k] = Candidate{Structure: models[k], Criterion: crit, Score: math.Inf(1),
							Err: &errs.InternalError{Op: "identify.Candidates", Value: fmt.Sprint("calling Settings.Progress: ", r), Stack: debug.Stack()}}
					}
				}()
				prog.tick()
			}()
			out[k] = scoreCandidate(ctx, models[k], data, fs, set, crit)
		}(k)
	}
	wg.Wait()
	return out
}

// scoreCandidate fits and checks one model and scores it by crit; it runs
// on a goroutine of scoreCandidates and recovers a panic into an
// *InternalError naming the stage (the last line of defence: a panic
// there would kill the caller's process).
func scoreCandidate(ctx context.Context, m tf.Model, data map[string][]float64, fs fit.Settings, set Settings, crit string) (c Candidate) {
	c = Candidate{Structure: m, Criterion: crit, Score: math.Inf(1)}
	stage := "fitting candidate " + c.Label()
	defer func() {
		if r := recover(); r != nil {
			c = Candidate{Structure: m, Criterion: crit, Score: math.Inf(1),
				Err: &errs.InternalError{Op: "identify.Candidates", Value: fmt.Sprint(stage, ": ", r), Stack: debug.Stack()}}
		}
	}()
	if err := ctx.Err(); err != nil {
		c.Err = err
		return c
	}
	est, err := modelFit(ctx, m, data, &fs)
	if err != nil {
		c.Err = err
		return c
	}
	score := est.BIC
	if set.ByAIC {
		score = est.AIC
	}
	if math.IsNaN(score) || math.IsInf(score, 0) {
		c.Err = scoreErr(c.Label(), crit, score)
		return c
	}
	c.Estimate = est
	c.Score = score
	stage = "checking candidate " + c.Label()
	c.Diagnostics, c.CheckErr = fit.Check(est, data, set.Check)
	return c
}

// modelFit is the fit Candidates runs; tests replace it to reach the
// recovery at the goroutine boundary of scoreCandidates.
var modelFit = fit.Model

// bestCandidate returns the candidate with the lowest score, nil if none fitted.
func bestCandidate(cs []Candidate) *Candidate {
	var b *Candidate
	for i := range cs {
		if cs[i].Err == nil && (b == nil || cs[i].Score < b.Score) {
			b = &cs[i]
		}
	}
	return b
}

// structureKey describes the structure of a model: per input its dead time and
// degrees, and the noise degrees.
func structureKey(m tf.Model) string {
	k := ""
	for _, in := range m.Inputs {
		k += fmt.Sprintf("%s:%d,%d,%d;", in.Series, in.Delay, in.Den.Degree(), in.Num.Degree())
	}
	if m.Noise != nil {
		k += fmt.Sprintf("n:%d,%d", m.Noise.AR.Degree(), m.Noise.MA.Degree())
	}
	return k
}

// lowerNeighbours returns copies of m (single-factor polynomials as
// Candidates builds them) with the highest-power term of one numerator
// (s >= 1), denominator (r >= 1) or noise polynomial removed.
func lowerNeighbours(m tf.Model) []tf.Model {
	drop := func(p tf.Poly) (tf.Poly, bool) {
		if len(p.Factors) != 1 || len(p.Factors[0].Terms) < 2 {
			return p, false
		}
		q := p.Clone()
		f := &q.Factors[0]
		f.Terms = f.Terms[:len(f.Terms)-1]
		if len(f.Terms) == 1 && f.Terms[0].Coef.Name == "" && f.Terms[0].Power == 0 && f.Terms[0].Value() == 1 {
			return tf.Poly{}, true // the denominator or noise polynomial became 1
		}
		return q, true
	}
	var out []tf.Model
	for i := range m.Inputs {
		for _, den := range []bool{false, true} {
			c := m.Clone()
			in := &c.Inputs[i]
			var ok bool
			if den {
				in.Den, ok = drop(in.Den)
			} else {
				in.Num, ok = drop(in.Num)
			}
			if ok {
				out = append(out, c)
			}
		}
	}
	if m.Noise != nil {
		for _, ar := range []bool{false, true} {
			c := m.Clone()
			var ok bool
			if ar {
				c.Noise.AR, ok = drop(c.Noise.AR)
			} else {
				c.Noise.MA, ok = drop(c.Noise.MA)
			}
			if ok {
				out = append(out, c)
			}
		}
	}
	return out
}

// jointWeights estimates the impulse-response weights of several
// inputs jointly (ccf.DistributedLag with AR(1) noise) on the
// differenced series, all starting at the largest differencing degree.
func jointWeights(output string, inputs []string, data map[string][]float64, outDiff []float64, diffs [][]float64, maxLag int) ([]*ccf.Weights, error) {
	d := max(len(outDiff)-1, 0)
	for _, dd := range diffs {
		d = max(d, len(dd)-1)
	}
	cut := func(x, dc []float64) []float64 {
		if len(dc) == 0 {
			dc = []float64{1}
		}
		return filter.Diff(make([]float64, len(x)), x, dc)[d:]
	}
	y := cut(data[output], outDiff)
	xs := make([][]float64, len(inputs))
	for i, name := range inputs {
		xs[i] = cut(data[name], diffs[i])
	}
	lags := min(maxLag, max(1, len(y)/(4*len(inputs))))
	r, err := ccf.DistributedLag(y, xs, &ccf.DistributedLagSettings{Lags: lags, Names: inputs, Output: output})
	if err != nil {
		return nil, err
	}
	return r.Weights, nil
}

// isSpecName reports whether s can name a series in a model spec (the
// models Candidates returns print as specs): an ASCII letter or underscore,
// then letters, digits or underscores, and not a word of the language.
func isSpecName(s string) bool {
	switch s {
	case "", "B", "a", "AR", "MA", "ARMA", "where", "every":
		return false
	}
	for i := 0; i < len(s); i++ {
		c := s[i]
		letter := 'a' <= c && c <= 'z' || 'A' <= c && c <= 'Z' || c == '_'
		if !letter && (i == 0 || c < '0' || c > '9') {
			return false
		}
	}
	return true
}

// validateData checks presence, lengths and finiteness of the series.
func validateData(output string, inputs []string, data map[string][]float64) error {
	if output == "" {
		return errs.Series(output, errs.ErrName, 0, 0, "the output is not named; name the output series")
	}
	y, ok := data[output]
	if !ok {
		return errs.Series(output, errs.ErrName, 0, 0, "the output is not in the data; check the series names")
	}
	if !isSpecName(output) {
		return specNameErr(output, "output")
	}
	seen := map[string]bool{}
	for _, name := range inputs {
		switch {
		case name != "" && !isSpecName(name):
			return specNameErr(name, "input")
		case name == "":
			return errs.Series(name, errs.ErrName, 0, 0, "an entry of the inputs is empty; name each input series")
		case name == output:
			return errs.Series(name, errs.ErrName, 0, 0, "listed among the inputs, it is the output; an output cannot be its own input")
		case seen[name]:
			return errs.Series(name, errs.ErrName, 0, 0, "it is listed twice among the inputs")
		}
		seen[name] = true
	}
	for _, name := range append([]string{output}, inputs...) {
		x, ok := data[name]
		if !ok {
			return errs.Series(name, errs.ErrName, 0, 0, "an input is not in the data; check the series names")
		}
		if len(x) != len(y) {
			return errs.Series(name, errs.ErrLength, len(x), len(y), "the length of the output "+strconv.Quote(output)+"; every series has one length")
		}
		if slices.ContainsFunc(x, math.IsNaN) {
			role := "input"
			if name == output {
				role = "output"
			}
			return missingErr(name, role, x, data, append([]string{output}, inputs...))
		}
		for t, v := range x {
			if math.IsInf(v, 0) {
				return &errs.SampleError{Series: name, Index: t, Value: v}
			}
			if math.Abs(v) > maxMagnitude {
				return &errs.SampleError{Series: name, Index: t, Value: v, Limit: maxMagnitude}
			}
		}
		if len(x) == 0 {
			continue // an empty series has no spread to check
		}
		if lo, hi := slices.Min(x), slices.Max(x); hi > lo && hi-lo < minSpread {
			return errs.Series(name, errs.ErrConstant, 0, 0, "it varies by only "+errs.Num(hi-lo)+", less than 1e-140: the squares of its deviations underflow, so its correlations are undefined; rescale the series (change its units)")
		}
	}
	return nil
}

// maxMagnitude and minSpread bound the samples Candidates accepts:
// the ARMA fits of the prewhitening refuse magnitudes above 1e140, and
// the correlations need squared deviations above the float64 underflow
// (about 1e-308 for a square, so deviations above about 1e-140 leave
// room for the sums).
const (
	maxMagnitude = 1e140
	minSpread    = 1e-140
)

// formCombos returns index combinations (one form per input) ordered by
// the sum of the forms' scores, at most limit of them.
func formCombos(scores [][]float64, limit int) [][]int {
	combos := [][]int{{}}
	for _, sc := range scores {
		var next [][]int
		for _, c := range combos {
			for k := range sc {
				next = append(next, append(append([]int(nil), c...), k))
			}
		}
		combos = next
	}
	sum := func(c []int) float64 {
		s := 0.0
		for i, k := range c {
			s += scores[i][k]
		}
		return s
	}
	sort.SliceStable(combos, func(i, j int) bool { return sum(combos[i]) < sum(combos[j]) })
	if len(combos) > limit {
		combos = combos[:limit]
	}
	return combos
}
