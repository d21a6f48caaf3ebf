// Package lint runs the rules over files and folders: it finds the files
// it has a reader for, reads each into the part model with the reader its
// extension chooses, checks them in parallel (one worker per core) and
// returns, per file, what it read and found, in the same order as a serial
// run would.
package lint

import (
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"runtime"
	"sort"
	"strings"
	"sync"

	"github.com/datumlint/datumlint/grammar"
	"github.com/datumlint/datumlint/grammar/model"
	"github.com/datumlint/datumlint/grammar/qif"
	"github.com/datumlint/datumlint/grammar/source"
	"github.com/datumlint/datumlint/rules"
)

// Ext is the extension of callout files.
const Ext = ".callouts"

// A Reader builds the part model of one file. It never fails: what it
// cannot read is recorded in the part's Problems.
type Reader func(name string, src []byte) *model.Part

// QIFExt is the extension of QIF documents.
const QIFExt = ".qif"

// readers chooses a reader by file extension (compared in any case), as
// cmd/shfmt chooses a language by file name. what names the files in
// messages; notation is true for the reader whose files the rules' fixes
// are written for (their edits are lines of the notation): a finding on a
// file of another format carries no fixes, and check --fix never writes
// one.
var readers = []struct {
	ext      string
	what     string
	read     Reader
	notation bool
}{
	{Ext, "a callouts file", grammar.Read, true},
	{QIFExt, "a QIF file", qif.Read, false},
}

func readerOf(name string) int {
	ext := strings.ToLower(filepath.Ext(name))
	for i, r := range readers {
		if r.ext == ext {
			return i
		}
	}
	return -1
}

// ReaderFor returns the reader for a file name, or nil when no reader
// knows its extension.
func ReaderFor(name string) Reader {
	if i := readerOf(name); i >= 0 {
		return readers[i].read
	}
	return nil
}

// Editable reports whether the rules' fixes apply to a file: it is read as
// the notation (a .callouts file, or a name no reader knows). A QIF file is
// not: fixes are lines of the notation, and datumlint never writes one.
func Editable(name string) bool {
	i := readerOf(name)
	return i < 0 || readers[i].notation
}

// IsQIF reports whether a file is read as a QIF document.
func IsQIF(name string) bool { return strings.EqualFold(filepath.Ext(name), QIFExt) }

// like names what a folder's name makes it look like ("a QIF file").
func like(name string) string {
	if i := readerOf(name); i >= 0 {
		return readers[i].what
	}
	return "a file"
}

// Read reads a file's source into the part model with the reader its
// extension chooses; a name no reader knows is read as the notation (a
// file named on the command line, or standard input).
func Read(name string, src []byte) *model.Part {
	if r := ReaderFor(name); r != nil {
		return r(name, src)
	}
	return grammar.Read(name, src)
}

// Exts lists the extensions that folders are walked for.
func Exts() []string {
	out := make([]string, len(readers))
	for i, r := range readers {
		out[i] = r.ext
	}
	return out
}

// namedLikeFile reports whether a folder's name ends in an extension that
// a reader knows (a likely mistake).
func namedLikeFile(name string) bool { return ReaderFor(name) != nil }

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
	// Override gives, by path, text to check in place of the file's (the
	// text that fixes would leave, for check --fix --diff).
	Override map[string][]byte
	// KeepParts keeps every file's source and part model in the result
	// (the report and the editor need them); otherwise only the source of
	// files with findings is kept, for outputs that quote it.
	KeepParts bool
}

// PathError is a path that could not be read; it is reported and the other
// paths are still checked (exit 2).
type PathError struct {
	Path string
	Err  error
}

func (e *PathError) Error() string { return fmt.Sprintf("%s: %v", e.Path, e.Err) }

// File is what a run read and found in one file.
type File struct {
	Path string
	// Root is the path on the command line the file was found under: the
	// folder that was walked, or the file itself where it was named.
	Root string
	// Source is the file as read: kept where it has findings, or with
	// Options.KeepParts; nil otherwise, and where the file was not read.
	Source *source.File
	// Statements are the file's statements, kept with Source.
	Statements []model.Statement
	// Part is the model the reader built (with Options.KeepParts only).
	Part        *model.Part
	Diagnostics []rules.Diagnostic
}

