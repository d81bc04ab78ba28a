package cache

import (
	"bytes"
	"compress/gzip"
	"crypto/sha256"
	"errors"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"runtime"
	"strings"
	"sync"
	"testing"
	"time"
)

const key = "0123456789abcdef0123456789abcdef0123456789abcdef0123456789abcdef"

func open(t *testing.T, dir string) (*Cache, *[]error) {
	t.Helper()
	var warned []error
	var mu sync.Mutex
	return Open(dir, "test-tool v1", func(err error) {
		mu.Lock()
		defer mu.Unlock()
		warned = append(warned, err)
	}), &warned
}

func TestPutGet(t *testing.T) {
	c, warned := open(t, t.TempDir())
	if _, ok := c.Get(key, "result"); ok {
		t.Fatal("an empty cache has an entry")
	}
	data := []byte(`{"version":"x","figures":[1,2,3]}`)
	c.Put(key, "result", data)
	got, ok := c.Get(key, "result")
	if !ok || !bytes.Equal(got, data) {
		t.Fatalf("Get = %q, %v; want %q", got, ok, data)
	}
	if _, ok := c.Get(key, "line"); ok {
		t.Error("another kind of the same key has an entry")
	}
	// An entry larger than any buffer, that does not compress.
	big := make([]byte, 1<<20)
	for i := range big {
		big[i] = byte(i*7919>>3 ^ i>>11)
	}
	big = []byte(fmt.Sprintf("%x", sha256.Sum256(big))) // seed
	for len(big) < 1<<20 {
		s := sha256.Sum256(big[len(big)-64:])
		big = append(big, fmt.Sprintf("%x", s)...)
	}
	c.Put(key, "big", big)
	if got, ok := c.Get(key, "big"); !ok || !bytes.Equal(got, big) {
		t.Errorf("a large entry: %v", ok)
	}
	other := Open(c.Dir(), "test-tool v2", nil)
	if _, ok := other.Get(key, "result"); ok {
		t.Error("another version of the tool reads the entry")
	}
	if len(*warned) > 0 {
		t.Errorf("warnings: %v", *warned)
	}
	var off *Cache
	off.Put(key, "result", data)
	if _, ok := off.Get(key, "result"); ok || off.On() {
		t.Error("a nil cache is on")
	}
}

// TestBadEntriesIgnored: an entry that is truncated, corrupt, of another
// tool, key or kind, or of the wrong size is not trusted, and the next Put
// rewrites it.
func TestBadEntriesIgnored(t *testing.T) {
	dir := t.TempDir()
	c, warned := open(t, dir)
	data := bytes.Repeat([]byte(`{"a":"value"}`), 100)
	entry := func() string { return c.path(c.name(key, "result")) }
	// An entry for another key, to copy in place of this one.
	const other = "fedcba9876543210fedcba9876543210fedcba9876543210fedcba9876543210"
	c.Put(other, "result", data)
	foreign, err := os.ReadFile(c.path(c.name(other, "result")))
	if err != nil {
		t.Fatal(err)
	}
	gz := func(b []byte) []byte {
		var z bytes.Buffer
		w := gzip.NewWriter(&z)
		w.Write(b)
		w.Close()
		return z.Bytes()
	}
	withHeader := func(tool, k, kind string, payload []byte, size int) []byte {
		return []byte(fmt.Sprintf("%s\ntool %s\nkey %s\nkind %s\nsize %d\nsha256 %x\n\n%s", magic, tool, k, kind, size, sha256.Sum256(payload), payload))
	}
	good := gz(data)
	notGzip := []byte("this is not gzip")
	for _, tc := range []struct {
		name string
		make func(valid []byte) []byte
	}{
		{"empty", func([]byte) []byte { return nil }},
		{"truncated", func(v []byte) []byte { return v[:len(v)-10] }},
		{"header only", func(v []byte) []byte { return v[:bytes.Index(v, []byte("\n\n"))+2] }},
		{"a flipped byte", func(v []byte) []byte {
			b := bytes.Clone(v)
			b[len(b)-5] ^= 1
			return b
		}},
		{"trailing bytes", func(v []byte) []byte { return append(bytes.Clone(v), "more"...) }},
		{"another key's entry", func([]byte) []byte { return foreign }},
		{"another tool", func([]byte) []byte { return withHeader("test-tool v0", key, "result", good, len(good)) }},
		{"another kind", func([]byte) []byte { return withHeader("test-tool v1", key, "line", good, len(good)) }},
		{"the wrong size", func([]byte) []byte { return withHeader("test-tool v1", key, "result", good, len(good)+1) }},
		{"not gzip, checksum right", func([]byte) []byte { return withHeader("test-tool v1", key, "result", notGzip, len(notGzip)) }},
		{"garbage", func([]byte) []byte { return []byte("\x00\x01\x02garbage\n\n\n") }},
	} {
		t.Run(tc.name, func(t *testing.T) {
			c.Put(key, "result", data)
			valid, err := os.ReadFile(entry())
			if err != nil {
				t.Fatal(err)
			}
			if err := os.WriteFile(entry(), tc.make(valid), 0o644); err != nil {
				t.Fatal(err)
			}
			if got, ok := c.Get(key, "result"); ok {
				t.Fatalf("a bad entry was trusted: %.80q", got)
			}
			c.Put(key, "result", data)
			if got, ok := c.Get(key, "result"); !ok || !bytes.Equal(got, data) {
				t.Fatalf("after Put: %v", ok)
			}
		})
	}
	if len(*warned) > 0 {
		t.Errorf("warnings: %v", *warned)
	}
}

