package parse

import (
	"strings"
	"testing"
)

// benchSpec is a typical two-input spec with ARMA(2, 1) noise, start
// values and a sample interval.
const benchSpec = "temp = 21.5 + (w0 + w1 B) / (1 - d1 B) B^4 burner + (v0 - v1 B) B^2 feed + ARMA(2, 1) where w0 ~ 0.5, d1 ~ 0.7 every 30 s"

func BenchmarkModel(b *testing.B) {
	b.ReportAllocs()
	b.SetBytes(int64(len(benchSpec)))
	for b.Loop() {
		if _, err := Model(benchSpec); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkString(b *testing.B) {
	m := MustModel(benchSpec)
	b.ReportAllocs()
	for b.Loop() {
		_ = m.String()
	}
}

// BenchmarkModelError measures a spec with a syntax error.
func BenchmarkModelError(b *testing.B) {
	bad := "temp = 21.5 + (w0 + w1 B) / (1 - d1 B) B^4 burner + (v0 - v1 B B^2 feed + ARMA(2, 1)"
	b.ReportAllocs()
	for b.Loop() {
		if _, err := Model(bad); err == nil {
			b.Fatal("no error")
		}
	}
}

// BenchmarkModelLong parses specs of growing length (inputs repeated up
// to the limit, then comment padding) to show linear cost.
func BenchmarkModelLong(b *testing.B) {
	benchLengths(b, func(n int) string {
		s := "y = w0 x"
		for len(s) < n {
			s += " # padding to grow the text linearly\n"
		}
		return s
	}, false)
}

// benchLengths runs one sub-benchmark of Model for each text length n in
// 1000, 4000 (near MaxTokens for the hostile texts), 10000 and 60000
// (near MaxSpecLen), on the spec mk(n) built outside the timing, and
// fails when Model's error does not match wantErr, or, for a spec over
// MaxTokens, when Model does not refuse it.
func benchLengths(b *testing.B, mk func(n int) string, wantErr bool) {
	for _, n := range []int{1000, 4000, 10000, 60000} {
		s := mk(n)
		if toks, err := lexSpec(s); err != nil || len(toks)-1 > MaxTokens {
			wantErr = true
		}
		b.Run(itoa(n), func(b *testing.B) {
			b.ReportAllocs()
			b.SetBytes(int64(len(s)))
			for b.Loop() {
				if _, err := Model(s); (err != nil) != wantErr {
					b.Fatalf("spec of %d bytes: error %v, want an error: %v", len(s), err, wantErr)
				}
			}
		})
	}
}

func itoa(n int) string {
	if n >= 1000 {
		return itoa(n/1000) + "k"
	}
	s := ""
	for {
		s = string(rune('0'+n%10)) + s
		n /= 10
		if n == 0 {
			return s
		}
	}
}

// BenchmarkModelHostile parses long products of constant factors, the
// longest work per byte a spec can ask for, to show linear cost up to
// MaxTokens (4000 bytes are 4006 tokens) and the early refusal above it.
func BenchmarkModelHostile(b *testing.B) {
	benchLengths(b, func(n int) string {
		return "y = w / (" + strings.Repeat("(1)", n/3) + ") x"
	}, false)
}

// BenchmarkModelNested parses a text at MaxTokens of factors nested
// MaxNesting deep, the costliest per token found (about 3.8 KB).
func BenchmarkModelNested(b *testing.B) {
	s := "y = " + strings.Repeat("((((((((1))))))))", 240) + " x"
	if toks, err := lexSpec(s); err != nil || len(toks)-1 > MaxTokens || len(toks)-1 < MaxTokens-20 {
		b.Fatalf("spec of %d tokens (%v), want just under %d", len(toks)-1, err, MaxTokens)
	}
	b.ReportAllocs()
	for b.Loop() {
		if _, err := Model(s); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkGrammar measures the participle parser alone on the tokens
// of benchSpec (Model is this plus lexing and building the model).
func BenchmarkGrammar(b *testing.B) {
	toks, err := lexSpec(benchSpec)
	if err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	for b.Loop() {
		if _, err := grammarParse(toks); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkModelHostileError parses long specs with an error at the end.
func BenchmarkModelHostileError(b *testing.B) {
	benchLengths(b, func(n int) string {
		return "y = " + strings.Repeat("w (1 - d B) x + ", n/16) + ")"
	}, true)
}
