// Command fitpeer times fit.Model on CSV files written by
// testdata/peer/fit_scipy.py; see that script for how to run it.
package main

import (
	"context"
	"encoding/json"
	"flag"
	"fmt"
	"os"

	"github.com/backshift/backshift/arma"
	"github.com/backshift/backshift/internal/testutil"
	"github.com/backshift/backshift/testdata/peer/internal/timing"
	"github.com/backshift/backshift/tf"
	"github.com/backshift/backshift/tf/fit"
)

func main() {
	reps := flag.Int("reps", 3, "timed repetitions (the best is reported)")
	flag.Parse()
	for _, path := range flag.Args() {
		data, err := readCSV(path)
		if err != nil {
			fmt.Fprintln(os.Stderr, err)
			os.Exit(1)
		}
		m := model()
		var est *fit.Estimate
		best, err := timing.Best(*reps, func() (err error) {
			est, err = fit.Model(context.Background(), m, data, nil)
			return err
		})
		if err != nil {
			fmt.Fprintln(os.Stderr, err)
			os.Exit(1)
		}
		par := map[string]float64{}
		for _, p := range est.Params {
			par[p.Name] = p.Value
		}
		out, _ := json.Marshal(map[string]any{"file": path, "seconds": best.Seconds(), "ssq": est.SSQ,
			"n_resid": est.N, "params": par, "iter": est.Iter, "converged": est.Converged})
		fmt.Println(string(out))
	}
}

// model is y_t = c + (w0 + w1 B + w2 B^2)/(1 - d1 B) B^3 x_t + 1/(1 - p1 B - p2 B^2) a_t,
// every free coefficient started at 0 (fit.Model computes the start values).
func model() tf.Model {
	free := func(neg bool, name string, pow int) tf.Term {
		return tf.Term{Neg: neg, Coef: tf.Coef{Name: name, Free: true}, Power: pow}
	}
	one := tf.Term{Coef: tf.Coef{Value: 1}}
	c := tf.Coef{Name: "c", Free: true}
	return tf.Model{
		Output: "y",
		Const:  &c,
		Inputs: []tf.Input{{Series: "x", Delay: 3,
			Num: tf.Poly{Factors: []tf.Factor{{Exp: 1, Terms: []tf.Term{free(false, "w0", 0), free(false, "w1", 1), free(false, "w2", 2)}}}},
			Den: tf.Poly{Factors: []tf.Factor{{Exp: 1, Terms: []tf.Term{one, free(true, "d1", 1)}}}}}},
		Noise: &arma.Noise{AR: tf.Poly{Factors: []tf.Factor{{Exp: 1, Terms: []tf.Term{one, free(true, "p1", 1), free(true, "p2", 2)}}}}},
	}
}

// readCSV reads a file of fit_scipy.py: a header line naming the
// series, then one line of numbers per sample.
func readCSV(path string) (map[string][]float64, error) {
	tb, err := testutil.LoadCSV(path)
	if err != nil {
		return nil, err
	}
	return tb.Num, nil
}