// TestUnwritable: a cache that cannot be written warns once and goes on
// without it.
func TestUnwritable(t *testing.T) {
	// A file where the directory should be: root can write anywhere else.
	dir := filepath.Join(t.TempDir(), "file")
	if err := os.WriteFile(dir, []byte("not a directory"), 0o644); err != nil {
		t.Fatal(err)
	}
	c, warned := open(t, dir)
	for i := 0; i < 3; i++ {
		c.Put(key, "result", []byte("x"))
		if _, ok := c.Get(key, "result"); ok {
			t.Fatal("an unwritable cache has an entry")
		}
	}
	if len(*warned) != 1 {
		t.Fatalf("%d warnings, want 1: %v", len(*warned), *warned)
	}
	if c.On() {
		t.Error("the cache is still on after an error")
	}
}

// TestConcurrentWriters: goroutines and processes writing and reading the
// same entries at once only ever read a whole entry, and leave no
// temporary file.
func TestConcurrentWriters(t *testing.T) {
	if dir := os.Getenv("AMPWRIGHT_CACHE_WRITER"); dir != "" {
		// A writer process: write and read the entries for a while.
		c := Open(dir, "test-tool v1", func(err error) { fmt.Println("warning:", err); os.Exit(1) })
		if err := hammer(c, 200); err != nil {
			fmt.Println(err)
			os.Exit(1)
		}
		os.Exit(0)
	}
	dir := t.TempDir()
	exe, err := os.Executable()
	if err != nil {
		t.Fatal(err)
	}
	var procs []*exec.Cmd
	var outs []*bytes.Buffer
	for i := 0; i < 3; i++ {
		cmd := exec.Command(exe, "-test.run=^TestConcurrentWriters$")
		cmd.Env = append(os.Environ(), "AMPWRIGHT_CACHE_WRITER="+dir)
		var out bytes.Buffer
		cmd.Stdout, cmd.Stderr = &out, &out
		if err := cmd.Start(); err != nil {
			t.Fatal(err)
		}
		procs, outs = append(procs, cmd), append(outs, &out)
	}
	c, warned := open(t, dir)
	var wg sync.WaitGroup
	errs := make(chan error, 4)
	for g := 0; g < 4; g++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			errs <- hammer(c, 200)
		}()
	}
	wg.Wait()
	close(errs)
	for err := range errs {
		if err != nil {
			t.Error(err)
		}
	}
	for i, p := range procs {
		if err := p.Wait(); err != nil {
			t.Errorf("writer process %d: %v\n%s", i, err, outs[i])
		}
	}
	if len(*warned) > 0 {
		t.Errorf("warnings: %v", *warned)
	}
	for k := 0; k < 8; k++ {
		if got, ok := c.Get(hammerKey(k), "result"); !ok || !bytes.Equal(got, hammerData(k)) {
			t.Errorf("entry %d after the writers: %v", k, ok)
		}
	}
	filepath.WalkDir(dir, func(p string, d os.DirEntry, err error) error {
		if err == nil && strings.HasPrefix(d.Name(), ".tmp-") {
			t.Errorf("a temporary file is left: %s", p)
		}
		return nil
	})
}

func hammerKey(k int) string { return fmt.Sprintf("%064x", k) }

func hammerData(k int) []byte {
	return bytes.Repeat([]byte(fmt.Sprintf(`{"entry":%d,"pad":"%s"}`, k, strings.Repeat("x", k*100))), 200)
}

// hammer writes and reads eight entries n times; every read must be
// either a miss or the whole entry.
func hammer(c *Cache, n int) error {
	for i := 0; i < n; i++ {
		k := i % 8
		c.Put(hammerKey(k), "result", hammerData(k))
		if got, ok := c.Get(hammerKey((i+3)%8), "result"); ok && !bytes.Equal(got, hammerData((i+3)%8)) {
			return errors.New("read part of an entry, or another entry")
		}
	}
	return nil
}

func TestTrim(t *testing.T) {
	dir := t.TempDir()
	c, _ := open(t, dir)
	c.Put(key, "old", []byte("old"))
	c.Put(key, "new", []byte("new"))
	old := c.path(c.name(key, "old"))
	long := time.Now().Add(-60 * 24 * time.Hour)
	os.Chtimes(old, long, long)
	tmp := filepath.Join(filepath.Dir(old), ".tmp-left-behind")
	os.WriteFile(tmp, []byte("x"), 0o644)
	os.Chtimes(tmp, long, long)
	c.Trim(30 * 24 * time.Hour)
	if _, err := os.Stat(old); err == nil {
		t.Error("an entry unused for 60 days was kept")
	}
	if _, err := os.Stat(tmp); err == nil {
		t.Error("an old temporary file was kept")
	}
	if _, ok := c.Get(key, "new"); !ok {
		t.Error("a new entry was trimmed")
	}
}

func TestBuildID(t *testing.T) {
	if runtime.GOOS != "linux" {
		t.Skip("the ELF note is read on Linux")
	}
	exe, _ := os.Executable()
	if id := goBuildID(exe); id == "" || !strings.Contains(id, "/") {
		t.Errorf("the test binary's build ID is %q", id)
	}
	if tool := Tool("v1"); !strings.HasPrefix(tool, "v1 go:") {
		t.Errorf("Tool = %q", tool)
	}
}
