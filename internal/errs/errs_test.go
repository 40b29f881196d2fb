package errs

import (
	"errors"
	"fmt"
	"io/fs"
	"math"
	"strings"
	"testing"
)

// Each shape prints its facts in one line and matches its kind with
// errors.Is (the wording is the library's own).
func TestShapes(t *testing.T) {
	for _, tc := range []struct {
		err  error
		kind error
		want string
	}{
		{&SampleError{Op: "fit.Model", Series: "valve", Index: 12, Value: math.NaN()}, ErrSample,
			`fit.Model: series "valve" sample 12 is NaN: samples must be finite numbers`},
		{&SampleError{Op: "arma.Fit", Series: "y", Index: 3, Value: 1e300, Limit: 1e140}, ErrSample,
			`arma.Fit: series "y" sample 3 is 1e+300, beyond the largest magnitude accepted, 1e+140 (rescale the series: change its units)`},
		{&SeriesError{Op: "fit.Model", Series: "temp", Kind: ErrShort, Have: 5, Need: 8, Detail: "after differencing"}, ErrShort,
			`fit.Model: series "temp": 5 samples, at least 8 needed (after differencing)`},
		{&SeriesError{Series: "valve", Kind: ErrLength, Have: 9, Need: 10}, ErrLength, `series "valve" has 9 samples against 10`},
		{&SeriesError{Series: "valve", Kind: ErrConstant, Detail: "every sample is 50"}, ErrConstant, `series "valve" is constant (every sample is 50)`},
		{&SeriesError{Series: "vlave", Kind: ErrName, Detail: "did you mean valve?"}, ErrName, `series "vlave": did you mean valve?`},
		{&SeriesError{Series: "vlave", Kind: ErrName}, ErrName, `series "vlave" is not known`},
		{&SeriesError{Series: "y", Kind: ErrOverflow}, ErrOverflow, `series "y": result out of float64 range`},
		{&SettingError{Op: "fit.Model", Setting: "Settings.MaxIter", Value: "-1", Rule: "must be zero or positive (0 means 200)"}, ErrSetting,
			`fit.Model: Settings.MaxIter = -1: must be zero or positive (0 means 200)`},
		{&ModelError{Op: "tf.NewSystem", Part: "input valve dead time", Problem: "-1 samples is below 0"}, ErrModel,
			`tf.NewSystem: input valve dead time: -1 samples is below 0`},
		{&ConvergenceError{Op: "arma.Fit", Iter: 500, Reason: "iteration limit"}, ErrConvergence, `arma.Fit: no convergence after 500 iterations: iteration limit`},
		// The constructors of build.go give the same shapes, Op empty.
		{Series("y", ErrShort, 3, 10, "to fit"), ErrShort, `series "y": 3 samples, at least 10 needed (to fit)`},
		{Model(`input "x"`, "it is unstable"), ErrModel, `input "x": it is unstable`},
		{Setting("Settings.Tol", "-1", "must be zero or positive"), ErrSetting, `Settings.Tol = -1: must be zero or positive`},
		{UnknownInput("Settings.InputDiff", "vlave", []string{"valve", "feed"}), ErrName,
			`series "vlave": named in Settings.InputDiff, it is not an input (the inputs are "valve", "feed"); check the spelling`},
		{UnknownInput("Settings.InputDiff", "x", nil), ErrName,
			`series "x": named in Settings.InputDiff, it is not an input (there are no inputs); check the spelling`},
		{&InternalError{Op: "tf.Identify", Value: "boom"}, ErrInternal,
			`tf.Identify: internal fault: boom (a fault of the library; please report it with this message)`},
	} {
		if got := tc.err.Error(); got != tc.want {
			t.Errorf("message\n got %s\nwant %s", got, tc.want)
		}
		if !errors.Is(tc.err, tc.kind) {
			t.Errorf("%T does not match its kind %v", tc.err, tc.kind)
		}
		if errors.Is(tc.err, ErrInternal) != (tc.kind == ErrInternal) {
			t.Errorf("%T matches a kind it is not", tc.err)
		}
	}
	// A ModelError with a precise cause matches both.
	cause := errors.New("constant term is zero")
	me := &ModelError{Part: "den", Problem: "constant term is zero", Err: cause}
	if !errors.Is(me, cause) || !errors.Is(me, ErrModel) {
		t.Error("ModelError with Err does not match both Err and ErrModel")
	}
}

