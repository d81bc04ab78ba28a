// Package cache keeps ampwright's compiled results between runs: a
// directory of entries, each named by a key of everything its result
// depends on (the tool, the schema, every input file of the hull), so that
// a hull whose inputs have not changed is not compiled again.
//
// An entry is trusted only after it is checked: it carries the tool and the
// key it was written for, the size and the SHA-256 of its payload, and one
// that is truncated, corrupt or written by another version is ignored (and
// rewritten by the caller). Entries are written to a temporary file in
// their own directory and renamed into place, so that concurrent runs,
// processes or workers never see half an entry.
//
// The cache never fails a command: the first error (a directory that
// cannot be written) is reported once through the Cache's warn function,
// and the Cache is off from then on. A nil *Cache is off.
//
// It uses only the standard library.
package cache

import (
	"bytes"
	"compress/gzip"
	"crypto/sha256"
	"debug/elf"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"sync"
	"sync/atomic"
	"time"
)

// magic is the first line of every entry; it changes with the format.
const magic = "ampwright result cache 1"

// maxData bounds an entry's payload once uncompressed: a result is a few
// hundred kilobytes.
const maxData = 256 << 20

// gzips are compressors to reuse: each holds some hundreds of kilobytes of
// tables, and a fleet's worker writes an entry for every hull.
var gzips = sync.Pool{New: func() any {
	zw, _ := gzip.NewWriterLevel(nil, gzip.BestSpeed)
	return zw
}}

// Cache is a directory of entries. It is safe for concurrent use.
type Cache struct {
	dir  string
	tool string
	warn func(error)
	once sync.Once
	off  atomic.Bool
}

// Open returns the cache in dir for the tool named by tool (Tool), which
// reports its first error through warn. Nothing is read or written yet.
func Open(dir, tool string, warn func(error)) *Cache {
	return &Cache{dir: dir, tool: tool, warn: warn}
}

// Dir is the cache's directory, "" for a nil Cache.
func (c *Cache) Dir() string {
	if c == nil {
		return ""
	}
	return c.dir
}

// On reports whether the cache is in use: not nil, and no error yet.
func (c *Cache) On() bool { return c != nil && !c.off.Load() }

// Fail reports err, the first time only, and turns the cache off: the
// command goes on without it.
func (c *Cache) Fail(err error) {
	if c == nil {
		return
	}
	c.off.Store(true)
	c.once.Do(func() {
		if c.warn != nil {
			c.warn(err)
		}
	})
}

// name is the file name of the entry for key and kind.
func (c *Cache) name(key, kind string) string {
	sum := sha256.Sum256([]byte(c.tool + "\x00" + key + "\x00" + kind))
	return hex.EncodeToString(sum[:])
}

func (c *Cache) path(name string) string {
	return filepath.Join(c.dir, name[:2], name)
}

// Get returns the data stored for key and kind, or false when there is no
// entry, or one that does not check out.
func (c *Cache) Get(key, kind string) ([]byte, bool) {
	if !c.On() {
		return nil, false
	}
	p := c.path(c.name(key, kind))
	// Only a regular file the size an entry can be is read: the cache's
	// directory is the user's, but a mistake should not hang (a FIFO) or
	// flood.
	if fi, err := os.Lstat(p); err != nil || !fi.Mode().IsRegular() {
		return nil, false
	}
	f, err := os.Open(p)
	if err != nil {
		return nil, false
	}
	defer f.Close()
	fi, err := f.Stat()
	if err != nil || !fi.Mode().IsRegular() || fi.Size() > maxData {
		return nil, false
	}
	raw := make([]byte, fi.Size())
	if _, err := io.ReadFull(f, raw); err != nil {
		return nil, false
	}
	data, err := c.decode(raw, key, kind)
	if err != nil {
		return nil, false
	}
	touch(p, fi)
	return data, true
}

// Put stores data for key and kind, replacing any entry there.
func (c *Cache) Put(key, kind string, data []byte) {
	if !c.On() {
		return
	}
	if strings.ContainsAny(key+kind, "\n") {
		return
	}
	if err := c.put(c.name(key, kind), key, kind, data); err != nil {
		c.Fail(err)
	}
}

func (c *Cache) put(name, key, kind string, data []byte) error {
	var payload bytes.Buffer
	zw := gzips.Get().(*gzip.Writer)
	defer gzips.Put(zw)
	zw.Reset(&payload)
	zw.Write(data)
	if err := zw.Close(); err != nil {
		return err
	}
	sum := sha256.Sum256(payload.Bytes())
	var entry bytes.Buffer
	fmt.Fprintf(&entry, "%s\ntool %s\nkey %s\nkind %s\nsize %d\nsha256 %x\n\n", magic, c.tool, key, kind, payload.Len(), sum)
	entry.Write(payload.Bytes())

	dir := filepath.Dir(c.path(name))
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return err
	}
	c.tag()
	f, err := os.CreateTemp(dir, ".tmp-"+name[:16]+"-")
	if err != nil {
		return err
	}
	_, err = f.Write(entry.Bytes())
	if err == nil {
		// Readable as any cache file is, not only by its writer.
		err = f.Chmod(0o644)
	}
	if cerr := f.Close(); err == nil {
		err = cerr
	}
	if err == nil {
		err = os.Rename(f.Name(), c.path(name))
	}
	if err != nil {
		os.Remove(f.Name())
	}
	return err
}

