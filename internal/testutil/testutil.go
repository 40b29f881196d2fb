package testutil

import (
	"encoding/json"
	"image"
	"image/png"
	"math"
	"math/cmplx"
	"os"
	"path/filepath"
	"runtime"
	"strings"
	"testing"
)

// Root returns the repository root, found from this file's location, so
// that tests in any package can open testdata/ files.
func Root() string {
	_, file, _, _ := runtime.Caller(0)
	return filepath.Join(filepath.Dir(file), "..", "..")
}

// ReadJSON decodes the JSON file at path (relative to the repository
// root) into v, failing the test on error.
func ReadJSON(t testing.TB, path string, v any) {
	t.Helper()
	b, err := os.ReadFile(filepath.Join(Root(), path))
	if err != nil {
		t.Fatalf("reading reference file: %v", err)
	}
	if err := json.Unmarshal(b, v); err != nil {
		t.Fatalf("decoding %s: %v", path, err)
	}
}

// RunningRelErr returns the largest |got_k - want_k| / max_{j<=k} |want_j|
// (with the denominator floored at tiny to avoid division by zero), the
// error measure for recursively computed series, whose rounding scales
// with the largest value produced so far. Lengths must agree; a length
// mismatch returns +Inf.
func RunningRelErr(got, want []float64) float64 {
	if len(got) != len(want) {
		return math.Inf(1)
	}
	const tiny = 1e-300
	scale, worst := tiny, 0.0
	for k := range want {
		scale = math.Max(scale, math.Abs(want[k]))
		e := math.Abs(got[k]-want[k]) / scale
		if math.IsNaN(e) {
			return math.Inf(1)
		}
		worst = math.Max(worst, e)
	}
	return worst
}

// RootsErr returns the largest distance from each wanted root to a
// distinct got root, matching greedily by nearest distance, relative to
// max(1, |want|); +Inf when the counts differ.
func RootsErr(got, want []complex128) float64 {
	if len(got) != len(want) {
		return math.Inf(1)
	}
	used := make([]bool, len(got))
	worst := 0.0
	for _, w := range want {
		best, bi := math.Inf(1), -1
		for i, g := range got {
			if !used[i] {
				if d := cmplx.Abs(g - w); d < best {
					best, bi = d, i
				}
			}
		}
		used[bi] = true
		worst = math.Max(worst, best/math.Max(1, cmplx.Abs(w)))
	}
	return worst
}

// Complex zips real and imaginary parts.
func Complex(re, im []float64) []complex128 {
	c := make([]complex128, len(re))
	for i := range re {
		c[i] = complex(re[i], im[i])
	}
	return c
}

// Variance returns the variance of x with divisor len(x) (the population
// variance, numpy.var's default), the scale the simulation tests compare
// signal and noise with.
func Variance(x []float64) float64 {
	m := 0.0
	for _, v := range x {
		m += v
	}
	m /= float64(len(x))
	s := 0.0
	for _, v := range x {
		s += (v - m) * (v - m)
	}
	return s / float64(len(x))
}

// CheckWords reports, naming the case, each of want that msg lacks and
// each of not that msg holds: the key-word check of error messages.
func CheckWords(t testing.TB, name, msg string, want, not []string) {
	t.Helper()
	for _, w := range want {
		if !strings.Contains(msg, w) {
			t.Errorf("%s: %q lacks %q", name, msg, w)
		}
	}
	for _, w := range not {
		if strings.Contains(msg, w) {
			t.Errorf("%s: %q holds %q", name, msg, w)
		}
	}
}

// Panics reports whether f panics: the check of a panic documented for
// a programmer error (a negative length, mismatched slices).
func Panics(f func()) (panicked bool) {
	defer func() { panicked = recover() != nil }()
	f()
	return false
}

// WriteFile writes body to the file name in a fresh temporary directory
// of the test and returns its path, failing the test on error.
func WriteFile(t testing.TB, name, body string) string {
	t.Helper()
	path := filepath.Join(t.TempDir(), name)
	if err := os.WriteFile(path, []byte(body), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

// ReadPNG decodes the PNG picture at path, failing t (with the path)
// when it cannot be opened or decoded.
func ReadPNG(t testing.TB, path string) image.Image {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	img, err := png.Decode(f)
	if err != nil {
		t.Fatalf("%s: %v", path, err)
	}
	return img
}
