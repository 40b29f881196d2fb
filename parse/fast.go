package parse

import "github.com/alecthomas/participle/v2/lexer"

// fastParse builds the same syntax tree as the participle grammar in
// grammar.go by plain recursive descent over the tokens, more than ten times
// faster; it reports only success. When it fails, Model runs the
// participle parser on the same tokens for the position and the message
// of the error. Tests (TestFastMatchesGrammar and FuzzParse) check that
// both parsers accept the same texts and build equal trees.
//
// On failure it returns the index of the token where it stopped.
func fastParse(toks []lexer.Token) (*gSpec, int, bool) {
	p := fastParser{toks: toks}
	nParen := 0
	for i := range toks {
		if t := &toks[i]; t.Type == tokPunct && t.Value == "(" {
			nParen++
		}
	}
	p.groups = make([]gGroup, 0, nParen)
	g := &gSpec{}
	if !p.equation(&g.Eq) {
		return nil, p.i, false
	}
	for !p.atEOF() {
		if p.isPunct(";") {
			p.i++
			continue
		}
		var c gClause
		if !p.clause(&c) {
			return nil, p.i, false
		}
		g.Clauses = append(g.Clauses, c)
	}
	return g, 0, true
}

type fastParser struct {
	toks   []lexer.Token
	i      int
	items  []gItem  // slab for the items inside parentheses
	groups []gGroup // slab for groups
}

// newItem hands out a zeroed item from the slab.
func (p *fastParser) newItem() *gItem {
	if len(p.items) == cap(p.items) {
		p.items = make([]gItem, 0, 16)
	}
	p.items = p.items[:len(p.items)+1]
	return &p.items[len(p.items)-1]
}

// newGroup hands out a zeroed group from the slab.
func (p *fastParser) newGroup() *gGroup {
	if len(p.groups) == cap(p.groups) {
		p.groups = make([]gGroup, 0, 16)
	}
	p.groups = p.groups[:len(p.groups)+1]
	return &p.groups[len(p.groups)-1]
}

func (p *fastParser) peek() *lexer.Token { return &p.toks[p.i] }
func (p *fastParser) atEOF() bool        { return p.toks[p.i].Type == lexer.EOF }

func (p *fastParser) isPunct(v string) bool {
	t := &p.toks[p.i]
	return t.Type == tokPunct && t.Value == v
}

func (p *fastParser) isKeyword(v string) bool {
	t := &p.toks[p.i]
	return t.Type == tokKeyword && t.Value == v
}

func (p *fastParser) equation(eq *gEquation) bool {
	for p.isPunct("(") {
		g := p.newGroup()
		if !p.group(g) {
			return false
		}
		eq.Diff = append(eq.Diff, g)
	}
	if !p.name(&eq.Output) {
		return false
	}
	if !p.isPunct("=") {
		return false
	}
	eq.Eq = "="
	p.i++
	eq.Terms = make([]gTerm, 0, 4)
	for {
		var t gTerm
		t.Pos = p.peek().Pos
		if p.isPunct("+") || p.isPunct("-") {
			t.Sign = p.peek().Value
			p.i++
		}
		t.Items = make([]gItem, 0, 4)
		n := 0
		for {
			var it gItem
			ok, matched := p.item(&it)
			if !ok {
				return false
			}
			if !matched {
				break
			}
			t.Items = append(t.Items, it)
			n++
		}
		if n == 0 {
			return false
		}
		eq.Terms = append(eq.Terms, t)
		if !(p.isPunct("+") || p.isPunct("-")) {
			return true
		}
	}
}

func (p *fastParser) name(n *gName) bool {
	t := p.peek()
	if t.Type != tokIdent {
		return false
	}
	n.Pos, n.Name = t.Pos, t.Value
	p.i++
	return true
}

