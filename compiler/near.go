package compiler

import (
	"fmt"
	"sort"
	"strings"
)

// nearMatches returns up to three names from candidates that look like a
// misspelling of name, closest first.
func nearMatches(name string, candidates []string) []string {
	type scored struct {
		s string
		d int
	}
	var out []scored
	lname := strings.ToLower(name)
	for _, c := range candidates {
		if c == name {
			continue
		}
		lc := strings.ToLower(c)
		d := editDistance(lname, lc)
		limit := max(2, len(name)/3)
		switch {
		case d <= limit:
		case len(lname) >= 3 && (strings.HasPrefix(lc, lname) || strings.HasPrefix(lname, lc)):
			d = limit + 1
		default:
			continue
		}
		out = append(out, scored{c, d})
	}
	sort.Slice(out, func(i, j int) bool {
		if out[i].d != out[j].d {
			return out[i].d < out[j].d
		}
		return out[i].s < out[j].s
	})
	names := make([]string, 0, 3)
	for i := 0; i < len(out) && i < 3; i++ {
		names = append(names, out[i].s)
	}
	return names
}

// editDistance is the Levenshtein distance between a and b, by rune.
func editDistance(a, b string) int {
	ra, rb := []rune(a), []rune(b)
	prev := make([]int, len(rb)+1)
	cur := make([]int, len(rb)+1)
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= len(ra); i++ {
		cur[0] = i
		for j := 1; j <= len(rb); j++ {
			cost := 1
			if ra[i-1] == rb[j-1] {
				cost = 0
			}
			cur[j] = min(prev[j]+1, cur[j-1]+1, prev[j-1]+cost)
		}
		prev, cur = cur, prev
	}
	return prev[len(rb)]
}

// suggest phrases the near matches of name among candidates, or lists
// what there is when nothing is near: "; did you mean "agm105"?".
func suggest(name string, candidates []string) string {
	if m := nearMatches(name, candidates); len(m) > 0 {
		return "; did you mean " + quoteList(m, "or") + "?"
	}
	if len(candidates) == 0 {
		return "; there are none"
	}
	sorted := append([]string(nil), candidates...)
	sort.Strings(sorted)
	if len(sorted) > 8 {
		return fmt.Sprintf("; there are %s and %d more", quoteList(sorted[:8], ""), len(sorted)-8)
	}
	return "; there are " + quoteList(sorted, "and")
}

// quoteList quotes names and joins them: "a", "b" or "c".
func quoteList(names []string, conj string) string {
	q := make([]string, len(names))
	for i, n := range names {
		q[i] = fmt.Sprintf("%q", n)
	}
	if conj == "" || len(q) == 1 {
		return strings.Join(q, ", ")
	}
	return strings.Join(q[:len(q)-1], ", ") + " " + conj + " " + q[len(q)-1]
}
