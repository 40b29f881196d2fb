package greenhouse

import (
	"math"
	"strings"
	"testing"
)

// TestWithFault checks that the faulty copy differs from the record at
// the fault's sample only, by the fault's size, and leaves the record
// unchanged (plain arithmetic, no outside source needed).
func TestWithFault(t *testing.T) {
	d := Generate(Settings{Days: 2})
	before := append([]float64(nil), d.Temp...)
	c, err := d.WithFault(Spike)
	if err != nil {
		t.Fatal(err)
	}
	for i := range d.Temp {
		if d.Temp[i] != before[i] {
			t.Fatalf("the record changed at sample %d", i)
		}
		want := before[i]
		if i == Spike.Sample {
			want += Spike.Size
		}
		if c.Temp[i] != want {
			t.Fatalf("faulty copy at %d: %v, want %v", i, c.Temp[i], want)
		}
	}
	c.Valve[0] = -1
	if d.Valve[0] == -1 {
		t.Fatal("the copy shares the valve series with the record")
	}
	for _, f := range []Fault{{Sample: -1, Size: 1}, {Sample: d.Len(), Size: 1}} {
		if _, err := d.WithFault(f); err == nil {
			t.Errorf("fault %+v: want an error", f)
		}
	}
}

// TestWithDropout checks that the copy with a dropout is NaN over the
// dropout's samples only, equal to the record elsewhere, leaves the
// record unchanged and shares no slice with it, that the demo's dropout
// lies away from the spike and the ends, and that bad dropouts are
// refused (plain arithmetic, no outside source needed).
func TestWithDropout(t *testing.T) {
	d := Default()
	g := SensorDropout
	if g.Len != 60 || g.Start-Spike.Sample < 600 || d.Len()-(g.Start+g.Len) < 600 {
		t.Fatalf("the demo's dropout %+v is not an hour away from the spike (%d) and the end (%d)", g, Spike.Sample, d.Len())
	}
	before := append([]float64(nil), d.Temp...)
	c, err := d.WithDropout(g)
	if err != nil {
		t.Fatal(err)
	}
	for i := range d.Temp {
		if d.Temp[i] != before[i] {
			t.Fatalf("the record changed at sample %d", i)
		}
		in := i >= g.Start && i < g.Start+g.Len
		if in != math.IsNaN(c.Temp[i]) || !in && c.Temp[i] != before[i] {
			t.Fatalf("copy at %d: %v (record %v, inside the dropout %v)", i, c.Temp[i], before[i], in)
		}
	}
	c.Outdoor[0] = -99
	if d.Outdoor[0] == -99 {
		t.Fatal("the copy shares the outdoor series with the record")
	}
	both, err := c.WithFault(Spike)
	if err != nil || both.Temp[Spike.Sample] != before[Spike.Sample]+Spike.Size || !math.IsNaN(both.Temp[g.Start]) {
		t.Fatalf("spike on the copy with a dropout: %v", err)
	}
	var b strings.Builder
	if err := c.WriteCSV(&b); err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(b.String(), "\n")
	if l := lines[1+g.Start]; !strings.HasSuffix(l, ",") || strings.Contains(l, "NaN") {
		t.Errorf("a missing sample is written as %q, want an empty cell", l)
	}
	for _, bad := range []Dropout{{Start: 0, Len: 0}, {Start: -1, Len: 5}, {Start: d.Len() - 3, Len: 5}} {
		if _, err := d.WithDropout(bad); err == nil {
			t.Errorf("dropout %+v: want an error", bad)
		}
	}
}