// item parses one gItem; matched is false (with ok true) when the next
// token cannot start an item.
func (p *fastParser) item(it *gItem) (ok, matched bool) {
	t := p.peek()
	it.Pos = t.Pos
	switch t.Type {
	case tokNumber:
		it.Number = t.Value
		p.i++
		return true, true
	case tokIdent:
		it.Name = t.Value
		p.i++
		return true, true
	case tokKeyword:
		switch t.Value {
		case "B":
			it.B = &gBPow{}
			return p.bpow(it.B), true
		case "a":
			it.Noise = true
			p.i++
			return true, true
		case "AR", "MA", "ARMA":
			it.Short = &gShort{}
			return p.short(it.Short), true
		}
		return true, false
	case tokPunct:
		switch t.Value {
		case "*":
			it.Star = true
			p.i++
			return true, true
		case "/":
			p.i++
			if !p.isPunct("(") {
				return false, true
			}
			it.Slash = p.newGroup()
			return p.group(it.Slash), true
		case "(":
			it.Group = p.newGroup()
			return p.group(it.Group), true
		}
	}
	return true, false
}

func (p *fastParser) bpow(b *gBPow) bool {
	b.Pos = p.peek().Pos
	b.B = "B"
	p.i++
	if p.isPunct("^") {
		p.i++
		b.Exp = &gExp{}
		return p.exp(b.Exp)
	}
	return true
}

func (p *fastParser) exp(e *gExp) bool {
	e.Pos = p.peek().Pos
	if p.isPunct("-") {
		e.Neg = true
		p.i++
	}
	t := p.peek()
	if t.Type != tokNumber {
		return false
	}
	e.Num = t.Value
	p.i++
	return true
}

func (p *fastParser) short(s *gShort) bool {
	t := p.peek()
	s.Pos, s.Kind = t.Pos, t.Value
	p.i++
	if !p.isPunct("(") {
		return false
	}
	p.i++
	for {
		e := &gExp{}
		if !p.exp(e) {
			return false
		}
		s.Args = append(s.Args, e)
		if p.isPunct(")") {
			p.i++
			return true
		}
		if !p.isPunct(",") {
			return false
		}
		p.i++
	}
}

func (p *fastParser) group(g *gGroup) bool {
	g.Pos = p.peek().Pos
	p.i++ // "("
	g.Elems = make([]gElem, 0, 4)
	for {
		t := p.peek()
		var el gElem
		el.Pos = t.Pos
		if t.Type == tokPunct && (t.Value == "+" || t.Value == "-") {
			el.Sign = t.Value
			p.i++
			g.Elems = append(g.Elems, el)
			continue
		}
		it := p.newItem()
		ok, matched := p.item(it)
		if !ok {
			return false
		}
		if !matched {
			break
		}
		el.Item = it
		g.Elems = append(g.Elems, el)
	}
	if len(g.Elems) == 0 || !p.isPunct(")") {
		return false
	}
	g.Close = gClose{Pos: p.peek().Pos, Paren: ")"}
	p.i++
	if p.isPunct("^") {
		p.i++
		g.Exp = &gExp{}
		return p.exp(g.Exp)
	}
	return true
}

func (p *fastParser) clause(c *gClause) bool {
	c.Pos = p.peek().Pos
	switch {
	case p.isKeyword("where"):
		p.i++
		for {
			var b gBind
			b.Pos = p.peek().Pos
			if !p.name(&b.Name) {
				return false
			}
			if !(p.isPunct("=") || p.isPunct("~")) {
				return false
			}
			b.Op = p.peek().Value
			p.i++
			if !p.exp(&b.Val) {
				return false
			}
			c.Where = append(c.Where, b)
			if !p.isPunct(",") {
				return true
			}
			p.i++
		}
	case p.isKeyword("every"):
		p.i++
		c.Every = &gEvery{Pos: p.peek().Pos}
		return p.exp(&c.Every.Val) && p.name(&c.Every.Unit)
	}
	return false
}
