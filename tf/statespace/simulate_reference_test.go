package statespace

import (
	"testing"

	"github.com/backshift/backshift/internal/fixture"
	"github.com/backshift/backshift/internal/testutil"
)

// reference is testdata/statespace/reference.json, written by
// make_reference.py with scipy.signal.tf2ss and dlsim.
type reference struct {
	Source string
	Cases  []struct {
		Name, Spec  string
		Inputs      [][]float64
		Innovations []float64
		Output      []float64
		Paths       []struct {
			States   int
			Markov   []float64
			Charpoly []float64
		}
	}
}

// Against scipy (testdata/statespace/make_reference.py): each input
// path's realisation has the state count of scipy.signal.tf2ss of its
// transfer function in z, the same Markov parameters D, CB, CAB, ... and
// the same characteristic polynomial (both invariant under a change of
// state coordinates, so they compare scipy's controller form with our
// observer form); and the whole realisation simulated from the default
// start equals scipy.signal.dlsim of scipy's own block realisation. The
// tolerance is 1e-10 of the largest value: the two forms reach the same
// numbers by different sums (a controller form accumulates the input
// through the poles, an observer form the output), and over 300 steps
// through poles up to 0.8 and an integrator the rounding of each grows to
// some 1e-13 of the largest value; 1e-10 is a wide margin that still
// catches any wrong coefficient.
func TestAgainstScipy(t *testing.T) {
	var ref reference
	testutil.ReadJSON(t, "testdata/statespace/reference.json", &ref)
	if len(ref.Cases) == 0 {
		t.Fatal("no cases in reference.json")
	}
	for _, c := range ref.Cases {
		t.Run(c.Name, func(t *testing.T) {
			r, err := Realise(fixture.MustModel(t, c.Spec))
			if err != nil {
				t.Fatal(err)
			}
			parts := r.Parts()
			for i, want := range c.Paths {
				p := parts[i]
				if p.States != want.States {
					t.Errorf("path %s: %d states, scipy tf2ss %d", p.Name, p.States, want.States)
					continue
				}
				a, b, cc := block(r, p, i)
				got := []float64{r.d[i]}
				v := b
				for range len(want.Markov) - 1 {
					s := 0.0
					for j := range v {
						s += cc[j] * v[j]
					}
					got = append(got, s)
					nv := make([]float64, len(v))
					for j := range nv {
						for k := range v {
							nv[j] += a.At(j, k) * v[k]
						}
					}
					v = nv
				}
				closeSlices(t, "Markov parameters of "+p.Name, got, want.Markov, 1e-10)
				closeSlices(t, "characteristic polynomial of "+p.Name, charpoly(a), want.Charpoly, 1e-10)
			}
			y, err := r.Simulate(c.Inputs, c.Innovations, nil)
			if err != nil {
				t.Fatal(err)
			}
			closeSlices(t, "output against dlsim", y, c.Output, 1e-10)
		})
	}
}

// charpoly returns the coefficients of det(z I - A), highest power first
// (numpy.poly's order), by the Faddeev-LeVerrier recursion (exact in
// exact arithmetic; the blocks here have at most 4 states).
func charpoly(a interface{ At(i, j int) float64 }) []float64 {
	n := 0
	if d, ok := a.(interface{ Dims() (int, int) }); ok {
		n, _ = d.Dims()
	}
	c := []float64{1}
	m := make([][]float64, n) // M_k, starting from M_0 = 0
	for i := range m {
		m[i] = make([]float64, n)
	}
	for k := 1; k <= n; k++ {
		// M_k = A M_{k-1} + c_{k-1} I; c_k = -tr(A M_k)/k.
		next := make([][]float64, n)
		for i := range next {
			next[i] = make([]float64, n)
			for j := range next[i] {
				s := 0.0
				for l := range n {
					s += a.At(i, l) * m[l][j]
				}
				next[i][j] = s
			}
			next[i][i] += c[k-1]
		}
		tr := 0.0
		for i := range n {
			for l := range n {
				tr += a.At(i, l) * next[l][i]
			}
		}
		c = append(c, -tr/float64(k))
		m = next
	}
	return c
}
