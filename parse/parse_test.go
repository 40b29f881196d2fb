package parse

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"runtime"
	"strconv"
	"strings"
	"testing"

	"github.com/backshift/backshift/tf"
)

// goodSpecs parse; each is used by several tests.
var goodSpecs = []string{
	"temp = 21.5 + (w0 + w1 B) / (1 - d1 B) B^4 burner + (1 - t1 B) / (1 - p1 B) a",
	"temp = 21.5 + (w0 + w1 B) / (1 - d1 B) B^4 burner + (v0 - v1 B) B^2 feed + ARMA(2, 1) where w0 ~ 0.5, d1 ~ 0.7 every 30 s",
	"(1 - B) y = w0 ((1 - B) x) + a",
	"(1 - B)(1 - B^12) sales = w0 B^3 ((1 - B)(1 - B^12) lead) + (1 - theta1 B) / (1 - Phi1 B^12) a",
	"(1 - B)^2 y = -3 + 1 x + B z + (w0 B) / ((1 - d1 B)(1 + d2 B^2))^2 ((1 - B) q) + 1 / (1 - p B) a where p = 0.5, d2 ~ -1e-7 every 1.5 min",
	"y = c + 2 x + a",
	"y = w0*B^2*x",
	"y = (w1*B + w2*B^2) x; every 2 h;",
	"# comment only line\n\ny = w0 x # trailing\n+ AR(3)\n; where phi1 ~ 0.4\n",
	"y = w0 x + MA(2)",
	"y = w0 x + ARMA(0, 0)",
	"y = w0 / (1 - d B) / (1 - e B) x",
	"y=.5x+2.5E+3 B^0 z-1e-3+a",
	"flow = 1 / ((1 - d1 B)(1 - d2 B)) B^10000 rain + a every 1 d",
	"temp = w0 B burner + k / (1 - d1 B) step(120) + j pulse(2026-03-01T08:00) + 1 pulse(7) + a where d1 ~ 0.5 every 30 s",
	"level = c + w x + s step(2026-03-01T08:00:30.25+01:00) + 1 / (1 - p1 B) a",
}

// readBack checks that m prints as text that parses to a model equal to
// m (values exactly) and that this model prints as the same text. It
// returns the text, and what went wrong first, or nil.
func readBack(m tf.Model) (string, error) {
	p := m.String()
	back, err := Model(p)
	switch {
	case err != nil:
		return p, fmt.Errorf("prints as %q, which does not parse: %v", p, err)
	case !back.Equal(m):
		return p, fmt.Errorf("prints as %q, which reads back as %q", p, back.String())
	case back.String() != p:
		return p, fmt.Errorf("printing not stable: %q then %q", p, back.String())
	}
	return p, nil
}

func TestGoodSpecs(t *testing.T) {
	for _, s := range goodSpecs {
		m, err := Model(s)
		if err != nil {
			t.Errorf("%q: %v", s, err)
			continue
		}
		if _, err := readBack(m); err != nil {
			t.Errorf("%q %v", s, err)
		}
	}
}

