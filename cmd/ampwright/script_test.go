package main

import (
	"encoding/json"
	"flag"
	"fmt"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/rogpeppe/go-internal/testscript"
)

var updateScripts = flag.Bool("update", false, "rewrite the expected output in testscript files")

func TestMain(m *testing.M) {
	testscript.Main(m, map[string]func(){
		"ampwright": func() { os.Exit(Main()) },
	})
}

// TestScript runs the end-to-end scripts in testdata/script. $DESIGNS is
// the example yard's directory.
func TestScript(t *testing.T) {
	designs, err := filepath.Abs("../../designs")
	if err != nil {
		t.Fatal(err)
	}
	testscript.Run(t, testscript.Params{
		Dir:           "testdata/script",
		UpdateScripts: *updateScripts,
		Setup: func(env *testscript.Env) error {
			env.Setenv("DESIGNS", designs)
			return nil
		},
		Cmds: map[string]func(ts *testscript.TestScript, neg bool, args []string){
			"jsonpath": cmdJSONPath,
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
