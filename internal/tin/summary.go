package tin

import (
	"math"
	"slices"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// Summary describes a built surface. Lengths are metres, areas square
// metres.
type Summary struct {
	InputPoints        int // survey points given to Build
	BreaklineVertices  int // breakline vertices given to Build
	Vertices           int // vertices of the (trimmed) surface
	Triangles          int // triangles of the (trimmed) surface
	HullVertices       int // vertices on the outer boundary (collinear ones included)
	Pieces             int // connected pieces of the surface (edge-connected)
	DuplicateGroups    int // groups of inputs sharing a plan position
	DuplicatesMerged   int // inputs merged into another (points removed)
	DuplicateConflicts int // groups whose elevations spread more than the conflict tolerance
	Breaklines         int // breaklines given
	BoundaryRings      int // boundary polygons given
	ConstraintSegments int // constrained edges in the triangulation
	ConstraintSplits   int // splits of constraints at crossings and at vertices on them
	TrimmedTriangles   int // triangles removed by the boundary and by MaxEdgeM
	PlanAreaM2         float64
	SurfaceAreaM2      float64 // 3-D (developed) area
	ZMinM, ZMaxM       float64 // elevation range of the surface's vertices
	LongestEdges       []Edge  // the longest edges, longest first (a hint of survey gaps)
}

// Edge is an edge of the surface with its plan length, in metres.
type Edge struct {
	A, B    geom.Vec3
	LengthM float64
	Mid     geom.Vec2
}

// longestEdgesReported is how many of the longest edges Summary lists.
const longestEdgesReported = 5

// Summary returns the surface's summary. Its LongestEdges slice is shared:
// do not modify it.
func (s *Surface) Summary() Summary { return s.summary }

// summarize fills the counts, areas, elevation range and longest edges.
func (s *Surface) summarize(sum *Summary) {
	m := s.mesh
	sum.Vertices = len(m.V)
	sum.Triangles = m.NumTriangles()
	var pa, sa geom.Sum
	for t := range m.NumTriangles() {
		a, b, c := m.Triangle(t)
		pa.Add(geom.PlanArea(a, b, c))
		sa.Add(geom.SurfaceArea(a, b, c))
	}
	sum.PlanAreaM2 = pa.Value()
	sum.SurfaceAreaM2 = sa.Value()
	sum.ZMinM, sum.ZMaxM = math.Inf(1), math.Inf(-1)
	for _, p := range m.V {
		sum.ZMinM = math.Min(sum.ZMinM, p.Z)
		sum.ZMaxM = math.Max(sum.ZMaxM, p.Z)
	}
	// Top edges by squared length; each undirected edge once (from the
	// half-edge with the larger index, or a boundary half-edge).
	type cand struct {
		d2 float64
		e  int32
	}
	var top []cand
	for e := range int32(len(m.T)) {
		if f := s.madj[e]; f >= 0 && f > e {
			continue
		}
		a, b := m.V[m.T[e]], m.V[m.T[next(e)]]
		d2 := geom.Vec2{X: a.X, Y: a.Y}.DistanceSquared(geom.Vec2{X: b.X, Y: b.Y})
		if len(top) == longestEdgesReported && d2 <= top[len(top)-1].d2 {
			continue
		}
		i, _ := slices.BinarySearchFunc(top, d2, func(c cand, d float64) int {
			switch {
			case c.d2 > d:
				return -1
			case c.d2 < d:
				return 1
			}
			return 0
		})
		top = slices.Insert(top, i, cand{d2, e})
		if len(top) > longestEdgesReported {
			top = top[:longestEdgesReported]
		}
	}
	sum.LongestEdges = make([]Edge, len(top))
	for i, c := range top {
		a, b := m.V[m.T[c.e]], m.V[m.T[next(c.e)]]
		sum.LongestEdges[i] = Edge{A: a, B: b, LengthM: math.Sqrt(c.d2), Mid: geom.Vec2{X: (a.X + b.X) / 2, Y: (a.Y + b.Y) / 2}}
	}
}

// loop is a closed boundary of the mesh: counter-clockwise for an outer
// boundary, clockwise around a hole.
type loop struct {
	ring geom.Ring
	vs   []int32
}

// boundaryLoops traces the boundary of mesh m (adjacency madj, -1 on the
// boundary) into closed loops, keeping the interior on the left. At a vertex
// where the surface pinches (two fans touching at one vertex) the next
// boundary edge is found by turning around the vertex inside the current
// fan, so every loop is simple.
func boundaryLoops(m geom.TriMesh, madj []int32) []loop {
	used := make(map[int32]bool)
	var out []loop
	for e0 := range int32(len(m.T)) {
		if madj[e0] >= 0 || used[e0] {
			continue
		}
		var l loop
		e := e0
		for steps := 0; steps <= len(m.T); steps++ {
			used[e] = true
			v := m.T[e]
			l.vs = append(l.vs, v)
			l.ring = append(l.ring, geom.Vec2{X: m.V[v].X, Y: m.V[v].Y})
			// Next boundary half-edge leaving the end of e.
			f := next(e)
			for madj[f] >= 0 {
				f = next(madj[f])
			}
			e = f
			if e == e0 {
				break
			}
		}
		out = append(out, l)
	}
	return out
}

// countPieces returns the number of edge-connected components of m.
func countPieces(m geom.TriMesh, madj []int32) int {
	nt := int32(m.NumTriangles())
	seen := make([]bool, nt)
	var stack []int32
	pieces := 0
	for t0 := range nt {
		if seen[t0] {
			continue
		}
		pieces++
		seen[t0] = true
		stack = append(stack[:0], t0)
		for len(stack) > 0 {
			t := stack[len(stack)-1]
			stack = stack[:len(stack)-1]
			for k := range int32(3) {
				if f := madj[3*t+k]; f >= 0 && !seen[f/3] {
					seen[f/3] = true
					stack = append(stack, f/3)
				}
			}
		}
	}
	return pieces
}
