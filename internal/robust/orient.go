package robust

import (
	"math"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// Orient2DErrBound certifies a floating-point orientation (Shewchuk 1997,
// ccwerrboundA): with detleft = (a.X−c.X)·(b.Y−c.Y) and detright =
// (a.Y−c.Y)·(b.X−c.X), each rounded as written (unfused), the sign of
// det = detleft − detright is that of the exact determinant whenever
// |det| > Orient2DErrBound·(|detleft| + |detright|). Code that evaluates
// many orientations in a loop may accept such results itself and call
// [Orient2D] only for the others; Orient2D's first stage is this test.
const Orient2DErrBound = ccwErrBoundA

// Orient2D returns the orientation of the triangle abc: Positive when a, b, c
// turn counter-clockwise (c lies to the left of the directed line a→b),
// Negative when clockwise, Zero when the three points are collinear
// (including when two or all of them coincide). The result is exact.
//
// Identities (exact, for all inputs):
//  1. Orient2D(a, b, c) == Orient2D(b, c, a) == Orient2D(c, a, b)
//  2. Orient2D(a, b, c) == -Orient2D(b, a, c)
//  3. Orient2D(a, a, c) == Zero
//
// Cost: a few floating-point operations; the adaptive stages run only when the
// points are collinear or nearly so.
func Orient2D(a, b, c geom.Vec2) Sign {
	// Stage A (Shewchuk's orient2d filter): the rounded determinant is
	// accepted when it exceeds ccwErrBoundA·(|detleft| + |detright|), a
	// proven bound on its error. The bound is written without branches so
	// that this function stays small enough to be inlined.
	detleft := float64((a.X - c.X) * (b.Y - c.Y))
	detright := float64((a.Y - c.Y) * (b.X - c.X))
	det := detleft - detright
	detsum := math.Abs(detleft) + math.Abs(detright)
	if errbound := ccwErrBoundA * detsum; det > errbound {
		return Positive
	} else if -det > errbound {
		return Negative
	}
	return orient2DSlow(a, b, c, detsum)
}

// orient2DSlow finishes an orientation that stage A could not decide.
func orient2DSlow(a, b, c geom.Vec2, detsum float64) Sign {
	if detsum == 0 {
		// Both products are zero, so the determinant is exactly zero.
		return Zero
	}
	return signOf(orient2DAdapt(a, b, c, detsum))
}

// orient2DAdapt is Shewchuk's orient2dadapt: stages B, C and D of the
// orientation determinant. detsum is |detleft| + |detright| from stage A.
func orient2DAdapt(a, b, c geom.Vec2, detsum float64) float64 {
	acx := a.X - c.X
	bcx := b.X - c.X
	acy := a.Y - c.Y
	bcy := b.Y - c.Y

	// Stage B: the determinant of the rounded differences, exactly.
	detleft, detlefttail := twoProduct(acx, bcy)
	detright, detrighttail := twoProduct(acy, bcx)
	var bExp [4]float64
	bExp[3], bExp[2], bExp[1], bExp[0] = twoTwoDiff(detleft, detlefttail, detright, detrighttail)
	det := estimate(bExp[:])
	if errbound := ccwErrBoundB * detsum; det >= errbound || -det >= errbound {
		return det
	}

	// Stage C: add the first-order effect of the differences' rounding errors.
	acxtail := twoDiffTail(a.X, c.X, acx)
	bcxtail := twoDiffTail(b.X, c.X, bcx)
	acytail := twoDiffTail(a.Y, c.Y, acy)
	bcytail := twoDiffTail(b.Y, c.Y, bcy)
	if acxtail == 0 && acytail == 0 && bcxtail == 0 && bcytail == 0 {
		return det
	}
	errbound := ccwErrBoundC*detsum + resultErrBound*math.Abs(det)
	det += (float64(acx*bcytail) + float64(bcy*acxtail)) - (float64(acy*bcxtail) + float64(bcx*acytail))
	if det >= errbound || -det >= errbound {
		return det
	}

	// Stage D: the remaining terms, exactly.
	var u [4]float64
	var c1 [8]float64
	var c2 [12]float64
	var d [16]float64

	s1, s0 := twoProduct(acxtail, bcy)
	t1, t0 := twoProduct(acytail, bcx)
	u[3], u[2], u[1], u[0] = twoTwoDiff(s1, s0, t1, t0)
	c1s := fastExpansionSumZeroElim(bExp[:], u[:], c1[:])

	s1, s0 = twoProduct(acx, bcytail)
	t1, t0 = twoProduct(acy, bcxtail)
	u[3], u[2], u[1], u[0] = twoTwoDiff(s1, s0, t1, t0)
	c2s := fastExpansionSumZeroElim(c1s, u[:], c2[:])

	s1, s0 = twoProduct(acxtail, bcytail)
	t1, t0 = twoProduct(acytail, bcxtail)
	u[3], u[2], u[1], u[0] = twoTwoDiff(s1, s0, t1, t0)
	ds := fastExpansionSumZeroElim(c2s, u[:], d[:])
	return ds[len(ds)-1]
}
