package plots

import (
	"bytes"
	"encoding/xml"
	"io"
	"strconv"
	"strings"
	"testing"
)

// svgText is a <text> element of a rendered figure.
type svgText struct {
	Text string
	Y    float64 // in the figure's flipped frame: smaller is higher up
}

// svgDoc is what the tests read back from a rendered SVG: the style of
// every <path> and every <text>.
type svgDoc struct {
	paths []string
	texts []svgText
}

// parseSVG parses svg with encoding/xml, failing the test if it is not
// well-formed or its root is not <svg>.
func parseSVG(t *testing.T, svg []byte) svgDoc {
	t.Helper()
	var doc svgDoc
	d := xml.NewDecoder(bytes.NewReader(svg))
	root := ""
	var text *svgText
	for {
		tok, err := d.Token()
		if err == io.EOF {
			break
		}
		if err != nil {
			t.Fatalf("SVG is not well-formed XML: %v", err)
		}
		switch tok := tok.(type) {
		case xml.StartElement:
			if root == "" {
				root = tok.Name.Local
			}
			switch tok.Name.Local {
			case "path":
				doc.paths = append(doc.paths, attr(tok, "style"))
			case "text":
				y, _ := strconv.ParseFloat(attr(tok, "y"), 64)
				text = &svgText{Y: y}
			}
		case xml.CharData:
			if text != nil {
				text.Text += string(tok)
			}
		case xml.EndElement:
			if tok.Name.Local == "text" && text != nil {
				doc.texts = append(doc.texts, *text)
				text = nil
			}
		}
	}
	if root != "svg" {
		t.Fatalf("SVG root element is <%s>, want <svg>", root)
	}
	return doc
}

func attr(e xml.StartElement, name string) string {
	for _, a := range e.Attr {
		if a.Name.Local == name {
			return a.Value
		}
	}
	return ""
}

// count returns the number of paths whose style holds every one of parts,
// e.g. "fill:#4477AA".
func (d svgDoc) count(parts ...string) int {
	n := 0
outer:
	for _, s := range d.paths {
		for _, p := range parts {
			if !strings.Contains(s, p) {
				continue outer
			}
		}
		n++
	}
	return n
}

// hasText reports whether some <text> element reads exactly s.
func (d svgDoc) hasText(s string) bool {
	_, ok := d.text(s)
	return ok
}

func (d svgDoc) text(s string) (svgText, bool) {
	for _, t := range d.texts {
		if t.Text == s {
			return t, true
		}
	}
	return svgText{}, false
}

// render renders f as SVG and parses it.
func render(t *testing.T, f *Figure) svgDoc {
	t.Helper()
	svg, err := f.SVG()
	if err != nil {
		t.Fatalf("SVG: %v", err)
	}
	return parseSVG(t, svg)
}

// wantTexts fails the test for every string of want that no <text> reads.
func wantTexts(t *testing.T, d svgDoc, want ...string) {
	t.Helper()
	for _, w := range want {
		if !d.hasText(w) {
			t.Errorf("no text %q in the SVG; texts: %v", w, d.texts)
		}
	}
}

// wantError fails the test unless err is non-nil and its message holds
// every one of parts.
func wantError(t *testing.T, err error, parts ...string) {
	t.Helper()
	if err == nil {
		t.Fatalf("got no error, want one mentioning %q", parts)
	}
	for _, p := range parts {
		if !strings.Contains(err.Error(), p) {
			t.Errorf("error %q does not mention %q", err, p)
		}
	}
}
