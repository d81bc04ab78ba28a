package report

import (
	"bytes"
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"
	"time"
	"unicode/utf16"

	"rsc.io/pdf"

	"github.com/ampwright/ampwright/result"
)

// The fixtures in testdata are the results of the example hulls, as
// `ampwright check --format json` prints them; package report may not run
// the compiler itself. Refresh them from the repository root with
//
//	for h in dunnock marram brackenwell tystie sanderling; do
//		go run ./cmd/ampwright check --format json designs/hulls/$h > report/testdata/$h.json
//	done
//
// (the command exits 1 for brackenwell, which fails four checks).
var hulls = []string{"dunnock", "marram", "brackenwell", "tystie", "sanderling"}

func fixture(t *testing.T, hull string) *result.Result {
	t.Helper()
	b, err := os.ReadFile(filepath.Join("testdata", hull+".json"))
	if err != nil {
		t.Fatal(err)
	}
	var r result.Result
	if err := json.Unmarshal(b, &r); err != nil {
		t.Fatalf("%s: %v", hull, err)
	}
	return &r
}

func render(t *testing.T, r *result.Result, opts PackOptions) []byte {
	t.Helper()
	var b bytes.Buffer
	if err := Pack(&b, r, opts); err != nil {
		t.Fatal(err)
	}
	return b.Bytes()
}

// parsed is a PDF read back: each page's text and media box.
type parsed struct {
	pages []string
	boxes []string
	info  pdf.Value
}

func (p parsed) all() string { return strings.Join(p.pages, "\n") }

// readPDF parses a PDF with rsc.io/pdf and extracts each page's text by
// interpreting its content stream. The pack's fonts are embedded UTF-8
// (Type0, Identity-H) fonts, whose strings fpdf writes as UTF-16BE code
// units, so the strings shown by Tj and TJ are decoded as UTF-16BE; each
// shown string is one line or cell of text, joined here by spaces, with
// runs of whitespace collapsed.
func readPDF(t *testing.T, b []byte) parsed {
	t.Helper()
	r, err := pdf.NewReader(bytes.NewReader(b), int64(len(b)))
	if err != nil {
		t.Fatalf("the pack does not parse as PDF: %v", err)
	}
	var p parsed
	p.info = r.Trailer().Key("Info")
	for i := 1; i <= r.NumPage(); i++ {
		pg := r.Page(i)
		var shown []string
		show := func(v pdf.Value) {
			if v.Kind() == pdf.String {
				shown = append(shown, utf16be(v.RawString()))
			}
		}
		contents := pg.V.Key("Contents")
		streams := []pdf.Value{contents}
		if contents.Kind() == pdf.Array {
			streams = nil
			for j := 0; j < contents.Len(); j++ {
				streams = append(streams, contents.Index(j))
			}
		}
		for _, s := range streams {
			pdf.Interpret(s, func(stk *pdf.Stack, op string) {
				n := stk.Len()
				args := make([]pdf.Value, n)
				for k := n - 1; k >= 0; k-- {
					args[k] = stk.Pop()
				}
				switch op {
				case "Tj", "'":
					if n > 0 {
						show(args[n-1])
					}
				case "TJ":
					if n > 0 && args[n-1].Kind() == pdf.Array {
						a := args[n-1]
						var parts []string
						for k := 0; k < a.Len(); k++ {
							if a.Index(k).Kind() == pdf.String {
								parts = append(parts, utf16be(a.Index(k).RawString()))
							}
						}
						shown = append(shown, strings.Join(parts, ""))
					}
				}
			})
		}
		p.pages = append(p.pages, strings.Join(strings.Fields(strings.Join(shown, " ")), " "))
		p.boxes = append(p.boxes, mediaBox(pg))
	}
	return p
}

// mediaBox is a page's media box, inherited from the page tree, as
// "[x0 y0 x1 y1]".
func mediaBox(pg pdf.Page) string {
	for v := pg.V; !v.IsNull(); v = v.Key("Parent") {
		if b := v.Key("MediaBox"); b.Kind() == pdf.Array {
			var xs []string
			for i := 0; i < b.Len(); i++ {
				xs = append(xs, fmt.Sprintf("%g", b.Index(i).Float64()))
			}
			return "[" + strings.Join(xs, " ") + "]"
		}
	}
	return "none"
}

