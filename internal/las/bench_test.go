package las

import "testing"

// The benchmarks read autzen_trim.las (110 000 points of format 3, 3.7 MB;
// 26 107 ground points). TestRead_SharedSamples pins the result.

func BenchmarkReadAutzenAll(b *testing.B) {
	path := sharedLAS(b, "autzen_trim.las")
	b.ReportAllocs()
	b.SetBytes(3742038)
	for b.Loop() {
		if _, _, _, err := Read(path, Options{AllClasses: true}); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkReadAutzenGround includes the first pass that looks for ground
// points.
func BenchmarkReadAutzenGround(b *testing.B) {
	path := sharedLAS(b, "autzen_trim.las")
	b.ReportAllocs()
	b.SetBytes(3742038)
	for b.Loop() {
		if _, _, _, err := Read(path, Options{}); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkReadAutzenThinLowest(b *testing.B) {
	path := sharedLAS(b, "autzen_trim.las")
	b.ReportAllocs()
	b.SetBytes(3742038)
	for b.Loop() {
		if _, _, _, err := Read(path, Options{AllClasses: true, ThinCell: 3, Thin: ThinLowest}); err != nil {
			b.Fatal(err)
		}
	}
}
