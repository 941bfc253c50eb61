package cutfill

import (
	"math"
	"runtime"
	"sync"
	"sync/atomic"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// CompareResult is the outcome of [Compare]. CutM3 = ∫(before − after)⁺ and
// FillM3 = ∫(after − before)⁺ (m³), NetM3 = ∫(before − after) = CutM3 −
// FillM3 up to round-off (summed on its own, so it stays accurate when cut
// and fill nearly cancel), AreaM2 the common plan area integrated over (m²),
// and Triangles the number of overlay cells of positive area.
type CompareResult struct {
	CutM3, FillM3, NetM3, AreaM2 float64
	Triangles                    int
}

// Compare overlays two triangulated surfaces of the same site, in the same
// local frame (metres): before, e.g. the ground before digging, and after,
// e.g. the as-built survey. Each overlay cell (triangle of before ∩ triangle
// of after, a convex polygon on which both surfaces are linear) contributes
// the prism volume of their difference, split exactly at the line where the
// difference is zero. The integral runs over the common area of the two
// meshes and, when boundary is not empty, of the union of the boundary
// rings.
//
// Each mesh must be a proper triangulation (triangles meet only along whole
// edges or at vertices and do not overlap, as a TIN built by package tin
// is); overlapping triangles would be counted twice. Triangles are expected
// counter-clockwise in plan; one that is clockwise by more than round-off is
// an error, and one whose orientation is within round-off of zero (a
// degenerate sliver with no area to speak of) is skipped. Boundary rings may
// be concave and wound either way, must each be simple, and must not cross,
// touch or lie inside one another (holes are not supported).
//
// Errors: a [*MeshError] wrapping [ErrBadIndex], [ErrNonFinite] or
// [ErrClockwise]; a [*BoundaryError] wrapping [ErrNonFinite],
// [ErrRingTooSmall], [ErrRingCrossing] or [ErrRingNested]. Meshes with no
// triangles, or that do not overlap, give a zero result.
//
// The clipping is done in floating point, which is fine for a metric result:
// a vertex moved by round-off changes a volume by round-off. The sums are
// compensated and taken in a fixed order (fixed chunks of before's
// triangles, merged in chunk order), so the result does not depend on the
// number of goroutines. Cost: about O(n + m) for meshes of comparable
// triangle size, plus the ear clipping of the boundary, O(k²) for k boundary
// vertices. Neither input is modified.
func Compare(before, after geom.TriMesh, boundary []geom.Ring) (CompareResult, error) {
	return compare(before, after, boundary, runtime.GOMAXPROCS(0))
}

// facet is a triangle prepared for the overlay: its plan corners
// (counter-clockwise), plane and bounding box.
type facet struct {
	t   [3]geom.Vec2
	pl  plane
	box geom.Box
}

// prepareMesh checks m and returns its non-degenerate triangles as facets.
func prepareMesh(name string, m geom.TriMesh) ([]facet, error) {
	for i, v := range m.V {
		if !v.IsFinite() {
			return nil, &MeshError{Mesh: name, Triangle: -1, Vertex: i, Err: ErrNonFinite}
		}
	}
	if len(m.T)%3 != 0 {
		return nil, &MeshError{Mesh: name, Triangle: len(m.T) / 3, Vertex: -1, Err: ErrBadIndex}
	}
	nt := len(m.T) / 3
	out := make([]facet, 0, nt)
	for t := range nt {
		for k := range 3 {
			if v := m.T[3*t+k]; v < 0 || int(v) >= len(m.V) {
				return nil, &MeshError{Mesh: name, Triangle: t, Vertex: int(v), Err: ErrBadIndex}
			}
		}
		a, b, c := m.Triangle(t)
		det, bound := orientFloat(a.XY(), b.XY(), c.XY())
		switch {
		case det < -bound:
			return nil, &MeshError{Mesh: name, Triangle: t, Vertex: -1, Err: ErrClockwise}
		case det <= bound:
			continue // degenerate: its area is within round-off of zero
		}
		f := facet{t: [3]geom.Vec2{a.XY(), b.XY(), c.XY()}, pl: planeOf(a, b, c, det)}
		tmp := cell{n: 3, p: [maxPolyVerts]geom.Vec2{f.t[0], f.t[1], f.t[2]}}
		f.box = tmp.bounds()
		out = append(out, f)
	}
	return out, nil
}

// compareChunk is the number of before-triangles per unit of work. It is
// fixed (not derived from the number of goroutines) so that the order of
// summation, and hence the result, is the same however the work is spread.
const compareChunk = 1024

// partial holds one chunk's compensated sums.
type partial struct {
	cut, fill, net, area geom.Sum
	cells                int
}

func compare(before, after geom.TriMesh, boundary []geom.Ring, workers int) (CompareResult, error) {
	fa, err := prepareMesh("before", before)
	if err != nil {
		return CompareResult{}, err
	}
	fb, err := prepareMesh("after", after)
	if err != nil {
		return CompareResult{}, err
	}
	var clipTris [][3]geom.Vec2
	if len(boundary) > 0 {
		if clipTris, err = boundaryTriangles(boundary); err != nil {
			return CompareResult{}, err
		}
	}
	if len(fa) == 0 || len(fb) == 0 {
		return CompareResult{}, nil
	}

	boxes := make([]geom.Box, len(fb))
	for i := range fb {
		boxes[i] = fb[i].box
	}
	gb := newBucketGrid(boxes)
	var gc bucketGrid
	var clipBoxes []geom.Box
	if clipTris != nil {
		clipBoxes = make([]geom.Box, len(clipTris))
		for i := range clipTris {
			clipBoxes[i] = geom.BoxOf(clipTris[i][:])
		}
		gc = newBucketGrid(clipBoxes)
	}

	chunks := (len(fa) + compareChunk - 1) / compareChunk
	parts := make([]partial, chunks)
	workers = max(1, min(workers, chunks))
	var next atomic.Int64
	var wg sync.WaitGroup
	for range workers {
		wg.Add(1)
		go func() {
			defer wg.Done()
			w := overlayWorker{after: fb, gb: &gb, qb: newBucketQuery(&gb)}
			if clipTris != nil {
				w.clip, w.clipBoxes, w.gc, w.qc = clipTris, clipBoxes, &gc, newBucketQuery(&gc)
			}
			for {
				k := int(next.Add(1) - 1)
				if k >= chunks {
					return
				}
				lo, hi := k*compareChunk, min((k+1)*compareChunk, len(fa))
				for i := lo; i < hi; i++ {
					w.facet(&fa[i], &parts[k])
				}
			}
		}()
	}
	wg.Wait()

	var tot partial
	for k := range parts {
		tot.cut.AddSum(parts[k].cut)
		tot.fill.AddSum(parts[k].fill)
		tot.net.AddSum(parts[k].net)
		tot.area.AddSum(parts[k].area)
		tot.cells += parts[k].cells
	}
	return CompareResult{
		CutM3:     math.Max(0, tot.cut.Value()),
		FillM3:    math.Max(0, tot.fill.Value()),
		NetM3:     tot.net.Value(),
		AreaM2:    math.Max(0, tot.area.Value()),
		Triangles: tot.cells,
	}, nil
}

// overlayWorker is one goroutine's view of the overlay: shared read-only
// inputs and its own scratch space.
type overlayWorker struct {
	after     []facet
	gb        *bucketGrid
	qb        *bucketQuery
	clip      [][3]geom.Vec2
	clipBoxes []geom.Box
	gc        *bucketGrid
	qc        *bucketQuery
	piece     cell
	c, tmp    cell
	f         [maxPolyVerts]float64
}

// facet integrates one before-triangle against everything it overlaps.
func (w *overlayWorker) facet(a *facet, acc *partial) {
	if w.clip == nil {
		w.piece.setTriangle(a.t[0], a.t[1], a.t[2])
		w.pieceAgainstAfter(a, acc)
		return
	}
	for _, j := range w.qc.find(w.gc, a.box) {
		if !a.box.Intersects(w.clipBoxes[j]) {
			continue
		}
		w.piece.setTriangle(a.t[0], a.t[1], a.t[2])
		clipTriangle(&w.piece, &w.clip[j], &w.tmp)
		if w.piece.n >= 3 {
			w.pieceAgainstAfter(a, acc)
		}
	}
}

// pieceAgainstAfter integrates the convex piece w.piece of before-triangle a
// against every after-triangle it overlaps.
func (w *overlayWorker) pieceAgainstAfter(a *facet, acc *partial) {
	pb := w.piece.bounds()
	for _, j := range w.qb.find(w.gb, pb) {
		b := &w.after[j]
		if !pb.Intersects(b.box) {
			continue
		}
		w.c = w.piece
		clipTriangle(&w.c, &b.t, &w.tmp)
		if w.c.n < 3 {
			continue
		}
		w.integrate(a, b, acc)
	}
}

// integrate adds the cell w.c, where before is a's plane and after b's.
func (w *overlayWorker) integrate(a, b *facet, acc *partial) {
	c := &w.c
	for i := 0; i < c.n; i++ {
		w.f[i] = a.pl.at(c.p[i]) - b.pl.at(c.p[i])
	}
	o := c.p[0]
	var cut, fill, net, area float64
	for i := 1; i+1 < c.n; i++ {
		ar := c.p[i].Sub(o).Cross(c.p[i+1].Sub(o)) / 2
		p, n := posNeg(ar, w.f[0], w.f[i], w.f[i+1])
		cut += p
		fill += n
		net += ar * (w.f[0] + w.f[i] + w.f[i+1]) / 3
		area += ar
	}
	if area <= 0 {
		return
	}
	acc.cut.Add(cut)
	acc.fill.Add(fill)
	acc.net.Add(net)
	acc.area.Add(area)
	acc.cells++
}
