package main

import (
	_ "embed"
	"flag"
	"fmt"
	"io"
	"os"

	"github.com/backshift/backshift/examples/internal/modelinfo"
)

//go:embed greenhouse.json
var builtin []byte

//go:embed broken.json
var broken []byte

func main() {
	file := flag.String("file", "", "config file to load (default: the built-in greenhouse.json, then the built-in broken.json)")
	flag.Parse()
	var err error
	if *file != "" {
		var raw []byte
		if raw, err = os.ReadFile(*file); err == nil {
			err = show(os.Stdout, *file, raw)
		}
	} else {
		err = demo(os.Stdout)
	}
	if err != nil {
		fmt.Fprintln(os.Stderr, err)
		os.Exit(1)
	}
}

// demo loads the built-in config and prints it, then shows how a broken
// config is reported.
func demo(w io.Writer) error {
	if err := show(w, "greenhouse.json", builtin); err != nil {
		return err
	}
	fmt.Fprintf(w, "\nA config with mistakes (broken.json) is rejected with positions in the file:\n\n")
	_, err := Load("broken.json", broken)
	if err == nil {
		return fmt.Errorf("broken.json was accepted")
	}
	fmt.Fprintln(w, err)
	return nil
}

// show loads, validates and prints one config.
func show(w io.Writer, name string, raw []byte) error {
	c, err := Load(name, raw)
	if err != nil {
		return err
	}
	plural := "s"
	if len(c.Models) == 1 {
		plural = ""
	}
	fmt.Fprintf(w, "%s: %s, %d model%s, all valid\n", name, c.Site, len(c.Models), plural)
	for _, e := range c.Models {
		fmt.Fprintf(w, "\n%s\n", e.Name)
		if e.Notes != "" {
			fmt.Fprintf(w, "  (%s)\n", e.Notes)
		}
		fmt.Fprintf(w, "  spec: %s\n", e.Spec)
		if err := modelinfo.Write(w, e.Spec.Model); err != nil {
			return fmt.Errorf("%s: model %q: %w", name, e.Name, err)
		}
	}
	return nil
}
