package apidoc

import (
	"go/ast"
	"sort"
	"strings"
	"testing"
)

// ownErrors lists the exported error types of the library packages that
// are not aliases of the shared shapes (internal/errs), each because it
// carries facts no shared shape has; every one must also unwrap to a
// kind (an Unwrap method). A new error type must either be an alias of a
// shared shape or be added here with its reason.
var ownErrors = map[string]string{
	"tf.CoefError":            "which polynomial, which power of B, the value",
	"tf.DelayError":           "the dead time",
	"tf.GainError":            "delta(1) and omega(1) of a pole at z = 1",
	"tf.UnstableError":        "the largest pole magnitude",
	"tf.SimError":             "the step and value where a simulation stopped being finite",
	"fit.InterruptedError":    "the iteration a cancelled fit reached, and the context's error",
	"fit.StageError":          "the stage of fit.Check, Estimate.Forecast or identify.Candidates that failed, and hints",
	"ccf.NoResponseError":     "the largest |t| and its lag",
	"prewhiten.NotWhiteError": "the Ljung-Box figures of the prewhitened input",
	"record.LineError":        "file, line and column of a record file",
	"record.GapError":         "the breaks of the time column",
	"parse.Error":             "the position in the spec text and a caret snippet",
	"parse.ErrorList":         "several positioned errors of one spec",
}

// TestSharedShapes fails when a library package adds an error type that
// is neither an alias of a shared shape nor listed in ownErrors with a
// reason, an own error type without Unwrap (so errors.Is finds no kind),
// a settings struct not named ...Settings or without a Validate method,
// or a parameter list of its own (a struct with Name and SE fields)
// instead of the shared Param (internal/est).
func TestSharedShapes(t *testing.T) {
	root := moduleRoot(t)
	var problems []string
	seen := map[string]bool{}
	for _, p := range walkPackages(t, root) {
		if strings.HasPrefix(p.rel, "examples") {
			continue // programs: their own types are not library API
		}
		pkg := p.files[0].Name.Name
		unwraps := map[string]bool{}
		validates := map[string]bool{}
		for _, f := range p.files {
			for _, d := range f.Decls {
				fd, ok := d.(*ast.FuncDecl)
				if !ok || fd.Recv == nil {
					continue
				}
				switch fd.Name.Name {
				case "Unwrap":
					unwraps[receiverName(fd.Recv)] = true
				case "Validate":
					validates[receiverName(fd.Recv)] = true
				}
			}
		}
		for _, f := range p.files {
			for _, d := range f.Decls {
				gd, ok := d.(*ast.GenDecl)
				if !ok {
					continue
				}
				for _, s := range gd.Specs {
					ts, ok := s.(*ast.TypeSpec)
					if !ok || !ts.Name.IsExported() {
						continue
					}
					name := pkg + "." + ts.Name.Name
					pos := p.fset.Position(ts.Pos())
					where := p.rel + "/" + filepathBase(pos.Filename) + ": " + name
					alias := ts.Assign.IsValid()
					switch {
					case strings.HasSuffix(ts.Name.Name, "Error") || ts.Name.Name == "ErrorList":
						if alias {
							if sel, ok := ts.Type.(*ast.SelectorExpr); !ok || identName(sel.X) != "errs" {
								problems = append(problems, where+" is an alias of something other than a shared shape of internal/errs")
							}
							continue
						}
						seen[name] = true
						if _, ok := ownErrors[name]; !ok {
							problems = append(problems, where+" is an error type of its own: make it an alias of a shared shape (internal/errs), or list it in ownErrors with the facts it carries")
						} else if !unwraps[ts.Name.Name] && name != "parse.ErrorList" {
							problems = append(problems, where+" has no Unwrap method, so errors.Is finds no kind")
						}
					case strings.HasSuffix(ts.Name.Name, "Options"):
						problems = append(problems, where+": settings structs are named ...Settings")
					case strings.HasSuffix(ts.Name.Name, "Settings") && !alias:
						if !validates[ts.Name.Name] {
							problems = append(problems, where+" has no Validate method (the settings rule: each settings struct checks itself)")
						}
					}
					if st, ok := ts.Type.(*ast.StructType); ok && !alias && hasFields(st, "SE") && (hasFields(st, "Name") || hasFields(st, "Names")) {
						problems = append(problems, where+" is a parameter list of its own: use the shared Param (internal/est)")
					}
				}
			}
		}
	}
	for name := range ownErrors {
		if !seen[name] {
			problems = append(problems, "ownErrors lists "+name+", which no longer exists: remove it from the list")
		}
	}
	sort.Strings(problems)
	for _, pr := range problems {
		t.Error(pr)
	}
}

func identName(e ast.Expr) string {
	if id, ok := e.(*ast.Ident); ok {
		return id.Name
	}
	return ""
}

func hasFields(st *ast.StructType, name string) bool {
	for _, f := range st.Fields.List {
		for _, n := range f.Names {
			if n.Name == name {
				return true
			}
		}
	}
	return false
}

func filepathBase(p string) string {
	if i := strings.LastIndexByte(p, '/'); i >= 0 {
		return p[i+1:]
	}
	return p
}