// decode checks an entry read from disk and returns its data.
func (c *Cache) decode(raw []byte, key, kind string) ([]byte, error) {
	rest := raw
	line := func() (string, bool) {
		i := bytes.IndexByte(rest, '\n')
		if i < 0 {
			return "", false
		}
		l := string(rest[:i])
		rest = rest[i+1:]
		return l, true
	}
	for _, want := range []string{magic, "tool " + c.tool, "key " + key, "kind " + kind} {
		if l, ok := line(); !ok || l != want {
			return nil, errors.New("a foreign entry")
		}
	}
	var size int
	var sum []byte
	for _, field := range []string{"size ", "sha256 "} {
		l, ok := line()
		v, found := strings.CutPrefix(l, field)
		if !ok || !found {
			return nil, errors.New("a bad header")
		}
		var err error
		if field == "size " {
			size, err = strconv.Atoi(v)
		} else {
			sum, err = hex.DecodeString(v)
		}
		if err != nil {
			return nil, errors.New("a bad header")
		}
	}
	if l, ok := line(); !ok || l != "" {
		return nil, errors.New("a bad header")
	}
	payload := rest
	if len(payload) != size {
		return nil, errors.New("the wrong size")
	}
	if got := sha256.Sum256(payload); !bytes.Equal(got[:], sum) {
		return nil, errors.New("the wrong checksum")
	}
	zr, err := gzip.NewReader(bytes.NewReader(payload))
	if err != nil {
		return nil, err
	}
	data, err := io.ReadAll(io.LimitReader(zr, maxData+1))
	if err != nil || len(data) > maxData {
		return nil, errors.New("a bad payload")
	}
	return data, nil
}

// touch marks an entry used, at most once an hour, so that Trim keeps it.
func touch(p string, fi os.FileInfo) {
	if now := time.Now(); now.Sub(fi.ModTime()) > time.Hour {
		os.Chtimes(p, now, now)
	}
}

// tagged is whether this process has written the cache's CACHEDIR.TAG.
var tagged sync.Map // directory → true

// tag marks the directory as a cache (https://bford.info/cachedir/), so
// that backup tools leave it out.
func (c *Cache) tag() {
	if _, done := tagged.LoadOrStore(c.dir, true); done {
		return
	}
	p := filepath.Join(c.dir, "CACHEDIR.TAG")
	if _, err := os.Stat(p); err == nil {
		return
	}
	os.WriteFile(p, []byte("Signature: 8a477f597d28d172789f06886806bc55\n# This directory is ampwright's result cache: it may be removed at any time.\n"), 0o644)
}

// DefaultDir is the cache's directory when none is given: ampwright in the
// user's cache directory (os.UserCacheDir).
func DefaultDir() (string, error) {
	d, err := os.UserCacheDir()
	if err != nil {
		return "", err
	}
	return filepath.Join(d, "ampwright"), nil
}

// Tool names this build of a tool for the cache: version (the result
// contract's) and the executable's Go build ID, which changes with any
// change to the code it was built from, committed or not. Without a build
// ID the executable itself is hashed.
func Tool(version string) string {
	return version + " " + buildID()
}

var buildID = sync.OnceValue(func() string {
	exe, err := os.Executable()
	if err != nil {
		return "unknown"
	}
	if id := goBuildID(exe); id != "" {
		return "go:" + id
	}
	f, err := os.Open(exe)
	if err != nil {
		return "unknown"
	}
	defer f.Close()
	h := sha256.New()
	if _, err := io.Copy(h, f); err != nil {
		return "unknown"
	}
	return fmt.Sprintf("sha256:%x", h.Sum(nil))
})

// goBuildID reads the Go build ID of an executable: the ELF note, or the
// string the linker puts at the start of the text elsewhere.
func goBuildID(exe string) string {
	if f, err := elf.Open(exe); err == nil {
		defer f.Close()
		if s := f.Section(".note.go.buildid"); s != nil {
			if b, err := s.Data(); err == nil && len(b) > 16 {
				desc := b[16:]
				if n := int(f.ByteOrder.Uint32(b[4:8])); n <= len(desc) {
					return string(desc[:n])
				}
			}
		}
		return ""
	}
	f, err := os.Open(exe)
	if err != nil {
		return ""
	}
	defer f.Close()
	head := make([]byte, 64<<10)
	n, _ := io.ReadFull(f, head)
	head = head[:n]
	const prefix = "\xff Go build ID: \""
	i := bytes.Index(head, []byte(prefix))
	if i < 0 {
		return ""
	}
	rest := head[i+len(prefix):]
	j := bytes.IndexByte(rest, '"')
	if j < 0 {
		return ""
	}
	return string(rest[:j])
}

// Trim removes the entries not used for maxAge, and temporary files left
// by a run that ended half way, at most once a day: the cache of a yard's
// CI grows with every change otherwise. Errors are ignored.
func (c *Cache) Trim(maxAge time.Duration) {
	if !c.On() {
		return
	}
	stamp := filepath.Join(c.dir, "trim.txt")
	now := time.Now()
	if fi, err := os.Stat(stamp); err == nil && now.Sub(fi.ModTime()) < 24*time.Hour {
		return
	}
	if _, err := os.Stat(c.dir); err != nil {
		return
	}
	os.WriteFile(stamp, []byte(now.UTC().Format(time.RFC3339)+"\n"), 0o644)
	shards, err := os.ReadDir(c.dir)
	if err != nil {
		return
	}
	for _, s := range shards {
		if !s.IsDir() || len(s.Name()) != 2 {
			continue
		}
		dir := filepath.Join(c.dir, s.Name())
		entries, err := os.ReadDir(dir)
		if err != nil {
			continue
		}
		for _, e := range entries {
			fi, err := e.Info()
			if err != nil || !fi.Mode().IsRegular() {
				continue
			}
			age := now.Sub(fi.ModTime())
			if age > maxAge || strings.HasPrefix(e.Name(), ".tmp-") && age > time.Hour {
				os.Remove(filepath.Join(dir, e.Name()))
			}
		}
	}
}
