package parse

import (
	"os"
	"strings"
	"testing"
)

// TestGrammarDoc checks that the grammar printed in the package doc is
// the grammar the parser runs: the productions participle reports for
// the grammar types (Parser.String) and those of the doc's Grammar
// section are the same, production by production (the doc may order
// them and break long ones over lines).
func TestGrammarDoc(t *testing.T) {
	src, err := os.ReadFile("doc.go")
	if err != nil {
		t.Fatal(err)
	}
	doc := productions(t, docGrammar(t, string(src)))
	run := productions(t, specParser.String())
	for name, body := range run {
		switch d, ok := doc[name]; {
		case !ok:
			t.Errorf("production %s is not in the doc; the parser has\n\t%s = %s .", name, name, body)
		case d != body:
			t.Errorf("production %s differs:\n doc: %s\n run: %s", name, d, body)
		}
	}
	for name := range doc {
		if _, ok := run[name]; !ok {
			t.Errorf("the doc has production %s, which the parser does not", name)
		}
	}
}

// docGrammar returns the productions of the doc's Grammar section: the
// indented lines after "# Grammar" up to the first blank comment line
// after them.
func docGrammar(t *testing.T, src string) string {
	_, sec, ok := strings.Cut(src, "// # Grammar\n")
	if !ok {
		t.Fatal("doc.go has no Grammar section")
	}
	var b strings.Builder
	started := false
	for _, line := range strings.Split(sec, "\n") {
		text, code := strings.CutPrefix(line, "//\t")
		switch {
		case code:
			started = true
			b.WriteString(text + "\n")
		case started:
			return b.String()
		}
	}
	t.Fatal("the Grammar section has no productions")
	return ""
}

// productions splits EBNF text ("Name = body ." each, possibly over
// several lines) into a map from name to body with spaces normalised.
func productions(t *testing.T, text string) map[string]string {
	out := map[string]string{}
	for _, p := range strings.Split(strings.Join(strings.Fields(text), " "), " . ") {
		p = strings.TrimSuffix(strings.TrimSpace(p), " .")
		if p == "" {
			continue
		}
		name, body, ok := strings.Cut(p, " = ")
		if !ok {
			t.Fatalf("not a production: %q", p)
		}
		if _, dup := out[name]; dup {
			t.Fatalf("production %s twice", name)
		}
		out[name] = body
	}
	return out
}
