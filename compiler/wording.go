package compiler

import (
	"regexp"
	"strings"
)

// The schema's constraints are CUE expressions (int & >=1 & <=16,
// =~"^[A-Z]{3}$"); a designer reads what they ask for in words. The
// helpers here word the constraints CUE's errors quote, and never print a
// regular expression.

// kindPhrase words a CUE kind as a value the designer could write.
func kindPhrase(kind string) string {
	switch strings.TrimSpace(kind) {
	case "int":
		return "a whole number"
	case "float", "number", "int|float", "float|int":
		return "a number"
	case "string":
		return "text in quotes"
	case "bool":
		return "true or false"
	case "struct":
		return "a struct of fields, {…}"
	case "list":
		return "a list, […]"
	case "null":
		return "null"
	}
	return "a value of another kind"
}

// boundPhrase words a bound such as <=100 as what the value must be.
func boundPhrase(bound, path string) string {
	for _, b := range []struct{ op, words string }{
		{"<=", "at most"}, {">=", "at least"}, {"<", "less than"}, {">", "more than"}, {"!=", "other than"},
	} {
		if rest, ok := strings.CutPrefix(bound, b.op); ok {
			return "it must be " + b.words + " " + rest
		}
	}
	if strings.HasPrefix(bound, "=~") || strings.HasPrefix(bound, "!~") {
		return "expected " + patternPhrase(path)
	}
	return "it does not meet the schema's bound"
}

// patternPhrase says what a field constrained by a regular expression in
// the schema holds.
func patternPhrase(path string) string {
	last := path
	if i := strings.LastIndexByte(path, '.'); i >= 0 {
		last = path[i+1:]
	}
	switch strings.Trim(last, `"`) {
	case "currency":
		return `a currency code of three capital letters, such as "EUR"`
	}
	return namePhrase
}

// namePhrase is what a name in a design must be: the schema's #Name.
const namePhrase = `a name that starts with a letter and has only letters, digits, "_", "." and "-"`

// isName reports whether s is a valid #Name.
var isName = regexp.MustCompile(`^[A-Za-z][A-Za-z0-9_.-]*$`).MatchString

// expectation words a schema expression CUE quotes as what was expected:
// `int & >=1 & <=16` reads "a whole number, at least 1, at most 16";
// a disjunction of literals lists them.
func expectation(expr, path string) string {
	expr = strings.TrimSpace(expr)
	if strings.Contains(expr, "|") {
		var lits []string
		for _, alt := range strings.Split(expr, "|") {
			alt = strings.TrimPrefix(strings.TrimSpace(alt), "*")
			if !strings.HasPrefix(alt, `"`) {
				return "one of the values the schema allows"
			}
			lits = append(lits, alt)
		}
		return "one of " + strings.Join(lits, ", ")
	}
	var what string
	var bounds []string
	for _, part := range strings.Split(expr, "&") {
		part = strings.TrimSpace(part)
		switch {
		case part == "":
		case part == `!=""`:
			bounds = append(bounds, "not empty")
		case strings.HasPrefix(part, "=~") || strings.HasPrefix(part, "!~"):
			what = patternPhrase(path)
		case strings.ContainsAny(part[:1], "<>!"):
			bounds = append(bounds, strings.TrimPrefix(boundPhrase(part, path), "it must be "))
		case kindPhrase(part) != "a value of another kind":
			if what == "" {
				what = kindPhrase(part)
			}
		default:
			return "a value the schema allows"
		}
	}
	if what == "" {
		what = "a value"
	}
	if len(bounds) > 0 {
		what += ", " + strings.Join(bounds, ", ")
	}
	return what
}
