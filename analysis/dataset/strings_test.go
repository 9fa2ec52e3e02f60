package dataset

import (
	"slices"
	"testing"
	"unsafe"
)

func TestStrings(t *testing.T) {
	if s := StringsOf(nil); s.Given() || s.Len() != 0 || s.Slice() != nil {
		t.Errorf("StringsOf(nil): given %v, len %d", s.Given(), s.Len())
	}
	if s := StringsOf([]string{}); !s.Given() || s.Len() != 0 {
		t.Errorf("StringsOf([]string{}): given %v, len %d", s.Given(), s.Len())
	}
	v := []string{"A-1", "", "NA", "B 22", "NA", "é"}
	s := StringsOf(v)
	if !slices.Equal(s.Slice(), v) || s.Len() != len(v) || s.At(5) != "é" || s.At(1) != "" {
		t.Fatalf("StringsOf(%q) reads back %q", v, s.Slice())
	}
	if got := s.String(); got != "[A-1  NA B 22 NA é]" {
		t.Errorf("String() = %q", got)
	}
	same := s.Blank(func(c string) bool { return c == "n/a" })
	if unsafe.SliceData(same.data) != unsafe.SliceData(s.data) {
		t.Error("Blank with nothing to blank copied the column")
	}
	b := s.Blank(func(c string) bool { return c == "NA" })
	if want := []string{"A-1", "", "", "B 22", "", "é"}; !slices.Equal(b.Slice(), want) {
		t.Errorf("Blank: %q, want %q", b.Slice(), want)
	}
	if !slices.Equal(s.Slice(), v) {
		t.Error("Blank changed the column it was called on")
	}
	if p := s.Pick([]int{3, 0, 3}); !slices.Equal(p.Slice(), []string{"B 22", "A-1", "B 22"}) {
		t.Errorf("Pick: %q", p.Slice())
	}
}
