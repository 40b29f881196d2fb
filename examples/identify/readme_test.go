package main

import (
	"os"
	"strings"
	"testing"
)

// readmeBlock returns the lines of the fenced block between the markers
// <!-- name:begin --> and <!-- name:end --> of the README (the lines
// .ci/run extracts into a module of its own).
func readmeBlock(t *testing.T, readme, name string) []string {
	t.Helper()
	_, rest, ok := strings.Cut(readme, "<!-- "+name+":begin -->\n")
	block, _, ok2 := strings.Cut(rest, "<!-- "+name+":end -->")
	if !ok || !ok2 {
		t.Fatalf("README.md has no block between the markers of %s", name)
	}
	var out []string
	for _, l := range strings.Split(strings.TrimSpace(block), "\n") {
		if !strings.HasPrefix(l, "```") {
			out = append(out, l)
		}
	}
	return out
}

// between returns the lines of s from the first that starts with from
// (after its indentation) to the first after it that starts with to,
// both included.
func between(s []string, from, to string) []string {
	i := -1
	for k, l := range s {
		if i < 0 && strings.HasPrefix(strings.TrimSpace(l), from) {
			i = k
		}
		if i >= 0 && strings.HasPrefix(strings.TrimSpace(l), to) {
			return s[i : k+1]
		}
	}
	return nil
}

// TestReadmeIsTheExample keeps the README's program and its printed
// output the same as Example, whose output go test checks: .ci/run runs
// the README's block in a module outside the repository, this test
// guards that the two say the same thing.
func TestReadmeIsTheExample(t *testing.T) {
	raw, err := os.ReadFile("../../README.md")
	if err != nil {
		t.Fatal(err)
	}
	src, err := os.ReadFile("example_test.go")
	if err != nil {
		t.Fatal(err)
	}
	readme, example := string(raw), strings.Split(string(src), "\n")
	prog := readmeBlock(t, readme, "ten-lines")
	got := between(prog, "d := greenhouse.Default()", `fmt.Printf("in 1 h`)
	want := between(example, "d := greenhouse.Default()", `fmt.Printf("in 1 h`)
	if len(want) == 0 || strings.Join(got, "\n") != strings.Join(want, "\n") {
		t.Errorf("the README's program differs from Example:\nREADME:\n%s\nExample:\n%s", strings.Join(got, "\n"), strings.Join(want, "\n"))
	}
	var out []string
	for _, l := range between(example, "// Output:", "}")[1:] {
		if l = strings.TrimSpace(l); l != "}" {
			out = append(out, strings.TrimPrefix(l, "// "))
		}
	}
	if printed := readmeBlock(t, readme, "ten-lines-output"); strings.Join(printed, "\n") != strings.Join(out, "\n") {
		t.Errorf("the README's output differs from Example's:\nREADME:\n%s\nExample:\n%s", strings.Join(printed, "\n"), strings.Join(out, "\n"))
	}
}
