package report

import (
	"bytes"
	"encoding/xml"
	"fmt"
	"io"
	"strings"
)

// dom is what the tests read back from a page, parsed leniently as HTML
// (encoding/xml with HTML void elements and entities): the title, every id,
// the in-page links and every figure.
type dom struct {
	title   string
	ids     []string
	links   []string
	figures []domFigure
}

type domFigure struct {
	id             string
	svgs, captions int
}

func (d dom) figureIDs() []string {
	var out []string
	for _, f := range d.figures {
		out = append(out, f.id)
	}
	return out
}

func parseDOM(page []byte) (dom, error) {
	var d dom
	dec := xml.NewDecoder(bytes.NewReader(page))
	dec.Strict = false
	dec.AutoClose = xml.HTMLAutoClose
	dec.Entity = xml.HTMLEntity
	var fig *domFigure
	inTitle := false
	for {
		tok, err := dec.Token()
		if err == io.EOF {
			break
		}
		if err != nil {
			return d, fmt.Errorf("parse page: %w", err)
		}
		switch tok := tok.(type) {
		case xml.StartElement:
			name := strings.ToLower(tok.Name.Local)
			id := attr(tok, "id")
			if id != "" {
				d.ids = append(d.ids, id)
			}
			switch name {
			case "title":
				inTitle = true
			case "a":
				d.links = append(d.links, attr(tok, "href"))
			case "figure":
				d.figures = append(d.figures, domFigure{id: id})
				fig = &d.figures[len(d.figures)-1]
			case "svg":
				if fig != nil {
					fig.svgs++
				}
			case "figcaption":
				if fig != nil {
					fig.captions++
				}
			}
		case xml.EndElement:
			switch strings.ToLower(tok.Name.Local) {
			case "title":
				inTitle = false
			case "figure":
				fig = nil
			}
		case xml.CharData:
			if inTitle {
				d.title += string(tok)
			}
		}
	}
	return d, nil
}

func attr(e xml.StartElement, name string) string {
	for _, a := range e.Attr {
		if a.Name.Local == name {
			return a.Value
		}
	}
	return ""
}
