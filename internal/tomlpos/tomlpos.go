// Package tomlpos helps strict TOML readers say where and what a bad value
// is: the line of a key, a value by its path, and values and their types as
// a message shows them.
package tomlpos

import (
	"bytes"
	"errors"
	"fmt"
	"math"
	"rampart/internal/boundedread"
	"rampart/internal/plural"
	"reflect"
	"strconv"
	"strings"
	"time"

	"github.com/BurntSushi/toml"
)

// ErrorLine returns the line of a decoding error of data. BurntSushi/toml
// v1.6 reports an unexpected newline on the line after it ("[ring" on line
// 1 came back as line 2, "got '\n'"), while its byte offset is right; the
// line is counted here from the offset. The decoder drops a leading UTF-8
// byte-order mark before counting offsets, which is added back. An offset
// out of range keeps the decoder's line.
func ErrorLine(data []byte, pos toml.Position) int {
	start := pos.Start
	if bytes.HasPrefix(data, []byte("\xef\xbb\xbf")) {
		start += 3
	}
	if start < 0 || start >= len(data) {
		return pos.Line
	}
	return 1 + bytes.Count(data[:start], []byte("\n"))
}

// Line returns the line of the key at path in data (decoded with metadata
// md), or 0 if it cannot be told.
//
// BurntSushi/toml keeps key positions private but reports one in the error
// of an Unmarshaler: decoding into a struct that reaches only path, with a
// probe that always fails, makes the decoder name the line. The decoder
// matches keys case-insensitively, so when a sibling differs only in case
// the answer could be either key's line and none is given.
func Line(data []byte, md toml.MetaData, path []string) int {
	for _, k := range md.Keys() {
		for i := 0; i < len(k) && i < len(path); i++ {
			if k[i] != path[i] {
				if strings.EqualFold(k[i], path[i]) {
					return 0
				}
				break
			}
		}
	}
	t := reflect.TypeFor[probe]()
	for i := len(path) - 1; i >= 0; i-- {
		t = reflect.StructOf([]reflect.StructField{{Name: "F", Type: t, Tag: reflect.StructTag(fmt.Sprintf("toml:%q", path[i]))}})
	}
	_, err := toml.Decode(string(data), reflect.New(t).Interface())
	var pe toml.ParseError
	if errors.As(err, &pe) && pe.Message == errProbe.Error() {
		return pe.Position.Line
	}
	return 0
}

type probe struct{}

var errProbe = errors.New("probe")

func (probe) UnmarshalTOML(any) error { return errProbe }

// Lookup returns the value at path in a decoded TOML document, or nil.
func Lookup(m map[string]any, path []string) any {
	var v any = m
	for _, p := range path {
		t, ok := v.(map[string]any)
		if !ok {
			return nil
		}
		v = t[p]
	}
	return v
}

// Show renders a decoded TOML value for a message. A float that looks like
// an integer keeps a ".0", which would otherwise puzzle "want an integer".
// maxShow bounds the bytes of a string value Show quotes.
const maxShow = 80

func Show(v any) string {
	switch x := v.(type) {
	case string:
		return strconv.Quote(boundedread.Excerpt(x, maxShow)) // never echo a whole file
	case float64:
		switch {
		case math.IsNaN(x):
			return "nan"
		case math.IsInf(x, 1):
			return "inf"
		case math.IsInf(x, -1):
			return "-inf"
		}
		f := strconv.FormatFloat(x, 'g', -1, 64)
		if !strings.ContainsAny(f, ".e") {
			f += ".0"
		}
		return f
	case int64:
		return strconv.FormatInt(x, 10)
	case bool:
		return strconv.FormatBool(x)
	case []any:
		var parts []string
		for i, e := range x {
			if i == 4 {
				parts = append(parts, fmt.Sprintf("... (%s)", plural.Count(len(x), "element")))
				break
			}
			parts = append(parts, Show(e))
		}
		return "[" + strings.Join(parts, ", ") + "]"
	case map[string]any:
		return "{...}"
	}
	return fmt.Sprint(v)
}

// TypeName names the TOML type of a decoded value, with its article.
func TypeName(v any) string {
	switch v.(type) {
	case string:
		return "a string"
	case float64:
		return "a float"
	case int64:
		return "an integer"
	case bool:
		return "a boolean"
	case []any, []map[string]any:
		return "an array"
	case map[string]any:
		return "a table"
	case time.Time:
		return "a date or time"
	}
	return fmt.Sprintf("a %T", v)
}
