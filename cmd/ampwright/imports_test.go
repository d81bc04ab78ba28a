package main

import (
	"os/exec"
	"strings"
	"testing"
)

const module = "github.com/ampwright/ampwright"

// allowedImports is the one-way import flow of DEVELOPERS.md: for each of
// the project's packages, the project packages it may import. Anything not
// listed here may not import anything of the project's.
var allowedImports = map[string][]string{
	"cmd/ampwright": {"worker", "yard", "cache", "compiler", "propose", "report", "result", "checks", "schema"},
	"worker":        {"yard", "cache", "compiler", "result"},
	"propose":       {"compiler", "checks", "energy", "model", "schema", "schema/unit", "result"},
	"yard":          {"cache", "compiler", "result", "schema"},
	"cache":         {},
	"compiler":      {"checks", "energy", "model", "schema", "schema/unit", "result"},
	"checks":        {"energy", "energy/solar", "model", "schema", "schema/unit", "result"},
	"energy":        {"energy/solar", "model", "schema", "schema/unit", "result"},
	"energy/solar":  {},
	"model":         {"schema", "schema/unit"},
	"schema":        {"schema/unit"},
	"report":        {"result"},
	"result":        {},
	"schema/unit":   {},
	"cmd/yardgen":   {},
}

// reportLibs are the only modules outside the standard library that
// package report may import: the PDF writer and the Go fonts.
var reportLibs = []string{"github.com/go-pdf/fpdf", "golang.org/x/image/font/"}

// stdOnly are the packages that may import nothing but the standard
// library: the result contract, so any tool can read it, and the unit
// parser.
var stdOnly = map[string]bool{"cache": true, "result": true, "schema/unit": true, "energy/solar": true, "cmd/yardgen": true}

// TestImportFlow walks `go list` and fails on an import against the flow.
func TestImportFlow(t *testing.T) {
	out, err := exec.Command("go", "list", "-f", `{{.ImportPath}}{{range .Imports}} {{.}}{{end}}`, module+"/...").Output()
	if err != nil {
		t.Fatalf("go list: %v", err)
	}
	for _, line := range strings.Split(strings.TrimSpace(string(out)), "\n") {
		fields := strings.Fields(line)
		pkg := strings.TrimPrefix(strings.TrimPrefix(fields[0], module), "/")
		allowed, known := allowedImports[pkg]
		if !known {
			t.Errorf("package %s is not in the import flow of DEVELOPERS.md; add it to allowedImports", pkg)
			continue
		}
		for _, imp := range fields[1:] {
			if strings.HasPrefix(imp, module+"/") {
				dep := strings.TrimPrefix(imp, module+"/")
				if !contains(allowed, dep) {
					t.Errorf("%s imports %s, against the import flow", pkg, dep)
				}
				continue
			}
			if stdOnly[pkg] && strings.Contains(strings.SplitN(imp, "/", 2)[0], ".") {
				t.Errorf("%s imports %s; it may use only the standard library", pkg, imp)
			}
			if pkg == "report" && strings.HasPrefix(imp, "cuelang.org/") {
				t.Errorf("report imports %s; report never sees CUE", imp)
			}
			if pkg == "report" && strings.Contains(strings.SplitN(imp, "/", 2)[0], ".") && !hasPrefix(imp, reportLibs) {
				t.Errorf("report imports %s; it may use only the standard library, result and %s", imp, strings.Join(reportLibs, ", "))
			}
		}
	}
}

func hasPrefix(s string, prefixes []string) bool {
	for _, p := range prefixes {
		if strings.HasPrefix(s, p) {
			return true
		}
	}
	return false
}

func contains(list []string, s string) bool {
	for _, x := range list {
		if x == s {
			return true
		}
	}
	return false
}
