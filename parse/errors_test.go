package parse

import (
	"errors"
	"strings"
	"testing"

	"github.com/backshift/backshift/tf"
)

// errorCases are malformed specs with the exact first error each must
// give: position (line, byte column), kind and message.
// longDigits is a 400-digit run, for numbers and names too long to quote
// whole in a message.
var longDigits = strings.Repeat("9", 400)

var errorCases = []struct {
	spec      string
	line, col int
	kind      error
	msg       string
}{
	{"", 1, 1, ErrSyntax, "the spec is empty; write a model such as y = w0 B x + a"},
	{"# only a comment", 1, 17, ErrSyntax, "the spec is empty; write a model such as y = w0 B x + a"},
	{"= w0 x", 1, 1, ErrSyntax, "expected the output series name, after its differencing if any, as in (1 - B) y = ...; found '='"},
	{"temp w0 x", 1, 6, ErrSyntax, "expected '=' after the output name temp, found name w0"},
	{"temp = ", 1, 8, ErrSyntax, "expected a term after '=', such as w0 B x, found the end of the spec"},
	{"temp = w0 x +", 1, 14, ErrSyntax, "expected a term after '+', such as w0 B x, found the end of the spec"},
	{"temp = (w0 + ) x", 1, 14, ErrSyntax, "expected a coefficient or B after '+', found ')'"},
	{"temp = (w0 w1 B) x", 1, 12, ErrSyntax, "expected '+', '-' or ')' after 'w0': write a sign between the terms of a polynomial"},
	{"temp = (w0 + w1 B x", 1, 20, ErrSyntax, "missing ')' to close the '(' at 1:8"},
	{"temp = w0 x)", 1, 12, ErrSyntax, "')' without a matching '('"},
	{"temp = () x", 1, 9, ErrSyntax, "expected a polynomial after '(', found ')'"},
	{"temp = w0 / 2 x", 1, 13, ErrSyntax, "expected '(' after '/': write a denominator in parentheses, as in / (1 - d1 B); found number 2"},
	{"temp = w0 / (2 - d1 B) x", 1, 13, ErrModel, "the constant term of the denominator must be 1, not 2; divide the numerator and the denominator by 2"},
	{"temp = w0 / (d0 - d1 B) x", 1, 14, ErrModel, "the constant term of the denominator must be the number 1, not the coefficient d0"},
	{"temp = w0 / (- d1 B) x", 1, 13, ErrModel, "the constant term of the denominator must be 1, not 0; write it as (1 + ...)"},
	{"temp = w0 B^1.5 x", 1, 13, ErrModel, "the dead time must be a whole number of samples, not 1.5"},
	{"temp = w0 B^-2 x", 1, 13, ErrModel, "the dead time cannot be negative (here -2); B^k delays a series by k samples, so write B^2 for a dead time of 2 samples"},
	{"temp = w0 B^20000 x", 1, 13, ErrLimit, "the dead time is 20000, over the limit of 10000 samples"},
	{"temp = w0 B^ x", 1, 14, ErrSyntax, "expected a whole number after '^', found name x"},
	{"temp = w0 x + w1 x", 1, 15, ErrModel, "input x appears twice; combine its terms into one transfer function"},
	{"temp = w0 temp", 1, 8, ErrModel, "temp is the output; it cannot also be an input (past outputs enter through the denominators and the noise model, as in w0 / (1 - d1 B) x + 1 / (1 - p1 B) a)"},
	{"temp = w0 x + x B y", 1, 15, ErrModel, "x names both a series and a coefficient; rename one of them"},
	{"temp = w0 x where x = 2", 1, 19, ErrModel, "x is a series, not a coefficient"},
	{"temp = w0 x where w9 ~ 1", 1, 19, ErrModel, "w9 is not a coefficient of this model"},
	{"temp = w0 x where w0 ~ 1, w0 = 2", 1, 27, ErrModel, "w0 is given a value twice"},
	{"temp = w0 x where w0 ~", 1, 23, ErrSyntax, "expected a number after '~', found the end of the spec"},
	{"temp = w0 x where w0 2", 1, 22, ErrSyntax, "expected '~' (start value) or '=' (held value) after w0, found number 2"},
	{"temp = w0 x every 30 sec", 1, 22, ErrModel, "unknown unit \"sec\" for the sample interval; use s, min, h, d, wk, mo, qtr or yr (for seconds write s)"},
	{"temp = w0 x every 30", 1, 21, ErrSyntax, "expected a unit after the sample interval 30, as in every 30 min (units: s, min, h, d, wk, mo, qtr, yr); found the end of the spec"},
	{"temp = w0 x every -3 s", 1, 19, ErrModel, "the sample interval must be a positive number"},
	{"temp = w0 x every 3 s every 4 s", 1, 23, ErrModel, "the sample interval is given twice"},
	{"(1 - k B) temp = w0 x", 1, 6, ErrModel, "the differencing of the output temp takes numbers only, and k is a coefficient name; differencing is not estimated"},
	{"(2 - B) temp = w0 x", 1, 1, ErrModel, "the constant term of the differencing of the output temp must be 1, not 2; a differencing operator starts with 1, as in (1 - B) or (1 - B^12)"},
	{"temp = w0 ((1 - g B) x)", 1, 17, ErrModel, "the differencing of the input x takes numbers only, and g is a coefficient name; differencing is not estimated"},
	{"temp = w0 x + a + a", 1, 19, ErrModel, "a second noise term; a model has at most one"},
	{"temp = 3 + 4 + w0 x", 1, 12, ErrModel, "a second constant term; a model has at most one"},
	{"temp = c + x", 1, 12, ErrModel, "a second constant term; a model has at most one (a lone name is a constant: to feed series x with unit gain write 1 x)"},
	{"temp = - w0 x", 1, 8, ErrModel, "an input term cannot be subtracted; put the sign in its numerator, as in (-w0 - w1 B) x"},
	{"temp = w0 x - a", 1, 13, ErrModel, "the noise term is added, not subtracted"},
	{"temp = 4 + ARMA(1) ", 1, 12, ErrSyntax, "ARMA takes two orders, as in ARMA(p, q)"},
	{"temp = w0 x + ARMA(1, 1, 2)", 1, 15, ErrSyntax, "ARMA takes two orders, as in ARMA(p, q)"},
	{"temp = w0 x + ARMA(1.5, 1)", 1, 20, ErrModel, "the order must be a whole number, not 1.5"},
	{"temp = w0 x + ARMA(70, 1)", 1, 20, ErrLimit, "the order is 70, over the limit of 64"},
	{"temp = w0 x + AR 2", 1, 18, ErrSyntax, "expected '(' after AR, as in AR(1); found number 2"},
	{"temp = w0 x + 2 a", 1, 15, ErrModel, "the noise term takes no gain (its scale is the noise variance; a is the white-noise symbol, not a series); write theta(B) / phi(B) a"},
	{"temp = w0 x + B a", 1, 15, ErrModel, "the noise term takes no dead time"},
	{"temp = w0 x + (1 - t B) / (2 - p B) a", 1, 27, ErrModel, "the constant term of the noise denominator must be 1, not 2; divide the numerator and the denominator by 2"},
	{"temp = w0 (1 - B)^0 x", 1, 19, ErrModel, "the power of a factor must be at least 1, not 0"},
	{"temp = w0 (1 - B^65) x", 1, 18, ErrLimit, "the power of B is 65, over the limit of 64"},
	{"temp = w0 (1 - B)^65 x", 1, 19, ErrLimit, "the power of a factor is 65, over the limit of 64"},
	{"temp = (w0 + w1 B + w2 B) x", 1, 21, ErrModel, "two terms in B^1 in one polynomial; combine them"},
	{"temp = w0 x + (1 - t B) a ARMA", 1, 31, ErrSyntax, "expected '(' after ARMA, as in ARMA(1, 1); found the end of the spec"},
	{"temp = w0 * * x", 1, 13, ErrSyntax, "'*' must stand between two factors"},
	{"temp = * w0 x", 1, 8, ErrSyntax, "'*' must stand between two factors"},
	{"temp = w0 x *", 1, 13, ErrSyntax, "'*' must stand between two factors"},
	{"temp = w0 / (1 - d B) w1 x", 1, 23, ErrModel, "a numerator factor after a denominator is ambiguous: write the numerator first, then each denominator factor after its own '/', as in (w0) / (1 - d1 B) / (1 - d2 B) B x"},
	{"temp = w0 ((1 - B) x) B y", 1, 11, ErrModel, "a differenced series such as ((1 - B) x) must come last in its term"},
	{"temp = w0 x ; ; where", 1, 22, ErrSyntax, "expected a coefficient name after 'where', found the end of the spec"},
	{"temp = w0 é", 1, 11, ErrSyntax, "unexpected character 'é'"},
	{"B = w0 x", 1, 1, ErrSyntax, "B is a reserved word and cannot name the output; expected the output series name, found 'B'"},
	{"temp = w0 x where B = 2", 1, 19, ErrSyntax, "expected a coefficient name after 'where', found 'B'"},
	{"temp = 1e999 + w0 x", 1, 8, ErrSyntax, "number 1e999 is out of range"},
	{"temp = w0 ((1 - B) x)^2", 1, 23, ErrModel, "a power cannot apply to a series; write the power on the differencing, as in ((1 - B)^2 x)"},
	{"temp = ((1 - d B) 3) x", 1, 19, ErrSyntax, "inside these parentheses write either one polynomial or a product of polynomials in parentheses, not both"},
	{"temp = (1 - a) x", 1, 13, ErrModel, "the white-noise symbol a cannot stand inside a polynomial"},
	{"temp = w0 B burner + (w1 B) temp", 1, 22, ErrModel, "temp is the output; it cannot also be an input (past outputs enter through the denominators and the noise model, as in w0 / (1 - d1 B) x + 1 / (1 - p1 B) a)"},
	{"temp = w0 = x", 1, 11, ErrSyntax, "expected '+', '-', where, every or the end of the spec after a term, found '='"},
	{"temp = w0 B x + a; wehre w0 ~ 1", 1, 20, ErrSyntax, "expected '+', '-', where, every or the end of the spec after a term, found name wehre (did you mean where?)"},
	{"temp = w0 B x + a; evry 1 min", 1, 20, ErrSyntax, "expected '+', '-', where, every or the end of the spec after a term, found name evry (did you mean every?)"},
	{"temp = w0 x, w1 y", 1, 12, ErrSyntax, "expected '+', '-', where, every or the end of the spec after a term, found ',' (join terms with '+'; put where and every after a space or ';')"},
	{"temp = (((((((((1))))))))) x", 1, 16, ErrLimit, "parentheses nested more than 8 deep"},
	{"temp = AR(1)", 1, 8, ErrModel, "the model has no input term; write at least one, such as w0 B x"},
	{"temp =\n  (w0 + w1 B)\n  / (1 - d1 B B^4 burner", 3, 25, ErrSyntax, "missing ')' to close the '(' at 3:5"},
	{"# header\ntemp = w0 B^4 burner\n  + 1 / (0.5 - p1 B) a", 3, 9, ErrModel, "the constant term of the noise denominator must be 1, not 0.5; divide the numerator and the denominator by 0.5"},
	{"temp = w0 x\nwhere w0 ~ 1,\n      d1 = 0.5", 3, 7, ErrModel, "d1 is not a coefficient of this model"},
	{"temp = w0 x + w1\t(1 - B) y + a\nevery 1 fortnight", 2, 9, ErrModel, "unknown unit \"fortnight\" for the sample interval; use s, min, h, d, wk, mo, qtr or yr"},
	{"température = w0 x", 1, 5, ErrSyntax, "unexpected character 'é'"},
	{"temp = w0 B^4 burner + (2 - t1 B) a", 1, 24, ErrModel, "the constant term of the noise numerator must be 1, not 2; the noise has no gain (its scale is its variance): write (1 - t1 B ...)"},
	{"temp = (w0 + w1 B + w2 B^2) / ((1 - d1 B)(2 - d2 B)) x", 1, 42, ErrModel, "the constant term of the denominator must be 1, not 2; divide the numerator and the denominator by 2"},
	{"temp = w0 x + (1 - t1 B) / (1 - p1 B) (1 - q B) a", 1, 39, ErrModel, "a numerator factor after a denominator is ambiguous: write the numerator first, then each denominator factor after its own '/', as in (w0) / (1 - d1 B) / (1 - d2 B) B x"},
	{"temp = w0 x + w0 y + (1 - w0 B) a where w0 ~ 1 every 0 s", 1, 54, ErrModel, "the sample interval must be a positive number"},
	{"temp = w0 x + ARMA(2, -1)", 1, 23, ErrModel, "the order cannot be negative (here -1)"},
	{"temp = w0 x + MA(1, 1)", 1, 15, ErrSyntax, "MA takes one order, as in MA(q)"},
	{"temp = w0 x + ARMA (1 1)", 1, 23, ErrSyntax, "expected ',' or ')' in ARMA(p, q), found number 1"},
	{"temp = w0 (1 - B)^1.5 x", 1, 19, ErrModel, "the power of a factor must be a whole number, not 1.5"},
	{"temp = w0 x + (1 - t B)^2 / AR(1) a", 1, 29, ErrSyntax, "expected '(' after '/': write a denominator in parentheses, as in / (1 - d1 B); found 'AR'"},
	{"temp = w0 x where w0 ~ 1e400", 1, 24, ErrSyntax, "number 1e400 is out of range"},
	{"temp = 5 x where", 1, 17, ErrSyntax, "expected a coefficient name after 'where', found the end of the spec"},
	{"temp = w0 x every s", 1, 19, ErrSyntax, "expected the sample interval as a number and a unit, as in every 30 s; found name s"},
	{"temp = w0 x + a where a ~ 1", 1, 23, ErrSyntax, "expected a coefficient name after 'where', found 'a'"},
	{"temp = w0 x; every 5 min; where w0 = 2; every 1 h", 1, 41, ErrModel, "the sample interval is given twice"},
	{"temp = burner", 1, 8, ErrModel, "the model has no input term: a lone name such as burner is the constant; write w0 burner (or 1 burner for unit gain) to make it an input"},
	{"temp = 4 + burner + a", 1, 12, ErrModel, "a second constant term; a model has at most one (a lone name is a constant: to feed series burner with unit gain write 1 burner)"},
	{"temp = w0 b^2 x", 1, 12, ErrSyntax, "expected '+', '-', where, every or the end of the spec after a term, found '^' (the backshift operator is written B, upper case)"},
	{"temp = w0 x + arma(1, 1)", 1, 21, ErrSyntax, "unexpected ',' inside parentheses (write ARMA in upper case)"},
	{"temp = w0 x Where w0 ~ 1", 1, 22, ErrSyntax, "expected '+', '-', where, every or the end of the spec after a term, found '~' (write where in lower case)"},
	{"temp = w0 x + 1e" + longDigits, 1, 15, ErrSyntax, "number 1e" + longDigits[:30] + "... (402 characters) is out of range"},
	{"temp = w0 x where " + longDigits, 1, 19, ErrSyntax, "expected a coefficient name after 'where', found number " + longDigits[:32] + "... (400 characters)"},
	// Slips for a power of B, a unit, the noise term and the like: each
	// names the slip and what to write.
	{"temp = w0 B3 valve", 1, 11, ErrSyntax, "B3 reads as a coefficient name; for B to the power 3 write B^3 (B^3 x delays x by 3 samples)"},
	{"temp = B3 valve + a", 1, 8, ErrSyntax, "B3 reads as a coefficient name; for B to the power 3 write B^3 (B^3 x delays x by 3 samples)"},
	{"temp = w0 / (1 - d1 B1) valve", 1, 21, ErrSyntax, "B1 reads as a coefficient name; for B to the power 1 write B^1 (B^1 x delays x by 1 sample)"},
	{"temp = (w0 + w1B) valve", 1, 14, ErrSyntax, "w1B reads as one coefficient name; put a space between the coefficient and B, as in w1 B"},
	{"temp = (w0 + w1B2) valve", 1, 14, ErrSyntax, "w1B2 reads as one coefficient name; put a space between the coefficient and B, as in w1 B^2"},
	{"temp = w0 B 3 valve", 1, 13, ErrSyntax, "B followed by 3 reads as a delay of one sample times the gain 3; for a dead time of 3 samples write B^3"},
	{"temp = w0 B(3) valve", 1, 12, ErrSyntax, "B followed by 3 reads as a delay of one sample times the gain 3; for a dead time of 3 samples write B^3"},
	{"temp = (w0 + w1 B 2) valve", 1, 19, ErrSyntax, "B followed by 2 is not a power of B: for the term in B^2 write B^2"},
	{"temp = w0 B**3 valve", 1, 12, ErrSyntax, "'**' is not a power here: write a power with '^', as in B^3"},
	{"temp = (1 - d1 B**2) valve", 1, 17, ErrSyntax, "'**' is not a power here: write a power with '^', as in B^3"},
	{"temp = w0 B^{3} valve", 1, 13, ErrSyntax, "unexpected character '{' (write a power without braces, as in B^12)"},
	{"temp = w0 z^-3 valve", 1, 12, ErrSyntax, "expected '+', '-', where, every or the end of the spec after a term, found '^' (the backshift operator is written B: B^3 x is x three samples back, what z^-3 or q^-3 means)"},
	{"temp = w0 x every 1 minute", 1, 21, ErrModel, "unknown unit \"minute\" for the sample interval; use s, min, h, d, wk, mo, qtr or yr (for minutes write min)"},
	{"temp = w0 x every 2 hr", 1, 21, ErrModel, "unknown unit \"hr\" for the sample interval; use s, min, h, d, wk, mo, qtr or yr (for hours write h)"},
	{"temp = w0 x every 1 S", 1, 21, ErrModel, "unknown unit \"S\" for the sample interval; use s, min, h, d, wk, mo, qtr or yr (units are written in lower case: s)"},
	{"temp = w0 x every 100 ms", 1, 23, ErrModel, "unknown unit \"ms\" for the sample interval; use s, min, h, d, wk, mo, qtr or yr (for milliseconds write the interval in seconds, as in every 0.1 s)"},
	{"temp = w0 x + e", 1, 15, ErrModel, "a lone name such as e is read as the constant, not as noise; the white-noise symbol is a, as in + a, + ARMA(1, 1) or + (1 - t1 B) / (1 - p1 B) a"},
	{"temp = c + w0 x + noise", 1, 19, ErrModel, "a lone name such as noise is read as the constant, not as noise; the white-noise symbol is a, as in + a, + ARMA(1, 1) or + (1 - t1 B) / (1 - p1 B) a"},
	{"temp = w0 x + AR1", 1, 15, ErrModel, "a lone name such as AR1 is read as the constant; for the noise shorthand write AR(1)"},
	{"temp = w0 x + ARMA11", 1, 15, ErrModel, "a lone name such as ARMA11 is read as the constant; for the noise shorthand write ARMA(1, 1)"},
	{"temp = w0 x + ARIMA(1, 1, 1)", 1, 22, ErrSyntax, "unexpected ',' inside parentheses (ARIMA is not a shorthand: write the differencing before the output name and the noise as ARMA(p, q), as in (1 - B) y = w0 B x + ARMA(1, 1))"},
	{"temp = w0 x where w0 := 1", 1, 22, ErrSyntax, "unexpected character ':' (the spec language has no ':'; write where w0 ~ 1 for a start value, where w0 = 1 to hold a value, every 30 s for the interval)"},
	{"temp = w0 x + (1 \u2212 t1 B) a", 1, 18, ErrSyntax, "unexpected character '\u2212' (write the minus sign as the ASCII '-')"},
	{"y(t) = w0 x", 1, 2, ErrSyntax, "expected '=' after the output name y, found '(' (write a series by its name alone: y, not y(t))"},
	{"y = w0 B^3 valve every 1,5 min", 1, 25, ErrSyntax, "expected a unit after the sample interval 1, as in every 1 min (units: s, min, h, d, wk, mo, qtr, yr); found ',' (the decimal mark is '.': write 1.5, not 1,5)"},
	{"y = (1 - 0,5 B) x", 1, 11, ErrSyntax, "unexpected ',' inside parentheses (the decimal mark is '.': write 0.5, not 0,5)"},
	{"y = w0 x where w0 = 0,5", 1, 23, ErrSyntax, "expected a coefficient name after ',', found number 5 (the decimal mark is '.': write 0.5, not 0,5)"},
	{"y = K / (1 + T s) x", 1, 16, ErrSyntax, "s is not an operator of the spec language: a spec is in the backshift operator B of discrete time; convert a continuous-time model first, as with tf.FOPDT.Discretize"},
	{"y = K / (1 + T*s) x", 1, 16, ErrSyntax, "s is not an operator of the spec language: a spec is in the backshift operator B of discrete time; convert a continuous-time model first, as with tf.FOPDT.Discretize"},
	{"y = w0 x(t-3)", 1, 9, ErrModel, "a series is written by its name alone, not x(t ...); x three samples back is B^3 x, as in w0 B^3 x"},
	{"y = w0 x where w0 ~ 1 and w1 ~ 2", 1, 23, ErrSyntax, "expected ',', where, every or the end of the spec after a value, found name and (separate the bindings with ',', as in where w0 ~ 1, w1 ~ 2)"},
	{"y = w0 x where w0 ~ 1; w1 ~ 2", 1, 24, ErrSyntax, "expected where, every or the end of the spec after ';', found name w1 (';' ends the where clause: separate its bindings with ',', as in where w0 ~ 1, w1 ~ 2)"},
	{"y = w0 x + w1 y", 1, 12, ErrModel, "y is the output; it cannot also be an input (past outputs enter through the denominators and the noise model, as in w0 / (1 - d1 B) x + 1 / (1 - p1 B) a)"},
	// Events (interventions): bad times, each at the time itself.
	{"y = w step(2026-13-01) + a", 1, 12, ErrModel, "bad time 2026-13-01 for step(...) (month out of range); write a date, or a date and time, as in 2026-03-01, 2026-03-01T08:00 or 2026-03-01T08:00:30, in UTC or with an offset such as +01:00"},
	{"y = w step(2026-02-30) + a", 1, 12, ErrModel, "bad time 2026-02-30 for step(...) (day out of range); write a date, or a date and time, as in 2026-03-01, 2026-03-01T08:00 or 2026-03-01T08:00:30, in UTC or with an offset such as +01:00"},
	{"y = w pulse(2026-03-01T25:00)", 1, 13, ErrModel, "bad time 2026-03-01T25:00 for pulse(...) (hour out of range); write a date, or a date and time, as in 2026-03-01, 2026-03-01T08:00 or 2026-03-01T08:00:30, in UTC or with an offset such as +01:00"},
	{"y = w pulse(2026-03-01T08h00)", 1, 13, ErrModel, "bad time 2026-03-01T08h00 for pulse(...); write a date, or a date and time, as in 2026-03-01, 2026-03-01T08:00 or 2026-03-01T08:00:30, in UTC or with an offset such as +01:00"},
	{"y = w pulse(2026-03-01 08:00)", 1, 26, ErrSyntax, "unexpected character ':' after the time 2026-03-01 (write a date and time as one word with T between them, as in 2026-03-01T08:00)"},
	{"y = w pulse(1.5)", 1, 13, ErrModel, "the sample of an event must be a whole number, not 1.5"},
	{"y = w pulse(-2)", 1, 13, ErrModel, "the sample of an event cannot be negative (here -2)"},
	{"y = w pulse(2000000000)", 1, 13, ErrLimit, "the sample of an event is 2000000000, over the limit of 1073741824"},
	{"y = w step(x) + a", 1, 12, ErrSyntax, "expected the time of the event after 'step(': a sample index as in step(120) or a date and time as in step(2026-03-01T08:00); found name x"},
	{"y = w step() + a", 1, 12, ErrSyntax, "expected the time of the event after 'step(': a sample index as in step(120) or a date and time as in step(2026-03-01T08:00); found ')'"},
	{"y = w step(3, 4) + a", 1, 13, ErrSyntax, "expected ')' after the time of step(...), found ',' (an event has one time, a sample index or a date and time)"},
	{"y = w0 step(3) x", 1, 8, ErrModel, "an event such as step(...) is the series of its term and must come last in it"},
	{"y = w step(3) + v step(3.0)", 1, 17, ErrModel, "input step(3) appears twice; combine its terms into one transfer function"},
	{"y = w x + 2026-03-01", 1, 11, ErrSyntax, "expected a term after '+', such as w0 B x, found time 2026-03-01 (a time stands only in an event, as in step(2026-03-01))"},
}

