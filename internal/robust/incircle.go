package robust

import (
	"math"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// InCircle reports where d lies relative to the circle through a, b and c,
// which must be in counter-clockwise order: Positive when d is strictly
// inside, Negative when strictly outside, Zero when the four points are
// cocircular. If a, b, c are clockwise the sign is reversed; if they are
// collinear the result is the sign of a degenerate determinant (Zero when d
// is on their line, otherwise the side of the line d is on, with the
// orientation convention of the lifted determinant). The result is exact.
//
// It is the sign of the determinant
//
//	| ax-dx  ay-dy  (ax-dx)²+(ay-dy)² |
//	| bx-dx  by-dy  (bx-dx)²+(by-dy)² |
//	| cx-dx  cy-dy  (cx-dx)²+(cy-dy)² |
//
// (Guibas & Stolfi, ACM Trans. Graphics 4(2), 1985). Identities (exact):
//  1. InCircle(a, b, c, d) == InCircle(b, c, a, d)
//  2. InCircle(a, b, c, d) == -InCircle(b, a, c, d)
//  3. InCircle(a, b, c, a) == Zero
//
// Cost: about 20 floating-point operations when the answer is clear; the
// adaptive stages run only for nearly cocircular points.
func InCircle(a, b, c, d geom.Vec2) Sign {
	adx := a.X - d.X
	bdx := b.X - d.X
	cdx := c.X - d.X
	ady := a.Y - d.Y
	bdy := b.Y - d.Y
	cdy := c.Y - d.Y

	bdxcdy := float64(bdx * cdy)
	cdxbdy := float64(cdx * bdy)
	alift := float64(adx*adx) + float64(ady*ady)

	cdxady := float64(cdx * ady)
	adxcdy := float64(adx * cdy)
	blift := float64(bdx*bdx) + float64(bdy*bdy)

	adxbdy := float64(adx * bdy)
	bdxady := float64(bdx * ady)
	clift := float64(cdx*cdx) + float64(cdy*cdy)

	det := float64(alift*(bdxcdy-cdxbdy)) + float64(blift*(cdxady-adxcdy)) + float64(clift*(adxbdy-bdxady))
	permanent := float64((math.Abs(bdxcdy)+math.Abs(cdxbdy))*alift) +
		float64((math.Abs(cdxady)+math.Abs(adxcdy))*blift) +
		float64((math.Abs(adxbdy)+math.Abs(bdxady))*clift)
	if errbound := iccErrBoundA * permanent; det > errbound || -det > errbound {
		return signOf(det)
	}
	return signOf(inCircleAdapt(a, b, c, d, permanent))
}

// inCircleAdapt runs stages B and C of Shewchuk's incircleadapt and, if they
// cannot decide, evaluates the determinant exactly (stage D) from the exact
// coordinate differences. permanent is the stage-A permanent.
func inCircleAdapt(a, b, c, d geom.Vec2, permanent float64) float64 {
	adx := a.X - d.X
	bdx := b.X - d.X
	cdx := c.X - d.X
	ady := a.Y - d.Y
	bdy := b.Y - d.Y
	cdy := c.Y - d.Y

	// Stage B: the determinant of the rounded differences, exactly.
	var bc, ca, ab [4]float64
	var t8a, t8b [8]float64
	var t16a, t16b [16]float64
	var adet, bdet, cdet [32]float64
	var abdet [64]float64
	var fin [96]float64

	lifted := func(x, y float64, m *[4]float64, out *[32]float64) []float64 {
		xm := scaleExpansionZeroElim(m[:], x, t8a[:])
		xxm := scaleExpansionZeroElim(xm, x, t16a[:])
		ym := scaleExpansionZeroElim(m[:], y, t8b[:])
		yym := scaleExpansionZeroElim(ym, y, t16b[:])
		return fastExpansionSumZeroElim(xxm, yym, out[:])
	}

	p1, p0 := twoProduct(bdx, cdy)
	q1, q0 := twoProduct(cdx, bdy)
	bc[3], bc[2], bc[1], bc[0] = twoTwoDiff(p1, p0, q1, q0)
	as := lifted(adx, ady, &bc, &adet)

	p1, p0 = twoProduct(cdx, ady)
	q1, q0 = twoProduct(adx, cdy)
	ca[3], ca[2], ca[1], ca[0] = twoTwoDiff(p1, p0, q1, q0)
	bs := lifted(bdx, bdy, &ca, &bdet)

	p1, p0 = twoProduct(adx, bdy)
	q1, q0 = twoProduct(bdx, ady)
	ab[3], ab[2], ab[1], ab[0] = twoTwoDiff(p1, p0, q1, q0)
	cs := lifted(cdx, cdy, &ab, &cdet)

	abs := fastExpansionSumZeroElim(as, bs, abdet[:])
	fins := fastExpansionSumZeroElim(abs, cs, fin[:])
	det := estimate(fins)
	if errbound := iccErrBoundB * permanent; det >= errbound || -det >= errbound {
		return det
	}

	// Stage C: first-order effect of the differences' rounding errors.
	adxtail := twoDiffTail(a.X, d.X, adx)
	adytail := twoDiffTail(a.Y, d.Y, ady)
	bdxtail := twoDiffTail(b.X, d.X, bdx)
	bdytail := twoDiffTail(b.Y, d.Y, bdy)
	cdxtail := twoDiffTail(c.X, d.X, cdx)
	cdytail := twoDiffTail(c.Y, d.Y, cdy)
	if adxtail == 0 && bdxtail == 0 && cdxtail == 0 && adytail == 0 && bdytail == 0 && cdytail == 0 {
		return det
	}
	errbound := iccErrBoundC*permanent + resultErrBound*math.Abs(det)
	det += (float64((float64(adx*adx)+float64(ady*ady))*((float64(bdx*cdytail)+float64(cdy*bdxtail))-(float64(bdy*cdxtail)+float64(cdx*bdytail)))) +
		float64(2*(float64(adx*adxtail)+float64(ady*adytail))*(float64(bdx*cdy)-float64(bdy*cdx)))) +
		(float64((float64(bdx*bdx)+float64(bdy*bdy))*((float64(cdx*adytail)+float64(ady*cdxtail))-(float64(cdy*adxtail)+float64(adx*cdytail)))) +
			float64(2*(float64(bdx*bdxtail)+float64(bdy*bdytail))*(float64(cdx*ady)-float64(cdy*adx)))) +
		(float64((float64(cdx*cdx)+float64(cdy*cdy))*((float64(adx*bdytail)+float64(bdy*adxtail))-(float64(ady*bdxtail)+float64(bdx*adytail)))) +
			float64(2*(float64(cdx*cdxtail)+float64(cdy*cdytail))*(float64(adx*bdy)-float64(ady*bdx))))
	if det >= errbound || -det >= errbound {
		return det
	}

	// Stage D: exact. Each difference is the two-component expansion
	// (tail, head); the determinant is expanded with exact products.
	ax := []float64{adxtail, adx}
	ay := []float64{adytail, ady}
	bx := []float64{bdxtail, bdx}
	by := []float64{bdytail, bdy}
	cx := []float64{cdxtail, cdx}
	cy := []float64{cdytail, cdy}
	lift := func(x, y []float64) []float64 { return expSum(expMul(x, x), expMul(y, y)) }
	cross := func(x1, y1, x2, y2 []float64) []float64 {
		return expSum(expMul(x1, y2), expNeg(expMul(y1, x2)))
	}
	ta := expMul(lift(ax, ay), cross(bx, by, cx, cy))
	tb := expMul(lift(bx, by), cross(cx, cy, ax, ay))
	tc := expMul(lift(cx, cy), cross(ax, ay, bx, by))
	full := expSum(expSum(ta, tb), tc)
	return full[len(full)-1]
}
