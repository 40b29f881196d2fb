package modelinfo

import (
	"bytes"
	"encoding/json"
	"errors"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf"
)

// testdata/saved.json is a file as examples/identify -save wrote it
// before the library moved here (go run ./examples/identify -write-data
// gh.csv, then -data gh.csv -output temp -inputs valve -interval 1min
// -spec 'temp = c + w0 B^3 valve + a' -save saved.json -save-untrusted):
// a model that failed its checks, so that the record holds failures and
// forced too. Read and written again, in either form of its spec, it must
// come back byte for byte: the layout is the one identify writes and the
// other examples read.
func TestLibraryRoundTrip(t *testing.T) {
	want, err := os.ReadFile(filepath.Join("testdata", "saved.json"))
	if err != nil {
		t.Fatal(err)
	}
	parsed, err := DecodeLibrary[parse.Spec](want)
	if err != nil {
		t.Fatal(err)
	}
	m := parsed.Models[0]
	if parsed.Site != "gh.csv" || len(parsed.Models) != 1 || m.Name != "temp (identified)" ||
		m.Spec.Model.Output != "temp" || len(m.Spec.Model.Inputs) != 1 || !m.Failed() || !m.Validity.Forced {
		t.Fatalf("decoded %+v", parsed)
	}
	text, err := DecodeLibrary[string](want)
	if err != nil {
		t.Fatal(err)
	}
	if s := text.Models[0].Spec; s != "temp = 17.68598627222141 + 0.012862857838381205 B^3 valve + a; every 1 min" {
		t.Errorf("spec text %q", s)
	}
	dir := t.TempDir()
	for name, lib := range map[string]interface{ WriteFile(string) error }{"parsed": parsed, "text": text} {
		path := filepath.Join(dir, name+".json")
		if err := lib.WriteFile(path); err != nil {
			t.Fatal(err)
		}
		got, err := os.ReadFile(path)
		if err != nil {
			t.Fatal(err)
		}
		if !bytes.Equal(got, want) {
			t.Errorf("%s: written back as\n%s\nwant\n%s", name, got, want)
		}
	}
}

// A model written by hand carries neither notes nor a validity record;
// neither is written as an empty key, and such a model has not failed.
func TestLibraryOptionalKeys(t *testing.T) {
	lib := Library[string]{Site: "s", Models: []Saved[string]{{Name: "a", Spec: "y = 2 x; every 1 s"}}}
	path := filepath.Join(t.TempDir(), "a.json")
	if err := lib.WriteFile(path); err != nil {
		t.Fatal(err)
	}
	got, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	want := "{\n  \"site\": \"s\",\n  \"models\": [\n    {\n      \"name\": \"a\",\n      \"spec\": \"y = 2 x; every 1 s\"\n    }\n  ]\n}\n"
	if string(got) != want {
		t.Errorf("got\n%s\nwant\n%s", got, want)
	}
	if lib.Models[0].Failed() {
		t.Error("a model without a record reports a failed verdict")
	}
}

func TestDecodeLibraryRefuses(t *testing.T) {
	for _, c := range []struct{ raw, want string }{
		{`{"site": "x", "models": [{"name": "a", "spec": "y = 2 x", "validty": {}}]}`, `json: unknown field "validty"`},
		{`{"site": "x", "models": [{"name": "a", "spec": "y = = x"}]}`, "y = = x"},
		{`{"site": "x", "models": [`, "unexpected EOF"},
	} {
		_, err := DecodeLibrary[parse.Spec]([]byte(c.raw))
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: error %v, want one containing %q", c.raw, err, c.want)
		}
	}
	// The text form leaves the spec to its reader.
	if _, err := DecodeLibrary[string]([]byte(`{"models": [{"name": "a", "spec": "y = = x"}]}`)); err != nil {
		t.Errorf("text form: %v", err)
	}
	// A syntax error keeps its offset in the bytes given.
	_, err := DecodeLibrary[string]([]byte("{\"site\": x}"))
	var se *json.SyntaxError
	if !errors.As(err, &se) || se.Offset != 10 {
		t.Errorf("error %v, want a *json.SyntaxError at offset 10", err)
	}
}

// A spec that cannot be written (a NaN coefficient) fails the write and
// leaves no file.
func TestLibraryWriteRefusesBadSpec(t *testing.T) {
	m, err := parse.Model("y = 2 x; every 1 s")
	if err != nil {
		t.Fatal(err)
	}
	m.Inputs[0].Num.Each(func(c *tf.Coef) { c.Value = math.NaN() })
	lib := Library[parse.Spec]{Models: []Saved[parse.Spec]{{Name: "a", Spec: parse.Spec{Model: m}}}}
	path := filepath.Join(t.TempDir(), "a.json")
	if err := lib.WriteFile(path); err == nil {
		t.Fatal("a NaN coefficient was written")
	}
	if _, err := os.Stat(path); !errors.Is(err, os.ErrNotExist) {
		t.Errorf("a file was left: %v", err)
	}
}
