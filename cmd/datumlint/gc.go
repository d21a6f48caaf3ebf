package main

import (
	"os"
	"runtime/debug"
)

// A check allocates many small, short-lived trees (one per statement) over
// a live heap of a few megabytes. With Go's default GOGC=100 the collector
// then runs every few megabytes and took about a quarter of a whole-
// repository check in the profile (docs/performance.md). A heap allowed to
// grow to five times the live data collects a quarter as often; the soft
// memory limit keeps the peak well under the 300 MiB the performance goal
// allows. Users who set GOGC or GOMEMLIMIT keep their own settings.
func init() {
	if os.Getenv("GOGC") == "" {
		debug.SetGCPercent(400)
	}
	if os.Getenv("GOMEMLIMIT") == "" {
		debug.SetMemoryLimit(192 << 20)
	}
}
