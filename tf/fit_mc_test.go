package tf

import (
	"context"
	"math"
	"math/rand/v2"
	"testing"

	"github.com/backshift/backshift/arma"
	"github.com/backshift/backshift/internal/filter"
)

// mcModel is the Monte Carlo model of our own: b = 3, s = 1, r = 1 and
// AR(1) noise with a constant,
//
//	y_t = c + (w0 - w1 B)/(1 - d1 B) B^3 x_t + 1/(1 - p1 B) a_t,
//
// truth c = 2, w0 = 1.5, w1 = -0.8, d1 = 0.6, p1 = 0.5, sigma = 1, with
// x an AR(1) input (phi 0.5, unit innovations). The numerator zero
// (z = -0.53) is far from the pole (0.6): a nearly cancelling pair would
// make the surface strongly non-quadratic and the SEs unreliable at n = 400.
func mcModel() Model {
	c := Coef{Name: "c", Free: true}
	num := mkPoly(mkFactor(mkTerm(false, "w0", 0, 0), mkTerm(true, "w1", 0, 1)))
	return Model{Output: "y", Const: &c,
		Inputs: []Input{{Series: "x", Num: num, Den: oneMinus("d1", 1), Delay: 3}},
		Noise:  &arma.Noise{AR: oneMinus("p1", 1)}}
}

var mcTruth = map[string]float64{"c": 2, "w0": 1.5, "w1": -0.8, "d1": 0.6, "p1": 0.5}

// mcSim simulates n samples of mcModel with long burn-ins, so that
// the series are draws from the stationary process.
func mcSim(rng *rand.Rand, n int) (y, x []float64) {
	burn := 200
	m := n + burn
	xa := simAR1(rng, m, 0.5)
	u := make([]float64, m)
	filter.Run(u[3:], []float64{1.5, 0.8}, []float64{1, -0.6}, xa[:m-3])
	e := simAR1(rng, m, 0.5)
	ya := make([]float64, m)
	for i := range ya {
		ya[i] = 2 + u[i] + e[i]
	}
	return ya[burn:], xa[burn:]
}

// mcReplicate simulates n + h samples of mcModel and fits the
// model to the first n, failing the test on error. It returns the whole
// simulated series (the last h samples are the future), the estimate and
// the fitted data.
func mcReplicate(t *testing.T, rng *rand.Rand, n, h int) (y, x []float64, est *Estimate, data map[string][]float64) {
	t.Helper()
	y, x = mcSim(rng, n+h)
	data = map[string][]float64{"y": y[:n], "x": x[:n]}
	est, err := Fit(context.Background(), mcModel(), data, nil)
	if err != nil {
		t.Fatal(err)
	}
	return y, x, est, data
}

// TestFitMonteCarlo fits 100 replicates of n = 400 and checks that the
// 95 % intervals estimate -/+ 1.96 SE cover the truth in 89-99 % of the
// replicates for every parameter (the binomial(100, 0.95) range is about
// 90-99 at 99 %), and that the 95 % forecast intervals with the future
// input known cover 92-98 % of the simulated futures (100 replicates x 10
// steps; the steps of one replicate are correlated, hence the width).
// Fixed seeds make it deterministic.
func TestFitMonteCarlo(t *testing.T) {
	const reps, n, h = 100, 400, 10
	rng := rand.New(rand.NewPCG(2026, 12))
	cover := map[string]int{}
	fcCover, fcTotal := 0, 0
	for r := 0; r < reps; r++ {
		y, x, est, data := mcReplicate(t, rng, n, h)
		for _, p := range est.Params {
			if math.Abs(p.Value-mcTruth[p.Name]) <= 1.96*p.SE {
				cover[p.Name]++
			}
		}
		fc, err := est.Forecast(data, h, &ForecastSettings{Future: map[string][]float64{"x": x[n:]}})
		if err != nil {
			t.Fatal(err)
		}
		for j := 0; j < h; j++ {
			fcTotal++
			if y[n+j] >= fc.Lower[j] && y[n+j] <= fc.Upper[j] {
				fcCover++
			}
		}
	}
	for name := range mcTruth {
		if c := cover[name]; c < 89 || c > 99 {
			t.Errorf("%s: 95 %% interval covers the truth in %d of %d replicates", name, c, reps)
		}
	}
	if f := float64(fcCover) / float64(fcTotal); f < 0.92 || f > 0.98 {
		t.Errorf("forecast intervals cover %.3f of %d futures", f, fcTotal)
	}
	t.Logf("coverage %v, forecasts %d/%d", cover, fcCover, fcTotal)
}

// TestForecastInputsForecast checks the forecast intervals when the input
// is itself forecast from its AR model (fitted by Yule-Walker): over 100
// replicates x 10 steps the 95 % intervals cover 92-98 % of the futures.
// The standard errors equal those with the input known for the first
// b = 3 steps (which use only observed inputs) and exceed them after.
func TestForecastInputsForecast(t *testing.T) {
	const reps, n, h = 100, 400, 10
	rng := rand.New(rand.NewPCG(77, 78))
	in, total := 0, 0
	for r := 0; r < reps; r++ {
		y, x, est, data := mcReplicate(t, rng, n, h)
		fc, err := est.Forecast(data, h, nil)
		if err != nil {
			t.Fatal(err)
		}
		if fc.Inputs[0].Known || len(fc.Inputs[0].Model.AR) < 1 {
			t.Fatalf("input should be forecast: %+v", fc.Inputs[0])
		}
		known, err := est.Forecast(data, h, &ForecastSettings{Future: map[string][]float64{"x": x[n:]}})
		if err != nil {
			t.Fatal(err)
		}
		for j := 0; j < h; j++ {
			if j < 3 && math.Abs(fc.SE[j]-known.SE[j]) > 1e-12*known.SE[j] || j >= 3 && fc.SE[j] <= known.SE[j] {
				t.Fatalf("step %d: SE %v with the input forecast, %v with it known", j+1, fc.SE[j], known.SE[j])
			}
		}
		for j := 0; j < h; j++ {
			total++
			if y[n+j] >= fc.Lower[j] && y[n+j] <= fc.Upper[j] {
				in++
			}
		}
	}
	if f := float64(in) / float64(total); f < 0.92 || f > 0.98 {
		t.Errorf("forecast intervals with forecast inputs cover %.3f of %d futures", f, total)
	}
}
