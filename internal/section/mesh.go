package section

import (
	"cmp"
	"math"
	"slices"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// meshTri is a mesh triangle prepared for section cutting: corners wound
// counter-clockwise in plan, its bounding box and index.
type meshTri struct {
	p   [3]geom.Vec3
	box geom.Box
	idx int
}

// usableTriangles returns the triangles of m that can be cut: indices in
// range, corners finite and a nonzero plan area. Clockwise triangles are
// turned round.
func usableTriangles(m geom.TriMesh) []meshTri {
	nt := len(m.T) / 3
	out := make([]meshTri, 0, nt)
	for t := range nt {
		i, j, k := m.T[3*t], m.T[3*t+1], m.T[3*t+2]
		n := int32(len(m.V))
		if i < 0 || j < 0 || k < 0 || i >= n || j >= n || k >= n {
			continue
		}
		a, b, c := m.V[i], m.V[j], m.V[k]
		if !a.IsFinite() || !b.IsFinite() || !c.IsFinite() {
			continue
		}
		ar := geom.PlanArea(a, b, c)
		if ar == 0 {
			continue
		}
		if ar < 0 {
			b, c = c, b
		}
		box := geom.EmptyBox().Extend(a.XY()).Extend(b.XY()).Extend(c.XY())
		out = append(out, meshTri{p: [3]geom.Vec3{a, b, c}, box: box, idx: t})
	}
	return out
}

// span returns the parameter interval [t0, t1] ⊂ [0, 1] of the segment
// a + t·(b − a) that lies in the triangle (Cyrus–Beck clipping against its
// three edges), and whether it is not empty.
func (tr *meshTri) span(a, d geom.Vec2) (t0, t1 float64, ok bool) {
	t0, t1 = 0, 1
	for e := range 3 {
		u, v := tr.p[e].XY(), tr.p[(e+1)%3].XY()
		ev := v.Sub(u)
		s0 := ev.Cross(a.Sub(u)) // ≥ 0 inside
		ds := ev.Cross(d)
		switch {
		case ds == 0:
			if s0 < 0 {
				return 0, 0, false
			}
		case ds > 0: // entering across this edge
			t0 = math.Max(t0, -s0/ds)
		default:
			t1 = math.Min(t1, -s0/ds)
		}
		if t0 > t1 {
			return 0, 0, false
		}
	}
	return t0, t1, true
}

// z returns the height of the triangle's plane at q, by barycentric
// weights.
func (tr *meshTri) z(q geom.Vec2) float64 {
	a, b, c := tr.p[0], tr.p[1], tr.p[2]
	qa := geom.Vec3{X: q.X, Y: q.Y}
	d := geom.PlanArea(a, b, c)
	wa := geom.PlanArea(qa, b, c) / d
	wb := geom.PlanArea(a, qa, c) / d
	return wa*a.Z + wb*b.Z + (1-wa-wb)*c.Z
}

// breakpoint is a sample of one segment at parameter t, from triangle tri.
type breakpoint struct {
	t, z float64
	tri  int
}

// AlongMesh returns the profile of mesh m along path with exact
// breakpoints: a sample at every path vertex and at every point where the
// path crosses a mesh edge or vertex, so that straight lines between
// consecutive samples are the mesh itself (no sampling error). chainage (m)
// is increasing and z (m) holds the mesh height, NaN at path vertices
// outside the mesh and at one point inside each stretch where the path runs
// outside it (so that a drawn line breaks there).
//
// Samples closer than a nanometre of chainage are merged. Triangles with an
// index out of range, a non-finite corner or no plan area are ignored (the
// mesh should have passed tin's Validate); either winding is accepted.
// A path with fewer than two vertices, or with a non-finite vertex, gives
// nil slices. Where triangles overlap, the lowest-numbered one wins. Cost:
// O(S·T) box tests for S path segments and T triangles.
func AlongMesh(path geom.Polyline, m geom.TriMesh) (chainage []float64, z []float64) {
	vc, err := pathChainage(path)
	if err != nil {
		return nil, nil
	}
	tris := usableTriangles(m)
	var bps []breakpoint
	var spans [][2]float64
	emit := func(c, v float64) {
		if n := len(chainage); n > 0 && c-chainage[n-1] <= stationMergeM {
			if math.IsNaN(z[n-1]) && !math.IsNaN(v) {
				z[n-1] = v // a value found at a vertex beats "outside"
			}
			return
		}
		chainage = append(chainage, c)
		z = append(z, v)
	}
	for i := 0; i+1 < len(path); i++ {
		a, b := path[i], path[i+1]
		l := vc[i+1] - vc[i]
		if l == 0 {
			continue
		}
		d := b.Sub(a)
		segBox := geom.EmptyBox().Extend(a).Extend(b)
		bps, spans = bps[:0], spans[:0]
		for k := range tris {
			tr := &tris[k]
			if !tr.box.Intersects(segBox) {
				continue
			}
			t0, t1, ok := tr.span(a, d)
			if !ok {
				continue
			}
			bps = append(bps,
				breakpoint{t: t0, z: tr.z(a.Lerp(b, t0)), tri: tr.idx},
				breakpoint{t: t1, z: tr.z(a.Lerp(b, t1)), tri: tr.idx})
			spans = append(spans, [2]float64{t0, t1})
		}
		// Stretches outside the mesh: gaps between the union of spans.
		tol := stationMergeM / l
		slices.SortFunc(spans, func(p, q [2]float64) int { return cmp.Compare(p[0], q[0]) })
		covered := -1.0 // end of the union so far; -1: nothing yet
		gapAt := func(lo, hi float64) {
			if hi-lo > tol {
				bps = append(bps, breakpoint{t: (lo + hi) / 2, z: math.NaN(), tri: -1})
			}
		}
		for _, s := range spans {
			if covered < 0 {
				if s[0] > tol { // the vertex itself is outside
					bps = append(bps, breakpoint{t: 0, z: math.NaN(), tri: -1})
				}
				covered = s[1]
				continue
			}
			if s[0] > covered+tol {
				gapAt(covered, s[0])
			}
			covered = math.Max(covered, s[1])
		}
		switch {
		case covered < 0:
			bps = append(bps, breakpoint{t: 0, z: math.NaN(), tri: -1}, breakpoint{t: 1, z: math.NaN(), tri: -1})
		case covered < 1-tol:
			bps = append(bps, breakpoint{t: 1, z: math.NaN(), tri: -1})
		}
		// Values before NaNs at equal t, then lower triangle index first.
		slices.SortFunc(bps, func(p, q breakpoint) int {
			if c := cmp.Compare(p.t, q.t); c != 0 {
				return c
			}
			pn, qn := math.IsNaN(p.z), math.IsNaN(q.z)
			if pn != qn {
				if pn {
					return 1
				}
				return -1
			}
			return cmp.Compare(p.tri, q.tri)
		})
		for _, bp := range bps {
			t := math.Min(math.Max(bp.t, 0), 1)
			emit(vc[i]+t*l, bp.z)
		}
	}
	return chainage, z
}
