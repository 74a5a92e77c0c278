package present

import (
	"fmt"
	"io"
	"strings"

	"rampart/design"
)

// EdgeReport is the result of rampart edge: the search's outcome for the
// key, against the spec.
type EdgeReport struct {
	Scenario string `json:"scenario"`
	Key      string `json:"key"`
	Spec     string `json:"spec"`
	Samples  int    `json:"samples"`
	Seed     uint64 `json:"seed"`
	design.EdgeResult
}

// EdgeGrid returns the table of the evaluated points in the order tried.
func EdgeGrid(rep EdgeReport) *Grid {
	g := NewGrid("The points the search qualified, in order", "Step", rep.Key, "Verdict", "Deciding criteria")
	for i, ev := range rep.Evaluations {
		g.Append(fmt.Sprint(i+1), Sig(ev.Value, 6), ev.Qualification.Verdict.String(), strings.Join(Deciding(ev.Qualification), "; "))
	}
	return g
}

// EdgeLines say what was found, with the bracket and the confidence.
func EdgeLines(rep EdgeReport) []string {
	which := "smallest"
	if rep.Largest {
		which = "largest"
	}
	// The level is set by the points the plan allows, not those made.
	m := (1 - rep.Confidence) / (1 - rep.PointConfidence)
	conf := fmt.Sprintf("%s %% for the search as a whole (each of up to %.0f points qualified at %s %%, Bonferroni)",
		Sig(100*rep.Confidence, 4), m, Sig(100*rep.PointConfidence, 5))
	if !rep.Found {
		ev := rep.Evaluations[0]
		return []string{fmt.Sprintf("No value of %s in the range meets spec %s: at %s the verdict is %s (%s).",
			rep.Key, rep.Spec, Sig(ev.Value, 6), ev.Qualification.Verdict, strings.Join(Deciding(ev.Qualification), "; ")), "Confidence: " + conf + "."}
	}
	out := []string{fmt.Sprintf("The %s %s that meets spec %s: %s, bracket [%s, %s]; the verdict there: %s.",
		which, rep.Key, rep.Spec, Sig(rep.Value, 6), Sig(rep.Bracket[0], 6), Sig(rep.Bracket[1], 6), rep.At.Verdict)}
	for _, c := range rep.At.Criteria {
		f := criterionFormat(c)
		out = append(out, fmt.Sprintf("  %s: %s, one-sided bounds %s, limit %s", c.Name, f(c.Value), criterionBounds(c, f), f(c.Limit)))
	}
	return append(out, "Confidence: "+conf+".",
		"Fail and undecided both count as not meeting the spec, so the bracket leans to the safe side; the range is assumed to hold one edge.")
}

// PrintEdge prints the search's points and its outcome.
func PrintEdge(w io.Writer, rep EdgeReport) error {
	if err := EdgeGrid(rep).Render(w); err != nil {
		return err
	}
	fmt.Fprintln(w)
	for _, l := range EdgeLines(rep) {
		fmt.Fprintln(w, l)
	}
	return nil
}
