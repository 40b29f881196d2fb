package ccf

import (
	"errors"
	"math"
	"strings"
	"testing"

	"github.com/backshift/backshift/internal/testutil"
)

// TestSettingsValidate: every field of Settings, IdentifySettings and
// DistributedLagSettings with a bad value gives a *SettingError naming the
// field, from Validate and from the call that takes the settings. Fields
// with no bad value: Settings.Names (names for messages),
// DistributedLagSettings.Output; IdentifySettings.MaxR/MaxS and
// DistributedLagSettings.ARP negative are documented (order zero only,
// no AR noise) and accepted.
func TestSettingsValidate(t *testing.T) {
	x, y := lagged(200)
	nan := math.NaN()
	check := func(how, field, want string, err error) {
		t.Helper()
		var ae *SettingError
		if !errors.As(err, &ae) || ae.Setting != field || !strings.Contains(err.Error(), want) || !errors.Is(err, ErrSetting) {
			t.Errorf("%s: %T %v, want a *SettingError on %s containing %q", how, err, err, field, want)
		}
		if how != "Validate" && ae != nil && ae.Op != "ccf."+how {
			t.Errorf("%s: Op %q, want %q", how, ae.Op, "ccf."+how)
		}
	}
	for _, m := range []Method{-1, 3} {
		s := Settings{Method: m}
		check("Validate", "Settings.Method", "Auto, Direct or FFT", s.Validate())
		check("Cross", "Settings.Method", "Auto, Direct or FFT", second(Cross(x, y, 3, &s)))
		check("ImpulseWeights", "Settings.Method", "Auto, Direct or FFT", second(ImpulseWeights(x, y, 3, "valve", &s)))
	}
	w := &Weights{Input: "valve", V: []float64{0, 0, 1, 0.6, 0.36, 0.2}, SE: []float64{0.05, 0.05, 0.05, 0.05, 0.05, 0.05}, N: 400}
	ids := []struct {
		s     IdentifySettings
		field string
		want  string
	}{
		{IdentifySettings{Level: 1}, "IdentifySettings.Level", "IdentifySettings.Level = 1: must lie strictly between 0 and 1 (0 means 0.99)"},
		{IdentifySettings{Level: -0.5}, "IdentifySettings.Level", "strictly between 0 and 1"},
		{IdentifySettings{Level: nan}, "IdentifySettings.Level", "strictly between 0 and 1"},
		{IdentifySettings{Penalty: -1}, "IdentifySettings.Penalty", "IdentifySettings.Penalty = -1: must be a finite number, zero or positive (0 means 2, the AIC weight)"},
		{IdentifySettings{Penalty: math.Inf(1)}, "IdentifySettings.Penalty", "finite number, zero or positive"},
		{IdentifySettings{Penalty: nan}, "IdentifySettings.Penalty", "finite number, zero or positive"},
		{IdentifySettings{MinFraction: 1}, "IdentifySettings.MinFraction", "must be below 1 (0 means 0.1, a negative value no bound)"},
		{IdentifySettings{MinFraction: nan}, "IdentifySettings.MinFraction", "below 1"},
	}
	for _, c := range ids {
		check("Validate", c.field, c.want, c.s.Validate())
		check("Identify", c.field, c.want, second(Identify(w, &c.s)))
	}
	// Documented values are accepted.
	for _, s := range []IdentifySettings{{MaxR: -1, MaxS: -1}, {MinFraction: -1}, {Input: "valve position"}} {
		if _, err := Identify(w, &s); err != nil {
			t.Errorf("documented settings %+v: %v", s, err)
		}
	}
	dls := []struct {
		s     DistributedLagSettings
		field string
		want  string
	}{
		{DistributedLagSettings{Lags: -1}, "DistributedLagSettings.Lags", "DistributedLagSettings.Lags = -1: must be zero or positive (0 means min(24, n/(4 inputs)), at least 1)"},
		{DistributedLagSettings{MaxIter: -1}, "DistributedLagSettings.MaxIter", "must be zero or positive (0 means 50)"},
		{DistributedLagSettings{Names: []string{"a", "a"}}, "DistributedLagSettings.Names", `"a" twice`},
	}
	for _, c := range dls {
		check("Validate", c.field, c.want, c.s.Validate())
		check("DistributedLag", c.field, c.want, second(DistributedLag(y, [][]float64{x, x}, &c.s)))
	}
	// Checks against the data: more names than inputs, and a given name
	// equal to the default name of another input.
	check("DistributedLag", "DistributedLagSettings.Names", "at most one per input",
		second(DistributedLag(y, [][]float64{x}, &DistributedLagSettings{Names: []string{"a", "b"}})))
	check("DistributedLag", "DistributedLagSettings.Names", `named "x1" like input 1`,
		second(DistributedLag(y, [][]float64{x, x}, &DistributedLagSettings{Names: []string{"", "x1"}})))
	if _, err := DistributedLag(y, [][]float64{x}, &DistributedLagSettings{ARP: -1}); err != nil {
		t.Errorf("documented ARP -1: %v", err)
	}
	for _, err := range []error{(*Settings)(nil).Validate(), (*IdentifySettings)(nil).Validate(), (*DistributedLagSettings)(nil).Validate()} {
		if err != nil {
			t.Errorf("nil settings: %v", err)
		}
	}
}

