package fit

import (
	"errors"
	"github.com/backshift/backshift/internal/gaps"
	"math"
	"sort"
	"strconv"
	"strings"

	"github.com/backshift/backshift/internal/errs"
	"github.com/backshift/backshift/tf"
)

// FillRule says how missing (NaN) input samples are filled.
type FillRule int

const (
	// NoFill refuses missing input samples (the default): the transfer
	// filters need every past input value, so an input gap cannot be
	// skipped the way an output gap is.
	NoFill FillRule = iota
	// HoldFill carries the last observed value across the gap (a gap at
	// the start of the record cannot be filled so).
	HoldFill
	// LinearFill interpolates linearly between the observed values on
	// either side of the gap (a gap at either end of the record cannot
	// be filled so).
	LinearFill
)

// String names the rule in a word or two.
func (r FillRule) String() string {
	switch r {
	case NoFill:
		return "not filled"
	case HoldFill:
		return "held"
	case LinearFill:
		return "linear interpolation"
	}
	return "FillRule(" + strconv.Itoa(int(r)) + ")"
}

// GapFill is the rule for missing input samples (Settings.InputGaps).
// The zero value refuses them.
type GapFill struct {
	// Rule is NoFill (refuse, the default), HoldFill or LinearFill.
	Rule FillRule
	// MaxLen is the longest gap, in samples, that Rule fills; a longer
	// one is refused with its position. Zero means 3 samples: a short
	// dropout of a sensor or a link, across which a held or interpolated
	// input differs little from the truth when the input does not move
	// during the gap: the fill error is what the input moved in the gap,
	// whatever the process's speed (a step inside the gap is not made
	// harmless by a slow process; Model warns with FilledGapMove)
	// (common practice). A long gap is better cut out of the record (fit
	// the stretches before or after it).
	MaxLen int
}

// maxLen returns MaxLen with its default.
func (g GapFill) maxLen() int {
	if g.MaxLen == 0 {
		return 3
	}
	return g.MaxLen
}

// validate checks the rule and the length (settings rule).
func (g GapFill) validate() error {
	if g.Rule < NoFill || g.Rule > LinearFill {
		return errs.Setting("Settings.InputGaps.Rule", strconv.Itoa(int(g.Rule)), "must be NoFill, HoldFill or LinearFill")
	}
	return errs.Count("", "Settings.InputGaps.MaxLen", g.MaxLen, "0 means 3 samples")
}

// InputFill reports one filled gap of an input: the series, the first
// missing index, the length in samples and the rule.
type InputFill struct {
	Series     string
	Index, Len int
	Rule       FillRule
}

// gap is a run of NaN samples x[start .. start+n-1].
type gap struct{ start, n int }

// gapsOf returns the runs of NaN samples of x.
func gapsOf(x []float64) []gap {
	var out []gap
	for _, r := range gaps.Runs(x) {
		out = append(out, gap{r[0], r[1] - r[0]})
	}
	return out
}

// gapText lists gaps for a message: "12..15 (4 samples), 40", at most
// eight of them.
func gapText(gs []gap) string {
	var parts []string
	total := 0
	for i, g := range gs {
		total += g.n
		if i >= 8 {
			continue
		}
		parts = append(parts, gaps.Span([2]int{g.start, g.start + g.n}))
	}
	s := strconv.Itoa(total) + " missing (NaN) at " + strings.Join(parts, ", ")
	if len(gs) > 8 {
		s += " and " + strconv.Itoa(len(gs)-8) + " more gaps"
	}
	return s
}

// gapErr is the error for missing samples of a series: the
// *SampleError of the first one (series and index) joined with a
// *SeriesError of kind ErrSample listing the gaps and the remedy.
func gapErr(series string, first int, detail string) error {
	return errors.Join(&errs.SampleError{Series: series, Index: first, Value: math.NaN()},
		&errs.SeriesError{Series: series, Kind: errs.ErrSample, Detail: detail})
}

