package parse

import (
	"strings"

	"github.com/backshift/backshift/tf"
)

// Spec is a model spec as a value for configuration: it implements
// encoding.TextMarshaler and encoding.TextUnmarshaler, so it can be a
// field of a JSON, YAML or TOML config struct, or a command-line flag
// through flag.TextVar.
//
// The zero Spec holds the zero tf.Model and marshals to the empty text;
// empty text (or text holding only spaces and comments) unmarshals to the
// zero Spec, so an optional model may be left out of a config file. Use
// IsZero to tell.
type Spec struct {
	Model tf.Model
}

// MarshalText returns the canonical spec text of s.Model (tf.Model.String),
// or no text for the zero Spec. It fails with the error of Check when the
// model is not one a spec can say (a NaN coefficient, a negative dead
// time, ...), so that no file is written that would read back as another
// model or not at all.
func (s Spec) MarshalText() ([]byte, error) { return s.AppendText(nil) }

// AppendText appends the text MarshalText returns to b; on error it
// returns b unchanged.
func (s Spec) AppendText(b []byte) ([]byte, error) {
	if s.IsZero() {
		return b, nil
	}
	if err := Check(s.Model); err != nil {
		return b, err
	}
	return append(b, s.Model.String()...), nil
}

// UnmarshalText parses text with Model and stores the result in s. On
// failure it returns the ErrorList of Model and leaves s unchanged.
func (s *Spec) UnmarshalText(text []byte) error {
	str := string(text)
	if isBlank(str) {
		*s = Spec{}
		return nil
	}
	m, err := Model(str)
	if err != nil {
		return err
	}
	s.Model = m
	return nil
}

// String returns the canonical spec text, as MarshalText.
func (s Spec) String() string {
	if s.IsZero() {
		return ""
	}
	return s.Model.String()
}

// IsZero reports whether s holds no model (an empty output name).
func (s Spec) IsZero() bool { return s.Model.Output == "" }

// isBlank reports whether s holds only spaces, line breaks and comments.
func isBlank(s string) bool {
	for len(s) > 0 {
		switch c := s[0]; {
		case c == ' ' || c == '\t' || c == '\r' || c == '\n':
			s = s[1:]
		case c == '#':
			i := strings.IndexByte(s, '\n')
			if i < 0 {
				return true
			}
			s = s[i:]
		default:
			return false
		}
	}
	return true
}

// MustModel is Model for specs written in code, such as tests and
// examples; it panics with the error when spec does not parse.
func MustModel(spec string) tf.Model {
	m, err := Model(spec)
	if err != nil {
		panic(err)
	}
	return m
}