// TestModelValues checks the typed values of one spec field by field.
func TestModelValues(t *testing.T) {
	m := MustModel("(1 - B) temp = 21.5 + (w0 + w1 B) / (1 - d1 B) B^4 burner + w2 ((1 - B^12) feed) + ARMA(1, 1) where w0 ~ 2, d1 = 0.6 every 30 s")
	c := func(name string, v float64, free bool) tf.Coef { return tf.Coef{Name: name, Value: v, Free: free} }
	num := func(v float64) tf.Coef { return tf.Coef{Value: v} }
	f := func(terms ...tf.Term) tf.Factor { return tf.Factor{Terms: terms, Exp: 1} }
	want := tf.Model{
		Output: "temp",
		Diff:   tf.Poly{Factors: []tf.Factor{f(tf.Term{Coef: num(1)}, tf.Term{Neg: true, Coef: num(1), Power: 1})}},
		Const:  &tf.Coef{Value: 21.5},
		Inputs: []tf.Input{
			{Series: "burner", Delay: 4,
				Num: tf.Poly{Factors: []tf.Factor{f(tf.Term{Coef: c("w0", 2, true)}, tf.Term{Coef: c("w1", 0, true), Power: 1})}},
				Den: tf.Poly{Factors: []tf.Factor{f(tf.Term{Coef: num(1)}, tf.Term{Neg: true, Coef: c("d1", 0.6, false), Power: 1})}}},
			{Series: "feed",
				Num:  tf.Poly{Factors: []tf.Factor{f(tf.Term{Coef: c("w2", 0, true)})}},
				Diff: tf.Poly{Factors: []tf.Factor{f(tf.Term{Coef: num(1)}, tf.Term{Neg: true, Coef: num(1), Power: 12})}}},
		},
		Noise: &tf.Noise{
			MA: tf.Poly{Factors: []tf.Factor{f(tf.Term{Coef: num(1)}, tf.Term{Neg: true, Coef: c("theta1", 0, true), Power: 1})}},
			AR: tf.Poly{Factors: []tf.Factor{f(tf.Term{Coef: num(1)}, tf.Term{Neg: true, Coef: c("phi1", 0, true), Power: 1})}},
		},
		Interval: tf.Interval{Value: 30, Unit: "s"},
	}
	if !m.Equal(want) {
		t.Fatalf("got  %v\nwant %v", m, want)
	}
	// Positions point at the text: the '(' of the burner numerator, the
	// name d1.
	if p := m.Inputs[0].Num.Factors[0].Pos; p.Line != 1 || p.Column != 23 {
		t.Errorf("numerator factor at %d:%d, want 1:23", p.Line, p.Column)
	}
	if p := m.Inputs[0].Den.Factors[0].Terms[1].Coef.Pos; p.Column != 42 {
		t.Errorf("d1 at column %d, want 42", p.Column)
	}
	// Noise-free and white-noise models.
	if m := MustModel("y = w0 x"); m.Noise != nil {
		t.Errorf("no noise term gave %v", m.Noise)
	}
	if m := MustModel("y = w0 x + a"); m.Noise == nil || !m.Noise.IsWhite() {
		t.Errorf("white noise gave %v", m.Noise)
	}
}

func TestErrorFormat(t *testing.T) {
	_, err := Model("# kiln\ntemp =\n\t(w0 + w1 B) / (2 - d1 B) burner")
	want := "3:16: the constant term of the denominator must be 1, not 2; divide the numerator and the denominator by 2\n" +
		"    \t(w0 + w1 B) / (2 - d1 B) burner\n" +
		"    \t              ^"
	if err == nil || err.Error() != want {
		t.Errorf("got\n%v\nwant\n%s", err, want)
	}
	// Columns count bytes; the caret is placed by characters.
	_, err = Model("y = w0 x # température\n+ é")
	want = "2:3: unexpected character 'é'\n    + é\n      ^"
	if err == nil || err.Error() != want {
		t.Errorf("got\n%v\nwant\n%s", err, want)
	}
	_, err = Model("t = w0 \xff")
	if e := new(Error); !errors.As(err, &e) || e.Msg != "unexpected character byte 0xff" || e.Pos.Column != 8 {
		t.Errorf("bad byte: %v", err)
	}
	// Several errors: the first, then a count.
	_, err = Model("y = w0 / (2 - d B) x + w1 / (3 - e B) z + w2 x")
	var l ErrorList
	if !errors.As(err, &l) || len(l) != 3 {
		t.Fatalf("want 3 errors, got %v", err)
	}
	if !strings.HasSuffix(err.Error(), "\n(and 2 more errors)") || l[1].Pos.Column != 29 || l[2].Pos.Column != 43 {
		t.Errorf("list: %v", err)
	}
	if !errors.Is(err, ErrModel) {
		t.Error("errors.Is(ErrModel) fails on the list")
	}
}

