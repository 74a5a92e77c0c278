// Package atomicfile writes output files whole or not at all, for the
// library and the commands alike.
//
// The rule for a destination path:
//   - missing or a regular file: the content goes to a temporary file in the
//     same directory, which is synced to disk and renamed over the path only
//     when everything has been written, so a failed or interrupted write
//     leaves the old file (or no file) behind, never half a file;
//   - a symbolic link: it is resolved, and the file it points to is written
//     whole-or-nothing by the same rule (the link itself stays a link); a
//     link that points nowhere is refused;
//   - a directory, device, FIFO or socket: refused with a message saying
//     what is there. A special file is never replaced (writing --out
//     /dev/null as root must not destroy the system's /dev/null).
package atomicfile

import (
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
)

// Write creates or replaces the file at path with what write produces,
// following the package's rule for destinations. If write or any file
// operation fails, the destination is left as it was and the temporary
// file is removed. Errors name path.
func Write(path string, write func(w io.Writer) error) (err error) {
	target, err := Target(path)
	if err != nil {
		return err
	}
	dir, base := filepath.Split(target)
	if dir == "" {
		dir = "."
	}
	f, err := os.CreateTemp(dir, "."+base+".*.tmp")
	if err != nil {
		return fmt.Errorf("write %q: %w", path, unwrapPath(err))
	}
	defer func() {
		if err != nil {
			f.Close()
			os.Remove(f.Name())
		}
	}()
	if err := write(f); err != nil {
		return fmt.Errorf("write %q: %w", path, err)
	}
	if err := f.Chmod(0o644); err != nil {
		return fmt.Errorf("write %q: %w", path, unwrapPath(err))
	}
	if err := f.Sync(); err != nil {
		return fmt.Errorf("write %q: %w", path, unwrapPath(err))
	}
	if err := f.Close(); err != nil {
		return fmt.Errorf("write %q: %w", path, unwrapPath(err))
	}
	if err := os.Rename(f.Name(), target); err != nil {
		return fmt.Errorf("write %q: %w", path, unwrapPath(err))
	}
	syncDir(dir)
	return nil
}

// WriteFile is Write for content already in memory.
func WriteFile(path string, data []byte) error {
	return Write(path, func(w io.Writer) error {
		_, err := w.Write(data)
		return err
	})
}

// Target returns the file a write to path replaces: path itself when it is
// missing or a regular file, the file a symbolic link resolves to when that
// is a regular file. Anything else is refused with an error that says what
// is at path.
func Target(path string) (string, error) {
	fi, err := os.Lstat(path)
	if errors.Is(err, fs.ErrNotExist) {
		return path, nil
	}
	if err != nil {
		return "", fmt.Errorf("write %q: %w", path, unwrapPath(err))
	}
	if fi.Mode().Type() == fs.ModeSymlink {
		resolved, err := filepath.EvalSymlinks(path)
		if err != nil {
			return "", fmt.Errorf("write %q: a symbolic link that points to no file (%v): give the file itself", path, unwrapPath(err))
		}
		rfi, err := os.Stat(resolved)
		if err != nil {
			return "", fmt.Errorf("write %q: %w", path, unwrapPath(err))
		}
		if !rfi.Mode().IsRegular() {
			return "", fmt.Errorf("write %q: a symbolic link to %s, which is %s: rampart writes only regular files", path, resolved, Kind(rfi.Mode()))
		}
		return resolved, nil
	}
	if !fi.Mode().IsRegular() {
		return "", fmt.Errorf("write %q: it is %s, and rampart replaces only regular files: give a file path", path, Kind(fi.Mode()))
	}
	return path, nil
}

// Kind names the type of a file mode for messages: "a directory", "a
// device", "a FIFO (named pipe)", "a socket" or "a regular file".
func Kind(m fs.FileMode) string {
	switch {
	case m.IsDir():
		return "a directory"
	case m&fs.ModeNamedPipe != 0:
		return "a FIFO (named pipe)"
	case m&fs.ModeSocket != 0:
		return "a socket"
	case m&fs.ModeDevice != 0 || m&fs.ModeCharDevice != 0:
		return "a device"
	case m&fs.ModeSymlink != 0:
		return "a symbolic link"
	case m.IsRegular():
		return "a regular file"
	}
	return "not a regular file"
}

// syncDir makes a rename in dir durable where the system allows it; a
// failure only weakens durability across a power loss, so it is ignored.
func syncDir(dir string) {
	if d, err := os.Open(dir); err == nil {
		d.Sync()
		d.Close()
	}
}

// unwrapPath drops the temporary file's name from an error: the message
// names the destination instead.
func unwrapPath(err error) error {
	var pe *os.PathError
	if errors.As(err, &pe) {
		return pe.Err
	}
	var le *os.LinkError
	if errors.As(err, &le) {
		return le.Err
	}
	return err
}
