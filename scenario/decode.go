package scenario

import (
	"errors"
	"fmt"
	"io/fs"
	"rampart/internal/boundedread"
	"rampart/internal/tomlguard"
	"rampart/internal/tomlpos"
	"strings"

	"github.com/BurntSushi/toml"

	"rampart/sim"
)

// entry is one key's value and where it came from.
type entry struct {
	key  *key
	path []string // as written in the file, for line look-ups
	val  any      // as decoded from TOML
	flag string   // the override it came from; empty: the file
}

// decoder turns a TOML document and overrides into a Scenario.
type decoder struct {
	s       *Scenario
	data    []byte
	md      toml.MetaData
	entries []*entry
	byKey   map[string]*entry
}

func parse(fsys fs.FS, name string, data []byte, overrides []string) (*Scenario, error) {
	d := &decoder{
		s:     &Scenario{Name: name, fsys: fsys, Atom: Atom{MassU: sim.Rb87MassU}},
		data:  data,
		byKey: map[string]*entry{},
	}
	if err := tomlguard.Check(data); err != nil {
		ge := err.(*tomlguard.Error)
		return nil, &Error{File: name, Line: ge.Line, Err: errors.New(ge.Msg)}
	}
	var raw map[string]any
	md, err := toml.Decode(string(data), &raw)
	if err != nil {
		return nil, d.syntaxError(err)
	}
	d.md = md
	if err := d.collect(raw); err != nil {
		return nil, err
	}
	for _, o := range overrides {
		if err := d.override(o); err != nil {
			return nil, err
		}
	}
	for _, e := range d.entries {
		v, err := e.key.convert(e.val)
		if err != nil {
			return nil, d.fail(e.key.name, err)
		}
		if e.key.kind == file && e.flag == "" {
			v = d.s.resolve(v.(string))
		}
		e.key.set(d.s, v)
	}
	if err := d.check(); err != nil {
		return nil, err
	}
	if _, kerr := d.s.config(); kerr != nil {
		return nil, d.fail(d.blame(kerr), kerr.err)
	}
	return d.s, nil
}

// maxQuote bounds what a message quotes of the user's input; maxPath the
// file paths it names (a path written in a scenario file is its content).
const (
	maxQuote = 80
	maxPath  = 256
)

func (d *decoder) syntaxError(err error) error {
	var pe toml.ParseError
	if errors.As(err, &pe) {
		return &Error{File: d.s.Name, Line: tomlpos.ErrorLine(d.data, pe.Position), Err: fmt.Errorf("not valid TOML: %s", boundedread.Excerpt(pe.Message, maxQuote))}
	}
	return &Error{File: d.s.Name, Err: fmt.Errorf("not valid TOML: %w", err)}
}

// collect records the values of the known keys in file order and refuses the
// first unknown one.
func (d *decoder) collect(raw map[string]any) error {
	for _, k := range d.md.Keys() {
		name := strings.Join(k, ".")
		v := tomlpos.Lookup(raw, k)
		if err := unknown(k, v); err != nil {
			return &Error{File: d.s.Name, Line: tomlpos.Line(d.data, d.md, k), Key: name, Err: err}
		}
		if _, isTable := tables[name]; isTable {
			if _, ok := v.(map[string]any); !ok {
				return &Error{File: d.s.Name, Line: tomlpos.Line(d.data, d.md, k), Key: name,
					Err: fmt.Errorf("%s must be a table [%s], got %s", name, name, tomlpos.TypeName(v))}
			}
			continue
		}
		e := &entry{key: keyByName[name], path: k, val: v}
		d.entries = append(d.entries, e)
		d.byKey[name] = e
	}
	return nil
}

// unknown returns an error if path, or a table on the way to it, is not in
// the schema.
func unknown(path []string, v any) error {
	for i := range path {
		name := strings.Join(path[:i+1], ".")
		if keyByName[name] != nil {
			if i < len(path)-1 {
				return fmt.Errorf("%s is a value, not a table: want %s", name, keyByName[name].want())
			}
			return nil
		}
		if _, ok := tables[name]; ok {
			continue
		}
		// Unknown names are file content: quote only an excerpt.
		name, parent := boundedread.Excerpt(name, maxQuote), boundedread.Excerpt(strings.Join(path[:i], "."), maxQuote)
		if _, isTable := v.(map[string]any); i == len(path)-1 && !isTable {
			if parent == "" {
				return fmt.Errorf("unknown key %s: a scenario holds only the tables %s", name, strings.Join(tables[""], ", "))
			}
			return fmt.Errorf("unknown key %s: [%s] takes %s%s", name, parent, strings.Join(tables[parent], ", "), elsewhere(boundedread.Excerpt(path[i], maxQuote)))
		}
		if parent == "" {
			return fmt.Errorf("unknown table [%s]: a scenario has the tables %s", name, strings.Join(tables[""], ", "))
		}
		return fmt.Errorf("unknown table [%s]: [%s] takes %s", name, parent, strings.Join(tables[parent], ", "))
	}
	return nil
}

