package tf_test

import (
	"fmt"

	"github.com/backshift/backshift/parse"
)

// The whole path of an integrating model: the output differencing moves
// to the path's denominator, so the plant is the term over (1 - B), with
// a pole at z = 1 and no steady-state gain; the term alone
// (Input.Rational) acts on the differenced output.
func ExampleModel_Path() {
	m := parse.MustModel("(1 - B) level = 0.05 / (1 - 0.5 B) B^2 pump; every 1 min")
	term, _ := m.Inputs[0].Rational()
	p, err := m.Path("pump")
	if err != nil {
		fmt.Println(err)
		return
	}
	_, gerr := p.Gain()
	fmt.Println("term:", term)
	fmt.Println("path:", p)
	fmt.Println("stable:", p.Stable(), "gain exists:", gerr == nil)
	// A (1 - B) on both sides cancels: a plain static path.
	s := parse.MustModel("(1 - B) y = 0.3 B ((1 - B) u)")
	q, _ := s.Path("u")
	g, _ := q.Gain()
	fmt.Println("both differenced:", q, "gain", g)
	// Output:
	// term: (0.05) / (1 - 0.5 B) B^2
	// path: (0.05) / (1 - 1.5 B + 0.5 B^2) B^2
	// stable: false gain exists: false
	// both differenced: (0.3) B gain 0.3
}
