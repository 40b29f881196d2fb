// Package apidoc holds no code: its test enforces the documentation rules of the module.
//
// The test walks every package of the module outside internal/ directories and fails when
//
//   - an exported function, an exported method of an exported type, an exported type, or an
//     exported constant or variable (in a group without a group comment) has no doc comment;
//   - a package has no doc.go file, or its doc.go does not hold the package comment, or
//     holds declarations besides it;
//   - a library package (not a main package) has no runnable Example function with a
//     non-empty "// Output:" comment.
//
// Main packages (the programs under examples/) are checked for doc comments and doc.go
// only. Test files are not checked for doc comments. Run it with
//
//	go test ./internal/apidoc
package apidoc