// prepareGaps handles the NaN samples of a fit's data: input gaps
// filled by set.InputGaps (or refused), output gaps refused by
// conditional least squares and, for ExactML, replaced in the returned
// map by linear interpolation (the start values' record; obs keeps the
// output as given). The caller's data are not modified; the returned
// map shares the slices it does not change.
func prepareGaps(m tf.Model, data map[string][]float64, set Settings) (out map[string][]float64, obs []float64, filled []InputFill, err error) {
	out = data
	copied := false
	put := func(name string, x []float64) {
		if !copied {
			out = make(map[string][]float64, len(data))
			for k, v := range data {
				out[k] = v
			}
			copied = true
		}
		out[name] = x
	}
	names := make([]string, 0, len(m.Inputs))
	for _, in := range m.Inputs {
		if in.Series != m.Output {
			names = append(names, in.Series)
		}
	}
	sort.Strings(names)
	for i, name := range names {
		if i > 0 && names[i-1] == name {
			continue
		}
		gs := gapsOf(data[name])
		if len(gs) == 0 {
			continue
		}
		x, f, err := fillInput(name, data[name], gs, set.InputGaps)
		if err != nil {
			return nil, nil, nil, err
		}
		filled = append(filled, f...)
		put(name, x)
	}
	y := data[m.Output]
	gs := gapsOf(y)
	if len(gs) == 0 {
		return out, y, filled, nil
	}
	if set.Method != ExactML {
		return nil, nil, nil, gapErr(m.Output, gs[0].start, "the output: "+gapText(gs)+
			"; conditional least squares needs every output sample: set fit.Settings.Method to fit.ExactML, whose Kalman filter skips missing outputs exactly")
	}
	if len(gs) == 1 && gs[0].n == len(y) {
		return nil, nil, nil, errs.Series(m.Output, errs.ErrShort, 0, 2, "every output sample is missing (NaN)")
	}
	put(m.Output, interpolateGaps(y, gs))
	return out, y, filled, nil
}

// fillInput fills the gaps gs of input x by rule g, or refuses them.
func fillInput(name string, x []float64, gs []gap, g GapFill) ([]float64, []InputFill, error) {
	if g.Rule == NoFill {
		return nil, nil, gapErr(name, gs[0].start, "an input: "+gapText(gs)+
			"; the transfer filters need every past input value, so input gaps cannot be skipped: set fit.Settings.InputGaps to fill short gaps (HoldFill or LinearFill, up to MaxLen samples), or cut the record")
	}
	lim := g.maxLen()
	for _, gp := range gs {
		why := ""
		switch {
		case gp.n > lim:
			why = "longer than fit.Settings.InputGaps.MaxLen = " + strconv.Itoa(lim) + " samples; cut the record there or raise MaxLen if holding or interpolating so long is sound"
		case gp.start == 0:
			why = "at the start of the record, with no value before it to " + map[bool]string{true: "hold", false: "interpolate from"}[g.Rule == HoldFill] + "; cut the record after it"
		case g.Rule == LinearFill && gp.start+gp.n == len(x):
			why = "at the end of the record, with no value after it to interpolate to; cut the record before it, or use HoldFill"
		}
		if why != "" {
			return nil, nil, gapErr(name, gp.start, "an input: the gap at "+gaps.Span([2]int{gp.start, gp.start + gp.n})+" cannot be filled: "+why)
		}
	}
	out := append([]float64(nil), x...)
	fills := make([]InputFill, len(gs))
	for i, gp := range gs {
		fills[i] = InputFill{Series: name, Index: gp.start, Len: gp.n, Rule: g.Rule}
		a := x[gp.start-1]
		for j := 0; j < gp.n; j++ {
			t := gp.start + j
			if g.Rule == HoldFill {
				out[t] = a
				continue
			}
			b := x[gp.start+gp.n]
			out[t] = a + (b-a)*float64(j+1)/float64(gp.n+1)
		}
	}
	return out, fills, nil
}

// interpolateGaps returns y with its gaps gs filled by linear
// interpolation between their observed neighbours, held flat at the
// ends.
func interpolateGaps(y []float64, gs []gap) []float64 {
	out := append([]float64(nil), y...)
	for _, gp := range gs {
		end := gp.start + gp.n
		for j := gp.start; j < end; j++ {
			switch {
			case gp.start == 0:
				out[j] = y[end]
			case end == len(y):
				out[j] = y[gp.start-1]
			default:
				a, b := y[gp.start-1], y[end]
				out[j] = a + (b-a)*float64(j-gp.start+1)/float64(gp.n+1)
			}
		}
	}
	return out
}
