package section

import (
	"math"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// isotropyTol is the relative size, against the polar moment, below which a
// ring's second-moment difference counts as no preferred direction. For a
// square or a regular polygon the difference is pure round-off (about 1e-16
// relative); a real elongation of a billionth means nothing for a pond, so
// 1e-9 separates the two with room to spare.
const isotropyTol = 1e-9

// northTol is the x component (of a unit direction) below which an axis
// counts as north-south and is made to point north. An axis computed for an
// exactly north-south shape carries round-off of about 1e-16 in x, of either
// sign; 1e-12 (a micrometre per kilometre) absorbs it.
const northTol = 1e-12

// Axes returns the principal (long) axis of the region bounded by r and the
// cross axis through the point through, each extended by marginM (m) beyond
// the ring.
//
// The long axis passes through the region's centroid along the direction
// of greatest second moment of area (the major axis of the region's inertia
// ellipse, from Green's-theorem moments of the polygon); it runs from the
// farthest crossing of the ring on one side to the farthest on the other,
// plus the margin, and points east-ish (positive x component; north when it
// runs north-south to within 1e-12). A region with no preferred direction (a circle, a
// square) gets an east-west long axis. The cross axis is perpendicular to
// it, turned 90° counter-clockwise (north-ish for an east-west long axis),
// through through, from its farthest ring crossing on either side (through
// itself when the line misses the ring) plus the margin. Both are
// two-vertex polylines.
//
// r may be wound either way and concave; a negative or NaN margin counts as
// 0. A ring with fewer than three vertices, a non-finite vertex or no area
// gives nil, nil; a non-finite through gives a nil cross axis.
func Axes(r geom.Ring, through geom.Vec2, marginM float64) (long, cross geom.Polyline) {
	if len(r) < 3 {
		return nil, nil
	}
	for _, p := range r {
		if !p.IsFinite() {
			return nil, nil
		}
	}
	if !(marginM > 0) || math.IsInf(marginM, 0) {
		marginM = 0
	}
	c, sxx, syy, sxy, ok := moments(r)
	if !ok {
		return nil, nil
	}
	theta := 0.0
	if math.Hypot(sxx-syy, 2*sxy) > isotropyTol*(sxx+syy) {
		theta = math.Atan2(2*sxy, sxx-syy) / 2 // in (−π/2, π/2]: cos ≥ 0
	}
	s, co := math.Sincos(theta)
	d := geom.Vec2{X: co, Y: s}
	if d.X < -northTol || (math.Abs(d.X) <= northTol && d.Y < 0) {
		d = d.Scale(-1)
	}
	long = axisThrough(r, c, d, marginM)
	if through.IsFinite() {
		cross = axisThrough(r, through, geom.Vec2{X: -d.Y, Y: d.X}, marginM)
	}
	return long, cross
}

// moments returns the centroid and the second moments of area about it,
// Sxx = ∬(x − cx)² dA, Syy = ∬(y − cy)² dA, Sxy = ∬(x − cx)(y − cy) dA, of
// the region bounded by r (signs fixed for either winding), taken about the
// first vertex and then the centroid to limit round-off. The formulas are
// the standard polygon moments from Green's theorem, e.g. ∬x² dA =
// Σ(xᵢ² + xᵢxᵢ₊₁ + xᵢ₊₁²)(xᵢyᵢ₊₁ − xᵢ₊₁yᵢ)/12.
func moments(r geom.Ring) (c geom.Vec2, sxx, syy, sxy float64, ok bool) {
	o := r[0]
	var a, mx, my geom.Sum
	n := len(r)
	for i := range n {
		p, q := r[i].Sub(o), r[(i+1)%n].Sub(o)
		w := p.Cross(q)
		a.Add(w)
		mx.Add((p.X + q.X) * w)
		my.Add((p.Y + q.Y) * w)
	}
	area2 := a.Value() // twice the signed area
	if area2 == 0 || math.IsNaN(area2) {
		return c, 0, 0, 0, false
	}
	c = o.Add(geom.Vec2{X: mx.Value() / (3 * area2), Y: my.Value() / (3 * area2)})
	var ixx, iyy, ixy geom.Sum
	for i := range n {
		p, q := r[i].Sub(c), r[(i+1)%n].Sub(c)
		w := p.Cross(q)
		ixx.Add((p.X*p.X + p.X*q.X + q.X*q.X) * w)
		iyy.Add((p.Y*p.Y + p.Y*q.Y + q.Y*q.Y) * w)
		ixy.Add((p.X*q.Y + 2*p.X*p.Y + 2*q.X*q.Y + q.X*p.Y) * w)
	}
	sign := 1.0
	if area2 < 0 {
		sign = -1
	}
	return c, sign * ixx.Value() / 12, sign * iyy.Value() / 12, sign * ixy.Value() / 24, true
}

// axisThrough returns the segment of the line p + s·d (d a unit vector)
// from its smallest to its largest crossing of r's edges, with s = 0 always
// included, extended by margin at both ends.
func axisThrough(r geom.Ring, p, d geom.Vec2, margin float64) geom.Polyline {
	lo, hi := 0.0, 0.0
	n := len(r)
	for i := range n {
		a, b := r[i], r[(i+1)%n]
		e := b.Sub(a)
		ap := a.Sub(p)
		den := d.Cross(e)
		if den == 0 {
			if ap.Cross(d) == 0 { // the edge lies on the line
				for _, q := range [2]geom.Vec2{a, b} {
					s := q.Sub(p).Dot(d)
					lo, hi = math.Min(lo, s), math.Max(hi, s)
				}
			}
			continue
		}
		u := ap.Cross(d) / den // position along the edge
		if u < 0 || u > 1 {
			continue
		}
		s := ap.Cross(e) / den
		lo, hi = math.Min(lo, s), math.Max(hi, s)
	}
	return geom.Polyline{p.Add(d.Scale(lo - margin)), p.Add(d.Scale(hi + margin))}
}
