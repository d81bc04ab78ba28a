package report

import (
	"fmt"
	"io"
	"reflect"
	"strconv"
	"strings"
	"unicode"
	"unicode/utf8"
)

// Inert returns s with everything escaped that could act rather than be
// read where the text is shown: control characters (C0, DEL and C1, so
// escape sequences, carriage returns, line breaks and tabs), Unicode's
// bidirectional overrides, isolates and marks, line and paragraph
// separators and other invisible format characters, and bytes that are not
// UTF-8. Each is written as a Go escape (\x1b, \u202e), so that a name from
// a design cannot clear a terminal, forge a line of a report, reorder what
// a reviewer reads or hide text. Every view of a result passes the text it
// did not write itself through Inert: the terminal's, Markdown's (md adds
// its own escaping) and the PDF's.
func Inert(s string) string {
	if plainASCII(s) || !acts(s) {
		return s
	}
	var b strings.Builder
	for i := 0; i < len(s); {
		r, w := utf8.DecodeRuneInString(s[i:])
		switch {
		case r == utf8.RuneError && w == 1:
			fmt.Fprintf(&b, `\x%02x`, s[i])
		case r == '\n':
			b.WriteString(`\n`)
		case r == '\r':
			b.WriteString(`\r`)
		case r == '\t':
			b.WriteString(`\t`)
		case r < 0x20 || r == 0x7f:
			fmt.Fprintf(&b, `\x%02x`, r)
		case active(r):
			q := strconv.QuoteRuneToASCII(r)
			b.WriteString(q[1 : len(q)-1])
		default:
			b.WriteString(s[i : i+w])
		}
		i += w
	}
	return b.String()
}

// acts reports whether Inert would escape anything in s.
func acts(s string) bool {
	for i, r := range s {
		if r == utf8.RuneError {
			if _, w := utf8.DecodeRuneInString(s[i:]); w == 1 {
				return true
			}
		}
		if r < 0x20 || r == 0x7f || r >= 0x80 && active(r) {
			return true
		}
	}
	return false
}

// plainASCII reports whether s is printable ASCII only, the usual case.
func plainASCII(s string) bool {
	for i := 0; i < len(s); i++ {
		if c := s[i]; c < 0x20 || c > 0x7e {
			return false
		}
	}
	return true
}

// active reports whether a rune beyond ASCII acts on how text is shown
// rather than showing as itself: the C1 controls, the bidirectional
// controls (U+061C, U+200E, U+200F, U+202A–U+202E, U+2066–U+2069), the
// line and paragraph separators, and the other format characters (zero
// width spaces, word joiners, tag characters) but the zero width joiner,
// which joins emoji.
func active(r rune) bool {
	switch {
	case r >= 0x80 && r <= 0x9f:
		return true
	case r == 0x200d:
		return false
	case r == 0x2028 || r == 0x2029:
		return true
	}
	return unicode.Is(unicode.Cf, r)
}

// Printf writes to w as fmt.Fprintf does, with every string argument made
// inert: the one way the command prints a message that may carry a
// design's text (an error naming a file of the yard, a hull's path).
func Printf(w io.Writer, format string, args ...any) error {
	_, err := fmt.Fprintf(w, format, inertArgs(args)...)
	return err
}

// inertArgs makes the string arguments of a print inert, errors and other
// Stringers included.
func inertArgs(args []any) []any {
	out := make([]any, len(args))
	for i, a := range args {
		switch v := a.(type) {
		case string:
			out[i] = Inert(v)
		case error:
			out[i] = Inert(v.Error())
		case fmt.Stringer:
			out[i] = Inert(v.String())
		default:
			if rv := reflect.ValueOf(a); rv.IsValid() && rv.Kind() == reflect.String {
				out[i] = Inert(rv.String())
			} else {
				out[i] = a
			}
		}
	}
	return out
}

// csvText makes a text cell of a CSV inert, and keeps a spreadsheet from
// reading it as a formula: a cell that starts with =, +, -, @ or a control
// character is prefixed with an apostrophe, as OWASP advises.
func csvText(s string) string {
	s = Inert(s)
	if s != "" && strings.ContainsRune("=+-@", rune(s[0])) {
		return "'" + s
	}
	return s
}
