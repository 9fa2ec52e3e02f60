package hugepage

import (
	"bufio"
	"os"
	"runtime"
	"strconv"
	"strings"
	"testing"
	"unsafe"
)

func TestMakeShape(t *testing.T) {
	for _, n := range []int{0, 1, 1000, minBytes/8 - 1, minBytes / 8, 3_000_000} {
		s := Make[float64](n)
		if len(s) != n || cap(s) != n {
			t.Fatalf("Make(%d): len %d cap %d", n, len(s), cap(s))
		}
		for i, v := range s {
			if v != 0 {
				t.Fatalf("Make(%d)[%d] = %g, want 0", n, i, v)
			}
		}
		e := Empty[int32](n)
		if len(e) != 0 || cap(e) != n {
			t.Fatalf("Empty(%d): len %d cap %d", n, len(e), cap(e))
		}
	}
}

func TestGrowKeepsValues(t *testing.T) {
	s := []float64{1, 2, 3}
	g := Grow(s, 2_000_000)
	if len(g) != 3 || cap(g) < 2_000_003 || g[0] != 1 || g[2] != 3 {
		t.Fatalf("Grow: len %d cap %d %v", len(g), cap(g), g[:3])
	}
	if h := Grow(g, 10); &h[0] != &g[0] {
		t.Error("Grow with room to spare made a new buffer")
	}
}

// TestAdvised reads the kernel's record of the mapping (the VmFlags line of
// /proc/self/smaps, where "hg" marks MADV_HUGEPAGE; proc(5)) to check that
// the advice reached the kernel. It skips off Linux and where the kernel
// has no transparent huge pages.
func TestAdvised(t *testing.T) {
	if runtime.GOOS != "linux" {
		t.Skip("huge page advice is Linux only")
	}
	if _, err := os.Stat("/sys/kernel/mm/transparent_hugepage/enabled"); err != nil {
		t.Skip("this kernel has no transparent huge pages")
	}
	s := Make[float64](1_000_000)
	p := uintptr(unsafe.Pointer(unsafe.SliceData(s)))
	flags := vmFlags(t, p)
	if !strings.Contains(" "+flags+" ", " hg ") {
		t.Errorf("mapping of %#x has VmFlags %q, without hg (MADV_HUGEPAGE)", p, flags)
	}
	runtime.KeepAlive(s)
}

// vmFlags returns the VmFlags of the mapping in /proc/self/smaps that
// holds address p.
func vmFlags(t *testing.T, p uintptr) string {
	f, err := os.Open("/proc/self/smaps")
	if err != nil {
		t.Skipf("no /proc/self/smaps: %v", err)
	}
	defer f.Close()
	sc := bufio.NewScanner(f)
	in := false
	for sc.Scan() {
		line := sc.Text()
		if fields := strings.Fields(line); len(fields) > 1 && strings.Contains(fields[0], "-") && !strings.HasSuffix(fields[0], ":") {
			lo, hi, _ := strings.Cut(fields[0], "-")
			a, err1 := strconv.ParseUint(lo, 16, 64)
			b, err2 := strconv.ParseUint(hi, 16, 64)
			in = err1 == nil && err2 == nil && uint64(p) >= a && uint64(p) < b
			continue
		}
		if in && strings.HasPrefix(line, "VmFlags:") {
			return strings.TrimSpace(strings.TrimPrefix(line, "VmFlags:"))
		}
	}
	t.Fatalf("no mapping holds %#x", p)
	return ""
}
