package main

import (
	"os"
	"strings"
	"testing"
)

// sectionBlock returns the lines of the fenced block between the markers
// <!-- from-model:begin --> and <!-- from-model:end --> of text, and
// whether text has them.
func sectionBlock(text string) ([]string, bool) {
	_, rest, ok := strings.Cut(text, "<!-- from-model:begin -->\n")
	block, _, ok2 := strings.Cut(rest, "<!-- from-model:end -->")
	if !ok || !ok2 {
		return nil, false
	}
	var out []string
	for _, l := range strings.Split(strings.TrimSpace(block), "\n") {
		if !strings.HasPrefix(l, "```") {
			out = append(out, l)
		}
	}
	return out, true
}

// TestReadmeSection keeps the code of the README section "From model to
// controller" (between the from-model markers of README.md) the same as
// fromModelToController, which Example_fromModelToController runs and
// checks.
func TestReadmeSection(t *testing.T) {
	src, err := os.ReadFile("readme_example_test.go")
	if err != nil {
		t.Fatal(err)
	}
	s := string(src)
	i := strings.Index(s, "func fromModelToController(")
	j := strings.Index(s[i:], "\n}\n")
	want := strings.Split(s[i:i+j+2], "\n")
	raw, err := os.ReadFile("../../README.md")
	if err != nil {
		t.Fatal(err)
	}
	got, ok := sectionBlock(string(raw))
	if !ok {
		t.Fatal("README.md has no from-model block")
	}
	if strings.Join(got, "\n") != strings.Join(want, "\n") {
		t.Errorf("the code of README.md differs from fromModelToController in readme_example_test.go:\n%s", strings.Join(got, "\n"))
	}
}
