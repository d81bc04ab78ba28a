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
	// A run is short and its heap is mostly CUE's, built once and read:
	// collect seldom, but keep a fleet's heap under its memory target.
	// GOGC and GOMEMLIMIT in the environment still win.
	if os.Getenv("GOGC") == "" {
		debug.SetGCPercent(400)
	}
	if os.Getenv("GOMEMLIMIT") == "" {
		debug.SetMemoryLimit(80 << 20)
	}
	os.Exit(Main())
}
