// Package present is the presentation layer of the rampart commands: the
// terminal tables, the notes under them, the sections and figures of the
// HTML reports and the CSV and JSON files a run directory holds. It turns
// the library's results (packages mc, sim and scenario) into text and
// pictures and decides nothing: every number it prints was computed in the
// library.
package present
