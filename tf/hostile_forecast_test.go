package tf

import (
	"context"
	"errors"
	"math"
	"strconv"
	"strings"
	"testing"

	"github.com/backshift/backshift/arma"
)

// TestHostileForecastHorizon checks that a horizon above MaxHorizon is
// a *SettingError naming h and the limit, returned at once; before the limit
// h = 1<<40 asked for terabytes of forecast series.
func TestHostileForecastHorizon(t *testing.T) {
	y := []float64{0, 1, 0.5, 1.5, 1, 2, 1.2, 2.5, 2, 3, 2.2, 3.4}
	c := Coef{Name: "c", Free: true}
	m := Model{Output: "y", Diff: diff1, Const: &c, Noise: &arma.Noise{}}
	data := map[string][]float64{"y": y}
	est, err := Fit(context.Background(), m, data, nil)
	if err != nil {
		t.Fatal(err)
	}
	for _, h := range []int{MaxHorizon + 1, 1 << 40, math.MaxInt} {
		fc, err := est.Forecast(data, h, nil)
		var ae *SettingError
		if !errors.As(err, &ae) || ae.Setting != "h" || ae.Value != strconv.Itoa(h) {
			t.Fatalf("h = %d: got %v, %v; want *SettingError for h", h, fc != nil, err)
		}
		if msg := err.Error(); !strings.Contains(msg, "tf.Estimate.Forecast: h = ") || !strings.Contains(msg, "must be at most tf.MaxHorizon (1048576 steps)") {
			t.Errorf("h = %d: message %q", h, msg)
		}
	}
	if testing.Short() {
		return
	}
	fc, err := est.Forecast(data, MaxHorizon, nil)
	if err != nil || len(fc.Mean) != MaxHorizon {
		t.Fatalf("h = MaxHorizon: %v", err)
	}
}
