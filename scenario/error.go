package scenario

import "fmt"

// Error is a problem with a scenario: a TOML syntax error, an unknown key, a
// wrong type, a value out of range or values that do not fit together.
type Error struct {
	File string // the scenario file as named by the caller
	Line int    // line of the offending key or value, 0 if the decoder does not give one
	Flag string // the "table.key=value" override the value came from, if any
	Key  string // dotted key such as "ring.sites"; empty for the file as a whole
	Err  error  // what is wrong and what would be accepted
}

func (e *Error) Error() string {
	where := fmt.Sprintf("scenario %q", e.File)
	switch {
	case e.Flag != "":
		where = fmt.Sprintf("--set %s", e.Flag)
	case e.Line > 0:
		where += fmt.Sprintf(" line %d", e.Line)
	}
	return where + ": " + e.Err.Error()
}

func (e *Error) Unwrap() error { return e.Err }
