package tin

import (
	"cmp"
	"math"
	"slices"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/robust"
)

// validateAreaRelTol is the relative tolerance between the sum of the
// triangle areas and the area enclosed by the boundary loops. The two are
// equal in exact arithmetic; in floating point each is a sum of n terms
// with relative error about n·2^-53, so 1e-9 covers 1e6 triangles with a
// wide margin while catching any missing or overlapping triangle bigger
// than a billionth of the surface.
const validateAreaRelTol = 1e-9

// Validate checks the surface's invariants and returns the first broken one
// (wrapping [ErrInvalid]), or nil:
//
//  1. triangle indices are in range and distinct;
//  2. every triangle is strictly counter-clockwise (exact orientation);
//  3. every directed edge appears once and every undirected edge in at most
//     two triangles (a 2-manifold), and the adjacency is symmetric and
//     agrees with the triangles;
//  4. the triangle areas add up to the area enclosed by the boundary loops;
//  5. for a surface from Build: every vertex is used, every unconstrained
//     interior edge of the full triangulation is locally Delaunay under the
//     exact incircle test (so it is the constrained Delaunay
//     triangulation), and every recorded constraint is an edge flagged
//     constrained.
//
// Cost: O(n log n); it allocates about 24 bytes per edge.
func (s *Surface) Validate() error {
	if err := checkMesh(s.mesh, s.madj, "mesh"); err != nil {
		return err
	}
	if !s.walk {
		return nil
	}
	full := geom.TriMesh{V: s.v, T: s.tri}
	if s.fullOf != nil {
		if err := checkMesh(full, s.adj, "full triangulation"); err != nil {
			return err
		}
	}
	used := make([]bool, len(s.v))
	for _, v := range s.tri {
		used[v] = true
	}
	for i, u := range used {
		if !u {
			return invalidf("vertex %d (%g, %g) is not in any triangle", i, s.v[i].X, s.v[i].Y)
		}
	}
	if s.delaunay {
		for e := range int32(len(s.tri)) {
			f := s.adj[e]
			if f < e || (s.flags != nil && s.flags[e]&flagConstrained != 0) {
				continue
			}
			a, b, c := s.tri[e], s.tri[next(e)], s.tri[prev(e)]
			d := s.tri[prev(f)]
			if robust.InCircle(s.xy(a), s.xy(b), s.xy(c), s.xy(d)) > 0 {
				return invalidf("edge %d–%d is not locally Delaunay: vertex %d is inside the circle of triangle %d", a, b, d, e/3)
			}
		}
	}
	if len(s.cons) > 0 {
		type dedge struct {
			key uint64
			e   int32
		}
		des := make([]dedge, len(s.tri))
		for e := range int32(len(s.tri)) {
			des[e] = dedge{uint64(s.tri[e])<<32 | uint64(s.tri[next(e)]), e}
		}
		slices.SortFunc(des, func(a, b dedge) int { return cmp.Compare(a.key, b.key) })
		for k := range s.cons {
			key := uint64(k[0])<<32 | uint64(k[1])
			i, ok := slices.BinarySearchFunc(des, key, func(d dedge, k uint64) int { return cmp.Compare(d.key, k) })
			if !ok {
				key = uint64(k[1])<<32 | uint64(k[0])
				i, ok = slices.BinarySearchFunc(des, key, func(d dedge, k uint64) int { return cmp.Compare(d.key, k) })
			}
			if !ok {
				return invalidf("constraint %d–%d is not an edge", k[0], k[1])
			}
			if s.flags[des[i].e]&flagConstrained == 0 {
				return invalidf("constraint %d–%d is not flagged constrained", k[0], k[1])
			}
		}
	}
	return nil
}

// checkMesh checks invariants 1–4 for mesh m with adjacency adj.
func checkMesh(m geom.TriMesh, adj []int32, what string) error {
	if len(m.T)%3 != 0 {
		return invalidf("%s: %d triangle indices is not a multiple of 3", what, len(m.T))
	}
	if len(adj) != len(m.T) {
		return invalidf("%s: adjacency has %d entries for %d half-edges", what, len(adj), len(m.T))
	}
	nv := int32(len(m.V))
	nt := int32(len(m.T) / 3)
	if nt == 0 {
		return invalidf("%s: no triangles", what)
	}
	var area geom.Sum
	for t := range nt {
		a, b, c := m.T[3*t], m.T[3*t+1], m.T[3*t+2]
		if a < 0 || a >= nv || b < 0 || b >= nv || c < 0 || c >= nv {
			return invalidf("%s: triangle %d has a vertex index out of range [0, %d)", what, t, nv)
		}
		if a == b || b == c || a == c {
			return invalidf("%s: triangle %d repeats a vertex (%d, %d, %d)", what, t, a, b, c)
		}
		pa, pb, pc := m.V[a], m.V[b], m.V[c]
		if robust.Orient2D(geom.Vec2{X: pa.X, Y: pa.Y}, geom.Vec2{X: pb.X, Y: pb.Y}, geom.Vec2{X: pc.X, Y: pc.Y}) <= 0 {
			return invalidf("%s: triangle %d (%d, %d, %d) is not counter-clockwise", what, t, a, b, c)
		}
		area.Add(geom.PlanArea(pa, pb, pc))
	}
	// Directed edges, sorted: each once; a boundary half-edge has no
	// reverse; adjacency must pair each half-edge with its reverse.
	keys := make([]uint64, len(m.T))
	for e := range int32(len(m.T)) {
		keys[e] = uint64(m.T[e])<<32 | uint64(m.T[next(e)])
	}
	sorted := slices.Clone(keys)
	slices.Sort(sorted)
	for i := 1; i < len(sorted); i++ {
		if sorted[i] == sorted[i-1] {
			return invalidf("%s: directed edge %d→%d is used twice (overlapping triangles)", what, sorted[i]>>32, sorted[i]&0xffffffff)
		}
	}
	for e := range int32(len(m.T)) {
		a, b := m.T[e], m.T[next(e)]
		_, hasRev := slices.BinarySearch(sorted, uint64(b)<<32|uint64(a))
		f := adj[e]
		switch {
		case f < 0 && hasRev:
			return invalidf("%s: half-edge %d (%d→%d) has a reverse but no twin", what, e, a, b)
		case f < 0:
			continue
		case f >= int32(len(m.T)):
			return invalidf("%s: half-edge %d has twin %d out of range", what, e, f)
		case adj[f] != e:
			return invalidf("%s: adjacency is not symmetric at half-edge %d (twin %d, whose twin is %d)", what, e, f, adj[f])
		case m.T[f] != b || m.T[next(f)] != a:
			return invalidf("%s: half-edge %d (%d→%d) and its twin %d (%d→%d) are not reversed", what, e, a, b, f, m.T[f], m.T[next(f)])
		}
	}
	// Area enclosed by the boundary loops.
	var enclosed geom.Sum
	for _, l := range boundaryLoops(m, adj) {
		enclosed.Add(l.ring.Area())
	}
	ta, la := area.Value(), enclosed.Value()
	if math.Abs(ta-la) > validateAreaRelTol*math.Max(math.Abs(ta), math.Abs(la)) {
		return invalidf("%s: triangle areas sum to %.12g m² but the boundary encloses %.12g m²", what, ta, la)
	}
	return nil
}
