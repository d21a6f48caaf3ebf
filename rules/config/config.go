// Package config reads .datumlint.toml: which rules run at what severity,
// the failing severity, the size limit and the files to leave out. A
// configuration is found by walking up from a checked file's folder to the
// repository root (the first folder holding .git) or the filesystem root;
// the nearest file wins, with no merging of parents (common practice for
// linters: one file says everything that applies beneath it).
package config

import (
	"errors"
	"fmt"
	"os"
	"path"
	"path/filepath"
	"sort"
	"strings"
	"sync"

	"github.com/BurntSushi/toml"

	"github.com/datumlint/datumlint/rules"
)

// FileName is the name of the configuration file.
const FileName = ".datumlint.toml"

// Config is one parsed configuration file.
type Config struct {
	// Path is the file it was read from; Dir its folder (absolute), against
	// which the exclude globs are matched.
	Path, Dir string
	// FailOn is the lowest severity that fails a check; valid if FailOnSet.
	FailOn    rules.Severity
	FailOnSet bool
	// Exclude holds slash-separated globs (see Match).
	Exclude []string
	// MaxBytes limits the size of a file; 0 when not set.
	MaxBytes int64
	// Rules maps rule identifiers to the severity chosen for them.
	Rules map[string]rules.Severity
}

// raw is the file's schema, as TOML decodes it.
type raw struct {
	FailOn   *severityText            `toml:"fail-on"`
	Exclude  []string                 `toml:"exclude"`
	MaxBytes *int64                   `toml:"max-bytes"`
	Rules    map[string]*severityText `toml:"rules"`
}

// severityText validates a severity while decoding, so that TOML reports
// the line of a bad value.
type severityText struct{ s rules.Severity }

func (t *severityText) UnmarshalText(b []byte) error {
	s, err := rules.ParseSeverity(string(b))
	if err != nil {
		return fmt.Errorf("unknown severity %q: use \"error\", \"warning\", \"info\" or \"off\"", string(b))
	}
	t.s = s
	return nil
}

// Load reads and checks a configuration file.
func Load(file string) (*Config, error) {
	src, err := os.ReadFile(file)
	if err != nil {
		var pe *os.PathError
		if errors.As(err, &pe) {
			err = pe.Err
		}
		return nil, fmt.Errorf("%s: %v", file, err)
	}
	return Parse(file, src)
}

// Parse checks the text of a configuration file named file. Errors name the
// file and, where it can be found, the line: "FILE:LINE: what is wrong".
func Parse(file string, src []byte) (*Config, error) {
	var r raw
	md, err := toml.Decode(string(src), &r)
	if err != nil {
		var pe toml.ParseError
		if errors.As(err, &pe) && pe.Position.Line > 0 {
			return nil, fmt.Errorf("%s:%d: %s", file, pe.Position.Line, pe.Message)
		}
		return nil, fmt.Errorf("%s: %v", file, err)
	}
	at := func(key ...string) string {
		if l := keyLine(string(src), key); l > 0 {
			return fmt.Sprintf("%s:%d", file, l)
		}
		return file
	}
	if und := md.Undecoded(); len(und) > 0 {
		k := und[0]
		return nil, fmt.Errorf("%s: unknown key %q: the keys are fail-on, exclude, max-bytes and the [rules] table", at(k...), k.String())
	}
	abs, err := filepath.Abs(file)
	if err != nil {
		return nil, fmt.Errorf("%s: %v", file, err)
	}
	c := &Config{Path: file, Dir: filepath.Dir(abs), Exclude: r.Exclude, Rules: map[string]rules.Severity{}}
	if r.FailOn != nil {
		if r.FailOn.s == rules.Off {
			return nil, fmt.Errorf("%s: fail-on takes \"error\", \"warning\" or \"info\", not \"off\"", at("fail-on"))
		}
		c.FailOn, c.FailOnSet = r.FailOn.s, true
	}
	if r.MaxBytes != nil {
		if *r.MaxBytes <= 0 {
			return nil, fmt.Errorf("%s: max-bytes must be a positive number of bytes, not %d", at("max-bytes"), *r.MaxBytes)
		}
		c.MaxBytes = *r.MaxBytes
	}
	for _, g := range c.Exclude {
		if err := checkGlob(g); err != nil {
			return nil, fmt.Errorf("%s: bad exclude pattern %q: %v", at("exclude"), g, err)
		}
	}
	ids := make([]string, 0, len(r.Rules))
	for id := range r.Rules {
		ids = append(ids, id)
	}
	sort.Strings(ids) // report the same error every time
	for _, id := range ids {
		if rules.Lookup(id) == nil {
			return nil, fmt.Errorf("%s: unknown rule %q in [rules]: `datumlint rules` lists them", at("rules", id), id)
		}
		if r.Rules[id] == nil {
			return nil, fmt.Errorf("%s: rule %q has no severity", at("rules", id), id)
		}
		c.Rules[id] = r.Rules[id].s
	}
	return c, nil
}

