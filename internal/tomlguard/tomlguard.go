// Package tomlguard checks a TOML document's shape before it is decoded.
// rampart's scenario and spec schemas are flat (tables of scalar keys and
// two-element arrays), but a TOML decoder spends time and memory that grow
// steeply with nesting: 40 KB of nested inline tables took over 100 s to
// decode and 120 KB exhausted 10 GB. Check refuses, in linear time, any
// document nested deeper than a flat schema can use.
package tomlguard

import (
	"bytes"
	"fmt"
	"unicode/utf8"
)

// MaxDepth is the deepest bracket nesting Check accepts: an array inside an
// inline table inside an array ([[x]] headers count 2, a band [a, b] 1),
// twice what the schemas use.
const MaxDepth = 4

// MaxLine bounds a line of a scenario or spec file; the longest real line
// (a comment or a file path) is well under a kilobyte.
const MaxLine = 16 << 10

// Error is a document refused by Check, at a line (1-based).
type Error struct {
	Line int
	Msg  string
}

func (e *Error) Error() string { return fmt.Sprintf("line %d: %s", e.Line, e.Msg) }

// Check scans data once, skipping strings and comments, and returns an
// *Error at the first point where brackets ([ and {) nest deeper than
// MaxDepth, or a line is longer than MaxLine bytes; before that, at the
// first byte that is not UTF-8, which a TOML document must be (TOML 1.0,
// "Spec": "A TOML file must be a valid UTF-8 encoded Unicode document").
// The decoder would skip a UTF-16 byte-order mark and read on, and quote
// invalid bytes elsewhere without their line.
func Check(data []byte) error {
	if err := checkUTF8(data); err != nil {
		return err
	}
	line, lineStart, depth := 1, 0, 0
	for i := 0; i < len(data); i++ {
		c := data[i]
		switch {
		case c == '\n':
			line++
			lineStart = i + 1
			continue
		case c == '#':
			for i+1 < len(data) && data[i+1] != '\n' {
				i++
			}
		case c == '"' || c == '\'':
			end, nl := skipString(data, i)
			line += nl
			if nl > 0 {
				lineStart = end // approximate: a multi-line string's last line
			}
			i = end - 1
		case c == '[' || c == '{':
			if depth++; depth > MaxDepth {
				return &Error{line, fmt.Sprintf("brackets nested %d deep: a scenario or spec holds tables of plain values, nested at most %d deep", depth, MaxDepth)}
			}
		case c == ']' || c == '}':
			if depth > 0 {
				depth--
			}
		}
		if i-lineStart > MaxLine {
			return &Error{line, fmt.Sprintf("line longer than %d bytes", MaxLine)}
		}
	}
	return nil
}

// skipString returns the index just past the string starting at data[i]
// (a basic or literal string, single- or multi-line) and the newlines in it.
// An unterminated string runs to the end; the decoder reports it.
func skipString(data []byte, i int) (end, newlines int) {
	q := data[i]
	multi := i+2 < len(data) && data[i+1] == q && data[i+2] == q
	j := i + 1
	if multi {
		j = i + 3
	}
	for j < len(data) {
		c := data[j]
		switch {
		case c == '\\' && q == '"':
			j += 2
			continue
		case c == '\n':
			newlines++
			if !multi {
				return j, newlines - 1 // the decoder reports the broken string
			}
		case c == q && !multi:
			return j + 1, newlines
		case c == q && j+2 < len(data) && data[j+1] == q && data[j+2] == q:
			j += 3
			for j < len(data) && data[j] == q { // up to two quotes may close the content
				j++
			}
			return j, newlines
		}
		j++
	}
	return len(data), newlines
}

// checkUTF8 returns an *Error at the first byte of data that is not UTF-8.
func checkUTF8(data []byte) error {
	if utf8.Valid(data) {
		return nil
	}
	if bytes.HasPrefix(data, []byte("\xff\xfe")) || bytes.HasPrefix(data, []byte("\xfe\xff")) {
		return &Error{1, "the file starts with a UTF-16 byte-order mark (bytes 0xff 0xfe or 0xfe 0xff): save it as UTF-8"}
	}
	for i := 0; i < len(data); {
		r, n := utf8.DecodeRune(data[i:])
		if r == utf8.RuneError && n <= 1 {
			line := 1 + bytes.Count(data[:i], []byte("\n"))
			col := i - (bytes.LastIndexByte(data[:i], '\n') + 1) + 1
			return &Error{line, fmt.Sprintf("byte 0x%02x at column %d is not UTF-8: save the file as UTF-8", data[i], col)}
		}
		i += n
	}
	return nil
}
