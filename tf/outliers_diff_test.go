package tf_test

import (
	"errors"
	"math"
	"strings"
	"testing"

	"github.com/backshift/backshift/arma"
	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf"
)

// TestWithOutliersRefuses: an outlier WithOutliers cannot place is a
// typed *SettingError naming outs[i] and the field (the
// finding: Index -3 printed "ao-3 pulse(-3)", a spec that does not parse
// back, and Kind 0 was skipped as if innovational), and the caller's
// model is not modified. The forms of the accepted kinds on a model
// with D(B) = (1 - B)(1 - B^12): one (1 - B) cancels the level shift's
// step, the rest of D(B) stays (Box & Tiao 1975, the intervention on
// the observed series; common practice for differenced models).
func TestWithOutliersRefuses(t *testing.T) {
	m := parse.MustModel("(1 - B)(1 - B^12) y = w0 B x + 1 / (1 - p1 B) a")
	before := m.String()
	for _, c := range []struct {
		o     arma.Outlier
		field string
	}{
		{arma.Outlier{Index: -3, Kind: arma.Additive, Size: 1}, "outs[1].Index = -3"},
		{arma.Outlier{Index: tf.MaxEventIndex + 1, Kind: arma.LevelShift, Size: 1}, "outs[1].Index = 1073741825"},
		{arma.Outlier{Index: 40, Kind: 0, Size: 1}, "outs[1].Kind = 0"},
		{arma.Outlier{Index: 40, Kind: arma.Innovational + 1, Size: 1}, "outs[1].Kind = 5"},
		{arma.Outlier{Index: 40, Kind: arma.Additive, Size: math.NaN()}, "outs[1].Size = NaN"},
	} {
		outs := []arma.Outlier{{Index: 10, Kind: arma.Additive, Size: 2}, c.o}
		_, _, err := m.WithOutliers(outs, 0.7)
		var se *tf.SettingError
		if !errors.As(err, &se) || !errors.Is(err, tf.ErrSetting) || !strings.Contains(err.Error(), c.field) {
			t.Errorf("%+v: got %v, want a *SettingError on %s", c.o, err, c.field)
		}
	}
	m2, _, err := m.WithOutliers([]arma.Outlier{{Index: 10, Kind: arma.Additive, Size: 2}, {Index: 20, Kind: arma.LevelShift, Size: 1},
		{Index: 30, Kind: arma.TemporaryChange, Size: 1}}, 0.7)
	if err != nil {
		t.Fatal(err)
	}
	want := "(1 - B)(1 - B^12) y = w0 B x + ao10 (1 - B) (1 - B^12) pulse(10) + ls20 (1 - B^12) pulse(20) + tc30 (1 - B) (1 - B^12) / (1 - 0.7 B) pulse(30) + 1 / (1 - p1 B) a; where ao10 ~ 2, ls20 ~ 1, tc30 ~ 1"
	if got := m2.String(); got != want {
		t.Errorf("got  %s\nwant %s", got, want)
	}
	if m.String() != before {
		t.Errorf("the caller's model changed: %s", m)
	}
	sq := parse.MustModel("(1 - B)^2 y = w0 B x + a")
	m3, _, err := sq.WithOutliers([]arma.Outlier{{Index: 20, Kind: arma.LevelShift, Size: 1}}, 0.7)
	if err != nil || !strings.Contains(m3.String(), " + ls20 (1 - B) pulse(20) + ") {
		t.Errorf("(1 - B)^2: %v %s", err, m3)
	}
}