// Result is the outcome of a run: one File per checked file, in the order
// of a serial run, the paths that could not be read, the likely mistakes
// that did not stop the run, and how many walked files were excluded.
type Result struct {
	Files    []*File
	Errors   []*PathError
	Warnings []*PathError
	Excluded int
	byPath   map[string]*File
}

// Diagnostics returns every file's findings, sorted by file, line and
// column.
func (r *Result) Diagnostics() []rules.Diagnostic {
	var out []rules.Diagnostic
	for _, f := range r.Files {
		out = append(out, f.Diagnostics...)
	}
	rules.Sort(out)
	return out
}

// File returns the result of the file with the path, or nil.
func (r *Result) File(path string) *File {
	if r.byPath == nil {
		r.byPath = make(map[string]*File, len(r.Files))
		for _, f := range r.Files {
			r.byPath[f.Path] = f
		}
	}
	return r.byPath[path]
}

// Found is what Collect found under the paths.
type Found struct {
	// Files are the files to check, in order.
	Files []string
	// Roots are, for each file, the path it was found under (the walked
	// folder, or the file as named).
	Roots []string
	// Errors are the paths that could not be read; a run that has any
	// exits 2.
	Errors []*PathError
	// Warnings are likely mistakes that do not stop anything: a folder
	// named like a callouts file, whose files are still checked.
	Warnings []*PathError
	// Excluded counts the walked files that exclude left out.
	Excluded int
}

// Collect expands paths into the files to check: files as named, folders
// walked for the extensions a reader knows, in sorted order. Missing or
// unreadable paths, permission errors and symbolic link loops become
// Errors; a folder named like a callouts file is a Warning.
func Collect(paths []string, exclude func(string) bool) Found {
	var out Found
	var files, roots []string
	var errs []*PathError
	seen := map[string]bool{}
	var root string
	named := func(p string) {
		// Likely a mistake (an export that made a folder per part): say
		// so, and still check the files inside.
		out.Warnings = append(out.Warnings, &PathError{p, fmt.Errorf("a folder named like %s; the files inside it are checked", like(p))})
	}
	add := func(p string) {
		// x.callouts and ./x.callouts are one file, checked once.
		if c := filepath.Clean(p); !seen[c] {
			seen[c] = true
			files, roots = append(files, p), append(roots, root)
		}
	}
	for _, root = range paths {
		info, err := os.Stat(root)
		if err != nil {
			errs = append(errs, &PathError{root, friendlyErr(err)})
			continue
		}
		if info.IsDir() && namedLikeFile(filepath.Clean(root)) {
			named(root)
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
				if p != root && namedLikeFile(d.Name()) {
					named(p)
				}
				return nil
			}
			if ReaderFor(d.Name()) == nil {
				return nil
			}
			if d.Type()&fs.ModeSymlink != 0 {
				st, err := os.Stat(p)
				if err != nil {
					errs = append(errs, &PathError{p, friendlyErr(err)})
					return nil
				}
				if st.IsDir() {
					errs = append(errs, &PathError{p, fmt.Errorf("a folder named like %s (symbolic link); not followed", like(d.Name()))})
					return nil
				}
			}
			if exclude != nil && exclude(p) {
				out.Excluded++
				return nil
			}
			add(p)
			return nil
		})
		if err != nil {
			errs = append(errs, &PathError{root, friendlyErr(err)})
		}
	}
	out.Files, out.Roots, out.Errors = files, roots, errs
	return out
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
	found := Collect(paths, opt.Exclude)
	files := found.Files
	res := Result{Files: make([]*File, len(files)), Errors: found.Errors, Warnings: found.Warnings, Excluded: found.Excluded}
	workers := opt.Workers
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	max := opt.MaxBytes
	if max <= 0 {
		max = DefaultMaxBytes
	}
	pathErrs := make([]*PathError, len(files))
	var wg sync.WaitGroup
	next := make(chan int)
	for w := 0; w < workers && w < len(files); w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := range next {
				res.Files[i], pathErrs[i] = CheckPath(files[i], opt, max)
			}
		}()
	}
	for i := range files {
		next <- i
	}
	close(next)
	wg.Wait()
	for i, f := range res.Files {
		f.Root = found.Roots[i]
	}
	for _, e := range pathErrs {
		if e != nil {
			res.Errors = append(res.Errors, e)
		}
	}
	sort.SliceStable(res.Errors, func(i, j int) bool { return res.Errors[i].Path < res.Errors[j].Path })
	return res
}

