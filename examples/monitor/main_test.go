package main

import (
	"bytes"
	"context"
	"fmt"
	"net/http"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"sync"
	"testing"
	"time"
)

// A command line the program refuses exits with 2 and says why, naming
// the flag; a config it cannot use exits with 1.
func TestBadInputFlags(t *testing.T) {
	dir := t.TempDir()
	noSigma := filepath.Join(dir, "nosigma.json")
	os.WriteFile(noSigma, []byte(`{"models": [{"name": "heater", "spec": "temp = 0.5 / (1 - 0.8 B) B^2 power + a; every 1 min"}]}`), 0o600)
	free := filepath.Join(dir, "free.json")
	os.WriteFile(free, []byte(`{"models": [{"name": "heater", "notes": "residual SD 0.1", "spec": "temp = w0 / (1 - 0.8 B) B^2 power + a; every 1 min"}]}`), 0o600)
	failed := filepath.Join(dir, "failed.json")
	os.WriteFile(failed, []byte(`{"models": [{"name": "heater", "notes": "residual SD 0.1", "spec": "temp = 0.5 / (1 - 0.8 B) B^2 power + a; every 1 min",
		"validity": {"samples": 500, "ranges": {"temp": [1, 2]}, "verdict": "failed", "forced": true}}]}`), 0o600)
	cases := []struct {
		args   []string
		status int
		msg    string
	}{
		{[]string{"extra"}, 2, `monitor takes no arguments besides its flags, and got "extra"`},
		{[]string{"-restore"}, 2, "-restore is given without -state"},
		{[]string{"-state", filepath.Join(dir, "none")}, 2, "not a folder (create it first)"},
		{[]string{"-arl", "10"}, 2, "-arl 10: the run length must lie in [50, 1e+09] samples"},
		{[]string{"-sigma", "air temperature"}, 2, "write the loop's name, '=' and a number"},
		{[]string{"-sigma", "air temprature=0.03"}, 2, `-sigma names "air temprature", which is not a model of the config ("air temperature")`},
		{[]string{"-nosuchflag"}, 2, "flag provided but not defined"},
		{[]string{"-config", filepath.Join(dir, "missing.json")}, 1, "no such file"},
		{[]string{"-config", noSigma}, 1, `no noise standard deviation: give it with -sigma 'heater=SD'`},
		{[]string{"-config", free}, 1, "its spec has free coefficients (w0)"},
		{[]string{"-config", failed}, 1, "it was saved with a failed verdict (-save-untrusted)"},
	}
	for _, c := range cases {
		var out, errOut bytes.Buffer
		if st := run(context.Background(), append([]string{"-addr", "127.0.0.1:0"}, c.args...), &out, &errOut); st != c.status || !strings.Contains(errOut.String(), c.msg) {
			t.Errorf("%q: status %d, %q; want %d, %q", c.args, st, errOut.String(), c.status, c.msg)
		}
	}
}

// syncBuffer is a buffer written by the program while the test reads it.
type syncBuffer struct {
	mu sync.Mutex
	b  bytes.Buffer
}

func (s *syncBuffer) Write(p []byte) (int, error) {
	s.mu.Lock()
	defer s.mu.Unlock()
	return s.b.Write(p)
}

func (s *syncBuffer) String() string {
	s.mu.Lock()
	defer s.mu.Unlock()
	return s.b.String()
}

// The program serves until stopped, prints the caution, writes the
// loops' states on shutdown and carries on from them with -restore.
func TestRunRestart(t *testing.T) {
	dir := t.TempDir()
	serve := func(args []string, work func(url string)) string {
		ctx, cancel := context.WithCancel(context.Background())
		var out, errOut syncBuffer
		done := make(chan int)
		go func() {
			done <- run(ctx, append([]string{"-addr", "127.0.0.1:0", "-state", dir}, args...), &out, &errOut)
		}()
		addr := regexp.MustCompile(`listening on (http://\S+)`)
		for i := 0; ; i++ {
			if m := addr.FindStringSubmatch(out.String()); m != nil {
				work(m[1])
				break
			}
			if i == 500 {
				t.Fatalf("not listening after 5 s: %s %s", out.String(), errOut.String())
			}
			time.Sleep(10 * time.Millisecond)
		}
		cancel()
		if st := <-done; st != 0 {
			t.Fatalf("exit status %d: %s", st, errOut.String())
		}
		return out.String()
	}
	var count string
	first := serve(nil, func(url string) {
		body := `{"valve": 50, "outdoor": 3, "temp": 19}` + "\n"
		resp, err := http.Post(url+loopPath+"/samples", "application/x-ndjson", strings.NewReader(strings.Repeat(body, 7)))
		if err != nil || resp.StatusCode != http.StatusOK {
			t.Fatalf("post: %v %v", resp, err)
		}
		resp.Body.Close()
		count = "7"
	})
	for _, want := range []string{"an alarm is advice to an operator, not an interlock", `loop "air temperature"`, "saved the state of 1 loops in " + dir} {
		if !strings.Contains(first, want) {
			t.Errorf("first run's output lacks %q:\n%s", want, first)
		}
	}
	second := serve([]string{"-restore"}, func(url string) {
		if b := raw(t, url+loopPath); !bytes.Contains(b, []byte(fmt.Sprintf(`"samples": %s,`, count))) {
			t.Errorf("after -restore the loop has not its %s samples:\n%s", count, b)
		}
		if b := raw(t, url+"/caution"); !bytes.Contains(b, []byte("not an interlock")) {
			t.Errorf("GET /caution: %s", b)
		}
	})
	if !strings.Contains(second, "restored the state of 1 of 1 loops") {
		t.Errorf("second run's output:\n%s", second)
	}
}
