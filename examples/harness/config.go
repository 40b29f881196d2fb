package main

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"strings"

	"github.com/backshift/backshift/examples/internal/cmdline"
	"github.com/backshift/backshift/examples/internal/modelinfo"
	"github.com/backshift/backshift/examples/internal/suggest"
)

// savedModel is one model entry of a config file as examples/identify
// -save writes it and examples/config reads it; its spec is kept as text,
// parsed when the plant is built (after the verdict is checked, and with
// the model's name in the message).
type savedModel = modelinfo.Saved[string]

// loadModel reads the config file and returns the model entry named
// name, or the only entry when name is empty. Unknown keys are refused
// (a misspelt "validity" would otherwise drop the record silently).
// Errors name the file and, for JSON syntax, the line and column.
func loadModel(file, name string) (*savedModel, error) {
	raw, err := cmdline.ReadConfig(file)
	if err != nil {
		return nil, err
	}
	if len(bytes.TrimSpace(raw)) == 0 {
		return nil, errors.New("the file is empty; it should hold {\"site\": ..., \"models\": [...]} as examples/identify -save writes it")
	}
	cfg, err := modelinfo.DecodeLibrary[string](raw)
	if err != nil {
		var se *json.SyntaxError
		if errors.As(err, &se) {
			line, col := lineCol(raw, se.Offset-1) // Offset counts the bytes read, the bad one included
			return nil, fmt.Errorf("%d:%d: not valid JSON: %v", line, col, err)
		}
		return nil, fmt.Errorf("not a model config: %v", err)
	}
	names := make([]string, len(cfg.Models))
	for i, m := range cfg.Models {
		names[i] = fmt.Sprintf("%q", m.Name)
		if m.Name == name || (name == "" && len(cfg.Models) == 1) {
			return &cfg.Models[i], nil
		}
	}
	switch {
	case len(cfg.Models) == 0:
		return nil, errors.New("the file holds no models")
	case name == "":
		return nil, fmt.Errorf("the file holds %d models; pick one with -model (%s)", len(cfg.Models), strings.Join(names, ", "))
	}
	hint := ""
	for _, m := range cfg.Models {
		if d := suggest.DidYouMean(name, m.Name); d != "" {
			hint = "; " + d
			break
		}
	}
	return nil, fmt.Errorf("no model named %q%s (the file holds %s)", name, hint, strings.Join(names, ", "))
}

// lineCol returns the 1-based line and byte column of the byte at the
// 0-based offset off in b.
func lineCol(b []byte, off int64) (line, col int) {
	off = min(max(off, 0), int64(len(b)))
	before := b[:off]
	line = 1 + bytes.Count(before, []byte{'\n'})
	col = int(off) - bytes.LastIndexByte(before, '\n')
	return line, col
}