func TestRecover(t *testing.T) {
	run := func() (err error) {
		defer Recover("tf.Identify", &err)
		var s []int
		_ = s[3] // an index panic, as a library fault would raise
		return nil
	}
	err := run()
	var ie *InternalError
	if !errors.As(err, &ie) || ie.Op != "tf.Identify" || len(ie.Stack) == 0 || !errors.Is(err, ErrInternal) {
		t.Fatalf("Recover gave %v", err)
	}
	quiet := func() (err error) {
		defer Recover("x", &err)
		return nil
	}
	if err := quiet(); err != nil {
		t.Errorf("Recover without a panic set %v", err)
	}
}

func TestRule(t *testing.T) {
	for _, tc := range []struct {
		err  error
		want string
	}{
		{Count("fit.Model", "Settings.Starts", -2, "0 means automatic"), "fit.Model: Settings.Starts = -2: must be zero or positive (0 means automatic)"},
		{NonNegative("", "Settings.Tol", math.NaN(), "0 means 1e-14"), "Settings.Tol = NaN: must be a finite number, zero or positive (0 means 1e-14)"},
		{NonNegative("", "S.X", math.Inf(1), "0 means 1"), "S.X = +Inf: must be a finite number, zero or positive (0 means 1)"},
		{Probability("", "CheckSettings.Alpha", 1, "0 means 0.05"), "CheckSettings.Alpha = 1: must lie strictly between 0 and 1 (0 means 0.05)"},
	} {
		var se *SettingError
		if !errors.As(tc.err, &se) || tc.err.Error() != tc.want {
			t.Errorf("got %v, want %s", tc.err, tc.want)
		}
	}
	for _, err := range []error{Count("", "a", 0, ""), Count("", "a", 5, ""), NonNegative("", "b", 0, ""), NonNegative("", "b", 2.5, ""),
		Probability("", "c", 0, ""), Probability("", "c", 0.05, "")} {
		if err != nil {
			t.Errorf("a valid value gave %v", err)
		}
	}
}

// IsKind tells a kind itself from an error that matches one.
func TestIsKind(t *testing.T) {
	if !IsKind(ErrFormat) || !IsKind(ErrSample) {
		t.Error("a kind is not recognised")
	}
	if IsKind(&SampleError{}) || IsKind(errors.New("bad sample")) {
		t.Error("an error that is not a kind is taken for one")
	}
}

// TestSetOp: SetOp renames the Op of every project error in a wrapped
// or joined chain and leaves errors of other modules alone; FillOp names
// only errors nobody has named; Prefix is "op: " or nothing.
func TestSetOp(t *testing.T) {
	for _, err := range []error{
		&SampleError{Op: "inner", Series: "y", Index: 1, Value: math.NaN()},
		&SeriesError{Op: "inner", Series: "y", Kind: ErrShort, Have: 2, Need: 5},
		&SettingError{Op: "inner", Setting: "Lags", Value: "-1", Rule: "must be positive"},
		&ModelError{Op: "inner", Part: "AR", Problem: "not stationary"},
		&ConvergenceError{Op: "inner", Iter: 3},
	} {
		wrapped := fmt.Errorf("context: %w", err)
		if SetOp("outer.Call", wrapped) != wrapped {
			t.Errorf("%T: SetOp does not return its argument", err)
		}
		if got := err.Error(); !strings.HasPrefix(got, "outer.Call: ") {
			t.Errorf("%T: got %q, want the prefix %q", err, got, "outer.Call: ")
		}
	}
	a := &SampleError{Op: "inner", Series: "y"}
	b := &SeriesError{Series: "y", Kind: ErrShort}
	path := &fs.PathError{Op: "open", Path: "x.csv", Err: fs.ErrNotExist}
	joined := errors.Join(a, fmt.Errorf("wrapped: %w", b), path)
	FillOp("outer.Call", joined)
	if a.Op != "inner" || b.Op != "outer.Call" {
		t.Errorf("FillOp: got %q and %q, want %q (kept) and %q (filled)", a.Op, b.Op, "inner", "outer.Call")
	}
	SetOp("outer.Call", joined)
	if a.Op != "outer.Call" || path.Op != "open" {
		t.Errorf("SetOp on a joined chain: got %q and %q, want %q and %q (another module's error left alone)", a.Op, path.Op, "outer.Call", "open")
	}
	SetOp("outer.Call", nil) // no error, nothing to rename: must not panic
	if Prefix("") != "" || Prefix("fit.Model") != "fit.Model: " {
		t.Errorf("Prefix: got %q and %q", Prefix(""), Prefix("fit.Model"))
	}
}
