// Command ampwright checks the DC electrical and solar-charging design of a
// boat, written in CUE, and reports what it finds.
//
// Run `ampwright help` for the commands.
package main

import (
	"os"
	"runtime/debug"
)

func main() {
	// One design's run is short and its heap is mostly CUE's, built once
	// and read: collecting less often saves about a tenth of a check.
	// A worker compiles many designs and keeps Go's default, which
	// measured faster there. GOGC in the environment still wins; the
	// --max-memory bound sets a soft memory limit either way.
	if len(os.Args) > 1 && os.Args[1] != "fleet" && os.Args[1] != "diff" && os.Args[1] != "worker" && os.Getenv("GOGC") == "" {
		debug.SetGCPercent(400)
	}
	os.Exit(Main())
}
