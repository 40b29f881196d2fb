package main

import (
	"fmt"
	"image/color"
	"math"
	"path/filepath"

	"github.com/backshift/backshift/examples/chart"
)

// Colours of the -track pictures.
var (
	colEstimate = color.RGBA{R: 31, G: 100, B: 190, A: 255}
	colBand     = color.NRGBA{R: 31, G: 100, B: 190, A: 60}
	colBatch    = color.RGBA{R: 60, G: 60, B: 60, A: 255}
	colTrue     = color.RGBA{R: 40, G: 150, B: 60, A: 255}
	colChange   = color.RGBA{R: 230, G: 140, B: 20, A: 255}
	colWithin   = color.NRGBA{R: 40, G: 150, B: 60, A: 45}
)

// draw writes the pictures of the run into dir, coefficients.png and
// gain.png, and returns their paths.
func (r *trackResult) draw(dir string) ([]string, error) {
	t := make([]float64, r.n)
	for i := range t {
		t[i] = float64(i)
	}
	var panels []*chart.Chart
	for i := range r.names {
		panels = append(panels, r.coefficientChart(t, i))
	}
	coefs := filepath.Join(dir, "coefficients.png")
	if err := chart.Save(coefs, panels, 18, 5); err != nil {
		return nil, err
	}
	gain := filepath.Join(dir, "gain.png")
	if err := chart.Save(gain, []*chart.Chart{r.gainChart(t)}, 18, 8); err != nil {
		return nil, err
	}
	return []string{coefs, gain}, nil
}

// coefficientChart draws coefficient i's recursive estimate with its
// +-2 SE band, the batch fit and the true values.
func (r *trackResult) coefficientChart(t []float64, i int) *chart.Chart {
	c := chart.New(fmt.Sprintf("Coefficient %s: recursive estimate", r.names[i]), "sample (min)", r.names[i])
	lo, hi := make([]float64, r.n), make([]float64, r.n)
	for k := range lo {
		lo[k] = r.value[i][k] - 2*r.se[i][k]
		hi[k] = r.value[i][k] + 2*r.se[i][k]
	}
	c.Legend("+-2 SE", c.Band(t, lo, hi, colBand))
	c.Legend("recursive estimate", c.Line(t, r.value[i], colEstimate, 1.2))
	c.Legend("batch fit, first half", c.HLine(r.batch[i].Value, 0, t[r.n-1], colBatch).Dashed(5, 3))
	c.Legend("true value", c.HLine(r.before[i], 0, float64(r.at), colTrue))
	c.HLine(r.after[i], float64(r.at), t[r.n-1], colTrue)
	// The first estimates after the warm-up can swing far; the range is
	// set from the second half of the first half of the record on, where
	// they have settled, so that the change stays readable.
	c.SetY(r.yRange(i))
	r.markChange(c)
	return c
}

// yRange returns a y range that holds the batch fit, the true values
// and the band from sample at/2 on.
func (r *trackResult) yRange(i int) (float64, float64) {
	lo, hi := min(r.batch[i].Value, r.before[i], r.after[i]), max(r.batch[i].Value, r.before[i], r.after[i])
	for k := r.at / 2; k < r.n; k++ {
		v, s := r.value[i][k], 2*r.se[i][k]
		if isFinite(v - s) {
			lo, hi = min(lo, v-s), max(hi, v+s)
		}
	}
	pad := 0.05 * (hi - lo)
	return lo - pad, hi + pad
}

// markChange draws the sample of the change as a vertical line.
func (r *trackResult) markChange(c *chart.Chart) {
	lo, hi := c.YRange()
	c.Legend("gain change", c.VLine(float64(r.at), lo, hi, colChange).Dashed(2, 2))
}

// gainChart draws the valve path's steady-state gain over time against
// its true value, the batch fit's and the band that counts as tracked.
func (r *trackResult) gainChart(t []float64) *chart.Chart {
	c := chart.New("Steady-state gain of the valve path (current model)", "sample (min)", "gain (degC per %)")
	end := t[r.n-1]
	tail := t[r.at:]
	lo, hi := make([]float64, len(tail)), make([]float64, len(tail))
	for k := range tail {
		lo[k], hi[k] = (1-trackWithin)*r.gain1, (1+trackWithin)*r.gain1
	}
	c.Legend(fmt.Sprintf("within %.0f %% of the new gain", 100*trackWithin), c.Band(tail, lo, hi, colWithin))
	c.Legend("recursive estimate", c.Line(t, r.gain, colEstimate, 1.2))
	c.Legend("batch fit, first half", c.HLine(r.batchGain, 0, end, colBatch).Dashed(5, 3))
	c.Legend("true gain", c.HLine(r.gain0, 0, float64(r.at), colTrue))
	c.HLine(r.gain1, float64(r.at), end, colTrue)
	lo0, hi0 := min(r.gain0, r.batchGain), (1+trackWithin)*r.gain1
	for k := r.at / 2; k < r.n; k++ {
		if isFinite(r.gain[k]) {
			lo0, hi0 = min(lo0, r.gain[k]), max(hi0, r.gain[k])
		}
	}
	pad := 0.05 * (hi0 - lo0)
	c.SetY(lo0-pad, hi0+pad)
	r.markChange(c)
	if r.delay >= 0 {
		c.Legend(fmt.Sprintf("within %.0f %% after %d samples", 100*trackWithin, r.delay),
			c.VLine(float64(r.at+r.delay), lo0-pad, hi0+pad, colTrue).Dashed(2, 2))
	}
	return c
}

// isFinite reports whether v is neither NaN nor infinite (an SE is NaN
// during the estimator's warm-up).
func isFinite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }
