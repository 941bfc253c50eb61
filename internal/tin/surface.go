package tin

import (
	"fmt"
	"math"
	"sync"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/robust"
)

// Surface is a triangulated ground surface (a TIN) in the local frame,
// metres. It is immutable once built and safe for concurrent queries.
//
// A surface from [Build] keeps two triangulations: the full constrained
// Delaunay triangulation of every vertex over their convex hull, on which
// points are located, and the trimmed surface (the triangles left after
// boundary and edge-length trimming), which is what [Surface.Mesh] returns
// and what every query answers about. Without trimming they are the same
// arrays.
type Surface struct {
	// Full triangulation (convex, no ghost triangles): vertex v, triangles
	// tri, twin half-edges adj (-1 on the hull), constraint flags (nil
	// without constraints).
	v     []geom.Vec3
	tri   []int32
	adj   []int32
	flags []uint8

	// Trimmed surface. meshOf maps a full triangle to its mesh index (-1
	// when trimmed away) and fullOf back; both are nil when nothing was
	// trimmed (the identity).
	mesh   geom.TriMesh
	madj   []int32
	meshOf []int32
	fullOf []int32
	src    []int32 // per mesh vertex: input index (see Source), -1 if none
	nPts   int32   // number of survey points given to Build

	walk     bool // locate by walking the full triangulation (else buckets)
	grid     startGrid
	buckets  bucketGrid
	delaunay bool // built here: unconstrained edges are locally Delaunay
	cons     map[conKey]conRec

	hull     geom.Ring
	bounds   geom.Box
	warnings []Warning
	summary  Summary
}

