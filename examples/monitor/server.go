package main

import (
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"net/http"
	"strconv"
	"sync"

	"github.com/backshift/backshift/tf/monitor"
	"github.com/backshift/backshift/tf/predict"
)

// Limits of a request.
const (
	maxBody  = 64 << 20 // bytes of one POST of samples: about 10^6 lines
	maxSteps = 10000    // samples ahead of one prediction request
)

// service holds the loops and answers HTTP requests about them.
type service struct {
	site   string
	loops  []*loop
	byName map[string]*loop
	chans  []chan monitor.Alarm
	logs   sync.WaitGroup
}

// newService builds a loop for each spec; each loop's alarms are also
// written, one line each, to alarmLog by a goroutine of the loop.
func newService(site string, specs []loopSpec, arl float64, alarmLog io.Writer) (*service, error) {
	s := &service{site: site, byName: map[string]*loop{}}
	var mu sync.Mutex // one alarm line at a time
	for _, spec := range specs {
		ch := make(chan monitor.Alarm, 16)
		l, err := newLoop(spec, arl, ch)
		if err != nil {
			s.close()
			return nil, err
		}
		s.loops, s.chans = append(s.loops, l), append(s.chans, ch)
		s.byName[spec.Name] = l
		s.logs.Add(1)
		go func() {
			defer s.logs.Done()
			for a := range ch {
				mu.Lock()
				fmt.Fprintf(alarmLog, "ALARM loop %q: %v\n", spec.Name, a)
				mu.Unlock()
			}
		}()
	}
	return s, nil
}

// close ends the alarm writers; call it when no request runs any more.
func (s *service) close() {
	for _, ch := range s.chans {
		close(ch)
	}
	s.chans = nil
	s.logs.Wait()
}

// handler routes the requests.
func (s *service) handler() http.Handler {
	mux := http.NewServeMux()
	mux.HandleFunc("GET /{$}", s.index)
	mux.HandleFunc("GET /caution", func(w http.ResponseWriter, _ *http.Request) {
		w.Header().Set("Content-Type", "text/plain; charset=utf-8")
		fmt.Fprintln(w, caution)
	})
	mux.HandleFunc("GET /state", s.state)
	mux.HandleFunc("GET /loops/{loop}", s.withLoop(func(w http.ResponseWriter, _ *http.Request, l *loop) {
		writeJSON(w, http.StatusOK, l.state())
	}))
	mux.HandleFunc("POST /loops/{loop}/samples", s.withLoop(s.samples))
	mux.HandleFunc("GET /loops/{loop}/predict", s.withLoop(s.predict))
	mux.HandleFunc("POST /loops/{loop}/predict", s.withLoop(s.predict))
	mux.HandleFunc("/", func(w http.ResponseWriter, r *http.Request) {
		writeError(w, http.StatusNotFound, &apiError{Msg: fmt.Sprintf("no such resource %s %s; see GET / for the routes", r.Method, r.URL.Path)})
	})
	return mux
}

// routes is what GET / lists.
var routes = []string{
	"GET  /caution                 the caution, in words",
	"GET  /state                   every loop's state",
	"GET  /loops/{loop}            one loop's state: samples, missing outputs, statistics, alarms",
	"POST /loops/{loop}/samples    JSON lines, one sample each: {\"stamp\": 1700000000, \"valve\": 55, \"outdoor\": 3.2, \"temp\": 19.8}",
	"GET  /loops/{loop}/predict?steps=K       the next K outputs, inputs held at their last values",
	"POST /loops/{loop}/predict  {\"steps\": K, \"plan\": {\"valve\": [60, 60, 70]}}  for planned inputs",
}

func (s *service) index(w http.ResponseWriter, _ *http.Request) {
	loops := make([]string, len(s.loops))
	for i, l := range s.loops {
		loops[i] = l.spec.Name
	}
	writeJSON(w, http.StatusOK, map[string]any{"site": s.site, "loops": loops, "routes": routes, "caution": caution})
}

func (s *service) state(w http.ResponseWriter, _ *http.Request) {
	out := make([]loopState, len(s.loops))
	for i, l := range s.loops {
		out[i] = l.state()
	}
	writeJSON(w, http.StatusOK, map[string]any{"site": s.site, "loops": out, "caution": caution})
}

