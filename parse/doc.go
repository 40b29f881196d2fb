// Package parse reads model specs: one short text, written the way an
// engineer writes a transfer-function-noise model on paper, that becomes
// a typed tf.Model. The model prints back to canonical spec text with
// tf.Model.String, and parse.Model(m.String()) is equal to m.
//
//	# kiln: burner firing rate (%) -> chamber temperature (degC)
//	temp = 21.5 + (w0 + w1 B) / (1 - d1 B) B^4 burner + (1 - t1 B) / (1 - p1 B) a
//	where w0 ~ 2, d1 ~ 0.6
//	every 30 s
//
// reads: the temperature is a constant 21.5 plus the burner rate passed
// through (w0 + w1 B) / (1 - d1 B) with a dead time of four samples, plus
// noise that is white noise a_t filtered by (1 - t1 B) / (1 - p1 B); the
// coefficients w0, w1, d1, t1 and p1 are free (to be estimated), w0
// starting at 2 and d1 at 0.6, the others at 0; one sample is 30 seconds.
//
// # The model
//
// A spec describes, in the backshift operator B (B x_t = x_{t-1}),
//
//	D(B) y_t = c + sum_i omega_i(B) / delta_i(B) B^b_i D_i(B) x_i,t + theta(B) / phi(B) a_t
//
// one output series y with optional differencing D(B); an optional
// constant c; one or more input terms, each a numerator omega(B), a
// denominator delta(B) (constant term 1), a dead time of b samples and an
// optional differencing D_i(B) of the input series x_i; and at most one
// noise term. See package tf for the typed values.
//
// # Coefficients
//
// A coefficient is a number (fixed) or a name (a parameter). A name is
// free, to be estimated, starting at 0, unless the where clause says
// otherwise:
//
//	where d1 ~ 0.8    free, starting at 0.8 ("about 0.8")
//	where d1 = 0.8    held at 0.8 (not estimated)
//
// The same name in several places is one parameter. Signs are kept as
// written: in (1 - d1 B) the coefficient of B is -d1.
//
// # Polynomials and factors
//
// A polynomial in B is written in parentheses as signed terms: a
// coefficient, a coefficient times a power of B, or a power of B alone:
// (w0 + w1 B - w2 B^2), (1 - 0.5 B), (1 - B^12). The '*' between a
// coefficient and B, and between factors, is optional: (w1*B), w0 * B^3 x.
// Factors multiply when written side by side, (1 - p1 B)(1 - P1 B^12),
// and take whole powers, (1 - B)^2. A product may also be grouped in
// parentheses: / ((1 - d1 B)(1 - d2 B)) divides by both factors.
//
// An input term is a run of operators followed by its series name:
//
//	w0 x                       gain w0 (a lone coefficient needs no parentheses)
//	w0 B^3 x                   gain w0, dead time 3 samples (B alone: 1 sample)
//	(w0 + w1 B) / (1 - d1 B) x numerator and denominator
//	w0 / (1 - d1 B) / (1 - d2 B) B^2 x   two denominator factors
//	1 x                        unit gain (a lone name is the constant)
//	w0 ((1 - B) x)             the input differenced once before the filter
//
// '/' divides by the one factor after it; the numerator comes first,
// then the denominator factors, each after its own '/' (or grouped in
// parentheses), so that no factor is left whose side is in doubt. B^k
// anywhere among the operators adds k samples of dead time. A term that is a number or a name alone is the constant; a
// negative constant is written with '-' (y = -4.2 + ...). An input term
// cannot be subtracted: put the sign in its numerator, (-w0) x.
//
// # Differencing
//
// Differencing operators are polynomials of fixed numbers with constant
// term 1, written before the output name and, for an input, with the
// series inside parentheses:
//
//	(1 - B) temp = w0 ((1 - B) burner) + a
//	(1 - B)(1 - B^12) sales = w0 B^2 ((1 - B)(1 - B^12) lead) + a
//
// # Noise
//
// The noise term ends with the white-noise symbol a:
//
//	a                           white noise only
//	(1 - t1 B) / (1 - p1 B) a   ARMA(1, 1) noise, written out
//	1 / (1 - p1 B) a            AR(1) noise
//	(1 - t1 B) / (1 - p1 B) / (1 - P1 B^12) a   a seasonal AR factor
//
// Without a noise term the model is noise free (tf.Model.Noise is nil);
// with a alone it is white noise (a zero tf.Noise). The shorthands
//
//	AR(p)       1 / (1 - phi1 B - ... - phip B^p) a
//	MA(q)       (1 - theta1 B - ... - thetaq B^q) a
//	ARMA(p, q)  (1 - theta1 B - ... - thetaq B^q) / (1 - phi1 B - ... - phip B^p) a
//
// stand alone as the noise term and expand to free coefficients named
// phi1..phip and theta1..thetaq, with the Box-Jenkins signs shown (minus
// signs on both polynomials; so the noise satisfies
// N_t = phi1 N_{t-1} + ... + a_t - theta1 a_{t-1} - ...). ARMA(0, 0)
// is white noise. Give them start values or hold them in the where
// clause like any name: ARMA(1, 1) where phi1 ~ 0.5.
//
// # Events
//
// A known event at a known time (a new burner, a changed recipe, a rule
// that took effect, a shutdown) enters as an input whose series is its
// indicator (Box & Tiao 1975), written in place of a series name:
//
//	step(120)                   0 before sample 120, 1 from it on
//	pulse(120)                  1 at sample 120, 0 elsewhere
//	step(2026-03-01T08:00)      the same at a time of the record's clock
//
// It takes operators like any input and needs no data column:
//
//	temp = ... + k step(120)                 an abrupt permanent shift of k
//	temp = ... + k / (1 - d1 B) step(120)    a gradual one, k / (1 - d1) in the end
//	temp = ... + k / (1 - d1 B) pulse(120)   a jump of k that dies out as d1^t
//	temp = ... + k B^2 pulse(120)            a one-off two samples after the event
//
// The time is a whole sample index (0 is the record's first sample) or
// a time written as 2026-03-01 (midnight), 2026-03-01T08:00 or
// 2026-03-01T08:00:30.5, read as UTC (the way package tf/record reads a
// time column without an offset) unless an offset follows, as in
// 2026-03-01T08:00+01:00 (a trailing Z is UTC too). A time becomes a
// sample through the record's start time and sample interval, at fit
// time (tf.Model.EventData): a time between two samples belongs to the
// next sample. The event prints back as written, in the shortest of these
// forms (tf.Event.String), and the input's series name (tf.Input.Series)
// is that text. step and pulse are events only when '(' follows them: a
// series may still be called step. An event takes no differencing
// (a differenced step is a pulse), and the same event twice in one model
// is refused like an input named twice.
//
// # Sample interval
//
// "every 30 s" gives the sample interval, so that responses can be
// reported in time as well as in samples. Without it times are in
// samples. The units are the clock units s, min, h, d and wk (a week, 7
// days) and the calendar units mo (a month), qtr (a quarter, 3 months)
// and yr (a year, 12 months), as in "every 1 mo" for monthly data. A
// calendar unit is not a fixed number of seconds (a month has 28 to 31
// days), so time figures of such a model are reported in the interval's
// own unit only (a dead time of 2 samples at every 1 qtr is 2 qtr, a
// time constant 1.5 samples is 1.5 qtr), and tf.Interval.Seconds reports
// ok = false for it.
//
// # Layout
//
// Spaces, tabs and line breaks may appear between any two tokens; '#'
// starts a comment to the end of the line. The where and every clauses
// follow the equation in any order, each optionally after ';'. Names
// are ASCII letters, digits and '_', not starting with a digit; B, a,
// AR, MA, ARMA, where and every are reserved. Numbers are decimal, with
// an optional exponent: 2, 0.5, .5, 1e-3, 2.5E+4.
//
// # Slips refused
//
// A few texts that would parse as something other than what was nearly
// always meant are refused with a message that says what to write:
//
//	B3 x, (1 - B12)     a coefficient named B and digits: write B^3, B^12
//	(w0 + w1B) x        a coefficient glued to B (a name ending in a digit
//	                    and B, and optional digits): write w1 B, w1 B^2
//	w0 B 3 x, w0 B(3) x B times a whole number: write B^3
//	y = w0 x + e        a lone name meant as noise (e, eps, noise, a_t, ...,
//	                    or AR1, MA2, ARMA11 without parentheses) would be the
//	                    constant: write a, AR(1), ...
//
// and the messages of other slips (z^-3, B**3, b^3, x(t-3), a decimal
// comma, a Laplace s, every 1 minute, every 5 without a unit,
// ARIMA(1, 1, 1), := or "and" in a where clause) name the text to write
// instead.
//
// # Grammar
//
// The grammar below is the one the parser runs: it is printed by the
// participle parser (github.com/alecthomas/participle v2) from the Go
// types in grammar.go, and a test checks that this text and the parser
// agree. Notation: "x" a token written as is, <ident> a name and
// <number> a number (defined below), ( ) grouping, | or, x? optional,
// x* repeated, x+ at least once; (?= x) says that x must come next and
// (?! x) that it must not (without reading it).
//
//	SpecText = Equation (";" | Clause)* .
//	Equation = Factor* <ident> "=" LeadTerm SignedTerm* .
//	LeadTerm = <sign>? Term .
//	SignedTerm = <sign> Term .
//	Term = Shorthand | (Operator* Operand) .
//	Operator = (Coefficient | Delay | ("/" Factor) | ((?! DiffSeries) Factor)) "*"? .
//	Coefficient = (<number> | <ident>)
//	    (?= <ident> | <number> | <event> | "(" | "B" | "/" | "*" | "a") .
//	Operand = Event | <ident> | "a" | DiffSeries | <number> .
//	Event = <event> "(" (<time> | Value) ")" .
//	DiffSeries = "(" Factor ("*"? Factor)* "*"? <ident> ")" .
//	Delay = "B" ("^" Value)? .
//	Factor = "(" (Polynomial | Product) ")" ("^" Value)? .
//	Product = Factor ("*"? Factor)* .
//	Polynomial = <sign>? Monomial SignedMono* .
//	SignedMono = <sign> Monomial .
//	Monomial = (((<number> | <ident>) ("*"? Delay)?) | Delay) .
//	Shorthand = <short> "(" Value ("," Value)* ")" .
//	Clause = ("where" Binding ("," Binding)*) | ("every" Every) .
//	Binding = <ident> ("~" | "=") Value .
//	Every = Value <ident> .
//	Value = "-"? <number> .
//
// A term is its operators and the operand they act on: a series name, a
// differenced series or an event (an input), the noise symbol a (the
// noise term), or, with no operators, a lone number or name (the
// constant). A coefficient is a number or name with more of its term
// after it, so in w0 B x the name w0 is a coefficient and x the series;
// step or pulse before '(' is an event, never a coefficient. The tokens
// are
//
//	<number> = ( digit { digit } [ "." { digit } ] | "." digit { digit } )
//	           [ ( "e" | "E" ) [ "+" | "-" ] digit { digit } ] .
//	<ident>  = letter { letter | digit } .   (not a reserved word, not an <event>)
//	letter   = "A" … "Z" | "a" … "z" | "_" .
//	<sign>   = "+" | "-" .
//	<short>  = "AR" | "MA" | "ARMA" .
//	<event>  = "step" | "pulse" .            (only when the next token is "(")
//	<time>   = digit digit digit digit "-" digit digit "-" digit digit
//	           { letter | digit | ":" | "." | "+" | "-" } .
//
// (in the notation of the Go specification: [ ] optional, { } repeated).
// A <time> is one token from its date to the first other character, so
// that a malformed time is refused whole, with its own message; it must
// then be one of the forms of Events.
// The rules the grammar does not say are checked after parsing, each with
// a message of its own: an input other than an event has at least one
// operator; an event's sample is a whole number from 0 to
// tf.MaxEventIndex and its time a real date and time; a term may
// follow '-' only when it is a number (the constant); at most one
// constant and one noise term; at least one input; numerator factors
// come before denominator factors; the noise term's operators are
// polynomials in parentheses, each after '/' or not, and an optional
// leading 1 (no gain, no dead time); each denominator and noise factor
// has constant term 1 (the number 1, not a name); differencing holds
// numbers only, with constant term 1; one term per power of B in a
// polynomial; powers, dead times and orders are whole numbers (4 or
// 4.0), not negative; AR and MA take one order and ARMA two; a unit is
// one of s, min, h, d, wk, mo, qtr and yr.
//
// # Errors
//
// Model returns an ErrorList of *Error values, each with a position
// (1-based line and column; columns count bytes), a message in the
// spec's terms and the offending line, printed as
//
//	1:22: the constant term of the denominator must be 1, not 2; divide the numerator and the denominator by 2
//	    temp = (w0 + w1 B) / (2 - d1 B) burner
//	                         ^
//
// Every *Error wraps ErrSyntax (not written in the language), ErrModel
// (written correctly but not a valid model: denominator constant term,
// dead time not a whole non-negative number, an event's sample not a
// whole non-negative number, a time that is not a date, an input or
// event named twice, the
// output used as an input, a name used as both a series and a
// coefficient, a name in a differencing operator, an unknown unit, ...)
// or ErrLimit. Check applies the same rules to a model built in code,
// and also refuses what code can hold but text cannot say (a factor
// power below 1, a negative dead time, a free coefficient without a
// name, ...): those errors name the field in Error.Path.
//
// # Limits
//
// A spec is at most MaxSpecLen (64 KiB) long and has at most MaxTokens
// (4096) tokens (comments and spaces are not tokens); each polynomial has
// degree at most MaxDegree (64); a dead time is at most MaxDelay (10000)
// samples; a model has at most MaxInputs (64) inputs; parentheses nest at
// most MaxNesting (8) deep. Length, tokens and nesting are checked before
// parsing (the lexer stops at the first token over the limit), so that
// Model takes time and memory linear in the number of tokens of any
// text, hostile or not, and bounded. The token limit is the one that
// bounds the parser's work: the largest sensible model, MaxInputs inputs
// each a second-order term with a dead time and a start value for every
// coefficient, is about 3,100 tokens.
//
// # Implementation
//
// The participle grammar (grammar.go) is the one parser; build.go turns
// its syntax tree into a tf.Model and checks the rules above, and
// syntax.go words the messages of texts the grammar refuses from
// participle's error: the production it expected and the token where
// it stopped. The lexer is hand-written (lex.go) and hands participle a
// token slice; the parser is built once, when the package is
// initialised, and runs with one token of lookahead.
//
// What a parse costs: participle tries the alternatives of each choice
// on a branch of its own and fills the syntax tree by reflection, about
// 20 allocations and 2 to 4 KB per token. The benchmark's spec (two
// inputs, ARMA(2, 1) noise, start values and an interval: 50 tokens)
// takes 1,141 allocations, 102 KB and 75 to 89 us on a quiet 2-core
// machine (load 0.3; up to 0.3 ms when the machine is loaded); the
// costliest texts at MaxTokens, factors nested MaxNesting deep, take
// about 16 MB, and a longer hostile one is refused by the lexer with
// 0.6 MB. A spec is read once per configuration load, so the grammar is
// kept as narrow and as readable as the language rather than shaped for
// participle's search (fewer, wider productions, no lookahead on
// coefficients), which would cut the allocations further.
//
//	go test ./parse -run '^$' -bench 'Model$|Hostile|Nested' -cpu 1 -benchmem
package parse
