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
	// fleet and diff compile many designs and keep Go's default, which
	// measured faster there and keeps a fleet under 100 MiB. GOGC in the
	// environment still wins.
	if len(os.Args) > 1 && os.Args[1] != "fleet" && os.Args[1] != "diff" && os.Getenv("GOGC") == "" {
		debug.SetGCPercent(400)
	}
	os.Exit(Main())
}
