package compiler

import (
	"bytes"
	"encoding/json"
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"
	"unicode/utf8"

	"github.com/ampwright/ampwright/report"
	"github.com/ampwright/ampwright/result"
)

// The fuzz targets replay their seeds in every `go test`. Run them for
// longer on demand, for example:
//
//	go test ./compiler -run xxx -fuzz FuzzLoad -fuzztime 10m
//	go test ./compiler -run xxx -fuzz FuzzCompile -fuzztime 10m
//
// Inputs that fail are saved under testdata/fuzz/ and replayed from then on.

// seedHull is a valid hull outside any module, importing nothing.
func seedHull(t testing.TB) string {
	b, err := os.ReadFile("../testdata/designs/standalone/standalone.cue")
	if err != nil {
		t.Fatal(err)
	}
	return string(b)
}

// checkOutcome fails on an outcome other than a result or a list of
// positioned, plain errors, and renders either as the command would: the
// result as JSON and text, the errors as text. The JSON must be valid and
// UTF-8, the text UTF-8 with no character that acts (control characters
// but the line break, bidirectional controls, separators).
func checkOutcome(t *testing.T, r *result.Result, err error) {
	var text bytes.Buffer
	if err == nil {
		var js bytes.Buffer
		if jerr := report.JSON(&js, r); jerr != nil {
			t.Fatalf("the result does not render as JSON: %v", jerr)
		}
		if !json.Valid(js.Bytes()) || !utf8.Valid(js.Bytes()) {
			t.Fatalf("the JSON is not valid UTF-8 JSON:\n%s", js.Bytes())
		}
		if terr := report.Text(&text, r); terr != nil {
			t.Fatalf("the result does not render as text: %v", terr)
		}
		checkInert(t, text.String())
		return
	}
	var list ErrorList
	if !errors.As(err, &list) {
		t.Fatalf("error is not an ErrorList: %T %v", err, err)
	}
	for _, e := range list {
		if e.Msg == "" {
			t.Fatalf("an error without a message: %+v", e)
		}
		if strings.Contains(e.Msg, "goroutine ") || strings.Contains(e.Msg, "panic") {
			t.Fatalf("a stack trace in a message: %s", e.Msg)
		}
	}
	if err := report.Problems(&text, list.Problems()); err != nil {
		t.Fatal(err)
	}
	checkInert(t, text.String())
}

// FuzzLoad loads arbitrary bytes as a hull outside any module: the loader
// must never panic, and must answer with a design or positioned errors.
func FuzzLoad(f *testing.F) {
	f.Add(seedHull(f))
	f.Add("package x\nvessel: {name: \"A\", length: \"12 V\"}\n")
	f.Add("package x\nimport \"yard.example/catalog\"\nbank: battery: catalog.battery.x\n")
	f.Add("package x\nwiring: a: {from: \"bank\", to: \"bank\", length: \"-1 m\", size: \"99 AWG\"}\n")
	f.Add("package x\n_l: [for i in [1,2,3] {i}]\nsite: latitude: _l\n")
	f.Add("{{{{")
	f.Add("")
	// From the hostile corpus (testdata/hostile): a limit loosened by the
	// design, embedding, names that act on a terminal, numbers float64
	// cannot hold, bytes that are not UTF-8.
	f.Add("package x\nvessel: length: \"1000 m\" @q(length, le=\"2000 m\")\n")
	f.Add("@extern(embed)\npackage x\nd: _ @embed(file=secret.json)\n")
	f.Add("package x\nvessel: {name: \"A\\u001b[2J\\u202e\\r\\nPASS\", hull: \"\\u0085\\u2066\"}\n")
	f.Add("package x\nrules: bundling: {source: \"s\", steps: [{from: 1, factor: 1}], minVoltage: 1e400}\n")
	f.Add("package x\nvessel: name: \"ab\xff\xfecd\"\n")
	f.Add("package x\nscenarios: a: hours: 12\nloads: l: hours: a: 24\n")
	hull := scratchHull(f)
	f.Fuzz(func(t *testing.T, src string) {
		if len(src) > 1<<16 {
			return
		}
		r, err := compileWithin(t, hull(t, src))
		checkOutcome(t, r, err)
	})
}

// FuzzCompile replaces one quoted value of a valid design with fuzzed
// text and compiles it: every quantity, name and reference of a real design
// meets bad values, and the compiler must answer plainly.
func FuzzCompile(f *testing.F) {
	f.Add(0, "12 V")
	f.Add(3, "")
	f.Add(5, "NaN A")
	f.Add(7, "1e308 m")
	f.Add(9, "bank")
	f.Add(11, "-0 °C")
	f.Add(13, "1/0 AWG")
	f.Add(20, "\" + x + \"")
	f.Add(0, "Name\x1b[2J\u202e\r\nFAKE PASS\u0085\u2066")
	f.Add(1, "\xff\xfe")
	f.Add(5, "1e400 A")
	f.Add(7, "Inf m")
	f.Add(2, "**x** <img src=x> @octocat")
	base := seedHull(f)
	hull := scratchHull(f)
	f.Fuzz(func(t *testing.T, n int, value string) {
		if len(value) > 256 || n < 0 {
			return
		}
		parts := strings.Split(base, `"`)
		// Odd parts are inside quotes.
		i := 1 + 2*(n%((len(parts)-1)/2))
		parts[i] = strings.NewReplacer(`"`, `\"`, "\\", "\\\\", "\n", "\\n").Replace(value)
		r, err := compileWithin(t, hull(t, strings.Join(parts, `"`)))
		checkOutcome(t, r, err)
	})
}

// scratchHull returns a function that writes a hull's one file into a
// directory kept for the fuzzing process and returns the directory: a
// fuzzing process runs its inputs one after another, and a directory
// made and removed for each was a tenth of an input's time. (A compile
// abandoned by compileWithin may still read it while the next input is
// written; that input was skipped in any case.)
func scratchHull(f *testing.F) func(t *testing.T, src string) string {
	dir := f.TempDir()
	file := filepath.Join(dir, "hull.cue")
	return func(t *testing.T, src string) string {
		if err := os.WriteFile(file, []byte(src), 0o644); err != nil {
			t.Fatal(err)
		}
		return dir
	}
}

// compileWithin compiles dir, skipping an input that takes longer than a
// few seconds: Compile has no time bound of its own (the command stops a
// compile by ending its process), and the fuzzer would wait on it. The
// abandoned compile runs on in the fuzzing process.
func compileWithin(t *testing.T, dir string) (*result.Result, error) {
	type answer struct {
		r   *result.Result
		err error
	}
	ch := make(chan answer, 1)
	go func() {
		r, d, err := Compile(dir)
		d.Release() // as a worker does: the next input reuses the context
		ch <- answer{r, err}
	}()
	select {
	case a := <-ch:
		return a.r, a.err
	case <-time.After(10 * time.Second):
		t.Skip("compiling took longer than 10s; bounds are the command's (package worker)")
		return nil, nil
	}
}

// checkInert fails on text with a character that acts rather than shows.
func checkInert(t *testing.T, s string) {
	t.Helper()
	if !utf8.ValidString(s) {
		t.Fatalf("the text is not UTF-8: %q", s)
	}
	for _, r := range s {
		if (r < 0x20 && r != '\n') || r == 0x7f || (r >= 0x80 && r <= 0x9f) || r == 0x061c || r == 0x200e || r == 0x200f ||
			(r >= 0x202a && r <= 0x202e) || (r >= 0x2066 && r <= 0x2069) || r == 0x2028 || r == 0x2029 {
			t.Fatalf("the text holds %U: %q", r, s)
		}
	}
}
