package fleet_test

import (
	"context"
	"fmt"
	"math/rand/v2"

	"github.com/backshift/backshift/tf/fleet"
)

// Five loops, each with its own simulated record (seeded from the loop
// index, so that the results do not depend on the pool size): the job
// returns the record's mean, and loop 3 has no data.
func Example() {
	job := func(_ context.Context, loop int) (float64, error) {
		if loop == 3 {
			return 0, fmt.Errorf("loop %d: no samples", loop)
		}
		rng := rand.New(rand.NewPCG(fleet.Seed(7, loop), 0))
		sum := 0.0
		for i := 0; i < 1000; i++ {
			sum += float64(loop) + rng.NormFloat64()
		}
		return sum / 1000, nil
	}
	res, err := fleet.Run(context.Background(), 5, job, &fleet.Settings{Workers: 2})
	if err != nil {
		fmt.Println(err)
		return
	}
	for i, r := range res {
		if r.Err != nil {
			fmt.Printf("loop %d: %v\n", i, r.Err)
			continue
		}
		fmt.Printf("loop %d: mean %.1f\n", i, r.Value)
	}
	// Output:
	// loop 0: mean 0.0
	// loop 1: mean 1.0
	// loop 2: mean 2.0
	// loop 3: loop 3: no samples
	// loop 4: mean 4.0
}
