package testsignal

import (
	"math/bits"
	"strconv"
)

// MinStages and MaxStages bound the register lengths MaxLength accepts.
const (
	MinStages = 2
	MaxStages = 24
)

// feedback holds, for each register length n, the stages (numbered 1 to
// n) whose exclusive-or is fed back into stage 1. Each set names the
// polynomial x^n + sum of x^k over the other taps + 1, primitive over
// GF(2), so that the register runs through all 2^n - 1 nonzero states.
//
// Source: the tap table of Xilinx application note XAPP 052, P. Alfke,
// "Efficient Shift Registers, LFSR Counters, and Long Pseudo-Random
// Sequence Generators" (1996), its table of taps for 3 to 168 stages
// (the 2-stage entry is x^2 + x + 1, the only primitive quadratic).
// Every entry here is FROM MEMORY of that table, not read from it for
// this code; TestMaxLengthPeriod verifies each one by running the
// register and finding its period to be exactly 2^n - 1, which holds
// only for a primitive polynomial.
var feedback = [MaxStages + 1][]int{
	2:  {2, 1},
	3:  {3, 2},
	4:  {4, 3},
	5:  {5, 3},
	6:  {6, 5},
	7:  {7, 6},
	8:  {8, 6, 5, 4},
	9:  {9, 5},
	10: {10, 7},
	11: {11, 9},
	12: {12, 6, 4, 1},
	13: {13, 4, 3, 1},
	14: {14, 5, 3, 1},
	15: {15, 14},
	16: {16, 15, 13, 4},
	17: {17, 14},
	18: {18, 11},
	19: {19, 6, 2, 1},
	20: {20, 17},
	21: {21, 19},
	22: {22, 21},
	23: {23, 18},
	24: {24, 23, 22, 17},
}

// Taps returns the feedback stages of the n-stage register MaxLength
// uses (see MaxLength), a new slice the caller may keep. An n outside
// MinStages..MaxStages is a *SettingError.
func Taps(stages int) ([]int, error) {
	if err := checkStages("testsignal.Taps", stages); err != nil {
		return nil, err
	}
	return append([]int(nil), feedback[stages]...), nil
}

func checkStages(op string, n int) error {
	if n < MinStages || n > MaxStages {
		return &SettingError{Op: op, Setting: "stages", Value: strconv.Itoa(n),
			Rule: "the register length must lie between " + strconv.Itoa(MinStages) + " and " + strconv.Itoa(MaxStages) + " (period 2^n - 1 samples)"}
	}
	return nil
}

// lfsr is an n-stage Fibonacci register: bit k-1 of state is stage k.
type lfsr struct {
	state, mask, tapMask uint32
	n                    int
}

func newLFSR(n int) lfsr {
	r := lfsr{n: n, mask: 1<<n - 1}
	for _, k := range feedback[n] {
		r.tapMask |= 1 << (k - 1)
	}
	r.state = r.mask // all ones: any nonzero start gives the same cycle
	return r
}

// step returns the output (stage n) and shifts the register once.
func (r *lfsr) step() uint32 {
	out := r.state >> (r.n - 1) & 1
	fb := uint32(bits.OnesCount32(r.state&r.tapMask) & 1)
	r.state = (r.state<<1 | fb) & r.mask
	return out
}

// MaxLength returns one period, 2^stages - 1 values, of the
// maximum-length binary sequence of a register of the given number of
// stages, with levels +1 (register output 1) and -1 (output 0),
// starting from the all-ones state. The sequence holds one more +1 than
// -1, its periodic autocorrelation is N at lag 0 and -1 at every other
// lag (N the period), and every line of its discrete Fourier transform
// but the zero-frequency one has squared magnitude N + 1: a flat
// spectrum up to half the clock frequency. Repeat it for a test of
// several periods; scale it with Level + Amplitude*x. A stages outside
// MinStages..MaxStages is a *SettingError.
func MaxLength(stages int) ([]float64, error) {
	if err := checkStages("testsignal.MaxLength", stages); err != nil {
		return nil, err
	}
	r := newLFSR(stages)
	out := make([]float64, r.mask)
	for i := range out {
		out[i] = float64(2*int(r.step()) - 1)
	}
	return out, nil
}