// TestBadInput: each spec of errorCases, the exact-message table of
// refused specs, gives a *parse.Error of its kind at its line:column with
// its message word for word.
func TestBadInput(t *testing.T) {
	if len(errorCases) < 40 {
		t.Fatalf("only %d error cases", len(errorCases))
	}
	for _, c := range errorCases {
		m, err := Model(c.spec)
		if err == nil {
			t.Errorf("%q: no error, got model %v", c.spec, m)
			continue
		}
		var e *Error
		if !errors.As(err, &e) {
			t.Errorf("%q: error %T is not a *parse.Error", c.spec, err)
			continue
		}
		if e.Pos.Line != c.line || e.Pos.Column != c.col || e.Msg != c.msg || !errors.Is(err, c.kind) || !errors.Is(err, tf.ErrModel) {
			t.Errorf("%q:\n got %d:%d %v %q\nwant %d:%d %v %q", c.spec, e.Pos.Line, e.Pos.Column, e.Kind, e.Msg,
				c.line, c.col, c.kind, c.msg)
		}
		if m.Output != "" || m.Inputs != nil {
			t.Errorf("%q: model not zero on error: %v", c.spec, m)
		}
		// The offset agrees with line and column.
		if e.Pos.Offset > len(c.spec) {
			t.Errorf("%q: offset %d past the end", c.spec, e.Pos.Offset)
		} else {
			start := strings.LastIndexByte(c.spec[:e.Pos.Offset], '\n') + 1
			if e.Pos.Offset-start+1 != e.Pos.Column || strings.Count(c.spec[:e.Pos.Offset], "\n")+1 != e.Pos.Line {
				t.Errorf("%q: offset %d does not match %d:%d", c.spec, e.Pos.Offset, e.Pos.Line, e.Pos.Column)
			}
		}
	}
}