func utf16be(s string) string {
	if len(s)%2 != 0 {
		return "\uFFFD" + s
	}
	u := make([]uint16, len(s)/2)
	for i := range u {
		u[i] = uint16(s[2*i])<<8 | uint16(s[2*i+1])
	}
	return string(utf16.Decode(u))
}

func TestPackExamples(t *testing.T) {
	t.Parallel()
	for _, hull := range hulls {
		t.Run(hull, func(t *testing.T) {
			r := fixture(t, hull)
			p := readPDF(t, render(t, r, PackOptions{}))
			n := len(p.pages)
			if n < 8 || n > 60 {
				t.Errorf("%d pages, want 8 to 60", n)
			}
			text := p.all()
			want := []string{r.Design.Name, r.Design.Hull, r.Design.InputsHash, "qualified marine electrician",
				"Sign-off", "Prepared", "Checked", "Approved", r.Design.Designer, r.Design.Checker, r.Design.Approver,
				"Wiring schedule", "Calculation sheets", "Bill of materials", "Cautions", "thermal runaway", "Ignition protection",
				r.Rulebook.Name, "edition " + r.Rulebook.Edition}
			for _, w := range r.Wiring {
				want = append(want, w.Name)
			}
			c := r.Count()
			for _, f := range r.Checks {
				if f.Status == result.Fail {
					want = append(want, string(f.ID)+" · "+f.Subject, f.Change)
				}
			}
			for _, f := range r.Figures {
				want = append(want, string(f.ID)+" · "+f.Subject)
			}
			for _, w := range want {
				if !strings.Contains(text, w) {
					t.Errorf("the pack's text lacks %q", w)
				}
			}
			verdict := fmt.Sprintf("NOT APPROVED — %d checks fail", c.Fail)
			if c.Fail > 0 {
				if !strings.Contains(p.pages[0], verdict) {
					t.Errorf("the cover lacks %q: %s", verdict, p.pages[0])
				}
				for i, pg := range p.pages[1:] {
					if !strings.Contains(pg, "NOT APPROVED") {
						t.Errorf("page %d is not marked NOT APPROVED", i+2)
					}
				}
			} else if strings.Contains(text, "NOT APPROVED") {
				t.Errorf("a passing design's pack says NOT APPROVED")
			}
			short := r.Design.InputsHash[:12]
			rev := "rev not in git"
			if len(r.Design.Revision) >= 7 {
				rev = "rev " + r.Design.Revision[:7]
			}
			for i, pg := range p.pages {
				for _, w := range []string{fmt.Sprintf("page %d of %d", i+1, n), r.Design.Name, r.Design.Hull, "inputs " + short, rev} {
					if !strings.Contains(pg, w) {
						t.Errorf("page %d lacks %q in its footer", i+1, w)
					}
				}
			}
			// No placeholder is left unresolved.
			for _, ph := range []string{"{nb}", "{p:"} {
				if strings.Contains(text, ph) {
					t.Errorf("the pack's text has an unresolved %q", ph)
				}
			}
		})
	}
}

