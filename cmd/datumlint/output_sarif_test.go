package main

import (
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"sort"
	"strings"
	"testing"

	"github.com/datumlint/datumlint/grammar/source"

	"github.com/santhosh-tekuri/jsonschema/v6"

	"github.com/datumlint/datumlint/rules"
	"github.com/datumlint/datumlint/rules/lint"
)

// compileSARIFSchema compiles the OASIS SARIF 2.1.0 schema kept in the
// repository (testdata/sarif/, with its notice), after checking that the
// copy is the one its README names: the OASIS terms allow copies, not
// changes.
func compileSARIFSchema(t *testing.T) *jsonschema.Schema {
	t.Helper()
	dir := filepath.Join(projectRoot(t), "testdata", "sarif")
	path := filepath.Join(dir, "sarif-schema-2.1.0.json")
	schema, err := os.ReadFile(path)
	if err != nil {
		t.Fatalf("the SARIF schema is part of the repository's test data: %v", err)
	}
	notice, err := os.ReadFile(filepath.Join(dir, "README.md"))
	if err != nil {
		t.Fatalf("the SARIF schema's notice: %v", err)
	}
	sum := sha256.Sum256(schema)
	if want := hex.EncodeToString(sum[:]); !strings.Contains(string(notice), "SHA-256 `"+want+"`") {
		t.Fatalf("%s is not the copy testdata/sarif/README.md names (its SHA-256 is %s): restore the OASIS file unchanged", path, want)
	}
	c := jsonschema.NewCompiler()
	c.AssertFormat()
	sch, err := c.Compile(path)
	if err != nil {
		t.Fatalf("compiling %s: %v", path, err)
	}
	return sch
}

// projectRoot is the folder of go.mod above the test's folder.
func projectRoot(t *testing.T) string {
	t.Helper()
	dir, err := os.Getwd()
	if err != nil {
		t.Fatal(err)
	}
	for {
		if _, err := os.Stat(filepath.Join(dir, "go.mod")); err == nil {
			return dir
		}
		parent := filepath.Dir(dir)
		if parent == dir {
			t.Fatal("no go.mod above the test's folder")
		}
		dir = parent
	}
}

func validateSARIF(t *testing.T, sch *jsonschema.Schema, out []byte) {
	t.Helper()
	inst, err := jsonschema.UnmarshalJSON(bytes.NewReader(out))
	if err != nil {
		t.Fatalf("SARIF output is not JSON: %v\n%s", err, out)
	}
	if err := sch.Validate(inst); err != nil {
		t.Fatalf("SARIF output does not validate: %v", err)
	}
}

// The schema the tests validate against rejects what SARIF 2.1.0 rejects:
// a run without its tool, a result level SARIF does not have.
func TestSARIFSchemaRejectsBrokenLogs(t *testing.T) {
	sch := compileSARIFSchema(t)
	for _, log := range []string{
		`{"version": "2.1.0", "runs": [{"results": []}]}`,
		`{"version": "2.1.0", "runs": [{"tool": {"driver": {"name": "datumlint"}}, "results": [{"message": {"text": "m"}, "level": "info"}]}]}`,
		`{"version": "2.0.0", "runs": []}`,
	} {
		inst, err := jsonschema.UnmarshalJSON(strings.NewReader(log))
		if err != nil {
			t.Fatal(err)
		}
		if err := sch.Validate(inst); err == nil {
			t.Errorf("the schema accepts a broken log: %s", log)
		}
	}
}

// The parts of a SARIF log the tests look at.
type sarifDoc struct {
	Runs []struct {
		Tool struct {
			Driver struct {
				Rules []struct {
					ID string `json:"id"`
				} `json:"rules"`
			} `json:"driver"`
		} `json:"tool"`
		Results []struct {
			RuleID    string `json:"ruleId"`
			RuleIndex int    `json:"ruleIndex"`
			Level     string `json:"level"`
			Message   struct {
				Text string `json:"text"`
			} `json:"message"`
			Locations []struct {
				PhysicalLocation struct {
					ArtifactLocation struct {
						URI       string `json:"uri"`
						URIBaseID string `json:"uriBaseId"`
					} `json:"artifactLocation"`
					Region struct {
						StartLine, StartColumn, EndLine, EndColumn int
					} `json:"region"`
				} `json:"physicalLocation"`
			} `json:"locations"`
			PartialFingerprints map[string]string `json:"partialFingerprints"`
			Suppressions        []struct {
				Kind          string `json:"kind"`
				Justification string `json:"justification"`
			} `json:"suppressions"`
		} `json:"results"`
	} `json:"runs"`
}

