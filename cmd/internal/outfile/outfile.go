// Package outfile writes output files whole or not at all: the content goes
// to a temporary file in the destination's directory, which is renamed over
// the destination only when everything has been written. A failed or
// interrupted command therefore never leaves a half-written file behind.
package outfile

import (
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
)

// Write creates or replaces the file at path with what write produces. If
// write or any file operation fails, the destination is left as it was and
// the temporary file is removed.
func Write(path string, write func(w io.Writer) error) (err error) {
	dir, base := filepath.Split(path)
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
	if err := f.Close(); err != nil {
		return fmt.Errorf("write %q: %w", path, unwrapPath(err))
	}
	if err := os.Rename(f.Name(), path); err != nil {
		return fmt.Errorf("write %q: %w", path, unwrapPath(err))
	}
	return nil
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
