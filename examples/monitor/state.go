package main

import (
	"math"
	"strconv"

	"github.com/backshift/backshift/tf/monitor"
	"github.com/backshift/backshift/tf/predict"
)

// num is a number in a JSON answer: NaN and infinities (a prediction
// not yet made, an error of a missing output) are written as null.
type num float64

// MarshalJSON writes the number, or null when it is not finite.
func (n num) MarshalJSON() ([]byte, error) {
	f := float64(n)
	if math.IsNaN(f) || math.IsInf(f, 0) {
		return []byte("null"), nil
	}
	return strconv.AppendFloat(nil, f, 'g', -1, 64), nil
}

// pointJSON is one prediction with its interval.
type pointJSON struct {
	Index int `json:"index"`
	Mean  num `json:"mean"`
	SE    num `json:"se"`
	Lower num `json:"lower"`
	Upper num `json:"upper"`
}

func pointOf(index int, p predict.Point) pointJSON {
	return pointJSON{Index: index, Mean: num(p.Mean), SE: num(p.SE), Lower: num(p.Lower), Upper: num(p.Upper)}
}

// stepJSON is the one-step prediction of the last sample taken, with
// its error (output minus prediction; null when the output was missing
// or the predictor still settles).
type stepJSON struct {
	pointJSON
	Error num `json:"error"`
}

// alarmJSON is one alarm.
type alarmJSON struct {
	Kind      string `json:"kind"`
	Direction int    `json:"direction"`
	Input     string `json:"input,omitempty"`
	Lag       int    `json:"lag,omitempty"`
	Index     int64  `json:"index"`
	Stamp     int64  `json:"stamp"`
	Statistic num    `json:"statistic"`
	Threshold num    `json:"threshold"`
	Text      string `json:"text"`
}

// statsJSON holds the monitor's current statistics and thresholds, in
// standard deviations (squared for the variance test).
type statsJSON struct {
	MeanUp          num   `json:"mean_up"`
	MeanDown        num   `json:"mean_down"`
	VarianceUp      num   `json:"variance_up"`
	VarianceDown    num   `json:"variance_down"`
	CorrelationUp   []num `json:"correlation_up"`
	CorrelationDown []num `json:"correlation_down"`
	// Pairs names the watched (input, lag) pairs of the correlation
	// test, in the order of its statistics.
	Pairs []string `json:"pairs"`
}

// loopState is what GET /loops/{loop} answers.
type loopState struct {
	Loop     string   `json:"loop"`
	Model    string   `json:"model"`
	Output   string   `json:"output"`
	Inputs   []string `json:"inputs"`
	Events   []string `json:"events,omitempty"` // where each event of the model falls on the stream
	Sigma    num      `json:"sigma"`
	Samples  int64    `json:"samples"`
	Missing  int64    `json:"missing_outputs"`
	Settling bool     `json:"settling"`
	// Watching says the monitor watches the errors: the start-up
	// transient of the input paths has faded (loop.settle).
	Watching bool     `json:"watching"`
	Last     stepJSON `json:"last"`
	// Statistics and Thresholds are the monitor's.
	Statistics statsJSON          `json:"statistics"`
	Thresholds monitor.Thresholds `json:"thresholds"`
	Alarms     []alarmJSON        `json:"alarms"`
	// AlarmsTotal counts the alarms raised; Forgotten those no longer
	// in Alarms (only the latest are kept); Dropped those the alarm
	// channel could not take (monitor.Monitor.Dropped).
	AlarmsTotal int64  `json:"alarms_total"`
	Forgotten   int64  `json:"alarms_forgotten"`
	Dropped     int64  `json:"alarms_dropped"`
	Caution     string `json:"caution"`
}

// state returns the loop's state; it takes l.mu.
func (l *loop) state() loopState {
	l.mu.Lock()
	defer l.mu.Unlock()
	st := l.mon.Status()
	s := loopState{
		Loop: l.spec.Name, Model: l.spec.Model.String(), Output: l.spec.Model.Output, Inputs: l.inputs, Events: l.spec.Events,
		Sigma: num(l.spec.Sigma), Samples: l.samples, Missing: l.missing,
		Settling: l.pred.Count() < l.pred.First(),
		Watching: l.pred.Count() > l.watchFrom,
		Last:     stepJSON{pointOf(l.last.Index, l.last.Point), num(l.last.Error)},
		Statistics: statsJSON{
			MeanUp: num(st.MeanUp), MeanDown: num(st.MeanDown),
			VarianceUp: num(st.VarianceUp), VarianceDown: num(st.VarianceDown),
			CorrelationUp: nums(st.CorrelationUp), CorrelationDown: nums(st.CorrelationDown),
		},
		Thresholds:  l.mon.Thresholds(),
		Alarms:      l.alarmList(),
		AlarmsTotal: l.total, Forgotten: l.forgotten, Dropped: l.mon.Dropped(),
		Caution: alarmCaution,
	}
	for i, lags := range l.lags() {
		for _, k := range lags {
			s.Statistics.Pairs = append(s.Statistics.Pairs, l.inputs[i]+" at lag "+strconv.Itoa(k))
		}
	}
	return s
}

// alarmList returns the kept alarms for JSON; l.mu must be held.
func (l *loop) alarmList() []alarmJSON {
	out := make([]alarmJSON, len(l.alarms))
	for i, a := range l.alarms {
		out[i] = alarmJSON{Kind: a.Kind.String(), Direction: a.Direction, Index: a.Index, Stamp: a.Stamp,
			Statistic: num(a.Statistic), Threshold: num(a.Threshold), Text: a.String()}
		if a.Kind == monitor.Correlation {
			out[i].Input, out[i].Lag = l.inputs[a.Input], a.Lag
		}
	}
	return out
}

func nums(f []float64) []num {
	out := make([]num, len(f))
	for i, v := range f {
		out[i] = num(v)
	}
	return out
}
