package report

import (
	"regexp"
	"strings"
)

// The pack marks a value that was not read in a published text with a
// symbol, explained once under Cautions (provenanceLegend), rather than
// repeating the rulebook's caveat beside every value.
const (
	markRecalled = "†" // recalled from a standard without its text at hand
	markCommon   = "‡" // common practice: a rule of thumb with no published source
	markSecond   = "§" // quoted from a secondary source, not the standard's own text
)

// provenanceLegend says what each mark means, for the pack's notes.
var provenanceLegend = [][2]string{
	{markRecalled, "Recalled (\u201cfrom memory\u201d): the value is the standard's as recalled, without its text at hand. Verify it against the edition of the standard the yard works to before the design is approved."},
	{markCommon, "Common practice: a rule of thumb of the trade, with no published source. The yard decides whether it holds for its boats, and may give its own value in its rulebook."},
	{markSecond, "Secondary source: the value is quoted from a handbook, a summary or a public source other than the standard's own text. Verify it against the edition the yard works to."},
}

// caveatRE is the caveat schema.Sourced.Caveat and the checks add to a
// source, which the marks replace.
var caveatRE = regexp.MustCompile(`\s*\((recalled|from memory|common-practice|common practice|secondary); verify against the edition you work to\)`)

// provenance returns source text s without its caveat, and the marks of
// its provenance ("" for a published source).
func provenance(s string) (text, marks string) {
	var have [3]bool
	note := func(kind string) {
		switch kind {
		case "recalled", "from memory":
			have[0] = true
		case "common-practice", "common practice":
			have[1] = true
		case "secondary":
			have[2] = true
		}
	}
	for _, m := range caveatRE.FindAllStringSubmatch(s, -1) {
		note(m[1])
	}
	text = strings.TrimSpace(caveatRE.ReplaceAllString(s, ""))
	l := strings.ToLower(text)
	for _, k := range []string{"from memory", "recalled", "common practice", "common-practice", "secondary"} {
		if strings.Contains(l, k) {
			note(k)
		}
	}
	for i, m := range []string{markRecalled, markCommon, markSecond} {
		if have[i] {
			marks += m
		}
	}
	return text, marks
}

// marked is source text s with its caveat replaced by its marks.
func marked(s string) string {
	text, marks := provenance(s)
	if marks == "" {
		return text
	}
	return text + " " + marks
}