func TestLimits(t *testing.T) {
	big := "y = w0 x #" + strings.Repeat("-", MaxSpecLen)
	_, err := Model(big)
	if !errors.Is(err, ErrLimit) || !strings.Contains(err.Error(), "over the limit of 65536") {
		t.Errorf("long spec: %v", err)
	}
	exact := "y = w0 x #"
	exact += strings.Repeat("-", MaxSpecLen-len(exact))
	if _, err := Model(exact); err != nil {
		t.Errorf("spec of exactly %d bytes: %v", MaxSpecLen, err)
	}
	delays := func(k int) string { return "y = w0 " + strings.Repeat("B ", k) + "x" } // 4 + k tokens
	if m, err := Model(delays(MaxTokens - 4)); err != nil || m.Inputs[0].Delay != MaxTokens-4 {
		t.Errorf("spec of exactly %d tokens: %v", MaxTokens, err)
	}
	_, err = Model(delays(MaxTokens - 3))
	if e := new(Error); !errors.As(err, &e) || !errors.Is(err, ErrLimit) ||
		e.Msg != "the spec has more than 4096 tokens (names, numbers and symbols), over the limit" ||
		e.Pos.Column != len("y = w0 ")+2*(MaxTokens-3)+1 {
		t.Errorf("spec of %d tokens: %v", MaxTokens+1, err)
	}
	// A hostile text near MaxSpecLen is refused by the lexer, before the
	// parser (which allocates about 20 times per token) sees it: the
	// allocations are the token slice's doublings and the error.
	hostile := "y = w / (" + strings.Repeat("(1)", 20000) + ") x"
	if n := testing.AllocsPerRun(3, func() { _, _ = Model(hostile) }); n > 20 { // the lexer makes 13
		t.Errorf("refusing %d bytes over MaxTokens took %v allocations, want at most 20", len(hostile), n)
	}
	deep := "y = " + strings.Repeat("(", MaxNesting) + "1 - B" + strings.Repeat(")", MaxNesting) + " x"
	if m, err := Model(deep); err != nil || m.Inputs[0].Num.Degree() != 1 {
		t.Errorf("nesting %d: %v", MaxNesting, err)
	}
	deeper := "y = " + strings.Repeat("(", MaxNesting+1) + "1 - B" + strings.Repeat(")", MaxNesting+1) + " x"
	if _, err := Model(deeper); !errors.Is(err, ErrLimit) {
		t.Errorf("nesting %d: %v", MaxNesting+1, err)
	}
	inputs := func(n int) string {
		var b strings.Builder
		b.WriteString("y = w0 x0")
		for i := 1; i < n; i++ {
			b.WriteString(" + w" + strconv.Itoa(i) + " x" + strconv.Itoa(i))
		}
		return b.String()
	}
	if _, err := Model(inputs(MaxInputs)); err != nil {
		t.Errorf("%d inputs: %v", MaxInputs, err)
	}
	_, err = Model(inputs(MaxInputs + 1))
	if e := new(Error); !errors.As(err, &e) || e.Msg != "more than 64 input terms" || !errors.Is(err, ErrLimit) {
		t.Errorf("%d inputs: %v", MaxInputs+1, err)
	}
	if _, err := Model("y = w0 / (1 - d B)^32 / (1 - e B^2)^16 x"); err != nil {
		t.Errorf("degree 64: %v", err)
	}
	_, err = Model("y = w0 / (1 - d B)^32 / (1 - e B^2)^16 / (1 - f B) x")
	if e := new(Error); !errors.As(err, &e) || e.Msg != "the denominator has degree 65, over the limit of 64" || e.Pos.Column != 42 {
		t.Errorf("degree 65: %v", err)
	}
	_, err = Model("y = w0 B^5000 B^5001 x")
	if e := new(Error); !errors.As(err, &e) || e.Msg != "the dead time adds up to 10001, over the limit of 10000 samples" {
		t.Errorf("dead time sum: %v", err)
	}
}

// TestHostileLinear checks that memory grows linearly with the length
// of hostile texts: the bytes allocated for a text four times as long
// are at most six times as many (linear growth gives four; the margin
// covers slice doubling). No timing is measured.
func TestHostileLinear(t *testing.T) {
	kinds := map[string]func(n int) string{
		"open parens":   func(n int) string { return strings.Repeat("(", n) },
		"many factors":  func(n int) string { return "y = " + strings.Repeat("(1 - B)", n/7) + " x" },
		"unit factors":  func(n int) string { return "y = w " + strings.Repeat("(1)", n/3) + " x" },
		"unit product":  func(n int) string { return "y = w / (" + strings.Repeat("(1)", n/3) + ") x" },
		"many inputs":   func(n int) string { return "y = " + strings.Repeat("w x + ", n/6) + "a" },
		"long product":  func(n int) string { return "y = " + strings.Repeat("w ", n/2) + "x" },
		"where list":    func(n int) string { return "y = w x where " + strings.Repeat("w = 1, ", n/7) + "w = 1" },
		"signs":         func(n int) string { return "y = (" + strings.Repeat("1 - ", n/4) + "B) x" },
		"nested groups": func(n int) string { return "y = " + strings.Repeat("((((((((1))))))))", n/17) + " x" },
	}
	alloc := func(s string) uint64 {
		var a, b runtime.MemStats
		runtime.ReadMemStats(&a)
		Model(s)
		runtime.ReadMemStats(&b)
		return b.TotalAlloc - a.TotalAlloc
	}
	for name, gen := range kinds {
		small, large := gen(12000), gen(48000)
		alloc(small) // warm up
		as, al := alloc(small), alloc(large)
		if float64(al) > 6*float64(as)+64<<10 {
			t.Errorf("%s: %d bytes for %d bytes of text, %d for %d", name, as, len(small), al, len(large))
		}
	}
}

