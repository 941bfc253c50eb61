package takeoff

import (
	"cmp"
	"math"
	"slices"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/robust"
)

// orient returns +1 when c lies to the left of the directed line ab
// (counter-clockwise turn), −1 to the right and 0 when the three points are
// collinear, exactly: the sign of [robust.Orient2D], the project's
// adaptive predicate (Shewchuk 1997).
func orient(a, b, c geom.Vec2) int { return int(robust.Orient2D(a, b, c)) }

// convexHull returns the convex hull of pts, counter-clockwise, without
// collinear points, by Andrew's monotone chain (A. M. Andrew, "Another
// efficient algorithm for convex hulls in two dimensions", Inform. Process.
// Lett. 9, 1979). Fewer than three distinct points come back as they are
// (deduplicated and sorted). pts is not modified. Cost O(n log n).
func convexHull(pts []geom.Vec2) []geom.Vec2 {
	p := slices.Clone(pts)
	slices.SortFunc(p, func(a, b geom.Vec2) int {
		if c := cmp.Compare(a.X, b.X); c != 0 {
			return c
		}
		return cmp.Compare(a.Y, b.Y)
	})
	p = slices.Compact(p)
	if len(p) < 3 {
		return p
	}
	h := make([]geom.Vec2, 0, 2*len(p))
	for _, q := range p {
		for len(h) >= 2 && orient(h[len(h)-2], h[len(h)-1], q) <= 0 {
			h = h[:len(h)-1]
		}
		h = append(h, q)
	}
	lower := len(h) + 1
	for i := len(p) - 2; i >= 0; i-- {
		q := p[i]
		for len(h) >= lower && orient(h[len(h)-2], h[len(h)-1], q) <= 0 {
			h = h[:len(h)-1]
		}
		h = append(h, q)
	}
	return h[:len(h)-1]
}

// Rect is an oriented rectangle in plan: its centre, the length of its
// longer side and of its shorter side (m), and the direction of the longer
// side in degrees counter-clockwise from the local x (east) axis, in
// [0, 180).
type Rect struct {
	Center   geom.Vec2 `json:"-"`
	LengthM  float64   `json:"length_m"`
	WidthM   float64   `json:"width_m"`
	AngleDeg float64   `json:"angle_deg"`
}

// PerimeterM returns the perimeter of r.
func (r Rect) PerimeterM() float64 { return 2 * (r.LengthM + r.WidthM) }

// AreaM2 returns the area of r.
func (r Rect) AreaM2() float64 { return r.LengthM * r.WidthM }

// MinAreaRect returns the minimum-area rectangle enclosing pts. One side of
// that rectangle lies along an edge of the convex hull (Freeman & Shapira,
// "Determining the minimum-area encasing rectangle for an arbitrary closed
// curve", Comm. ACM 18, 1975), so every hull edge direction is tried, with
// the extreme points in the other three directions advanced around the hull
// as the edge turns (rotating calipers, Toussaint, "Solving geometric
// problems with the rotating calipers", Proc. IEEE MELECON 1983); ties keep
// the first edge in hull order. Collinear input gives a rectangle of zero
// width along the line, a single point a zero rectangle, and no points the
// zero Rect. Cost O(n log n) for the hull, O(h) after it.
func MinAreaRect(pts []geom.Vec2) Rect {
	h := convexHull(pts)
	n := len(h)
	switch n {
	case 0:
		return Rect{}
	case 1:
		return Rect{Center: h[0]}
	case 2:
		d := h[1].Sub(h[0])
		return Rect{Center: h[0].Lerp(h[1], 0.5), LengthM: d.Norm(), AngleDeg: angleDeg(d)}
	}
	dir := func(i int) (u, nv geom.Vec2) {
		d := h[(i+1)%n].Sub(h[i])
		u = d.Scale(1 / d.Norm())
		return u, geom.Vec2{X: -u.Y, Y: u.X}
	}
	// Calipers: ia is farthest along u, ib farthest along n (the hull lies
	// on the left of each counter-clockwise edge, so n points inwards), ic
	// least along u. Each only moves forward as the edge turns.
	best := Rect{}
	bestArea := math.Inf(1)
	ia, ib, ic := 0, 0, 0
	for i := range n {
		u, nv := dir(i)
		if i == 0 {
			ia, ib, ic = farthest(h, 0, u), farthest(h, 0, nv), farthest(h, 0, u.Scale(-1))
		} else {
			ia = climb(h, ia, u)
			ib = climb(h, ib, nv)
			ic = climb(h, ic, u.Scale(-1))
		}
		o := h[i]
		hi := h[ia].Sub(o).Dot(u)
		lo := h[ic].Sub(o).Dot(u)
		wid := h[ib].Sub(o).Dot(nv)
		a := (hi - lo) * wid
		if a < bestArea {
			bestArea = a
			c := o.Add(u.Scale((lo + hi) / 2)).Add(nv.Scale(wid / 2))
			r := Rect{Center: c, LengthM: hi - lo, WidthM: wid, AngleDeg: angleDeg(u)}
			if r.WidthM > r.LengthM {
				r.LengthM, r.WidthM = r.WidthM, r.LengthM
				r.AngleDeg = normAngle(r.AngleDeg + 90)
			}
			best = r
		}
	}
	return best
}

// farthest returns the index of the point of h farthest along u, searched
// from start (a full scan).
func farthest(h []geom.Vec2, start int, u geom.Vec2) int {
	k := start
	for i := range h {
		if h[i].Dot(u) > h[k].Dot(u) {
			k = i
		}
	}
	return k
}

// climb moves k forward around the convex polygon h while that increases
// the projection on u; on a convex polygon the projection is unimodal, so
// this reaches the maximum from the previous edge's maximum.
func climb(h []geom.Vec2, k int, u geom.Vec2) int {
	n := len(h)
	for range n {
		nk := (k + 1) % n
		if h[nk].Dot(u) <= h[k].Dot(u) {
			break
		}
		k = nk
	}
	return k
}

// extent returns the smallest and largest projection of pts onto u.
func extent(pts []geom.Vec2, u geom.Vec2) (lo, hi float64) {
	lo, hi = math.Inf(1), math.Inf(-1)
	for _, p := range pts {
		t := p.Dot(u)
		lo = min(lo, t)
		hi = max(hi, t)
	}
	return lo, hi
}

// angleDeg returns the direction of d in degrees in [0, 180).
func angleDeg(d geom.Vec2) float64 {
	return normAngle(math.Atan2(d.Y, d.X) * 180 / math.Pi)
}

// angleSnapDeg folds angles within 1e-9° below 180° to 0°, so that a
// direction a hair clockwise of east (a hull edge with round-off in it)
// reads 0 rather than 179.999999999.
const angleSnapDeg = 1e-9

// normAngle folds an angle in degrees into [0, 180).
func normAngle(a float64) float64 {
	a = math.Mod(a, 180)
	if a < 0 {
		a += 180
	}
	if a >= 180-angleSnapDeg {
		a = 0
	}
	return a
}
