package report

import (
	"bytes"
	"encoding/xml"
	"errors"
	"fmt"
	"html/template"
	"io"
	"strings"
)

// Elements that would run code, embed another document or play media are
// not allowed in an inlined figure.
var forbidden = map[string]bool{
	"script": true, "foreignObject": true, "iframe": true, "object": true,
	"embed": true, "audio": true, "video": true, "animate": true, "set": true,
}

// inlineSVG checks that svg is one well-formed <svg> element, after at most
// an XML declaration, comments and white space, with no forbidden element,
// no event-handler attribute and no link out of the page (href values must
// be "#..." or "data:" URLs, CSS url() must point inside the page). It
// returns the <svg> element alone, ready to inline.
func inlineSVG(svg []byte) (template.HTML, error) {
	if len(bytes.TrimSpace(svg)) == 0 {
		return "", errors.New("no SVG")
	}
	d := xml.NewDecoder(bytes.NewReader(svg))
	start := int64(-1)
	depth := 0
	for {
		offset := d.InputOffset()
		tok, err := d.Token()
		if err == io.EOF {
			break
		}
		if err != nil {
			return "", fmt.Errorf("SVG is not well-formed: %w", err)
		}
		switch tok := tok.(type) {
		case xml.StartElement:
			if depth == 0 {
				if start >= 0 {
					return "", errors.New("SVG has more than one root element")
				}
				if tok.Name.Local != "svg" {
					return "", fmt.Errorf("SVG root element is <%s>, want <svg>", tok.Name.Local)
				}
				start = offset
			}
			depth++
			if forbidden[tok.Name.Local] {
				return "", fmt.Errorf("SVG has a <%s> element", tok.Name.Local)
			}
			for _, a := range tok.Attr {
				if err := checkAttr(tok.Name.Local, a); err != nil {
					return "", err
				}
			}
		case xml.EndElement:
			depth--
		case xml.CharData:
			if depth == 0 && len(bytes.TrimSpace(tok)) > 0 {
				return "", errors.New("SVG has text outside its root element")
			}
		case xml.Directive:
			return "", errors.New("SVG has a <!...> directive (such as a DOCTYPE)")
		}
	}
	if start < 0 {
		return "", errors.New("SVG has no <svg> element")
	}
	return template.HTML(bytes.TrimSpace(svg[start:])), nil
}

func checkAttr(elem string, a xml.Attr) error {
	name := strings.ToLower(a.Name.Local)
	switch {
	case strings.HasPrefix(name, "on"):
		return fmt.Errorf("SVG <%s> has an event handler %q", elem, a.Name.Local)
	case name == "href" || name == "src":
		if !strings.HasPrefix(a.Value, "#") && !strings.HasPrefix(a.Value, "data:") {
			return fmt.Errorf("SVG <%s> links out of the page: %s=%q", elem, a.Name.Local, a.Value)
		}
	}
	for rest := strings.ToLower(a.Value); ; {
		i := strings.Index(rest, "url(")
		if i < 0 {
			break
		}
		rest = strings.TrimLeft(rest[i+4:], " '\"")
		if !strings.HasPrefix(rest, "#") && !strings.HasPrefix(rest, "data:") {
			return fmt.Errorf("SVG <%s> links out of the page in %s", elem, a.Name.Local)
		}
	}
	return nil
}
