package main

import (
	"math"
	"runtime"
	"runtime/debug"
	"testing"
	"time"
)

// TestFollowLiveHeap: with the soft limit below a live heap that stays,
// followLiveHeap raises it above that heap (to about an eighth more) after
// a few collections, instead of leaving the collector to run without
// pause. The live heap is 64 MiB of columns held through the test; the
// limit starts at 16 MiB.
func TestFollowLiveHeap(t *testing.T) {
	old := debug.SetMemoryLimit(16 << 20)
	defer debug.SetMemoryLimit(old)
	followLiveHeap()
	held := make([][]float64, 8)
	for i := range held {
		held[i] = make([]float64, 1<<20) // 8 MiB each
		held[i][0] = float64(i)
	}
	deadline := time.Now().Add(10 * time.Second)
	for debug.SetMemoryLimit(-1) == 16<<20 && time.Now().Before(deadline) {
		runtime.GC()
		time.Sleep(time.Millisecond) // the finalizer runs on its own goroutine
	}
	got := debug.SetMemoryLimit(-1)
	if got < 64<<20 || got > 96<<20 {
		t.Errorf("soft limit %d MiB after collections with 64 MiB live, want it raised to about 72 MiB", got>>20)
	}
	runtime.KeepAlive(held)
	debug.SetMemoryLimit(math.MaxInt64) // the finalizer chain goes on: far from any heap, it changes nothing more
}
