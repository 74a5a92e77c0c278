package scenario

import (
	"strings"
	"testing"
	"testing/fstest"

	"rampart/noise"
)

// TestRINTable: noise.depth.rin_table gives the budget the table's PSD
// (S_eps = 10^(RIN/10), -120 dB/Hz is 1e-12 1/Hz by the definition of RIN
// in dB/Hz), with the band of rin_band_hz; the fingerprint follows the
// table's content, not its path; a white level beside it is refused.
func TestRINTable(t *testing.T) {
	fs := fstest.MapFS{
		"s.toml":  {Data: []byte(minimal + "\n[noise.depth]\nrin_table = \"rin.csv\"\nrin_band_hz = [10, 1e4]\n")},
		"rin.csv": {Data: []byte("f_hz,rin_db_hz\n10,-110\n1e4,-120\n")},
	}
	s, err := LoadFS(fs, "s.toml", nil)
	if err != nil {
		t.Fatal(err)
	}
	b, err := s.Budget()
	if err != nil {
		t.Fatal(err)
	}
	tab, ok := b.RIN.(*noise.Table)
	if !ok {
		t.Fatalf("budget RIN %T, want a *noise.Table", b.RIN)
	}
	if got := tab.Density(1e4); relDiff(got, 1e-12) > 1e-12 {
		t.Errorf("S_eps(10 kHz) = %g, want 1e-12", got)
	}
	if b.RINBand != (noise.Band{LowHz: 10, HighHz: 1e4}) {
		t.Errorf("band %+v", b.RINBand)
	}
	h1, _, err := s.Fingerprint()
	if err != nil {
		t.Fatal(err)
	}
	fs["rin.csv"] = &fstest.MapFile{Data: []byte("f_hz,rin_db_hz\n10,-110\n1e4,-121\n")}
	s2, err := LoadFS(fs, "s.toml", nil)
	if err != nil {
		t.Fatal(err)
	}
	if h2, _, _ := s2.Fingerprint(); h2 == h1 {
		t.Errorf("the fingerprint does not follow the table's content")
	}
	_, err = LoadFS(fs, "s.toml", []string{"noise.depth.rin_db_hz=-120"})
	if err == nil || !strings.Contains(err.Error(), "give one of them") {
		t.Errorf("table and level together: %v", err)
	}
	fs["s.toml"] = &fstest.MapFile{Data: []byte(minimal + "\n[noise.depth]\nrin_table = \"none.csv\"\n")}
	if _, err = LoadFS(fs, "s.toml", nil); err == nil || !strings.Contains(err.Error(), `intensity-noise table "none.csv"`) {
		t.Errorf("missing table: %v", err)
	}
}

func relDiff(a, b float64) float64 {
	d := (a - b) / b
	if d < 0 {
		return -d
	}
	return d
}
