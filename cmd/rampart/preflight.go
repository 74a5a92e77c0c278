package main

import (
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"reflect"
	"slices"
	"sync"
	"syscall"

	"rampart/internal/atomicfile"
	"rampart/sim"
)

// checked holds the numerics estimates this process has made, so that a
// command running several ensembles of one configuration (tolerance: one
// per amplitude tried) checks it once. Configurations are compared in
// full (reflect.DeepEqual follows the ramps), so a hit is always the same
// nominal shot.
var checked []checkedNumerics

type checkedNumerics struct {
	cfg sim.Config
	est sim.ErrorEstimate
}

// preflight checks the numerics of the nominal shot of cfg before an
// ensemble of it runs: sim.EstimateError compares the shot with the same
// shot on twice the grid and half the step (docs/model.md, Numerics). It
// refuses, with the estimate's remedy (exit 2), when the error misses
// sim.ContrastTarget or sim.PhaseTargetRad; what names the configuration in
// that message (a ramp of a ranking, or the scenario).
func preflight(what string, cfg sim.Config) (sim.ErrorEstimate, error) {
	s, err := sim.NewSimulator(cfg)
	if err != nil {
		return sim.ErrorEstimate{}, fmt.Errorf("%s: %w", what, err)
	}
	cfg = s.Config() // with the numerics in use
	for _, c := range checked {
		if reflect.DeepEqual(c.cfg, cfg) {
			return c.est, numericsRefusal(what, c.est)
		}
	}
	est, err := sim.EstimateError(cfg)
	if err != nil {
		return est, fmt.Errorf("%s: %w", what, err)
	}
	checked = append(checked, checkedNumerics{cfg, est})
	return est, numericsRefusal(what, est)
}

// numericsRefusal is the error of an estimate that misses its targets (nil if it
// meets them).
func numericsRefusal(what string, est sim.ErrorEstimate) error {
	if est.Met {
		return nil
	}
	return fmt.Errorf("%s: refused to run the ensemble: %s", what, est.Remedy)
}

// warnValidity writes the inputs of cfg outside the model's validity
// (sim.Config.Warnings) to stderr, one line each.
func warnValidity(stderr io.Writer, cfg sim.Config) {
	for _, w := range cfg.Warnings() {
		fmt.Fprintf(stderr, "rampart: warning: %s\n", w)
	}
}

// warned holds the ring-potential notes this process has written, so
// that a command running many ensembles of one configuration says it once.
var warned = map[string]bool{}

// warnRingModel writes a note, and returns the model error, when the ring
// potential of base leaves a model error above the phase target in the
// bias (ringModelError).
func warnRingModel(stderr io.Writer, what string, cfg sim.Config, base sim.Shot) float64 {
	e, firstOrder, ground := ringModelError(cfg, base)
	if e <= sim.PhaseTargetRad || warned[what] {
		return e
	}
	warned[what] = true
	if firstOrder {
		fmt.Fprintf(stderr, "rampart: warning: %s: the ring's tilt is applied at first order along the adiabatic path in an echo sequence; with %.2g of the atoms left outside the ground band after the ramp-up, that leaves out a bias of order %.1g rad (above the %g rad phase target), so the bias figures carry this model error; a gentler ramp reduces it (docs/model.md, Perturbations)\n",
			what, 1-ground, e, sim.PhaseTargetRad)
		return e
	}
	fmt.Fprintf(stderr, "rampart: warning: %s: the ring potential's first Magnus term over the cruise leaves an estimated %.1g rad out of the bias (above the %g rad phase target), so the bias figures carry this model error; a smaller tilt or depth harmonic, or a gentler ramp, reduces it (docs/model.md, Perturbations)\n",
		what, e, sim.PhaseTargetRad)
	return e
}

// ringModelError returns the model error of the ring potential of base in
// the bias: for an echo sequence, which applies it at first order, the
// scale of the excited-packet bias that leaves out
// (sim.RingPotential.ExcitedBiasRad at the nominal shot's ground-band
// population, which it returns too, with firstOrder set); otherwise the
// estimate of what the first Magnus term over the cruise leaves out
// (sim.Simulator.RingErrorRad). Zero without a potential. The commands
// carry it beside the numerical error (sim.ErrorEstimate.ModelBiasRad).
func ringModelError(cfg sim.Config, base sim.Shot) (bias float64, firstOrder bool, ground float64) {
	// A command runs many ensembles of one configuration and apparatus
	// (the tolerance searches: tens of them), and the estimate costs a
	// refined shot: it is computed once per configuration.
	key := fmt.Sprintf("%+v|%+v|%+v", cfg, base.Potential, base.Field)
	ringModelMu.Lock()
	defer ringModelMu.Unlock()
	if v, ok := ringModelCache[key]; ok {
		return v.bias, v.firstOrder, v.ground
	}
	bias, firstOrder, ground = ringModelErrorOf(cfg, base)
	ringModelCache[key] = ringModel{bias, firstOrder, ground}
	return bias, firstOrder, ground
}

type ringModel struct {
	bias       float64
	firstOrder bool
	ground     float64
}

var (
	ringModelMu    sync.Mutex
	ringModelCache = map[string]ringModel{}
)

