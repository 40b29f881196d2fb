package chart_test

import (
	"fmt"
	"image/color"
	"image/png"
	"log"
	"math"
	"os"
	"path/filepath"

	"github.com/backshift/backshift/examples/chart"
)

// Example draws the step response of a first-order lag, 0.2/(1 - 0.9 B),
// with its final value, into a PNG file and reads back its size.
func Example() {
	dir, err := os.MkdirTemp("", "chart")
	if err != nil {
		log.Fatal(err)
	}
	defer os.RemoveAll(dir)

	var t, y []float64
	for k := range 60 {
		t = append(t, float64(k))
		y = append(y, 2*(1-math.Pow(0.9, float64(k+1))))
	}
	c := chart.New("Step response", "time (min)", "output")
	c.Legend("final value 2", c.HLine(2, 0, 59, color.Gray{Y: 110}).Dashed(4, 3))
	c.Legend("response", c.Line(t, y, color.RGBA{B: 190, A: 255}, 2))

	path := filepath.Join(dir, "step.png")
	if err := chart.Save(path, []*chart.Chart{c}, 12, 7); err != nil {
		log.Fatal(err)
	}
	f, err := os.Open(path)
	if err != nil {
		log.Fatal(err)
	}
	defer f.Close()
	cfg, err := png.DecodeConfig(f)
	if err != nil {
		log.Fatal(err)
	}
	fmt.Printf("%s: %d x %d pixels\n", filepath.Base(path), cfg.Width, cfg.Height)
	// Output: step.png: 1039 x 606 pixels
}

// ExampleMovingAverage shows the slow part of a series that jumps up
// and down every sample, as a dithered valve does.
func ExampleMovingAverage() {
	fmt.Printf("%.2f\n", chart.MovingAverage([]float64{0, 10, 0, 10, 0, 10}, 3))
	// Output: [5.00 3.33 6.67 3.33 6.67 5.00]
}
