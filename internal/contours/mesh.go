package contours

import (
	"cmp"
	"errors"
	"fmt"
	"math"
	"slices"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// Errors about the mesh handed to [Trace], wrapped in a [*MeshError].
var (
	// ErrTriangleList: the triangle index list length is not a multiple of 3.
	ErrTriangleList = errors.New("contours: triangle index list length is not a multiple of 3")
	// ErrIndex: a triangle names a vertex that does not exist.
	ErrIndex = errors.New("contours: vertex index out of range")
	// ErrDegenerate: a triangle names the same vertex twice.
	ErrDegenerate = errors.New("contours: triangle repeats a vertex")
	// ErrNonFinite: a vertex used by a triangle has a NaN or infinite
	// coordinate.
	ErrNonFinite = errors.New("contours: vertex coordinate is not finite")
	// ErrNonManifold: an edge is shared by more than two triangles, so a
	// contour crossing it could continue into more than one.
	ErrNonManifold = errors.New("contours: edge shared by more than two triangles")
)

// MeshError reports the first problem found in a mesh, with the triangle
// and vertex indices involved. Err is one of the sentinels above.
type MeshError struct {
	Triangle int // index of the offending triangle, or -1
	Vertex   int // index of the offending vertex, or -1
	Err      error
	detail   string
}

func (e *MeshError) Error() string {
	s := e.Err.Error()
	if e.Triangle >= 0 {
		s += fmt.Sprintf(": triangle %d", e.Triangle)
	}
	if e.Vertex >= 0 {
		s += fmt.Sprintf(": vertex %d", e.Vertex)
	}
	if e.detail != "" {
		s += ": " + e.detail
	}
	return s
}

// Unwrap returns the sentinel error.
func (e *MeshError) Unwrap() error { return e.Err }

// mesh is a triangle mesh prepared for tracing: the usable triangles and,
// for every half-edge h (triangle h/3, from corner h%3 to the next), the
// half-edge of the neighbouring triangle across it, or -1 on the boundary.
type mesh struct {
	v    []geom.Vec3
	t    []int32
	tris []int32 // usable triangles, ascending
	twin []int32
	zlo  float64 // elevation range of the vertices of usable triangles
	zhi  float64 // (zlo > zhi when there are none)
}

// next returns the half-edge after h in its triangle.
func next(h int32) int32 {
	if h%3 == 2 {
		return h - 2
	}
	return h + 1
}

// prepare checks m and builds its edge table. In strict mode the first
// problem is returned as a *MeshError; otherwise unusable triangles (bad
// indices, repeated vertices, non-finite corners) are left out and edges
// shared by more than two triangles are treated as boundary edges.
//
// Cost: O(V + T) time and memory, plus a sort of the edges at each vertex.
func prepare(m geom.TriMesh, strict bool) (*mesh, error) {
	nt := len(m.T) / 3
	if len(m.T)%3 != 0 {
		if strict {
			return nil, &MeshError{Triangle: -1, Vertex: -1, Err: ErrTriangleList,
				detail: fmt.Sprintf("%d indices", len(m.T))}
		}
	}
	if len(m.V) > math.MaxInt32 || len(m.T) > math.MaxInt32 {
		return nil, &MeshError{Triangle: -1, Vertex: -1, Err: ErrIndex,
			detail: fmt.Sprintf("mesh too large: %d vertices, %d triangles", len(m.V), nt)}
	}
	pm := &mesh{v: m.V, t: m.T[:3*nt], zlo: math.Inf(1), zhi: math.Inf(-1)}
	nv := int32(len(m.V))
	pm.tris = make([]int32, 0, nt)
	for t := range nt {
		c := m.T[3*t : 3*t+3]
		ok := true
		for k, i := range c {
			if i < 0 || i >= nv {
				if strict {
					return nil, &MeshError{Triangle: t, Vertex: -1, Err: ErrIndex,
						detail: fmt.Sprintf("corner %d is %d, want 0 to %d", k, i, nv-1)}
				}
				ok = false
				break
			}
		}
		if !ok {
			continue
		}
		if c[0] == c[1] || c[1] == c[2] || c[0] == c[2] {
			if strict {
				return nil, &MeshError{Triangle: t, Vertex: -1, Err: ErrDegenerate,
					detail: fmt.Sprintf("corners %d, %d, %d", c[0], c[1], c[2])}
			}
			continue
		}
		for _, i := range c {
			if !m.V[i].IsFinite() {
				if strict {
					p := m.V[i]
					return nil, &MeshError{Triangle: t, Vertex: int(i), Err: ErrNonFinite,
						detail: fmt.Sprintf("(%g, %g, %g)", p.X, p.Y, p.Z)}
				}
				ok = false
				break
			}
		}
		if !ok {
			continue
		}
		for _, i := range c {
			z := m.V[i].Z
			pm.zlo = math.Min(pm.zlo, z)
			pm.zhi = math.Max(pm.zhi, z)
		}
		pm.tris = append(pm.tris, int32(t))
	}
	if err := pm.buildTwins(strict); err != nil {
		return nil, err
	}
	return pm, nil
}

// buildTwins pairs the half-edges of usable triangles that join the same two
// vertices (in either direction, so a mesh with some triangles wound the
// wrong way still links up). Half-edges are grouped by their lower vertex
// in a counting sort, then each group is sorted by the upper vertex.
func (pm *mesh) buildTwins(strict bool) error {
	nv := len(pm.v)
	start := make([]int32, nv+1)
	for _, t := range pm.tris {
		for k := int32(0); k < 3; k++ {
			h := 3*t + k
			a, b := pm.t[h], pm.t[next(h)]
			start[min(a, b)+1]++
		}
	}
	for i := 1; i <= nv; i++ {
		start[i] += start[i-1]
	}
	list := make([]int32, 3*len(pm.tris))
	fill := slices.Clone(start[:nv])
	for _, t := range pm.tris {
		for k := int32(0); k < 3; k++ {
			h := 3*t + k
			a, b := pm.t[h], pm.t[next(h)]
			lo := min(a, b)
			list[fill[lo]] = h
			fill[lo]++
		}
	}
	fill = nil
	pm.twin = make([]int32, len(pm.t))
	for i := range pm.twin {
		pm.twin[i] = -1
	}
	upper := func(h int32) int32 { return max(pm.t[h], pm.t[next(h)]) }
	for v := range nv {
		g := list[start[v]:start[v+1]]
		if len(g) > 1 {
			slices.SortFunc(g, func(x, y int32) int {
				if c := cmp.Compare(upper(x), upper(y)); c != 0 {
					return c
				}
				return cmp.Compare(x, y)
			})
		}
		for i := 0; i < len(g); {
			j := i + 1
			for j < len(g) && upper(g[j]) == upper(g[i]) {
				j++
			}
			switch j - i {
			case 1: // boundary edge
			case 2:
				pm.twin[g[i]], pm.twin[g[i+1]] = g[i+1], g[i]
			default:
				if strict {
					return &MeshError{Triangle: int(g[i] / 3), Vertex: -1, Err: ErrNonManifold,
						detail: fmt.Sprintf("edge %d-%d is used by %d triangles", v, upper(g[i]), j-i)}
				}
			}
			i = j
		}
	}
	return nil
}
