package apidoc

import (
	"fmt"
	"go/ast"
	"go/parser"
	"go/token"
	"path/filepath"
	"sort"
	"strings"
	"testing"
)

// maxFuncLines is the longest a function may be, counted from its func
// line to its closing brace, less the lines of table literals (composite
// literals of more than tableLines lines) in it.
const (
	maxFuncLines = 100
	tableLines   = 5
	// reasonLines is the length above which a function must say why in
	// a comment of its own (doc or body) that starts "Over 60 lines".
	reasonLines = 60
)

// longFuncs lists functions allowed over maxFuncLines, each with the
// reason in a comment; a function that gets shorter must leave the list.
// It is empty: every function of the module is within the limit.
var longFuncs = map[string]bool{}

// funcLength is one function's length.
type funcLength struct {
	name   string // path:Name or path:Recv.Name
	lines  int
	reason bool // a comment of the function starts "Over 60 lines"
}

// funcLengths returns the length of every function of the module's
// non-test Go files, longest first.
func funcLengths(t *testing.T) []funcLength {
	root := moduleRoot(t)
	var out []funcLength
	err := eachLibraryFile(root, func(path string) error {
		fset := token.NewFileSet()
		f, err := parser.ParseFile(fset, path, nil, parser.ParseComments)
		if err != nil {
			return err
		}
		rel, _ := filepath.Rel(root, path)
		for _, d := range f.Decls {
			fd, ok := d.(*ast.FuncDecl)
			if !ok || fd.Body == nil {
				continue
			}
			name := fd.Name.Name
			if r := receiverName(fd.Recv); r != "" {
				name = r + "." + name
			}
			n := fset.Position(fd.End()).Line - fset.Position(fd.Pos()).Line + 1
			n -= tableSpan(fset, fd.Body)
			out = append(out, funcLength{name: filepath.ToSlash(rel) + ":" + name, lines: n, reason: hasReason(f, fd)})
		}
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	sort.Slice(out, func(i, j int) bool {
		if out[i].lines != out[j].lines {
			return out[i].lines > out[j].lines
		}
		return out[i].name < out[j].name
	})
	return out
}

// hasReason reports whether a comment in fd's doc or body starts "Over
// 60 lines" (the reason a function is longer than reasonLines).
func hasReason(f *ast.File, fd *ast.FuncDecl) bool {
	for _, g := range f.Comments {
		if g.Pos() < fd.Pos() && g != fd.Doc || g.Pos() > fd.End() {
			continue
		}
		for _, c := range g.List {
			if strings.Contains(c.Text, "Over 60 lines") {
				return true
			}
		}
	}
	return false
}

// tableSpan returns the lines taken by the outermost composite literals
// of more than tableLines lines in n.
func tableSpan(fset *token.FileSet, n ast.Node) int {
	total := 0
	ast.Inspect(n, func(x ast.Node) bool {
		cl, ok := x.(*ast.CompositeLit)
		if !ok {
			return true
		}
		if span := fset.Position(cl.End()).Line - fset.Position(cl.Pos()).Line + 1; span > tableLines {
			total += span
			return false
		}
		return true
	})
	return total
}

// TestFunctionLength fails on a function over maxFuncLines that is not
// in longFuncs, and on an entry of longFuncs that is no longer long. Run
// with -v to see the ten longest functions.
func TestFunctionLength(t *testing.T) {
	fl := funcLengths(t)
	for i := 0; i < 10 && i < len(fl); i++ {
		t.Log(fmt.Sprintf("%4d %s", fl[i].lines, fl[i].name))
	}
	for _, f := range fl {
		if f.lines > reasonLines && f.lines <= maxFuncLines && !f.reason {
			t.Errorf("%s is %d lines, over %d, with no comment that starts \"Over 60 lines\" and gives the reason: cut it into named steps or say why it reads better whole", f.name, f.lines, reasonLines)
		}
	}
	long := map[string]bool{}
	for _, f := range fl {
		if f.lines <= maxFuncLines {
			break
		}
		long[f.name] = true
		if !longFuncs[f.name] {
			t.Errorf("%s is %d lines, over %d: cut it into named steps", f.name, f.lines, maxFuncLines)
		}
	}
	for name := range longFuncs {
		if !long[name] {
			t.Errorf("longFuncs lists %s, which is no longer over %d lines: remove it", name, maxFuncLines)
		}
	}
}
