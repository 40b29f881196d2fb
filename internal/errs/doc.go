// Package errs is the error vocabulary shared by every package of
// backshift: one kind per idea, as sentinel values for errors.Is, and a
// few shapes that carry the facts a caller needs (which series and index,
// which setting, which part of a model). Public packages re-export the
// shapes by type alias (tf.SampleError = errs.SampleError) and the kinds
// as variables, so that one errors.As target answers "bad sample in
// series x at index i" whichever stage found it.
//
// The constructors Series, Model and Setting build the shapes as the
// packages report them, UnknownInput the error for a settings map naming
// a series that is not an input, and Num formats a number for a message.
//
// # Op
//
// Every shape has an Op: the exported function the caller called, as
// "package.Function" ("fit.Model", "arma.Fit"). When one exported function
// calls another (identify.Candidates runs arma and ccf), the outer one sets Op
// to its own name and renames settings to the caller's fields, so that a
// message never names an inner package's setting.
//
// # Settings
//
// One rule for every settings struct of the library: the zero value of a
// field means its documented default; a negative count, a negative or
// non-finite tolerance or scale, and a probability outside (0, 1) are
// errors (*SettingError naming the field), unless the field's doc gives a
// negative value a meaning (a negative order bound means "order zero
// only"). Every settings struct has a Validate method, and the function
// that takes it calls Validate first. Count, NonNegative and Probability
// apply the rule; OrderBound applies it to the bound of an order search.
//
// # Goroutines
//
// No goroutine the library starts may panic: each defers Recover, which
// turns a panic into an *InternalError (a library fault, reported as
// such) as a last line of defence.
package errs