// TestPackPageRefs follows every page the packs name, drawn once the
// pages are known (doc.finish), to the page it names: the contents on the
// cover and the references in the text.
func TestPackPageRefs(t *testing.T) {
	t.Parallel()
	refs := []struct {
		re, on string
	}{
		{`Read the cautions on page (\d+) before`, "Cautions"},
		{`see Findings, page (\d+)`, "Findings"},
		{`under Findings, page (\d+)\.`, "Findings"},
		{`on the calculation sheets \(page (\d+)\)`, "Calculation sheets"},
		{`listed in full on page (\d+)\.`, "Sources cited"},
		{`the design voyage on page (\d+) shows`, "Design voyage"},
		{`in the wiring schedule, page (\d+)\.`, "Wiring schedule"},
		{`is under Cautions, page (\d+)\.`, "Cautions"},
	}
	for _, hull := range hulls {
		t.Run(hull, func(t *testing.T) {
			t.Parallel()
			pages := placed(t, render(t, fixture(t, hull), PackOptions{}))
			text := make([]string, len(pages))
			for i, items := range pages {
				text[i] = strings.Join(lines(items), "\n")
				for _, r := range text[i] {
					if isRef(r) {
						t.Fatalf("page %d holds a page reference's marker %U", i+1, r)
					}
				}
			}
			// The contents: a section's title, then its first page, which
			// holds the section's heading (the line of its title alone, or
			// beside the diagram's sheet number), and no page before does.
			heading := func(page int, title string) bool {
				for _, l := range lines(pages[page-1]) {
					if l == title || strings.HasPrefix(l, title+" sheet ") {
						return true
					}
				}
				return false
			}
			cover := lines(pages[0])
			for _, s := range packSections {
				n := 0
				for _, l := range cover {
					if rest, ok := strings.CutPrefix(l, s.title+" "); ok {
						n, _ = strconv.Atoi(rest)
					}
				}
				if n < 2 || n > len(pages) {
					t.Errorf("the contents give %q no page: %q", s.title, cover)
					continue
				}
				if !heading(n, s.title) {
					t.Errorf("the contents put %q on page %d, which lacks its heading: %q", s.title, n, lines(pages[n-1]))
				}
				for before := 2; before < n; before++ {
					if heading(before, s.title) {
						t.Errorf("the contents put %q on page %d, but page %d has its heading", s.title, n, before)
					}
				}
			}
			all := strings.Join(text, "\n")
			found := 0
			for _, ref := range refs {
				for _, m := range regexp.MustCompile(ref.re).FindAllStringSubmatch(strings.ReplaceAll(all, "\n", " "), -1) {
					found++
					n, _ := strconv.Atoi(m[1])
					if n < 1 || n > len(pages) || !strings.Contains(text[n-1], ref.on) {
						t.Errorf("%q names page %d, which lacks %q", m[0], n, ref.on)
					}
				}
			}
			if found < 4 {
				t.Errorf("%d references to pages found, want at least 4", found)
			}
		})
	}
}

func TestPackDeterministic(t *testing.T) {
	t.Parallel()
	r := fixture(t, "marram")
	a := render(t, r, PackOptions{})
	// Another pack between the two: nothing one pack keeps (the fonts'
	// widths, the page references) reaches the next.
	render(t, fixture(t, "brackenwell"), PackOptions{PageSize: "Letter"})
	b := render(t, fixture(t, "marram"), PackOptions{})
	if !bytes.Equal(a, b) {
		t.Fatal("two renders of the same result differ")
	}
	d := time.Date(2031, 5, 6, 7, 8, 9, 0, time.UTC)
	r = fixture(t, "dunnock")
	c := render(t, r, PackOptions{Date: d})
	if bytes.Equal(render(t, r, PackOptions{}), c) {
		t.Error("a different date gives the same bytes")
	}
	p := readPDF(t, c)
	if got := p.info.Key("CreationDate").Text(); !strings.HasPrefix(got, "D:20310506070809") {
		t.Errorf("CreationDate = %q, want the given date", got)
	}
	if !strings.Contains(p.pages[0], "2031-05-06") {
		t.Error("the cover does not show the pack date")
	}
}

func TestPackInputsHash(t *testing.T) {
	t.Parallel()
	r := fixture(t, "dunnock")
	old := r.Design.InputsHash
	a := render(t, r, PackOptions{})
	r.Design.InputsHash = "89abcdef01234567" + old[16:]
	b := render(t, r, PackOptions{})
	if bytes.Equal(a, b) {
		t.Fatal("changing the inputs hash does not change the pack")
	}
	p := readPDF(t, b)
	if !strings.Contains(p.pages[0], r.Design.InputsHash) {
		t.Error("the cover lacks the new inputs hash")
	}
	if strings.Contains(p.all(), old[:12]) {
		t.Error("the old inputs hash is still in the pack")
	}
	for i, pg := range p.pages {
		if !strings.Contains(pg, "inputs 89abcdef0123") {
			t.Errorf("page %d's footer lacks the new short hash", i+1)
		}
	}
}