// keyLine finds the line on which a dotted key is defined, by a plain scan
// of the text (TOML's decoder does not expose key positions). It tracks
// [table] headers and understands bare, quoted and dotted keys; 0 if not
// found.
func keyLine(src string, key []string) int {
	var table []string
	for i, line := range strings.Split(src, "\n") {
		t := strings.TrimSpace(line)
		if strings.HasPrefix(t, "[") {
			h := strings.Trim(t, "[]")
			if j := strings.Index(t, "]"); j >= 0 {
				h = strings.Trim(t[:j], "[]")
			}
			table = splitKey(h)
			if hasPrefix(table, key) {
				return i + 1
			}
			continue
		}
		eq := strings.Index(t, "=")
		if eq <= 0 || strings.HasPrefix(t, "#") {
			continue
		}
		full := append(append([]string{}, table...), splitKey(t[:eq])...)
		if hasPrefix(full, key) {
			return i + 1
		}
	}
	return 0
}

func splitKey(s string) []string {
	var out []string
	for _, p := range strings.Split(s, ".") {
		out = append(out, strings.Trim(strings.TrimSpace(p), `"'`))
	}
	return out
}

// hasPrefix reports whether the key path have starts with want.
func hasPrefix(have, want []string) bool {
	if len(have) < len(want) {
		return false
	}
	for i := range want {
		if have[i] != want[i] {
			return false
		}
	}
	return true
}

// Excluded reports whether a file is left out by the exclude globs, which
// are matched against its path relative to the configuration's folder.
// Files outside that folder are never excluded.
func (c *Config) Excluded(file string) bool {
	if c == nil || len(c.Exclude) == 0 {
		return false
	}
	abs, err := filepath.Abs(file)
	if err != nil {
		return false
	}
	rel, ok := beneath(c.Dir, abs)
	if !ok {
		return false
	}
	rel = filepath.ToSlash(rel)
	for _, g := range c.Exclude {
		if Match(g, rel) {
			return true
		}
	}
	return false
}

// Match reports whether a slash-separated relative path matches a glob:
// `*`, `?` and `[...]` match within one path segment (as path.Match), `**`
// matches any number of segments, including none. A glob that matches a
// folder matches everything beneath it; a leading "./" or "/" anchors
// nothing more than the glob already does (globs are always relative to
// the configuration's folder).
func Match(glob, name string) bool {
	glob = strings.TrimPrefix(strings.TrimPrefix(glob, "./"), "/")
	glob = strings.TrimSuffix(glob, "/")
	return matchSegs(strings.Split(glob, "/"), strings.Split(name, "/"))
}

func matchSegs(pat, segs []string) bool {
	for len(pat) > 0 {
		if pat[0] == "**" {
			for len(pat) > 1 && pat[1] == "**" {
				pat = pat[1:]
			}
			if len(pat) == 1 {
				return true
			}
			for i := 0; i <= len(segs); i++ {
				if matchSegs(pat[1:], segs[i:]) {
					return true
				}
			}
			return false
		}
		if len(segs) == 0 {
			return false
		}
		if ok, _ := path.Match(pat[0], segs[0]); !ok {
			return false
		}
		pat, segs = pat[1:], segs[1:]
	}
	return true // the glob matched the whole path or a folder above it
}

