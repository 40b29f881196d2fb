package main

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math"
	"math/cmplx"
	"slices"
	"strconv"
	"strings"
	"unicode/utf8"

	"github.com/backshift/backshift/examples/internal/modelinfo"
	"github.com/backshift/backshift/examples/internal/suggest"
	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf"
)

// Config is a site's model library. It is written out here, with a
// parse.Spec as a field of the program's own struct, to show the pattern;
// the other examples share the same format as modelinfo.Library
// (TestSameAsLibrary keeps the two in step).
type Config struct {
	// Site names the plant.
	Site string `json:"site"`
	// Models lists the models, each with a unique name.
	Models []Entry `json:"models"`
}

// Entry is one model of the library.
type Entry struct {
	Name  string     `json:"name"`
	Notes string     `json:"notes,omitempty"`
	Spec  parse.Spec `json:"spec"`
	// Validity is the record of the data the model was fitted to, as
	// examples/identify -save writes it; nil for a model written by hand
	// or saved before the record existed (its range of validity is then
	// unknown).
	Validity *modelinfo.Validity `json:"validity,omitempty"`
}

// Failed reports whether the model was saved with a failed verdict.
func (e Entry) Failed() bool {
	return e.Validity != nil && e.Validity.Verdict == modelinfo.VerdictFailed
}

// Problem is one thing wrong with a config file, at a 1-based line and
// byte column of the file (after a UTF-8 byte order mark, which is
// skipped).
type Problem struct {
	File         string
	Line, Column int
	Msg          string
	// Text is the file's line holding the problem (without its line
	// break; a window of it around the column, marked "...", when the
	// line is long), for a caret display.
	Text  string
	caret int // byte index of the caret in Text
}

// Error prints file:line:col: message, the offending line and a caret.
func (p *Problem) Error() string {
	var b strings.Builder
	fmt.Fprintf(&b, "%s:%d:%d: %s", p.File, p.Line, p.Column, p.Msg)
	if p.Text != "" {
		text := printable(p.Text)
		pad := utf8.RuneCountInString(text[:min(printableLen(p.Text, p.caret), len(text))])
		fmt.Fprintf(&b, "\n    %s\n    %s^", text, strings.Repeat(" ", pad))
	}
	return b.String()
}

// printable returns line with tabs as one blank and each byte that is
// not UTF-8, or a control character, as U+FFFD, so that every character
// takes one column.
func printable(line string) string {
	var b strings.Builder
	for i := 0; i < len(line); {
		r, n := utf8.DecodeRuneInString(line[i:])
		switch {
		case r == '\t':
			b.WriteByte(' ')
		case r < 0x20 || r == 0x7f || (r == utf8.RuneError && n == 1):
			b.WriteRune(utf8.RuneError)
		default:
			b.WriteString(line[i : i+n])
		}
		i += n
	}
	return b.String()
}

// printableLen returns the length in printable(line) of the first n
// bytes of line.
func printableLen(line string, n int) int {
	n = max(0, min(n, len(line)))
	return len(printable(line[:n]))
}

// Problems is every problem found in one file, in file order.
type Problems []*Problem

// Error prints every problem, one after the other.
func (ps Problems) Error() string {
	s := make([]string, len(ps))
	for i, p := range ps {
		s[i] = p.Error()
	}
	return strings.Join(s, "\n")
}

// Unwrap returns the problems for errors.As.
func (ps Problems) Unwrap() []error {
	out := make([]error, len(ps))
	for i, p := range ps {
		out[i] = p
	}
	return out
}

// bom is the UTF-8 byte order mark some editors write at the start of a
// file.
var bom = []byte{0xef, 0xbb, 0xbf}

// example is a one-model config, quoted in messages.
const example = `{"site": "...", "models": [{"name": "...", "spec": "y = w0 B x + a; every 1 min"}]}`

