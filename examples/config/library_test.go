package main

import (
	"bytes"
	"encoding/json"
	"testing"

	"github.com/backshift/backshift/examples/internal/modelinfo"
	"github.com/backshift/backshift/parse"
)

// TestSameAsLibrary keeps Config, the program's own struct that teaches
// the format, in step with modelinfo.Library, the definition that
// examples/identify writes and examples/harness and examples/monitor read:
// each built-in config decodes the same through both (no key that one
// knows and the other refuses) and encodes to the same bytes (the same
// keys, in the same order, left out under the same conditions).
func TestSameAsLibrary(t *testing.T) {
	for name, raw := range map[string][]byte{
		"greenhouse.json": builtin,
		"fitted.json":     fitted,
		// no notes, no record: the keys left out
		"bare.json": []byte(`{"models": [{"name": "m", "spec": "temp = w0 B^3 valve + a; every 1 min"}]}`),
		// a failed verdict, forced
		"failed.json": validityFile(`{"samples": 20, "interval": "1 min", "ranges": {"temp": [15, 16], "valve": [40, 60]},
  "verdict": "failed", "failures": ["the fit did not converge"], "forced": true}`),
	} {
		c, err := Load(name, raw)
		if err != nil {
			t.Fatal(err)
		}
		lib, err := modelinfo.DecodeLibrary[parse.Spec](raw)
		if err != nil {
			t.Fatalf("%s: modelinfo.DecodeLibrary: %v", name, err)
		}
		mine, err := json.Marshal(c)
		if err != nil {
			t.Fatal(err)
		}
		shared, err := json.Marshal(lib)
		if err != nil {
			t.Fatal(err)
		}
		if !bytes.Equal(mine, shared) {
			t.Errorf("%s: Config encodes as\n%s\nmodelinfo.Library as\n%s", name, mine, shared)
		}
		for i, e := range c.Models {
			if e.Failed() != lib.Models[i].Failed() {
				t.Errorf("%s: model %q: Failed %v here, %v in modelinfo", name, e.Name, e.Failed(), lib.Models[i].Failed())
			}
		}
	}
}
