package main

import (
	"bytes"
	"compress/zlib"
	"crypto/rand"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"runtime"
	"strings"
	"syscall"
	"testing"
	"unicode/utf16"
	"unicode/utf8"

	"rsc.io/pdf"
)

// The hostile corpus, testdata/hostile: designs written as someone outside
// a yard would write them to break its CI. yard/ is a CUE module with one
// hull per case, each the reference hull (hulls/good, over base/) with one
// thing wrong; replace/ is a module whose cue.mod/local-module.cue points
// a dependency outside it. What git cannot hold, or should not (links,
// FIFOs, a 5 MiB file, bytes that are not UTF-8), each test adds to its own
// copy of the corpus.
//
// Every test checks: the design is refused with a positioned error, or
// stopped at a bound named in the message; exit status 2; neither the
// canary in the environment nor the one in files outside the module
// appears in any output (text, JSON, PDF); no file is left behind.

// canaryEnv is set, for this test process and the commands it starts, to
// a canary that a link to /proc/self/environ would show.
const canaryEnv = "AMPWRIGHT_CANARY"

var envCanary = "ENV-" + token()

func init() { os.Setenv(canaryEnv, envCanary) }

// hostile is one test's copy of the corpus.
type hostile struct {
	t        *testing.T
	dir      string // holds yard/, replace/ and outside/
	yard     string // the copied yard module
	envValue string // the environment's canary
	secret   string // the canary in files outside the module
}

func newHostile(t *testing.T) *hostile {
	t.Helper()
	dir := t.TempDir()
	if err := os.CopyFS(dir, os.DirFS("../../testdata/hostile")); err != nil {
		t.Fatal(err)
	}
	h := &hostile{t: t, dir: dir, yard: filepath.Join(dir, "yard"), envValue: envCanary, secret: "FILE-" + token()}
	// Outside the module: files that would put the secret into a result
	// if they were read.
	h.write("outside/leak.cue", "package hull\n\nvessel: client: \""+h.secret+"\"\n")
	h.write("outside/secret.json", `{"client": "`+h.secret+`"}`+"\n")
	h.write("outside/parts/parts.cue", "package parts\n\nclient: \""+h.secret+"\"\n")
	h.write("outside/parts-module/cue.mod/module.cue", "module: \"parts.example/parts\"\nlanguage: version: \"v0.13.0\"\n")
	h.write("outside/parts-module/parts.cue", "package parts\n\nclient: \""+h.secret+"\"\n")
	h.write("outside/hull/hull.cue", "package hull\n\nvessel: {name: \""+h.secret+"\", hull: \"X\", kind: \"sloop\", length: \"7.5 m\", system: \"12 V\"}\n")
	return h
}

func token() string {
	b := make([]byte, 8)
	_, _ = rand.Read(b)
	return "CANARY" + strings.ToUpper(hex.EncodeToString(b))
}

func (h *hostile) path(rel string) string { return filepath.Join(h.dir, filepath.FromSlash(rel)) }

func (h *hostile) write(rel, s string) {
	h.t.Helper()
	p := h.path(rel)
	if err := os.MkdirAll(filepath.Dir(p), 0o755); err != nil {
		h.t.Fatal(err)
	}
	if err := os.WriteFile(p, []byte(s), 0o644); err != nil {
		h.t.Fatal(err)
	}
}

func (h *hostile) link(target, rel string) {
	h.t.Helper()
	if err := os.Symlink(target, h.path(rel)); err != nil {
		h.t.Skipf("cannot make a symbolic link: %v", err)
	}
}

// hull is the path of a hull of the copied yard.
func (h *hostile) hull(name string) string { return filepath.Join(h.yard, "hulls", name) }

// outcome is one run of the command.
type outcome struct {
	args           []string
	stdout, stderr string
	code           int
}

func (o outcome) all() string { return o.stdout + o.stderr }

// run runs the command in this process.
func (h *hostile) run(args ...string) outcome {
	h.t.Helper()
	var stdout, stderr bytes.Buffer
	code := run(args, &stdout, &stderr)
	return outcome{args: args, stdout: stdout.String(), stderr: stderr.String(), code: code}
}

