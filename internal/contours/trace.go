package contours

import (
	"errors"
	"math"
	"runtime"
	"slices"
	"sync"
	"sync/atomic"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// Line is one contour line: a polyline at elevation Level (m) in the local
// frame. When Closed is set it is a ring and its last point is a copy of its
// first; otherwise both of its ends lie on the mesh boundary. Higher ground
// lies to the left of the direction of travel. Index marks index contours.
type Line struct {
	Level  float64
	Pts    []geom.Vec2
	Closed bool
	Index  bool
}

// Trace returns the contour lines of m at the levels chosen by o (see
// [Levels]; the elevation range is that of the mesh), ordered by level, then
// by their points compared lexicographically (x, then y). A ring starts at
// its lowest-x (then lowest-y) point; an open line starts at the boundary
// end from which the higher ground is on its left. Pts of different lines
// may share one backing array, each with its capacity capped at its length.
//
// m must be a mesh as [geom.TriMesh] describes; Trace returns a *[MeshError]
// for a triangle list whose length is not a multiple of 3, vertex indices
// out of range, a triangle repeating a vertex, non-finite coordinates on a
// vertex in use, or an edge shared by more than two triangles that a level
// crosses (the edge table is built only where contours run, so a
// non-manifold edge elsewhere, which cannot change the lines, goes
// unreported). It returns the errors of [Levels] for bad options. An empty
// mesh gives no lines.
//
// With o.Smooth, every corner of a line that lies inside a mesh edge is cut
// once, Chaikin-style (Chaikin, "An algorithm for high-speed curve
// generation", Computer Graphics and Image Processing 3, 1974), by two points
// at a quarter of the neighbouring segments, or an eighth or a sixteenth if
// needed for the guarantee below; corners at mesh vertices and line ends are
// kept. A cut is made only when the new segment crosses that mesh edge
// strictly inside it and the surface along it stays within half an interval
// of the level, so a smoothed line stays within the two triangles around
// each corner, never reaches the neighbouring levels, and never crosses any
// other line of its own level (each triangle holds at most one segment per
// level) or itself.
//
// Cost: O(V + T) to check the mesh and bucket the triangles by level, an
// edge table over the triangles that some level crosses, then O(S) for S
// output segments; the passes over the mesh and the levels run in parallel on
// up to GOMAXPROCS goroutines, with results independent of scheduling.
func Trace(m geom.TriMesh, o Options) ([]Line, error) {
	if err := o.check(); err != nil {
		return nil, err
	}
	pm, err := newMesh(m, true)
	if err != nil || pm.numTriangles() == 0 {
		return nil, err
	}
	// Levels come from the range of all finite vertices, so that the
	// triangles can be checked in the same pass that buckets them. Only when
	// that range is unusable (no finite vertex, too many levels, no level at
	// all) are the triangles checked first and the range taken from their
	// corners alone.
	var ls levelSet
	if pm.zlo <= pm.zhi {
		ls, err = levels(pm.zlo, pm.zhi, o)
	}
	var tooMany *TooManyLevelsError
	if pm.zlo > pm.zhi || errors.As(err, &tooMany) || (err == nil && len(ls.z) == 0) {
		if err := pm.listTriangles(true); err != nil || len(pm.tris) == 0 {
			return nil, err
		}
		if ls, err = levels(pm.zlo, pm.zhi, o); err != nil || len(ls.z) == 0 {
			return nil, err
		}
	} else if err != nil {
		return nil, err
	}
	start, bucket, crossing, err := pm.buckets(ls.z)
	if err != nil {
		return nil, err
	}
	pm.compact(crossing)
	if err := pm.buildTwins(true); err != nil {
		return nil, err
	}
	every := o.indexEvery()
	out := make([][]Line, len(ls.z))
	var nextLevel atomic.Int64
	work := func(tr *tracer) {
		for {
			i := int(nextLevel.Add(1) - 1)
			if i >= len(ls.z) {
				return
			}
			lv := ls.z[i]
			var sm *smoother
			if o.Smooth {
				sm = &smoother{m: pm, level: lv, band: smoothBand * o.IntervalM}
			}
			out[i] = tr.level(bucket[start[i]:start[i+1]], lv, isIndex(ls.k[i], every), sm)
		}
	}
	workers := min(runtime.GOMAXPROCS(0), len(ls.z), 1+len(bucket)/minSegmentsPerWorker)
	if workers <= 1 {
		work(newTracer(pm))
	} else {
		var wg sync.WaitGroup
		for range workers {
			wg.Go(func() { work(newTracer(pm)) })
		}
		wg.Wait()
	}
	var n int
	for _, l := range out {
		n += len(l)
	}
	lines := make([]Line, 0, n)
	for _, l := range out {
		lines = append(lines, l...)
	}
	return lines, nil
}

// minSegmentsPerWorker is the amount of work (triangle crossings) below
// which another goroutine does not pay for its start-up and its visit
// marks; chosen by benchmark, not critical.
const minSegmentsPerWorker = 20000

// TraceLevel returns the contour lines of m at one level (m), in the order
// and form described for [Trace], without smoothing and with Index unset.
//
// Unlike Trace it does not reject bad meshes: triangles with indices out of
// range, a repeated vertex or a non-finite corner are skipped, and edges
// shared by more than two triangles are treated as boundary edges. A
// non-finite level gives no lines.
func TraceLevel(m geom.TriMesh, level float64) []Line {
	if math.IsNaN(level) || math.IsInf(level, 0) {
		return nil
	}
	pm, err := prepare(m, false)
	if err != nil || len(pm.tris) == 0 {
		return nil
	}
	if !(pm.zlo < level && level <= pm.zhi) {
		return nil
	}
	cand := make([]int32, 0, len(pm.tris)/8)
	for _, t := range pm.tris {
		if pm.crosses(t, level) {
			cand = append(cand, t)
		}
	}
	pm.compact(cand)
	if pm.buildTwins(false) != nil {
		return nil
	}
	for i := range cand {
		cand[i] = int32(i) // the compact numbers of the candidates
	}
	return newTracer(pm).level(cand, level, false, nil)
}

// crosses reports whether triangle t has corners on both sides of level.
func (pm *mesh) crosses(t int32, level float64) bool {
	c := pm.t[3*t : 3*t+3]
	a, b, d := pm.z[c[0]] >= level, pm.z[c[1]] >= level, pm.z[c[2]] >= level
	return a != b || b != d
}

// buckets checks every triangle (as [mesh.checkTriangle] in strict mode,
// returning the first problem), lists in crossing the triangles crossing any
// level (one corner below, z < level, and one at or above), ascending, and
// lists for each level i the triangles crossing it, by their index in
// crossing (their compact number, see [mesh.compact]), in
// bucket[start[i]:start[i+1]], ascending. A triangle spans a contiguous run
// of levels, those in (zmin, zmax] of its corners.
func (pm *mesh) buckets(lv []float64) (start, bucket, crossing []int32, err error) {
	n := len(lv)
	li := newLevelIndex(lv)
	// In parallel over chunks of triangles: check each triangle, find its
	// run of levels and count it; turn the counts into each chunk's write
	// offsets; then fill, so that every bucket lists its triangles in
	// ascending order. The first chunk holding an error holds the first bad
	// triangle.
	type run struct{ t, lo, hi int32 } // triangle t crosses levels [lo, hi)
	nt := pm.numTriangles()
	ranges := split(nt, workersFor(nt))
	cnt := make([][]int32, len(ranges))
	cross := make([][]run, len(ranges))
	errs := make([]error, len(ranges))
	parallel(len(ranges), func(w int) {
		c := make([]int32, n)
		x := make([]run, 0, (ranges[w][1]-ranges[w][0])/4+16) // a guess; on a fine TIN about a quarter cross
		for t := ranges[w][0]; t < ranges[w][1]; t++ {
			k := pm.t[3*t : 3*t+3 : 3*t+3]
			i0, i1, i2 := k[0], k[1], k[2]
			// The common case inline; checkTriangle names the problem.
			if uint32(i0) >= pm.nv || uint32(i1) >= pm.nv || uint32(i2) >= pm.nv ||
				i0 == i1 || i1 == i2 || i0 == i2 || !pm.allFinite {
				if _, err := pm.checkTriangle(t, true); err != nil {
					errs[w] = err
					return
				}
			}
			z0, z1, z2 := pm.z[i0], pm.z[i1], pm.z[i2]
			zmin, zmax := z0, z0
			if z1 < zmin {
				zmin = z1
			} else if z1 > zmax {
				zmax = z1
			}
			if z2 < zmin {
				zmin = z2
			} else if z2 > zmax {
				zmax = z2
			}
			lo := li.upper(zmin)
			if lo == n || lv[lo] > zmax {
				continue // no level in (zmin, zmax]
			}
			hi := li.upper(zmax)
			x = append(x, run{int32(t), int32(lo), int32(hi)})
			for i := lo; i < hi; i++ {
				c[i]++
			}
		}
		cnt[w], cross[w] = c, x
	})
	for _, err := range errs {
		if err != nil {
			return nil, nil, nil, err
		}
	}
	nc := 0
	for _, x := range cross {
		nc += len(x)
	}
	crossing = make([]int32, 0, nc)
	for _, x := range cross {
		for _, r := range x {
			crossing = append(crossing, r.t)
		}
	}
	start = make([]int32, n+1)
	var off int32
	for i := range n {
		start[i] = off
		for _, c := range cnt {
			k := c[i]
			c[i] = off
			off += k
		}
	}
	start[n] = off
	bucket = make([]int32, off)
	base := make([]int32, len(cross)) // compact number of each chunk's first crossing triangle
	for w := 1; w < len(cross); w++ {
		base[w] = base[w-1] + int32(len(cross[w-1]))
	}
	parallel(len(ranges), func(w int) {
		fill := cnt[w]
		for j, r := range cross[w] {
			c := base[w] + int32(j)
			for i := r.lo; i < r.hi; i++ {
				bucket[fill[i]] = c
				fill[i]++
			}
		}
	})
	return start, bucket, crossing, nil
}

// levelIndex finds where an elevation falls among ascending levels.
type levelIndex struct {
	lv  []float64
	l0  float64 // lv[0]
	inv float64 // 1 / mean spacing, 0 for a single level
}

func newLevelIndex(lv []float64) levelIndex {
	li := levelIndex{lv: lv, l0: lv[0]}
	if n := len(lv); n > 1 && lv[n-1] > lv[0] {
		li.inv = float64(n-1) / (lv[n-1] - lv[0])
	}
	return li
}

// upper returns the number of levels <= z: an estimate on the (nearly)
// uniform spacing, corrected by exact comparisons with the level values.
func (li levelIndex) upper(z float64) int {
	lv := li.lv
	n := len(lv)
	if !(z >= li.l0) {
		return 0
	}
	e := n
	if f := (z - li.l0) * li.inv; f < float64(n) {
		e = int(f) + 1
	}
	for e > n || (e > 0 && lv[e-1] > z) {
		e--
	}
	for e < n && lv[e] <= z {
		e++
	}
	return e
}

// point is a traced contour point: its position and the half-edge it lies
// on, or -1 when it is exactly a mesh vertex.
type point struct {
	p geom.Vec2
	h int32
}

// tracer holds one goroutine's visit marks and scratch buffers.
type tracer struct {
	m     *mesh
	mark  []uint32 // mark[t] == stamp: triangle t already traced at this level
	stamp uint32
	fwd   []point
	back  []point
	seq   []point
	set   lineSet // the cleaned lines of the current level
	alt   lineSet // the same after cancelling ridges
}

func newTracer(pm *mesh) *tracer {
	return &tracer{m: pm, mark: make([]uint32, len(pm.ct)/3)}
}

// cross returns the point where half-edge h crosses level. Its two
// vertices must lie on opposite sides (one z < level, one z >= level). The
// point is interpolated from the lower vertex towards the upper one, so
// both half-edges of an edge give bit-identical points, and an upper vertex
// exactly at the level is returned as itself.
func (pm *mesh) cross(h int32, level float64) point {
	p, q := pm.v[pm.ct[h]], pm.v[pm.ct[next(h)]]
	if p.Z >= level {
		p, q = q, p
	}
	if q.Z == level {
		return point{geom.Vec2{X: q.X, Y: q.Y}, -1}
	}
	s := (level - p.Z) / (q.Z - p.Z)
	return point{geom.Vec2{X: p.X + float64(s*(q.X-p.X)), Y: p.Y + float64(s*(q.Y-p.Y))}, h}
}

// ends returns the two crossing half-edges of compact triangle t (which
// must cross level) in the order that keeps the higher ground on the left
// for a counter-clockwise triangle: the segment runs from in to out.
func (pm *mesh) ends(t int32, level float64) (in, out int32) {
	c := pm.ct[3*t : 3*t+3]
	s0, s1, s2 := pm.z[c[0]] >= level, pm.z[c[1]] >= level, pm.z[c[2]] >= level
	var o int32 // the corner alone on its side
	var up bool
	switch {
	case s0 == s1:
		o, up = 2, s2
	case s0 == s2:
		o, up = 1, s1
	default:
		o, up = 0, s0
	}
	// Half-edge 3t+o leaves corner o, half-edge 3t+(o+2)%3 enters it. With
	// corner o alone above, walking from its outgoing edge to its incoming
	// edge keeps it on the left.
	a, b := 3*t+o, 3*t+(o+2)%3
	if up {
		return a, b
	}
	return b, a
}

// other returns the crossing half-edge of the triangle of g other than g.
func (pm *mesh) other(g int32, level float64) int32 {
	h1 := next(g)
	h2 := next(h1)
	// Exactly two of the triangle's half-edges cross, g among them.
	if (pm.z[pm.ct[h1]] >= level) != (pm.z[pm.ct[h2]] >= level) {
		return h1
	}
	return h2
}

// level traces every contour through the compact triangles tris (each
// crossing the level, ascending) and returns the cleaned, canonical lines in
// order.
func (tr *tracer) level(tris []int32, level float64, index bool, sm *smoother) []Line {
	tr.stamp++
	if tr.stamp == 0 { // wrapped: clear the marks
		clear(tr.mark)
		tr.stamp = 1
	}
	pm := tr.m
	tr.set.reset()
	for _, t := range tris {
		if tr.mark[t] == tr.stamp {
			continue
		}
		tr.mark[t] = tr.stamp
		in, out := pm.ends(t, level)
		fwd := append(tr.fwd[:0], pm.cross(in, level), pm.cross(out, level))
		closed := false
		// Walk forward through the triangle across each exit edge until the
		// boundary or back to t. Invariant: cur is the exit half-edge of the
		// last triangle walked, and its point is the last one in fwd.
		for cur := out; ; {
			g := pm.twin(cur)
			if g < 0 {
				break
			}
			u := g / 3
			if u == t {
				closed = true // fwd ends with the point of in's edge again
				break
			}
			if tr.mark[u] == tr.stamp {
				break // cannot happen on a consistent edge table
			}
			tr.mark[u] = tr.stamp
			cur = pm.other(g, level)
			fwd = append(fwd, pm.cross(cur, level))
		}
		tr.fwd = fwd
		back := tr.back[:0]
		if !closed {
			for cur := in; ; {
				g := pm.twin(cur)
				if g < 0 {
					break
				}
				u := g / 3
				if tr.mark[u] == tr.stamp {
					break
				}
				tr.mark[u] = tr.stamp
				cur = pm.other(g, level)
				back = append(back, pm.cross(cur, level))
			}
		}
		tr.back = back
		seq := tr.seq[:0]
		for i := len(back) - 1; i >= 0; i-- {
			seq = append(seq, back[i])
		}
		seq = append(seq, fwd...)
		tr.seq = seq
		tr.set.add(clean(seq, closed), closed)
	}
	set := &tr.set
	if set.ridges() {
		set = tr.set.cancelRidges(&tr.alt)
	}
	var lines []Line
	var buf []geom.Vec2
	ends := []int{0} // line i is buf[ends[i]:ends[i+1]]
	for i := range set.closed {
		seq := set.pts[set.ends[i]:set.ends[i+1]]
		closed := set.closed[i]
		if sm != nil {
			buf = sm.smooth(buf, seq, closed)
		} else {
			for _, q := range seq {
				buf = append(buf, q.p)
			}
		}
		if closed {
			buf = append(buf, buf[ends[len(ends)-1]])
		}
		ends = append(ends, len(buf))
		lines = append(lines, Line{Level: level, Closed: closed, Index: index})
	}
	// Slice the lines out of the final buffer (append may have moved it).
	for i := range lines {
		lines[i].Pts = buf[ends[i]:ends[i+1]:ends[i+1]]
	}
	for i := range lines {
		if lines[i].Closed {
			canonicalRing(lines[i].Pts)
		}
	}
	slices.SortFunc(lines, compareLines)
	return lines
}

// clean removes repeated points and spikes (a point followed by a detour
// that comes straight back: A B A becomes A) from a traced sequence, in
// place. For a ring (whose last point repeats its first) it also reduces
// across the join and returns the ring without its closing point. It
// returns nil when fewer than two points (open) or three points (ring)
// remain.
func clean(seq []point, closed bool) []point {
	n := len(seq)
	if closed {
		n-- // the closing point is a copy of the first
	}
	out := seq[:0]
	for _, q := range seq[:n] {
		k := len(out)
		if k > 0 && out[k-1].p == q.p {
			continue
		}
		if k > 1 && out[k-2].p == q.p {
			out = out[:k-1]
			continue
		}
		out = append(out, q)
	}
	if closed {
		for {
			k := len(out)
			switch {
			case k >= 2 && out[k-1].p == out[0].p:
				out = out[:k-1]
			case k >= 3 && out[k-2].p == out[0].p:
				out = out[:k-2]
			case k >= 3 && out[k-1].p == out[1].p:
				out = out[1 : k-1]
			default:
				if k < 3 {
					return nil
				}
				return out
			}
		}
	}
	if len(out) < 2 {
		return nil
	}
	return out
}

// canonicalRing rotates the open ring pts[:n-1] (pts[n-1] == pts[0]) in
// place to start at its least point (x, then y); among equal least points
// (a ring touching itself there) the rotation giving the least sequence
// wins. The closing point is rewritten.
func canonicalRing(pts []geom.Vec2) {
	n := len(pts) - 1
	r := pts[:n]
	best := 0
	for i := 1; i < n; i++ {
		c := comparePt(r[i], r[best])
		if c < 0 || (c == 0 && compareRotations(r, i, best) < 0) {
			best = i
		}
	}
	if best != 0 {
		slices.Reverse(r[:best])
		slices.Reverse(r[best:])
		slices.Reverse(r)
	}
	pts[n] = pts[0]
}

func compareRotations(r []geom.Vec2, i, j int) int {
	n := len(r)
	for k := range n {
		if c := comparePt(r[(i+k)%n], r[(j+k)%n]); c != 0 {
			return c
		}
	}
	return 0
}

func comparePt(a, b geom.Vec2) int {
	switch {
	case a.X < b.X:
		return -1
	case a.X > b.X:
		return 1
	case a.Y < b.Y:
		return -1
	case a.Y > b.Y:
		return 1
	}
	return 0
}

// compareLines orders the lines of one level by their points, then by
// length, then open before closed.
func compareLines(a, b Line) int {
	for i := range min(len(a.Pts), len(b.Pts)) {
		if c := comparePt(a.Pts[i], b.Pts[i]); c != 0 {
			return c
		}
	}
	switch {
	case len(a.Pts) != len(b.Pts):
		return len(a.Pts) - len(b.Pts)
	case a.Closed == b.Closed:
		return 0
	case b.Closed:
		return -1
	}
	return 1
}