// Load decodes and validates a config file; file names it in messages.
// It returns Problems when anything is wrong, each at the key or value it
// is about: an empty file; JSON syntax (the first such problem); a key
// that is unknown, written in another case than the one expected, or
// given twice in one object (keys are matched exactly, so that no key of
// the file is silently ignored or overridden); a value of the wrong type;
// a missing or repeated model name; a missing spec, a spec that does not
// parse (each spec error positioned in the file) or one without a sample
// interval or with a noise model that tf/predict refuses (an MA zero or
// AR root on or outside the unit circle, each named); and a validity
// record that is incomplete or disagrees with its spec. A UTF-8 byte order mark at the start is skipped.
func Load(file string, raw []byte) (*Config, error) {
	raw = bytes.TrimPrefix(raw, bom)
	pos := newPositions(file, raw)
	if len(bytes.TrimSpace(raw)) == 0 {
		p := pos.at(0, "the file is empty; a config is a JSON object listing models, such as "+example)
		p.Text = ""
		return nil, Problems{p}
	}
	root, err := walk(raw)
	if err != nil {
		return nil, Problems{pos.fromJSON(err)}
	}
	l := loader{pos: pos}
	l.config(root)
	if len(l.probs) > 0 {
		slices.SortStableFunc(l.probs, func(a, b *Problem) int {
			if a.Line != b.Line {
				return a.Line - b.Line
			}
			return a.Column - b.Column
		})
		if len(l.probs) > maxProblems {
			more := l.probs[maxProblems]
			more.Msg = "more problems from here on are not listed; fix the ones above first"
			l.probs = l.probs[:maxProblems+1]
		}
		return nil, l.probs
	}
	// Every key and type is checked: decode into the typed config, where
	// encoding/json hands each spec to parse.Spec.UnmarshalText.
	var c Config
	if err := json.Unmarshal(raw, &c); err != nil {
		return nil, Problems{pos.at(0, "JSON: "+err.Error())}
	}
	return &c, nil
}

// loader checks the walked file and collects the problems.
type loader struct {
	pos   *positions
	probs Problems
	// guessed holds, for each object, the known keys that an unknown key
	// of it was taken for (a near miss or another case), so that the
	// missing key is not reported a second time.
	guessed map[*jval]map[string]bool
}

func (l *loader) fail(off int, format string, args ...any) {
	if len(l.probs) > maxProblems {
		return
	}
	l.probs = append(l.probs, l.pos.at(off, fmt.Sprintf(format, args...)))
}

// maxProblems caps the problems reported for one file.
const maxProblems = 50

// keys checks the keys of object v against the known ones: each
// written exactly, at most once. It returns the members by key.
func (l *loader) keys(v *jval, what string, known ...string) map[string]*jmember {
	out := map[string]*jmember{}
	for i := range v.members {
		m := &v.members[i]
		if !slices.Contains(known, m.key) {
			msg, guess := unknownKey(m.key, what, known)
			l.fail(m.start, "%s", msg)
			if guess != "" {
				if l.guessed == nil {
					l.guessed = map[*jval]map[string]bool{}
				}
				if l.guessed[v] == nil {
					l.guessed[v] = map[string]bool{}
				}
				l.guessed[v][guess] = true
			}
			continue
		}
		if _, dup := out[m.key]; dup {
			l.fail(m.start, "key %q appears twice in %s; the second would silently replace the first: keep one", m.key, what)
			continue
		}
		out[m.key] = m
	}
	return out
}

// unknownKey words the problem of a key that is not one of known: a key
// in another case, a near miss, or one unknown. It returns the known key
// it was likely meant as, if any.
func unknownKey(key, what string, known []string) (string, string) {
	for _, k := range known {
		if strings.EqualFold(k, key) {
			return fmt.Sprintf("key %q in %s is written in another case: write %q (keys are matched exactly, so that a misspelt key is never silently ignored)", key, what, k), k
		}
	}
	msg := fmt.Sprintf("unknown key %q in %s (known: %s)", clip(key), what, strings.Join(known, ", "))
	for _, k := range known {
		if suggest.Near(k, key) {
			return msg + fmt.Sprintf("; did you mean %q?", k), k
		}
	}
	return msg, ""
}

