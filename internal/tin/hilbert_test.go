package tin

import (
	"math/rand/v2"
	"testing"
)

// TestHilbertKey checks the table-driven Hilbert index against the classic
// iterative algorithm (the xy2d conversion as published, e.g. in Warren,
// "Hacker's Delight", 2nd ed., §16-2), at random cells and the corners.
func TestHilbertKey(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 4))
	for range 100000 {
		x, y := r.Uint32N(hilbertOrder), r.Uint32N(hilbertOrder)
		if got, want := hilbertKey(x, y), hilbertKeySlow(x, y); got != want {
			t.Fatalf("hilbertKey(%d, %d) = %d, want %d", x, y, got, want)
		}
	}
	for _, c := range [][2]uint32{{0, 0}, {hilbertOrder - 1, 0}, {0, hilbertOrder - 1}, {hilbertOrder - 1, hilbertOrder - 1}} {
		if got, want := hilbertKey(c[0], c[1]), hilbertKeySlow(c[0], c[1]); got != want {
			t.Fatalf("hilbertKey(%d, %d) = %d, want %d", c[0], c[1], got, want)
		}
	}
}

// hilbertKeySlow is the classic iterative xy→d conversion, the test oracle
// for hilbertKey.
func hilbertKeySlow(x, y uint32) uint32 {
	var d uint32
	for s := uint32(hilbertOrder / 2); s > 0; s >>= 1 {
		var rx, ry uint32
		if x&s != 0 {
			rx = 1
		}
		if y&s != 0 {
			ry = 1
		}
		d += s * s * ((3 * rx) ^ ry)
		if ry == 0 {
			if rx == 1 {
				x = hilbertOrder - 1 - x
				y = hilbertOrder - 1 - y
			}
			x, y = y, x
		}
	}
	return d
}
