package main

import (
	"fmt"
	"io"

	"github.com/backshift/backshift/parse"
)

// leftOutEvent is an event term of a plant spec (step(T), pulse(T): a
// known intervention in the record the model was fitted to) that the
// harness leaves out of the plant it drives: it is no input the PI or
// the weather moves, and the scenarios start from a steady state of the
// valve and the outdoor temperature alone.
type leftOutEvent struct {
	Term string // the term as written in the spec, "3.02 step(1500)"
}

// withoutEvents returns spec with its event terms left out, and the
// terms; a spec without events, or one that does not parse (NewProcess
// then reports where), is returned as it is.
func withoutEvents(spec string) (string, []leftOutEvent) {
	m, err := parse.Model(spec)
	if err != nil {
		return spec, nil
	}
	c := m.Clone()
	c.Inputs = c.Inputs[:0]
	var out []leftOutEvent
	for _, in := range m.Inputs {
		if in.Event == nil {
			c.Inputs = append(c.Inputs, in)
			continue
		}
		out = append(out, leftOutEvent{Term: in.String()})
	}
	if len(out) == 0 {
		return spec, nil
	}
	return c.String(), out
}

// writeLeftOut says which event terms the plant leaves out, and why.
func writeLeftOut(w io.Writer, evs []leftOutEvent) {
	for _, e := range evs {
		fmt.Fprintf(w, "  left out: %s, an event (a known intervention in the record the model was fitted to), not an input the harness drives\n", e.Term)
	}
}
