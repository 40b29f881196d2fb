package online_test

import (
	"context"
	"fmt"
	"math/rand/v2"
	"strings"

	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf"
	"github.com/backshift/backshift/tf/online"
)

// A heating valve whose gain drops by a third at sample 1500 (a fouled
// heat exchanger): the recursive estimate of the gain, printed every 250
// samples with a bar as a picture of its trajectory, follows it at
// forgetting 0.99 (a memory of about 100 samples) within about 500
// samples. The valve is given as its deviation from the usual opening,
// so that the constant carries the level and the gain is not confounded
// with it.
func ExampleEstimator() {
	before, _ := parse.Model("temp = c + w / (1 - d B) B^2 valve + 1 / (1 - p B) a; where c ~ 35, w ~ 0.3, d ~ 0.7, p ~ 0.5")
	after := before.Clone()
	after.Inputs[0].Num.Factors[0].Terms[0].Coef.Value = 0.2
	r := rand.New(rand.NewPCG(1, 2))
	valve := make([]float64, 3000)
	v := -10.0
	for t := range valve {
		if r.Float64() < 0.05 { // a plant test: 10 % below or above the usual opening, switched at random
			v = -v
		}
		valve[t] = v
	}
	in := map[string][]float64{"valve": valve}
	temp, _ := before.Simulate(in, &tf.SimSettings{Sigma: 0.2, Seed1: 3})
	temp2, _ := after.Simulate(in, &tf.SimSettings{Sigma: 0.2, Seed1: 3})
	copy(temp[1500:], temp2[1500:])

	est, err := online.New(before, &online.Settings{Forgetting: 0.99})
	if err != nil {
		fmt.Println(err)
		return
	}
	x := make([]float64, 1)
	ps := make([]online.Param, 0, 4)
	for t := range temp {
		x[0] = valve[t]
		if err := est.Update(x, temp[t]); err != nil {
			fmt.Println(err)
			return
		}
		if (t+1)%250 == 0 {
			ps = est.Params(ps[:0])
			gain := ps[1].Value / (1 - ps[2].Value) // w / (1 - d)
			fmt.Printf("%4d  gain %.2f  (w %.3f, SE %.3f)  %s\n", t+1, gain, ps[1].Value, ps[1].SE, strings.Repeat("#", int(gain*20+0.5)))
		}
	}
	fmt.Printf("%+v\n", est.Counts())
	// Output:
	// 250  gain 1.00  (w 0.300, SE 0.002)  ####################
	//  500  gain 1.00  (w 0.301, SE 0.002)  ####################
	//  750  gain 1.00  (w 0.303, SE 0.003)  ####################
	// 1000  gain 0.99  (w 0.303, SE 0.003)  ####################
	// 1250  gain 1.00  (w 0.298, SE 0.002)  ####################
	// 1500  gain 1.00  (w 0.300, SE 0.002)  ####################
	// 1750  gain 0.88  (w 0.224, SE 0.005)  ##################
	// 2000  gain 0.72  (w 0.202, SE 0.005)  ##############
	// 2250  gain 0.66  (w 0.197, SE 0.003)  #############
	// 2500  gain 0.66  (w 0.199, SE 0.002)  #############
	// 2750  gain 0.67  (w 0.201, SE 0.002)  #############
	// 3000  gain 0.67  (w 0.199, SE 0.002)  #############
	// {Samples:3000 Updates:2960 DeadZone:0 Rejected:0 Bounded:0 Resets:0}
}

// A Refitter keeps the live model of a service and refits it in the
// background every 500 samples over the latest 1000; here the refit
// function only counts the window, where a service would call the batch
// fit (fit the live model to the window, return the fitted model).
func ExampleRefitter() {
	m, _ := parse.Model("y = w / (1 - d B) B x + a; where w ~ 0.5, d ~ 0.6")
	refit := func(ctx context.Context, live tf.Model, window map[string][]float64) (tf.Model, error) {
		fmt.Printf("refit over %d samples\n", len(window["y"]))
		return live, nil
	}
	r, err := online.NewRefitter(context.Background(), m, refit, &online.RefitSettings{Window: 1000, Every: 500})
	if err != nil {
		fmt.Println(err)
		return
	}
	defer r.Close()
	for t := 0; t < 2000; t++ {
		if err := r.Add([]float64{float64(t % 7)}, float64(t%5)); err != nil {
			fmt.Println(err)
			return
		}
		r.Wait() // for a deterministic example; a service does not wait
	}
	fmt.Printf("%+v\n", r.Counts())
	// Output:
	// refit over 1000 samples
	// refit over 1000 samples
	// refit over 1000 samples
	// {Started:3 Swapped:3 Failed:0 Skipped:0}
}
