package yard

import (
	"encoding/json"
	"os"
	"path/filepath"
	"testing"

	"github.com/ampwright/ampwright/cache"
)

// TestFleetCached: a fleet compiled in this process, several hulls at
// once, gives the same lines with the cache off, cold and warm, and the
// warm run writes no entry; whole results kept for packs too.
func TestFleetCached(t *testing.T) {
	const yard = "../designs"
	hulls, err := Hulls(yard, nil)
	if err != nil {
		t.Fatal(err)
	}
	keep := func(h string) bool { return h == "hulls/tystie" }
	fleet := func(ch *cache.Cache) string {
		lines, kept := Fleet(yard, hulls, Options{Cache: ch, Parallel: 4, Keep: keep})
		b, err := json.Marshal(struct {
			Lines any
			Kept  any
		}{lines, kept})
		if err != nil {
			t.Fatal(err)
		}
		return string(b)
	}
	want := fleet(nil)
	dir := t.TempDir()
	ch := cache.Open(dir, "test", func(err error) { t.Errorf("cache: %v", err) })
	if got := fleet(ch); got != want {
		t.Fatalf("cold: %.300s\nwant %.300s", got, want)
	}
	written := map[string]os.FileInfo{}
	filepath.Walk(dir, func(p string, fi os.FileInfo, err error) error {
		if err == nil && !fi.IsDir() {
			written[p] = fi
		}
		return err
	})
	if len(written) < 2*len(hulls) {
		t.Fatalf("%d files in the cache after a fleet of %d hulls", len(written), len(hulls))
	}
	if got := fleet(ch); got != want {
		t.Fatalf("warm: %.300s\nwant %.300s", got, want)
	}
	filepath.Walk(dir, func(p string, fi os.FileInfo, err error) error {
		if err == nil && !fi.IsDir() {
			if was, ok := written[p]; !ok || !os.SameFile(was, fi) {
				t.Errorf("the warm fleet wrote %s", p)
			}
		}
		return err
	})
}