// missing reports a missing key of object v, unless an unknown key of v
// was already taken for it.
func (l *loader) missing(v *jval, key string, format string, args ...any) {
	if !l.guessed[v][key] {
		l.fail(v.start, format, args...)
	}
}

// clip shortens a long text for a message.
func clip(s string) string {
	if len(s) <= 40 {
		return s
	}
	i := 32
	for i > 0 && !utf8.RuneStart(s[i]) {
		i--
	}
	return s[:i] + "..."
}

// want checks that the value of a key has the kind k.
func (l *loader) want(m *jmember, what string, k jkind, form string) bool {
	if m.val.kind == k {
		return true
	}
	l.fail(m.val.start, "%q of %s holds %s; it must be %s", m.key, what, m.val.kind, form)
	return false
}

func (l *loader) config(root *jval) {
	if root.kind != jObject {
		l.fail(root.start, "the file holds %s, not a config object; a config is a JSON object such as %s", root.kind, example)
		return
	}
	ks := l.keys(root, "the config", "site", "models")
	if m := ks["site"]; m != nil {
		l.want(m, "the config", jString, `a string naming the plant, as in "site": "Greenhouse 3"`)
	}
	mm := ks["models"]
	switch {
	case mm == nil:
		l.missing(root, "models", `the config has no "models" array; a config is a JSON object such as %s`, example)
		return
	case !l.want(mm, "the config", jArray, `an array of models, as in "models": [{"name": "...", "spec": "..."}]`):
		return
	case len(mm.val.elems) == 0:
		l.fail(mm.val.start, `the "models" array is empty; list at least one model, as in [{"name": "...", "spec": "y = w0 B x + a; every 1 min"}]`)
		return
	}
	names := map[string]int{}
	for i, e := range mm.val.elems {
		l.model(i, e, names)
	}
}

// model checks one model entry.
func (l *loader) model(i int, e *jval, names map[string]int) {
	what := fmt.Sprintf("model %d", i+1)
	if e.kind != jObject {
		l.fail(e.start, `%s is %s, not an object such as {"name": "...", "spec": "y = w0 B x + a; every 1 min"}`, what, e.kind)
		return
	}
	// Name the model in messages as soon as it has a usable name.
	for j := range e.members {
		if m := &e.members[j]; m.key == "name" && m.val.kind == jString && m.val.str != "" {
			what = fmt.Sprintf("model %d (%q)", i+1, m.val.str)
			break
		}
	}
	ks := l.keys(e, what, "name", "notes", "spec", "validity")
	if m := ks["name"]; m == nil {
		l.missing(e, "name", `%s has no "name"; give each model a unique name, as in "name": "air temperature"`, what)
	} else if l.want(m, what, jString, `a string, as in "name": "air temperature"`) {
		switch n := m.val.str; {
		case strings.TrimSpace(n) == "":
			l.fail(m.val.start, `%s has an empty "name"; give each model a unique name`, what)
		default:
			if j, dup := names[n]; dup {
				l.fail(m.val.start, "model name %q is used twice (models %d and %d); names must be unique", n, j+1, i+1)
			} else {
				names[n] = i
			}
		}
	}
	// The optional keys may hold null, read as absent.
	if m := ks["notes"]; m != nil && m.val.kind != jNull {
		l.want(m, what, jString, "a string")
	}
	var model *tf.Model
	if m := ks["spec"]; m == nil {
		l.missing(e, "spec", `%s has no "spec"; add one, as in "spec": "y = w0 B x + a; every 1 min"`, what)
	} else if l.want(m, what, jString, `a string holding a model spec, as in "spec": "y = w0 B x + a; every 1 min"`) {
		model = l.spec(m.val, what)
	}
	if m := ks["validity"]; m != nil && m.val.kind != jNull && l.want(m, what, jObject, `an object as examples/identify -save writes it: {"samples": ..., "ranges": {...}, "verdict": "passed"}`) {
		l.validity(m.val, what, model)
	}
}

