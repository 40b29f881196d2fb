package testsignal

import (
	"errors"
	"testing"

	"github.com/backshift/backshift/internal/testutil"
)

// The period of each tap set is exactly 2^n - 1: the register, started
// from a nonzero state, first returns to it after 2^n - 1 steps. For an
// LFSR this holds exactly when the feedback polynomial is primitive over
// GF(2) (a standard result of the theory of shift-register sequences;
// Golomb, "Shift Register Sequences", 1967, from memory), so this test
// is what turns the from-memory table into a verified one.
func TestMaxLengthPeriod(t *testing.T) {
	for n := MinStages; n <= MaxStages; n++ {
		r := newLFSR(n)
		start := r.state
		want := uint64(1)<<n - 1
		var steps uint64
		for {
			r.step()
			steps++
			if r.state == start || steps > want {
				break
			}
		}
		if steps != want {
			t.Errorf("%d stages, taps %v: period %d, want 2^%d - 1 = %d", n, feedback[n], steps, n, want)
		}
	}
}

// The periodic autocorrelation of a maximum-length sequence in levels
// +-1 is N at lag 0 and exactly -1 at every other lag over one period
// (normalised: 1 and -1/N), a mathematical fact of these sequences
// (Golomb 1967, from memory; it follows from the shift-and-add property).
// Sums of +-1 products are exact integers in float64, so the check is
// exact.
func TestMaxLengthAutocorrelation(t *testing.T) {
	for _, n := range []int{2, 3, 5, 7, 10, 12} {
		x, err := MaxLength(n)
		if err != nil {
			t.Fatal(err)
		}
		N := len(x)
		if N != 1<<n-1 {
			t.Fatalf("%d stages: length %d, want %d", n, N, 1<<n-1)
		}
		plus := 0
		for _, v := range x {
			if v == 1 {
				plus++
			} else if v != -1 {
				t.Fatalf("%d stages: level %v, want +-1", n, v)
			}
		}
		if plus != (N+1)/2 {
			t.Errorf("%d stages: %d values +1, want (N+1)/2 = %d", n, plus, (N+1)/2)
		}
		for lag := 0; lag < N; lag++ {
			s := 0.0
			for i := range x {
				s += x[i] * x[(i+lag)%N]
			}
			want := -1.0
			if lag == 0 {
				want = float64(N)
			}
			if s != want {
				t.Errorf("%d stages, lag %d: sum %v, want %v (normalised %v)", n, lag, s, want, want/float64(N))
			}
		}
	}
}

func TestTaps(t *testing.T) {
	tp, err := Taps(10)
	if err != nil || len(tp) != 2 || tp[0] != 10 {
		t.Fatalf("Taps(10) = %v, %v", tp, err)
	}
	tp[0] = 99 // the caller's copy: the table must not change
	if feedback[10][0] != 10 {
		t.Error("Taps returned the table itself")
	}
}

func TestMaxLengthBadInput(t *testing.T) {
	for _, n := range []int{-1, 0, 1, 25} {
		_, err := MaxLength(n)
		var se *SettingError
		if !errors.As(err, &se) || !errors.Is(err, ErrSetting) {
			t.Fatalf("MaxLength(%d): %v, want *SettingError", n, err)
		}
		testutil.CheckWords(t, "MaxLength", err.Error(), []string{"testsignal.MaxLength", "stages", "between 2 and 24"}, nil)
		if _, err := Taps(n); err == nil {
			t.Errorf("Taps(%d): no error", n)
		}
	}
}