// exec runs the command as its own process: a bound ends the process that
// passes it. ampwright is the test binary, on PATH (TestMain).
func (h *hostile) exec(args ...string) outcome {
	h.t.Helper()
	cmd := exec.Command("ampwright", args...)
	var stdout, stderr bytes.Buffer
	cmd.Stdout, cmd.Stderr = &stdout, &stderr
	err := cmd.Run()
	code := 0
	if ee, ok := err.(*exec.ExitError); ok {
		code = ee.ExitCode()
	} else if err != nil {
		h.t.Fatal(err)
	}
	return outcome{args: args, stdout: stdout.String(), stderr: stderr.String(), code: code}
}

// refused checks that an outcome is an input error or a bound: exit
// status 2, the message matching want, no stack trace, no canary, and
// only inert text.
func (h *hostile) refused(o outcome, want string) {
	h.t.Helper()
	if o.code != exitInput {
		h.t.Errorf("ampwright %s: exit status %d, want %d\n%s", strings.Join(o.args, " "), o.code, exitInput, o.all())
	}
	if !regexp.MustCompile(want).MatchString(o.all()) {
		h.t.Errorf("ampwright %s: output does not say %q:\n%s", strings.Join(o.args, " "), want, o.all())
	}
	for _, bad := range []string{"goroutine ", "panic", "runtime error"} {
		if strings.Contains(o.all(), bad) {
			h.t.Errorf("ampwright %s: a crash's %q in the output:\n%s", strings.Join(o.args, " "), bad, o.all())
		}
	}
	h.clean(o)
}

// clean checks an outcome for canaries and text that is not inert.
func (h *hostile) clean(o outcome) {
	h.t.Helper()
	h.noSecret(strings.Join(o.args, " "), []byte(o.all()))
	if err := inertText(o.all()); err != nil {
		h.t.Errorf("ampwright %s: %v in:\n%q", strings.Join(o.args, " "), err, o.all())
	}
}

// noSecret fails if b holds a canary, as UTF-8 or as the UTF-16BE a PDF
// writes its text in.
func (h *hostile) noSecret(what string, b []byte) {
	h.t.Helper()
	for _, c := range []string{h.envValue, h.secret} {
		if bytes.Contains(b, []byte(c)) || bytes.Contains(b, encodeUTF16BE(c)) {
			h.t.Errorf("%s: the output holds a canary from outside the module (%s)", what, c)
		}
	}
}

func encodeUTF16BE(s string) []byte {
	var b []byte
	for _, u := range utf16.Encode([]rune(s)) {
		b = append(b, byte(u>>8), byte(u))
	}
	return b
}

// inertText reports a character of s that acts rather than shows: a
// control character but the line break, DEL, a C1 control, a
// bidirectional control, a line or paragraph separator, or bytes that are
// not UTF-8.
func inertText(s string) error {
	if !utf8.ValidString(s) {
		return errors.New("bytes that are not UTF-8")
	}
	for _, r := range s {
		switch {
		case r == '\n':
		case r < 0x20, r == 0x7f, r >= 0x80 && r <= 0x9f:
			return fmt.Errorf("control character %U", r)
		case r == 0x061c, r == 0x200e, r == 0x200f, r >= 0x202a && r <= 0x202e, r >= 0x2066 && r <= 0x2069, r == 0x2028, r == 0x2029:
			return fmt.Errorf("bidirectional or separator character %U", r)
		}
	}
	return nil
}

// refusedEverywhere runs the commands that show a design (check as text and JSON,
// bom, pack) on hull, checking that each refuses it as want says, and
// that no file is left behind by pack.
func (h *hostile) refusedEverywhere(hull, want string) {
	h.t.Helper()
	h.refused(h.run("check", hull), want)
	j := h.run("check", "--format", "json", hull)
	h.refused(j, ".") // the JSON splits position and message
	var r struct {
		Problems []struct{ Message string } `json:"problems"`
	}
	if err := json.Unmarshal([]byte(j.stdout), &r); err != nil || len(r.Problems) == 0 {
		h.t.Errorf("check --format json %s: want a result with problems, got %v:\n%s", hull, err, j.stdout)
	}
	h.refused(h.run("bom", hull), want)
	out := filepath.Join(h.t.TempDir(), "pack.pdf")
	h.refused(h.run("pack", hull, "-o", out), want)
	h.nothingLeft(filepath.Dir(out))
}