// spec parses a spec string, positioning each error in the file, and
// returns the model (nil when it does not parse).
func (l *loader) spec(v *jval, what string) *tf.Model {
	if strings.TrimSpace(v.str) == "" {
		l.fail(v.start, `%s has an empty "spec"; write the model, as in "y = w0 B x + a; every 1 min"`, what)
		return nil
	}
	m, err := parse.Model(v.str)
	if err != nil {
		var list parse.ErrorList
		if !errors.As(err, &list) {
			l.fail(v.start, "%s: %v", what, err)
			return nil
		}
		for _, pe := range list {
			l.fail(v.offs[max(0, min(pe.Pos.Offset, len(v.offs)-1))], "spec of %s: %s", what, pe.Msg)
		}
		return nil
	}
	if m.Interval.Value == 0 {
		l.fail(v.offs[len(v.offs)-1], `%s has no sample interval; end its spec with "every 1 min" (or s, h, d)`, what)
	}
	l.noise(v, what, m)
	return &m
}

// noise refuses a noise model that tf/predict (and so examples/monitor)
// refuses: an MA with a zero on or outside the unit circle (not
// invertible: the one-step errors would not forget their start-up
// values) or an AR with a root there (not stationary). It names each such
// root, and for an MA the fix: the root's reciprocal gives the same
// autocorrelations (Box, Jenkins & Reinsel, Time Series Analysis, the
// invertibility of MA models; from memory), so a factor (1 - z B) with |z| > 1 becomes (1 - B/z)
// with the innovation SD times |z|.
func (l *loader) noise(v *jval, what string, m tf.Model) {
	if m.Noise == nil {
		return
	}
	check := func(c []float64, part, why string) {
		r, err := tf.NewRational([]float64{1}, c, 0)
		if err != nil || r.Stable() {
			return
		}
		var out []string
		for _, z := range r.Poles() {
			if cmplx.Abs(z) >= 1-1e-12 {
				out = append(out, fmt.Sprintf("z = %s (|z| = %.4g)", rootText(z), cmplx.Abs(z)))
			}
		}
		l.fail(v.start, "spec of %s: the noise %s has a root on or outside the unit circle, at %s: %s; examples/monitor and tf/predict refuse this model", what, part, strings.Join(out, ", "), why)
	}
	check(m.Noise.MA.Coeffs(), "MA", "the noise is not invertible, so the one-step prediction errors would not forget their start-up values; write each factor (1 - z B) with |z| > 1 as (1 - B/z), which has the same autocorrelations, and multiply the innovation SD by |z|")
	check(m.Noise.AR.Coeffs(), "AR", "the noise is not stationary; write differencing as the output's D(B), as in \"(1 - B) y = ...\", instead")
}

// rootText writes a z-plane root: a real one as a number, a complex one
// as a + bi.
func rootText(z complex128) string {
	if math.Abs(imag(z)) <= 1e-12*cmplx.Abs(z) {
		return strconv.FormatFloat(real(z), 'g', 4, 64)
	}
	return fmt.Sprintf("%.4g%+.4gi", real(z), imag(z))
}

