package main

import (
	"bytes"
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/backshift/backshift/internal/testutil"
)

// TestPictures draws the loop's pictures through the command line and
// checks that each is a PNG of the width chart.Save gives 18 cm at 220
// dots per inch (18/2.54*220 = 1559 pixels, by hand).
func TestPictures(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "pics")
	var out, errb bytes.Buffer
	if code := cli([]string{"-pictures", dir}, &out, &errb); code != 0 {
		t.Fatalf("exit %d: %s", code, errb.String())
	}
	for _, name := range []string{signalPicture, stepPicture, sensitivityPicture} {
		img := testutil.ReadPNG(t, filepath.Join(dir, name))
		if w := img.Bounds().Dx(); w < 1555 || w > 1563 {
			t.Errorf("%s is %d pixels wide, want about 1559", name, w)
		}
	}
}

// TestLoopFlags checks the flags of the loop: -pictures with -spec or
// -config, -noise 0 for the loop, and a -pictures folder that cannot be
// made are *FlagErrors reported before anything is printed.
func TestLoopFlags(t *testing.T) {
	file := filepath.Join(t.TempDir(), "a-file")
	if err := os.WriteFile(file, []byte("x"), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		name string
		o    options
		want string
	}{
		{"pictures with -spec", options{spec: PlantSpec, specSet: true, noise: NoiseSD, pictures: "pics"},
			"harness: -pictures pics: draws the loop of the default run (test signal, identified model, tuning); run without -spec and -config to draw it"},
		{"no noise for the loop", options{spec: PlantSpec, noise: 0, loop: true},
			"harness: -noise 0: the default run simulates a plant test, and a test without noise fits exactly"},
		{"folder under a file", options{spec: PlantSpec, noise: NoiseSD, loop: true, pictures: filepath.Join(file, "pics")},
			"harness: -pictures " + filepath.Join(file, "pics") + ": cannot make the folder for the pictures: mkdir "},
	} {
		var buf bytes.Buffer
		err := runWith(&buf, c.o)
		var fe *FlagError
		if !errors.As(err, &fe) || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: error %v, want a *FlagError containing %q", c.name, err, c.want)
		}
		if buf.Len() != 0 {
			t.Errorf("%s: printed %q before failing", c.name, buf.String())
		}
	}
}
