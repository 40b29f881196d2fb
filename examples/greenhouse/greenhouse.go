package greenhouse

import (
	"bufio"
	"fmt"
	"io"
	"math"
	"math/rand/v2"
	"strconv"
)

// Path is one first-order input path of the true model,
//
//	Omega B^Delay / (1 - Delta B) x_t
//
// with x the series named Series, in Unit; Delay is the dead time in
// samples (minutes).
type Path struct {
	Series string
	Unit   string
	Omega  float64
	Delta  float64
	Delay  int
}

// Gain returns the steady-state gain Omega/(1 - Delta) in degC per unit
// of the input.
func (p Path) Gain() float64 { return p.Omega / (1 - p.Delta) }

// TimeConstant returns the time constant of the path in minutes,
// -1/ln(Delta) (the continuous first-order lag whose samples decay by
// Delta each minute).
func (p Path) TimeConstant() float64 { return -1 / math.Log(p.Delta) }

// Truth holds the numbers of the model that generates the data:
//
//	temp_t = Const + Valve path + Outdoor path + (1 + Theta B)/(1 - Phi B) a_t
//
// with a_t white Gaussian noise of standard deviation Sigma (degC).
type Truth struct {
	Const   float64
	Valve   Path
	Outdoor Path
	Theta   float64
	Phi     float64
	Sigma   float64
}

// True is the model that generates the demo data: the valve acts after
// 3 min with gain 0.2 degC/% and a time constant of about 19.5 min; the
// outdoor temperature after 1 min with gain 0.5 and a time constant of
// about 9.5 min; the disturbance is ARMA(1,1) noise.
var True = Truth{
	Const:   6,
	Valve:   Path{Series: "valve", Unit: "%", Omega: 0.01, Delta: 0.95, Delay: 3},
	Outdoor: Path{Series: "outdoor", Unit: "degC", Omega: 0.05, Delta: 0.9, Delay: 1},
	Theta:   0.3,
	Phi:     0.8,
	Sigma:   0.03,
}

// TrueSpec is [True] written in the spec language, with every
// coefficient fixed.
const TrueSpec = "temp = 6 + 0.01 / (1 - 0.95 B) B^3 valve + 0.05 / (1 - 0.9 B) B outdoor + (1 + 0.3 B) / (1 - 0.8 B) a; every 1 min"

// Structure is the structure of [True] in the spec language with every
// coefficient free: the model a fit of the record estimates (the tests
// of the examples share it).
const Structure = "temp = c + w0 / (1 - d1 B) B^3 valve + v0 / (1 - e1 B) B outdoor + (1 + t1 B) / (1 - p1 B) a"

// Interval is the sample interval of the data in minutes.
const Interval = 1.0

// Names of the series (and of the CSV columns that hold them).
const (
	Output   = "temp"
	Valve    = "valve"
	Outdoor  = "outdoor"
	Setpoint = "setpoint"
	Minute   = "minute"
)

// Settings chooses what Generate produces. The zero value gives the
// default demo: 4 days (5760 samples) from seed 7.
type Settings struct {
	// Days is the length of the record in days (1440 samples a day);
	// 0 means 4.
	Days int
	// Seed seeds the weather, the test signal and the noise; 0 means 7.
	Seed uint64
	// DitherAmplitude is the amplitude of the test signal in % valve
	// opening; 0 means 10, a negative value switches it off.
	DitherAmplitude float64
}

// Controller tuning used while the data were logged: a PI controller in
// velocity form, gain Kc in % per degC, integral time Ti in minutes,
// acting on the measurement of the previous minute.
const (
	Kc = 3.0
	Ti = 30.0
)

// Data is one generated record. All series have the same length; index
// t is minute t from the start (midnight of the first day).
type Data struct {
	Minute   []float64 // minutes from the start
	Setpoint []float64 // degC
	Valve    []float64 // % opening, 0..100
	Outdoor  []float64 // degC
	Temp     []float64 // degC, the output
}

// Len returns the number of samples.
func (d Data) Len() int { return len(d.Temp) }

