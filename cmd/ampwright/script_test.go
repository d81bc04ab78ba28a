package main

import (
	"bytes"
	"encoding/json"
	"flag"
	"fmt"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"unicode/utf16"

	"github.com/rogpeppe/go-internal/testscript"
	"rsc.io/pdf"
)

var updateScripts = flag.Bool("update", false, "rewrite the expected output in testscript files")

func TestMain(m *testing.M) {
	testscript.Main(cachedTests{m}, map[string]func(){
		"ampwright": func() { os.Exit(Main()) },
	})
}

// cachedTests runs the tests with a result cache of their own, never the
// user's, for the commands run in this process and their workers, and
// removes it after.
type cachedTests struct{ m *testing.M }

func (t cachedTests) Run() int {
	dir, err := os.MkdirTemp("", "ampwright-test-cache-")
	if err != nil {
		fmt.Fprintln(os.Stderr, err)
		return 2
	}
	defer os.RemoveAll(dir)
	os.Setenv(envResultCache, dir)
	return t.m.Run()
}

// TestScript runs the end-to-end scripts in testdata/script. $DESIGNS is
// the example yard's directory.
func TestScript(t *testing.T) {
	designs, err := filepath.Abs("../../designs")
	if err != nil {
		t.Fatal(err)
	}
	workflow, err := filepath.Abs("../../docs/yard-ci/ampwright.yml")
	if err != nil {
		t.Fatal(err)
	}
	testscript.Run(t, testscript.Params{
		Dir:           "testdata/script",
		UpdateScripts: *updateScripts,
		Setup: func(env *testscript.Env) error {
			env.Setenv("DESIGNS", designs)
			env.Setenv("YARD_WORKFLOW", workflow)
			// Each script starts with an empty result cache of its own,
			// outside its work directory.
			dir, err := os.MkdirTemp("", "ampwright-script-cache-")
			if err != nil {
				return err
			}
			env.Defer(func() { os.RemoveAll(dir) })
			env.Setenv(envResultCache, dir)
			return nil
		},
		Cmds: map[string]func(ts *testscript.TestScript, neg bool, args []string){
			"jsonpath": cmdJSONPath,
			"pdftext":  cmdPDFText,
			"runsteps": cmdRunSteps,
		},
	})
}

// cmdJSONPath checks a value in a JSON file:
//
//	jsonpath FILE PATH [WANT]
//
// PATH is dot-separated, with numbers indexing lists; "#" gives a list's
// length. Without WANT it checks the path exists.
func cmdJSONPath(ts *testscript.TestScript, neg bool, args []string) {
	if len(args) < 2 || len(args) > 3 {
		ts.Fatalf("usage: jsonpath FILE PATH [WANT]")
	}
	var v any
	if err := json.Unmarshal([]byte(ts.ReadFile(args[0])), &v); err != nil {
		ts.Fatalf("%s: not JSON: %v", args[0], err)
	}
	got, err := lookupJSON(v, args[1])
	switch {
	case err != nil && !neg:
		ts.Fatalf("%s: %v", args[1], err)
	case err != nil:
		return
	case len(args) == 2 && neg:
		ts.Fatalf("%s exists: %s", args[1], got)
	case len(args) == 3 && (got == args[2]) == neg:
		ts.Fatalf("%s = %s, want %s%s", args[1], got, map[bool]string{true: "not "}[neg], args[2])
	}
}

func lookupJSON(v any, path string) (string, error) {
	for _, key := range strings.Split(path, ".") {
		switch x := v.(type) {
		case map[string]any:
			next, ok := x[key]
			if !ok {
				return "", fmt.Errorf("no key %q", key)
			}
			v = next
		case []any:
			if key == "#" {
				return strconv.Itoa(len(x)), nil
			}
			i, err := strconv.Atoi(key)
			if err != nil || i < 0 || i >= len(x) {
				return "", fmt.Errorf("no element %q in a list of %d", key, len(x))
			}
			v = x[i]
		default:
			return "", fmt.Errorf("cannot index %T with %q", v, key)
		}
	}
	if s, ok := v.(string); ok {
		return s, nil
	}
	b, err := json.Marshal(v)
	return string(b), err
}

