package plural

import "testing"

// TestCount checks the English rule (common practice): singular for one,
// plural for zero and for more, an irregular plural when given.
func TestCount(t *testing.T) {
	for _, tc := range []struct {
		n      int
		noun   string
		plural []string
		want   string
	}{
		{0, "ramp", nil, "0 ramps"},
		{1, "ramp", nil, "1 ramp"},
		{2, "ramp", nil, "2 ramps"},
		{-1, "degree", nil, "-1 degree"},
		{1, "entry", []string{"entries"}, "1 entry"},
		{3, "entry", []string{"entries"}, "3 entries"},
		{20, "site", nil, "20 sites"},
	} {
		if got := Count(tc.n, tc.noun, tc.plural...); got != tc.want {
			t.Errorf("Count(%d, %q, %v) = %q, want %q", tc.n, tc.noun, tc.plural, got, tc.want)
		}
	}
	if got := Noun(1, "realisation"); got != "realisation" {
		t.Errorf("Noun(1) = %q", got)
	}
	if got := Noun(7, "realisation"); got != "realisations" {
		t.Errorf("Noun(7) = %q", got)
	}
}
