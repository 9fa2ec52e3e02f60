package units

import "testing"

// BenchmarkTable resolves UCUM's whole table, as the first use of the
// package does once.
func BenchmarkTable(b *testing.B) {
	b.ReportAllocs()
	for range b.N {
		_ = buildAtoms()
	}
}

func BenchmarkAffine(b *testing.B) {
	b.ReportAllocs()
	for range b.N {
		if _, _, err := Affine("[psi]", "kPa"); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkSymbol(b *testing.B) {
	b.ReportAllocs()
	for range b.N {
		_ = Symbol("umol/(L.h)")
	}
}

// BenchmarkUnknown is the error path: an unknown atom and the search for
// the nearest one.
func BenchmarkUnknown(b *testing.B) {
	b.ReportAllocs()
	_ = Check("x") // build the candidates outside the loop
	b.ResetTimer()
	for range b.N {
		if Check("mmole/L") == nil {
			b.Fatal("accepted")
		}
	}
}
