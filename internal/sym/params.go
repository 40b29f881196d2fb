package sym

// Params is the binding of a model's free coefficients to a parameter
// vector: parameter k is the name Names[k], and Coefs[k] holds every free
// coefficient of that name, in the order visited (one name written in
// several places is one parameter). Index maps a name to k.
type Params struct {
	Names []string
	Coefs [][]*Coef
	Index map[string]int
	// Conflict is the first name (in parameter order) that is free in
	// one place and held in another, "" when there is none.
	Conflict string
}

// GroupParams binds the named coefficients that each visits, in order
// of first appearance; unnamed coefficients (numbers written in a
// spec) are skipped, and a held (not free) coefficient is only noted
// for Conflict. The pointers are those each hands out, so that setting
// Coefs[k][i].Value changes the model each walks.
func GroupParams(each func(fn func(*Coef))) Params {
	p := Params{Index: map[string]int{}}
	held := map[string]bool{}
	each(func(c *Coef) {
		if c.Name == "" {
			return
		}
		if !c.Free {
			held[c.Name] = true
			return
		}
		k, ok := p.Index[c.Name]
		if !ok {
			k = len(p.Names)
			p.Index[c.Name] = k
			p.Names = append(p.Names, c.Name)
			p.Coefs = append(p.Coefs, nil)
		}
		p.Coefs[k] = append(p.Coefs[k], c)
	})
	for _, name := range p.Names {
		if held[name] {
			p.Conflict = name
			break
		}
	}
	return p
}
