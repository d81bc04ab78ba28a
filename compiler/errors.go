package compiler

import (
	"fmt"
	"os"
	"path"
	"path/filepath"
	"sort"
	"strings"

	"cuelang.org/go/cue/token"

	"github.com/ampwright/ampwright/result"
	"github.com/ampwright/ampwright/schema"
)

// An Error is one problem with a design's input: where it is, the CUE path
// of the offending value, and a message that says what was found and what
// was expected.
type Error struct {
	Pos     token.Pos   // the design's own position, when known
	Path    string      // CUE path, such as wiring."bank-main".length
	Msg     string      // what is wrong and what is expected
	Related []token.Pos // further positions that contributed (the schema's)
}

// Error formats e as file:line:col: path: message.
func (e *Error) Error() string {
	var b strings.Builder
	if p := posString(e.Pos); p != "" {
		b.WriteString(p)
		b.WriteString(": ")
	}
	if e.Path != "" {
		b.WriteString(e.Path)
		b.WriteString(": ")
	}
	b.WriteString(e.Msg)
	return b.String()
}

// ErrorList is a list of input errors; it is itself an error.
type ErrorList []*Error

// Add appends an error.
func (l *ErrorList) Add(pos token.Pos, path, format string, args ...any) {
	*l = append(*l, &Error{Pos: pos, Path: path, Msg: fmt.Sprintf(format, args...)})
}

// Sort orders errors by file, line and column, errors with no position
// last, then by path and message, and drops exact duplicates.
func (l *ErrorList) Sort() {
	s := *l
	sort.SliceStable(s, func(i, j int) bool {
		a, b := s[i], s[j]
		if c := comparePos(a.Pos, b.Pos); c != 0 {
			return c < 0
		}
		if a.Path != b.Path {
			return a.Path < b.Path
		}
		return a.Msg < b.Msg
	})
	out := s[:0]
	for i, e := range s {
		if i > 0 && e.Error() == s[i-1].Error() {
			continue
		}
		out = append(out, e)
	}
	*l = out
}

func comparePos(a, b token.Pos) int {
	switch {
	case a.IsValid() && !b.IsValid():
		return -1
	case !a.IsValid() && b.IsValid():
		return 1
	case !a.IsValid():
		return 0
	}
	if a.Filename() != b.Filename() {
		return strings.Compare(displayName(a.Filename()), displayName(b.Filename()))
	}
	if a.Line() != b.Line() {
		return a.Line() - b.Line()
	}
	return a.Column() - b.Column()
}

// Error joins the list, one error a line, each followed by its related
// positions indented.
func (l ErrorList) Error() string {
	var b strings.Builder
	for i, e := range l {
		if i > 0 {
			b.WriteByte('\n')
		}
		b.WriteString(e.Error())
		for _, p := range e.Related {
			b.WriteString("\n    ")
			b.WriteString(posString(p))
		}
	}
	return b.String()
}

// Err returns nil for an empty list, else the sorted list as an error.
func (l ErrorList) Err() error {
	if len(l) == 0 {
		return nil
	}
	l.Sort()
	return l
}

// Problems converts the list for a result.
func (l ErrorList) Problems() []result.Problem {
	out := make([]result.Problem, 0, len(l))
	for _, e := range l {
		p := result.Problem{Position: posString(e.Pos), Path: e.Path, Message: e.Msg}
		for _, r := range e.Related {
			p.Related = append(p.Related, posString(r))
		}
		out = append(out, p)
	}
	return out
}

// isSchemaPos reports whether p lies in ampwright's schema, embedded or
// vendored into the yard's module.
func isSchemaPos(p token.Pos) bool {
	f := filepath.ToSlash(p.Filename())
	return strings.HasPrefix(f, schema.FilePrefix) ||
		strings.HasSuffix(path.Dir(f), "/cue.mod/pkg/"+schema.ImportPath)
}

// designPos picks the first position that is the design's own from ps,
// the rest becoming related positions. Positions in the embedded schema
// are left out: there is no file a user could open at them (a vendored
// copy's positions are kept).
func designPos(ps []token.Pos) (token.Pos, []token.Pos) {
	var first token.Pos
	var rest []token.Pos
	for _, p := range ps {
		if !p.IsValid() || strings.HasPrefix(p.Filename(), schema.FilePrefix) {
			continue
		}
		if !first.IsValid() && !isSchemaPos(p) {
			first = p
			continue
		}
		rest = append(rest, p)
	}
	sort.SliceStable(rest, func(i, j int) bool { return comparePos(rest[i], rest[j]) < 0 })
	out := rest[:0]
	for i, p := range rest {
		if (i > 0 && comparePos(p, rest[i-1]) == 0) || (first.IsValid() && comparePos(p, first) == 0) {
			continue
		}
		out = append(out, p)
	}
	return first, out
}

func posString(p token.Pos) string {
	if !p.IsValid() {
		return ""
	}
	return fmt.Sprintf("%s:%d:%d", displayName(p.Filename()), p.Line(), p.Column())
}

// displayName shows a file relative to the working directory when it lies
// below it, so that messages and goldens do not depend on where a checkout
// sits.
func displayName(name string) string {
	if strings.HasPrefix(name, virtualBase+"/") {
		var shown string
		labels.Range(func(k, v any) bool {
			if root := k.(string); strings.HasPrefix(name, root+"/") {
				shown = v.(string) + strings.TrimPrefix(name, root+"/")
				return false
			}
			return true
		})
		if shown != "" {
			return shown
		}
	}
	if strings.HasPrefix(name, schema.FilePrefix) || !filepath.IsAbs(name) {
		return filepath.ToSlash(name)
	}
	wd, err := os.Getwd()
	if err != nil {
		return name
	}
	rel, err := filepath.Rel(wd, name)
	if err != nil || strings.HasPrefix(rel, "..") {
		return filepath.ToSlash(name)
	}
	return filepath.ToSlash(rel)
}