// nothingLeft fails if dir holds any file: a refused pack writes nothing,
// temporary files included.
func (h *hostile) nothingLeft(dir string) {
	h.t.Helper()
	entries, err := os.ReadDir(dir)
	if err != nil {
		h.t.Fatal(err)
	}
	for _, e := range entries {
		h.t.Errorf("a file is left behind in %s: %s", dir, e.Name())
	}
}

func TestHostileLinkToCUEFile(t *testing.T) {
	h := newHostile(t)
	h.link("../../../outside/leak.cue", "yard/hulls/link-cue/leak.cue")
	h.refusedEverywhere(h.hull("link-cue"), `hulls/link-cue/leak.cue leads outside the module through a symbolic link`)
	// An absolute link to the same file.
	os.Remove(h.path("yard/hulls/link-cue/leak.cue"))
	h.link(h.path("outside/leak.cue"), "yard/hulls/link-cue/leak.cue")
	o := h.run("check", h.hull("link-cue"))
	h.refused(o, `hulls/link-cue/leak.cue leads outside the module through a symbolic link`)
	if strings.Contains(o.all(), "outside") && strings.Contains(o.all(), h.path("outside")) {
		t.Errorf("the refusal names the link's target:\n%s", o.all())
	}
}

func TestHostileLinkToEnvironment(t *testing.T) {
	if runtime.GOOS != "linux" {
		t.Skip("/proc/self/environ is Linux's")
	}
	h := newHostile(t)
	h.link("/proc/self/environ", "yard/hulls/link-proc/environ.cue")
	h.refusedEverywhere(h.hull("link-proc"), `hulls/link-proc/environ.cue leads outside the module through a symbolic link`)
}

func TestHostileLinkEmbedded(t *testing.T) {
	h := newHostile(t)
	h.link("../../../outside/secret.json", "yard/hulls/link-embed/secret.json")
	h.refusedEverywhere(h.hull("link-embed"), `hulls/link-embed/hull.cue:3:1: attribute @extern: embedding files is not supported`)
	// Inside the module, embedding is refused all the same.
	os.Remove(h.path("yard/hulls/link-embed/secret.json"))
	h.write("yard/hulls/link-embed/secret.json", `{"client": "inside"}`)
	h.refused(h.run("check", h.hull("link-embed")), `hull.cue:13:12: attribute @embed: embedding files is not supported`)
}

func TestHostileLinkToDirectory(t *testing.T) {
	h := newHostile(t)
	h.link("../../../outside/parts", "yard/hulls/link-dir/parts")
	h.refusedEverywhere(h.hull("link-dir"), `hulls/link-dir/parts leads outside the module through a symbolic link`)
	// A hull directory that is itself a link out of the yard: refused when
	// named, not listed by the fleet.
	h.link("../../outside/hull", "yard/hulls/link-hull")
	h.refused(h.run("check", h.hull("link-hull")), `hulls/link-hull leads outside the module through a symbolic link`)
	// cue.mod leading out.
	other := filepath.Join(h.dir, "other")
	h.write("other/hulls/h/hull.cue", "package hull\nvessel: name: \"x\"\n")
	h.link("../outside/parts-module/cue.mod", "other/cue.mod")
	h.refused(h.run("check", filepath.Join(other, "hulls/h")), `other/cue.mod/module.cue leads outside the module through a symbolic link`)
}

func TestHostileDevicesAndFIFOs(t *testing.T) {
	h := newHostile(t)
	h.link("/dev/zero", "yard/hulls/dev-zero/zero.cue")
	h.refusedEverywhere(h.hull("dev-zero"), `hulls/dev-zero/zero.cue leads outside the module through a symbolic link`)
	if err := syscall.Mkfifo(h.path("yard/hulls/fifo/pipe.cue"), 0o644); err != nil {
		t.Skipf("no FIFOs here: %v", err)
	}
	h.refusedEverywhere(h.hull("fifo"), `hulls/fifo/pipe.cue is not a regular file`)
	// A link inside the module to the FIFO.
	h.link("../fifo/pipe.cue", "yard/hulls/good/pipe.cue")
	h.refused(h.run("check", h.hull("good")), `hulls/good/pipe.cue is not a regular file`)
}

