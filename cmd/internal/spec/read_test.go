package spec

import (
	"os"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
)

// TestReadRefuses: a spec is read only from a regular file of at most
// 1 MiB, nesting is refused before decoding, and a missing file gets a
// message in the house style rather than Go's "open nope.toml".
func TestReadRefuses(t *testing.T) {
	dir := t.TempDir()
	fifo := filepath.Join(dir, "fifo.toml")
	if err := syscall.Mkfifo(fifo, 0o644); err != nil {
		t.Fatal(err)
	}
	huge := filepath.Join(dir, "huge.toml")
	os.WriteFile(huge, make([]byte, 1<<20+1), 0o644)
	nested := filepath.Join(dir, "nested.toml")
	os.WriteFile(nested, []byte("[contrast]\np05_min = 0.9\nx = [[[[[[1]]]]]]\n"), 0o644)
	for _, c := range []struct{ path, want string }{
		{"/dev/zero", `spec "/dev/zero": it is a device, not a regular file`},
		{fifo, "it is a FIFO (named pipe), not a regular file"},
		{huge, "1048577 bytes, beyond the cap of 1 MiB"},
		{nested, `nested.toml" line 3: brackets nested 5 deep`},
		{"nope.toml", `spec "nope.toml": cannot read the spec file (--spec; a TOML file of [contrast], [bias], [yield] or [scale_factor] criteria, README: Spec reference): no such file or directory`},
	} {
		_, err := Read(c.path)
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: got %v, want %q", c.path, err, c.want)
		}
	}
}

// FuzzParse feeds arbitrary documents to the spec reader: it must return
// requirements or an *Error, never panic, and requirements it returns must
// have a confidence in (0, 1). Run with
//
//	go test -fuzz=FuzzParse ./cmd/internal/spec
func FuzzParse(f *testing.F) {
	for _, seed := range []string{
		"",
		"[contrast]\np05_min = 0.986\n",
		"confidence = 0.9\n[contrast]\nmean_min = 0.9\np05_min = 0.8\n[bias]\nabs_p95_max_rad = 0.1\n[yield]\nmin = 0.9\ncontrast_min = 0.5\n",
		"contrast.p05_min = 0.9\n",
		"[contrast]\np05_min = {a = [1]}\n",
		"x = [[[[[[1]]]]]]\n",
	} {
		f.Add([]byte(seed))
	}
	f.Fuzz(func(t *testing.T, data []byte) {
		req, err := Parse("fuzz.toml", data)
		if err != nil {
			if _, ok := err.(*Error); !ok {
				t.Fatalf("error of type %T: %v", err, err)
			}
			return
		}
		if !(req.Confidence > 0 && req.Confidence < 1) {
			t.Fatalf("accepted confidence %g", req.Confidence)
		}
	})
}

// TestLongKeyQuotedInPart: a 15,000-byte unknown key is quoted in part.
func TestLongKeyQuotedInPart(t *testing.T) {
	_, err := Parse("s.toml", []byte("[contrast]\n"+strings.Repeat("k", 15000)+" = 1\n"))
	if err == nil || !strings.Contains(err.Error(), "unknown key contrast.kkk") || len(err.Error()) > 300 {
		t.Errorf("got a message of %d bytes", len(err.Error()))
	}
}
