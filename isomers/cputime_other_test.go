//go:build !unix

package isomers

import "time"

func processCPU() (time.Duration, bool) { return 0, false }
