package cutfill

import (
	"github.com/dugout-estimating/dugout/internal/geom"
)

// boundaryTriangles checks the rings and cuts each into counter-clockwise
// triangles by ear clipping. The region is the union of the rings, which
// must be simple, must not cross, touch or nest in one another; either
// winding is accepted. Topology (simplicity, crossings, ears) is decided with
// the exact [orient].
func boundaryTriangles(rings []geom.Ring) ([][3]geom.Vec2, error) {
	clean := make([]ringPts, len(rings))
	for i, r := range rings {
		c, err := cleanRing(i, r)
		if err != nil {
			return nil, err
		}
		clean[i] = c
	}
	if err := checkCrossings(clean); err != nil {
		return nil, err
	}
	if err := checkNesting(clean); err != nil {
		return nil, err
	}
	var tris [][3]geom.Vec2
	for i, c := range clean {
		var err error
		tris, err = earClip(i, c, tris)
		if err != nil {
			return nil, err
		}
	}
	return tris, nil
}

// ringPts is a ring without repeated consecutive vertices, counter-clockwise,
// with each vertex's index in the caller's ring.
type ringPts struct {
	p   []geom.Vec2
	idx []int
	rev bool // reversed from the caller's winding
}

// edgeStart returns the caller's index of the first vertex, in the caller's
// winding, of edge k (from p[k] to p[k+1]).
func (c ringPts) edgeStart(k int) int {
	if c.rev {
		return c.idx[(k+1)%len(c.idx)]
	}
	return c.idx[k]
}

func cleanRing(ri int, r geom.Ring) (ringPts, error) {
	var c ringPts
	for j, p := range r {
		if !p.IsFinite() {
			return c, &BoundaryError{Ring: ri, Vertex: j, Other: -1, Err: ErrNonFinite}
		}
		if len(c.p) > 0 && c.p[len(c.p)-1] == p {
			continue
		}
		c.p = append(c.p, p)
		c.idx = append(c.idx, j)
	}
	for len(c.p) > 1 && c.p[0] == c.p[len(c.p)-1] { // closed rings repeat the first vertex
		c.p, c.idx = c.p[:len(c.p)-1], c.idx[:len(c.idx)-1]
	}
	if len(c.p) < 3 {
		return c, &BoundaryError{Ring: ri, Vertex: -1, Other: -1, Err: ErrRingTooSmall}
	}
	a := geom.Ring(c.p).Area()
	if a == 0 {
		return c, &BoundaryError{Ring: ri, Vertex: -1, Other: -1, Err: ErrRingTooSmall}
	}
	if a < 0 {
		c.rev = true
		for i, j := 0, len(c.p)-1; i < j; i, j = i+1, j-1 {
			c.p[i], c.p[j] = c.p[j], c.p[i]
			c.idx[i], c.idx[j] = c.idx[j], c.idx[i]
		}
	}
	return c, nil
}

// edgeRef names edge k of ring r (from vertex k to vertex k+1).
type edgeRef struct{ r, k int }

// checkCrossings reports the first pair of edges that cross or touch, other
// than consecutive edges of one ring at their shared vertex. A consecutive
// pair that doubles back on itself (a spike) is reported too.
func checkCrossings(rings []ringPts) error {
	var edges []edgeRef
	var boxes []geom.Box
	for ri, c := range rings {
		for k := range c.p {
			a, b := c.p[k], c.p[(k+1)%len(c.p)]
			edges = append(edges, edgeRef{ri, k})
			boxes = append(boxes, geom.EmptyBox().Extend(a).Extend(b))
		}
	}
	g := newBucketGrid(boxes)
	q := newBucketQuery(&g)
	seg := func(e edgeRef) (geom.Vec2, geom.Vec2) {
		c := rings[e.r]
		return c.p[e.k], c.p[(e.k+1)%len(c.p)]
	}
	for i, e := range edges {
		a, b := seg(e)
		for _, j := range q.find(&g, boxes[i]) {
			if int(j) <= i || !boxes[i].Intersects(boxes[j]) {
				continue
			}
			f := edges[j]
			c, d := seg(f)
			n := len(rings[e.r].p)
			if f.r == e.r && (f.k == (e.k+1)%n || e.k == (f.k+1)%n) {
				// Consecutive edges share one vertex; they only fail when
				// they overlap, i.e. the ring turns back on itself.
				p, m, s, shared := a, b, d, (e.k+1)%n
				if e.k == (f.k+1)%n {
					p, m, s, shared = c, a, b, e.k
				}
				if orient(p, m, s) == 0 && m.Sub(p).Dot(s.Sub(m)) < 0 {
					return &BoundaryError{Ring: e.r, Vertex: rings[e.r].idx[shared], Other: -1, Err: ErrRingCrossing}
				}
				continue
			}
			if segmentsMeet(a, b, c, d) {
				other := f.r
				if other == e.r {
					other = -1
				}
				return &BoundaryError{Ring: e.r, Vertex: rings[e.r].edgeStart(e.k), Other: other, Err: ErrRingCrossing}
			}
		}
	}
	return nil
}

