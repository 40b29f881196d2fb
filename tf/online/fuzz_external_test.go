package online_test

import (
	"errors"
	"math"
	"testing"

	"github.com/backshift/backshift/internal/errs"
	"github.com/backshift/backshift/internal/fixture"
	"github.com/backshift/backshift/internal/testutil"
	"github.com/backshift/backshift/tf/online"
)

// fuzzSpecs are the models FuzzUpdate picks from: first-order terms, a
// product denominator (the dual expansion), a tied ARX form, and the
// eight-coefficient model.
var fuzzSpecs = []string{
	"y = w / (1 - d B) B x1 + a; where w ~ 0.5, d ~ 0.5",
	"y = c + w / (1 - d B)^2 x1 + v B x2 + (1 + t B) a; where c ~ 0, w ~ 1, d ~ 0.3, v ~ 0.2, t ~ 0.1",
	"y = (w0 + w1 B) / (1 - a1 B - a2 B^2) B x1 + 1 / (1 - a1 B - a2 B^2) a; where w0 ~ 0.5, w1 ~ 0, a1 ~ 1, a2 ~ -0.3",
	eightSpec,
}

// FuzzUpdate feeds hostile samples (NaN, infinities, 1e300, constant
// runs, huge jumps) under random settings: New and Update return a typed
// error or nil, never panic, and the estimates stay finite.
func FuzzUpdate(f *testing.F) {
	f.Add(byte(0), byte(200), byte(3), byte(0), []byte("\x0b\x10\x0c\x20\x0b\x30\x0b\x40\x0b\x50\x0b\x60\x0b\x70"))
	f.Add(byte(3), byte(128), byte(0), byte(9), []byte("\x09\x7f\x0b\x80\x03\x00\x0b\x10\x05\x00\x0b\x01\x09\x7f"))
	f.Add(byte(1), byte(255), byte(1), byte(200), []byte("\x00\x00\x0b\x05\x0b\x06\x0b\x07\x0b\x08\x0b\x09\x0b\x0a\x0b\x0b"))
	f.Add(byte(2), byte(10), byte(7), byte(40), []byte("\x0b\x01\x0b\x7f\x0b\x80\x0b\x01\x0b\x7f\x0b\x80\x0a\x7f\x0a\x80"))
	f.Fuzz(func(t *testing.T, spec, lam, warm, zone byte, data []byte) {
		m := fixture.MustModel(t, fuzzSpecs[int(spec)%len(fuzzSpecs)])
		set := &online.Settings{
			Forgetting: 0.85 + float64(lam)/255*0.16, // some below 0.9 and above 1: refused
			Warmup:     int(warm%16) - 1,             // -1 refused, 0 the default
			DeadZone:   float64(zone%8) / 4,
			MaxTrace:   float64(zone/8) * 10,
		}
		e, err := online.New(m, set)
		if err != nil {
			if !errors.Is(err, errs.ErrSetting) {
				t.Fatalf("New: %v", err)
			}
			return
		}
		s := testutil.HostileSeries(data, testutil.Hostile{Max: 3000, Div: 16, Up: 1e6, Down: 1e-6})
		k := len(e.Inputs())
		x := make([]float64, k)
		ps := make([]online.Param, 0, 8)
		for i := 0; i+k < len(s); i += k + 1 {
			copy(x, s[i:i+k])
			err := e.Update(x, s[i+k])
			if err != nil && !errors.Is(err, errs.ErrSample) && !errors.Is(err, errs.ErrOverflow) {
				t.Fatalf("Update: untyped error %v", err)
			}
			ps = e.Params(ps[:0])
			for _, p := range ps {
				if math.IsNaN(p.Value) || math.IsInf(p.Value, 0) {
					t.Fatalf("sample %d: %s = %v", i, p.Name, p.Value)
				}
			}
		}
		if err := e.Model().Validate(); err != nil {
			t.Fatalf("Model: %v", err)
		}
	})
}