// TestMutations reads token-level mutations of the test specs: each
// parses to a model that prints and reads back equal, or fails with
// positioned errors whose messages are worded for the slip (none is the
// bare fallback "unexpected ...", which says what was found but not what
// to write).
func TestMutations(t *testing.T) {
	corpus := mutations(t)
	accepted := 0
	for _, s := range corpus {
		m, err := Model(s)
		if err == nil {
			accepted++
			if _, err := readBack(m); err != nil {
				t.Errorf("%q %v", s, err)
			}
			continue
		}
		var e *Error
		if !errors.As(err, &e) || e.Pos.Line < 1 || e.Pos.Offset > len(s) {
			t.Errorf("%q: %v", s, err)
			continue
		}
		if strings.HasPrefix(e.Msg, "unexpected ") && !strings.HasPrefix(e.Msg, "unexpected character") && !strings.Contains(e.Msg, "inside parentheses") {
			t.Errorf("%q: fallback message %q", s, e.Msg)
		}
	}
	if accepted < len(corpus)/10 {
		t.Errorf("only %d of %d texts parse: the mutations test little", accepted, len(corpus))
	}
}

// mutations returns the test specs, random models and token-level
// mutations of them (a token dropped, inserted or replaced).
func mutations(t *testing.T) []string {
	var corpus []string
	corpus = append(corpus, goodSpecs...)
	for _, c := range errorCases {
		corpus = append(corpus, c.spec)
	}
	rng := rand.New(rand.NewPCG(3, 4))
	for range 200 {
		corpus = append(corpus, randomModel(rng).String())
	}
	pieces := []string{"(", ")", "+", "-", "*", "/", "^", "=", "~", ",", ";", "B", "a", "x", "w", "2", "ARMA", "AR", "where", "every", "s"}
	n := len(corpus)
	count := 12
	if testing.Short() {
		count = 4
	}
	for i := range n {
		toks, err := lexSpec(corpus[i])
		if err != nil {
			continue
		}
		for range count {
			parts := make([]string, 0, len(toks)+1)
			for _, tk := range toks[:len(toks)-1] {
				parts = append(parts, tk.Value)
			}
			k := rng.IntN(len(parts) + 1)
			switch rng.IntN(3) {
			case 0:
				if k < len(parts) {
					parts = append(parts[:k], parts[k+1:]...)
				}
			case 1:
				parts = append(parts[:k], append([]string{pieces[rng.IntN(len(pieces))]}, parts[k:]...)...)
			default:
				if k < len(parts) {
					parts[k] = pieces[rng.IntN(len(pieces))]
				}
			}
			corpus = append(corpus, strings.Join(parts, " "))
		}
	}
	return corpus
}

// TestRoundTrip prints random models and reads them back: the result is
// equal (values exactly) and prints to the same text.
func TestRoundTrip(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	for i := range 3000 {
		m := randomModel(rng)
		s, err := readBack(m)
		if err != nil {
			t.Fatalf("model %d %v", i, err)
		}
		var sp Spec
		if err := sp.UnmarshalText([]byte(s)); err != nil || !sp.Model.Equal(m) {
			t.Fatalf("Spec.UnmarshalText(%q): %v", s, err)
		}
		if txt, _ := sp.MarshalText(); string(txt) != s {
			t.Fatalf("Spec.MarshalText: %q, want %q", txt, s)
		}
	}
}