// Build triangulates survey points pts (local-frame metres; never modified)
// into a constrained Delaunay TIN, as configured by opt:
//
//  1. Duplicate plan positions (closer than opt.MergeTolM) are merged by
//     opt.Duplicates; a group whose elevations spread more than the
//     conflict tolerance is an error under [DupError] and a [Warning]
//     otherwise.
//  2. The merged points are triangulated (Delaunay, exact predicates).
//  3. Breakline vertices are TIN vertices with the breakline's elevations
//     (they take precedence over survey points at the same position) and
//     breakline segments are constrained edges, split where they cross
//     each other or pass through a vertex. A breakline vertex farther than
//     opt.MergeTolM outside the convex hull of the survey points is an
//     error ([ErrBreaklineOutside]).
//  4. Boundary polygons, clipped to the hull, become constrained edges
//     (their vertices take elevations interpolated from the surface), and
//     triangles outside every polygon are removed.
//  5. With opt.MaxEdgeM > 0, triangles on the outer boundary that have an
//     unconstrained edge longer than that are removed, repeatedly, inwards;
//     a triangle never on the boundary is never removed.
//
// Errors: [ErrTooFewPoints], [ErrCollinear], [ErrTooManyPoints], a
// [*PointError] for non-finite coordinates, [*DuplicateError],
// [*BreaklineError], [*BoundaryError], [*OptionError], [ErrEmptySurface].
//
// Cost: O(n log n) expected time for n points in practice (spatial-order
// insertion; about 0.7 s of CPU for 1e6 points on the bench machine) and
// about 112 bytes of memory per point (DESIGN.md).
func Build(pts []geom.Vec3, opt Options) (*Surface, error) {
	if err := opt.check(); err != nil {
		return nil, err
	}
	in := &input{pts: pts}
	nbl := 0
	for _, bl := range opt.Breaklines {
		nbl += len(bl.Pts)
	}
	if len(pts)+nbl > MaxPoints {
		return nil, fmt.Errorf("%w: %d points and breakline vertices (limit %d)", ErrTooManyPoints, len(pts)+nbl, MaxPoints)
	}
	for i, p := range pts {
		if !p.IsFinite() {
			return nil, &PointError{Index: i, P: p, Err: ErrNonFinite}
		}
		if !coordOK(p.X) || !coordOK(p.Y) {
			return nil, &PointError{Index: i, P: p, Err: ErrCoordinateRange}
		}
	}
	for li, bl := range opt.Breaklines {
		if len(bl.Pts) < 2 {
			return nil, &BreaklineError{Index: li, Name: bl.Name, Vertex: -1, Err: fmt.Errorf("%w: %d vertices, want at least 2", ErrBreakline, len(bl.Pts))}
		}
		for k, p := range bl.Pts {
			if !p.IsFinite() {
				return nil, &BreaklineError{Index: li, Name: bl.Name, Vertex: k, Err: ErrNonFinite}
			}
			if !coordOK(p.X) || !coordOK(p.Y) {
				return nil, &BreaklineError{Index: li, Name: bl.Name, Vertex: k, Err: ErrCoordinateRange}
			}
		}
	}
	rings := make([]ring, len(opt.Boundary))
	for ri, r := range opt.Boundary {
		var err error
		if rings[ri], err = checkRing(ri, r); err != nil {
			return nil, err
		}
	}
	if nbl > 0 {
		in.bl = make([]geom.Vec3, 0, nbl)
		in.blLine = make([]int32, 0, nbl)
		hull := convexHull(pts)
		for li, bl := range opt.Breaklines {
			in.blNames = append(in.blNames, bl.Name)
			for k, p := range bl.Pts {
				if d := outsideDistance(hull, geom.Vec2{X: p.X, Y: p.Y}); d > opt.MergeTolM {
					return nil, &BreaklineError{Index: li, Name: bl.Name, Vertex: k, DistM: d, Err: ErrBreaklineOutside}
				}
				in.bl = append(in.bl, p)
				in.blLine = append(in.blLine, int32(li))
			}
		}
	}

	// Room for the vertices constraints add, so that the arrays are not
	// reallocated (doubled) for a few: crossings of breaklines (a guess: two
	// per segment), ring vertices, and crossings of ring edges with the hull
	// (at most two per edge). More is fine; the arrays then grow.
	extra := 64
	for _, bl := range opt.Breaklines {
		extra += 2 * len(bl.Pts)
	}
	for _, r := range rings {
		extra += 3 * len(r.pts)
	}
	pr, err := prepare(in, &opt, extra)
	if err != nil {
		return nil, err
	}
	n := len(pr.v)
	if n < 3 {
		return nil, ErrTooFewPoints
	}
	b := &builder{v: pr.v}
	b.tri = make([]int32, 0, 6*(n+extra))
	b.adj = make([]int32, 0, 6*(n+extra))
	seed := -1
	for k := 2; k < n; k++ {
		if robust.Orient2D(b.xy(0), b.xy(1), b.xy(int32(k))) != 0 {
			seed = k
			break
		}
	}
	if seed < 0 {
		return nil, ErrCollinear
	}
	b.init(0, 1, int32(seed))
	for k := 2; k < n; k++ {
		if k != seed {
			b.insert(int32(k))
		}
	}

	s := &Surface{nPts: int32(len(pts)), delaunay: true, walk: true}
	s.warnings = append(s.warnings, pr.warnings...)
	sum := Summary{
		InputPoints:        len(pts),
		BreaklineVertices:  nbl,
		DuplicateGroups:    pr.groups,
		DuplicatesMerged:   pr.merged,
		DuplicateConflicts: pr.conflicts,
		Breaklines:         len(opt.Breaklines),
		BoundaryRings:      len(opt.Boundary),
	}

	var keep []bool
	if len(opt.Breaklines) > 0 || len(rings) > 0 {
		c := newConstrainer(b, in.blNames, opt.conflictTol())
		var segs []segment
		off := 0
		for li, bl := range opt.Breaklines {
			for k := 1; k < len(bl.Pts); k++ {
				a, z := pr.blv[off+k-1], pr.blv[off+k]
				if a != z {
					segs = append(segs, segment{a, z, flagBreakline, int32(li)})
				}
			}
			off += len(bl.Pts)
		}
		if err := c.insertAll(segs); err != nil {
			return nil, err
		}
		if len(rings) > 0 {
			hull, err := insertBoundaries(b, c, rings)
			if err != nil {
				return nil, err
			}
			hullXY := make([][2]geom.Vec2, len(hull))
			for k, h := range hull {
				hullXY[k] = [2]geom.Vec2{b.xy(h[0]), b.xy(h[1])}
			}
			keep = classifyInside(b, rings, hullXY)
		}
		s.warnings = append(s.warnings, c.warnings...)
		if c.warnCount > maxWarningsPerKind {
			s.warnings = append(s.warnings, Warning{Msg: fmt.Sprintf("%d more breakline crossing warnings not listed", c.warnCount-maxWarningsPerKind)})
		}
		s.cons = c.recs
		for _, r := range c.recs {
			if r.kind&flagUser != 0 {
				sum.ConstraintSegments++
			}
		}
		sum.ConstraintSplits = c.splits
	}
	src := make([]int32, len(b.v))
	copy(src, pr.src)
	for i := len(pr.src); i < len(src); i++ {
		src[i] = -1
	}
	s.src = src
	s.v = b.v
	s.compact(b, keep)
	if opt.MaxEdgeM > 0 {
		s.trimLongEdges(opt.MaxEdgeM)
	}
	if err := s.finish(&sum); err != nil {
		return nil, err
	}
	return s, nil
}

