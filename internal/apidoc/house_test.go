package apidoc

import (
	"go/parser"
	"go/token"
	"os"
	"path/filepath"
	"sort"
	"strconv"
	"strings"
	"testing"
)

// house is the map of the module that DEVELOPERS.md draws ("The house"):
// for each room (a package path below the module, or a prefix ending in
// "/" for a family of packages), the rooms its non-test files may
// import. The most specific entry applies. An import that this map does
// not allow fails TestHouse: change the map, and DEVELOPERS.md with it,
// only when the design changes.
var house = map[string][]string{
	"internal/":       {},
	"internal/kalman": {"internal/errs"},
	"internal/lm":     {"internal/vec"},
	"internal/sym":    {"internal/poly"},
	// Test set-ups only: imported by tests, never by a library package.
	"internal/fixture": {"tf", "arma", "parse", "internal/filter"},
	"arma":             {"internal/"},
	"ccf":              {"internal/"},
	"prewhiten":        {"arma", "internal/"},
	"tf":               {"arma", "internal/"},
	"tf/fit":           {"tf", "arma", "ccf", "prewhiten", "internal/"},
	"tf/identify":      {"tf/fit", "tf", "arma", "ccf", "prewhiten", "internal/"},
	"tf/record":        {"tf", "internal/errs"},
	"tf/testsignal":    {"internal/"},
	"tf/control":       {"tf", "internal/"},
	"tf/statespace":    {"tf", "arma", "internal/"},
	"tf/monitor":       {"internal/"},
	"tf/fleet":         {"internal/"},
	"tf/predict":       {"tf", "arma", "internal/"},
	"tf/online":        {"tf", "arma", "internal/"},
	"parse":            {"tf", "internal/errs"},
	"examples/":        {"tf", "tf/", "arma", "ccf", "prewhiten", "parse", "examples/"},
	// The runs of missing samples, shared by tf/fit and tf/identify
	// (identify.Gaps is the public face the examples use).
	"internal/gaps": {},
}

// room returns the most specific entry of house for pkg, and whether
// there is one.
func room(pkg string) (string, bool) {
	best := ""
	for k := range house {
		if (k == pkg || strings.HasSuffix(k, "/") && strings.HasPrefix(pkg, k)) && len(k) > len(best) {
			best = k
		}
	}
	return best, best != ""
}

// allowed reports whether room r may import pkg.
func allowed(r, pkg string) bool {
	for _, a := range house[r] {
		if a == pkg || strings.HasSuffix(a, "/") && strings.HasPrefix(pkg, a) {
			return true
		}
	}
	return false
}

// TestHouse fails on an import between the module's packages that runs
// against the map in house (and DEVELOPERS.md), on a library file that
// imports the test set-ups of internal/fixture, and on a package that
// the map does not place.
func TestHouse(t *testing.T) {
	root := moduleRoot(t)
	modBytes, err := os.ReadFile(filepath.Join(root, "go.mod"))
	if err != nil {
		t.Fatal(err)
	}
	module := strings.TrimSpace(strings.TrimPrefix(strings.SplitN(string(modBytes), "\n", 2)[0], "module"))
	var problems []string
	err = eachLibraryFile(root, func(path string) error {
		rel, _ := filepath.Rel(root, filepath.Dir(path))
		pkg := filepath.ToSlash(rel)
		f, err := parser.ParseFile(token.NewFileSet(), path, nil, parser.ImportsOnly)
		if err != nil {
			return err
		}
		r, ok := room(pkg)
		if !ok {
			problems = append(problems, pkg+": not placed in the house (add it to the map in house_test.go and DEVELOPERS.md)")
			return nil
		}
		for _, im := range f.Imports {
			p, _ := strconv.Unquote(im.Path.Value)
			if !strings.HasPrefix(p, module+"/") {
				continue
			}
			p = strings.TrimPrefix(p, module+"/")
			if p == "internal/fixture" {
				problems = append(problems, filepath.ToSlash(filepath.Join(pkg, filepath.Base(path)))+" imports internal/fixture, which holds test set-ups for _test.go files only")
				continue
			}
			if !allowed(r, p) {
				problems = append(problems, filepath.ToSlash(filepath.Join(pkg, filepath.Base(path)))+" imports "+p+", against the house map (room "+r+")")
			}
		}
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	sort.Strings(problems)
	for _, p := range slicesCompact(problems) {
		t.Error(p)
	}
}

func slicesCompact(s []string) []string {
	var out []string
	for i, v := range s {
		if i == 0 || v != s[i-1] {
			out = append(out, v)
		}
	}
	return out
}

// The map's own rules: a room importing one it may not, and a room the
// map does not know, are both caught.
func TestHouseRules(t *testing.T) {
	for _, tc := range []struct {
		pkg, imp string
		want     bool
	}{
		{"tf", "arma", true},
		{"tf", "internal/filter", true},
		{"arma", "tf", false},
		{"ccf", "arma", false},
		{"parse", "arma", false},
		{"internal/poly", "internal/vec", false},
		{"internal/lm", "internal/vec", true},
		{"tf/record", "tf", true},
		{"examples/identify", "examples/internal/modelinfo", true},
		{"tf", "examples/greenhouse", false},
	} {
		r, ok := room(tc.pkg)
		if !ok || allowed(r, tc.imp) != tc.want {
			t.Errorf("%s importing %s: allowed %v, want %v", tc.pkg, tc.imp, ok && allowed(r, tc.imp), tc.want)
		}
	}
	if _, ok := room("newpkg"); ok {
		t.Error("a package the map does not name is placed")
	}
}

// eachLibraryFile calls fn with the path of every non-test Go file below
// root, outside testdata and the folders the go tool ignores (names
// starting with "." or "_"), and returns the first error.
func eachLibraryFile(root string, fn func(path string) error) error {
	return filepath.WalkDir(root, func(path string, d os.DirEntry, err error) error {
		if err != nil {
			return err
		}
		if d.IsDir() {
			if n := d.Name(); path != root && (n == "testdata" || strings.HasPrefix(n, ".") || strings.HasPrefix(n, "_")) {
				return filepath.SkipDir
			}
			return nil
		}
		if !strings.HasSuffix(path, ".go") || strings.HasSuffix(path, "_test.go") {
			return nil
		}
		return fn(path)
	})
}
