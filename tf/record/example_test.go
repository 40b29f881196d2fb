package record_test

import (
	"fmt"
	"log"
	"strings"

	"github.com/backshift/backshift/tf/record"
)

// Example reads a record logged every minute with two rows lost, fills
// the gap on a straight line, and prints what was done and the series a
// fit takes.
func Example() {
	csv := `time (min),valve,temp
0,50,15.0
1,50,15.2
2,60,15.4
5,60,16.0
6,60,16.1
`
	rec, err := record.Read(strings.NewReader(csv), &record.Settings{
		File:   "log.csv",
		Series: []string{"temp", "valve"},
		Gaps:   record.Remedy{Kind: "linear", Max: 5},
	})
	if err != nil {
		log.Fatal(err)
	}
	fmt.Println("every", rec.Interval.Value, rec.Interval.Unit)
	for _, n := range rec.Notes {
		fmt.Println(n)
	}
	fmt.Println("temp", rec.Series["temp"])
	// Output:
	// every 1 min
	// time column "time (min)" (numbers in minutes): rows every 1 min
	// filled 2 missing samples in 1 gap (2 before line 5) by straight lines between the rows either side
	// temp [15 15.2 15.4 15.6 15.8 16 16.1]
}
