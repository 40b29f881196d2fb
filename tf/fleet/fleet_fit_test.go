package fleet_test

import (
	"context"
	"flag"
	"fmt"
	"math"
	"math/rand/v2"
	"runtime"
	"slices"
	"testing"

	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf"
	"github.com/backshift/backshift/tf/fleet"
	"github.com/backshift/backshift/tf/identify"
	"github.com/backshift/backshift/tf/monitor"
	"github.com/backshift/backshift/tf/predict"
)

// fitLoops is the number of loops of BenchmarkFitFleet. The issue's
// figure is 1000 loops of 10^4 samples; a benchmark run of that takes
// minutes on 2 cores, so the default is smaller. Measure it by hand:
//
//	go test ./tf/fleet -run '^$' -bench FitFleet -benchtime 1x -cpu 2 -fleet.loops 1000
//
// Measured once that way: 208 s for 1000 loops, 4.8 loops/s (2 cores of
// the shared development machine).
var fitLoops = flag.Int("fleet.loops", 20, "loops of BenchmarkFitFleet")

// plantLoop simulates n samples of loop number loop of a site: a
// first-order path with a dead time of 1 to 5 samples, a gain of 0.5 to 2
// and a pole of 0.6 to 0.9, driven by a random binary test signal
// (holding each level 1 to 10 samples), with AR(1) noise; every number
// drawn from the loop's own seed (fleet.Seed), so that the record does
// not depend on which worker builds it. It returns the data and the
// true dead time.
func plantLoop(loop, n int) (map[string][]float64, int, error) {
	rng := rand.New(rand.NewPCG(fleet.Seed(2026, loop), 0))
	delay := 1 + rng.IntN(5)
	pole := 0.6 + 0.3*rng.Float64()
	gain := 0.5 + 1.5*rng.Float64()
	spec := fmt.Sprintf("y = %.6g / (1 - %.6g B) B^%d u + 1 / (1 - 0.5 B) a", gain*(1-pole), pole, delay)
	m, err := parse.Model(spec)
	if err != nil {
		return nil, 0, err
	}
	u := make([]float64, n)
	level := 1.0
	for i := 0; i < n; {
		if rng.IntN(2) == 0 {
			level = -level
		}
		for hold := 1 + rng.IntN(10); hold > 0 && i < n; hold-- {
			u[i] = level
			i++
		}
	}
	y, err := m.Simulate(map[string][]float64{"u": u}, &tf.SimSettings{Seed1: fleet.Seed(2027, loop), Sigma: 0.3})
	if err != nil {
		return nil, 0, err
	}
	return map[string][]float64{"y": y, "u": u}, delay, nil
}

// identified is what the fleet keeps of a loop: the best candidate's
// label, dead time, estimates and residual variance.
type identified struct {
	Label  string
	Delay  int
	Values []float64
	Sigma2 float64
}

// identifyLoop identifies and fits one loop's model from its record
// (identify.Candidates: dead time, orders and noise from the data, every
// candidate fitted by fit.Model and ranked by BIC), with one worker
// inside the loop so that the fleet's pool is the only parallelism.
func identifyLoop(n int) func(ctx context.Context, loop int) (identified, error) {
	return func(ctx context.Context, loop int) (identified, error) {
		data, _, err := plantLoop(loop, n)
		if err != nil {
			return identified{}, err
		}
		cands, err := identify.Candidates(ctx, "y", []string{"u"}, data, &identify.Settings{Workers: 1})
		if err != nil {
			return identified{}, err
		}
		best := cands[0]
		out := identified{Label: best.Label(), Delay: best.Estimate.Model.Inputs[0].Delay, Sigma2: best.Estimate.Sigma2}
		for _, p := range best.Estimate.Params {
			out.Values = append(out.Values, p.Value)
		}
		return out, nil
	}
}