func checkGlob(g string) error {
	if strings.TrimSpace(g) == "" {
		return errors.New("empty pattern")
	}
	for _, seg := range strings.Split(g, "/") {
		if seg == "**" {
			continue
		}
		if strings.Contains(seg, "**") {
			return errors.New("** must be a whole path segment, as in dir/**/name")
		}
		if _, err := path.Match(seg, ""); err != nil {
			return err
		}
	}
	return nil
}

// Overrides are the command line's --enable and --disable lists.
type Overrides struct {
	Enable, Disable []string
}

// Check rejects unknown rule identifiers and a rule both enabled and
// disabled.
func (o Overrides) Check() error {
	dis := map[string]bool{}
	for _, id := range o.Disable {
		if rules.Lookup(id) == nil {
			return fmt.Errorf("--disable: unknown rule %q: `datumlint rules` lists them", id)
		}
		dis[id] = true
	}
	for _, id := range o.Enable {
		if rules.Lookup(id) == nil {
			return fmt.Errorf("--enable: unknown rule %q: `datumlint rules` lists them", id)
		}
		if dis[id] {
			return fmt.Errorf("rule %q is both enabled and disabled on the command line", id)
		}
	}
	return nil
}

// Settings combines a configuration (nil for none) with the command line:
// an enabled rule runs at the configuration's severity, or its default
// where the configuration turns it off; a disabled rule is off.
func (c *Config) Settings(o Overrides) *rules.Settings {
	s := &rules.Settings{Severity: map[string]rules.Severity{}}
	if c != nil {
		for id, sev := range c.Rules {
			s.Severity[id] = sev
		}
	}
	for _, id := range o.Enable {
		if s.Severity[id] == rules.Off {
			delete(s.Severity, id) // back to the default
		}
	}
	for _, id := range o.Disable {
		s.Severity[id] = rules.Off
	}
	return s
}

// display shortens an absolute path to one relative to the working folder
// where it lies beneath it, for messages.
func display(abs string) string {
	wd, err := os.Getwd()
	if err != nil {
		return abs
	}
	if rel, ok := beneath(wd, abs); ok {
		return rel
	}
	return abs
}

// beneath returns path relative to dir, if it lies in dir or below it.
func beneath(dir, path string) (string, bool) {
	rel, err := filepath.Rel(dir, path)
	if err != nil || rel == ".." || strings.HasPrefix(rel, ".."+string(filepath.Separator)) {
		return "", false
	}
	return rel, true
}

// Finder finds and caches the configuration of each folder. It is safe for
// concurrent use.
type Finder struct {
	mu    sync.Mutex
	dirs  map[string]*found
	files map[string]*found
}

type found struct {
	c   *Config
	err error
}

// Find returns the configuration that applies to files in dir: the nearest
// .datumlint.toml in dir or a folder above it, stopping after the first
// folder that holds .git (the repository root) or at the filesystem root.
// It returns nil, nil where there is none.
func (f *Finder) Find(dir string) (*Config, error) {
	abs, err := filepath.Abs(dir)
	if err != nil {
		return nil, err
	}
	f.mu.Lock()
	defer f.mu.Unlock()
	if f.dirs == nil {
		f.dirs, f.files = map[string]*found{}, map[string]*found{}
	}
	var walked []string
	var res *found
	for d := abs; ; {
		if r, ok := f.dirs[d]; ok {
			res = r
			break
		}
		walked = append(walked, d)
		p := filepath.Join(d, FileName)
		if st, err := os.Stat(p); err == nil && !st.IsDir() {
			r, ok := f.files[p]
			if !ok {
				c, err := Load(display(p))
				r = &found{c, err}
				f.files[p] = r
			}
			res = r
			break
		}
		if _, err := os.Lstat(filepath.Join(d, ".git")); err == nil {
			break // the repository root: configurations above it are not ours
		}
		parent := filepath.Dir(d)
		if parent == d {
			break
		}
		d = parent
	}
	if res == nil {
		res = &found{}
	}
	for _, d := range walked {
		f.dirs[d] = res
	}
	return res.c, res.err
}
