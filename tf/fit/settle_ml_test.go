package fit_test

import (
	"context"
	"github.com/backshift/backshift/internal/fixture"
	"math"
	"testing"

	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf/fit"
)

// TestSettleExactML: Settings.Settle applies to ExactML as to least
// squares (the exact likelihood honours Settings.First, so the same
// start-up transient is left out of it). The record of TestSettle: an
// input that sat at an earlier operating level (10) before the record
// and varies about 0 in it, through 0.5 B / (1 - 0.95 B), so that the
// pre-sample convention (held at its first value) leaves a transient
// that decays as 0.95^t. The plain ExactML fit is biased by it (d1 more
// than 10 SE from 0.95); with Settle the likelihood starts after the
// transient (LikelihoodStart 90 or more, at most n/10) and d1 lies
// within 3 SE of 0.95 (common practice). Before, ExactML ignored
// Settle without a word.
func TestSettleExactML(t *testing.T) {
	n := 2000
	data := fixture.TransientRecord(41, n, 300) // the record of TestModelSettle
	m := parse.MustModel("y = c + w0 / (1 - d1 B) B x + a")
	plain, err := fit.Model(context.Background(), m, data, &fit.Settings{Method: fit.ExactML})
	if err != nil {
		t.Fatal(err)
	}
	settled, err := fit.Model(context.Background(), m, data, &fit.Settings{Method: fit.ExactML, Settle: true})
	if err != nil {
		t.Fatal(err)
	}
	d0, _ := plain.Param("d1")
	d1, _ := settled.Param("d1")
	t.Logf("ExactML plain d1 %.4f (%.4f) from %d; settled d1 %.4f (%.4f) from %d", d0.Value, d0.SE, plain.Conditioning.LikelihoodStart,
		d1.Value, d1.SE, settled.Conditioning.LikelihoodStart)
	if settled.Method != fit.ExactML {
		t.Errorf("the settled refit used %v", settled.Method)
	}
	if ls := settled.Conditioning.LikelihoodStart; ls < 90 || ls > n/10 {
		t.Errorf("settled likelihood start %d", ls)
	}
	if math.Abs(d1.Value-0.95) > 3*d1.SE {
		t.Errorf("settled d1 = %v (SE %v), truth 0.95", d1.Value, d1.SE)
	}
	if math.Abs(d0.Value-0.95) < 10*d0.SE {
		t.Errorf("plain ExactML d1 = %v (SE %v) should be biased by the start-up transient", d0.Value, d0.SE)
	}
}