// validity checks the record of the data a model was fitted to.
func (l *loader) validity(v *jval, of string, model *tf.Model) {
	what := "the validity of " + of
	ks := l.keys(v, what, "samples", "interval", "start", "ranges", "verdict", "failures", "forced", "cautions", "sigma")
	if m := ks["samples"]; m == nil {
		l.missing(v, "samples", `%s has no "samples" (the number of samples of the record)`, what)
	} else if l.want(m, what, jNumber, "a whole number of samples") {
		if n, err := strconv.ParseInt(string(m.val.num), 10, 64); err != nil || n < 1 {
			l.fail(m.val.start, `"samples" of %s is %s; it must be a whole number of samples, at least 1, written without a decimal point or exponent`, what, m.val.num)
		}
	}
	if m := ks["interval"]; m != nil && l.want(m, what, jString, `a string such as "1 min"`) && model != nil {
		l.interval(m.val, what, model.Interval)
	}
	if m := ks["start"]; m != nil && l.want(m, what, jString, `the time of the record's first sample, such as "2026-03-28T12:00"`) {
		if _, err := tf.ParseEventTime(m.val.str); err != nil {
			l.fail(m.val.start, `"start" of %s is %q; write the time of the record's first sample as an event's time is written, such as "2026-03-28T12:00" or "2026-03-28T12:00+01:00"`, what, m.val.str)
		}
	}
	verdict := ""
	if m := ks["verdict"]; m == nil {
		l.missing(v, "verdict", `%s has no "verdict"; it is "passed" or "failed"`, what)
	} else if l.want(m, what, jString, `"passed" or "failed"`) {
		verdict = m.val.str
		if verdict != modelinfo.VerdictPassed && verdict != modelinfo.VerdictFailed {
			l.fail(m.val.start, `"verdict" of %s is %q; it must be "passed" or "failed"`, what, verdict)
		}
	}
	if m := ks["failures"]; m != nil && l.want(m, what, jArray, "an array of strings") {
		for _, f := range m.val.elems {
			if f.kind != jString {
				l.fail(f.start, `"failures" of %s holds %s; each failure is a string`, what, f.kind)
			}
		}
		if verdict == modelinfo.VerdictPassed && len(m.val.elems) > 0 {
			l.fail(m.val.start, `%s says "passed" but lists failures; the record contradicts itself: identify the model again`, what)
		}
	}
	if m := ks["forced"]; m != nil {
		l.want(m, what, jBool, "true or false")
	}
	l.sigma(ks["sigma"], what)
	if m := ks["cautions"]; m != nil && l.want(m, what, jArray, "an array of strings") {
		for _, c := range m.val.elems {
			if c.kind != jString {
				l.fail(c.start, `"cautions" of %s holds %s; each caution is a string`, what, c.kind)
			}
		}
	}
	m := ks["ranges"]
	if m == nil {
		l.missing(v, "ranges", `%s has no "ranges" (the smallest and largest value of each series of the record)`, what)
		return
	}
	if l.want(m, what, jObject, `an object of [smallest, largest] pairs by series, as in {"temp": [14.7, 22.3]}`) {
		l.ranges(m.val, of, model)
	}
}

// sigma checks the "sigma" of a validity record (m nil when absent): the
// noise SD to expect on clean data, a positive finite number.
func (l *loader) sigma(m *jmember, what string) {
	if m == nil || !l.want(m, what, jNumber, "the noise SD to expect on clean data, a positive number in the output's units") {
		return
	}
	if x, err := strconv.ParseFloat(string(m.val.num), 64); err != nil || !(x > 0) || math.IsInf(x, 0) {
		l.fail(m.val.start, `"sigma" of %s is %s; it is the standard deviation of the model's one-step prediction errors on clean data, a positive finite number in the output's units (drop the key if it is not known: examples/monitor then wants -sigma)`, what, m.val.num)
	}
}