// Identifying a fleet gives every loop the same model, to the bit,
// with one worker and with two; and the identification finds each
// loop's simulated dead time (in a record of 2000 samples whose path
// has 1.4 to 5.7 times the noise's standard deviation, the dead time is
// clear in the cross-correlation: common practice).
func TestFitFleetWorkers(t *testing.T) {
	const loops, n = 6, 2000
	one, err := fleet.Run(context.Background(), loops, identifyLoop(n), &fleet.Settings{Workers: 1})
	if err != nil {
		t.Fatal(err)
	}
	two, err := fleet.Run(context.Background(), loops, identifyLoop(n), &fleet.Settings{Workers: 2})
	if err != nil {
		t.Fatal(err)
	}
	for i := range one {
		a, b := one[i], two[i]
		if a.Err != nil || b.Err != nil {
			t.Errorf("loop %d: %v, %v", i, a.Err, b.Err)
			continue
		}
		if a.Value.Label != b.Value.Label || !slices.Equal(a.Value.Values, b.Value.Values) || a.Value.Sigma2 != b.Value.Sigma2 {
			t.Errorf("loop %d: %+v with one worker, %+v with two", i, a.Value, b.Value)
		}
		if _, delay, _ := plantLoop(i, 10); a.Value.Delay != delay {
			t.Errorf("loop %d: dead time %d identified, %d simulated (%s)", i, a.Value.Delay, delay, a.Value.Label)
		}
	}
}

// BenchmarkFitFleet identifies and fits fitLoops loops of 10^4 samples
// each (plantLoop, identifyLoop) on a pool of GOMAXPROCS workers (-cpu 2
// for the two cores) and reports loops/s.
func BenchmarkFitFleet(b *testing.B) {
	for i := 0; i < b.N; i++ {
		res, err := fleet.Run(context.Background(), *fitLoops, identifyLoop(10_000), nil)
		if err != nil {
			b.Fatal(err)
		}
		for l, r := range res {
			if r.Err != nil {
				b.Fatalf("loop %d: %v", l, r.Err)
			}
		}
	}
	b.ReportMetric(float64(*fitLoops*b.N)/b.Elapsed().Seconds(), "loops/s")
}

// monitoredSpec is a loop as a service runs it: two inputs with
// first-order paths and dead times, ARMA(1, 1) noise (the greenhouse
// model of examples/greenhouse).
const monitoredSpec = "temp = 6 + 0.01 / (1 - 0.95 B) B^3 valve + 0.05 / (1 - 0.9 B) B outdoor + (1 + 0.3 B) / (1 - 0.8 B) a"

// BenchmarkMonitoredLoopMemory reports the heap taken by one monitored
// loop, a predictor and a monitor watching each input at two lags
// (the setup of examples/monitor), as the growth of the live heap over
// 1000 of them after a garbage collection, divided by 1000.
func BenchmarkMonitoredLoopMemory(b *testing.B) {
	m, err := parse.Model(monitoredSpec)
	if err != nil {
		b.Fatal(err)
	}
	const loops = 1000
	perLoop := 0.0
	for i := 0; i < b.N; i++ {
		type monitored struct {
			p   *predict.Predictor
			mon *monitor.Monitor
		}
		keep := make([]monitored, loops)
		var before, after runtime.MemStats
		runtime.GC()
		runtime.ReadMemStats(&before)
		for l := range keep {
			p, err := predict.New(m, 0.03*0.03, nil)
			if err != nil {
				b.Fatal(err)
			}
			mon, err := monitor.New(&monitor.Settings{Lags: [][]int{{3, 4}, {1, 2}}})
			if err != nil {
				b.Fatal(err)
			}
			keep[l] = monitored{p, mon}
		}
		runtime.GC()
		runtime.ReadMemStats(&after)
		perLoop = float64(after.HeapAlloc-before.HeapAlloc) / loops
		runtime.KeepAlive(keep)
	}
	b.ReportMetric(perLoop, "B/loop")
	b.ReportMetric(math.Round(1e9/perLoop), "loops/GB")
}
