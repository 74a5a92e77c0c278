package boundedread

import (
	"errors"
	"os"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
	"testing/fstest"
	"time"
)

func TestReadFile(t *testing.T) {
	dir := t.TempDir()
	small := filepath.Join(dir, "small.toml")
	os.WriteFile(small, []byte("a = 1\n"), 0o644)
	fifo := filepath.Join(dir, "fifo")
	if err := syscall.Mkfifo(fifo, 0o644); err != nil {
		t.Fatal(err)
	}
	big := filepath.Join(dir, "big")
	os.WriteFile(big, make([]byte, 2049), 0o644)

	if got, err := ReadFile(small, 1024); err != nil || string(got) != "a = 1\n" {
		t.Errorf("small file: %q, %v", got, err)
	}
	cases := []struct{ path, want string }{
		{dir, "is a directory, not a regular file"},
		{"/dev/zero", "is a device, not a regular file"},
		{fifo, "is a FIFO (named pipe), not a regular file"},
		{big, "2049 bytes, beyond the cap of 2 KiB"},
	}
	for _, c := range cases {
		done := make(chan error, 1)
		go func() { _, err := ReadFile(c.path, 2048); done <- err }()
		select {
		case err := <-done:
			if err == nil || !strings.Contains(err.Error(), c.want) {
				t.Errorf("%s: got %v, want %q", c.path, err, c.want)
			}
		case <-time.After(5 * time.Second):
			t.Fatalf("%s: still reading after 5 s (a FIFO must not block)", c.path)
		}
	}
	if _, err := ReadFile(big, 2048); !errors.Is(err, ErrTooLarge) {
		t.Errorf("big file: %v does not wrap ErrTooLarge", err)
	}
	if _, err := ReadFile(filepath.Join(dir, "none"), 10); !errors.Is(err, os.ErrNotExist) {
		t.Errorf("missing file: %v", err)
	}
}

func TestReadFS(t *testing.T) {
	fsys := fstest.MapFS{"a": {Data: []byte("xyz")}, "d": {Mode: os.ModeDir}}
	if got, err := ReadFS(fsys, "a", 3); err != nil || string(got) != "xyz" {
		t.Errorf("got %q, %v", got, err)
	}
	if _, err := ReadFS(fsys, "a", 2); !errors.Is(err, ErrTooLarge) {
		t.Errorf("over the cap: %v", err)
	}
}

func TestExcerpt(t *testing.T) {
	for _, c := range []struct {
		in   string
		n    int
		want string
	}{
		{"short", 10, "short"},
		{"0123456789abc", 10, "0123456789..."},
		{"ééééé", 3, "é..."}, // é is two bytes: never cut inside a rune
	} {
		if got := Excerpt(c.in, c.n); got != c.want {
			t.Errorf("Excerpt(%q, %d) = %q, want %q", c.in, c.n, got, c.want)
		}
	}
}