func TestSpecZero(t *testing.T) {
	var sp Spec
	if txt, err := sp.MarshalText(); err != nil || len(txt) != 0 {
		t.Errorf("zero Spec marshals to %q, %v", txt, err)
	}
	sp.Model = MustModel("y = w0 x")
	if err := sp.UnmarshalText([]byte("  # none\n")); err != nil || !sp.IsZero() {
		t.Errorf("blank text: %v, %v", sp, err)
	}
	sp.Model = MustModel("y = w0 x")
	if err := sp.UnmarshalText([]byte("y = w0 / (2 - d B) x")); err == nil || sp.Model.Output != "y" {
		t.Errorf("bad text: err %v, spec changed to %v", err, sp)
	}
}

// randomModel draws a model as the parser builds it: coefficient values
// non-negative with the sign in Term.Neg, constant terms 1 where the
// language requires them, one value and freedom per name, names and
// series disjoint.
func randomModel(rng *rand.Rand) tf.Model {
	type state struct {
		v    float64
		free bool
	}
	names := map[string]state{}
	coefName := func() string {
		n := []string{"w", "d", "t", "p", "c", "omega", "delta_", "k"}[rng.IntN(8)] + strconv.Itoa(rng.IntN(12))
		if _, ok := names[n]; !ok {
			st := state{free: rng.IntN(3) > 0}
			if !st.free || rng.IntN(2) == 0 {
				st.v = randValue(rng, true)
			}
			names[n] = st
		}
		return n
	}
	coef := func(named bool) tf.Coef {
		if named {
			n := coefName()
			return tf.Coef{Name: n, Value: names[n].v, Free: names[n].free}
		}
		return tf.Coef{Value: randValue(rng, false)}
	}
	factor := func(unit, numbersOnly bool, maxPow int) tf.Factor {
		f := tf.Factor{Exp: 1}
		if rng.IntN(4) == 0 {
			f.Exp = 1 + rng.IntN(3)
		}
		powers := rng.Perm(maxPow + 1)[:1+rng.IntN(min(maxPow+1, 4))]
		if unit {
			f.Terms = append(f.Terms, tf.Term{Coef: tf.Coef{Value: 1}})
			powers = slicesDelete(powers, 0)
			if len(powers) == 0 {
				powers = []int{1 + rng.IntN(maxPow)}
			}
		}
		for _, k := range powers {
			f.Terms = append(f.Terms, tf.Term{Neg: rng.IntN(2) == 0, Coef: coef(!numbersOnly && rng.IntN(3) > 0), Power: k})
		}
		return f
	}
	poly := func(n int, unit, numbersOnly bool) tf.Poly {
		var p tf.Poly
		for range n {
			p.Factors = append(p.Factors, factor(unit, numbersOnly, 1+rng.IntN(5)))
		}
		return p
	}
	m := tf.Model{Output: []string{"y", "temp", "flow_out", "Y2"}[rng.IntN(4)]}
	if rng.IntN(3) == 0 {
		m.Diff = poly(1+rng.IntN(2), true, true)
	}
	switch rng.IntN(4) {
	case 1:
		c := tf.Coef{Value: randValue(rng, true)}
		m.Const = &c
	case 2:
		c := coef(true)
		m.Const = &c
	}
	nin := 1 + rng.IntN(4)
	for i := range nin {
		in := tf.Input{Series: "x" + strconv.Itoa(i)}
		for range rng.IntN(3) {
			if rng.IntN(2) == 0 {
				in.Num.Factors = append(in.Num.Factors, tf.Factor{Exp: 1, Terms: []tf.Term{{Neg: rng.IntN(4) == 0, Coef: coef(rng.IntN(2) == 0)}}})
			} else {
				in.Num.Factors = append(in.Num.Factors, factor(false, false, 1+rng.IntN(4)))
			}
		}
		in.Den = poly(rng.IntN(3), true, false)
		if rng.IntN(2) == 0 {
			in.Delay = rng.IntN(30)
		}
		if rng.IntN(4) == 0 {
			in.Diff = poly(1, true, true)
		}
		m.Inputs = append(m.Inputs, in)
	}
	// shorthand builds the factor AR(p) or MA(q) expands to.
	shorthand := func(name string, k int) tf.Poly {
		if k == 0 {
			return tf.Poly{}
		}
		f := tf.Factor{Exp: 1, Terms: []tf.Term{{Coef: tf.Coef{Value: 1}}}}
		for i := 1; i <= k; i++ {
			n := name + strconv.Itoa(i)
			st := state{free: rng.IntN(2) == 0, v: randValue(rng, true)}
			names[n] = st
			f.Terms = append(f.Terms, tf.Term{Neg: true, Coef: tf.Coef{Name: n, Value: st.v, Free: st.free}, Power: i})
		}
		return tf.Poly{Factors: []tf.Factor{f}}
	}
	switch rng.IntN(4) {
	case 1:
		m.Noise = &tf.Noise{}
	case 2:
		m.Noise = &tf.Noise{MA: poly(rng.IntN(3), true, false), AR: poly(rng.IntN(3), true, false)}
	case 3:
		m.Noise = &tf.Noise{MA: shorthand("theta", rng.IntN(3)), AR: shorthand("phi", rng.IntN(4))}
	}
	if rng.IntN(2) == 0 {
		m.Interval = tf.Interval{Value: randValue(rng, false) + 1e-3, Unit: []string{"s", "min", "h", "d"}[rng.IntN(4)]}
	}
	return m
}