// ByName returns the output and the two inputs by their names (Output,
// Valve, Outdoor), as fit.Model, identify.Candidates and Estimate.Forecast take
// them. The slices are the record's own.
func (d Data) ByName() map[string][]float64 {
	return map[string][]float64{Output: d.Temp, Valve: d.Valve, Outdoor: d.Outdoor}
}

// Series returns the named series (one of Output, Valve, Outdoor,
// Setpoint, Minute) and whether the name is known. The slice is the
// record's own: copy it before changing it.
func (d Data) Series(name string) ([]float64, bool) {
	switch name {
	case Output:
		return d.Temp, true
	case Valve:
		return d.Valve, true
	case Outdoor:
		return d.Outdoor, true
	case Setpoint:
		return d.Setpoint, true
	case Minute:
		return d.Minute, true
	}
	return nil, false
}

// Default returns the default demo record (Generate with zero Settings).
func Default() Data { return Generate(Settings{}) }

// warmup is the number of minutes simulated before the record starts, so
// that the record begins in a settled operating state.
const warmup = 720

// Generate simulates the greenhouse under its controller. It is
// deterministic given the settings.
func Generate(s Settings) Data {
	days, seed, amp := s.resolve()
	n := days * 1440
	sim := newSimulation(seed, amp)
	d := Data{
		Minute:   make([]float64, n),
		Setpoint: make([]float64, n),
		Valve:    make([]float64, n),
		Outdoor:  make([]float64, n),
		Temp:     make([]float64, n),
	}
	for k := 0; k < n+warmup; k++ {
		m := k - warmup // minute from the start of the record
		sp := setpoint(m)
		out := sim.weather(m)
		u := sim.valve(sp)
		y := sim.plant(u, out)
		if m >= 0 {
			d.Minute[m] = float64(m)
			d.Setpoint[m] = sp
			d.Valve[m] = u
			d.Outdoor[m] = out
			d.Temp[m] = y
		}
	}
	return d
}

// resolve returns the settings with their defaults filled in: the days,
// the seed and the amplitude of the test signal (0 when switched off).
func (s Settings) resolve() (days int, seed uint64, amp float64) {
	days, seed, amp = s.Days, s.Seed, s.DitherAmplitude
	if days <= 0 {
		days = 4
	}
	if seed == 0 {
		seed = 7
	}
	if amp == 0 {
		amp = 10
	} else if amp < 0 {
		amp = 0
	}
	return days, seed, amp
}

// simulation is the state of the weather, the plant (the true model) and
// the controller while Generate runs, one step a minute.
type simulation struct {
	rng *rand.Rand
	amp float64 // amplitude of the test signal, % valve
	// Weather: a slow front component (AR(1), time scale about 1.4
	// days), fast gusts and sun/cloud changes (AR(1), time scale about 5
	// min).
	front, gust float64
	// Plant: the two first-order lags, the ARMA noise and its last
	// innovation, and the input histories for the dead times.
	xv, xo, noise, aPrev float64
	uHist, oHist         []float64
	// Controller: the PI part of the valve opening (%), the last error
	// and measurement, and the shift register of the test signal.
	pi, ePrev, yPrev float64
	lfsr             uint16
	bit              float64
}

// newSimulation returns the simulation at the start of the warm-up,
// with the lags at the steady state of the first minute's inputs.
func newSimulation(seed uint64, amp float64) *simulation {
	tr := True
	s := &simulation{
		rng:   rand.New(rand.NewPCG(seed, 0x6772656e)),
		amp:   amp,
		uHist: make([]float64, tr.Valve.Delay+1),
		oHist: make([]float64, tr.Outdoor.Delay+1),
		pi:    60,
		lfsr:  0x2b5a,
		bit:   1,
	}
	o0 := outdoorBase(-warmup)
	s.xo = tr.Outdoor.Gain() * o0
	s.xv = tr.Valve.Gain() * s.pi
	for i := range s.uHist {
		s.uHist[i] = s.pi
	}
	for i := range s.oHist {
		s.oHist[i] = o0
	}
	s.yPrev = tr.Const + s.xv + s.xo
	return s
}

