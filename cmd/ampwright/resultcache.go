package main

import (
	"fmt"
	"io"
	"os"
	"strings"
	"time"
	"unicode/utf8"

	"github.com/spf13/cobra"

	"github.com/ampwright/ampwright/cache"
	"github.com/ampwright/ampwright/report"
	"github.com/ampwright/ampwright/result"
)

// The result cache (package cache): check, fleet and diff keep what they
// compile there, keyed by the tool, the schema and every input file of a
// hull, and compile only the hulls they do not find.
const (
	flagResultCache = "result-cache"
	// envResultCache names the cache's directory when the flag does not.
	envResultCache = "AMPWRIGHT_RESULT_CACHE"
	// cacheOff, as the flag's or the variable's value, turns the cache off.
	cacheOff = "off"
	// cacheMaxAge is how long an entry no run has used is kept.
	cacheMaxAge = 30 * 24 * time.Hour
)

// cacheFlag adds --result-cache to a command that compiles hulls.
func cacheFlag(c *cobra.Command, target *string) {
	c.Flags().StringVar(target, flagResultCache, "", "the result cache's directory, or \""+cacheOff+"\" (default $"+envResultCache+", else ampwright in the user's cache directory)")
	_ = c.MarkFlagDirname(flagResultCache)
}

// cacheDir is the directory a --result-cache setting names, "" when the
// cache is off.
func cacheDir(setting string) (string, error) {
	if setting == "" {
		setting = os.Getenv(envResultCache)
	}
	switch setting {
	case cacheOff:
		return "", nil
	case "":
		return cache.DefaultDir()
	}
	return setting, nil
}

// openCache opens the result cache for a command, nil when it is off. A
// cache that cannot be used is reported once on stderr, and the command
// goes on without it.
func openCache(setting string, stderr io.Writer) *cache.Cache {
	dir, err := cacheDir(setting)
	warn := func(err error) {
		report.Printf(stderr, "ampwright: warning: the result cache %s cannot be used (%v); going on without it\n", dir, err)
	}
	if err != nil {
		dir = "(no directory)"
		warn(err)
		return nil
	}
	if dir == "" {
		return nil
	}
	c := cache.Open(dir, cache.Tool(result.Version), warn)
	c.Trim(cacheMaxAge)
	return c
}

// workerCacheArg is the worker's --result-cache: the command's directory,
// or off.
func workerCacheArg(c *cache.Cache) string {
	if !c.On() {
		return cacheOff
	}
	return c.Dir()
}

// cacheHelp is the paragraph on the result cache in the help of the
// commands that use it; what says what is kept.
func cacheHelp(what string) string {
	return wrap(fmt.Sprintf("%s is kept in a result cache, keyed by this build of ampwright, the schema and every input file of a hull (its files and everything it imports), so that a hull whose inputs have not changed is not compiled again; git's facts (the revision, whether the hull's files are committed) are asked afresh every time. The cache is ampwright in the user's cache directory (such as ~/.cache/ampwright), or --%s DIR (or $%s); --%s %s turns it off. An entry that does not check out is ignored and written again; a cache that cannot be written is reported once and the command goes on without it. Remove the directory to clear it.",
		what, flagResultCache, envResultCache, flagResultCache, cacheOff), 76)
}

// wrap breaks text into lines of at most width columns, between words.
func wrap(text string, width int) string {
	var b strings.Builder
	col := 0
	for _, w := range strings.Fields(text) {
		n := utf8.RuneCountInString(w)
		switch {
		case col == 0:
		case col+1+n > width:
			b.WriteByte('\n')
			col = 0
		default:
			b.WriteByte(' ')
			col++
		}
		b.WriteString(w)
		col += n
	}
	return b.String()
}