func slicesDelete(s []int, v int) []int {
	out := s[:0]
	for _, x := range s {
		if x != v {
			out = append(out, x)
		}
	}
	return out
}

// randValue draws a finite float64: often a plain decimal, sometimes any
// bit pattern (subnormals, huge and tiny values) to test exact reading
// back. Signed values only when signed is set.
func randValue(rng *rand.Rand, signed bool) float64 {
	var v float64
	switch rng.IntN(4) {
	case 0:
		v = float64(rng.IntN(100)) / 10
	case 1:
		v = rng.Float64() * 3
	case 2:
		for {
			v = math.Float64frombits(rng.Uint64() &^ (1 << 63))
			if !math.IsInf(v, 0) && !math.IsNaN(v) {
				break
			}
		}
	default:
		v = 1
	}
	if signed && rng.IntN(2) == 0 {
		v = -v
	}
	return v
}

// TestConcurrent parses good and bad specs from several goroutines at
// once (run with -race): results equal those of a sequential run.
func TestConcurrent(t *testing.T) {
	specs := append([]string(nil), goodSpecs...)
	for _, c := range errorCases[:20] {
		specs = append(specs, c.spec)
	}
	want := make([]string, len(specs))
	for i, s := range specs {
		m, err := Model(s)
		want[i] = m.String() + errString(err)
	}
	done := make(chan string, 4)
	for g := range 4 {
		go func() {
			for r := range 20 {
				for k := range specs {
					i := (k + g*7 + r) % len(specs)
					m, err := Model(specs[i])
					if got := m.String() + errString(err); got != want[i] {
						done <- "spec " + strconv.Itoa(i) + ": " + got
						return
					}
				}
			}
			done <- ""
		}()
	}
	for range 4 {
		if msg := <-done; msg != "" {
			t.Error(msg)
		}
	}
}

// TestDocExamples parses the examples of the package documentation.
func TestDocExamples(t *testing.T) {
	for _, s := range []string{
		"# kiln: burner firing rate (%) -> chamber temperature (degC)\ntemp = 21.5 + (w0 + w1 B) / (1 - d1 B) B^4 burner + (1 - t1 B) / (1 - p1 B) a\nwhere w0 ~ 2, d1 ~ 0.6\nevery 30 s",
		"y = w0 x + 0.5 / (1 - d1 B) z where d1 = 0.8, w0 ~ 0.8",
		"y = (w0 + w1 B - w2 B^2) x + (1 - 0.5 B) z + (1 - B^12) v",
		"y = (w1*B) x + w0 * B^3 z",
		"y = w0 / ((1 - d1 B)(1 - d2 B)) x + (1 - p1 B)(1 - P1 B^12) z + (1 - B)^2 v",
		"y = w0 x",
		"y = w0 B^3 x",
		"y = (w0 + w1 B) / (1 - d1 B) x",
		"y = w0 / (1 - d1 B) / (1 - d2 B) B^2 x",
		"y = 1 x",
		"y = w0 ((1 - B) x)",
		"y = -4.2 + (-w0) x",
		"(1 - B) temp = w0 ((1 - B) burner) + a",
		"(1 - B)(1 - B^12) sales = w0 B^2 ((1 - B)(1 - B^12) lead) + a",
		"y = w0 x + a",
		"y = w0 x + (1 - t1 B) / (1 - p1 B) a",
		"y = w0 x + 1 / (1 - p1 B) a",
		"y = w0 x + (1 - t1 B) / (1 - p1 B) / (1 - P1 B^12) a",
		"y = w0 x + AR(2)", "y = w0 x + MA(1)", "y = w0 x + ARMA(2, 1)", "y = w0 x + ARMA(0, 0)",
		"y = w0 x + ARMA(1, 1) where phi1 ~ 0.5",
		"y = w0 x every 30 s",
		"y = 2 x + 0.5 z + .5 v + 1e-3 u + 2.5E+4 q",
	} {
		if _, err := Model(s); err != nil {
			t.Errorf("%q: %v", s, err)
		}
	}
}