func TestHostileOversize(t *testing.T) {
	h := newHostile(t)
	var b strings.Builder
	b.WriteString("package hull\n")
	for b.Len() < 5<<20 {
		b.WriteString("// padding padding padding padding padding padding padding padding\n")
	}
	h.write("yard/hulls/oversize/big.cue", b.String())
	h.refusedEverywhere(h.hull("oversize"), `hulls/oversize/big.cue is [0-9]+ bytes, more than the 4194304-byte limit for one file`)
}

func TestHostileAttributes(t *testing.T) {
	h := newHostile(t)
	h.refusedEverywhere(h.hull("attr-q"), `hulls/attr-q/hull.cue:9:72: attribute @q: @q is the schema's`)
	h.refusedEverywhere(h.hull("attr-q-import"), `looseparts/looseparts.cue:5:18: attribute @q: @q is the schema's`)
	// A default of the design's own is checked against the schema's limit.
	h.refusedEverywhere(h.hull("default-loosen"), `hulls/default-loosen/hull.cue:9:63: vessel.length: "1000 m" is out of range; it must be at most 100 m`)
	// In a package below the vendored schema's directory, which is not the
	// schema's, and in the catalog.
	h.write("yard/cue.mod/pkg/ampwright.dev/schema/sub/sub.cue", "package sub\n\nlength: \"1000 m\" @q(length,le=\"2000 m\")\n")
	h.write("yard/hulls/attr-q-import/hull.cue", strings.Replace(h.read("yard/hulls/attr-q-import/hull.cue"), `"hostile.example/yard/looseparts"`, `looseparts "ampwright.dev/schema/sub"`, 1))
	h.refused(h.run("check", h.hull("attr-q-import")), `cue.mod/pkg/ampwright.dev/schema/sub/sub.cue:3:18: attribute @q`)
	h.write("yard/catalog/more.cue", "package catalog\n\nbattery: agm105: capacity: _ @q(charge,gt=\"0 Ah\")\n")
	h.refused(h.run("check", h.hull("good")), `catalog/more.cue:3:30: attribute @q`)
}

func (h *hostile) read(rel string) string {
	h.t.Helper()
	b, err := os.ReadFile(h.path(rel))
	if err != nil {
		h.t.Fatal(err)
	}
	return string(b)
}

// A chain of fields 300,000 deep would overflow the stack of CUE's parser,
// a crash no program recovers from.
func TestHostileNesting(t *testing.T) {
	h := newHostile(t)
	h.write("yard/hulls/good/deep.cue", "package hull\n\n_x: "+strings.Repeat("a: ", 300000)+"1\n")
	h.refusedEverywhere(h.hull("good"), `hulls/good/deep.cue:3:3003: the file nests fields, structs and lists more than 1000 levels deep`)
}

func TestHostileNotUTF8(t *testing.T) {
	h := newHostile(t)
	h.write("yard/hulls/not-utf8/bytes.cue", "package hull\n\nvessel: client: \"ab\xff\xfecd\"\n")
	h.refusedEverywhere(h.hull("not-utf8"), `hulls/not-utf8/bytes.cue:3:20: byte 0xff is not UTF-8`)
}

func TestHostileInputErrors(t *testing.T) {
	h := newHostile(t)
	for _, tc := range []struct{ hull, want string }{
		{"nan-inf", `hull.cue:10:56: vessel.length: "Inf m" is not a length(?s:.*)hull.cue:11:16: loads.fridge.surge: "NaN A" is not a current(?s:.*)rules.bundling.minVoltage: 1e\+400 is too large a number(?s:.*)1e-400 is too small a number`},
		{"hours", `base/base.cue:19:94: loads.fridge.hours.anchor: 24 hours in scenario "anchor", whose period is 12 hours(?s:.*)hull.cue:10:32: scenarios.anchor.engineHours: 13 engine hours`},
		{"fed-from-load", `hull.cue:11:24: wiring."fridge-aux".from: the run is fed from load "fridge"`},
		{"empty-table", `hull.cue:11:29: rules.ampacity.table: the table is empty(?s:.*)rules.protection.standardRatings: the table is empty(?s:.*)rules.vocFactor.rows: the table is empty`},
		{"voyage-long", `hull.cue:13:24: voyage.legs: the voyage's legs add up to 36500 days`},
		{"inverted-range", `rules.chargeRate.leadAcidMin: the minimum 0.5 is more than the maximum(?s:.*)rules.pv.fuseMin: the minimum 2 is more than the maximum`},
	} {
		t.Run(tc.hull, func(t *testing.T) {
			h.t = t
			h.refusedEverywhere(h.hull(tc.hull), tc.want)
		})
	}
}

