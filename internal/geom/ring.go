package geom

import "math"

// Ring is a simple polygon boundary, stored open: the closing edge runs from
// the last vertex back to the first. Either winding is accepted; [Ring.Area]
// is positive for counter-clockwise rings.
type Ring []Vec2

// Area returns the signed area of r (positive when counter-clockwise), by the
// shoelace formula taken about the first vertex to limit round-off. Rings
// with fewer than three vertices have zero area.
func (r Ring) Area() float64 {
	if len(r) < 3 {
		return 0
	}
	o := r[0]
	var s Sum
	for i := 1; i+1 < len(r); i++ {
		s.Add(r[i].Sub(o).Cross(r[i+1].Sub(o)))
	}
	return s.Value() / 2
}

// Perimeter returns the length of the closed boundary of r.
func (r Ring) Perimeter() float64 {
	var s Sum
	for i := range r {
		s.Add(r[i].Distance(r[(i+1)%len(r)]))
	}
	return s.Value()
}

// Bounds returns the bounding box of r.
func (r Ring) Bounds() Box { return BoxOf(r) }

// CCW returns r wound counter-clockwise: r itself when it already is, else a
// reversed copy. r is not modified.
func (r Ring) CCW() Ring {
	if r.Area() >= 0 {
		return r
	}
	out := make(Ring, len(r))
	for i, p := range r {
		out[len(r)-1-i] = p
	}
	return out
}

// Contains reports whether p lies inside r or on its boundary, by the even-odd
// crossing rule in floating point. It is meant for metric work (areas,
// distances) where a point within round-off of the boundary may fall either
// way; topological decisions use the exact predicates of package robust.
func (r Ring) Contains(p Vec2) bool {
	in := false
	n := len(r)
	for i, j := 0, n-1; i < n; j, i = i, i+1 {
		a, b := r[j], r[i]
		if SegmentDistanceSquared(p, a, b) == 0 {
			return true
		}
		if (a.Y > p.Y) != (b.Y > p.Y) {
			x := a.X + (p.Y-a.Y)*(b.X-a.X)/(b.Y-a.Y)
			if p.X < x {
				in = !in
			}
		}
	}
	return in
}

// BoundaryDistance returns the distance from p to the nearest point of the
// boundary of r (not zero inside: see [Ring.Distance] for that).
func (r Ring) BoundaryDistance(p Vec2) float64 {
	best := math.Inf(1)
	for i := range r {
		d := SegmentDistanceSquared(p, r[i], r[(i+1)%len(r)])
		if d < best {
			best = d
		}
	}
	return math.Sqrt(best)
}

// Distance returns the distance from p to the region bounded by r: zero
// inside or on the boundary, else the distance to the boundary.
func (r Ring) Distance(p Vec2) float64 {
	if r.Contains(p) {
		return 0
	}
	return r.BoundaryDistance(p)
}

// SegmentDistanceSquared returns the squared distance from p to the closed
// segment ab (a degenerate segment is the point a).
func SegmentDistanceSquared(p, a, b Vec2) float64 {
	ab := b.Sub(a)
	ap := p.Sub(a)
	l2 := ab.Norm2()
	if l2 == 0 {
		return ap.Norm2()
	}
	t := ap.Dot(ab) / l2
	switch {
	case t <= 0:
		return ap.Norm2()
	case t >= 1:
		return p.Sub(b).Norm2()
	}
	return p.Sub(a.Add(ab.Scale(t))).Norm2()
}

// Polyline is an open sequence of planar vertices.
type Polyline []Vec2

// Length returns the total length of l.
func (l Polyline) Length() float64 {
	var s Sum
	for i := 1; i < len(l); i++ {
		s.Add(l[i-1].Distance(l[i]))
	}
	return s.Value()
}
