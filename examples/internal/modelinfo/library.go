package modelinfo

import (
	"bytes"
	"encoding/json"
	"os"

	"github.com/backshift/backshift/parse"
)

// Library is a site's model library: the JSON file that examples/identify
// -save writes and examples/harness and examples/monitor read (its format
// is taught by examples/config, which reads it with every problem
// positioned in the file):
//
//	{"site": "Greenhouse 3",
//	 "models": [{"name": "air temperature", "notes": "...",
//	             "spec": "temp = 0.01 / (1 - 0.95 B) B^3 valve + a; every 1 min",
//	             "validity": {...}}]}
//
// S is how each model's spec is held: parse.Spec parses every spec while
// the file is decoded (and writes the canonical text), string keeps the
// text as written, for a reader that parses it later with messages of its
// own.
type Library[S SpecForm] struct {
	// Site names the plant.
	Site string `json:"site"`
	// Models lists the models, each under its own name.
	Models []Saved[S] `json:"models"`
}

// SpecForm is the form of a saved model's spec: parsed or as text.
type SpecForm interface {
	parse.Spec | string
}

// Saved is one model of a Library.
type Saved[S SpecForm] struct {
	Name string `json:"name"`
	// Notes say what the model was fitted to and how; examples/identify
	// writes the fit's residual SD there ("residual SD 0.0356") and which
	// noise SD it saved as Validity.Sigma. A reader wanting the noise SD
	// takes Validity.Sigma; the notes' residual SD is the fallback for
	// files saved before that field, and is inflated when the record had
	// outliers.
	Notes string `json:"notes,omitempty"`
	Spec  S      `json:"spec"`
	// Validity is the record of the data the model was fitted to, as
	// examples/identify -save writes it; nil for a model written by hand
	// or saved before the record existed (its range of validity is then
	// unknown).
	Validity *Validity `json:"validity,omitempty"`
}

// Failed reports whether the model was saved with a failed verdict.
func (s Saved[S]) Failed() bool {
	return s.Validity != nil && s.Validity.Verdict == VerdictFailed
}

// DecodeLibrary decodes the first JSON value of raw as a Library. Unknown
// keys are refused (a misspelt "validity" would otherwise drop the record
// silently). The error is encoding/json's, for the caller to word; the
// Offset of a *json.SyntaxError counts the bytes of raw.
func DecodeLibrary[S SpecForm](raw []byte) (*Library[S], error) {
	var lib Library[S]
	dec := json.NewDecoder(bytes.NewReader(raw))
	dec.DisallowUnknownFields()
	if err := dec.Decode(&lib); err != nil {
		return nil, err
	}
	return &lib, nil
}

// WriteFile writes the library to the file path as JSON indented by two
// spaces, with a line break at the end, readable by its owner and all
// (mode 0644 before the umask). It fails, writing nothing, when a spec
// cannot be written (parse.Spec.MarshalText).
func (lib *Library[S]) WriteFile(path string) error {
	b, err := json.MarshalIndent(lib, "", "  ")
	if err != nil {
		return err
	}
	return os.WriteFile(path, append(b, '\n'), 0o644)
}
