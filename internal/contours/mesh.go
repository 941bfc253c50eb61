package contours

import (
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
	// ErrNonManifold: an edge crossed by a contour level is shared by more
	// than two triangles, so the contour could continue into more than one.
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
// half-edge of the neighbouring triangle across it ([mesh.twin]).
type mesh struct {
	v         []geom.Vec3
	z         []float64 // z[i] = v[i].Z, dense for the passes that only compare elevations
	t         []int32
	nv        uint32
	allFinite bool    // every vertex has finite coordinates
	tris      []int32 // usable triangles, ascending (set by listTriangles)
	// The triangles that contours run through get compact numbers 0..n-1
	// (see compact): orig[c] is the mesh triangle of compact triangle c and
	// ct[3c:3c+3] its corners. Tracing works on compact triangles and
	// half-edges only, which keeps its memory dense.
	orig []int32
	ct   []int32
	link []int32 // link[h] = twin(h) + 1 over compact half-edges; zero means "boundary"
	// zlo, zhi: the elevation range of the finite vertices (newMesh) or of
	// the corners of usable triangles (listTriangles); zlo > zhi when empty.
	zlo, zhi float64
}

// twin returns the compact half-edge across compact half-edge h in the
// neighbouring triangle, or -1 when h is on the boundary.
func (pm *mesh) twin(h int32) int32 { return pm.link[h] - 1 }

// next returns the half-edge after h in its triangle.
func next(h int32) int32 {
	if h%3 == 2 {
		return h - 2
	}
	return h + 1
}

// newMesh checks the shape of m and makes one pass over its vertices,
// noting whether all are finite and the elevation range of the finite
// ones. Triangles are checked later, by [mesh.listTriangles] or, in
// [Trace], while they are bucketed.
func newMesh(m geom.TriMesh, strict bool) (*mesh, error) {
	nt := len(m.T) / 3
	if len(m.T)%3 != 0 && strict {
		return nil, &MeshError{Triangle: -1, Vertex: -1, Err: ErrTriangleList,
			detail: fmt.Sprintf("%d indices", len(m.T))}
	}
	if len(m.V) > math.MaxInt32 || len(m.T) > math.MaxInt32 {
		return nil, &MeshError{Triangle: -1, Vertex: -1, Err: ErrIndex,
			detail: fmt.Sprintf("mesh too large: %d vertices, %d triangles", len(m.V), nt)}
	}
	pm := &mesh{v: m.V, t: m.T[:3*nt], nv: uint32(len(m.V)), allFinite: true,
		z: make([]float64, len(m.V)), zlo: math.Inf(1), zhi: math.Inf(-1)}
	for i, p := range m.V {
		pm.z[i] = p.Z
		if !p.IsFinite() {
			pm.allFinite = false
			continue
		}
		if p.Z < pm.zlo {
			pm.zlo = p.Z
		}
		if p.Z > pm.zhi {
			pm.zhi = p.Z
		}
	}
	return pm, nil
}

// prepare checks m and lists its usable triangles, with the elevation range
// of their corners. In strict mode the first problem is returned as a
// *MeshError; otherwise unusable triangles (bad indices, repeated vertices,
// non-finite corners) are left out. The edge table is built afterwards by
// [mesh.buildTwins], over only the triangles that some level crosses.
//
// Cost: O(V + T).
func prepare(m geom.TriMesh, strict bool) (*mesh, error) {
	pm, err := newMesh(m, strict)
	if err != nil {
		return nil, err
	}
	if err := pm.listTriangles(strict); err != nil {
		return nil, err
	}
	return pm, nil
}

// numTriangles returns the number of triangles in pm.t.
func (pm *mesh) numTriangles() int { return len(pm.t) / 3 }

// listTriangles fills pm.tris with the usable triangles and sets pm.zlo and
// pm.zhi to the elevation range of their corners. It runs in contiguous
// chunks; the first chunk holding an error holds the first bad triangle.
func (pm *mesh) listTriangles(strict bool) error {
	type part struct {
		tris     []int32
		zlo, zhi float64
		err      error
	}
	nt := pm.numTriangles()
	ranges := split(nt, workersFor(nt))
	parts := make([]part, len(ranges))
	parallel(len(ranges), func(w int) {
		p := part{tris: make([]int32, 0, ranges[w][1]-ranges[w][0]), zlo: math.Inf(1), zhi: math.Inf(-1)}
		for t := ranges[w][0]; t < ranges[w][1]; t++ {
			ok, err := pm.checkTriangle(t, strict)
			if err != nil {
				p.err = err
				break
			}
			if !ok {
				continue
			}
			c := pm.t[3*t : 3*t+3 : 3*t+3]
			for _, i := range c {
				z := pm.z[i]
				if z < p.zlo {
					p.zlo = z
				}
				if z > p.zhi {
					p.zhi = z
				}
			}
			p.tris = append(p.tris, int32(t))
		}
		parts[w] = p
	})
	pm.zlo, pm.zhi = math.Inf(1), math.Inf(-1)
	n := 0
	for _, p := range parts {
		if p.err != nil {
			return p.err
		}
		n += len(p.tris)
		pm.zlo, pm.zhi = math.Min(pm.zlo, p.zlo), math.Max(pm.zhi, p.zhi)
	}
	if len(parts) == 1 {
		pm.tris = parts[0].tris
		return nil
	}
	pm.tris = make([]int32, 0, n)
	for _, p := range parts {
		pm.tris = append(pm.tris, p.tris...)
	}
	return nil
}

// checkTriangle reports whether triangle t is usable: its corners are
// distinct vertices that exist and have finite coordinates. In strict mode a
// problem is returned as a *MeshError instead.
func (pm *mesh) checkTriangle(t int, strict bool) (bool, error) {
	c := pm.t[3*t : 3*t+3 : 3*t+3]
	i0, i1, i2 := c[0], c[1], c[2]
	nv := pm.nv
	if uint32(i0) >= nv || uint32(i1) >= nv || uint32(i2) >= nv {
		if !strict {
			return false, nil
		}
		k, i := 0, i0
		if uint32(i0) < nv {
			k, i = 1, i1
			if uint32(i1) < nv {
				k, i = 2, i2
			}
		}
		return false, &MeshError{Triangle: t, Vertex: -1, Err: ErrIndex,
			detail: fmt.Sprintf("corner %d is %d, want 0 to %d", k, i, int64(nv)-1)}
	}
	if i0 == i1 || i1 == i2 || i0 == i2 {
		if !strict {
			return false, nil
		}
		return false, &MeshError{Triangle: t, Vertex: -1, Err: ErrDegenerate,
			detail: fmt.Sprintf("corners %d, %d, %d", i0, i1, i2)}
	}
	if !pm.allFinite {
		for _, i := range c {
			if p := pm.v[i]; !p.IsFinite() {
				if !strict {
					return false, nil
				}
				return false, &MeshError{Triangle: t, Vertex: int(i), Err: ErrNonFinite,
					detail: fmt.Sprintf("(%g, %g, %g)", p.X, p.Y, p.Z)}
			}
		}
	}
	return true, nil
}

// compact numbers the triangles tris (ascending mesh triangles) 0..n-1 for
// tracing: it records them in pm.orig and gathers their corners into pm.ct.
func (pm *mesh) compact(tris []int32) {
	pm.orig = tris
	pm.ct = make([]int32, 3*len(tris))
	ranges := split(len(tris), workersFor(len(tris)))
	parallel(len(ranges), func(w int) {
		for c := ranges[w][0]; c < ranges[w][1]; c++ {
			t := tris[c]
			pm.ct[3*c], pm.ct[3*c+1], pm.ct[3*c+2] = pm.t[3*t], pm.t[3*t+1], pm.t[3*t+2]
		}
	})
}

// buildTwins pairs the half-edges of the compact triangles (see compact)
// that join the same two vertices (in either direction, so a mesh with some triangles wound the
// wrong way still links up). A contour crosses from a triangle only into a
// neighbour that crosses the same level, so the compact triangles need only
// be those crossing some level; an edge shared by more than two triangles
// is then found (strict: returned as ErrNonManifold; otherwise treated as
// boundary) whenever a level crosses it. Half-edges are grouped by their lower vertex
// in a counting sort, each entry packing the upper vertex above the
// half-edge number, so that sorting a group (a handful of entries) puts the
// copies of each edge side by side.
func (pm *mesh) buildTwins(strict bool) error {
	nv := len(pm.v)
	t := pm.ct
	nc := int32(len(t) / 3)
	// Counting sort by lower vertex, in parallel over chunks of triangles:
	// each chunk counts its half-edges per vertex, the counts become each
	// chunk's write offsets, and each chunk fills its own slots, so the
	// result is the same as a sequential pass.
	ranges := split(int(nc), workersFor(int(nc)))
	cnt := make([][]int32, len(ranges))
	parallel(len(ranges), func(w int) {
		c := make([]int32, nv)
		for tr := int32(ranges[w][0]); tr < int32(ranges[w][1]); tr++ {
			k := t[3*tr : 3*tr+3 : 3*tr+3]
			c[min(k[0], k[1])]++
			c[min(k[1], k[2])]++
			c[min(k[2], k[0])]++
		}
		cnt[w] = c
	})
	start := make([]int32, nv+1)
	var off int32
	for v := range nv {
		start[v] = off
		for _, c := range cnt {
			n := c[v]
			c[v] = off
			off += n
		}
	}
	start[nv] = off
	list := make([]uint64, off)
	parallel(len(ranges), func(w int) {
		fill := cnt[w]
		put := func(a, b int32, h int32) {
			lo, hi := min(a, b), max(a, b)
			list[fill[lo]] = uint64(hi)<<32 | uint64(h)
			fill[lo]++
		}
		for tr := int32(ranges[w][0]); tr < int32(ranges[w][1]); tr++ {
			h := 3 * tr
			k := t[h : h+3 : h+3]
			put(k[0], k[1], h)
			put(k[1], k[2], h+1)
			put(k[2], k[0], h+2)
		}
	})
	cnt = nil
	pm.link = make([]int32, len(t)) // zero: no neighbour
	// Pair the copies of each edge, in parallel over ranges of vertices
	// holding similar numbers of half-edges; every half-edge is in exactly
	// one group, so the writes never overlap.
	vr := make([][2]int, len(ranges))
	for w := range vr {
		lo := int32(int64(off) * int64(w) / int64(len(vr)))
		hi := int32(int64(off) * int64(w+1) / int64(len(vr)))
		vr[w] = [2]int{vertexAt(start, lo), vertexAt(start, hi)}
	}
	vr[len(vr)-1][1] = nv
	errs := make([]error, len(vr))
	parallel(len(vr), func(w int) {
		for v := vr[w][0]; v < vr[w][1]; v++ {
			g := list[start[v]:start[v+1]]
			if len(g) > 1 {
				slices.Sort(g)
			}
			for i := 0; i < len(g); {
				up := g[i] >> 32
				j := i + 1
				for j < len(g) && g[j]>>32 == up {
					j++
				}
				switch j - i {
				case 1: // boundary edge
				case 2:
					a, b := int32(uint32(g[i])), int32(uint32(g[i+1]))
					pm.link[a], pm.link[b] = b+1, a+1
				default:
					if strict {
						errs[w] = &MeshError{Triangle: int(pm.orig[uint32(g[i])/3]), Vertex: -1, Err: ErrNonManifold,
							detail: fmt.Sprintf("edge %d-%d is used by %d triangles", v, up, j-i)}
						return
					}
				}
				i = j
			}
		}
	})
	for _, err := range errs {
		if err != nil {
			return err
		}
	}
	return nil
}

// vertexAt returns the first vertex whose group starts at or after slot i.
func vertexAt(start []int32, i int32) int {
	lo, hi := 0, len(start)-1
	for lo < hi {
		mid := (lo + hi) / 2
		if start[mid] < i {
			lo = mid + 1
		} else {
			hi = mid
		}
	}
	return lo
}
