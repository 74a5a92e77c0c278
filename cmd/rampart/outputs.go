package main

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
	"syscall"

	"rampart/cmd/internal/present"
	"rampart/cmd/internal/report"
	"rampart/mc"
)

// Output paths are checked before any computation, so that a command never
// spends its run and then fails to write (or, worse, writes over its own
// input).

// checkReportDir refuses --report DIR when report.html cannot be written
// there: DIR (or the nearest part of it that exists) is not a directory,
// or DIR/report.html is not a regular file (a directory, a FIFO, ...).
func checkReportDir(dir string) error {
	o := outDir("--report", dir, report.FileName)
	o.want = "a directory for " + report.FileName
	return checkOutputPaths(o)
}

// runFiles are the files the ensemble commands write in a run directory
// (and in the directory that holds the runs of rank, tolerance, scan and
// edge): the store's, the summaries and the figures.
var runFiles = []string{mc.ManifestFile, mc.RealisationsFile, mc.LockFile, present.SummaryFile, present.QualificationFile,
	present.RankingFile, present.SensitivityFile, present.ToleranceCurvesFile, present.ScanCSVFile, present.ScanJSONFile, edgeFile, "*.png", "*.svg"}

// checkDirPath checks that dir is a directory or can be made one: the
// nearest ancestor that exists is a directory.
func checkDirPath(dir string) error {
	for p := filepath.Clean(dir); ; p = filepath.Dir(p) {
		fi, err := os.Stat(p)
		switch {
		case err == nil && fi.IsDir():
			return nil
		case err == nil:
			if p == filepath.Clean(dir) {
				return errors.New("it exists and is not a directory")
			}
			return fmt.Errorf("%s is not a directory", p)
		case errors.Is(err, syscall.ENOTDIR):
			// A part of p is a file: the loop finds and names it.
		case !errors.Is(err, fs.ErrNotExist):
			return fmt.Errorf("cannot use it: %v", pathErr(err))
		}
		if parent := filepath.Dir(p); parent == p {
			return nil
		}
	}
}

// pathErr strips the path from an *fs.PathError, which the message names
// already.
func pathErr(err error) error {
	var pe *fs.PathError
	if errors.As(err, &pe) {
		return pe.Err
	}
	return err
}

// checkOutDir refuses --out DIR when DIR is not a directory, or is a
// non-empty directory that holds no run (no manifest.json in it or in a
// subdirectory of it): files of an unrelated directory would be mixed with
// the run's. A directory that holds a run is left to mc.Job, which says to
// resume it.
func checkOutDir(dir string) error {
	if dir == "" {
		return nil
	}
	o := outDir("--out", dir, runFiles...)
	o.want = "a new or empty directory"
	if err := checkOutputPaths(o); err != nil {
		return err
	}
	entries, err := os.ReadDir(dir)
	if err != nil || len(entries) == 0 {
		return nil // absent: it will be made
	}
	var names []string
	for _, e := range entries {
		if e.Name() == "manifest.json" {
			return nil
		}
		if e.IsDir() {
			if _, err := os.Stat(filepath.Join(dir, e.Name(), "manifest.json")); err == nil {
				return nil
			}
		}
		names = append(names, e.Name())
	}
	if len(names) > 3 {
		names = append(names[:3], "...")
	}
	return fmt.Errorf("--out %s: the directory holds other files (%s) and no run: give a new or empty directory, so that the run's files are not mixed with them", dir, strings.Join(names, ", "))
}

// checkOutputs checks the ensemble's directories before anything runs:
// --resume names an existing directory, --out a new or empty one or one
// that holds a run.
func (o *ensembleOptions) checkOutputs() error {
	if err := o.checkResumeExists(); err != nil {
		return err
	}
	if o.resume == "" {
		return checkOutDir(o.out)
	}
	return checkOutputPaths(outDir("--resume", o.resume, runFiles...))
}

// checkNotInput refuses an output file (given by flag) that resolves to
// one of the command's input files: writing it would destroy the input.
func checkNotInput(flag, out string, inputs []string) error {
	if out == "" {
		return nil
	}
	for _, in := range inputs {
		if in != "" && samePath(out, in) {
			return fmt.Errorf("%s %s: that is the input file %s; give another path for the output", flag, out, in)
		}
	}
	return nil
}

// samePath reports whether two paths name the same file: the same file on
// disk when both exist (hard and symbolic links included), otherwise the
// same cleaned absolute path.
func samePath(a, b string) bool {
	fa, errA := os.Stat(a)
	fb, errB := os.Stat(b)
	if errA == nil && errB == nil {
		return os.SameFile(fa, fb)
	}
	absA, errA := filepath.Abs(a)
	absB, errB := filepath.Abs(b)
	return errA == nil && errB == nil && absA == absB
}