func TestHostileModules(t *testing.T) {
	h := newHostile(t)
	h.refusedEverywhere(filepath.Join(h.dir, "replace/hulls/replaced"), `replace/cue.mod/local-module.cue: module replacements are not supported`)
	h.refused(h.run("check", "../../testdata/designs/remote/hulls/remote"), `the design asks for module registry.example/parts@v0.1.0; ampwright never downloads modules`)
}

// stopped is the message of a design stopped at either bound.
const stopped = `stopped: it (took longer than the --timeout bound of [0-9]+s|needed more memory than the --max-memory bound of [0-9]+MiB)`

// The time and memory bounds end the process that passes them: the
// command runs as its own process here.
func TestHostileBounds(t *testing.T) {
	t.Parallel()
	h := newHostile(t)
	h.refused(h.exec("check", "--timeout", "2s", h.hull("slow")), `hulls/slow: stopped: it took longer than the --timeout bound of 2s`)
	h.refused(h.exec("check", "--max-memory", "100MiB", h.hull("greedy")), `hulls/greedy: stopped: it needed more memory than the --max-memory bound of 100MiB`)
	out := filepath.Join(t.TempDir(), "slow.pdf")
	h.refused(h.exec("pack", "--timeout", "2s", h.hull("slow"), "-o", out), `stopped: it took longer than the --timeout bound of 2s`)
	h.nothingLeft(filepath.Dir(out))

	// Several designs: each in a worker; the one that passes a bound is
	// reported, the others are checked.
	// Which bound a runaway design passes first depends on the machine's
	// speed; either stops it.
	o := h.exec("check", "--timeout", "2s", "--max-memory", "200MiB", h.hull("good"), h.hull("slow"), h.hull("greedy"))
	h.refused(o, `hulls/slow: 1 input error\(s\)\n\s*`+stopped+`(?s:.*)hulls/greedy: 1 input error\(s\)\n\s*`+stopped)
	if !strings.Contains(o.stdout, "Good  H-1") {
		t.Errorf("check of several designs did not report the good one:\n%s", o.all())
	}

	// A diff whose head adds the slow and greedy hulls and changes a good
	// one: the two are broken, named with their bounds, and the change to
	// the good one is still reported.
	base := filepath.Join(h.dir, "base")
	if err := os.CopyFS(base, os.DirFS(h.yard)); err != nil {
		t.Fatal(err)
	}
	for _, dir := range []string{"slow", "greedy", "loads-10k"} {
		os.RemoveAll(filepath.Join(base, "hulls", dir))
	}
	os.RemoveAll(h.hull("loads-10k"))
	h.write("yard/hulls/hours/hull.cue", strings.Replace(h.read("yard/hulls/hours/hull.cue"), "hours: 12, engineHours: 13", "hours: 24, engineHours: 2", 1))
	d := h.exec("diff", "--timeout", "2s", "--max-memory", "200MiB", base, h.yard)
	h.clean(d)
	for _, want := range []string{
		`hulls/slow: broken\n\s*error: ` + stopped,
		`hulls/greedy: broken\n\s*error: ` + stopped,
		`hulls/hours \(Hours H-17\): (added|changed)`,
	} {
		if !regexp.MustCompile(want).MatchString(d.stdout) {
			t.Errorf("diff does not say %q:\n%s", want, d.all())
		}
	}
}

