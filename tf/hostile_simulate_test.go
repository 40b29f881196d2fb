package tf_test

import (
	"errors"
	"math"
	"strings"
	"testing"

	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf"
)

// TestHostileSimulateBurnIn checks that a burn-in above MaxBurnIn is an
// *ArgError naming BurnIn and the limit, returned at once (BurnIn =
// math.MaxInt used to draw innovations practically for ever), and that
// the limit itself does not apply when Innovations are given (BurnIn is
// then ignored).
func TestHostileSimulateBurnIn(t *testing.T) {
	m := parse.MustModel("y = 0.5 x + 1 / (1 - 0.6 B) a")
	in := map[string][]float64{"x": {1, 2, 3}}
	for _, b := range []int{tf.MaxBurnIn + 1, math.MaxInt} {
		y, err := m.Simulate(in, &tf.SimSettings{Sigma: 1, BurnIn: b})
		var ae *tf.ArgError
		if !errors.As(err, &ae) || ae.Arg != "BurnIn" || ae.Value != float64(b) {
			t.Fatalf("BurnIn %d: got %v, %v; want *tf.ArgError for BurnIn", b, y, err)
		}
		if !strings.Contains(err.Error(), "must be at most tf.MaxBurnIn (16777216 draws)") {
			t.Errorf("BurnIn %d: message %q", b, err.Error())
		}
	}
	if _, err := m.Simulate(in, &tf.SimSettings{BurnIn: math.MaxInt, Innovations: []float64{0, 0, 0}}); err != nil {
		t.Errorf("BurnIn ignored with Innovations: %v", err)
	}
}