// elsewhere names the table a misplaced key belongs in, if any.
func elsewhere(leaf string) string {
	for _, k := range keys {
		if strings.HasSuffix(k.name, "."+leaf) {
			return fmt.Sprintf(" (%s belongs in [%s])", leaf, k.table())
		}
	}
	return ""
}

// override applies one "table.key=value" override. The value is a TOML
// value; for string keys, text that is not a quoted TOML string is taken as
// it stands.
func (d *decoder) override(o string) error {
	bad := func(key string, err error) error { return &Error{File: d.s.Name, Flag: o, Key: key, Err: err} }
	name, text, ok := strings.Cut(o, "=")
	name = strings.TrimSpace(name)
	if !ok || name == "" {
		return bad("", fmt.Errorf("want table.key=value, for example ring.sites=24"))
	}
	k := keyByName[name]
	if k == nil {
		path := strings.Split(name, ".")
		err := unknown(path, nil)
		if err == nil {
			err = fmt.Errorf("%s is a table, not a key: [%s] takes %s", name, name, strings.Join(tables[name], ", "))
		}
		return bad(name, err)
	}
	v, err := overrideValue(k, text)
	if err != nil {
		return bad(name, err)
	}
	if e := d.byKey[name]; e != nil {
		e.val, e.flag = v, o
		return nil
	}
	e := &entry{key: k, val: v, flag: o}
	d.entries = append(d.entries, e)
	d.byKey[name] = e
	return nil
}

func overrideValue(k *key, value string) (any, error) {
	t := strings.TrimSpace(value)
	quoted := strings.HasPrefix(t, `"`) || strings.HasPrefix(t, `'`)
	if (k.kind == text || k.kind == file) && !quoted {
		return t, nil
	}
	if strings.ContainsAny(t, "\n\r") {
		return nil, fmt.Errorf("the value of %s spans several lines: want one TOML value, %s", k.name, k.want())
	}
	var m map[string]any
	if _, err := toml.Decode("v = "+t, &m); err != nil || len(m) != 1 {
		return nil, fmt.Errorf("%q is not a TOML value: want %s", boundedread.Excerpt(t, maxQuote), k.want())
	}
	return m["v"], nil
}

// check tests what single keys cannot: required keys, and keys that must fit
// together.
func (d *decoder) check() error {
	s := d.s
	for _, k := range keys {
		if k.required && d.byKey[k.name] == nil {
			return &Error{File: s.Name, Key: k.name, Err: fmt.Errorf("missing %s: want %s", k.name, k.want())}
		}
	}
	if s.Ramp.Shape != "file" && d.byKey["ramp.duration_us"] == nil {
		k := keyByName["ramp.duration_us"]
		return &Error{File: s.Name, Key: k.name, Err: fmt.Errorf("missing %s, which shape %q needs: want %s", k.name, s.Ramp.Shape, k.want())}
	}
	if s.Ramp.Shape == "file" && s.Ramp.File == "" {
		return d.fail("ramp.shape", fmt.Errorf(`ramp.shape = "file" needs ramp.file, the ramp table: %s`, d.giveFile("ramp.shape", "ramp.file")))
	}
	if s.Ramp.Shape != "file" && s.Ramp.File != "" {
		return d.fail("ramp.file", fmt.Errorf(`ramp.file is given but ramp.shape = %q: set shape = "file" to use the table, or leave file out`, s.Ramp.Shape))
	}
	if !designed(s.Ramp.Shape) && s.Ramp.DesignDepthKHz != 0 {
		return d.fail("ramp.design_depth_khz", fmt.Errorf(`ramp.design_depth_khz applies to shapes designed for a depth (%s) only, not %q: leave it out or set it to 0`, strings.Join(designedShapes(), ", "), s.Ramp.Shape))
	}
	if err := d.checkDown(); err != nil {
		return err
	}
	if g, m := s.Numerics.Grid, 2*s.Ring.Sites; g%m != 0 {
		such := fmt.Sprint(m)
		if lo := g / m * m; lo > 0 {
			such = fmt.Sprintf("%d or %d", lo, lo+m)
		}
		return d.fail("numerics.grid", fmt.Errorf("numerics.grid = %d is not a multiple of 2*sites = %d: want 0 (automatic) or a multiple such as %s", g, m, such))
	}
	if s.Noise.Depth.RINDBPerHz != 0 && s.Noise.Depth.RINTable != "" {
		return d.fail("noise.depth.rin_table", fmt.Errorf("noise.depth.rin_table and noise.depth.rin_db_hz are both given: the table replaces the white level, so give one of them"))
	}
	if p := s.Noise.Depth.RINTable; p != "" {
		if _, err := s.ReadFile(p); err != nil {
			return d.fail("noise.depth.rin_table", fmt.Errorf("intensity-noise table %q: %w", boundedread.Excerpt(p, maxPath), readError(err)))
		}
	}
	if s.Noise.Drive.PhaseDBcPerHz != 0 && s.Noise.Drive.PhaseTable != "" {
		return d.fail("noise.drive.phase_table", fmt.Errorf("noise.drive.phase_table and noise.drive.phase_dbc_hz are both given: the table replaces the white floor, so give one of them"))
	}
	if p := s.Noise.Drive.PhaseTable; p != "" {
		if _, err := s.ReadFile(p); err != nil {
			return d.fail("noise.drive.phase_table", fmt.Errorf("phase-noise table %q: %w", boundedread.Excerpt(p, maxPath), readError(err)))
		}
	}
	if (s.Readout.Atoms > 0) != (s.Readout.CycleS > 0) {
		given, other := "readout.atoms", "readout.cycle_s"
		if s.Readout.CycleS > 0 {
			given, other = other, given
		}
		return d.fail(given, fmt.Errorf("%s needs %s too: give both for gyroscope figures, or neither", given, other))
	}
	if s.Readout.DetectionAtoms > 0 && s.Readout.Atoms == 0 {
		return d.fail("readout.detection_atoms", fmt.Errorf("readout.detection_atoms needs readout.atoms and readout.cycle_s: the detection noise is that of a read-out"))
	}
	return d.checkApparatus()
}