// A fleet of the whole corpus: every hostile hull is broken or bounded,
// the good one passes, and nothing from outside reaches the output.
func TestHostileFleet(t *testing.T) {
	t.Parallel()
	h := newHostile(t)
	h.link("../../../outside/leak.cue", "yard/hulls/link-cue/leak.cue")
	h.link("../../../outside/secret.json", "yard/hulls/link-embed/secret.json")
	h.link("../../../outside/parts", "yard/hulls/link-dir/parts")
	h.link("../../outside/hull", "yard/hulls/link-hull")
	h.link("/dev/zero", "yard/hulls/dev-zero/zero.cue")
	if runtime.GOOS == "linux" {
		h.link("/proc/self/environ", "yard/hulls/link-proc/environ.cue")
	}
	if err := syscall.Mkfifo(h.path("yard/hulls/fifo/pipe.cue"), 0o644); err != nil {
		t.Skipf("no FIFOs here: %v", err)
	}
	// A hull whose directory's name would clear a terminal.
	h.write("yard/hulls/esc\x1b[2J\u202e/hull.cue", "package hull\n\nimport \"hostile.example/yard/base\"\n\nbase.hull\n\nvessel: {name: \"Esc\", hull: \"H-21\", kind: \"sloop\", length: \"7.5 m\", system: \"12 V\"}\n")
	bounds := []string{"--timeout", "3s", "--max-memory", "200MiB"}
	o := h.exec(append([]string{"fleet"}, append(bounds, h.yard)...)...)
	h.refused(o, `hulls/slow: 1 input error\(s\)\n\s*`+stopped)
	h.clean(o)
	for _, want := range []string{
		`hulls/good +Good H-1 +PASS`,
		`hulls/greedy: 1 input error\(s\)\n\s*` + stopped,
		`hulls/link-cue/leak.cue leads outside the module through a symbolic link`,
		`hulls/dev-zero/zero.cue leads outside the module through a symbolic link`,
		`hulls/fifo/pipe.cue is not a regular file`,
		// CUE takes no such name in an import path: the hull is broken, and
		// its name shown escaped.
		`hulls/esc\\x1b\[2J\\u202e: 1 input error`,
	} {
		if !regexp.MustCompile(want).MatchString(o.stdout) {
			t.Errorf("fleet output does not say %q:\n%s", want, o.stdout)
		}
	}
	if strings.Contains(o.stdout, "link-hull") {
		t.Errorf("the fleet lists a hull directory that links out of the yard:\n%s", o.stdout)
	}
	j := h.exec(append([]string{"fleet", "--format", "json"}, append(bounds, h.yard)...)...)
	h.noSecret("fleet --format json", []byte(j.all()))
	var f struct{ Hulls []json.RawMessage }
	if err := json.Unmarshal([]byte(j.stdout), &f); err != nil || len(f.Hulls) < 20 {
		t.Errorf("fleet --format json: %v, %d hulls:\n%s", err, len(f.Hulls), j.stdout)
	}
}

// Text from a design reaches a terminal, a pull request's Markdown and the
// PDF inert.
func TestHostileNames(t *testing.T) {
	t.Parallel()
	h := newHostile(t)
	o := h.run("check", h.hull("names"))
	if o.code != exitOK {
		t.Fatalf("check names: exit %d:\n%s", o.code, o.all())
	}
	h.clean(o)
	if !strings.Contains(o.stdout, `Name\x1b[2J\x1b[31m\rPASS\n FAKE LINE\u202eevil\u2066x\u2069\u200f`) {
		t.Errorf("check does not show the vessel's name escaped:\n%s", o.stdout)
	}
	h.clean(h.run("bom", h.hull("names")))
	h.clean(h.run("bom", "--format", "csv", h.hull("names")))

	// The Markdown of a diff in which the hull is added.
	base := filepath.Join(h.dir, "base")
	if err := os.CopyFS(base, os.DirFS(h.yard)); err != nil {
		t.Fatal(err)
	}
	os.RemoveAll(filepath.Join(base, "hulls", "names"))
	for _, dir := range []string{"slow", "greedy", "loads-10k"} {
		os.RemoveAll(filepath.Join(base, "hulls", dir))
		os.RemoveAll(filepath.Join(h.yard, "hulls", dir))
	}
	md := h.run("diff", "--format", "markdown", base, h.yard)
	h.clean(md)
	if !strings.Contains(md.stdout, `Name\\x1b\[2J`) || strings.Contains(md.stdout, "<img") || strings.Contains(md.stdout, "@octocat") {
		t.Errorf("the diff's Markdown does not show the names escaped:\n%s", md.stdout)
	}
	h.clean(h.run("diff", base, h.yard))

	// The PDF.
	out := filepath.Join(t.TempDir(), "names.pdf")
	p := h.run("pack", h.hull("names"), "-o", out)
	if p.code != exitOK {
		t.Fatalf("pack names: exit %d:\n%s", p.code, p.all())
	}
	b, err := os.ReadFile(out)
	if err != nil {
		t.Fatal(err)
	}
	text := pdfText(t, b)
	if err := inertText(text); err != nil {
		t.Errorf("the pack's text: %v", err)
	}
	if !strings.Contains(text, `\u202eevil`) {
		t.Errorf("the pack does not show the bidirectional override escaped")
	}
	h.noSecret("pack", []byte(text))
	h.noSecret("pack", inflated(b))
}

