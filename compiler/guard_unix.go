//go:build unix

package compiler

import "syscall"

// openNonblock keeps opening a FIFO from waiting for a writer: the open
// file is then found not to be a regular file and refused.
const openNonblock = syscall.O_NONBLOCK