func TestPackPaper(t *testing.T) {
	t.Parallel()
	r := fixture(t, "dunnock")
	a4 := readPDF(t, render(t, r, PackOptions{PageSize: "A4"}))
	letter := readPDF(t, render(t, r, PackOptions{PageSize: "Letter"}))
	if got, want := a4.boxes[0], "[0 0 595.28 841.89]"; got != want {
		t.Errorf("A4 media box %s, want %s", got, want)
	}
	if got, want := letter.boxes[0], "[0 0 612 792]"; got != want {
		t.Errorf("Letter media box %s, want %s", got, want)
	}
	landscape := 0
	for i, pg := range a4.pages {
		if a4.boxes[i] == "[0 0 841.89 595.28]" {
			landscape++
			if !strings.Contains(pg, "One-line diagram") {
				t.Errorf("page %d is landscape but not the one-line diagram", i+1)
			}
		}
	}
	if landscape == 0 {
		t.Error("the one-line diagram is not on a landscape page")
	}
	if err := Pack(&bytes.Buffer{}, r, PackOptions{PageSize: "A3"}); err == nil {
		t.Error("page size A3 accepted")
	}
}

func TestPackRevision(t *testing.T) {
	t.Parallel()
	r := fixture(t, "dunnock")
	r.Design.Dirty = true
	p := readPDF(t, render(t, r, PackOptions{}))
	if !strings.Contains(p.pages[0], "uncommitted changes") {
		t.Error("a dirty revision is not marked on the cover")
	}
	if !strings.Contains(p.pages[1], "+uncommitted") {
		t.Error("a dirty revision is not marked in the footer")
	}
	r.Design.Revision, r.Design.Dirty, r.Design.CommitTime = "", false, 0
	p = readPDF(t, render(t, r, PackOptions{}))
	if !strings.Contains(p.pages[0], "not in git") {
		t.Error("a design outside git is not marked so")
	}
	if !strings.Contains(p.pages[0], "not dated") {
		t.Error("a pack with no date and no commit time does not say it is undated")
	}
	if got := p.info.Key("CreationDate").Text(); !strings.HasPrefix(got, "D:20000101000000") {
		t.Errorf("CreationDate = %q, want PackEpoch", got)
	}
}

func TestPackRefusesProblems(t *testing.T) {
	r := &result.Result{Problems: []result.Problem{{Message: "broken"}}}
	if err := Pack(&bytes.Buffer{}, r, PackOptions{}); err == nil {
		t.Error("a result with input errors made a pack")
	}
}

// TestPackLarge draws a design far larger than the examples, with long
// names and text the fonts cannot show: the wiring schedule breaks across
// pages with its header repeated and the one-line diagram continues on
// further pages.
func TestPackLarge(t *testing.T) {
	t.Parallel()
	r := fixture(t, "marram")
	base := r.Wiring
	long := strings.Repeat("very-long-conductor-name-", 4)
	for i := 0; i < 90; i++ {
		w := base[len(base)-1]
		w.Name = fmt.Sprintf("extra-%02d", i)
		w.From = "dc-panel"
		if i%3 != 0 {
			w.From = fmt.Sprintf("load-%02d", i-1)
		}
		w.To = fmt.Sprintf("load-%02d", i)
		if i == 7 {
			w.To = long + "\x07 \U0001F6A2 end"
		}
		r.Wiring = append(r.Wiring, w)
	}
	r.Design.Name = "A vessel whose name is much too long for any one line of the cover page, to see it is cut short"
	p := readPDF(t, render(t, r, PackOptions{}))
	heads := 0
	diagram := 0
	for i, pg := range p.pages {
		if strings.Contains(pg, "run from → to role") {
			heads++
		}
		if strings.Contains(pg, "One-line diagram") && p.boxes[i] == "[0 0 841.89 595.28]" {
			diagram++
		}
	}
	if heads < 2 {
		t.Errorf("the wiring schedule's header appears on %d pages, want it repeated", heads)
	}
	if diagram < 2 {
		t.Errorf("the one-line diagram takes %d pages, want it to continue", diagram)
	}
	if len(p.pages) > 120 {
		t.Errorf("%d pages", len(p.pages))
	}
}

func TestPackBOMIncomplete(t *testing.T) {
	t.Parallel()
	r := fixture(t, "dunnock")
	if r.BOM == nil || len(r.BOM.Lines) < 2 {
		t.Fatal("the fixture has no bill of materials")
	}
	for i := range 2 {
		r.BOM.Lines[i].UnitPrice, r.BOM.Lines[i].Total = nil, nil
	}
	r.BOM.Complete = false
	text := readPDF(t, render(t, r, PackOptions{})).all()
	if !strings.Contains(text, "Total incomplete: 2 lines without a price") {
		t.Error("an incomplete total is not marked so")
	}
}

