package cutfill

import (
	"math"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/robust"
)

// maxPolyVerts bounds the vertices of an overlay cell. A triangle clipped by
// three half-planes has at most 6 vertices, and clipped again by three more
// at most 9 (each half-plane adds at most one vertex to a convex polygon);
// 12 leaves room for the extra crossings round-off can create on slivers.
const maxPolyVerts = 12

// cell is a convex polygon, counter-clockwise, held in a fixed array so that
// the overlay allocates nothing per cell.
type cell struct {
	n int
	p [maxPolyVerts]geom.Vec2
}

func (c *cell) add(p geom.Vec2) {
	if c.n < maxPolyVerts { // a full buffer only happens on degenerate slivers
		c.p[c.n] = p
		c.n++
	}
}

func (c *cell) setTriangle(a, b, d geom.Vec2) {
	c.n = 3
	c.p[0], c.p[1], c.p[2] = a, b, d
}

// bounds returns the bounding box of c, which must not be empty. Plain
// comparisons are enough: every coordinate is finite.
func (c *cell) bounds() geom.Box {
	b := geom.Box{Min: c.p[0], Max: c.p[0]}
	for _, p := range c.p[1:c.n] {
		if p.X < b.Min.X {
			b.Min.X = p.X
		} else if p.X > b.Max.X {
			b.Max.X = p.X
		}
		if p.Y < b.Min.Y {
			b.Min.Y = p.Y
		} else if p.Y > b.Max.Y {
			b.Max.Y = p.Y
		}
	}
	return b
}

// clipHalf writes to out the part of in on the left of, or on, the directed
// line a→b (Sutherland–Hodgman, one edge). in and out must differ.
func clipHalf(in *cell, a, b geom.Vec2, out *cell) {
	out.n = 0
	if in.n == 0 {
		return
	}
	d := b.Sub(a)
	prev := in.p[in.n-1]
	sp := d.Cross(prev.Sub(a))
	for i := 0; i < in.n; i++ {
		cur := in.p[i]
		sc := d.Cross(cur.Sub(a))
		switch {
		case sc >= 0:
			if sp < 0 {
				out.add(prev.Lerp(cur, sp/(sp-sc)))
			}
			out.add(cur)
		case sp > 0: // prev strictly inside, cur outside
			out.add(prev.Lerp(cur, sp/(sp-sc)))
		}
		prev, sp = cur, sc
	}
}

// clipTriangle clips in to the counter-clockwise triangle t, using tmp as
// scratch, and leaves the result in in.
func clipTriangle(in *cell, t *[3]geom.Vec2, tmp *cell) {
	clipHalf(in, t[0], t[1], tmp)
	clipHalf(tmp, t[1], t[2], in)
	clipHalf(in, t[2], t[0], tmp)
	*in = *tmp
}

// plane is the linear function z(p) = z + gx·(p.x − o.x) + gy·(p.y − o.y)
// through a triangle's corners, taken about its first corner to limit
// round-off.
type plane struct {
	o         geom.Vec2
	z, gx, gy float64
}

// planeOf returns the plane through a, b and c; det is twice their signed
// plan area and must be nonzero.
func planeOf(a, b, c geom.Vec3, det float64) plane {
	d1, d2 := b.Sub(a), c.Sub(a)
	gx := (float64(d1.Z*d2.Y) - float64(d2.Z*d1.Y)) / det
	gy := (float64(d2.Z*d1.X) - float64(d1.Z*d2.X)) / det
	return plane{o: a.XY(), z: a.Z, gx: gx, gy: gy}
}

func (p *plane) at(q geom.Vec2) float64 {
	return p.z + float64(p.gx*(q.X-p.o.X)) + float64(p.gy*(q.Y-p.o.Y))
}

// posNeg returns ∫f⁺ and ∫f⁻ over a triangle of (signed) plan area area on
// which f is linear with corner values a, b and c. With f₁ ≥ f₂ ≥ f₃ and
// mean μ = (f₁+f₂+f₃)/3 (the refbench README gives the same closed forms):
//
//	f₃ ≥ 0:            ∫f⁺ = A·μ, ∫f⁻ = 0
//	f₁ ≤ 0:            ∫f⁺ = 0,   ∫f⁻ = −A·μ
//	only f₃ < 0:       ∫f⁻ = A·(−f₃)³ / (3(f₁−f₃)(f₂−f₃)),  ∫f⁺ = A·μ + ∫f⁻
//	only f₁ > 0:       ∫f⁺ = A·f₁³ / (3(f₁−f₂)(f₁−f₃)),      ∫f⁻ = ∫f⁺ − A·μ
//
// The corner term is the integral over the small triangle cut off at the
// lone vertex by the zero line, whose sides are the fractions f₁/(f₁−f₂) and
// f₁/(f₁−f₃) of the triangle's; it is written as a product of those
// fractions so that nothing overflows. The denominators are positive in the
// cases that use them.
func posNeg(area, a, b, c float64) (pos, neg float64) {
	if a < b {
		a, b = b, a
	}
	if b < c {
		b, c = c, b
	}
	if a < b {
		a, b = b, a
	}
	mean := (a + b + c) / 3
	switch {
	case c >= 0:
		return area * mean, 0
	case a <= 0:
		return 0, -area * mean
	case b >= 0: // only c < 0
		n := area * (-c / 3) * (-c / (a - c)) * (-c / (b - c))
		return area*mean + n, n
	default: // only a > 0
		p := area * (a / 3) * (a / (a - b)) * (a / (a - c))
		return p, p - area*mean
	}
}

// ccwErrBound is the relative error bound of the floating-point orientation
// determinant (bx−ax)(cy−ay) − (by−ay)(cx−ax): its computed value differs
// from the exact one by at most (3 + 16ε)ε·(|t₁| + |t₂|), t₁ and t₂ being the
// two products and ε = 2⁻⁵³ (Shewchuk, "Adaptive precision floating-point
// arithmetic and fast robust geometric predicates", Discrete Comput. Geom.
// 18, 1997, the bound ccwerrboundA).
const ccwErrBound = (3 + 16*epsilon) * epsilon

const epsilon = 1.0 / (1 << 53)

// orientFloat returns twice the signed area of abc and the bound on its
// round-off; the sign is certain when |det| > bound.
func orientFloat(a, b, c geom.Vec2) (det, bound float64) {
	t1 := float64((b.X - a.X) * (c.Y - a.Y))
	t2 := float64((b.Y - a.Y) * (c.X - a.X))
	return t1 - t2, ccwErrBound * (math.Abs(t1) + math.Abs(t2))
}

// orient returns +1 when abc turn counter-clockwise, −1 clockwise and 0 when
// they are collinear, exactly (Shewchuk's adaptive predicate, package
// robust). It decides the topology of boundary rings.
func orient(a, b, c geom.Vec2) int { return int(robust.Orient2D(a, b, c)) }
