package prewhiten_test

import (
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/backshift/backshift/ccf"
	"github.com/backshift/backshift/internal/filter"
	"github.com/backshift/backshift/prewhiten"
)

// Transfer-function shapes of our own for the recovery test: omega(B)
// of degree s and delta(B) of degree r, stored as ascending coefficients.
var (
	recNum = [3][]float64{{1}, {1, 0.7}, {1, 0.6, -0.5}}
	recDen = [3][]float64{{1}, {1, -0.6}, {1, -1.0, 0.5}}
)

// simulateTF returns n samples of an AR(1) input (phi 0.7) and the
// output B^b omega/delta x + noise, with ARMA(1,1) noise
// (1 + 0.4 B)/(1 - 0.5 B) a scaled so that var(signal)/var(noise) = snr.
func simulateTF(rng *rand.Rand, n, b, r, s int, snr float64) (x, y []float64) {
	const burn = 200
	m := n + burn
	e := make([]float64, m)
	a := make([]float64, m)
	for i := range e {
		e[i] = rng.NormFloat64()
		a[i] = rng.NormFloat64()
	}
	x = make([]float64, m)
	filter.Run(x, []float64{1}, []float64{1, -0.7}, e)
	num := make([]float64, b+len(recNum[s]))
	copy(num[b:], recNum[s])
	sig := make([]float64, m)
	filter.Run(sig, num, recDen[r], x)
	noise := make([]float64, m)
	filter.Run(noise, []float64{1, 0.4}, []float64{1, -0.5}, a)
	x, sig, noise = x[burn:], sig[burn:], noise[burn:]
	k := math.Sqrt(variance(sig) / (snr * variance(noise)))
	y = make([]float64, n)
	for i := range y {
		y[i] = 10 + sig[i] + k*noise[i]
	}
	return x, y
}

func variance(x []float64) float64 {
	m := 0.0
	for _, v := range x {
		m += v
	}
	m /= float64(len(x))
	s := 0.0
	for _, v := range x {
		s += (v - m) * (v - m)
	}
	return s / float64(len(x))
}

// TestRecovery simulates 200 replicates of models of our own (b = 0..6,
// r = 0..2, s = 0..2 cycled, AR(1) input, ARMA(1,1) noise, signal-to-noise
// variance ratio 3, n = 300, fixed seeds), prewhitens, estimates the
// weights at lags 0..20 and identifies. Requirements (issue 5): the true
// dead time in at least 95 % of replicates, the true (r, s) among the
// top three candidates in at least 80 %.
func TestRecovery(t *testing.T) {
	const reps, n, maxLag = 200, 300, 20
	var bOK, top3, top1, corner int
	var conf [9][9]int // true (r,s) -> first candidate (r,s), index 3r+s
	var confB [7][8]int
	var confC [9][10]int // true (r,s) -> corner pick, column 9 = none
	for i := 0; i < reps; i++ {
		b, rs := i%7, i%9
		r, s := rs/3, rs%3
		rng := rand.New(rand.NewPCG(uint64(i)+1, 20261201))
		x, y := simulateTF(rng, n, b, r, s, 3)
		pw, err := prewhiten.Pair(x, y, "y", &prewhiten.Settings{Name: "x"})
		if err != nil && pw == nil {
			t.Fatalf("replicate %d: %v", i, err)
		}
		w, err := ccf.ImpulseWeights(pw.Alpha[pw.Start:], pw.Beta[pw.Start:], maxLag, "x", nil)
		if err != nil {
			t.Fatalf("replicate %d: %v", i, err)
		}
		id, err := ccf.Identify(w, nil)
		if err != nil {
			confB[b][7]++
			continue
		}
		if id.DeadTime == b {
			bOK++
		}
		confB[b][min(id.DeadTime, 7)]++
		if id.CornerR == r && id.CornerS == s {
			corner++
		}
		if id.CornerR < 0 {
			confC[rs][9]++
		} else {
			confC[rs][3*id.CornerR+id.CornerS]++
		}
		c0 := id.Forms[0]
		conf[rs][3*c0.R+c0.S]++
		if c0.R == r && c0.S == s {
			top1++
		}
		for _, c := range id.Forms[:min(3, len(id.Forms))] {
			if c.R == r && c.S == s && c.Delay == b {
				top3++
			}
		}
	}
	var sb strings.Builder
	sb.WriteString("confusion of (r,s): rows true, columns top candidate\n     ")
	for j := 0; j < 9; j++ {
		fmt.Fprintf(&sb, " (%d,%d)", j/3, j%3)
	}
	for i := 0; i < 9; i++ {
		fmt.Fprintf(&sb, "\n(%d,%d)", i/3, i%3)
		for j := 0; j < 9; j++ {
			fmt.Fprintf(&sb, " %5d", conf[i][j])
		}
	}
	sb.WriteString("\nconfusion of (r,s): rows true, columns the corner method's pick (last: none)\n     ")
	for j := 0; j < 9; j++ {
		fmt.Fprintf(&sb, " (%d,%d)", j/3, j%3)
	}
	sb.WriteString("  none")
	for i := 0; i < 9; i++ {
		fmt.Fprintf(&sb, "\n(%d,%d)", i/3, i%3)
		for j := 0; j < 10; j++ {
			fmt.Fprintf(&sb, " %5d", confC[i][j])
		}
	}
	sb.WriteString("\nconfusion of b: rows true, columns found (7 = 7+ or none)\n   ")
	for j := 0; j < 8; j++ {
		fmt.Fprintf(&sb, " %4d", j)
	}
	for i := 0; i < 7; i++ {
		fmt.Fprintf(&sb, "\n%2d ", i)
		for j := 0; j < 8; j++ {
			fmt.Fprintf(&sb, " %4d", confB[i][j])
		}
	}
	t.Log(sb.String())
	t.Logf("dead time right %d/%d, true (r,s) first %d/%d, in top three %d/%d, corner method's pick right %d/%d",
		bOK, reps, top1, reps, top3, reps, corner, reps)
	if bOK < 95*reps/100 {
		t.Errorf("dead time right in %d of %d replicates, want >= 95 %%", bOK, reps)
	}
	if top3 < 80*reps/100 {
		t.Errorf("true (r,s) in the top three in %d of %d replicates, want >= 80 %%", top3, reps)
	}
}