// weather returns the outdoor temperature at minute m.
func (s *simulation) weather(m int) float64 {
	s.front = 0.9995*s.front + 0.06*s.rng.NormFloat64()
	s.gust = 0.8*s.gust + 0.25*s.rng.NormFloat64()
	return outdoorBase(m) + s.front + s.gust
}

// valve returns the valve opening for setpoint sp: the velocity-form PI
// on last minute's measurement plus the test signal, within 0..100 %.
func (s *simulation) valve(sp float64) float64 {
	e := sp - s.yPrev
	s.pi += Kc * (e - s.ePrev + e/Ti)
	s.pi = clamp(s.pi, 0, 100)
	s.ePrev = e
	// Test signal: a 15-bit maximum-length shift register
	// (x^15 + x^14 + 1, period 32767 minutes, longer than any
	// record), one bit a minute.
	if s.amp > 0 {
		fb := (s.lfsr>>14 ^ s.lfsr>>13) & 1
		s.lfsr = (s.lfsr<<1 | fb) & 0x7fff
		s.bit = float64(s.lfsr&1)*2 - 1
	}
	return clamp(s.pi+s.amp*s.bit, 0, 100)
}

// plant advances the true model one minute with valve u and outdoor
// temperature out, and returns the air temperature.
func (s *simulation) plant(u, out float64) float64 {
	tr := True
	copy(s.uHist[1:], s.uHist[:len(s.uHist)-1])
	s.uHist[0] = u
	copy(s.oHist[1:], s.oHist[:len(s.oHist)-1])
	s.oHist[0] = out
	s.xv = tr.Valve.Delta*s.xv + tr.Valve.Omega*s.uHist[tr.Valve.Delay]
	s.xo = tr.Outdoor.Delta*s.xo + tr.Outdoor.Omega*s.oHist[tr.Outdoor.Delay]
	a := tr.Sigma * s.rng.NormFloat64()
	s.noise = tr.Phi*s.noise + a + tr.Theta*s.aPrev
	s.aPrev = a
	s.yPrev = tr.Const + s.xv + s.xo + s.noise
	return s.yPrev
}

// setpoint returns the air temperature setpoint at minute m: 16 degC at
// night, a day value from 06:00 to 20:00 that differs from day to day.
func setpoint(m int) float64 {
	if m < 0 {
		return 16
	}
	day := m / 1440
	h := float64(m%1440) / 60
	if h >= 6 && h < 20 {
		return [...]float64{20, 21, 19, 20.5}[day%4]
	}
	return 16
}

// outdoorBase returns the deterministic part of the outdoor temperature
// at minute m: a daily cycle of +-5 degC around 4 degC with its maximum at
// 15:00, and a cold front that lowers it by 5 degC over three hours from
// 18:00 on the second day.
func outdoorBase(m int) float64 {
	t := float64(m)
	cycle := 4 + 5*math.Cos(2*math.Pi*(t/1440-15.0/24))
	front := -5 / (1 + math.Exp(-(t-(1440+18*60+90))/30))
	return cycle + front
}

func clamp(v, lo, hi float64) float64 { return math.Min(math.Max(v, lo), hi) }

// WriteCSV writes the record as CSV with a header line: minute,
// setpoint, valve, outdoor, temp (units: min, degC, %, degC, degC). A
// missing sample (NaN, see [Data.WithDropout]) is written as an empty
// cell, as data loggers write a reading they did not get.
func (d Data) WriteCSV(w io.Writer) error {
	bw := bufio.NewWriter(w)
	fmt.Fprintf(bw, "%s,%s,%s,%s,%s\n", Minute, Setpoint, Valve, Outdoor, Output)
	var buf []byte
	for t := range d.Temp {
		buf = buf[:0]
		buf = strconv.AppendFloat(buf, d.Minute[t], 'f', -1, 64)
		for _, v := range [...]float64{d.Setpoint[t], d.Valve[t], d.Outdoor[t], d.Temp[t]} {
			buf = append(buf, ',')
			if !math.IsNaN(v) {
				buf = strconv.AppendFloat(buf, v, 'f', 4, 64)
			}
		}
		buf = append(buf, '\n')
		if _, err := bw.Write(buf); err != nil {
			return err
		}
	}
	return bw.Flush()
}