// ringModelErrorOf is ringModelError without the cache.
func ringModelErrorOf(cfg sim.Config, base sim.Shot) (bias float64, firstOrder bool, ground float64) {
	s, err := sim.NewSimulator(cfg)
	if err != nil {
		return 0, false, 1 // the run itself reports it
	}
	if !cfg.Sequence.Echo() {
		return s.RingErrorRad(base), false, 1
	}
	pot := base.Potential
	if pot.TiltRad == 0 {
		return 0, true, 1
	}
	r := s.Run(sim.Shot{}, nil)
	ground = min(r.GroundAfterRampUp[0], r.GroundAfterRampUp[1])
	return pot.ExcitedBiasRad(cfg.Ring, cfg.TrapRadS(), ground), true, ground
}

// Output paths. Every path a command writes is checked here, before its
// scenario is simulated, so that a run is never spent and then lost to an
// output that cannot be written (README, exit codes: bad input exits 2
// before anything runs). The messages name the flag that gave the path.

// output is a path a command will write, named by the flag that gave it.
type output struct {
	flag string // such as "--report"
	path string // the flag's value; "" when the flag is not given
	// dir marks a directory, made if missing, into which the command
	// writes files: the names in files, or filepath.Match patterns such as
	// "*.png" for figures named after the results.
	dir   bool
	files []string
	// beside are more files the flag's file brings along (a figure written
	// beside a CSV file), checked as it is.
	beside []string
	// want says what the flag takes, for the message ("a directory for
	// report.html"); empty for the default.
	want string
}

// outFile is the output file path given by flag.
func outFile(flag, path string) output { return output{flag: flag, path: path} }

// outDir is the output directory given by flag, into which the command
// writes files (names or patterns).
func outDir(flag, dir string, files ...string) output {
	return output{flag: flag, path: dir, dir: true, files: files}
}

// checkOutputPaths refuses the first output that cannot be written: a file
// path that is a directory or a special file (FIFO, socket, device), or
// whose directory is missing or not a directory; a directory path that is
// not a directory (or lies under a file), or that holds a special file, or
// a directory, where the command writes one of its files; two file flags
// that name one file (the second write would replace the first).
func checkOutputPaths(outs ...output) error {
	for i, o := range outs {
		if o.path == "" {
			continue
		}
		var err error
		if o.dir {
			err = o.checkDir()
		} else {
			err = o.checkFile()
			for _, b := range o.beside {
				if err != nil {
					break
				}
				if err = (output{path: b}).checkFile(); err != nil {
					err = fmt.Errorf("%s, written beside it: %w", b, err)
				}
			}
		}
		if err != nil {
			return fmt.Errorf("%s %s: %w", o.flag, o.path, err)
		}
		for _, p := range outs[:i] {
			if !o.dir && !p.dir && p.path != "" && samePath(o.path, p.path) {
				return fmt.Errorf("%s %s: the same file as %s %s; give each output its own file", o.flag, o.path, p.flag, p.path)
			}
		}
	}
	return nil
}

// checkFile checks an output file path (see checkOutputPaths); the error
// does not repeat the flag and path.
func (o output) checkFile() error {
	target := o.path
	fi, err := os.Lstat(target)
	if err == nil && fi.Mode().Type() == fs.ModeSymlink {
		if target, err = filepath.EvalSymlinks(o.path); err != nil {
			return fmt.Errorf("a symbolic link that points to no file (%v); give the file itself", pathErr(err))
		}
		fi, err = os.Stat(target)
	}
	switch {
	case err == nil && !fi.Mode().IsRegular():
		return fmt.Errorf("it is %s, and rampart replaces only regular files; give a regular file or a new path", atomicfile.Kind(fi.Mode()))
	case err == nil:
		return nil
	case !errors.Is(err, fs.ErrNotExist) && !errors.Is(err, syscall.ENOTDIR):
		return fmt.Errorf("cannot use it: %v", pathErr(err))
	}
	parent := filepath.Dir(target)
	if err := checkDirPath(parent); err != nil {
		return fmt.Errorf("its directory %s: %w", parent, err)
	}
	if _, err := os.Stat(parent); err != nil {
		return fmt.Errorf("its directory %s does not exist; create it first, or give a path in an existing directory", parent)
	}
	return nil
}

// checkDir checks an output directory and the files the command writes in
// it (see checkOutputPaths); the error does not repeat the flag and path.
func (o output) checkDir() error {
	want := o.want
	if want == "" {
		want = "a directory"
	}
	if err := checkDirPath(o.path); err != nil {
		return fmt.Errorf("%w; give %s", err, want)
	}
	entries, err := os.ReadDir(o.path)
	if err != nil {
		return nil // absent: it will be made
	}
	for _, e := range entries {
		name := e.Name()
		if !slices.ContainsFunc(o.files, func(pattern string) bool {
			ok, _ := filepath.Match(pattern, name)
			return ok
		}) {
			continue
		}
		path := filepath.Join(o.path, name)
		fi, err := os.Stat(path) // a link is judged by what it points to
		if err != nil {
			if lfi, lerr := os.Lstat(path); lerr == nil && lfi.Mode().Type() == fs.ModeSymlink {
				return fmt.Errorf("%s is a symbolic link that points to no file; remove it or give another directory", path)
			}
			return fmt.Errorf("%s: cannot use it: %v", path, pathErr(err))
		}
		if !fi.Mode().IsRegular() {
			return fmt.Errorf("%s is %s; give a directory whose %s is a regular file or absent", path, atomicfile.Kind(fi.Mode()), name)
		}
	}
	return nil
}