// TestKindsShared: each kind of spec error is a precise kind under the
// library's shared tf.ErrModel, and the three stay distinct.
func TestKindsShared(t *testing.T) {
	kinds := []error{ErrSyntax, ErrModel, ErrLimit}
	for i, k := range kinds {
		if !errors.Is(k, tf.ErrModel) {
			t.Errorf("%v does not match tf.ErrModel", k)
		}
		for j, o := range kinds {
			if (i == j) != errors.Is(k, o) {
				t.Errorf("errors.Is(%v, %v) = %v", k, o, i != j)
			}
		}
	}
	_, err := Model("y = 0.5 x +")
	if !errors.Is(err, ErrSyntax) || !errors.Is(err, tf.ErrModel) || errors.Is(err, ErrLimit) || errors.Is(err, tf.ErrSetting) {
		t.Errorf("syntax error %v: kinds wrong", err)
	}
}

// TestCalendarUnits: every accepts the week and the calendar units, the
// model prints them back, Check accepts them, and other spellings are
// refused with the unit to write.
func TestCalendarUnits(t *testing.T) {
	for _, c := range []struct {
		spec     string
		unit     string
		seconds  float64 // 0: no fixed length
		months   float64
		calendar bool
	}{
		{"sales = w0 B price + a every 1 mo", "mo", 0, 1, true},
		{"sales = w0 B price + a every 1 qtr", "qtr", 0, 3, true},
		{"sales = w0 B price + a every 2 yr", "yr", 0, 24, true},
		{"sales = w0 B price + a every 2 wk", "wk", 2 * 604800, 0, false},
	} {
		m, err := Model(c.spec)
		if err != nil {
			t.Fatalf("%s: %v", c.spec, err)
		}
		if m.Interval.Unit != c.unit || m.Interval.Calendar() != c.calendar {
			t.Errorf("%s: interval %+v, calendar %v", c.spec, m.Interval, m.Interval.Calendar())
		}
		sec, ok := m.Interval.Seconds()
		if ok != (c.seconds > 0) || sec != c.seconds {
			t.Errorf("%s: Seconds %v, %v; want %v", c.spec, sec, ok, c.seconds)
		}
		mo, ok := m.Interval.Months()
		if ok != c.calendar || mo != c.months {
			t.Errorf("%s: Months %v, %v; want %v", c.spec, mo, ok, c.months)
		}
		back, err := Model(m.String())
		if err != nil || !back.Equal(m) || !strings.HasSuffix(m.String(), "every "+strings.Fields(c.spec)[len(strings.Fields(c.spec))-2]+" "+c.unit) {
			t.Errorf("%s: round trip %q: %v", c.spec, m.String(), err)
		}
		if err := Check(m); err != nil {
			t.Errorf("%s: Check: %v", c.spec, err)
		}
	}
	for spelling, want := range map[string]string{"month": "(for months write mo)", "quarters": "(for quarters write qtr)",
		"years": "(for years write yr)", "week": "(for weeks write wk)"} {
		_, err := Model("sales = w0 price every 1 " + spelling)
		if !errors.Is(err, ErrModel) || !strings.Contains(err.Error(), `unknown unit "`+spelling+`" for the sample interval; use s, min, h, d, wk, mo, qtr or yr `+want) {
			t.Errorf("every 1 %s: %v", spelling, err)
		}
	}
}

func errString(err error) string {
	if err == nil {
		return "none"
	}
	return err.Error()
}
