package sym

import (
	"slices"
	"testing"
)

// GroupParams binds free named coefficients by name in order of first
// appearance, skips numbers, and names the first name that is both free
// and held (worked by hand).
func TestGroupParams(t *testing.T) {
	cs := []Coef{
		{Name: "c", Free: true, Value: 1},
		{Value: 1}, // a number written in the spec
		{Name: "w", Free: true, Value: 2},
		{Name: "d", Free: false, Value: 0.5},
		{Name: "w", Free: true, Value: 3},
		{Name: "c", Free: false},
	}
	each := func(fn func(*Coef)) {
		for i := range cs {
			fn(&cs[i])
		}
	}
	p := GroupParams(each)
	if !slices.Equal(p.Names, []string{"c", "w"}) {
		t.Fatalf("Names %v, want [c w]", p.Names)
	}
	if len(p.Coefs[1]) != 2 || p.Coefs[1][0] != &cs[2] || p.Coefs[1][1] != &cs[4] {
		t.Errorf("w is bound to %v, want cs[2] and cs[4]", p.Coefs[1])
	}
	if p.Index["w"] != 1 || p.Conflict != "c" {
		t.Errorf("Index[w] %d, Conflict %q; want 1 and c", p.Index["w"], p.Conflict)
	}
	p.Coefs[1][0].Value = 9
	if cs[2].Value != 9 {
		t.Errorf("setting through Coefs did not reach the coefficient")
	}
	cs[5].Free = true
	if q := GroupParams(each); q.Conflict != "" {
		t.Errorf("Conflict %q with no held name among the free ones", q.Conflict)
	}
}
