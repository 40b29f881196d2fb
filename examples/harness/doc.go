// Command harness unit-tests a controller against a known discrete
// model, as a template for testing your own controller before it meets
// the real process.
//
// The process is the greenhouse of the demo (air temperature driven by
// the heating valve and the outdoor temperature), given as a spec string
// and simulated sample by sample with seeded ARMA noise. A PI controller
// in velocity form with output limits and anti-windup closes the loop.
// Two scenarios run: a setpoint step (16 -> 20 degC at 06:00) and a
// disturbance step (a cold front: outdoor temperature down by 8 degC).
// The program prints settling time, overshoot, steady-state error and
// peak deviation; harness_test.go asserts them, and that file is the
// part to copy: replace the PI with your controller and the spec with
// your identified model.
//
//	go run ./examples/harness
//	go run ./examples/harness -noise 0.03 -spec 'temp = 5.97 + 0.009989 / (1 - 0.9502 B) B^3 valve + ...'
//
// The second form tests the controller on another model, such as the one
// examples/identify prints for the demo record; it needs an input named
// valve (%) and may have one named outdoor (degC).
//
// A model identified from data is an approximation valid near the
// operating conditions of that data. A controller that passes these tests
// must still be commissioned on site under the site's safety procedures,
// with independent safety interlocks; defer to local codes and licensed
// practice. The program says so at the end of its summary.
package main
