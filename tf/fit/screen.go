package fit

import (
	"fmt"
	"github.com/backshift/backshift/tf"
	"math"
	"slices"
)

// Screening of a recorded output for two faults of plant data that
// conditional least squares cannot see and that bias its estimates
// without a word: a stuck sensor (a stretch of identical samples) and a
// spike (one bad reading). The rules are common practice, with the
// thresholds stated here and in the warnings' docs.

// Thresholds of the screen.
const (
	// screenMinRun is the shortest stretch of identical samples
	// reported as a stuck sensor, whatever the series' resolution.
	screenMinRun = 10
	// screenRunChance is the largest expected number of runs at least as
	// long as the one found, in a series that repeats its previous
	// sample with the probability p seen outside that run (n p^(L-1)),
	// below which the run is reported: a run that long is then
	// implausible for this series' own resolution (a quantised steady
	// output repeats often, and gets a correspondingly longer allowance).
	screenRunChance = 1e-3
	// screenSpikeScale is the size, in robust standard deviations of the
	// first differences (1.4826 times their median absolute deviation),
	// of the jump into and out of a sample that marks it as a spike. For
	// Gaussian differences a jump of 10 SDs has probability below 1e-22.
	screenSpikeScale = 10
	// screenMaxSpikes bounds the spikes listed.
	screenMaxSpikes = 5
)

// flatRun is a stretch of identical samples x[Start..Start+Len-1].
type flatRun struct {
	Start, Len int
	Value      float64
}

// screenFlat returns the longest stretch of identical consecutive
// samples of x and whether it is implausible: at least screenMinRun
// long, and n p^(L-1) below screenRunChance with p the share of samples
// outside the stretch that equal their predecessor.
func screenFlat(x []float64) (flatRun, bool) {
	n := len(x)
	var best flatRun
	repeats := 0
	for i := 0; i < n; {
		j := i + 1
		for j < n && x[j] == x[i] {
			j++
		}
		if j-i > best.Len {
			best = flatRun{Start: i, Len: j - i, Value: x[i]}
		}
		repeats += j - i - 1
		i = j
	}
	if best.Len < screenMinRun {
		return best, false
	}
	others := n - best.Len - 1 // pairs outside the run
	if others <= 0 {
		return best, false // the whole series is constant: refused elsewhere
	}
	p := float64(repeats-(best.Len-1)) / float64(others)
	expected := float64(n) * math.Pow(p, float64(best.Len-1))
	return best, expected < screenRunChance
}

// spike is one sample far from both neighbours.
type spike struct {
	Index                int
	Value, Before, After float64
	// SDs is the smaller jump (into or out of the sample) in robust
	// standard deviations of the first differences.
	SDs float64
}

// screenSpikes returns up to screenMaxSpikes samples x[t] whose jumps
// from x[t-1] and to x[t+1] both exceed screenSpikeScale robust standard
// deviations of the first differences, in opposite directions: a single
// reading out of line with its neighbours. A series whose differences
// are mostly zero (robust scale 0) is not screened.
func screenSpikes(x []float64) []spike {
	n := len(x)
	if n < 5 {
		return nil
	}
	d := make([]float64, n-1)
	for t := 1; t < n; t++ {
		d[t-1] = x[t] - x[t-1]
	}
	abs := make([]float64, len(d))
	med := median(slices.Clone(d))
	for i, v := range d {
		abs[i] = math.Abs(v - med)
	}
	s := 1.4826 * median(abs)
	if !(s > 0) {
		return nil
	}
	var out []spike
	for t := 1; t < n-1 && len(out) < screenMaxSpikes; t++ {
		in, outJ := d[t-1]-med, d[t]-med
		if in*outJ < 0 && math.Abs(in) > screenSpikeScale*s && math.Abs(outJ) > screenSpikeScale*s {
			out = append(out, spike{Index: t, Value: x[t], Before: x[t-1], After: x[t+1], SDs: math.Min(math.Abs(in), math.Abs(outJ)) / s})
		}
	}
	return out
}

// Screen returns the warnings of the screening that Model runs on an
// output series y named name before fitting: StuckOutput for a long run
// of one value and OutputSpike for isolated spikes, with indexes into y.
// It does not modify y.
func Screen(name string, y []float64) []Warning {
	return screenSkipping(name, y, nil)
}

// screen is Screen of the output y of w's model, without a spike warning
// at a sample that a pulse event input of the model explains (its pulse
// sample plus its dead time): a bad reading the model already carries as
// an intervention is no longer a reason to doubt the fit.
func (w *work) screen(y []float64) []Warning {
	var explained map[int]bool
	for _, fi := range w.ins {
		if fi.in.Event == nil || fi.in.Event.Kind != tf.Pulse {
			continue
		}
		for t, v := range fi.x {
			if v != 0 {
				if explained == nil {
					explained = map[int]bool{}
				}
				explained[t+fi.in.Delay] = true
			}
		}
	}
	return screenSkipping(w.m.Output, y, explained)
}

// screenSkipping is Screen without spike warnings at the samples in
// explained.
func screenSkipping(name string, y []float64, explained map[int]bool) []Warning {
	var ws []Warning
	if r, bad := screenFlat(y); bad {
		ws = append(ws, Warning{Kind: StuckOutput, Message: fmt.Sprintf(
			"output %q holds the value %v for %d samples, %d..%d, far longer than its own rate of repeats makes plausible: a stuck sensor or a held value? Repair or cut that stretch (fit the record before or after it) and refit",
			name, r.Value, r.Len, r.Start, r.Start+r.Len-1)})
	}
	for _, s := range screenSpikes(y) {
		if explained[s.Index] {
			continue
		}
		ws = append(ws, Warning{Kind: OutputSpike, Message: fmt.Sprintf(
			"output %q sample %d is %v between %v and %v, a jump of %.3g robust SDs each way: a bad reading? Repair the sample and refit",
			name, s.Index, s.Value, s.Before, s.After, s.SDs)})
	}
	return ws
}
