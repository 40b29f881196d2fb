package testsignal

import (
	"errors"
	"slices"
	"strings"
	"testing"
)

// regPeriod returns the period of the register with coefficients c over
// GF(q) from the state (0, ..., 0, 1), or -1 when it has not returned
// to that state after limit steps.
func regPeriod(q int, c []int, limit int) int {
	n := len(c)
	s := make([]int, n)
	s[n-1] = 1
	start := slices.Clone(s)
	for p := 1; p <= limit; p++ {
		v := 0
		for i, ci := range c {
			v += ci * s[i]
		}
		copy(s, s[1:])
		s[n-1] = (q - v%q) % q
		if slices.Equal(s, start) {
			return p
		}
	}
	return -1
}

// The table is the construction stated beside it: for each q and n the
// first polynomial, in the stated order, whose register has period
// exactly q^n - 1; that period holds only for a primitive polynomial
// (Lidl and Niederreiter 1997, from memory), so the test also proves
// every entry primitive. The search runs over every candidate (about 0.8
// s in all, most of it on 3^13 - 1 = 1,594,322 steps per candidate of
// degree 13); with -short it runs for periods up to 10^5 only, and the
// longer entries are checked by their period alone (still a proof that
// each is primitive).
func TestMultiLevelTable(t *testing.T) {
	for _, q := range []int{3, 5, 7} {
		for n := MinMultiStages; n <= MaxMultiStages(q); n++ {
			N := pow(q, n) - 1
			if testing.Short() && N > 100_000 {
				if p := regPeriod(q, primitive[q][n], N); p != N {
					t.Errorf("q = %d, n = %d: period %d, want %d", q, n, p, N)
				}
				continue
			}
			var found []int
		search:
			for w := 0; w < n; w++ {
				for code := 0; code <= N; code++ {
					c, nz := make([]int, n), 0
					for i, x := 0, code; i < n; i, x = i+1, x/q {
						c[i] = x % q
						if i > 0 && c[i] != 0 {
							nz++
						}
					}
					if c[0] != 0 && nz == w && regPeriod(q, c, N) == N {
						found = c
						break search
					}
				}
			}
			if !slices.Equal(primitive[q][n], found) {
				t.Errorf("q = %d, n = %d: table %v, the search finds %v", q, n, primitive[q][n], found)
			}
		}
	}
}

func pow(q, n int) int {
	r := 1
	for range n {
		r *= q
	}
	return r
}

// The exact properties stated on MultiLevel, in integer arithmetic on
// the levels (so the checks are exact), for every q and every register
// of period up to 7000 (the autocorrelation at every lag costs N^2): the period, the level set and its counts, the inverse
// repeat, and the periodic autocorrelation at every lag against
// q^(n-1) sum_a f(a) f(g^j a) at multiples of N/(q-1) and zero elsewhere.
func TestMultiLevel(t *testing.T) {
	for _, q := range []int{3, 5, 7} {
		for n := MinMultiStages; n <= MaxMultiStages(q) && pow(q, n) <= 7000; n++ {
			x, err := MultiLevel(q, n)
			if err != nil {
				t.Fatal(err)
			}
			N, h := pow(q, n)-1, (q-1)/2
			if len(x) != N {
				t.Fatalf("q = %d, n = %d: %d values, want %d", q, n, len(x), N)
			}
			f := make([]int, N)
			count := map[int]int{}
			for i, v := range x {
				f[i] = int(v * float64(h))
				if float64(f[i])/float64(h) != v || f[i] < -h || f[i] > h {
					t.Fatalf("q = %d, n = %d: value %v is not a level k/%d", q, n, v, h)
				}
				count[f[i]]++
			}
			for k := -h; k <= h; k++ {
				want := pow(q, n-1)
				if k == 0 {
					want--
				}
				if count[k] != want {
					t.Errorf("q = %d, n = %d: level %d occurs %d times, want %d", q, n, k, count[k], want)
				}
			}
			for i := range N / 2 {
				if f[i+N/2] != -f[i] {
					t.Fatalf("q = %d, n = %d: x[%d] = %d is not -x[%d] = %d", q, n, i+N/2, f[i+N/2], i, -f[i])
				}
			}
			checkAutocorrelation(t, q, n, f)
		}
	}
}

// checkAutocorrelation compares the periodic autocorrelation of the
// integer levels f (one period) with the formula stated on MultiLevel.
func checkAutocorrelation(t *testing.T, q, n int, f []int) {
	t.Helper()
	N, step := len(f), len(f)/(q-1)
	s := elements(q, primitive[q][n])
	g := 0 // s_{t+step} = g s_t for every t
	for i := range N {
		if s[i] != 0 {
			for c := 1; c < q; c++ {
				if c*s[i]%q == s[(i+step)%N] {
					g = c
				}
			}
			break
		}
	}
	for k := range N {
		r := 0
		for i := range N {
			r += f[i] * f[(i+k)%N]
		}
		want := 0
		if k%step == 0 {
			gj := 1
			for range k / step {
				gj = gj * g % q
			}
			for a := 1; a < q; a++ {
				want += levelOf(q, a) * levelOf(q, gj*a%q)
			}
			want *= pow(q, n-1)
		}
		if r != want {
			t.Fatalf("q = %d, n = %d: autocorrelation at lag %d is %d, want %d", q, n, k, r, want)
		}
	}
}

// TestMultiLevelBadInput: the refused arguments and their messages.
func TestMultiLevelBadInput(t *testing.T) {
	for _, c := range []struct {
		levels, stages int
		want           string
	}{
		{2, 5, "levels = 2: must be 3, 5 or 7"},
		{4, 3, "levels = 4"},
		{3, 1, "stages = 1: the register length for 3 levels must lie between 2 and 13"},
		{5, 9, "between 2 and 8"},
		{-1, 3, "levels = -1"},
	} {
		_, err := MultiLevel(c.levels, c.stages)
		var se *SettingError
		if !errors.As(err, &se) || !strings.Contains(err.Error(), c.want) {
			t.Errorf("MultiLevel(%d, %d): %v, want a *SettingError saying %q", c.levels, c.stages, err, c.want)
		}
	}
}
