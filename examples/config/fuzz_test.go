package main

import (
	"bytes"
	"errors"
	"strings"
	"testing"

	"github.com/backshift/backshift/parse"
)

// FuzzLoad checks that Load never panics and returns either a config
// whose every model is valid (parse.Check) with a sample interval, or
// Problems, each positioned inside the file and printable. Seeds: the
// built-in files and broken variants of them.
func FuzzLoad(f *testing.F) {
	for _, raw := range [][]byte{builtin, fitted, broken, validityFile(`{"samples": 3, "ranges": {"temp": [1, 2]}, "verdict": "failed"}`)} {
		f.Add(raw)
		f.Add(append([]byte("\ufeff"), raw...))
		f.Add(raw[:len(raw)/2])
	}
	f.Add([]byte(`{"models": [{"name": "a\ud83d\ude00", "Spec": "# \ud83d x\ny = w0 / (2 - B) x + a; every 1 s", "spec": "\xff"}]}`))
	f.Add([]byte(""))
	f.Fuzz(func(t *testing.T, raw []byte) {
		in := bytes.Clone(raw)
		c, err := Load("f.json", raw)
		if !bytes.Equal(in, raw) {
			t.Fatal("Load modified its input")
		}
		if err != nil {
			var ps Problems
			if c != nil || !errors.As(err, &ps) || len(ps) == 0 {
				t.Fatalf("error %T %v with config %v", err, err, c)
			}
			lines := bytes.Count(raw, []byte("\n")) + 1
			for _, p := range ps {
				if p.Line < 1 || p.Line > lines || p.Column < 1 || p.Column > len(raw)+1 || p.Msg == "" {
					t.Fatalf("problem out of the file: %+v", *p)
				}
				if s := p.Error(); !strings.HasPrefix(s, "f.json:") {
					t.Fatalf("printed as %q", s)
				}
			}
			return
		}
		if c == nil || len(c.Models) == 0 {
			t.Fatalf("no error and no models: %+v", c)
		}
		for _, e := range c.Models {
			if err := parse.Check(e.Spec.Model); err != nil || e.Spec.Model.Interval.Value <= 0 || e.Name == "" {
				t.Fatalf("model %q accepted: %v (interval %v)", e.Name, err, e.Spec.Model.Interval)
			}
		}
	})
}
