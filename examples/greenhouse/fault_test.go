package greenhouse

import "testing"

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
