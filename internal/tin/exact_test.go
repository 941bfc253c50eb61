package tin

import (
	"math/big"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// ratOrient and ratInCircle evaluate the orientation and incircle
// determinants in exact rational arithmetic (math/big.Rat holds every
// float64 exactly), independently of package robust. They are the oracle
// of exactCheck.
func ratOrient(a, b, c geom.Vec3) int {
	r := func(x float64) *big.Rat { return new(big.Rat).SetFloat64(x) }
	bx := new(big.Rat).Sub(r(b.X), r(a.X))
	by := new(big.Rat).Sub(r(b.Y), r(a.Y))
	cx := new(big.Rat).Sub(r(c.X), r(a.X))
	cy := new(big.Rat).Sub(r(c.Y), r(a.Y))
	l := new(big.Rat).Mul(bx, cy)
	return l.Sub(l, new(big.Rat).Mul(by, cx)).Sign()
}

func ratInCircle(a, b, c, d geom.Vec3) int {
	r := func(x float64) *big.Rat { return new(big.Rat).SetFloat64(x) }
	row := func(p geom.Vec3) (x, y, l *big.Rat) {
		x = new(big.Rat).Sub(r(p.X), r(d.X))
		y = new(big.Rat).Sub(r(p.Y), r(d.Y))
		l = new(big.Rat).Add(new(big.Rat).Mul(x, x), new(big.Rat).Mul(y, y))
		return
	}
	ax, ay, al := row(a)
	bx, by, bl := row(b)
	cx, cy, cl := row(c)
	m := func(p, q *big.Rat) *big.Rat { return new(big.Rat).Mul(p, q) }
	s := func(p, q *big.Rat) *big.Rat { return new(big.Rat).Sub(p, q) }
	det := m(al, s(m(bx, cy), m(by, cx)))
	det.Add(det, m(bl, s(m(cx, ay), m(cy, ax))))
	det.Add(det, m(cl, s(m(ax, by), m(ay, bx))))
	return det.Sign()
}

// filteredInCircle is ratInCircle with a floating-point shortcut: the
// float determinant is trusted when it exceeds 1e-10 of its permanent (a
// margin a million times the rounding error bound), else big.Rat decides.
// The same scheme as ref_delaunay.py's validator.
func filteredInCircle(a, b, c, d geom.Vec3) int {
	adx, ady := a.X-d.X, a.Y-d.Y
	bdx, bdy := b.X-d.X, b.Y-d.Y
	cdx, cdy := c.X-d.X, c.Y-d.Y
	al, bl, cl := adx*adx+ady*ady, bdx*bdx+bdy*bdy, cdx*cdx+cdy*cdy
	det := al*(bdx*cdy-bdy*cdx) + bl*(cdx*ady-cdy*adx) + cl*(adx*bdy-ady*bdx)
	perm := al*(abs(bdx*cdy)+abs(bdy*cdx)) + bl*(abs(cdx*ady)+abs(cdy*adx)) + cl*(abs(adx*bdy)+abs(ady*bdx))
	switch {
	case det > 1e-10*perm:
		return 1
	case det < -1e-10*perm:
		return -1
	}
	return ratInCircle(a, b, c, d)
}

func abs(x float64) float64 {
	if x < 0 {
		return -x
	}
	return x
}

// exactCheck verifies with big.Rat that every mesh triangle of s is
// counter-clockwise and that every interior unconstrained edge of the mesh
// is locally Delaunay (the empty-circle test of check-values.md §6, exactly;
// cocircular quadrilaterals are ties, not violations). It is slow and meant
// for small and medium inputs.
func exactCheck(tb testing.TB, s *Surface) {
	tb.Helper()
	m := s.Mesh()
	for t := range m.NumTriangles() {
		a, b, c := m.Triangle(t)
		if ratOrient(a, b, c) <= 0 {
			tb.Fatalf("exact check: triangle %d is not counter-clockwise", t)
		}
	}
	viol := 0
	for e := range int32(len(m.T)) {
		f := s.madj[e]
		if f < e || s.IsConstrained(int(e/3), int(e%3)) {
			continue
		}
		a, b, c := m.V[m.T[e]], m.V[m.T[next(e)]], m.V[m.T[prev(e)]]
		d := m.V[m.T[prev(f)]]
		if ratInCircle(a, b, c, d) > 0 {
			viol++
		}
	}
	if viol > 0 {
		tb.Fatalf("exact check: %d edges are not locally Delaunay", viol)
	}
}
