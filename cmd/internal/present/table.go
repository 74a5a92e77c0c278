package present

import (
	"io"
	"strconv"
	"strings"

	"github.com/olekukonko/tablewriter"
	"github.com/olekukonko/tablewriter/renderer"
	"github.com/olekukonko/tablewriter/tw"
)

// NewTable returns an ASCII table with the given header. The first column
// (labels) and a column headed "Unit" are aligned left, the others (values)
// right.
func NewTable(w io.Writer, header ...string) *tablewriter.Table {
	align := make([]tw.Align, len(header))
	for i, h := range header {
		align[i] = tw.AlignRight
		if i == 0 || h == "Unit" {
			align[i] = tw.AlignLeft
		}
	}
	t := tablewriter.NewTable(w,
		tablewriter.WithRenderer(renderer.NewBlueprint(tw.Rendition{Symbols: tw.NewSymbols(tw.StyleASCII)})),
		tablewriter.WithHeaderAutoFormat(tw.Off),
		tablewriter.WithHeaderAlignmentConfig(tw.CellAlignment{PerColumn: align}),
		tablewriter.WithRowAlignmentConfig(tw.CellAlignment{PerColumn: align}),
	)
	t.Header(header)
	return t
}

// Sig formats x with n significant digits, in exponent form when x is very
// small or large.
func Sig(x float64, n int) string { return strconv.FormatFloat(x, 'g', n, 64) }

// Sci formats x in exponent form with n significant digits.
func Sci(x float64, n int) string { return strconv.FormatFloat(x, 'e', n-1, 64) }

// Fixed formats x with n digits after the decimal point.
//
// A value that rounds to zero prints without a sign: never "-0.000".
func Fixed(x float64, n int) string {
	s := strconv.FormatFloat(x, 'f', n, 64)
	if strings.HasPrefix(s, "-") && strings.Trim(s, "-0.") == "" {
		return s[1:]
	}
	return s
}

func YesNo(b bool) string {
	if b {
		return "yes"
	}
	return "no"
}
