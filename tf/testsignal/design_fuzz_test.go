package testsignal

import (
	"math"
	"testing"
)

// FuzzDesign: any settings give a *SettingError or a plan whose every
// number is finite and whose samples are Level +- Amplitude; never a
// panic.
func FuzzDesign(f *testing.F) {
	f.Add(10.0, 2.0, 1.0, 40.0, 5.0, 600.0, false, uint64(1))
	f.Add(1.0, 0.0, 2.0, 0.0, 1.0, 200.0, true, uint64(2))
	f.Add(1e-3, 1e6, 1e-6, -1.0, 1e300, 1.0, false, uint64(3))
	f.Add(1e-3, 1e6, 1e-2, -1.0, 1e300, 1.0, false, uint64(3))
	f.Fuzz(func(t *testing.T, tau, dead, ts, level, amp, budget float64, noise bool, seed uint64) {
		skipLongDesign(t, budget, ts)
		s := DesignSettings{TimeConstant: tau, DeadTime: dead, Sample: ts, Level: level, Amplitude: amp, Budget: budget, Seed: seed}
		if noise {
			s.Signal = KindBinaryNoise
		}
		d, err := Design(s)
		if err != nil {
			if !isSettingError(err) {
				t.Fatalf("untyped error %v", err)
			}
			return
		}
		if len(d.Signal) == 0 || len(d.Signal) > MaxSamples {
			t.Fatalf("%d samples", len(d.Signal))
		}
		for _, v := range []float64{d.Clock, d.BandLow, d.BandHigh} {
			if math.IsNaN(v) || math.IsInf(v, 0) || v <= 0 {
				t.Fatalf("clock %v, band %v to %v", d.Clock, d.BandLow, d.BandHigh)
			}
		}
		for _, v := range d.Power {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				t.Fatalf("%v in the periodogram", v)
			}
		}
		for _, v := range d.Signal {
			if v != level+amp && v != level-amp {
				t.Fatalf("sample %v, want %v +- %v", v, level, amp)
			}
		}
	})
}

// fuzzMaxSamples is the longest design the fuzz targets run: a design of
// millions of samples takes seconds (its periodogram above all), which
// the fuzzer's ten-second hang detection can mistake for a hang on a
// loaded machine. Long designs are checked by TestDesignLongRecord.
const fuzzMaxSamples = 200_000

// skipLongDesign skips a fuzz input whose design would be longer than
// fuzzMaxSamples (a NaN or negative ratio runs: Design refuses it).
func skipLongDesign(t *testing.T, budget, ts float64) {
	if budget/ts > fuzzMaxSamples {
		t.Skip("a design over fuzzMaxSamples samples: see TestDesignLongRecord")
	}
}

// TestDesignLongRecord runs the input that made the fuzzer hang when the
// periodogram of a length with a large prime factor took O(n p) (2.4e6
// samples, a month at one second): it must finish with a finite
// periodogram and a two-level signal, the checks of FuzzDesign.
func TestDesignLongRecord(t *testing.T) {
	if testing.Short() {
		t.Skip("seconds of work; run without -short")
	}
	d, err := Design(DesignSettings{TimeConstant: 0.023809523809523808, DeadTime: 7, Sample: 1.75, Level: -658,
		Amplitude: 1, Budget: 2.437201e+06, Signal: KindBinaryNoise, Seed: 31})
	if err != nil {
		t.Fatal(err)
	}
	for _, v := range d.Power {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			t.Fatalf("%v in the periodogram", v)
		}
	}
	for _, v := range d.Signal {
		if v != -657 && v != -659 {
			t.Fatalf("sample %v, want -658 +- 1", v)
		}
	}
}