// cmdRunSteps writes the shell commands of one job of a GitHub Actions
// workflow to a script, so that a test runs the workflow's own commands:
//
//	runsteps WORKFLOW JOB SCRIPT
//
// Steps that install ampwright are left out (the test's ampwright is on
// PATH), and so are steps that use an action.
func cmdRunSteps(ts *testscript.TestScript, neg bool, args []string) {
	if neg || len(args) != 3 {
		ts.Fatalf("usage: runsteps WORKFLOW JOB SCRIPT")
	}
	lines := strings.Split(ts.ReadFile(args[0]), "\n")
	var out []string
	inJob, inRun, skip := false, false, false
	runIndent := 0
	indent := func(l string) int { return len(l) - len(strings.TrimLeft(l, " ")) }
	for _, l := range lines {
		t := strings.TrimSpace(l)
		switch {
		case indent(l) == 2 && strings.HasSuffix(t, ":"):
			inJob, inRun = t == args[1]+":", false
			continue
		case !inJob:
			continue
		}
		if inRun {
			if t == "" || indent(l) >= runIndent {
				if !skip && t != "" {
					out = append(out, strings.TrimSpace(l))
				}
				continue
			}
			inRun = false
		}
		switch {
		case strings.HasPrefix(t, "- name:"):
			skip = strings.Contains(t, "install ampwright")
		case strings.HasPrefix(t, "- uses:"):
			skip = true
		case strings.HasPrefix(t, "run: |"):
			inRun, runIndent = true, indent(l)+2
		case strings.HasPrefix(t, "run:"):
			if !skip {
				out = append(out, strings.TrimSpace(strings.TrimPrefix(t, "run:")))
			}
		}
	}
	if len(out) == 0 {
		ts.Fatalf("no commands for job %s in %s", args[1], args[0])
	}
	script := "set -euo pipefail\n" + strings.Join(out, "\n") + "\n"
	if err := os.WriteFile(ts.MkAbs(args[2]), []byte(script), 0o644); err != nil {
		ts.Fatalf("%v", err)
	}
}

// cmdPDFText writes the text a PDF shows, one line a page, to a file, so
// that a script can grep a pack:
//
//	pdftext PDF OUT
//
// The pack's fonts are embedded UTF-8 fonts whose strings fpdf writes as
// UTF-16BE; each string shown is one cell of text, joined by spaces.
func cmdPDFText(ts *testscript.TestScript, neg bool, args []string) {
	if neg || len(args) != 2 {
		ts.Fatalf("usage: pdftext PDF OUT")
	}
	b := []byte(ts.ReadFile(args[0]))
	r, err := pdf.NewReader(bytes.NewReader(b), int64(len(b)))
	if err != nil {
		ts.Fatalf("%s: not a PDF: %v", args[0], err)
	}
	var pages []string
	for i := 1; i <= r.NumPage(); i++ {
		var shown []string
		show := func(v pdf.Value) {
			if v.Kind() == pdf.String {
				shown = append(shown, decodeUTF16BE(v.RawString()))
			}
		}
		contents := r.Page(i).V.Key("Contents")
		streams := []pdf.Value{contents}
		if contents.Kind() == pdf.Array {
			streams = nil
			for j := 0; j < contents.Len(); j++ {
				streams = append(streams, contents.Index(j))
			}
		}
		for _, st := range streams {
			pdf.Interpret(st, func(stk *pdf.Stack, op string) {
				n := stk.Len()
				args := make([]pdf.Value, n)
				for k := n - 1; k >= 0; k-- {
					args[k] = stk.Pop()
				}
				switch {
				case (op == "Tj" || op == "'") && n > 0:
					show(args[n-1])
				case op == "TJ" && n > 0 && args[n-1].Kind() == pdf.Array:
					for k := 0; k < args[n-1].Len(); k++ {
						show(args[n-1].Index(k))
					}
				}
			})
		}
		pages = append(pages, strings.Join(strings.Fields(strings.Join(shown, " ")), " "))
	}
	if err := os.WriteFile(ts.MkAbs(args[1]), []byte(strings.Join(pages, "\n")+"\n"), 0o644); err != nil {
		ts.Fatalf("%v", err)
	}
}

// decodeUTF16BE decodes a string of UTF-16BE code units.
func decodeUTF16BE(s string) string {
	u := make([]uint16, 0, len(s)/2)
	for i := 0; i+1 < len(s); i += 2 {
		u = append(u, uint16(s[i])<<8|uint16(s[i+1]))
	}
	return string(utf16.Decode(u))
}