func runCLI(t *testing.T, args ...string) (stdout []byte, code int) {
	t.Helper()
	var out, errb bytes.Buffer
	code = run(args, &out, &errb)
	if code == 2 {
		t.Fatalf("datumlint %s: exit 2: %s", strings.Join(args, " "), errb.String())
	}
	return out.Bytes(), code
}

func writeFiles(t *testing.T, dir string, files map[string]string) {
	t.Helper()
	for name, text := range files {
		p := filepath.Join(dir, filepath.FromSlash(name))
		if err := os.MkdirAll(filepath.Dir(p), 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(p, []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
	}
}

const header = "part \"Test bracket TB-7\"\nunits mm\nstandard asme-2018\n\n"

// A folder of mixed files: clean, with findings of several rules, syntax
// errors, a suppression, Unicode symbols, CRLF line ends, a name with a
// space, a file in a subfolder.
var mixedFiles = map[string]string{
	"clean.callouts": header + `feature base plane normal -z at (0, 0, 0)
frame base: flatness 0.02
`,
	"findings.callouts": header + `feature base plane normal -z at (0, 0, 0)
feature rear plane normal -y at (0, 0, 0)
datum A on base
datum O on rear
frame base: flatness 0.02 datums A
frame rear: perpendicularity 0
frame nope: flatness 0.1
`,
	"syntax.callouts": header + `feature base plane normal -z at (0, 0, 0)
frame base: flatness
feature ??? plane
`,
	"suppressed.callouts": header + `feature base plane normal -z at (0, 0, 0)
datum A on base  # datumlint: allow datum-unused -- referenced on the assembly drawing
frame base: flatness 0  # datumlint: allow tolerance-value -- zero flatness agreed, ref. Q-9
`,
	"sub dir/unicode ⌀.callouts": header + `feature bore hole size 25 ±0.05 axis +z at (60, 40, 0)
frame bore: position ⌀0.1 Ⓜ datums A
`,
	"crlf.callouts":     strings.ReplaceAll(header+"feature base plane normal -z at (0, 0, 0)\ndatum A on base\n", "\n", "\r\n"),
	"noheader.callouts": "feature base plane normal -z at (0, 0, 0)\n",
	"empty.callouts":    "",
}

func TestSARIFMatchesJSONAndValidates(t *testing.T) {
	sch := compileSARIFSchema(t)
	dir := t.TempDir()
	writeFiles(t, dir, mixedFiles)
	t.Chdir(dir)

	sarifOut, code := runCLI(t, "check", "--format", "sarif", ".")
	if code != 1 {
		t.Errorf("exit %d, want 1 (the folder has findings)", code)
	}
	validateSARIF(t, sch, sarifOut)
	jsonOut, _ := runCLI(t, "check", "--format", "json", ".")

	var doc sarifDoc
	if err := json.Unmarshal(sarifOut, &doc); err != nil {
		t.Fatal(err)
	}
	if len(doc.Runs) != 1 {
		t.Fatalf("%d runs, want 1", len(doc.Runs))
	}
	run := doc.Runs[0]
	listed := map[string]int{}
	for i, r := range run.Tool.Driver.Rules {
		listed[r.ID] = i
	}
	for _, r := range append(rules.All(), &rules.Rule{ID: rules.InternalRule}) {
		if _, ok := listed[r.ID]; !ok {
			t.Errorf("the driver does not list rule %s", r.ID)
		}
	}

	var findings []jsonFinding
	if err := json.Unmarshal(jsonOut, &findings); err != nil {
		t.Fatal(err)
	}
	key := func(file string, line, col, endLine, endCol int, rule, msg string) string {
		return fmt.Sprintf("%s|%d:%d-%d:%d|%s|%s", filepath.ToSlash(file), line, col, endLine, endCol, rule, msg)
	}
	var want, got, suppressed []string
	for _, f := range findings {
		want = append(want, key(f.File, f.Line, f.Column, f.EndLine, f.EndColumn, f.Rule, f.Message))
	}
	fingerprints := map[string]bool{}
	for _, r := range run.Results {
		if i, ok := listed[r.RuleID]; !ok || i != r.RuleIndex {
			t.Errorf("result names rule %q at index %d; the driver lists it at %d (listed: %v)", r.RuleID, r.RuleIndex, i, ok)
		}
		if len(r.Locations) != 1 {
			t.Fatalf("result has %d locations, want 1", len(r.Locations))
		}
		loc := r.Locations[0].PhysicalLocation
		if loc.ArtifactLocation.URIBaseID != "SRCROOT" || strings.Contains(loc.ArtifactLocation.URI, ":") {
			t.Errorf("a file in the working folder must be a relative URI against SRCROOT: %+v", loc.ArtifactLocation)
		}
		fp := r.PartialFingerprints[fingerprintKey]
		if fp == "" || fingerprints[fp] {
			t.Errorf("fingerprint %q missing or not unique", fp)
		}
		fingerprints[fp] = true
		file := strings.ReplaceAll(loc.ArtifactLocation.URI, "%20", " ")
		file = strings.ReplaceAll(file, "%E2%8C%80", "⌀")
		k := key(file, loc.Region.StartLine, loc.Region.StartColumn, loc.Region.EndLine, loc.Region.EndColumn, r.RuleID, r.Message.Text)
		if len(r.Suppressions) > 0 {
			if r.Suppressions[0].Kind != "inSource" || r.Suppressions[0].Justification == "" {
				t.Errorf("suppression without kind inSource and a justification: %+v", r.Suppressions)
			}
			suppressed = append(suppressed, k+"|"+r.Suppressions[0].Justification)
			continue
		}
		got = append(got, k)
	}
	sort.Strings(want)
	sort.Strings(got)
	if strings.Join(want, "\n") != strings.Join(got, "\n") {
		t.Errorf("unsuppressed SARIF results differ from the JSON findings:\nSARIF:\n%s\nJSON:\n%s", strings.Join(got, "\n"), strings.Join(want, "\n"))
	}
	if len(want) < 8 {
		t.Errorf("the mixed folder gave only %d findings; the test data no longer exercises much:\n%s", len(want), strings.Join(want, "\n"))
	}
	sort.Strings(suppressed)
	wantSup := []string{
		"suppressed.callouts|6:7-6:8|datum-unused|",
		"suppressed.callouts|7:22-7:23|tolerance-value|",
	}
	if len(suppressed) != len(wantSup) {
		t.Fatalf("suppressed results:\n%s\nwant %d", strings.Join(suppressed, "\n"), len(wantSup))
	}
	for i, w := range wantSup {
		if !strings.HasPrefix(suppressed[i], w) {
			t.Errorf("suppressed result %d = %s, want it to start with %s", i, suppressed[i], w)
		}
	}
}

// Every result must name a rule the driver lists, the internal-error pseudo
// rule included; files outside the working folder get absolute file URIs.
func TestSARIFInternalErrorAndOutsideFile(t *testing.T) {
	sch := compileSARIFSchema(t)
	outside := filepath.Join(t.TempDir(), "elsewhere", "p q.callouts")
	t.Chdir(t.TempDir())
	sp := source.Span{Start: source.Pos{Line: 1, Col: 1}, End: source.Pos{Line: 1, Col: 2}}
	res := lint.Result{
		Files:  []*lint.File{{Path: outside, Diagnostics: []rules.Diagnostic{{File: outside, Span: sp, Rule: rules.InternalRule, Severity: rules.Error, Message: "internal error in rule x: boom"}}}},
		Errors: []*lint.PathError{{Path: "gone.callouts", Err: os.ErrNotExist}},
	}
	var out bytes.Buffer
	if err := writeSARIF(&out, &res); err != nil {
		t.Fatal(err)
	}
	validateSARIF(t, sch, out.Bytes())
	var doc sarifDoc
	if err := json.Unmarshal(out.Bytes(), &doc); err != nil {
		t.Fatal(err)
	}
	r := doc.Runs[0].Results[0]
	if got := doc.Runs[0].Tool.Driver.Rules[r.RuleIndex].ID; got != rules.InternalRule {
		t.Errorf("result's ruleIndex points at %q, want %q", got, rules.InternalRule)
	}
	loc := r.Locations[0].PhysicalLocation.ArtifactLocation
	if !strings.HasPrefix(loc.URI, "file:///") || !strings.HasSuffix(loc.URI, "/elsewhere/p%20q.callouts") || loc.URIBaseID != "" {
		t.Errorf("outside file: %+v, want an absolute file URI without a base", loc)
	}
	if !bytes.Contains(out.Bytes(), []byte(`"executionSuccessful": false`)) {
		t.Error("an unreadable path must make the invocation unsuccessful")
	}
}

// The fingerprint follows the statement, not its line: inserting lines,
// changing spacing and trailing comments keeps it; changing the statement
// changes it.
func TestSARIFFingerprintsSurviveMoves(t *testing.T) {
	dir := t.TempDir()
	t.Chdir(dir)
	fps := func(text string) []string {
		t.Helper()
		writeFiles(t, dir, map[string]string{"p.callouts": text})
		out, _ := runCLI(t, "check", "--format", "sarif", "p.callouts")
		var doc sarifDoc
		if err := json.Unmarshal(out, &doc); err != nil {
			t.Fatal(err)
		}
		var s []string
		for _, r := range doc.Runs[0].Results {
			s = append(s, r.RuleID+"="+r.PartialFingerprints[fingerprintKey])
		}
		return s
	}
	before := fps(header + "feature base plane normal -z at (0, 0, 0)\nframe nope: flatness 0.02\nframe gone: flatness 0.02\n")
	after := fps(header + "# moved down\n\nfeature base plane normal -z at (0, 0, 0)\n\n\nframe   nope:  flatness 0.02   # a note\nframe gone: flatness 0.02\n")
	if len(before) != 2 || strings.Join(before, " ") != strings.Join(after, " ") {
		t.Errorf("fingerprints changed when the statements moved:\nbefore %v\nafter  %v", before, after)
	}
	changed := fps(header + "feature base plane normal -z at (0, 0, 0)\nframe nope: flatness 0.03\nframe gone: flatness 0.02\n")
	if changed[0] == before[0] || changed[1] != before[1] {
		t.Errorf("editing one statement must change its fingerprint only:\nbefore  %v\nchanged %v", before, changed)
	}
}

// A finding that speaks of another place carries it as a related location
// (SARIF §3.27.22) with an id and a message, valid against the schema, and
// the JSON finding carries it too.
func TestRelatedLocations(t *testing.T) {
	sch := compileSARIFSchema(t)
	t.Chdir(t.TempDir())
	src := "units mm\nstandard asme-2018\nfeature base plane normal -z at (0, 0, 0)\nfeature base plane normal +z at (0, 0, 10)\n"
	if err := os.WriteFile("dup.callouts", []byte(src), 0o644); err != nil {
		t.Fatal(err)
	}
	out, code := runCLI(t, "check", "--format", "sarif", "dup.callouts")
	if code != 1 {
		t.Fatalf("exit %d, want 1", code)
	}
	validateSARIF(t, sch, out)
	var doc struct {
		Runs []struct {
			Results []struct {
				RuleID           string `json:"ruleId"`
				RelatedLocations []struct {
					ID               int `json:"id"`
					PhysicalLocation struct {
						Region struct{ StartLine, StartColumn int } `json:"region"`
					} `json:"physicalLocation"`
					Message struct{ Text string } `json:"message"`
				} `json:"relatedLocations"`
			} `json:"results"`
		} `json:"runs"`
	}
	if err := json.Unmarshal(out, &doc); err != nil {
		t.Fatal(err)
	}
	rs := doc.Runs[0].Results
	if len(rs) != 1 || rs[0].RuleID != "name-duplicate" || len(rs[0].RelatedLocations) != 1 {
		t.Fatalf("want one name-duplicate result with one related location, got %+v", rs)
	}
	rel := rs[0].RelatedLocations[0]
	if rel.PhysicalLocation.Region.StartLine != 3 || rel.PhysicalLocation.Region.StartColumn != 9 || !strings.Contains(rel.Message.Text, "first declared") {
		t.Errorf("related location %+v, want line 3 column 9, first declared", rel)
	}
	js, _ := runCLI(t, "check", "--format", "json", "dup.callouts")
	if !bytes.Contains(js, []byte(`"related": [`)) || !bytes.Contains(js, []byte(`"line": 3`)) {
		t.Errorf("JSON finding lacks its related place:\n%s", js)
	}
}

// Findings with fixes carry them as SARIF fixes (§3.55: artifactChanges
// with replacements; an insertion is an empty deleted region), valid
// against the schema, with whether they are safe in the property bag.
func TestSARIFFixes(t *testing.T) {
	sch := compileSARIFSchema(t)
	t.Chdir(t.TempDir())
	src := "units mm\nstandard asme-2018\nfeature base plane normal -z at (0, 0, 0)\nfeature bore hole size 25 +0.05 -0 axis +z at (60, 40, 0)\n" +
		"datum A on base\nframe base: flatness 0.02\nframe bore: position 0.1 datums A\nframe bor: perpendicularity dia 0.05 datums A\n"
	if err := os.WriteFile("fix.callouts", []byte(src), 0o644); err != nil {
		t.Fatal(err)
	}
	out, _ := runCLI(t, "check", "--format", "sarif", "fix.callouts")
	validateSARIF(t, sch, out)
	var doc struct {
		Runs []struct {
			Results []struct {
				RuleID string `json:"ruleId"`
				Fixes  []struct {
					Description     struct{ Text string } `json:"description"`
					ArtifactChanges []struct {
						ArtifactLocation struct{ URI string } `json:"artifactLocation"`
						Replacements     []struct {
							DeletedRegion   struct{ StartLine, StartColumn, EndLine, EndColumn int } `json:"deletedRegion"`
							InsertedContent struct{ Text string }                                    `json:"insertedContent"`
						} `json:"replacements"`
					} `json:"artifactChanges"`
					Properties map[string]any `json:"properties"`
				} `json:"fixes"`
			} `json:"results"`
		} `json:"runs"`
	}
	if err := json.Unmarshal(out, &doc); err != nil {
		t.Fatal(err)
	}
	got := map[string]bool{}
	for _, r := range doc.Runs[0].Results {
		for _, f := range r.Fixes {
			rp := f.ArtifactChanges[0].Replacements[0]
			switch r.RuleID {
			case "zone-shape":
				if rp.DeletedRegion.StartLine != 7 || rp.DeletedRegion.StartColumn != 22 || rp.DeletedRegion.EndColumn != 22 || rp.InsertedContent.Text != "dia " || f.Properties["datumlint/safe"] != true {
					t.Errorf("zone-shape fix %+v", f)
				}
			case "name-undefined":
				if rp.InsertedContent.Text != "bore" || f.Properties["datumlint/safe"] != false || f.ArtifactChanges[0].ArtifactLocation.URI != "fix.callouts" {
					t.Errorf("name-undefined fix %+v", f)
				}
			}
			got[r.RuleID] = true
		}
	}
	if !got["zone-shape"] || !got["name-undefined"] {
		t.Errorf("fixes missing: %v", got)
	}
}

// TestSARIFMultitoolValidates runs the SARIF SDK's validator (the
// Sarif.Multitool, npm package @microsoft/sarif-multitool) over the log of
// every example and test file, fixes included, where it is installed:
// DATUMLINT_SARIF_MULTITOOL names its executable (.ci/run installs it). A
// result it reports at error or warning level fails the test.
func TestSARIFMultitoolValidates(t *testing.T) {
	tool := os.Getenv("DATUMLINT_SARIF_MULTITOOL")
	if tool == "" {
		t.Skip("DATUMLINT_SARIF_MULTITOOL is not set: the SARIF SDK's validator is not installed (the OASIS schema test still runs)")
	}
	dir := t.TempDir()
	var files []string
	for _, root := range []string{"../../testdata/examples", "../../rules/testdata"} {
		m, _ := filepath.Glob(filepath.Join(root, "*.callouts"))
		files = append(files, m...)
		m, _ = filepath.Glob(filepath.Join(root, "fix", "*.callouts"))
		files = append(files, m...)
	}
	out, _ := runCLI(t, append([]string{"check", "--format", "sarif", "--fail-on", "error"}, files...)...)
	log := filepath.Join(dir, "in.sarif")
	if err := os.WriteFile(log, out, 0o644); err != nil {
		t.Fatal(err)
	}
	res := filepath.Join(dir, "validation.sarif")
	cmd := exec.Command(tool, "validate", log, "--output", res, "--log", "ForceOverwrite")
	cmd.Env = append(os.Environ(), "DOTNET_SYSTEM_GLOBALIZATION_INVARIANT=1")
	if msg, err := cmd.CombinedOutput(); err != nil {
		t.Fatalf("the validator did not run: %v\n%s", err, msg)
	}
	b, err := os.ReadFile(res)
	if err != nil {
		t.Fatal(err)
	}
	var doc struct {
		Runs []struct {
			Results []struct {
				RuleID  string                `json:"ruleId"`
				Level   string                `json:"level"`
				Message struct{ Text string } `json:"message"`
			} `json:"results"`
		} `json:"runs"`
	}
	if err := json.Unmarshal(b, &doc); err != nil {
		t.Fatal(err)
	}
	for _, r := range doc.Runs[0].Results {
		if r.Level == "error" || r.Level == "warning" || r.Level == "" {
			t.Errorf("SARIF SDK validator: %s %s: %s", r.Level, r.RuleID, r.Message.Text)
		}
	}
}
