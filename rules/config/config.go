// Package config reads .datumlint.toml: which rules run at what severity,
// the failing severity, the size limit and the files to leave out. A
// configuration is found by walking up from a checked file's folder to the
// repository root (the first folder holding .git) or the filesystem root;
// the nearest file wins, with no merging of parents (common practice for
// linters: one file says everything that applies beneath it).
package config

import (
	"cmp"
	"errors"
	"fmt"
	"math"
	"os"
	"path"
	"path/filepath"
	"slices"
	"sort"
	"strings"
	"sync"

	"github.com/BurntSushi/toml"

	"github.com/datumlint/datumlint/grammar/spell"
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

// Keys are the top-level keys of the file, in the order messages name them.
var Keys = []string{"fail-on", "exclude", "max-bytes", "rules"}

// Error is one mistake in a configuration file, at a line where it can be
// found (0 where it cannot).
type Error struct {
	File string
	Line int
	Msg  string
}

func (e *Error) Error() string {
	if e.Line > 0 {
		return fmt.Sprintf("%s:%d: %s", e.File, e.Line, e.Msg)
	}
	return fmt.Sprintf("%s: %s", e.File, e.Msg)
}

// Errors are every mistake found in one file, in line order; Error joins
// them one to a line.
type Errors []*Error

func (es Errors) Error() string {
	out := make([]string, len(es))
	for i, e := range es {
		out[i] = e.Error()
	}
	return strings.Join(out, "\n")
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

// Parse checks the text of a configuration file named file. A file that is
// not TOML gives one error, where the TOML parser stopped; otherwise every
// mistake is reported at once (Errors, in line order), each naming the
// file and, where it can be found, the line: "FILE:LINE: what is wrong".
func Parse(file string, src []byte) (*Config, error) {
	var top map[string]any
	if _, err := toml.Decode(string(src), &top); err != nil {
		var pe toml.ParseError
		if errors.As(err, &pe) && pe.Position.Line > 0 {
			return nil, Errors{{file, pe.Position.Line, pe.Message}}
		}
		return nil, Errors{{file, 0, err.Error()}}
	}
	abs, err := filepath.Abs(file)
	if err != nil {
		return nil, fmt.Errorf("%s: %v", file, err)
	}
	c := &Config{Path: file, Dir: filepath.Dir(abs), Rules: map[string]rules.Severity{}}
	var errs Errors
	report := func(key []string, format string, args ...any) {
		errs = append(errs, &Error{file, keyLine(string(src), key), fmt.Sprintf(format, args...)})
	}
	for _, k := range sortedKeys(top) {
		v := top[k]
		key := []string{k}
		switch k {
		case "fail-on":
			sev, ok := severityOf(v)
			switch {
			case !ok:
				if w, isText := v.(string); isText {
					report(key, "unknown severity %q: use \"error\", \"warning\" or \"info\"", w)
				} else {
					report(key, "fail-on takes a severity in quotes: \"error\", \"warning\" or \"info\"")
				}
			case sev == rules.Off:
				report(key, "fail-on takes \"error\", \"warning\" or \"info\", not \"off\"")
			default:
				c.FailOn, c.FailOnSet = sev, true
			}
		case "exclude":
			list, ok := v.([]any)
			if !ok {
				report(key, "exclude takes a list of globs, e.g. exclude = [\"build/**\"]")
				continue
			}
			for _, g := range list {
				gs, ok := g.(string)
				if !ok {
					report(key, "exclude takes a list of globs in quotes, e.g. exclude = [\"build/**\"]")
					continue
				}
				if err := checkGlob(gs); err != nil {
					report(key, "bad exclude pattern %q: %v", gs, err)
					continue
				}
				c.Exclude = append(c.Exclude, gs)
			}
		case "max-bytes":
			n, ok := v.(int64)
			switch {
			case !ok:
				report(key, "max-bytes takes a whole number of bytes, e.g. max-bytes = 1000000")
			case n <= 0:
				report(key, "max-bytes must be a positive number of bytes, not %d", n)
			default:
				c.MaxBytes = n
			}
		case "rules":
			table, ok := v.(map[string]any)
			if !ok {
				report(key, "rules is a table of rule severities: write [rules] and then lines such as datum-unused = \"off\"")
				continue
			}
			for _, id := range sortedKeys(table) {
				rk := []string{"rules", id}
				if slices.Contains(Keys, id) && id != "rules" {
					report(rk, "%s is a top-level key, not a rule: move it above [rules]", id)
					continue
				}
				if rules.Lookup(id) == nil {
					if sg := rules.Suggest(id); sg != "" {
						report(rk, "unknown rule %q in [rules]; did you mean %q?", id, sg)
					} else {
						report(rk, "unknown rule %q in [rules]: `datumlint rules` lists them", id)
					}
					continue
				}
				sev, ok := severityOf(table[id])
				if !ok {
					if w, isText := table[id].(string); isText {
						report(rk, "unknown severity %q for rule %s: use \"error\", \"warning\", \"info\" or \"off\"", w, id)
					} else {
						report(rk, "rule %s takes a severity in quotes: \"error\", \"warning\", \"info\" or \"off\"", id)
					}
					continue
				}
				c.Rules[id] = sev
			}
		default:
			hint := "the keys are fail-on, exclude, max-bytes and the [rules] table"
			if sg := spell.Nearest(k, Keys); sg != "" {
				hint = fmt.Sprintf("did you mean %q?", sg)
			} else if id := rules.Suggest(k); id != "" {
				hint = fmt.Sprintf("a rule's severity goes in the [rules] table, as %s = \"...\" under [rules]", id)
			}
			report(key, "unknown key %q: %s", k, hint)
		}
	}
	if len(errs) > 0 {
		// In line order; a mistake whose line was not found goes last.
		slices.SortStableFunc(errs, func(a, b *Error) int {
			la, lb := a.Line, b.Line
			if la == 0 {
				la = math.MaxInt
			}
			if lb == 0 {
				lb = math.MaxInt
			}
			return cmp.Compare(la, lb)
		})
		return nil, errs
	}
	return c, nil
}

// severityOf reads a severity written as a string.
func severityOf(v any) (rules.Severity, bool) {
	s, ok := v.(string)
	if !ok {
		return 0, false
	}
	sev, err := rules.ParseSeverity(s)
	return sev, err == nil
}

func sortedKeys[V any](m map[string]V) []string {
	ks := make([]string, 0, len(m))
	for k := range m {
		ks = append(ks, k)
	}
	sort.Strings(ks)
	return ks
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
			return unknownFlagRule("--disable", id)
		}
		dis[id] = true
	}
	for _, id := range o.Enable {
		if rules.Lookup(id) == nil {
			return unknownFlagRule("--enable", id)
		}
		if dis[id] {
			return fmt.Errorf("rule %q is both enabled and disabled on the command line", id)
		}
	}
	return nil
}

func unknownFlagRule(flag, id string) error {
	if sg := rules.Suggest(id); sg != "" {
		return fmt.Errorf("%s: unknown rule %q; did you mean %q?", flag, id, sg)
	}
	return fmt.Errorf("%s: unknown rule %q: `datumlint rules` lists them", flag, id)
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
