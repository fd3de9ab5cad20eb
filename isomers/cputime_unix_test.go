//go:build unix

package isomers

import (
	"syscall"
	"time"
)

// processCPU returns the CPU time used by the process so far (user +
// system), so that benchmarks can report a rate that does not depend on
// how busy a shared machine is; ok is false where it is unavailable.
func processCPU() (d time.Duration, ok bool) {
	var ru syscall.Rusage
	if err := syscall.Getrusage(syscall.RUSAGE_SELF, &ru); err != nil {
		return 0, false
	}
	return time.Duration(ru.Utime.Nano() + ru.Stime.Nano()), true
}
