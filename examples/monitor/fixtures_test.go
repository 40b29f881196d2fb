package main

import (
	"bytes"
	"encoding/json"
	"fmt"
	"io"
	"math"
	"net/http"
	"net/http/httptest"
	"net/url"
	"strings"
	"testing"

	"github.com/backshift/backshift/examples/greenhouse"
)

// loopPath is the built-in config's loop, escaped for a path.
var loopPath = "/loops/" + url.PathEscape("air temperature")

// testService starts the built-in config's service with the in-control
// run length arl per test behind an httptest server; alarms are written
// to the returned buffer.
func testService(t testing.TB, arl float64) (*service, *httptest.Server, *bytes.Buffer) {
	t.Helper()
	specs, err := decodeConfig(builtin, nil)
	if err != nil {
		t.Fatal(err)
	}
	var log bytes.Buffer
	svc, err := newService("test", specs, arl, &log) // read it after svc.close
	if err != nil {
		t.Fatal(err)
	}
	ts := httptest.NewServer(svc.handler())
	t.Cleanup(func() { ts.Close(); svc.close() })
	return svc, ts, &log
}

// sampleLines writes samples from..to-1 of rec as JSON lines, the output
// plus fault(i) (null where missing(i)), the stamp the minute.
func sampleLines(rec greenhouse.Data, from, to int, fault func(int) float64, missing func(int) bool) []byte {
	var b bytes.Buffer
	for i := from; i < to; i++ {
		y := "null"
		if missing == nil || !missing(i) {
			f := 0.0
			if fault != nil {
				f = fault(i)
			}
			y = fmt.Sprint(rec.Temp[i] + f)
		}
		fmt.Fprintf(&b, `{"stamp": %d, "valve": %v, "outdoor": %v, "temp": %s}`+"\n", int(rec.Minute[i]), rec.Valve[i], rec.Outdoor[i], y)
	}
	return b.Bytes()
}

// post sends body to path and decodes the JSON answer into out; it
// returns the status.
func post(t testing.TB, ts *httptest.Server, path string, body []byte, out any) int {
	t.Helper()
	resp, err := http.Post(ts.URL+path, "application/x-ndjson", bytes.NewReader(body))
	if err != nil {
		t.Fatal(err)
	}
	return decode(t, resp, out)
}

// get fetches path and decodes the JSON answer into out.
func get(t testing.TB, ts *httptest.Server, path string, out any) int {
	t.Helper()
	resp, err := http.Get(ts.URL + path)
	if err != nil {
		t.Fatal(err)
	}
	return decode(t, resp, out)
}

func decode(t testing.TB, resp *http.Response, out any) int {
	t.Helper()
	defer resp.Body.Close()
	raw, err := io.ReadAll(resp.Body)
	if err != nil {
		t.Fatal(err)
	}
	if out != nil {
		if err := json.Unmarshal(raw, out); err != nil {
			t.Fatalf("answer %d is not JSON: %v\n%s", resp.StatusCode, err, raw)
		}
	}
	return resp.StatusCode
}

// alarmOf is an alarm in an answer.
type alarmOf struct {
	Kind      string `json:"kind"`
	Direction int    `json:"direction"`
	Index     int64  `json:"index"`
	Stamp     int64  `json:"stamp"`
}

// feedAll posts the lines in requests of chunk lines each, fails on a
// refused request, and returns the alarms the requests raised.
func feedAll(t testing.TB, ts *httptest.Server, lines []byte, chunk int) []alarmOf {
	t.Helper()
	ls := strings.SplitAfter(string(lines), "\n")
	var alarms []alarmOf
	for i := 0; i < len(ls); i += chunk {
		body := strings.Join(ls[i:min(i+chunk, len(ls))], "")
		var ans struct {
			Raised int       `json:"alarms_raised"`
			Alarms []alarmOf `json:"alarms"`
		}
		if st := post(t, ts, loopPath+"/samples", []byte(body), &ans); st != http.StatusOK {
			t.Fatalf("lines %d..: status %d: %+v", i+1, st, ans)
		}
		if ans.Raised != len(ans.Alarms) {
			t.Fatalf("lines %d..: %d alarms raised, %d listed", i+1, ans.Raised, len(ans.Alarms))
		}
		alarms = append(alarms, ans.Alarms...)
	}
	return alarms
}

// stateOf is the part of a loop's state the tests read.
type stateOf struct {
	Samples    int64 `json:"samples"`
	Missing    int64 `json:"missing_outputs"`
	Statistics struct {
		MeanUp float64 `json:"mean_up"`
	} `json:"statistics"`
	Thresholds struct {
		MeanReference, Mean float64
	} `json:"thresholds"`
	Alarms  []alarmOf `json:"alarms"`
	Total   int64     `json:"alarms_total"`
	Dropped int64     `json:"alarms_dropped"`
	Caution string    `json:"caution"`
}

// finite reports whether every value is a finite number.
func finite(v ...float64) bool {
	for _, f := range v {
		if math.IsNaN(f) || math.IsInf(f, 0) {
			return false
		}
	}
	return true
}