// segmentsMeet reports whether the closed segments ab and cd share a point,
// exactly.
func segmentsMeet(a, b, c, d geom.Vec2) bool {
	o1, o2 := orient(a, b, c), orient(a, b, d)
	o3, o4 := orient(c, d, a), orient(c, d, b)
	if o1*o2 < 0 && o3*o4 < 0 {
		return true
	}
	return (o1 == 0 && onSegment(a, b, c)) || (o2 == 0 && onSegment(a, b, d)) ||
		(o3 == 0 && onSegment(c, d, a)) || (o4 == 0 && onSegment(c, d, b))
}

// onSegment reports whether p, known to be collinear with ab, lies on the
// closed segment ab.
func onSegment(a, b, p geom.Vec2) bool {
	return min(a.X, b.X) <= p.X && p.X <= max(a.X, b.X) &&
		min(a.Y, b.Y) <= p.Y && p.Y <= max(a.Y, b.Y)
}

// checkNesting reports a ring that lies inside another. The rings are known
// not to cross or touch, so one vertex decides.
func checkNesting(rings []ringPts) error {
	boxes := make([]geom.Box, len(rings))
	for i, c := range rings {
		boxes[i] = geom.BoxOf(c.p)
	}
	for i := range rings {
		for j := range rings {
			if i == j || !boxes[i].Intersects(boxes[j]) {
				continue
			}
			if insideRing(rings[i].p, rings[j].p[0]) {
				return &BoundaryError{Ring: j, Vertex: -1, Other: i, Err: ErrRingNested}
			}
		}
	}
	return nil
}

// insideRing reports whether p lies strictly inside the counter-clockwise
// ring r (p is known not to lie on it), by the winding number with exact
// orientation tests.
func insideRing(r []geom.Vec2, p geom.Vec2) bool {
	w := 0
	for i := range r {
		a, b := r[i], r[(i+1)%len(r)]
		if a.Y <= p.Y {
			if b.Y > p.Y && orient(a, b, p) > 0 {
				w++
			}
		} else if b.Y <= p.Y && orient(a, b, p) < 0 {
			w--
		}
	}
	return w != 0
}

// earClip appends to tris the triangles of the simple counter-clockwise
// ring c, by ear clipping (Meisters, "Polygons have ears", Amer. Math.
// Monthly 82, 1975: every simple polygon with more than three vertices has
// two non-overlapping ears). Collinear vertices are dropped without a
// triangle. Cost O(n²) for n vertices.
func earClip(ri int, c ringPts, tris [][3]geom.Vec2) ([][3]geom.Vec2, error) {
	n := len(c.p)
	prev := make([]int, n)
	next := make([]int, n)
	for i := range n {
		prev[i] = (i + n - 1) % n
		next[i] = (i + 1) % n
	}
	left := n
	i := 0
	for misses := 0; left > 3; {
		p, q := prev[i], next[i]
		a, b, d := c.p[p], c.p[i], c.p[q]
		o := orient(a, b, d)
		ear := o == 0
		if o > 0 {
			ear = true
			for k := next[q]; k != p; k = next[k] {
				x := c.p[k]
				if x == a || x == d {
					continue
				}
				if orient(a, b, x) >= 0 && orient(b, d, x) >= 0 && orient(d, a, x) >= 0 {
					ear = false
					break
				}
			}
		}
		if !ear {
			i = q
			misses++
			if misses > left {
				// No ear: impossible for a simple ring, which was checked.
				return tris, &BoundaryError{Ring: ri, Vertex: c.idx[i], Other: -1, Err: ErrRingCrossing}
			}
			continue
		}
		if o > 0 {
			tris = append(tris, [3]geom.Vec2{a, b, d})
		}
		next[p], prev[q] = q, p
		left--
		misses = 0
		i = p
	}
	a, b, d := c.p[prev[i]], c.p[i], c.p[next[i]]
	if orient(a, b, d) > 0 {
		tris = append(tris, [3]geom.Vec2{a, b, d})
	}
	return tris, nil
}
