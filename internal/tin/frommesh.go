package tin

import (
	"cmp"
	"fmt"
	"slices"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/robust"
)

// FromMesh wraps an existing triangle mesh (e.g. a surface read from
// LandXML) as a Surface, so that it can be queried like a built one. m is
// copied, not modified. Clockwise triangles are reversed and triangles of
// zero plan area are dropped, each with a warning; vertex indices out of
// range, non-finite vertices, an edge shared by more than two triangles, or
// two triangles overlapping along an edge (the same directed edge twice
// once oriented) are errors ([*MeshError]). The mesh need not be convex,
// connected or Delaunay; [Surface.Validate] checks its manifoldness but not
// the Delaunay property. Vertices keep their indices ([Surface.Source] of
// vertex v is v).
func FromMesh(m geom.TriMesh) (*Surface, error) {
	if len(m.T)%3 != 0 {
		return nil, &MeshError{Triangle: -1, Vertex: -1, Msg: fmt.Sprintf("%d triangle indices is not a multiple of 3", len(m.T))}
	}
	if len(m.V) > MaxPoints || len(m.T)/3 > 3*MaxPoints {
		return nil, fmt.Errorf("%w: %d vertices, %d triangles", ErrTooManyPoints, len(m.V), len(m.T)/3)
	}
	for i, p := range m.V {
		if !p.IsFinite() {
			return nil, &MeshError{Triangle: -1, Vertex: i, Msg: fmt.Sprintf("non-finite coordinate (%g, %g, %g)", p.X, p.Y, p.Z)}
		}
		if !coordOK(p.X) || !coordOK(p.Y) {
			return nil, &MeshError{Triangle: -1, Vertex: i, Msg: fmt.Sprintf("coordinate (%g, %g) outside [%g, %g] m", p.X, p.Y, MinCoordM, MaxCoordM)}
		}
	}
	nv := int32(len(m.V))
	v := slices.Clone(m.V)
	tri := make([]int32, 0, len(m.T))
	var reversed, dropped int
	var droppedAt geom.Vec2
	xy := func(i int32) geom.Vec2 { return geom.Vec2{X: v[i].X, Y: v[i].Y} }
	for t := 0; t < len(m.T); t += 3 {
		a, b, c := m.T[t], m.T[t+1], m.T[t+2]
		if a < 0 || a >= nv || b < 0 || b >= nv || c < 0 || c >= nv {
			return nil, &MeshError{Triangle: t / 3, Vertex: -1, Msg: fmt.Sprintf("vertex index out of range [0, %d): (%d, %d, %d)", nv, a, b, c)}
		}
		switch robust.Orient2D(xy(a), xy(b), xy(c)) {
		case robust.Zero:
			if dropped == 0 {
				droppedAt = xy(a)
			}
			dropped++
			continue
		case robust.Negative:
			b, c = c, b
			reversed++
		}
		tri = append(tri, a, b, c)
	}
	if len(tri) == 0 {
		return nil, &MeshError{Triangle: -1, Vertex: -1, Msg: "no triangle with non-zero plan area"}
	}
	adj, err := buildAdjacency(tri)
	if err != nil {
		return nil, err
	}
	s := &Surface{
		mesh: geom.TriMesh{V: v, T: tri}, madj: adj,
		v: v, tri: tri, adj: adj,
		src:  make([]int32, len(v)),
		nPts: nv,
	}
	for i := range s.src {
		s.src[i] = int32(i)
	}
	if reversed > 0 {
		s.warnings = append(s.warnings, Warning{Msg: fmt.Sprintf("%d clockwise triangles were reversed", reversed)})
	}
	if dropped > 0 {
		s.warnings = append(s.warnings, Warning{Msg: fmt.Sprintf("%d triangles with zero plan area were dropped", dropped), At: droppedAt})
	}
	s.computeBounds()
	s.buckets = newBucketGrid(s.mesh)
	sum := Summary{InputPoints: len(m.V)}
	s.finishCommon(&sum)
	return s, nil
}

// buildAdjacency pairs each half-edge of the counter-clockwise triangles
// tri with its reverse, or -1 on the boundary. A directed edge used twice
// or an undirected edge in more than two triangles is a [*MeshError].
func buildAdjacency(tri []int32) ([]int32, error) {
	type dedge struct {
		key uint64
		e   int32
	}
	des := make([]dedge, len(tri))
	for e := range int32(len(tri)) {
		des[e] = dedge{uint64(tri[e])<<32 | uint64(tri[next(e)]), e}
	}
	slices.SortFunc(des, func(a, b dedge) int { return cmp.Compare(a.key, b.key) })
	for i := 1; i < len(des); i++ {
		if des[i].key == des[i-1].key {
			a, b := des[i].key>>32, des[i].key&0xffffffff
			return nil, &MeshError{Triangle: int(des[i].e / 3), Vertex: -1,
				Msg: fmt.Sprintf("edge %d–%d is also used, in the same direction, by triangle %d (overlapping or non-manifold)", a, b, des[i-1].e/3)}
		}
	}
	adj := make([]int32, len(tri))
	for e := range int32(len(tri)) {
		a, b := tri[e], tri[next(e)]
		rev := uint64(b)<<32 | uint64(a)
		i, ok := slices.BinarySearchFunc(des, rev, func(d dedge, k uint64) int { return cmp.Compare(d.key, k) })
		if ok {
			adj[e] = des[i].e
		} else {
			adj[e] = -1
		}
	}
	return adj, nil
}
