package parse

import (
	"errors"
	"slices"
	"strconv"

	"github.com/alecthomas/participle/v2/lexer"
	"github.com/backshift/backshift/tf"
)

// Model parses a spec and returns the model it describes.
//
// On failure it returns the zero tf.Model and an ErrorList with at least
// one *Error, each with the position (1-based line and byte column) and a
// message in the spec's own words; printing the error shows the line with
// a caret under the column. Model never modifies anything it is given and
// is safe for concurrent use. Its time and memory are linear in
// len(spec), which is at most MaxSpecLen.
func Model(spec string) (tf.Model, error) {
	b := builder{src: spec}
	if len(spec) > MaxSpecLen {
		p := tf.Pos{Offset: MaxSpecLen, Line: 1, Column: 1}
		b.errs = append(b.errs, &Error{Pos: p, Kind: ErrLimit,
			Msg: "the spec is " + strconv.Itoa(len(spec)) + " bytes long, over the limit of " + strconv.Itoa(MaxSpecLen)})
		return tf.Model{}, b.errs
	}
	toks, err := lexSpec(spec)
	if err != nil {
		var le *lexError
		errors.As(err, &le)
		b.fail(le.pos, le.kind, le.msg)
		return tf.Model{}, b.errs
	}
	if e := checkNesting(toks); e != nil {
		b.fail(e.pos, e.kind, e.msg)
		return tf.Model{}, b.errs
	}
	if len(toks) == 1 {
		b.fail(toks[0].Pos, ErrSyntax, "the spec is empty; write a model such as y = w0 B x + a")
		return tf.Model{}, b.errs
	}
	g, err := grammarParse(toks)
	if err != nil {
		b.syntax(toks, err)
		return tf.Model{}, b.errs
	}
	b.build(g)
	if len(b.errs) > 0 {
		slices.SortStableFunc(b.errs, func(x, y *Error) int { return x.Pos.Offset - y.Pos.Offset })
		return tf.Model{}, b.errs
	}
	return b.m, nil
}

// grammarParse runs the participle parser on lexed tokens.
func grammarParse(toks []lexer.Token) (*specText, error) {
	pl, err := lexer.Upgrade(&sliceLexer{toks: toks})
	if err != nil {
		return nil, err
	}
	return specParser.ParseFromLexer(pl)
}

// checkNesting bounds the depth of parentheses before the recursive
// parser sees the tokens.
func checkNesting(toks []lexer.Token) *lexError {
	depth := 0
	for _, t := range toks {
		if t.Type != tokPunct {
			continue
		}
		switch t.Value {
		case "(":
			depth++
			if depth > MaxNesting {
				return &lexError{pos: t.Pos, kind: ErrLimit, msg: "parentheses nested more than " + strconv.Itoa(MaxNesting) + " deep"}
			}
		case ")":
			depth = max(depth-1, 0)
		}
	}
	return nil
}
