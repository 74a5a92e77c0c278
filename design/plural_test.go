package design

import (
	"strings"
	"testing"
)

// TestRobustCounts: the evaluation and term counts of a refused setting
// are written in the number they ask for (internal/plural).
func TestRobustCounts(t *testing.T) {
	err := Robust{Terms: 1, MaxEvals: 1, Objective: Objective{Name: ObjectiveP05}}.Validate()
	if err == nil || !strings.HasPrefix(err.Error(), "1 evaluation for 1 term: want at least 3") {
		t.Errorf("1 evaluation, 1 term: %v", err)
	}
	err = Robust{Terms: 2, MaxEvals: 3, Objective: Objective{Name: ObjectiveP05}}.Validate()
	if err == nil || !strings.HasPrefix(err.Error(), "3 evaluations for 2 terms: want at least 4") {
		t.Errorf("3 evaluations, 2 terms: %v", err)
	}
}
