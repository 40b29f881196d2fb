package predict_test

import (
	"fmt"
	"log"
	"math"

	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf/predict"
)

// A service's loop: build the predictor from the held model, warm it
// with history, feed live samples (one with its output missing), look
// ahead for a planned valve move, and snapshot the state for a restart.
func Example() {
	m, err := parse.Model("temp = 5 + 0.2 / (1 - 0.9 B) B^2 valve + 1 / (1 - 0.5 B) a")
	if err != nil {
		log.Fatal(err)
	}
	p, err := predict.New(m, 0.04, nil) // sigma2 of the fit
	if err != nil {
		log.Fatal(err)
	}
	// History: the valve at 40 % and the temperature settled at
	// 5 + 0.2/(1 - 0.9) 40 = 85.
	valve := make([]float64, 20)
	temp := make([]float64, 20)
	for i := range valve {
		valve[i], temp[i] = 40, 85
	}
	if err := p.Warm(map[string][]float64{"valve": valve, "temp": temp}); err != nil {
		log.Fatal(err)
	}
	for _, s := range []struct{ valve, temp float64 }{{50, 85.12}, {50, math.NaN()}, {50, 85.3}} {
		st, err := p.Update([]float64{s.valve}, s.temp)
		if err != nil {
			log.Fatal(err)
		}
		fmt.Printf("sample %d: predicted %.2f (%.2f to %.2f), error %.2f\n", st.Index, st.Mean, st.Lower, st.Upper, st.Error)
	}
	ahead := make([]predict.Point, 30)
	if err := p.Forecast(ahead, [][]float64{{50}}); err != nil { // valve held at 50 %
		log.Fatal(err)
	}
	fmt.Printf("in 30 samples: %.1f (%.1f to %.1f)\n", ahead[29].Mean, ahead[29].Lower, ahead[29].Upper)

	snap, _ := p.MarshalBinary() // store it; after a restart:
	q, _ := predict.New(m, 0.04, nil)
	if err := q.UnmarshalBinary(snap); err != nil {
		log.Fatal(err)
	}
	fmt.Println("restored after", q.Count(), "samples")
	// Output:
	// sample 20: predicted 85.00 (84.61 to 85.39), error 0.12
	// sample 21: predicted 85.06 (84.67 to 85.45), error NaN
	// sample 22: predicted 87.03 (86.59 to 87.47), error -1.73
	// in 30 samples: 104.2 (103.8 to 104.7)
	// restored after 23 samples
}

// A live stream that starts after the fit's record: the model was
// fitted to 1000 samples and found a level shift at record sample 600
// (step(600)) and a pulse at 990; the stream's first sample is record
// sample 1000, so Offset 1000 places both before it. The step is on
// from the start, in its steady state 0.5/(1 - 0.7) = 1.67 above the
// base level 20; the pulse is over.
func ExampleSettings_offset() {
	m, err := parse.Model("temp = 20 + 0.5 / (1 - 0.7 B) step(600) + 3 pulse(990) + a")
	if err != nil {
		log.Fatal(err)
	}
	p, err := predict.New(m, 0.01, &predict.Settings{Offset: 1000})
	if err != nil {
		log.Fatal(err)
	}
	for _, y := range []float64{21.7, 21.6} {
		st, err := p.Update(nil, y)
		if err != nil {
			log.Fatal(err)
		}
		fmt.Printf("sample %d (record sample %d): predicted %.2f\n", st.Index, 1000+st.Index, st.Mean)
	}
	// Output:
	// sample 0 (record sample 1000): predicted 21.67
	// sample 1 (record sample 1001): predicted 21.67
}
