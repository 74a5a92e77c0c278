// Package boundedread reads input files with a size cap, refusing anything
// that is not a regular file, so that an input named by mistake (/dev/zero,
// a FIFO, a directory, a multi-gigabyte file) is refused at once with a
// clear message instead of exhausting memory or hanging.
package boundedread

import (
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"syscall"

	"rampart/internal/atomicfile"
)

// Caps for the inputs rampart reads, in bytes.
const (
	// TextCap bounds scenario and spec files: their schemas are a few
	// dozen keys, so 1 MiB is far beyond any real file.
	TextCap = 1 << 20
	// TableCap bounds ramp and phase-noise tables: 10^6 rows of two
	// shortest-round-trip float64 fields (at most 2*24+2 bytes a row) with
	// room for comments.
	TableCap = 64 << 20
)

// ErrTooLarge is wrapped by the error for a file beyond its cap.
var ErrTooLarge = errors.New("too large")

// ReadFile returns the content of the regular file at path, of at most
// limit bytes. A directory, device, FIFO or socket is refused without
// reading (a FIFO is opened non-blocking, so it cannot hang the reader); a
// larger file is refused with a message naming the cap. Errors from
// opening the file are *fs.PathError as from os.ReadFile.
func ReadFile(path string, limit int64) ([]byte, error) {
	f, err := os.OpenFile(path, os.O_RDONLY|syscall.O_NONBLOCK, 0)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	fi, err := f.Stat()
	if err != nil {
		return nil, err
	}
	return read(f, fi, limit)
}

// ReadFS is ReadFile for a file in fsys (such as an embedded file system).
func ReadFS(fsys fs.FS, name string, limit int64) ([]byte, error) {
	f, err := fsys.Open(name)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	fi, err := f.Stat()
	if err != nil {
		return nil, err
	}
	return read(f, fi, limit)
}

func read(r io.Reader, fi fs.FileInfo, limit int64) ([]byte, error) {
	if !fi.Mode().IsRegular() {
		return nil, fmt.Errorf("it is %s, not a regular file: give the path of a file", atomicfile.Kind(fi.Mode()))
	}
	if fi.Size() > limit {
		return nil, tooLarge(fmt.Sprintf("%d bytes", fi.Size()), limit)
	}
	data, err := io.ReadAll(io.LimitReader(r, limit+1))
	if err != nil {
		return nil, err
	}
	if int64(len(data)) > limit { // grew while we read it
		return nil, tooLarge("more than "+Size(limit), limit)
	}
	return data, nil
}

func tooLarge(size string, limit int64) error {
	return fmt.Errorf("%w: %s, beyond the cap of %s for this kind of input", ErrTooLarge, size, Size(limit))
}

// Size formats a byte count as rampart's messages give caps: "1 MiB",
// "64 MiB" or "512 bytes".
func Size(n int64) string {
	switch {
	case n >= 1<<20 && n%(1<<20) == 0:
		return fmt.Sprintf("%d MiB", n>>20)
	case n >= 1<<10 && n%(1<<10) == 0:
		return fmt.Sprintf("%d KiB", n>>10)
	}
	return fmt.Sprintf("%d bytes", n)
}

// Excerpt returns s cut to at most n bytes (on a rune boundary) with "..."
// when cut, for quoting user input in messages without echoing a whole file.
func Excerpt(s string, n int) string {
	if len(s) <= n {
		return s
	}
	i := n
	for i > 0 && i < len(s) && s[i]&0xC0 == 0x80 {
		i--
	}
	return s[:i] + "..."
}