// lagged returns an input with some memory and an output that follows it
// two samples later, plus a deterministic wobble.
func lagged(n int) (x, y []float64) {
	x, y = make([]float64, n), make([]float64, n)
	for i := range x {
		x[i] = math.Sin(float64(i*i)*0.37) + 0.3*math.Cos(float64(i)*1.1)
		if i >= 2 {
			y[i] = 0.8*x[i-2] + 0.2*math.Sin(float64(i)*2.3)
		}
	}
	return x, y
}

func second[T any](_ T, err error) error { return err }

// TestMessages: a constant series prints its value rounded (0.1 + 0.2
// printed 0.30000000000000004; a filtered constant printed rounding
// noise such as -2.22e-15 under the internal name "output (filtered)"),
// and values whose squares overflow or underflow name the series and,
// for the overflow, the index.
func TestMessages(t *testing.T) {
	x, _ := lagged(50)
	flat := make([]float64, 50)
	tiny := make([]float64, 50)
	big := append([]float64(nil), x...)
	for i := range flat {
		flat[i] = 0.1 + 0.2
		tiny[i] = x[i] * 1e-300
	}
	big[17] = -1e300
	// A constant filtered by (1 - B) and a mean removal: rounding noise.
	filtered := make([]float64, 49)
	for i := range filtered {
		filtered[i] = -2.220446049250313e-15
	}
	cases := []struct {
		name string
		err  error
		want []string
		not  []string
	}{
		{"constant", second(Cross(x, flat, 3, &Settings{Names: [2]string{"valve", "flow"}})),
			[]string{`ccf.Cross: series "flow" is constant (every sample is 0.3; its correlations are undefined)`}, []string{"0.30000000000000004"}},
		{"filtered constant", second(ImpulseWeights(x[1:], filtered, 3, "valve", nil)),
			[]string{`ccf.ImpulseWeights: series "output" is constant (after the prewhitening filter of input "valve": `}, []string{"e-15", "(filtered)"}},
		{"overflow", second(Cross(x, big, 3, &Settings{Names: [2]string{"valve", "flow"}})),
			[]string{`ccf.Cross: series "flow" sample 17 is -1e+300, beyond the largest magnitude accepted`, "rescale"}, nil},
		{"underflow", second(Cross(tiny, x, 3, &Settings{Names: [2]string{"valve", "flow"}})),
			[]string{`series "valve"`, "underflow", "rescale"}, []string{`"flow"`}},
	}
	for _, c := range cases {
		if c.err == nil {
			t.Errorf("%s: no error", c.name)
			continue
		}
		testutil.CheckWords(t, c.name, c.err.Error(), c.want, c.not)
	}
	var ve *SampleError
	if err := cases[2].err; !errors.As(err, &ve) || ve.Index != 17 || ve.Series != "flow" || !(ve.Limit > 0) {
		t.Errorf("overflow: %T %v, want a *SampleError at flow[17]", err, err)
	}
	var ce *SeriesError
	if err := cases[1].err; !errors.As(err, &ce) || ce.Series != "output" || !errors.Is(err, ErrConstant) {
		t.Errorf("filtered constant: %T %v", err, err)
	}
}
