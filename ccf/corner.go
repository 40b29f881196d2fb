package ccf

import "math"

// CornerTable is the corner-method table of impulse-response weights:
//
//	C(f, g) = det [ v_{f+i-j} ],  i, j = 0..g-1,   f = 0..Rows-1, g = 1..Cols
//
// with v_k = 0 for k < 0. For weights of B^b omega(B)/delta(B) with
// deg omega = s and deg delta = r, C(f, g) = 0 for f < b (every g) and for
// f > b+s with g > r, and is non-zero elsewhere: the zero block below and
// right of row b+s+1, column r+1 (the corner) gives the orders.
type CornerTable struct {
	// Det[f][g-1] is C(f, g).
	Det [][]float64
	// T[f][g-1] is C(f, g) divided by its approximate standard error
	// (first-order propagation of the weights' standard errors, taken as
	// independent). |T| below Z marks a cell as zero.
	T [][]float64
	// Z is the threshold used for Zero (the 95 % normal quantile 1.96).
	Z float64
}

// Zero reports whether cell (f, g) is taken as zero (|T| < Z).
func (c *CornerTable) Zero(f, g int) bool { return math.Abs(c.T[f][g-1]) < c.Z }

// Corner computes the corner table of w for rows f = 0..rows-1 and
// columns g = 1..cols. Rows are cut to those for which every weight
// needed (up to lag f+g-1) exists. It returns nil when no row fits or w
// is nil or its V and SE differ in length.
//
// The standard errors are taken as given. Where every weight a cell
// depends on has a zero standard error, the cell's T is +Inf when its
// determinant is non-zero (the cell is then never taken as zero) and 0
// when the determinant is zero; Identify never passes zero standard
// errors. The work grows as rows * cols^5 (cofactors of each g-by-g
// determinant); Identify uses 4 columns.
func Corner(w *Weights, rows, cols int) *CornerTable {
	if w == nil || len(w.SE) != len(w.V) {
		return nil
	}
	K := len(w.V) - 1
	rows = min(rows, K-cols+2)
	if rows <= 0 || cols <= 0 {
		return nil
	}
	// Scale the weights to unit largest magnitude so that determinants
	// stay in range; T is scale free.
	sc := 0.0
	for _, v := range w.V {
		sc = math.Max(sc, math.Abs(v))
	}
	if sc == 0 {
		sc = 1
	}
	v := func(k int) float64 {
		if k < 0 {
			return 0
		}
		return w.V[k] / sc
	}
	se := func(k int) float64 {
		if k < 0 {
			return 0
		}
		return w.SE[k] / sc
	}
	t := &CornerTable{Det: make([][]float64, rows), T: make([][]float64, rows), Z: normalQuantile(0.975)}
	for f := 0; f < rows; f++ {
		t.Det[f] = make([]float64, cols)
		t.T[f] = make([]float64, cols)
		for g := 1; g <= cols; g++ {
			d, sd := cornerCell(v, se, f, g)
			t.Det[f][g-1] = d * math.Pow(sc, float64(g))
			switch {
			case sd > 0:
				t.T[f][g-1] = d / sd
			case d == 0:
				t.T[f][g-1] = 0
			default:
				t.T[f][g-1] = math.Inf(1)
			}
		}
	}
	return t
}

// cornerCell returns C(f, g) of the weights v(k) and its approximate
// standard error, by first-order propagation of the standard errors
// se(k) taken as independent: dC/dv_k is the sum of the cofactors of
// the cells holding v_k.
func cornerCell(v, se func(k int) float64, f, g int) (d, sd float64) {
	a := make([]float64, g*g)
	for i := 0; i < g; i++ {
		for j := 0; j < g; j++ {
			a[i*g+j] = v(f + i - j)
		}
	}
	d = det(a, g)
	grad := make([]float64, f+g)
	for i := 0; i < g; i++ {
		for j := 0; j < g; j++ {
			if k := f + i - j; k >= 0 {
				grad[k] += cofactor(a, g, i, j)
			}
		}
	}
	vr := 0.0
	for k, gk := range grad {
		vr += gk * gk * se(k) * se(k)
	}
	return d, math.Sqrt(vr)
}