// The pack of a design of 10,000 loads is refused at the page bound (or
// stopped at a bound of time or memory), writing nothing.
func TestHostilePack10k(t *testing.T) {
	t.Parallel()
	if testing.Short() {
		t.Skip("compiles 10,000 loads")
	}
	h := newHostile(t)
	out := filepath.Join(t.TempDir(), "big.pdf")
	o := h.exec("pack", "--max-pages", "100", h.hull("loads-10k"), "-o", out)
	h.refused(o, `pack passed its bound of 100 pages(?s:.*)--max-pages|stopped: it (took longer|needed more memory)`)
	h.nothingLeft(filepath.Dir(out))
}

// pdfText is the text a PDF shows, page by page, with its title, subject
// and author: the strings shown by Tj and TJ, which fpdf writes in
// UTF-16BE for the pack's fonts.
func pdfText(t *testing.T, b []byte) string {
	t.Helper()
	r, err := pdf.NewReader(bytes.NewReader(b), int64(len(b)))
	if err != nil {
		t.Fatalf("the pack does not parse as PDF: %v", err)
	}
	var out strings.Builder
	info := r.Trailer().Key("Info")
	for _, k := range []string{"Title", "Subject", "Author"} {
		out.WriteString(decodeUTF16(info.Key(k).RawString()) + "\n")
	}
	for i := 1; i <= r.NumPage(); i++ {
		contents := r.Page(i).V.Key("Contents")
		streams := []pdf.Value{contents}
		if contents.Kind() == pdf.Array {
			streams = nil
			for j := 0; j < contents.Len(); j++ {
				streams = append(streams, contents.Index(j))
			}
		}
		for _, s := range streams {
			pdf.Interpret(s, func(stk *pdf.Stack, op string) {
				n := stk.Len()
				args := make([]pdf.Value, n)
				for k := n - 1; k >= 0; k-- {
					args[k] = stk.Pop()
				}
				switch op {
				case "Tj", "'":
					if n > 0 && args[n-1].Kind() == pdf.String {
						out.WriteString(decodeUTF16(args[n-1].RawString()) + "\n")
					}
				case "TJ":
					if n > 0 && args[n-1].Kind() == pdf.Array {
						for k := 0; k < args[n-1].Len(); k++ {
							if v := args[n-1].Index(k); v.Kind() == pdf.String {
								out.WriteString(decodeUTF16(v.RawString()))
							}
						}
						out.WriteString("\n")
					}
				}
			})
		}
	}
	return out.String()
}

func decodeUTF16(s string) string {
	s = strings.TrimPrefix(s, "\xfe\xff")
	var u []uint16
	for i := 0; i+1 < len(s); i += 2 {
		u = append(u, uint16(s[i])<<8|uint16(s[i+1]))
	}
	return string(utf16.Decode(u))
}

// inflated is a PDF's bytes with each compressed stream inflated after
// it, so that a search sees what the streams hold.
func inflated(b []byte) []byte {
	out := append([]byte(nil), b...)
	for rest := b; ; {
		i := bytes.Index(rest, []byte("stream"))
		if i < 0 {
			break
		}
		rest = rest[i+len("stream"):]
		rest = bytes.TrimLeft(rest, "\r\n")
		end := bytes.Index(rest, []byte("endstream"))
		if end < 0 {
			break
		}
		if zr, err := zlib.NewReader(bytes.NewReader(rest[:end])); err == nil {
			if data, err := io.ReadAll(io.LimitReader(zr, 64<<20)); err == nil {
				out = append(out, data...)
			}
		}
		rest = rest[end:]
	}
	return out
}