// ranges checks the "ranges" object obj of a validity record: each series
// once, a series of the model's spec, with a pair of finite numbers
// [smallest, largest] in that order.
func (l *loader) ranges(obj *jval, of string, model *tf.Model) {
	series := map[string]bool{}
	var list []string
	if model != nil {
		series[model.Output] = true
		list = append(list, model.Output)
		for _, in := range model.Inputs {
			series[in.Series] = true
			list = append(list, in.Series)
		}
	}
	seen := map[string]bool{}
	for _, r := range obj.members {
		if seen[r.key] {
			l.fail(r.start, `series %q appears twice in the ranges of %s; keep one`, r.key, of)
			continue
		}
		seen[r.key] = true
		if model != nil && !series[r.key] {
			l.fail(r.start, `the ranges of %s name %q, which is not a series of its spec (%s)`, of, r.key, strings.Join(list, ", "))
			continue
		}
		ok := r.val.kind == jArray && len(r.val.elems) == 2
		var lh [2]float64
		for k := 0; ok && k < 2; k++ {
			e := r.val.elems[k]
			var err error
			if e.kind == jNumber {
				lh[k], err = strconv.ParseFloat(string(e.num), 64)
			}
			ok = e.kind == jNumber && err == nil && !math.IsInf(lh[k], 0)
		}
		switch {
		case !ok:
			l.fail(r.val.start, `the range of %q in %s must be a pair of finite numbers [smallest, largest]`, r.key, of)
		case lh[0] > lh[1]:
			l.fail(r.val.start, `the range of %q in %s is [%s, %s]: the smallest value comes first`, r.key, of, r.val.elems[0].num, r.val.elems[1].num)
		}
	}
}

// interval checks that a record's interval text agrees with the spec's.
func (l *loader) interval(v *jval, what string, spec tf.Interval) {
	if spec.Value > 0 && v.str == spec.String() {
		return // written as the spec writes it (calendar units included)
	}
	got, ok := seconds(v.str)
	if !ok {
		l.fail(v.start, `"interval" of %s is %q; write a number and a unit s, min, h or d (or the spec's own interval, such as "1 mo"), as in "1 min"`, what, v.str)
		return
	}
	if want, _ := seconds(spec.String()); spec.Value > 0 && math.Abs(got-want) > 1e-9*want {
		l.fail(v.start, `"interval" of %s is %q but its spec says every %s; the model was fitted at another interval: identify it again at %s, or fix the spec`,
			what, v.str, spec, spec)
	}
}

// seconds reads an interval written "30 s", "1 min", "2 h" or "1 d".
func seconds(s string) (float64, bool) {
	f := strings.Fields(s)
	if len(f) != 2 {
		return 0, false
	}
	v, err := strconv.ParseFloat(f[0], 64)
	unit := map[string]float64{"s": 1, "min": 60, "h": 3600, "d": 86400}[f[1]]
	if err != nil || !(v > 0) || math.IsInf(v, 0) || unit == 0 {
		return 0, false
	}
	return v * unit, true
}

// positions turns file offsets into lines and columns.
type positions struct {
	file  string
	raw   []byte
	lines []int // offset of the start of each line
}

func newPositions(file string, raw []byte) *positions {
	p := &positions{file: file, raw: raw, lines: []int{0}}
	for i, c := range raw {
		if c == '\n' {
			p.lines = append(p.lines, i+1)
		}
	}
	return p
}

func (p *positions) at(off int, msg string) *Problem {
	off = max(0, min(off, len(p.raw)))
	l, _ := slices.BinarySearch(p.lines, off+1)
	l-- // the last line starting at or before off
	endLine := len(p.raw)
	if l+1 < len(p.lines) {
		endLine = p.lines[l+1] - 1
	}
	col := off - p.lines[l]
	// Cut the window from the bytes before copying: a minified file is
	// one long line, and each problem must cost little.
	lo, hi := p.lines[l], endLine
	if hi-lo > 160 {
		lo, hi = max(lo, off-64), min(hi, off+64)
	}
	text, caret := window(strings.TrimRight(string(p.raw[lo:hi]), "\r"), off-lo)
	if lo > p.lines[l] && !strings.HasPrefix(text, "...") {
		text, caret = "..."+text, caret+3
	}
	if hi < endLine && !strings.HasSuffix(text, "...") {
		text += "..."
	}
	return &Problem{File: p.file, Line: l + 1, Column: col + 1, Msg: msg, Text: text, caret: caret}
}