// withLoop finds the loop named in the path, or answers 404.
func (s *service) withLoop(h func(http.ResponseWriter, *http.Request, *loop)) http.HandlerFunc {
	return func(w http.ResponseWriter, r *http.Request) {
		name := r.PathValue("loop")
		l, ok := s.byName[name]
		if !ok {
			ns := make([]string, len(s.loops))
			for i, l := range s.loops {
				ns[i] = l.spec.Name
			}
			writeError(w, http.StatusNotFound, &apiError{Loop: name, Msg: fmt.Sprintf("no loop named %q (loops: %s; escape spaces in the path as %%20)", name, quoted(ns))})
			return
		}
		h(w, r, l)
	}
}

// samples takes the JSON lines of the body.
func (s *service) samples(w http.ResponseWriter, r *http.Request, l *loop) {
	body := http.MaxBytesReader(w, r.Body, maxBody)
	l.mu.Lock()
	taken, alarms, err := l.feed(body)
	total, last := l.samples, l.last
	raised := l.alarmList()
	raised = raised[max(0, len(raised)-alarms):] // this request's (the latest maxKept of them)
	l.mu.Unlock()
	var le *LineError
	var mb *http.MaxBytesError
	switch {
	case errors.As(err, &le) && errors.As(err, &mb):
		le.Msg = fmt.Sprintf("the body is over %d MiB; send the samples in several requests", maxBody>>20)
		writeJSON(w, http.StatusRequestEntityTooLarge, le)
	case errors.As(err, &le):
		writeJSON(w, http.StatusBadRequest, le)
	case err != nil:
		writeError(w, http.StatusInternalServerError, &apiError{Loop: l.spec.Name, Msg: err.Error()})
	default:
		writeJSON(w, http.StatusOK, map[string]any{"loop": l.spec.Name, "taken": taken, "samples": total,
			"last": stepJSON{pointOf(last.Index, last.Point), num(last.Error)}, "alarms_raised": alarms, "alarms": raised})
	}
}

// predictRequest is the body of POST /loops/{loop}/predict.
type predictRequest struct {
	Steps int                  `json:"steps"`
	Plan  map[string][]float64 `json:"plan"`
}

// predict answers the next outputs with their intervals.
func (s *service) predict(w http.ResponseWriter, r *http.Request, l *loop) {
	req := predictRequest{Steps: 1}
	if r.Method == http.MethodPost {
		dec := json.NewDecoder(http.MaxBytesReader(w, r.Body, maxBody))
		dec.DisallowUnknownFields()
		if err := dec.Decode(&req); err != nil {
			writeError(w, http.StatusBadRequest, &apiError{Loop: l.spec.Name, Msg: `the body is not {"steps": K, "plan": {"input": [values...]}}: ` + err.Error()})
			return
		}
	} else if q := r.URL.Query().Get("steps"); q != "" {
		n, err := strconv.Atoi(q)
		if err != nil {
			n = -1
		}
		req.Steps = n
	}
	if req.Steps < 1 || req.Steps > maxSteps {
		writeError(w, http.StatusBadRequest, &apiError{Loop: l.spec.Name, Field: "steps", Msg: fmt.Sprintf("steps must be a whole number from 1 to %d", maxSteps)})
		return
	}
	pts, first, err := l.forecast(req.Steps, req.Plan)
	if err != nil {
		predictError(w, l, err)
		return
	}
	out := make([]pointJSON, len(pts))
	for i, p := range pts {
		out[i] = pointOf(first+i, p)
	}
	writeJSON(w, http.StatusOK, map[string]any{"loop": l.spec.Name, "output": l.spec.Model.Output,
		"level": l.pred.Level(), "points": out, "caution": caution})
}

// predictError answers a refused prediction request.
func predictError(w http.ResponseWriter, l *loop, err error) {
	e := &apiError{Loop: l.spec.Name, Msg: err.Error()}
	var fe *fieldError
	var se *predict.SampleError
	switch {
	case errors.As(err, &fe):
		e.Field, e.Msg = fe.Field, fe.Msg
	case errors.As(err, &se):
		e.Field = se.Series
	case errors.Is(err, predict.ErrShort):
		writeError(w, http.StatusConflict, e) // not yet: the loop has too few samples
		return
	}
	writeError(w, http.StatusBadRequest, e)
}

// apiError is the JSON answer to a refused request.
type apiError struct {
	Loop  string `json:"loop,omitempty"`
	Line  int    `json:"line,omitempty"`
	Field string `json:"field,omitempty"`
	Msg   string `json:"error"`
}

func writeError(w http.ResponseWriter, status int, e *apiError) { writeJSON(w, status, e) }

func writeJSON(w http.ResponseWriter, status int, v any) {
	w.Header().Set("Content-Type", "application/json")
	w.WriteHeader(status)
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	enc.Encode(v)
}