// compact removes the ghost triangles from the builder's arrays (in place)
// and stores the full triangulation, with keep (indexed by builder
// triangle, nil for all) turned into the trimmed mesh's triangle map.
func (s *Surface) compact(b *builder, keep []bool) {
	nt := int32(len(b.tri) / 3)
	newIdx := make([]int32, nt)
	cnt := int32(0)
	for t := range nt {
		if b.isGhost(t) {
			newIdx[t] = -1
			continue
		}
		newIdx[t] = cnt
		cnt++
	}
	for t := range nt {
		d := newIdx[t]
		if d < 0 {
			continue
		}
		for k := range int32(3) {
			f := b.adj[3*t+k]
			nf := int32(-1)
			if g := newIdx[f/3]; g >= 0 {
				nf = 3*g + f%3
			}
			b.tri[3*d+k] = b.tri[3*t+k]
			b.adj[3*d+k] = nf
			if b.flags != nil {
				b.flags[3*d+k] = b.flags[3*t+k]
			}
		}
	}
	s.tri = b.tri[: 3*cnt : 3*cnt]
	s.adj = b.adj[: 3*cnt : 3*cnt]
	if b.flags != nil {
		s.flags = b.flags[: 3*cnt : 3*cnt]
	}
	if keep != nil {
		s.meshOf = make([]int32, cnt)
		for t := range nt {
			if d := newIdx[t]; d >= 0 {
				if keep[t] {
					s.meshOf[d] = 0
				} else {
					s.meshOf[d] = -1
				}
			}
		}
	}
}

// kept reports whether full triangle t is part of the trimmed surface
// (before finish numbers the mesh).
func (s *Surface) kept(t int32) bool { return s.meshOf == nil || s.meshOf[t] >= 0 }

// trimLongEdges peels boundary triangles with an unconstrained edge longer
// than maxM, inwards, until none is left on the boundary.
func (s *Surface) trimLongEdges(maxM float64) {
	nt := int32(len(s.tri) / 3)
	if s.meshOf == nil {
		s.meshOf = make([]int32, nt)
	}
	max2 := maxM * maxM
	long := func(t int32) bool {
		for k := range int32(3) {
			e := 3*t + k
			if s.flags != nil && s.flags[e]&flagUser != 0 {
				continue // breakline and boundary edges are deliberate
			}
			a, c := s.v[s.tri[e]], s.v[s.tri[next(e)]]
			if (geom.Vec2{X: a.X, Y: a.Y}).DistanceSquared(geom.Vec2{X: c.X, Y: c.Y}) > max2 {
				return true
			}
		}
		return false
	}
	onBoundary := func(t int32) bool {
		for k := range int32(3) {
			f := s.adj[3*t+k]
			if f < 0 || !s.kept(f/3) {
				return true
			}
		}
		return false
	}
	var queue []int32
	for t := range nt {
		if s.kept(t) && onBoundary(t) {
			queue = append(queue, t)
		}
	}
	for len(queue) > 0 {
		t := queue[len(queue)-1]
		queue = queue[:len(queue)-1]
		if !s.kept(t) || !long(t) {
			continue
		}
		s.meshOf[t] = -1
		for k := range int32(3) {
			if f := s.adj[3*t+k]; f >= 0 && s.kept(f/3) {
				queue = append(queue, f/3)
			}
		}
	}
}

// finish numbers the trimmed mesh, builds the point locator, the hull and
// the summary.
func (s *Surface) finish(sum *Summary) error {
	nt := int32(len(s.tri) / 3)
	allKept := true
	if s.meshOf != nil {
		for _, m := range s.meshOf {
			if m < 0 {
				allKept = false
				break
			}
		}
	}
	if allKept {
		s.meshOf = nil
		s.mesh = geom.TriMesh{V: s.v, T: s.tri}
		s.madj = s.adj
	} else {
		vmap := make([]int32, len(s.v))
		for i := range vmap {
			vmap[i] = -1
		}
		var mv []geom.Vec3
		var msrc []int32
		var mt, fullOf []int32
		cnt := int32(0)
		for t := range nt {
			if s.meshOf[t] < 0 {
				continue
			}
			s.meshOf[t] = cnt
			fullOf = append(fullOf, t)
			cnt++
			for k := range int32(3) {
				vi := s.tri[3*t+k]
				if vmap[vi] < 0 {
					vmap[vi] = int32(len(mv))
					mv = append(mv, s.v[vi])
					msrc = append(msrc, s.src[vi])
				}
				mt = append(mt, vmap[vi])
			}
		}
		if cnt == 0 {
			return ErrEmptySurface
		}
		madj := make([]int32, len(mt))
		for m, t := range fullOf {
			for k := range int32(3) {
				f := s.adj[3*t+k]
				madj[3*int32(m)+k] = -1
				if f >= 0 && s.meshOf[f/3] >= 0 {
					madj[3*int32(m)+k] = 3*s.meshOf[f/3] + f%3
				}
			}
		}
		sum.TrimmedTriangles = int(nt) - int(cnt)
		s.mesh = geom.TriMesh{V: mv, T: mt}
		s.madj = madj
		s.fullOf = fullOf
		s.src = msrc
	}
	// The start grid and the summary read the finished arrays only: build
	// them concurrently (results do not depend on scheduling).
	s.computeBounds()
	var wg sync.WaitGroup
	wg.Add(1)
	go func() {
		defer wg.Done()
		s.grid = newStartGrid(s)
	}()
	s.finishCommon(sum)
	wg.Wait()
	return nil
}

