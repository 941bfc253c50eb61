package design

import (
	"math"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// segment is one polygon edge prepared for distance queries: start a,
// direction d = b − a, inv = 1/|d|² and its bounding box.
type segment struct {
	ax, ay, dx, dy, inv    float64
	minX, minY, maxX, maxY float64
}

func newSegment(a, b geom.Vec2) segment {
	s := segment{ax: a.X, ay: a.Y, dx: b.X - a.X, dy: b.Y - a.Y,
		minX: min(a.X, b.X), minY: min(a.Y, b.Y), maxX: max(a.X, b.X), maxY: max(a.Y, b.Y)}
	if l2 := s.dx*s.dx + s.dy*s.dy; l2 > 0 {
		s.inv = 1 / l2
	}
	return s
}

// bboxDist2 returns the squared distance between the segment's bounding
// box and the box [x0, x1] × [y0, y1]: a lower bound of [segment.boxDist2]
// and of every distance from the box to the segment, at a fraction of the
// cost.
func (s *segment) bboxDist2(x0, y0, x1, y1 float64) float64 {
	dx := max(x0-s.maxX, 0, s.minX-x1)
	dy := max(y0-s.maxY, 0, s.minY-y1)
	return dx*dx + dy*dy
}

// dist2 returns the squared distance from (x, y) to the closed segment.
func (s *segment) dist2(x, y float64) float64 {
	px, py := x-s.ax, y-s.ay
	t := (px*s.dx + py*s.dy) * s.inv
	if t < 0 {
		t = 0
	} else if t > 1 {
		t = 1
	}
	qx, qy := px-t*s.dx, py-t*s.dy
	return qx*qx + qy*qy
}

// boxDist2 returns the squared distance between the segment and the box
// [x0, x1] × [y0, y1] (0 when they meet). Between two disjoint convex sets
// the distance is reached at a vertex of one of them, so it is the least
// of the segment's end points to the box and the box corners to the
// segment.
func (s *segment) boxDist2(x0, y0, x1, y1 float64) float64 {
	bx, by := s.ax+s.dx, s.ay+s.dy
	if clipsBox(s.ax, s.ay, bx, by, x0, y0, x1, y1) {
		return 0
	}
	d := min(pointBoxDist2(s.ax, s.ay, x0, y0, x1, y1), pointBoxDist2(bx, by, x0, y0, x1, y1))
	d = min(d, s.dist2(x0, y0), s.dist2(x1, y0), s.dist2(x0, y1), s.dist2(x1, y1))
	return d
}

// maxCornerDist2 returns the largest squared distance from a corner of the
// box to the segment; distance to a segment is convex, so no point of the
// box is farther.
func (s *segment) maxCornerDist2(x0, y0, x1, y1 float64) float64 {
	return max(s.dist2(x0, y0), s.dist2(x1, y0), s.dist2(x0, y1), s.dist2(x1, y1))
}

func pointBoxDist2(x, y, x0, y0, x1, y1 float64) float64 {
	dx := max(x0-x, 0, x-x1)
	dy := max(y0-y, 0, y-y1)
	return dx*dx + dy*dy
}

// clipsBox reports whether segment (ax, ay)–(bx, by) meets the closed box,
// by Liang–Barsky parametric clipping. It is used only to prune distance
// candidates, where a wrong answer within round-off costs nothing: a
// segment reported as missing the box still gets its exact distance.
func clipsBox(ax, ay, bx, by, x0, y0, x1, y1 float64) bool {
	t0, t1 := 0.0, 1.0
	dx, dy := bx-ax, by-ay
	clip := func(p, q float64) bool {
		if p == 0 {
			return q >= 0
		}
		r := q / p
		if p < 0 {
			if r > t1 {
				return false
			}
			t0 = max(t0, r)
		} else {
			if r < t0 {
				return false
			}
			t1 = min(t1, r)
		}
		return true
	}
	return clip(-dx, ax-x0) && clip(dx, x1-ax) && clip(-dy, ay-y0) && clip(dy, y1-ay)
}

// polygon is a simple counter-clockwise ring prepared for distance and
// containment queries.
type polygon struct {
	pts  geom.Ring
	segs []segment
	box  geom.Box
	// Outward unit normals and offsets of the edges' lines, for mitred
	// distances: the signed distance of p from edge k's line is
	// nx[k]·p.X + ny[k]·p.Y − nc[k].
	nx, ny, nc []float64
}

func newPolygon(r geom.Ring) *polygon {
	q := &polygon{pts: r, box: r.Bounds()}
	n := len(r)
	q.segs = make([]segment, n)
	q.nx, q.ny, q.nc = make([]float64, n), make([]float64, n), make([]float64, n)
	for i := range r {
		a, b := r[i], r[(i+1)%n]
		q.segs[i] = newSegment(a, b)
		l := a.Distance(b)
		nx, ny := (b.Y-a.Y)/l, -(b.X-a.X)/l
		q.nx[i], q.ny[i], q.nc[i] = nx, ny, nx*a.X+ny*a.Y
	}
	return q
}

// contains reports whether p is inside by the even–odd rule with the
// crossing convention of [rowCrossings] (a point on the boundary may fall
// either way; callers that care also test the distance).
func (q *polygon) contains(p geom.Vec2) bool {
	in := false
	n := len(q.pts)
	for i := range q.pts {
		a, b := q.pts[i], q.pts[(i+1)%n]
		if (a.Y > p.Y) != (b.Y > p.Y) {
			if x := crossX(a, b, p.Y); x <= p.X {
				in = !in
			}
		}
	}
	return in
}

// crossX returns the x where edge ab crosses the horizontal line at y.
func crossX(a, b geom.Vec2, y float64) float64 {
	return a.X + (y-a.Y)*(b.X-a.X)/(b.Y-a.Y)
}

// boundaryDist returns the distance from p to the boundary.
func (q *polygon) boundaryDist(p geom.Vec2) float64 {
	best := math.Inf(1)
	for k := range q.segs {
		best = min(best, q.segs[k].dist2(p.X, p.Y))
	}
	return math.Sqrt(best)
}

// dist returns the distance from p to the region (0 inside or on the
// boundary).
func (q *polygon) dist(p geom.Vec2) float64 {
	if q.contains(p) {
		return 0
	}
	return q.boundaryDist(p)
}

// mitreDist returns max(0, max_k signed distance of p from edge k's line):
// for a convex polygon, the distance that grows with sharp (mitred)
// corners, whose level sets are the polygon offset outward with its
// corners kept.
func (q *polygon) mitreDist(p geom.Vec2) float64 {
	m := 0.0
	for k := range q.nx {
		m = max(m, q.nx[k]*p.X+q.ny[k]*p.Y-q.nc[k])
	}
	return m
}

// mitreOffset returns the convex polygon offset outward by r with mitred
// corners: vertex k moves along the sum of its edges' normals, by
// r/(1 + n₁·n₂) times it.
func (q *polygon) mitreOffset(r float64) geom.Ring {
	n := len(q.pts)
	out := make(geom.Ring, n)
	for k := range q.pts {
		j := (k + n - 1) % n
		ax, ay, bx, by := q.nx[j], q.ny[j], q.nx[k], q.ny[k]
		f := r / (1 + ax*bx + ay*by)
		out[k] = geom.Vec2{X: q.pts[k].X + f*(ax+bx), Y: q.pts[k].Y + f*(ay+by)}
	}
	return out
}
