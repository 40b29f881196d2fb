package apidoc

import (
	"fmt"
	"go/ast"
	"go/doc"
	"go/parser"
	"go/token"
	"io/fs"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"testing"
)

// moduleRoot returns the directory holding go.mod, found upwards from the test's directory.
func moduleRoot(t *testing.T) string {
	t.Helper()
	dir, err := os.Getwd()
	if err != nil {
		t.Fatal(err)
	}
	for {
		if _, err := os.Stat(filepath.Join(dir, "go.mod")); err == nil {
			return dir
		}
		parent := filepath.Dir(dir)
		if parent == dir {
			t.Fatal("go.mod not found above the test directory")
		}
		dir = parent
	}
}

// pkgDir is one directory of Go source: its path relative to the module root and its files.
type pkgDir struct {
	rel   string
	fset  *token.FileSet
	files []*ast.File // non-test files
	tests []*ast.File // _test.go files (internal and external test packages)
	names []string    // base names of the non-test files
}

// skipDir reports whether a directory is outside the checked packages: testdata, hidden and
// underscore directories (the go tool ignores them too) and any internal/ subtree.
func skipDir(name string) bool {
	return name == "testdata" || name == "internal" || strings.HasPrefix(name, ".") || strings.HasPrefix(name, "_")
}

