// Command ampwright checks the DC electrical and solar-charging design of a
// boat, written in CUE, and reports what it finds.
//
// Run `ampwright help` for the commands.
package main

import "os"

func main() { os.Exit(Main()) }
