//go:build !race

package monitor

// raceEnabled: see race_test.go.
const raceEnabled = false
