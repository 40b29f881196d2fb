// Package record reads a CSV record of series with a time column into the
// data map the tf package fits to: the series by name, oldest first, with
// the sample interval taken from the time column and the rows checked to
// be evenly spaced with none missing.
//
// The models of tf are in samples: a record with rows deleted from the
// middle fits without complaint to wrong estimates. Read therefore finds
// every place where the time between two rows is not one interval (a
// [Break]) and refuses the record with a *GapError naming the lines,
// unless Settings.Gaps chooses a remedy: fill gaps of up to N missing
// samples by holding the last value or on a straight line, or keep only
// the longest evenly spaced stretch. [Record.Notes] says what was done.
//
// # The file
//
// A header line of column names, then one line per sample; lines
// starting with # are comments; a UTF-8 byte order mark is dropped and a
// file whose lines end in a carriage return alone is read line by line.
// Only the columns named in Settings.Series are read as numbers, so a
// column of notes is no obstacle. Every cell of them must be a finite
// number, except in the columns named in Settings.Missing, whose empty,
// NaN, NA and N/A cells (a sensor's dropout as a logger writes it) are
// read as NaN for a fit that skips them (the output, by exact
// likelihood); Record.Notes lists them by line.
//
// # The time column
//
// It holds numbers (seconds, or the unit of Settings.TimeUnit or of the
// column's name: "minute", "time (h)", "time_s") or calendar times:
// RFC 3339 timestamps (2026-01-01T10:00:00Z, also with a space for the T,
// with fractional seconds, or without a zone, read as UTC) or dates alone
// (2026-01-01). By default it is the first column when its first cell is
// a calendar time or its name announces a time over numbers. The
// interval is the median step between rows, written in the largest unit
// (s, min, h, d) it is a whole number of. A step counts as one interval
// when it is within 1 % of it, so that timestamps rounded to the
// logger's resolution pass while a step of 1.5 intervals does not (our
// choice, stated here as the threshold).
//
// # Errors
//
// A problem at a place in the file is a *LineError (file, line, column)
// that unwraps to a kind: ErrFormat for text that is not a CSV record of
// the expected shape, ErrSample for a cell that is not a finite number or
// a time, ErrName for a column name that is empty or repeated, ErrShort
// for an empty file or a header without data lines. A named
// series missing from the file is a *SeriesError of kind ErrName, a bad
// setting a *SettingError, and gaps without a remedy a *GapError (kind
// ErrSample). Messages name the settings as Settings.Gaps and so on, or
// by the words a program gives in Settings.Names (a command line's
// flags).
package record