// pick returns the orders (r, s) whose corner fits the table best for
// dead time b, with r <= maxR and s <= maxS, or (-1, -1) when the table is
// too small. For each candidate, with the corner at row f0 = b+s+1 and
// column g0 = r+1, it counts the cells of the 2-by-2 block at the corner
// that are zero, and the cells that must be non-zero: the row above the
// block (f0-1, columns g0 and g0+1) and, when r >= 1, the column left of
// it (column r, rows f0 and f0+1). The best fraction wins; ties go to
// fewer coefficients (r+s), then to the smaller sum of |T| over the zero
// block.
func (c *CornerTable) pick(b, maxR, maxS int) (int, int) {
	bestR, bestS := -1, -1
	best, bestOrd, bestSum := -1.0, 0, 0.0
	rows := len(c.Det)
	cols := 0
	if rows > 0 {
		cols = len(c.Det[0])
	}
	in := func(f, g int) bool { return f >= 0 && f < rows && g >= 1 && g <= cols }
	for s := 0; s <= maxS; s++ {
		for r := 0; r <= maxR; r++ {
			f0, g0 := b+s+1, r+1
			score, cells, sum := 0.0, 0.0, 0.0
			for f := f0; f < f0+2; f++ {
				for g := g0; g < g0+2; g++ {
					if !in(f, g) {
						continue
					}
					cells++
					sum += math.Abs(c.T[f][g-1])
					if c.Zero(f, g) {
						score++
					}
				}
			}
			if cells == 0 {
				continue
			}
			var nz [][2]int
			nz = append(nz, [2]int{f0 - 1, g0}, [2]int{f0 - 1, g0 + 1})
			if r >= 1 {
				nz = append(nz, [2]int{f0, r}, [2]int{f0 + 1, r})
			}
			for _, fg := range nz {
				if in(fg[0], fg[1]) {
					cells++
					if !c.Zero(fg[0], fg[1]) {
						score++
					}
				}
			}
			frac, ord := score/cells, r+s
			better := frac > best+1e-12 ||
				math.Abs(frac-best) <= 1e-12 && (ord < bestOrd || ord == bestOrd && sum < bestSum)
			if better {
				bestR, bestS, best, bestOrd, bestSum = r, s, frac, ord, sum
			}
		}
	}
	return bestR, bestS
}

// det returns the determinant of the n-by-n row-major matrix a by
// Gaussian elimination with partial pivoting (n is small here).
func det(a []float64, n int) float64 {
	m := append([]float64(nil), a...)
	d := 1.0
	for c := 0; c < n; c++ {
		p := c
		for i := c + 1; i < n; i++ {
			if math.Abs(m[i*n+c]) > math.Abs(m[p*n+c]) {
				p = i
			}
		}
		if m[p*n+c] == 0 {
			return 0
		}
		if p != c {
			for j := 0; j < n; j++ {
				m[c*n+j], m[p*n+j] = m[p*n+j], m[c*n+j]
			}
			d = -d
		}
		d *= m[c*n+c]
		for i := c + 1; i < n; i++ {
			f := m[i*n+c] / m[c*n+c]
			for j := c; j < n; j++ {
				m[i*n+j] -= f * m[c*n+j]
			}
		}
	}
	return d
}

// cofactor returns (-1)^(i+j) times the minor of a without row i and
// column j.
func cofactor(a []float64, n, i, j int) float64 {
	if n == 1 {
		return 1
	}
	m := make([]float64, 0, (n-1)*(n-1))
	for p := 0; p < n; p++ {
		if p == i {
			continue
		}
		for q := 0; q < n; q++ {
			if q != j {
				m = append(m, a[p*n+q])
			}
		}
	}
	d := det(m, n-1)
	if (i+j)%2 == 1 {
		d = -d
	}
	return d
}
