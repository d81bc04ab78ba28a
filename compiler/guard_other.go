//go:build !unix

package compiler

// openNonblock is not needed where there are no FIFOs to open.
const openNonblock = 0