// walkPackages parses every checked package directory below root, comments included.
func walkPackages(t *testing.T, root string) []pkgDir {
	t.Helper()
	var dirs []pkgDir
	err := filepath.WalkDir(root, func(path string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		if !d.IsDir() {
			return nil
		}
		if path != root && skipDir(d.Name()) {
			return filepath.SkipDir
		}
		entries, err := os.ReadDir(path)
		if err != nil {
			return err
		}
		p := pkgDir{fset: token.NewFileSet()}
		p.rel, _ = filepath.Rel(root, path)
		for _, e := range entries {
			name := e.Name()
			if e.IsDir() || !strings.HasSuffix(name, ".go") || strings.HasPrefix(name, ".") || strings.HasPrefix(name, "_") {
				continue
			}
			f, err := parser.ParseFile(p.fset, filepath.Join(path, name), nil, parser.ParseComments)
			if err != nil {
				return err
			}
			if strings.HasSuffix(name, "_test.go") {
				p.tests = append(p.tests, f)
			} else {
				p.files = append(p.files, f)
				p.names = append(p.names, name)
			}
		}
		if len(p.files) > 0 {
			dirs = append(dirs, p)
		}
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	return dirs
}

// undocumented lists the exported names of one package that lack a doc comment, as
// "file:line: Name" strings (methods as "Type.Method").
func undocumented(p pkgDir) []string {
	var out []string
	add := func(pos token.Pos, name string) {
		position := p.fset.Position(pos)
		out = append(out, fmt.Sprintf("%s:%d: %s", filepath.Join(p.rel, filepath.Base(position.Filename)), position.Line, name))
	}
	for _, f := range p.files {
		for _, decl := range f.Decls {
			switch d := decl.(type) {
			case *ast.FuncDecl:
				if !d.Name.IsExported() {
					continue
				}
				name := d.Name.Name
				if d.Recv != nil {
					recv := receiverName(d.Recv)
					if !ast.IsExported(recv) {
						continue
					}
					name = recv + "." + name
				}
				if !hasText(d.Doc) {
					add(d.Pos(), name)
				}
			case *ast.GenDecl:
				for _, spec := range d.Specs {
					switch s := spec.(type) {
					case *ast.TypeSpec:
						if s.Name.IsExported() && !hasText(s.Doc) && !(len(d.Specs) == 1 && hasText(d.Doc)) {
							add(s.Pos(), s.Name.Name)
						}
					case *ast.ValueSpec:
						// A documented group documents its members; otherwise each
						// exported name needs its own comment above or at the end of the line.
						if hasText(d.Doc) || hasText(s.Doc) || hasText(s.Comment) {
							continue
						}
						for _, n := range s.Names {
							if n.IsExported() {
								add(n.Pos(), n.Name)
							}
						}
					}
				}
			}
		}
	}
	return out
}

// receiverName returns the base type name of a method receiver (T for T, *T, T[P], *T[P]).
func receiverName(fl *ast.FieldList) string {
	if fl == nil || len(fl.List) == 0 {
		return ""
	}
	expr := fl.List[0].Type
	for {
		switch e := expr.(type) {
		case *ast.StarExpr:
			expr = e.X
		case *ast.IndexExpr:
			expr = e.X
		case *ast.IndexListExpr:
			expr = e.X
		case *ast.Ident:
			return e.Name
		default:
			return ""
		}
	}
}

func hasText(cg *ast.CommentGroup) bool {
	return cg != nil && strings.TrimSpace(cg.Text()) != ""
}

// docFileProblems checks the doc.go rule: the file exists, carries the package comment and
// declares nothing; no other file of the package carries a package comment.
func docFileProblems(p pkgDir) []string {
	var out []string
	found := false
	for i, f := range p.files {
		name := p.names[i]
		if name == "doc.go" {
			found = true
			if !hasText(f.Doc) {
				out = append(out, p.rel+"/doc.go: no package comment")
			}
			if len(f.Decls) > 0 {
				out = append(out, p.rel+"/doc.go: holds declarations besides the package comment")
			}
			continue
		}
		if hasText(f.Doc) && !strings.HasPrefix(strings.TrimSpace(f.Doc.Text()), "Code generated") {
			out = append(out, fmt.Sprintf("%s/%s: package comment outside doc.go", p.rel, name))
		}
	}
	if !found {
		out = append(out, p.rel+": no doc.go")
	}
	return out
}

// hasOutputExample reports whether the package's test files hold a runnable example: an
// Example function whose "// Output:" comment is followed by expected text.
func hasOutputExample(p pkgDir) bool {
	for _, ex := range doc.Examples(p.tests...) {
		if ex.Output != "" {
			return true
		}
	}
	return false
}

// TestDocumentation enforces the rules of the package comment: see doc.go.
func TestDocumentation(t *testing.T) {
	root := moduleRoot(t)
	dirs := walkPackages(t, root)
	seen := map[string]bool{}
	for _, p := range dirs {
		seen[p.rel] = true
		isMain := p.files[0].Name.Name == "main"
		var problems []string
		for _, u := range undocumented(p) {
			problems = append(problems, "undocumented: "+u)
		}
		problems = append(problems, docFileProblems(p)...)
		if !isMain && !hasOutputExample(p) {
			problems = append(problems, p.rel+": no Example function with a non-empty // Output: comment")
		}
		sort.Strings(problems)
		t.Logf("%s: %d files, %d test files, %d problems", p.rel, len(p.files), len(p.tests), len(problems))
		for _, pr := range problems {
			t.Error(pr)
		}
	}
	// The library packages of the design must all be present and checked, so that a
	// renamed directory cannot silently drop out of the walk.
	for _, want := range []string{"tf", "arma", "ccf", "prewhiten", "parse"} {
		if !seen[want] {
			t.Errorf("package %s not found under %s", want, root)
		}
	}
}

// TestDetector runs the checks on a small synthetic package, so that the rules above are
// known to fire: each planted fault must be reported, and nothing else.
func TestDetector(t *testing.T) {
	const src = `// Package demo is documented here, which is not doc.go.
package demo

// Good is documented.
func Good() {}

func Bare() {}

type T struct{}

// U is documented.
type U struct{}

func (U) Method() {}

// Documented is documented.
func (U) Documented() {}

func (u) hidden() {}

type u struct{}

func (u) Exported() {}

const (
	A = 1
	B = 2 // B is documented at the end of its line.
)

// Group comment documents both.
var (
	V1, V2 int
)
`
	p := pkgDir{rel: "demo", fset: token.NewFileSet(), names: []string{"demo.go"}}
	f, err := parser.ParseFile(p.fset, "demo.go", src, parser.ParseComments)
	if err != nil {
		t.Fatal(err)
	}
	p.files = []*ast.File{f}
	got := undocumented(p)
	want := []string{"demo/demo.go:7: Bare", "demo/demo.go:9: T", "demo/demo.go:14: U.Method", "demo/demo.go:26: A"}
	if strings.Join(got, "\n") != strings.Join(want, "\n") {
		t.Errorf("undocumented:\n got %q\nwant %q", got, want)
	}
	gotDoc := docFileProblems(p)
	wantDoc := []string{"demo/demo.go: package comment outside doc.go", "demo: no doc.go"}
	if strings.Join(gotDoc, "\n") != strings.Join(wantDoc, "\n") {
		t.Errorf("doc.go rule:\n got %q\nwant %q", gotDoc, wantDoc)
	}
	if hasOutputExample(p) {
		t.Error("a package without tests reported as having an example")
	}
	// Both directions: empty or missing // Output: does not count, expected
	// text does (so a hasOutputExample that always said false fails too).
	for _, c := range []struct {
		body string
		want bool
	}{
		{"func ExampleGood() {\n\tfmt.Println(\"x\")\n\t// Output:\n}\n\nfunc ExampleU() {\n\tfmt.Println(\"y\")\n}\n", false},
		{"func ExampleGood() {\n\tfmt.Println(\"x\")\n\t// Output: x\n}\n", true},
	} {
		tf, err := parser.ParseFile(p.fset, "demo_test.go", "package demo_test\n\nimport \"fmt\"\n\n"+c.body, parser.ParseComments)
		if err != nil {
			t.Fatal(err)
		}
		p.tests = []*ast.File{tf}
		if got := hasOutputExample(p); got != c.want {
			t.Errorf("hasOutputExample for %q: got %v, want %v", c.body, got, c.want)
		}
	}
	// The doc.go rule on doc.go itself: clean when it holds only the
	// package comment, and each fault reported.
	for _, c := range []struct{ src, want string }{
		{"// Package demo is documented.\npackage demo\n", ""},
		{"package demo\n", "demo/doc.go: no package comment"},
		{"// Package demo is documented.\npackage demo\n\nvar X int\n", "demo/doc.go: holds declarations besides the package comment"},
	} {
		d := pkgDir{rel: "demo", fset: token.NewFileSet(), names: []string{"doc.go"}}
		f, err := parser.ParseFile(d.fset, "doc.go", c.src, parser.ParseComments)
		if err != nil {
			t.Fatal(err)
		}
		d.files = []*ast.File{f}
		if got := strings.Join(docFileProblems(d), "\n"); got != c.want {
			t.Errorf("doc.go %q: got %q, want %q", c.src, got, c.want)
		}
	}
}
