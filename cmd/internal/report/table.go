package report

import (
	"fmt"
	"strings"
	"unicode"
)

// tableOf checks t and lays out its cells with their alignment classes.
func tableOf(t Table, number int) (tableView, error) {
	cols := len(t.Header)
	if cols == 0 && len(t.Rows) > 0 {
		cols = len(t.Rows[0])
	}
	if cols == 0 {
		return tableView{}, fmt.Errorf("no header and no rows")
	}
	for i, row := range t.Rows {
		if len(row) != cols {
			return tableView{}, fmt.Errorf("row %d has %d cells, want %d like the header", i+1, len(row), cols)
		}
	}
	if t.Align != nil && len(t.Align) != cols {
		return tableView{}, fmt.Errorf("%d alignments for %d columns", len(t.Align), cols)
	}
	class := make([]string, cols)
	for c := range class {
		a := AlignAuto
		if t.Align != nil {
			a = t.Align[c]
		}
		switch a {
		case AlignAuto:
			if numericColumn(t.Rows, c) {
				class[c] = "num"
			}
		case AlignLeft:
		case AlignRight:
			class[c] = "right"
		case AlignCenter:
			class[c] = "center"
		default:
			return tableView{}, fmt.Errorf("column %d: unknown alignment %d", c+1, a)
		}
	}
	tv := tableView{Number: number, Caption: t.Caption}
	for c, h := range t.Header {
		hc := class[c]
		if hc == "num" {
			hc = "right"
		}
		tv.Header = append(tv.Header, cellView{Text: h, Class: hc})
	}
	for _, row := range t.Rows {
		cells := make([]cellView, cols)
		for c, text := range row {
			cells[c] = cellView{Text: text, Class: class[c]}
		}
		tv.Rows = append(tv.Rows, cells)
	}
	return tv, nil
}

// numericColumn reports whether column c has at least one number and
// nothing but numbers and placeholders.
func numericColumn(rows [][]string, c int) bool {
	seen := false
	for _, row := range rows {
		switch s := strings.TrimSpace(row[c]); {
		case placeholder(s):
		case numeric(s):
			seen = true
		default:
			return false
		}
	}
	return seen
}

// placeholder reports whether s stands for a missing value.
func placeholder(s string) bool {
	switch s {
	case "", "-", "–", "—", "n/a":
		return true
	}
	return false
}

// numeric reports whether s reads as a number or a few of them: digits with
// signs, a decimal point, exponents, ×10^ powers, ±, percent, and the
// brackets and commas of an interval such as "[0.95, 0.97]". NaN and Inf,
// as Go prints them, count too.
func numeric(s string) bool {
	switch strings.TrimLeft(s, "+-−") {
	case "NaN", "Inf", "∞":
		return true
	}
	digit := false
	for _, r := range s {
		switch {
		case unicode.IsDigit(r):
			digit = true
		case strings.ContainsRune(".,+-−eE×^±%[]() ", r):
		default:
			return false
		}
	}
	return digit
}
