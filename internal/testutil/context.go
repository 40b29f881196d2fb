package testutil

import "context"

// CountingContext is a context whose Err counts its calls and returns
// context.Canceled from call After+1 on, so that a test can stop a
// computation at a chosen check without timing. Calls holds the count.
// It is not safe for concurrent use: give each goroutine its own.
type CountingContext struct {
	context.Context
	Calls, After int
}

// Err counts the call and returns context.Canceled once Calls exceeds
// After, nil before.
func (c *CountingContext) Err() error {
	if c.Calls++; c.Calls > c.After {
		return context.Canceled
	}
	return nil
}
