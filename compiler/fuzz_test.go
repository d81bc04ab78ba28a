package compiler

import (
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"
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

// checkOutcome fails on an outcome other than a design or a list of
// positioned, plain errors.
func checkOutcome(t *testing.T, err error) {
	if err == nil {
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
	f.Fuzz(func(t *testing.T, src string) {
		if len(src) > 1<<16 {
			return
		}
		dir := t.TempDir()
		if err := os.WriteFile(filepath.Join(dir, "hull.cue"), []byte(src), 0o644); err != nil {
			t.Fatal(err)
		}
		_, _, err := Compile(dir)
		checkOutcome(t, err)
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
	base := seedHull(f)
	f.Fuzz(func(t *testing.T, n int, value string) {
		if len(value) > 256 || n < 0 {
			return
		}
		parts := strings.Split(base, `"`)
		// Odd parts are inside quotes.
		i := 1 + 2*(n%((len(parts)-1)/2))
		parts[i] = strings.NewReplacer(`"`, `\"`, "\\", "\\\\", "\n", "\\n").Replace(value)
		dir := t.TempDir()
		if err := os.WriteFile(filepath.Join(dir, "hull.cue"), []byte(strings.Join(parts, `"`)), 0o644); err != nil {
			t.Fatal(err)
		}
		_, _, err := Compile(dir)
		checkOutcome(t, err)
	})
}
