package design

import (
	"math/big"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// orientErrBound is Shewchuk's ccwerrboundA = (3 + 16ε)ε with ε = 2⁻⁵³
// ("Adaptive Precision Floating-Point Arithmetic and Fast Robust Geometric
// Predicates", Discrete Comput. Geom. 18, 1997, §4): when |det| exceeds it
// times the sum of the magnitudes of the two products, the floating-point
// sign is the exact sign.
const orientErrBound = (3 + 16*0x1p-53) * 0x1p-53

// orient returns the exact sign of the orientation of c relative to the
// directed line ab: +1 when abc turns counter-clockwise, −1 clockwise, 0
// collinear. A floating-point filter settles almost every call; the rest
// are decided in exact rational arithmetic.
func orient(a, b, c geom.Vec2) int {
	l := float64((a.X - c.X) * (b.Y - c.Y))
	r := float64((a.Y - c.Y) * (b.X - c.X))
	det := l - r
	bound := orientErrBound * (abs(l) + abs(r))
	switch {
	case det > bound:
		return 1
	case -det > bound:
		return -1
	}
	return orientExact(a, b, c)
}

func orientExact(a, b, c geom.Vec2) int {
	rat := func(f float64) *big.Rat { return new(big.Rat).SetFloat64(f) }
	acx := new(big.Rat).Sub(rat(a.X), rat(c.X))
	bcy := new(big.Rat).Sub(rat(b.Y), rat(c.Y))
	acy := new(big.Rat).Sub(rat(a.Y), rat(c.Y))
	bcx := new(big.Rat).Sub(rat(b.X), rat(c.X))
	l := new(big.Rat).Mul(acx, bcy)
	r := new(big.Rat).Mul(acy, bcx)
	return l.Cmp(r)
}

func abs(f float64) float64 {
	if f < 0 {
		return -f
	}
	return f
}

// onSegment reports whether p, known to be collinear with ab, lies on the
// closed segment ab (exact: comparisons only).
func onSegment(p, a, b geom.Vec2) bool {
	return min(a.X, b.X) <= p.X && p.X <= max(a.X, b.X) && min(a.Y, b.Y) <= p.Y && p.Y <= max(a.Y, b.Y)
}

// segmentsMeet reports whether the closed segments ab and cd share a point,
// decided exactly.
func segmentsMeet(a, b, c, d geom.Vec2) bool {
	o1, o2 := orient(a, b, c), orient(a, b, d)
	o3, o4 := orient(c, d, a), orient(c, d, b)
	if o1 != o2 && o3 != o4 {
		return true
	}
	switch {
	case o1 == 0 && onSegment(c, a, b):
		return true
	case o2 == 0 && onSegment(d, a, b):
		return true
	case o3 == 0 && onSegment(a, c, d):
		return true
	case o4 == 0 && onSegment(b, c, d):
		return true
	}
	return false
}
