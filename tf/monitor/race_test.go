//go:build race

package monitor

// raceEnabled: the race detector slows the long simulations tenfold;
// TestInControlARL then runs only its short case.
const raceEnabled = true
