package monitor

import (
	"math"
	"testing"
)

// CusumThreshold inverts CusumARL: the threshold it returns gives back
// the target run length (to 1e-9 relative: Newton's method stops at a
// step of 1e-14 in x), over the whole range of targets and references
// Settings accepts.
func TestCusumThresholdInverts(t *testing.T) {
	for _, k := range []float64{1e-4, 0.05, 0.25, 0.5, 1, 2} {
		for _, arl := range []float64{MinTargetARL, 168, 1e3, 2e4, 1e6, 2 * MaxTargetARL} {
			h := CusumThreshold(k, arl)
			if got := CusumARL(k, h, 0); math.Abs(got-arl) > 1e-9*arl {
				t.Errorf("k %v arl %v: h %v gives ARL %v", k, arl, h, got)
			}
		}
	}
}

// The thresholds of the textbook scheme: k = 0.5 and two-sided ARL0
// 168 (one side 2 * 168) and 465 give h close to 4 and 5 (Montgomery,
// Introduction to Statistical Quality Control, the table of the tabular
// CUSUM with k = 1/2, h = 4 and 5: from memory). Siegmund's approximation
// is within 1 % of those run lengths, so h is within 0.05.
func TestCusumThresholdTextbook(t *testing.T) {
	for _, c := range []struct{ arl, h float64 }{{168, 4}, {465, 5}} {
		if got := CusumThreshold(0.5, 2*c.arl); math.Abs(got-c.h) > 0.05 {
			t.Errorf("two-sided ARL0 %v: h %v, want %v", c.arl, got, c.h)
		}
	}
}

// Arguments outside the approximation's domain give NaN, never a panic
// or a wrong finite number.
func TestCusumThresholdBadArguments(t *testing.T) {
	for _, c := range [][2]float64{{0, 100}, {-1, 100}, {0.5, 0}, {0.5, -3}, {math.NaN(), 100}, {0.5, math.Inf(1)}, {math.Inf(1), 10}} {
		if got := CusumThreshold(c[0], c[1]); !math.IsNaN(got) {
			t.Errorf("CusumThreshold(%v, %v) = %v, want NaN", c[0], c[1], got)
		}
	}
	if got := CusumARL(0.5, 4, math.NaN()); !math.IsNaN(got) {
		t.Errorf("CusumARL with a NaN mean = %v", got)
	}
	if got := CusumARL(0.5, 4000, -10); !math.IsInf(got, 1) {
		t.Errorf("CusumARL beyond float64 = %v, want +Inf", got)
	}
}

// With no drift the approximation is b^2 (the limit of the formula as
// d -> 0, Siegmund 1985): continuous on both sides of d = 0.
func TestCusumARLZeroDrift(t *testing.T) {
	b := 4 + overshoot
	if got := CusumARL(0.5, 4, 0.5); got != b*b {
		t.Errorf("zero drift: %v, want %v", got, b*b)
	}
	for _, eps := range []float64{1e-6, -1e-6} {
		if got := CusumARL(0.5, 4, 0.5+eps); math.Abs(got-b*b) > 1e-4*b*b {
			t.Errorf("drift %v: %v, want about %v", eps, got, b*b)
		}
	}
}

// The variance test's thresholds give back the target through the chain
// (solveThreshold stops at 1e-6 in log ARL), grow with the target, and
// are cached (a second call returns the same numbers).
func TestVarianceThresholds(t *testing.T) {
	prevUp, prevDown := 0.0, 0.0
	for _, arl := range []float64{100, 2e3, 2e4, 2e6} {
		up, down := varianceThresholds(2, arl)
		ku, kd := varianceReference(2)
		if got := varianceARL(true, ku, up, 1); math.Abs(got-arl) > 1e-5*arl {
			t.Errorf("arl %v: up side h %v gives %v", arl, up, got)
		}
		if got := varianceARL(false, kd, down, 1); math.Abs(got-arl) > 1e-5*arl {
			t.Errorf("arl %v: down side h %v gives %v", arl, down, got)
		}
		if up <= prevUp || down <= prevDown {
			t.Errorf("arl %v: thresholds %v, %v do not grow", arl, up, down)
		}
		prevUp, prevDown = up, down
		if u2, d2 := varianceThresholds(2, arl); u2 != up || d2 != down {
			t.Errorf("arl %v: cached thresholds differ", arl)
		}
	}
}

// The integral of chiSquare1 matches a trapezoid sum of it (1e-6: the
// sum's step of 1e-4 over a kink-free stretch away from 0), so the
// transition probabilities of the chain are differences of the right
// function.
func TestChiSquare1Integral(t *testing.T) {
	for _, r := range []float64{0.5, 1, 2} {
		sum, prev := 0.0, chiSquare1(0.5, r)
		const step = 1e-4
		for x := 0.5 + step; x <= 3+step/2; x += step {
			v := chiSquare1(x, r)
			sum += (prev + v) / 2 * step
			prev = v
		}
		want := chiSquare1Integral(3, r) - chiSquare1Integral(0.5, r)
		if math.Abs(sum-want) > 1e-6 {
			t.Errorf("ratio %v: integral %v, trapezoid %v", r, want, sum)
		}
	}
}
