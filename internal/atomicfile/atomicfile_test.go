package atomicfile

import (
	"errors"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
)

func TestWrite(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "out.csv")
	if err := Write(path, func(w io.Writer) error {
		_, err := io.WriteString(w, "a,b\n1,2\n")
		return err
	}); err != nil {
		t.Fatal(err)
	}
	got, err := os.ReadFile(path)
	if err != nil || string(got) != "a,b\n1,2\n" {
		t.Fatalf("got %q, %v, want the written content", got, err)
	}
	if fi, _ := os.Stat(path); fi.Mode().Perm() != 0o644 {
		t.Errorf("mode %v, want 0644", fi.Mode().Perm())
	}
	assertOnly(t, dir, "out.csv")
}

func TestWriteFailureLeavesNothing(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "out.csv")
	boom := errors.New("boom")
	err := Write(path, func(w io.Writer) error {
		io.WriteString(w, "half a file")
		return boom
	})
	if !errors.Is(err, boom) || !strings.Contains(err.Error(), path) {
		t.Fatalf("got %v, want the write error naming %q", err, path)
	}
	assertOnly(t, dir)
}

func TestWriteFailureKeepsOldFile(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "out.csv")
	if err := os.WriteFile(path, []byte("old"), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := Write(path, func(io.Writer) error { return errors.New("boom") }); err == nil {
		t.Fatal("no error")
	}
	if got, _ := os.ReadFile(path); string(got) != "old" {
		t.Errorf("got %q, want the old content kept", got)
	}
	assertOnly(t, dir, "out.csv")
}

func TestWriteMissingDirectory(t *testing.T) {
	path := filepath.Join(t.TempDir(), "no", "out.csv")
	err := Write(path, func(io.Writer) error { return nil })
	if err == nil || !strings.Contains(err.Error(), `write "`+path+`": no such file or directory`) {
		t.Fatalf("got %v, want a message naming %q", err, path)
	}
}

// assertOnly checks that dir holds exactly the named files.
func assertOnly(t *testing.T, dir string, names ...string) {
	t.Helper()
	entries, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	var got []string
	for _, e := range entries {
		got = append(got, e.Name())
	}
	if strings.Join(got, ",") != strings.Join(names, ",") {
		t.Errorf("directory holds %q, want %q", got, names)
	}
}

// TestWriteRefusesSpecialFiles checks that a directory, a FIFO and a
// device are refused and left as they were (the rule of the package doc).
func TestWriteRefusesSpecialFiles(t *testing.T) {
	dir := t.TempDir()
	fifo := filepath.Join(dir, "fifo")
	if err := syscall.Mkfifo(fifo, 0o644); err != nil {
		t.Fatal(err)
	}
	sub := filepath.Join(dir, "sub")
	if err := os.Mkdir(sub, 0o755); err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct{ path, want string }{
		{fifo, "a FIFO (named pipe)"},
		{sub, "a directory"},
		{"/dev/null", "a device"},
	} {
		err := WriteFile(c.path, []byte("x"))
		if err == nil || !strings.Contains(err.Error(), c.want) || !strings.Contains(err.Error(), "replaces only regular files") {
			t.Errorf("%s: got %v, want a refusal naming %q", c.path, err, c.want)
		}
	}
	if fi, err := os.Lstat(fifo); err != nil || fi.Mode()&fs.ModeNamedPipe == 0 {
		t.Errorf("the FIFO was replaced: %v %v", fi.Mode(), err)
	}
	if fi, err := os.Stat("/dev/null"); err != nil || fi.Mode()&fs.ModeDevice == 0 {
		t.Errorf("/dev/null is no longer a device: %v %v", fi.Mode(), err)
	}
	assertOnly(t, dir, "fifo", "sub")
}

// TestWriteThroughSymlink checks that a link to a regular file stays a link
// and its target gets the new content, and that a dangling link or a link
// to a device is refused.
func TestWriteThroughSymlink(t *testing.T) {
	dir := t.TempDir()
	target := filepath.Join(dir, "target.csv")
	if err := os.WriteFile(target, []byte("old"), 0o644); err != nil {
		t.Fatal(err)
	}
	link := filepath.Join(dir, "link.csv")
	if err := os.Symlink("target.csv", link); err != nil {
		t.Fatal(err)
	}
	if err := WriteFile(link, []byte("new")); err != nil {
		t.Fatal(err)
	}
	if fi, _ := os.Lstat(link); fi.Mode().Type() != fs.ModeSymlink {
		t.Errorf("the link became %v", fi.Mode())
	}
	if got, _ := os.ReadFile(target); string(got) != "new" {
		t.Errorf("target holds %q, want the new content", got)
	}
	dangling := filepath.Join(dir, "dangling")
	os.Symlink("nowhere", dangling)
	if err := WriteFile(dangling, []byte("x")); err == nil || !strings.Contains(err.Error(), "points to no file") {
		t.Errorf("dangling link: got %v", err)
	}
	null := filepath.Join(dir, "null")
	os.Symlink("/dev/null", null)
	if err := WriteFile(null, []byte("x")); err == nil || !strings.Contains(err.Error(), "a device") {
		t.Errorf("link to /dev/null: got %v", err)
	}
	assertOnly(t, dir, "dangling", "link.csv", "null", "target.csv")
}