// fail attaches err to the key whose value caused it: its line in the file,
// or the override it came from.
func (d *decoder) fail(name string, err error) error {
	e := &Error{File: d.s.Name, Key: name, Err: err}
	if x := d.byKey[name]; x != nil {
		e.Flag = x.flag
		if x.flag == "" {
			e.Line = tomlpos.Line(d.data, d.md, x.path)
		}
	}
	return e
}

// giveFile says how to give the table key file that the value of key (a
// shape "file") needs, where key was given: in the scenario file a path is
// relative to the scenario file's directory, on the command line (--set) to
// the working directory (Scenario.resolve).
func (d *decoder) giveFile(key, file string) string {
	if x := d.byKey[key]; x != nil && x.flag != "" {
		return fmt.Sprintf("give --set %s=PATH too, a CSV file (a path on the command line is relative to the working directory)", file)
	}
	table, name, _ := strings.Cut(file, ".")
	return fmt.Sprintf("give %s = \"PATH\" in [%s], a CSV file (a path in the scenario file is relative to the scenario file's directory)", name, table)
}

// blame returns the key to attach kerr's error to: its own key, unless
// that comes from the file and one of the other keys that take part in the
// error (kerr.also) was set by --set: then that override's key, so that the
// message points at the change that caused it rather than at a line the
// user did not touch.
func (d *decoder) blame(kerr *keyError) string {
	if e := d.byKey[kerr.key]; e != nil && e.flag != "" {
		return kerr.key
	}
	for _, k := range kerr.also {
		if e := d.byKey[k]; e != nil && e.flag != "" {
			return k
		}
	}
	return kerr.key
}

// checkDown checks the keys of the ramp-down and of the echo against each
// other, as check does for the ramp-up.
func (d *decoder) checkDown() error {
	r := d.s.Ramp
	if r.DownShape == "" {
		for _, k := range []string{"ramp.down_duration_us", "ramp.down_design_depth_khz", "ramp.down_file"} {
			if d.byKey[k] != nil {
				return d.fail(k, fmt.Errorf("%s is given but ramp.down_shape is not: set down_shape (a shape or \"file\") for a ramp-down of its own, or leave %s out for the mirror of the ramp-up", k, k))
			}
		}
	}
	switch {
	case r.DownShape == "":
	case r.DownShape == "file" && r.DownFile == "":
		return d.fail("ramp.down_shape", fmt.Errorf(`ramp.down_shape = "file" needs ramp.down_file, the ramp-down table: %s`, d.giveFile("ramp.down_shape", "ramp.down_file")))
	case r.DownShape != "file" && r.DownFile != "":
		return d.fail("ramp.down_file", fmt.Errorf(`ramp.down_file is given but ramp.down_shape = %q: set down_shape = "file" to use the table, or leave down_file out`, r.DownShape))
	case r.DownShape != "file" && d.byKey["ramp.down_duration_us"] == nil:
		k := keyByName["ramp.down_duration_us"]
		return d.fail("ramp.down_shape", fmt.Errorf("ramp.down_shape = %q needs %s: want %s", r.DownShape, k.name, k.want()))
	case !designed(r.DownShape) && r.DownDesignDepthKHz != 0:
		return d.fail("ramp.down_design_depth_khz", fmt.Errorf(`ramp.down_design_depth_khz applies to shapes designed for a depth (%s) only, not %q: leave it out or set it to 0`, strings.Join(designedShapes(), ", "), r.DownShape))
	}
	if m := d.s.Motion; m.EchoHoldUS != 0 && m.EchoSegments < 2 {
		return d.fail("motion.echo_hold_us", fmt.Errorf("motion.echo_hold_us = %g applies to echo sequences only, but motion.echo_segments = %d: set echo_segments to 2 or more, or leave the hold out", m.EchoHoldUS, m.EchoSegments))
	}
	return nil
}
