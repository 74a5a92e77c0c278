// Package report writes a rampart report: one self-contained HTML page with
// the tables, the figures as inline SVG, the scenario file and the exact
// command and seed that reproduce the run.
//
// The page loads nothing: its style is inline, it carries no script, and a
// Content-Security-Policy forbids any fetch, so it reads the same offline,
// from a mail attachment or on paper (the style sheet has print rules).
// Every string is HTML-escaped; figure SVG is checked to be a well-formed
// <svg> document without scripts, event handlers or external links before it
// is inlined. The same Report gives the same bytes: nothing in the page
// depends on the clock unless Generated is set.
package report
