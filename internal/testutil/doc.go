// Package testutil holds helpers for tests: reading reference files
// written by the scripts in testdata/, comparisons with stated
// tolerances for series and for unordered sets of complex roots, the
// population variance of simulated series, the key-word check of error
// messages (CheckWords) and the fuzz-byte decoder the fuzz targets share
// (HostileSeries).
package testutil
