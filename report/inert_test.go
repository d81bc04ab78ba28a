package report

import (
	"bytes"
	"strings"
	"testing"
)

func TestInert(t *testing.T) {
	for _, tc := range []struct{ name, in, want string }{
		{"plain", "Dunnock KQ 28", "Dunnock KQ 28"},
		{"letters beyond ASCII", "Mörwe ⚓ 12 mm² ✓", "Mörwe ⚓ 12 mm² ✓"},
		{"escape sequence", "a\x1b[2Jb", `a\x1b[2Jb`},
		{"carriage return and line break", "PASS\r\nFAIL", `PASS\r\nFAIL`},
		{"tab", "a\tb", `a\tb`},
		{"NUL and DEL", "a\x00b\x7f", `a\x00b\x7f`},
		{"C1 control", "a\u0085b\u009bc", `a\u0085b\u009bc`},
		{"bidirectional override", "abc\u202edef", `abc\u202edef`},
		{"isolates and marks", "\u2066x\u2069\u200e\u200f\u061c", `\u2066x\u2069\u200e\u200f\u061c`},
		{"separators", "a\u2028b\u2029c", `a\u2028b\u2029c`},
		{"zero width space and tag characters", "a\u200bb\U000e0041", `a\u200bb\U000e0041`},
		{"zero width joiner kept", "👩\u200d🔧", "👩\u200d🔧"},
		{"not UTF-8", "a\xff\xfeb", `a\xff\xfeb`},
	} {
		t.Run(tc.name, func(t *testing.T) {
			got := Inert(tc.in)
			if got != tc.want {
				t.Errorf("Inert(%q) = %q, want %q", tc.in, got, tc.want)
			}
			if again := Inert(got); again != got {
				t.Errorf("Inert is not idempotent: %q, then %q", got, again)
			}
		})
	}
}

func TestMarkdownEscapes(t *testing.T) {
	got := md("**x** <img src=x> @octocat | `c` \x1b[31m\u202e\nline")
	for _, bad := range []string{"**", "<img", "@octocat", "| `", "\x1b", "\u202e", "\n"} {
		if strings.Contains(got, bad) {
			t.Errorf("md left %q in %q", bad, got)
		}
	}
	if !strings.Contains(got, `@&#8203;octocat`) || !strings.Contains(got, `\\x1b`) {
		t.Errorf("md(...) = %q", got)
	}
}

func TestPrintfInert(t *testing.T) {
	var b bytes.Buffer
	type name string
	if err := Printf(&b, "%s %v %s\n", "a\x1bb", errString("e\rf"), name("\u202e")); err != nil {
		t.Fatal(err)
	}
	if got, want := b.String(), `a\x1bb e\rf \u202e`+"\n"; got != want {
		t.Errorf("Printf wrote %q, want %q", got, want)
	}
}

type errString string

func (e errString) Error() string { return string(e) }

func TestCSVFormulas(t *testing.T) {
	for in, want := range map[string]string{"=HYPERLINK(1)": "'=HYPERLINK(1)", "+1": "'+1", "@x": "'@x", "-x": "'-x", "plain": "plain", "a\tb": `a\tb`} {
		if got := csvText(in); got != want {
			t.Errorf("csvText(%q) = %q, want %q", in, got, want)
		}
	}
}