// The yard as a pull request brings it: a git repository whose own
// configuration names a command to run (an fsmonitor), and whose commits
// hold a link out of the module and an oversize file. ampwright runs no
// command of the repository's, and reads the commit's links and files
// under the same rules as the work tree's.
func TestHostileGit(t *testing.T) {
	if _, err := exec.LookPath("git"); err != nil {
		t.Skip("no git")
	}
	h := newHostile(t)
	for _, dir := range []string{"slow", "greedy", "loads-10k"} {
		os.RemoveAll(h.hull(dir))
	}
	git := func(args ...string) {
		t.Helper()
		cmd := exec.Command("git", append([]string{"-C", h.yard, "-c", "user.name=t", "-c", "user.email=t@example.invalid", "-c", "commit.gpgsign=false"}, args...)...)
		if out, err := cmd.CombinedOutput(); err != nil {
			t.Fatalf("git %v: %v\n%s", args, err, out)
		}
	}
	git("init", "-q")
	git("add", ".")
	git("commit", "-q", "-m", "base")
	// The pull request: a link out of the module and an oversize file,
	// committed.
	h.link("../../../outside/leak.cue", "yard/hulls/link-cue/leak.cue")
	h.write("yard/hulls/oversize/big.cue", "package hull\n"+strings.Repeat("// padding padding padding padding padding padding padding padding\n", 5<<20/66+1))
	git("add", ".")
	git("commit", "-q", "-m", "head")

	marker := filepath.Join(h.dir, "ran")
	script := filepath.Join(h.dir, "monitor.sh")
	if err := os.WriteFile(script, []byte("#!/bin/sh\ntouch "+marker+"\n"), 0o755); err != nil {
		t.Fatal(err)
	}
	git("config", "core.fsmonitor", script)
	git("config", "core.pager", script)

	for _, args := range [][]string{
		{"check", h.hull("good")},
		{"check", "--format", "json", h.hull("good"), h.hull("hours")},
		{"pack", h.hull("good"), "-o", filepath.Join(h.dir, "good.pdf")},
		{"diff", h.yard},
		{"diff", "--base", "HEAD~1", "--format", "markdown", h.yard},
		{"diff", "--base", "HEAD~1", "--head", "HEAD", "--format", "json", h.yard},
	} {
		o := h.exec(args...)
		if o.code == exitInput && args[0] != "check" {
			t.Errorf("ampwright %s: exit %d:\n%s", strings.Join(args, " "), o.code, o.all())
		}
		h.clean(o)
		if args[0] == "diff" && len(args) > 2 && args[2] == "HEAD~1" {
			for _, want := range []string{"hulls/link-cue/leak.cue leads outside the module through a symbolic link", "hulls/oversize/big.cue is [0-9]+ bytes, more than the 4194304-byte limit"} {
				if !regexp.MustCompile(want).MatchString(o.stdout) {
					t.Errorf("ampwright %s does not say %q:\n%s", strings.Join(args, " "), want, o.stdout)
				}
			}
		}
	}
	if _, err := os.Stat(marker); err == nil {
		t.Error("ampwright let git run the repository's configured command")
	}
}

// An output that cannot be written is an error of exit status 2 that says
// what failed, with no word about usage: the command line was right.
func TestIOErrorNoUsageHint(t *testing.T) {
	h := newHostile(t)
	o := h.run("pack", h.hull("good"), "-o", filepath.Join(h.dir, "no", "such", "dir", "x.pdf"))
	h.refused(o, `cannot write .*x\.pdf: no such file or directory`)
	if strings.Contains(o.all(), "--help") || strings.Contains(o.all(), "usage") {
		t.Errorf("an I/O error comes with a usage hint:\n%s", o.all())
	}
	if f, err := os.OpenFile("/dev/full", os.O_WRONLY, 0); err == nil {
		defer f.Close()
		var stderr bytes.Buffer
		if code := run([]string{"check", h.hull("good")}, f, &stderr); code != exitInput || strings.Contains(stderr.String(), "--help") || !strings.Contains(stderr.String(), "no space left") {
			t.Errorf("check to a full device: exit %d:\n%s", code, stderr.String())
		}
	}
	// A bad command line still says where the usage is.
	if o := h.run("pack", "--no-such-flag"); o.code != exitInput || !strings.Contains(o.stderr, "Run 'ampwright pack --help' for usage.") {
		t.Errorf("a bad flag: exit %d:\n%s", o.code, o.all())
	}
}
