package main

import (
	"fmt"
	"io"
	"rampart/internal/boundedread"
	"rampart/internal/version"
	"strings"

	"github.com/spf13/cobra"

	"rampart/cmd/internal/report"
	"rampart/scenario"
)

// addReportFlag adds --report DIR.
func addReportFlag(cmd *cobra.Command, dir *string) {
	cmd.Flags().StringVar(dir, "report", "", "write a self-contained HTML report (figures inline, no network) to `DIR`/report.html")
}

// newReport starts the report of a command on a scenario: the title, the
// exact command line that reproduces it, the seed and the scenario's text.
func newReport(e env, title string, sc *scenario.Scenario, text string, sets []string, seed uint64) *report.Report {
	if len(sets) > 0 {
		text += "\n# overridden on the command line:\n"
		for _, s := range sets {
			text += "#   --set " + s + "\n"
		}
	}
	return &report.Report{
		Title:    title,
		Subtitle: "Scenario " + sc.Name,
		Command:  commandLine(e.args),
		Seed:     seed,
		Scenario: text,
		// The build, so that a signed-off page says what produced it.
		Generated: "by rampart " + version.Get().String(),
	}
}

// scenarioText returns the text of the scenario file at path.
func scenarioText(path string) string {
	b, err := boundedread.ReadFile(path, boundedread.TextCap)
	if err != nil {
		return ""
	}
	return string(b)
}

// commandLine quotes args for a POSIX shell.
func commandLine(args []string) string {
	parts := []string{"rampart"}
	for _, a := range args {
		if a != "" && strings.IndexFunc(a, func(r rune) bool {
			return !(r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z' || r >= '0' && r <= '9' || strings.ContainsRune("-_./=:,+", r))
		}) < 0 {
			parts = append(parts, a)
			continue
		}
		parts = append(parts, "'"+strings.ReplaceAll(a, "'", `'\''`)+"'")
	}
	return strings.Join(parts, " ")
}

// writeReport writes r to dir, the value of --report, and says where.
func writeReport(stderr io.Writer, r *report.Report, dir string) error {
	path, err := r.Write(dir)
	if err != nil {
		return fmt.Errorf("--report %s: %w", dir, err)
	}
	fmt.Fprintf(stderr, "wrote the report to %s\n", path)
	return nil
}
