package main

import (
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
)

// driveFigures are the ids of the figures of driveSection and
// dynamicsSection, which every command's report opens with.
var driveFigures = []string{"drive", "dynamics-offset-up", "dynamics-offset-down", "dynamics-velocity-up", "dynamics-velocity-down", "dynamics-ground"}

// readReport checks the page a command wrote with --report dir: it holds
// the command line that reproduces it, every figure id of ids, exactly
// figures figures, and each string of texts (HTML-escaped as on the page).
func readReport(t *testing.T, dir, command string, ids []string, figures int, texts ...string) {
	t.Helper()
	b, err := os.ReadFile(filepath.Join(dir, "report.html"))
	if err != nil {
		t.Fatal(err)
	}
	page := string(b)
	if text := regexp.MustCompile(`<[^>]*>`).ReplaceAllString(page, ""); !strings.Contains(text, command) {
		t.Errorf("report lacks the command %q", command)
	}
	for _, id := range ids {
		if !strings.Contains(page, `id="`+id+`"`) {
			t.Errorf("report lacks the figure %q", id)
		}
	}
	for _, s := range texts {
		if !strings.Contains(page, s) {
			t.Errorf("report lacks %q", s)
		}
	}
	if n := strings.Count(page, "<figure"); n != figures {
		t.Errorf("report has %d figures, want %d", n, figures)
	}
}
