// Package plural writes a count with its noun in English, "1 site" and
// "20 sites", for every message and table of rampart that prints a count.
package plural

import "strconv"

// Count returns n and the noun: the singular for n = 1 and -1, the plural
// otherwise (0 sites, 2 sites; the usual English rule). The plural is the
// noun with "s" appended, or the form given as plural[0] for an irregular
// noun ("entry", "entries").
func Count(n int, noun string, plural ...string) string {
	return strconv.Itoa(n) + " " + Noun(n, noun, plural...)
}

// Noun returns the noun alone in the number n asks for, for a count that
// is printed apart from its noun ("%d of %d realisations").
func Noun(n int, noun string, plural ...string) string {
	if n == 1 || n == -1 {
		return noun
	}
	if len(plural) > 0 {
		return plural[0]
	}
	return noun + "s"
}