// RunReader checks one file read from r (standard input) under the name
// given, which chooses the reader and the settings (Options.SettingsFor)
// and names the file in the findings. Input over the size limit is not
// read past it and gets the same one finding as a file over the limit.
func RunReader(name string, r io.Reader, opt Options) Result {
	f := &File{Path: name}
	res := Result{Files: []*File{f}}
	max := opt.MaxBytes
	if max <= 0 {
		max = DefaultMaxBytes
	}
	settings := opt.Settings
	if opt.SettingsFor != nil {
		s, err := opt.SettingsFor(name)
		if err != nil {
			res.Errors = append(res.Errors, &PathError{name, err})
			return res
		}
		settings = s
	}
	src, err := io.ReadAll(io.LimitReader(r, max+1))
	if err != nil {
		res.Errors = append(res.Errors, &PathError{name, err})
		return res
	}
	if int64(len(src)) > max {
		f.Diagnostics = []rules.Diagnostic{{File: name, Rule: rules.Syntax.ID, Severity: rules.Error, Span: source.Line(1),
			Message: fmt.Sprintf("the input is over the size limit of %d bytes; it was not read (raise the limit with --max-bytes if it really is one part)", max)}}
		return res
	}
	CheckSource(f, src, settings, opt.KeepParts)
	return res
}

// CheckPath reads and checks one file. The File is never nil; where the
// file could not be read it has no findings and the PathError says why.
func CheckPath(path string, opt Options, max int64) (*File, *PathError) {
	out := &File{Path: path}
	st, err := os.Stat(path)
	if err != nil {
		return out, &PathError{path, friendlyErr(err)}
	}
	if st.IsDir() {
		return out, &PathError{path, errors.New("is a folder")}
	}
	settings := opt.Settings
	if opt.SettingsFor != nil {
		s, err := opt.SettingsFor(path)
		if err != nil {
			return out, &PathError{path, err}
		}
		settings = s
	}
	if st.Size() > max {
		out.Diagnostics = []rules.Diagnostic{tooBig(path, st.Size(), max)}
		return out, nil
	}
	src, ok := opt.Override[path]
	if !ok {
		if src, err = os.ReadFile(path); err != nil {
			return out, &PathError{path, friendlyErr(err)}
		}
	}
	CheckSource(out, src, settings, opt.KeepParts)
	return out, nil
}

// CheckSource reads src with the reader for f.Path and checks it, filling
// f; the source and the model are kept as Options.KeepParts says.
func CheckSource(f *File, src []byte, settings *rules.Settings, keep bool) {
	part := Read(f.Path, src)
	f.Diagnostics = rules.Check(part, settings)
	if !Editable(f.Path) {
		for i := range f.Diagnostics {
			f.Diagnostics[i].Fixes = nil
		}
	}
	if keep || len(f.Diagnostics) > 0 {
		f.Source, f.Statements = part.Source, part.Statements
	}
	if keep {
		f.Part = part
	}
}

func tooBig(path string, size, max int64) rules.Diagnostic {
	return rules.Diagnostic{File: path, Rule: rules.Syntax.ID, Severity: rules.Error, Span: source.Line(1),
		Message: fmt.Sprintf("the file is %d bytes, over the size limit of %d bytes; it was not read (raise the limit with --max-bytes if it really is one part)", size, max)}
}
