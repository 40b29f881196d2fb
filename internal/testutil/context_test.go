package testutil

import (
	"context"
	"errors"
	"testing"
)

// A CountingContext is not done for its first After calls and is done
// (context.Canceled) from then on, counting every call.
func TestCountingContext(t *testing.T) {
	c := &CountingContext{Context: context.Background(), After: 2}
	for i, want := range []error{nil, nil, context.Canceled, context.Canceled} {
		if got := c.Err(); !errors.Is(got, want) || (want == nil && got != nil) {
			t.Errorf("call %d: Err() = %v, want %v", i+1, got, want)
		}
	}
	if c.Calls != 4 {
		t.Errorf("Calls = %d after 4 calls", c.Calls)
	}
}