// window returns the part of line to print and the byte index of the
// caret in it: the whole line when it is at most 160 bytes, else about
// 60 bytes before and 60 after col, cut at character boundaries and
// marked with "...".
func window(line string, col int) (string, int) {
	if len(line) <= 160 {
		return line, col
	}
	col = min(max(col, 0), len(line))
	lo, hi := max(col-60, 0), min(col+60, len(line))
	for lo > 0 && !utf8.RuneStart(line[lo]) {
		lo--
	}
	for hi < len(line) && !utf8.RuneStart(line[hi]) {
		hi++
	}
	out := line[lo:hi]
	if lo > 0 {
		out, col = "..."+out, col-lo+3
	}
	if hi < len(line) {
		out += "..."
	}
	return out, col
}

// fromJSON positions an error of the JSON reader.
func (p *positions) fromJSON(err error) *Problem {
	var se *json.SyntaxError
	var de *errDepth
	var te *errTrailing
	switch {
	case errors.As(err, &se):
		off := p.syntaxOffset(se)
		return p.at(off, "JSON: "+se.Error()+jsonHint(p.raw, off))
	case errors.As(err, &de):
		return p.at(de.off, fmt.Sprintf("JSON: nested more than %d deep; a config nests six deep (the file, models, a model, its validity, its ranges, a range)", maxDepth))
	case errors.As(err, &te):
		return p.at(te.off, "JSON: text after the end of the config object; a file holds one config object")
	case errors.Is(err, errUnexpectedEnd):
		return p.at(len(p.raw), "JSON: the file ends before the config is complete (a missing '}', ']' or '\"'?)")
	}
	return p.at(0, "JSON: "+err.Error())
}

// syntaxOffset finds the byte a JSON syntax error is about. The reader's
// offset is the end of the last good token: the bad character named in
// the message ("invalid character 'x' ...") is searched from there,
// else the first byte that is not white space is taken.
func (p *positions) syntaxOffset(se *json.SyntaxError) int {
	off := min(max(int(se.Offset), 0), len(p.raw))
	if rest, ok := strings.CutPrefix(se.Error(), "invalid character '"); ok {
		c := byte(0)
		switch {
		case strings.HasPrefix(rest, `\''`):
			c = '\''
		case len(rest) >= 2 && rest[1] == '\'' && rest[0] < utf8.RuneSelf:
			c = rest[0]
		}
		if c != 0 {
			if i := bytes.IndexByte(p.raw[max(off-1, 0):], c); i >= 0 {
				return max(off-1, 0) + i
			}
		}
	}
	for off < len(p.raw) && (p.raw[off] == ' ' || p.raw[off] == '\t' || p.raw[off] == '\r' || p.raw[off] == '\n') {
		off++
	}
	return off
}

// errUnexpectedEnd is what the JSON reader returns for a file cut short.
var errUnexpectedEnd = io.ErrUnexpectedEOF

// prevByte returns the last byte before off that is not JSON white
// space, or 0.
func prevByte(raw []byte, off int) byte {
	for i := off - 1; i >= 0; i-- {
		if !isSpace(raw[i]) {
			return raw[i]
		}
	}
	return 0
}

// jsonHint adds a likely fix for common slips at a JSON syntax error.
func jsonHint(raw []byte, off int) string {
	if off < 0 || off >= len(raw) {
		return ""
	}
	switch c := raw[off]; {
	case c == '\'':
		return " (JSON strings are in double quotes)"
	case (c == '}' || c == ']') && prevByte(raw, off) == ',':
		return " (JSON allows no ',' after the last member or element)"
	case c == '/' || c == '#':
		return " (JSON has no comments; put notes in a \"notes\" field)"
	case c == '"':
		return " (a missing ',' between two members?)"
	case c >= 0x80:
		return " (a character outside a string; only JSON punctuation and values may stand there)"
	}
	return ""
}
