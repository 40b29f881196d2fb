package testsignal

import "strconv"

// The levels and register lengths MultiLevel accepts: q = 3, 5 or 7
// levels (a prime, so that the register works in the field GF(q)) and
// 2..MaxMultiStages(q) stages.
const MinMultiStages = 2

// MaxMultiStages returns the longest register MultiLevel offers for q
// levels, 0 for an unsupported q: 13 stages for 3 levels (period
// 1,594,322), 8 for 5 (390,624), 7 for 7 (823,542).
func MaxMultiStages(levels int) int {
	if levels < 0 || levels >= len(primitive) || len(primitive[levels]) == 0 {
		return 0
	}
	return len(primitive[levels]) - 1
}

// primitive[q][n] holds c_0..c_{n-1} of a polynomial
//
//	x^n + c_{n-1} x^{n-1} + ... + c_1 x + c_0
//
// over GF(q), primitive, so that the recurrence
// s_{t+n} = -(c_0 s_t + ... + c_{n-1} s_{t+n-1}) mod q runs through all
// q^n - 1 nonzero states.
//
// Construction (our own, no table copied): for each q and n, the first
// polynomial whose register has period exactly q^n - 1, searching in
// order of the number of nonzero coefficients among c_1..c_{n-1}, then
// of c_0 + c_1 q + ... + c_{n-1} q^(n-1), with c_0 != 0. A period of
// q^n - 1 holds exactly for a primitive polynomial (Lidl and Niederreiter,
// Finite Fields, 2nd ed., 1997, the chapter on linear recurring sequences;
// from memory). TestMultiLevelTable repeats the search and checks every
// entry against it and its period. (For q = 3 the first entries are
// x^2 + x + 2 and x^3 + 2x + 1, the primitive polynomials usually quoted.)
var primitive = [8][][]int{
	3: {2: {2, 1}, 3: {1, 2, 0}, 4: {2, 1, 0, 0}, 5: {1, 2, 0, 0, 0}, 6: {2, 1, 0, 0, 0, 0},
		7: {1, 0, 2, 0, 0, 0, 0}, 8: {2, 0, 0, 1, 0, 0, 0, 0}, 9: {1, 0, 0, 0, 2, 0, 0, 0, 0},
		10: {2, 1, 0, 1, 0, 0, 0, 0, 0, 0}, 11: {1, 0, 2, 0, 0, 0, 0, 0, 0, 0, 0},
		12: {2, 1, 0, 0, 0, 1, 0, 0, 0, 0, 0, 0}, 13: {1, 2, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0}},
	5: {2: {2, 1}, 3: {2, 3, 0}, 4: {2, 2, 1, 0}, 5: {2, 4, 0, 0, 0}, 6: {2, 1, 0, 0, 0, 0},
		7: {2, 3, 0, 0, 0, 0, 0}, 8: {3, 2, 1, 0, 0, 0, 0, 0}},
	7: {2: {3, 1}, 3: {2, 3, 0}, 4: {5, 3, 1, 0}, 5: {4, 1, 0, 0, 0}, 6: {5, 1, 3, 0, 0, 0},
		7: {2, 6, 0, 0, 0, 0, 0}},
}

// MultiLevel returns one period, levels^stages - 1 values, of the
// maximum-length sequence over GF(q), q = levels (3, 5 or 7), of the
// register of the given number of stages (see primitive), started from
// the state (0, ..., 0, 1). Each field element k is mapped to the level
// k for k <= (q-1)/2 and k - q above, divided by (q-1)/2: the values lie
// in [-1, 1], symmetric about 0 (for 3 levels -1, 0, 1; for 5 levels -1,
// -0.5, 0, 0.5, 1). Scale it with Level + Amplitude*x.
//
// Exact properties over one period of N = q^n - 1 values (TestMultiLevel
// checks each; they follow from the trace form of the sequence, Lidl and
// Niederreiter 1997, from memory):
//   - every nonzero level occurs q^(n-1) times and 0 occurs q^(n-1) - 1
//     times, so the mean is zero;
//   - the second half is the negation of the first, x_{t+N/2} = -x_t
//     (an inverse-repeat sequence), so the responses of a linear plant to
//     the two halves cancel when added and what remains of the sum is
//     even-order distortion (plus noise), which a binary sequence cannot
//     reveal: a static non-linearity of a two-valued signal looks linear;
//   - the periodic autocorrelation sum_t x_t x_{t+k} is zero at every lag
//     k that is not a multiple of N/(q-1), and at k = j N/(q-1) it is
//     q^(n-1) sum_a f(a) f(g^j a) / h^2, with f the integer level map
//     above, h = (q-1)/2 and g = alpha^(N/(q-1)) the primitive element of
//     GF(q) the register fixes: for 3 and 5 levels it is nonzero only at
//     lags 0 and N/2, where it is plus and minus the sum of squares.
//
// An unsupported number of levels or a stages outside
// MinMultiStages..MaxMultiStages(levels) is a *SettingError.
func MultiLevel(levels, stages int) ([]float64, error) {
	const op = "testsignal.MultiLevel"
	if MaxMultiStages(levels) == 0 {
		return nil, &SettingError{Op: op, Setting: "levels", Value: strconv.Itoa(levels), Rule: "must be 3, 5 or 7 (a prime number of levels, so that the register works in a field)"}
	}
	if stages < MinMultiStages || stages > MaxMultiStages(levels) {
		return nil, &SettingError{Op: op, Setting: "stages", Value: strconv.Itoa(stages),
			Rule: "the register length for " + strconv.Itoa(levels) + " levels must lie between " + strconv.Itoa(MinMultiStages) + " and " + strconv.Itoa(MaxMultiStages(levels))}
	}
	s := elements(levels, primitive[levels][stages])
	h := float64(levels-1) / 2
	out := make([]float64, len(s))
	for i, k := range s {
		out[i] = float64(levelOf(levels, k)) / h
	}
	return out, nil
}

// levelOf maps the field element k of GF(q) to its integer level:
// k for k <= (q-1)/2, k - q above.
func levelOf(q, k int) int {
	if k > (q-1)/2 {
		return k - q
	}
	return k
}

// elements returns one period, q^n - 1 field elements, of the
// recurrence with coefficients c (see primitive) from the state
// (0, ..., 0, 1): element t is s_t.
func elements(q int, c []int) []int {
	n := len(c)
	total := 1
	for range n {
		total *= q
	}
	out := make([]int, total-1)
	s := make([]int, n)
	s[n-1] = 1
	for t := range out {
		out[t] = s[0]
		v := 0
		for i, ci := range c {
			v += ci * s[i]
		}
		v = (q - v%q) % q
		copy(s, s[1:])
		s[n-1] = v
	}
	return out
}
