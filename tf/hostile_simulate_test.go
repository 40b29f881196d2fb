package tf_test

import (
	"errors"
	"math"
	"strconv"
	"strings"
	"testing"

	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf"
)

// TestHostileSimulateBurnIn checks that a burn-in above MaxBurnIn is a
// *SettingError naming BurnIn and the limit, returned at once (BurnIn =
// math.MaxInt would draw innovations practically for ever), and that
// the limit itself does not apply when Innovations are given (BurnIn is
// then ignored).
func TestHostileSimulateBurnIn(t *testing.T) {
	m := parse.MustModel("y = 0.5 x + 1 / (1 - 0.6 B) a")
	in := map[string][]float64{"x": {1, 2, 3}}
	for _, b := range []int{tf.MaxBurnIn + 1, math.MaxInt} {
		y, err := m.Simulate(in, &tf.SimSettings{Sigma: 1, BurnIn: b})
		var se *tf.SettingError
		if !errors.As(err, &se) || se.Setting != "SimSettings.BurnIn" || se.Value != strconv.Itoa(b) || se.Op != "tf.Model.Simulate" || !errors.Is(err, tf.ErrSetting) {
			t.Fatalf("BurnIn %d: got %v, %v; want *tf.SettingError for BurnIn", b, y, err)
		}
		if !strings.Contains(err.Error(), "must be at most tf.MaxBurnIn (16777216 draws); 0 means automatic, a negative value none") {
			t.Errorf("BurnIn %d: message %q", b, err.Error())
		}
	}
	if _, err := m.Simulate(in, &tf.SimSettings{BurnIn: math.MaxInt, Innovations: []float64{0, 0, 0}}); err != nil {
		t.Errorf("BurnIn ignored with Innovations: %v", err)
	}
}

// TestHostileSimulateOverflow checks that an output that overflows
// float64 is a *SimError for the output, naming the sample and the noise
// scale, instead of +-Inf or NaN returned silently. Sigma = 1e308 times
// a standard normal draw (|z| > 1.8 with probability 0.07 per draw)
// overflows within the 200 samples for these seeds, and the AR filter
// 1/(1 - 0.6 B) amplifies what does not; an input of 1e308 through the
// gain 2 overflows at once.
func TestHostileSimulateOverflow(t *testing.T) {
	m := parse.MustModel("y = 0.5 x + 1 / (1 - 0.6 B) a")
	x := make([]float64, 200)
	for _, c := range []struct {
		name string
		s    tf.SimSettings
		msg  string
	}{
		{"Sigma 1e308", tf.SimSettings{Sigma: 1e308, Seed1: 1, Seed2: 2},
			"the output overflowed float64 (noise scale Sigma = 1e+308)"},
		{"Sigma 1e308 with burn-in", tf.SimSettings{Sigma: 1e308, Seed1: 1, Seed2: 2, BurnIn: 500},
			"tf.Model.Simulate: output y: step 0 gave "},
		{"max float Sigma", tf.SimSettings{Sigma: math.MaxFloat64, Seed1: 3, Seed2: 4},
			"(noise scale Sigma = 1.7976931348623157e+308)"},
	} {
		t.Run(c.name, func(t *testing.T) {
			y, err := m.Simulate(map[string][]float64{"x": x}, &c.s)
			var se *tf.SimError
			if !errors.As(err, &se) || se.Part != "output y" || !errors.Is(err, tf.ErrOverflow) {
				t.Fatalf("got %v, %v; want *tf.SimError for the output", y, err)
			}
			if !strings.Contains(err.Error(), c.msg) {
				t.Errorf("message %q, want it to contain %q", err.Error(), c.msg)
			}
		})
	}
	big := parse.MustModel("y = 2 x")
	_, err := big.Simulate(map[string][]float64{"x": {1, 1e308}}, nil)
	if err == nil || err.Error() != "tf.Model.Simulate: output y: step 1 gave +Inf: the output overflowed float64 (the inputs, the innovations or an unstable term is too large)" {
		t.Errorf("input overflow: %v", err)
	}
}
