// Package testutil holds helpers for tests: reading reference files
// written by the scripts in testdata/, and comparisons with stated
// tolerances for series and for unordered sets of complex roots.
package testutil