// computeBounds sets the bounding box of the mesh's vertices.
func (s *Surface) computeBounds() {
	s.bounds = geom.EmptyBox()
	for _, p := range s.mesh.V {
		s.bounds = s.bounds.Extend(geom.Vec2{X: p.X, Y: p.Y})
	}
}

// finishCommon computes the hull and summary from the mesh (bounds first).
func (s *Surface) finishCommon(sum *Summary) {
	loops := boundaryLoops(s.mesh, s.madj)
	pieces := 1 // a triangulation of a convex hull is connected
	if s.fullOf != nil || !s.walk {
		pieces = countPieces(s.mesh, s.madj)
	}
	best, bestA := -1, math.Inf(-1)
	for i, l := range loops {
		if a := l.ring.Area(); a > 0 && a > bestA {
			best, bestA = i, a
		}
	}
	if best >= 0 {
		s.hull = loops[best].ring
		sum.HullVertices = len(s.hull)
	}
	if pieces > 1 {
		s.warnings = append(s.warnings, Warning{
			Msg: fmt.Sprintf("the surface has %d separate pieces; its hull is the outer boundary of the largest (%.1f m²)", pieces, bestA),
			At:  s.hull.Bounds().Center(),
		})
	}
	sum.Pieces = pieces
	s.summarize(sum)
	s.summary = *sum
}

// Mesh returns the vertices and counter-clockwise triangles of the surface
// (after trimming). Vertices are in the triangulation's insertion order, not
// input order (see [Surface.Source]); every vertex is used by a triangle.
// The slices are shared with the surface: do not modify them.
func (s *Surface) Mesh() geom.TriMesh { return s.mesh }

// Source returns the index in Build's input points of the point that mesh
// vertex v came from (the first of its duplicate group), and ok=false for a
// vertex made by a breakline or boundary, or for a surface from [FromMesh]
// (where v is its own index and ok is true).
func (s *Surface) Source(v int) (i int, ok bool) {
	if v < 0 || v >= len(s.src) {
		return -1, false
	}
	if x := s.src[v]; x >= 0 && x < s.nPts {
		return int(x), true
	}
	return -1, false
}

// Warnings returns the non-fatal data issues found while building the
// surface, in the order found. The slice is shared: do not modify it.
func (s *Surface) Warnings() []Warning { return s.warnings }

// Bounds returns the bounding box of the surface's vertices (the empty box
// for the zero Surface).
func (s *Surface) Bounds() geom.Box {
	if s.mesh.V == nil {
		return geom.EmptyBox()
	}
	return s.bounds
}

// Hull returns the outer boundary of the surface, counter-clockwise, open
// (the first vertex is not repeated). Without trimming it is the convex
// hull, collinear boundary vertices included. If trimming split the surface
// into several pieces it is the outer boundary of the largest, and
// [Surface.Warnings] says so. Holes are not part of it. Do not modify it.
func (s *Surface) Hull() geom.Ring { return s.hull }

// IsConstrained reports whether edge k (0, 1 or 2: from corner k to corner
// k+1 mod 3) of mesh triangle tri is a constrained edge: part of a breakline
// or of a boundary polygon. It is false for indices out of range.
func (s *Surface) IsConstrained(tri, edge int) bool {
	if s.flags == nil || tri < 0 || tri >= s.mesh.NumTriangles() || edge < 0 || edge > 2 {
		return false
	}
	t := int32(tri)
	if s.fullOf != nil {
		t = s.fullOf[tri]
	}
	return s.flags[3*t+int32(edge)]&flagUser != 0
}
