// Package lint runs the rules over files and folders: it finds the
// .callouts files, checks them in parallel (one worker per core) and returns
// the findings in the same order as a serial run would.
package lint

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"runtime"
	"sort"
	"strings"
	"sync"

	"github.com/datumlint/datumlint/rules"
)

// Ext is the extension of callout files.
const Ext = ".callouts"

// DefaultMaxBytes is the default size limit of one file.
const DefaultMaxBytes = 16 << 20

// Options control a run.
type Options struct {
	Settings *rules.Settings
	// SettingsFor, when set, chooses the settings per file (configuration
	// found by walking up from the file); it overrides Settings.
	SettingsFor func(path string) (*rules.Settings, error)
	// Exclude reports whether a walked file is left out.
	Exclude func(path string) bool
	// MaxBytes limits the size of a file (0: DefaultMaxBytes).
	MaxBytes int64
	// Workers is the number of files checked at once (0: one per core).
	Workers int
}

// PathError is a path that could not be read; it is reported and the other
// paths are still checked (exit 2).
type PathError struct {
	Path string
	Err  error
}

func (e *PathError) Error() string { return fmt.Sprintf("%s: %v", e.Path, e.Err) }

// Result is the outcome of a run.
type Result struct {
	Files       []string
	Diagnostics []rules.Diagnostic
	Errors      []*PathError
}

// Collect expands paths into the files to check: files as named, folders
// walked for *.callouts in sorted order. Missing or unreadable paths,
// permission errors and symbolic link loops become PathErrors.
func Collect(paths []string, exclude func(string) bool) ([]string, []*PathError) {
	var files []string
	var errs []*PathError
	seen := map[string]bool{}
	add := func(p string) {
		// x.callouts and ./x.callouts are one file, checked once.
		if c := filepath.Clean(p); !seen[c] {
			seen[c] = true
			files = append(files, p)
		}
	}
	for _, root := range paths {
		info, err := os.Stat(root)
		if err != nil {
			errs = append(errs, &PathError{root, friendlyErr(err)})
			continue
		}
		if info.IsDir() && strings.HasSuffix(filepath.Clean(root), Ext) {
			// Named like a file but a folder: report it (exit 2), and
			// still check what is inside.
			errs = append(errs, &PathError{root, errors.New("a folder named like a callouts file; the .callouts files inside it are checked")})
		}
		if !info.IsDir() {
			if !info.Mode().IsRegular() {
				errs = append(errs, &PathError{root, errors.New("not a regular file")})
				continue
			}
			add(root)
			continue
		}
		err = filepath.WalkDir(root, func(p string, d fs.DirEntry, err error) error {
			if err != nil {
				errs = append(errs, &PathError{p, friendlyErr(err)})
				if d != nil && d.IsDir() {
					return fs.SkipDir
				}
				return nil
			}
			if d.IsDir() {
				if p != root && strings.HasPrefix(d.Name(), ".") && d.Name() != "." && d.Name() != ".." {
					return fs.SkipDir // .git and other hidden folders
				}
				if p != root && strings.HasSuffix(d.Name(), Ext) {
					// Likely a mistake (an export that made a folder per part);
					// say so, and still check the files inside.
					errs = append(errs, &PathError{p, errors.New("a folder named like a callouts file; the .callouts files inside it are checked")})
				}
				return nil
			}
			if !strings.HasSuffix(d.Name(), Ext) {
				return nil
			}
			if d.Type()&fs.ModeSymlink != 0 {
				st, err := os.Stat(p)
				if err != nil {
					errs = append(errs, &PathError{p, friendlyErr(err)})
					return nil
				}
				if st.IsDir() {
					errs = append(errs, &PathError{p, errors.New("a folder named like a callouts file (symbolic link); not followed")})
					return nil
				}
			}
			if exclude != nil && exclude(p) {
				return nil
			}
			add(p)
			return nil
		})
		if err != nil {
			errs = append(errs, &PathError{root, friendlyErr(err)})
		}
	}
	return files, errs
}

func friendlyErr(err error) error {
	var pe *fs.PathError
	if errors.As(err, &pe) {
		err = pe.Err
	}
	switch {
	case errors.Is(err, fs.ErrNotExist):
		return errors.New("no such file or folder")
	case errors.Is(err, fs.ErrPermission):
		return errors.New("permission denied")
	}
	return err
}

// Run checks every file under paths.
func Run(paths []string, opt Options) Result {
	files, errs := Collect(paths, opt.Exclude)
	res := Result{Files: files, Errors: errs}
	workers := opt.Workers
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	max := opt.MaxBytes
	if max <= 0 {
		max = DefaultMaxBytes
	}
	type out struct {
		diags []rules.Diagnostic
		err   *PathError
	}
	outs := make([]out, len(files))
	var wg sync.WaitGroup
	next := make(chan int)
	for w := 0; w < workers && w < len(files); w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := range next {
				d, err := CheckPath(files[i], opt, max)
				outs[i] = out{d, err}
			}
		}()
	}
	for i := range files {
		next <- i
	}
	close(next)
	wg.Wait()
	for _, o := range outs {
		res.Diagnostics = append(res.Diagnostics, o.diags...)
		if o.err != nil {
			res.Errors = append(res.Errors, o.err)
		}
	}
	rules.Sort(res.Diagnostics)
	sort.SliceStable(res.Errors, func(i, j int) bool { return res.Errors[i].Path < res.Errors[j].Path })
	return res
}

// CheckPath reads and checks one file.
func CheckPath(path string, opt Options, max int64) ([]rules.Diagnostic, *PathError) {
	st, err := os.Stat(path)
	if err != nil {
		return nil, &PathError{path, friendlyErr(err)}
	}
	if st.IsDir() {
		return nil, &PathError{path, errors.New("is a folder")}
	}
	settings := opt.Settings
	if opt.SettingsFor != nil {
		s, err := opt.SettingsFor(path)
		if err != nil {
			return nil, &PathError{path, err}
		}
		settings = s
	}
	if st.Size() > max {
		return []rules.Diagnostic{tooBig(path, st.Size(), max)}, nil
	}
	src, err := os.ReadFile(path)
	if err != nil {
		return nil, &PathError{path, friendlyErr(err)}
	}
	return rules.Check(path, src, settings), nil
}

func tooBig(path string, size, max int64) rules.Diagnostic {
	d := rules.Diagnostic{File: path, Rule: rules.Syntax.ID, Severity: rules.Error,
		Message: fmt.Sprintf("the file is %d bytes, over the size limit of %d bytes; it was not read (raise the limit with --max-bytes if it really is one part)", size, max)}
	d.Span.Start.Line, d.Span.Start.Col, d.Span.End.Line, d.Span.End.Col = 1, 1, 1, 2
	return d
}
