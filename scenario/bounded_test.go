package scenario

import (
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
)

// TestLoadRefusesSpecialAndHugeFiles: only regular files of at most 1 MiB
// are read as scenarios (issue 10: /dev/zero grew memory without bound, a
// FIFO hung the reader).
func TestLoadRefusesSpecialAndHugeFiles(t *testing.T) {
	dir := t.TempDir()
	fifo := filepath.Join(dir, "fifo.toml")
	if err := syscall.Mkfifo(fifo, 0o644); err != nil {
		t.Fatal(err)
	}
	huge := filepath.Join(dir, "huge.toml")
	os.WriteFile(huge, []byte("# "+strings.Repeat("x", 1<<20)+"\n"), 0o644)
	for _, c := range []struct{ path, want string }{
		{"/dev/zero", `scenario "/dev/zero": it is a device, not a regular file`},
		{fifo, "it is a FIFO (named pipe), not a regular file"},
		{dir, "it is a directory, not a regular file"},
		{huge, "1048579 bytes, beyond the cap of 1 MiB"},
		{filepath.Join(dir, "nope.toml"), "cannot read the file: no such file or directory"},
	} {
		_, err := Load(c.path, nil)
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: got %v, want %q", c.path, err, c.want)
		}
	}
}

// TestLoadRefusesNesting: nesting is refused before the decoder sees it,
// and a long value is quoted only in part.
func TestLoadRefusesNesting(t *testing.T) {
	dir := t.TempDir()
	nested := filepath.Join(dir, "nested.toml")
	os.WriteFile(nested, []byte("[ring]\nradius_um = 5\nx = "+strings.Repeat("{a = ", 10000)+"\n"), 0o644)
	if _, err := Load(nested, nil); err == nil || !strings.Contains(err.Error(), `nested.toml" line 3: brackets nested 5 deep`) {
		t.Errorf("nested: got %v", err)
	}
	long := filepath.Join(dir, "long.toml")
	os.WriteFile(long, []byte("[ring]\nradius_um = \"\"\"\n"+strings.Repeat("y", 500000)+"\"\"\"\n"), 0o644)
	_, err := Load(long, nil)
	if err == nil || len(err.Error()) > 400 {
		t.Errorf("long string value: got a message of %d bytes: %.200v", len(fmt.Sprint(err)), err)
	}
}

// TestRampFileSpreadsheetExports: a UTF-8 byte-order mark is accepted, a
// semicolon separator gets a message saying so, and a table over the row
// cap is refused naming the cap.
func TestRampFileSpreadsheetExports(t *testing.T) {
	table := "t_s,omega_rad_s\n0,0\n5e-5,250\n1e-4,500\n"
	tab, err := ParseRamp(strings.NewReader("\ufeff"+table), "bom.csv", 20, 500)
	if err != nil || tab.Duration() != 1e-4 {
		t.Errorf("BOM: got %v, %v", tab, err)
	}
	_, err = ParseRamp(strings.NewReader(strings.ReplaceAll(table, ",", ";")), "semi.csv", 20, 500)
	if err == nil || !strings.Contains(err.Error(), `ramp file "semi.csv" line 1: the columns are separated by semicolons`) {
		t.Errorf("semicolons: got %v", err)
	}
	_, err = ParseRamp(strings.NewReader("t_s,omega_rad_s\n0,"+strings.Repeat("0", 1000)+"\n"), "long.csv", 20, 500)
	if err == nil || !strings.Contains(err.Error(), "field 2 is 1000 bytes long") {
		t.Errorf("long field: got %v", err)
	}
	var b strings.Builder
	b.WriteString("t_s,omega_rad_s\n")
	for i := range MaxRampRows + 1 {
		fmt.Fprintf(&b, "%d,0\n", i)
	}
	_, err = ParseRamp(strings.NewReader(b.String()), "big.csv", 20, 500)
	if err == nil || !strings.Contains(err.Error(), fmt.Sprintf("line %d: more than 1000000 data rows", MaxRampRows+2)) {
		t.Errorf("rows over the cap: got %v", err)
	}
}

func TestReadRampRefusesDevice(t *testing.T) {
	if _, err := ReadRamp("/dev/zero", 20, 500); err == nil || !strings.Contains(err.Error(), "a device, not a regular file") {
		t.Errorf("got %v", err)
	}
}

// TestLongNamesQuotedInPart: an unknown key, a table or a file path of
// 15,000 bytes written in the file is quoted only in part.
func TestLongNamesQuotedInPart(t *testing.T) {
	base, err := os.ReadFile(filepath.Join(root, "testdata", "scenarios", "benchmark.toml"))
	if err != nil {
		t.Fatal(err)
	}
	long := strings.Repeat("k", 15000)
	dir := t.TempDir()
	for _, c := range []struct{ name, doc, want string }{
		{"key", string(base) + "\n" + long + " = 1\n", "unknown key ramp.kkk"},
		{"table", string(base) + "\n[" + long + "]\n", "unknown table [kkk"},
		{"file", strings.Replace(string(base), `shape = "sin2"`, `shape = "file"`+"\nfile = \""+long+"\"", 1), `ramp file "`},
	} {
		path := filepath.Join(dir, c.name+".toml")
		os.WriteFile(path, []byte(c.doc), 0o644)
		_, err := Load(path, nil)
		if err == nil || !strings.Contains(err.Error(), c.want) || len(err.Error()) > 500 {
			t.Errorf("%s: got a message of %d bytes: %.120v", c.name, len(fmt.Sprint(err)), err)
		}
	}
}
