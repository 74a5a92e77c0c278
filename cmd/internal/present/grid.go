package present

import (
	"fmt"
	"io"

	"rampart/cmd/internal/report"
)

// Grid is a table's cells, rendered either on the terminal (tablewriter)
// or into a report, so that both show the same numbers.
type Grid struct {
	caption string
	header  []string
	rows    [][]string
}

func NewGrid(caption string, header ...string) *Grid { return &Grid{caption: caption, header: header} }

func (g *Grid) Append(cells ...string) { g.rows = append(g.rows, cells) }

// Render prints the grid as a terminal table.
func (g *Grid) Render(w io.Writer) error {
	t := NewTable(w, g.header...)
	for _, r := range g.rows {
		t.Append(r)
	}
	return t.Render()
}

// RenderNoted prints the grid as a terminal table, then a blank line and
// the notes that explain it, a line each.
func (g *Grid) RenderNoted(w io.Writer, notes []string) error {
	if err := g.Render(w); err != nil {
		return err
	}
	fmt.Fprintln(w)
	for _, line := range notes {
		fmt.Fprintln(w, line)
	}
	return nil
}

// Table returns the grid as a report table.
func (g *Grid) Table() report.Table {
	return report.Table{Caption: g.caption, Header: g.header, Rows: g.rows}
}