// TestPackHistory: the cover lists the commits that touched the design's
// inputs, at most historyRows of them and a count of the rest, and says
// when there are none.
func TestPackHistory(t *testing.T) {
	t.Parallel()
	r := fixture(t, "dunnock")
	h := result.History{Since: "v2.1"}
	for i := 0; i < historyRows+2; i++ {
		h.Commits = append(h.Commits, result.Commit{Commit: strings.Repeat(string(rune('a'+i)), 40), Time: 1796000000 + int64(i), Author: "Tamsin Rowe", Subject: "change " + string(rune('A'+i))})
	}
	p := readPDF(t, render(t, r, PackOptions{History: h}))
	cover := p.pages[0]
	for _, want := range []string{"since v2.1", "change A", "Tamsin Rowe", "aaaaaaaa", "… and 2 more"} {
		if !strings.Contains(cover, want) {
			t.Errorf("the cover lacks %q:\n%s", want, cover)
		}
	}
	if strings.Contains(cover, "change "+string(rune('A'+historyRows))) {
		t.Errorf("the cover lists more than %d commits", historyRows)
	}
	p = readPDF(t, render(t, r, PackOptions{History: result.History{Since: "v2.1"}}))
	if !strings.Contains(p.pages[0], "no commit since v2.1 touched") {
		t.Errorf("a history with no commit is not said so:\n%s", p.pages[0])
	}
}

// TestPackPagesFilled: no page of an example's pack holds less than a
// third of its body unless it is the last page of its section (issue 15),
// and then only where the next section turns the paper (the landscape
// diagram): a short section follows the one before on its page.
func TestPackPagesFilled(t *testing.T) {
	t.Parallel()
	for _, hull := range []string{"dunnock", "marram", "brackenwell", "tystie", "sanderling"} {
		for _, paper := range []string{"A4", "Letter"} {
			p, err := drawPack(fixture(t, hull), PackOptions{PageSize: paper})
			if err != nil {
				t.Fatal(err)
			}
			pages := p.layout.pages
			if len(pages) != p.d.page() {
				t.Fatalf("%s: %d pages recorded of %d", hull, len(pages), p.d.page())
			}
			for i, u := range pages {
				if u.filled() >= 1.0/3 || i == len(pages)-1 {
					continue
				}
				last := u.sections[len(u.sections)-1]
				if contains(pages[i+1].sections, last) {
					t.Errorf("%s (%s): page %d holds %.0f %% of a page and section %q goes on to page %d", hull, paper, i+1, 100*u.filled(), last, i+2)
				}
				// Stricter than the rule: the next section does not
				// follow on the page only where it turns the paper.
				if pages[i+1].landscape == u.landscape {
					t.Errorf("%s (%s): page %d holds %.0f %% of a page, and the section after it starts a page of its own", hull, paper, i+1, 100*u.filled())
				}
			}
		}
	}
}

func contains(list []string, s string) bool {
	for _, x := range list {
		if x == s {
			return true
		}
	}
	return false
}

// BenchmarkPack draws the packs of two example hulls, and of the result
// in the file AMPWRIGHT_BENCH_RESULT names when it is set (a larger hull:
// `ampwright check --format json` of a hull of cmd/yardgen's yard), to
// follow the time and allocations a pack costs:
//
//	go test ./report -run xxx -bench Pack -benchmem
func BenchmarkPack(b *testing.B) {
	files := []string{filepath.Join("testdata", "dunnock.json"), filepath.Join("testdata", "marram.json")}
	if f := os.Getenv("AMPWRIGHT_BENCH_RESULT"); f != "" {
		files = append(files, f)
	}
	for _, file := range files {
		b.Run(strings.TrimSuffix(filepath.Base(file), ".json"), func(b *testing.B) {
			bs, err := os.ReadFile(file)
			if err != nil {
				b.Fatal(err)
			}
			var r result.Result
			if err := json.Unmarshal(bs, &r); err != nil {
				b.Fatal(err)
			}
			var out bytes.Buffer
			b.ReportAllocs()
			for b.Loop() {
				out.Reset()
				if err := Pack(&out, &r, PackOptions{}); err != nil {
					b.Fatal(err)
				}
			}
			b.ReportMetric(float64(out.Len()), "bytes/pack")
		})
	}
}
