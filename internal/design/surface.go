package design

import (
	"math"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// BowlAt returns the bowl E at p, computed exactly from the zones (not
// from the lattice): +Inf where only vertical-walled zones reach and none
// holds p.
//
// Cost: a few edges per zone near p, from a grid of cells per zone floor
// built on the first call; points beyond a zone's grid are measured
// against all its edges. BowlAt is safe for concurrent use.
func (s *Surface) BowlAt(p geom.Vec2) float64 {
	if s.bowl == nil {
		e, _, _ := s.zs.rel(p, -1)
		return s.WaterLevelM + e
	}
	return s.WaterLevelM + s.bowl.get(s.zs).rel(p)
}

// FinishedAt returns the finished grade D at (x, y), interpolated on the
// lattice; ok is false outside the work area.
func (s *Surface) FinishedAt(x, y float64) (float64, bool) {
	return s.Lattice.Interpolate(s.D, geom.Vec2{X: x, Y: y})
}

// Owner returns the zone (index into Params.Zones) whose bowl gives E at
// lattice node i, or −1 where E is above the rim (outside the bowl).
// Overlapping zones: the lowest bowl wins, ties to the lower index.
func (s *Surface) Owner(i int) int {
	if !(s.fd.e[i] <= s.zs.freeboard) {
		return -1
	}
	return int(s.fd.own[i])
}

// Mesh returns the finished grade over the work area as a triangle mesh
// (two triangles per lattice cell). A vertical wall shows in it as a band
// one cell wide; the volumes are computed with the wall exact.
func (s *Surface) Mesh() geom.TriMesh { return s.Lattice.Mesh(s.D, nil) }

// DiffMesh returns z = D − G over the surveyed cells of the work area:
// positive in fill, negative in cut, for cut and fill depth contours.
func (s *Surface) DiffMesh() geom.TriMesh {
	z := make([]float64, len(s.D))
	for k := range z {
		z[k] = s.D[k] - s.G[k]
	}
	return s.Lattice.Mesh(z, nil)
}

// BowlMesh returns the bowl E over the lined area {E ≤ R}, for the liner
// takeoff: lattice triangles, with those the rim line crosses clipped
// exactly along the interpolated level E = R (clip points on a lattice
// edge are shared by the triangles on both sides). Nodes where E is +Inf
// (just outside a vertical wall) are taken at the rim, so a vertical wall
// shows as a band one cell wide running from its floor up to the rim;
// its 3-D area approaches the wall's as the cell shrinks.
func (s *Surface) BowlMesh() geom.TriMesh {
	l := s.Lattice
	r := s.RimM
	z := func(k int) float64 {
		if math.IsInf(s.E[k], 1) {
			return r
		}
		return s.E[k]
	}
	// Sized from the nodes in the lined area: about two triangles a node,
	// and one vertex a node plus the clip points along the rim. Only cells
	// with a corner among those nodes, within their box, are visited.
	nIn := 0
	i0, i1, j0, j1 := l.NX, -1, l.NY, -1
	for k, e := range s.E {
		if e <= r {
			nIn++
			i, j := k%l.NX, k/l.NX
			i0, i1, j0, j1 = min(i0, i), max(i1, i), min(j0, j), max(j1, j)
		}
	}
	m := geom.TriMesh{V: make([]geom.Vec3, 0, nIn+nIn/8+64), T: make([]int32, 0, 6*nIn+6*64)}
	// Vertex index + 1 (0 for none yet) of each node and of the clip
	// point on each lattice edge, by the edge's lower node: horizontal
	// (k, k+1), vertical (k, k+NX) and diagonal (k, k+NX+1) edges. Flat
	// arrays, allocated once, instead of maps.
	n := l.Len()
	flat := make([]int32, 4*n)
	nodeV, clipH, clipV, clipD := flat[:n], flat[n:2*n], flat[2*n:3*n], flat[3*n:]
	vert := func(k int) int32 {
		if v := nodeV[k]; v > 0 {
			return v - 1
		}
		p := l.Node(k%l.NX, k/l.NX)
		v := int32(len(m.V))
		m.V = append(m.V, geom.Vec3{X: p.X, Y: p.Y, Z: z(k)})
		nodeV[k] = v + 1
		return v
	}
	cut := func(a, b int) int32 {
		lo := min(a, b)
		var slot *int32
		switch max(a, b) - lo {
		case 1:
			slot = &clipH[lo]
		case l.NX:
			slot = &clipV[lo]
		default:
			slot = &clipD[lo]
		}
		if v := *slot; v > 0 {
			return v - 1
		}
		za, zb := z(a), z(b)
		t := (r - za) / (zb - za)
		if t == 0 {
			return vert(a)
		}
		pa, pb := l.Node(a%l.NX, a/l.NX), l.Node(b%l.NX, b/l.NX)
		p := pa.Lerp(pb, t)
		v := int32(len(m.V))
		m.V = append(m.V, geom.Vec3{X: p.X, Y: p.Y, Z: r})
		*slot = v + 1
		return v
	}
	for cj := max(j0-1, 0); cj <= min(j1, l.NY-2); cj++ {
		for ci := max(i0-1, 0); ci <= min(i1, l.NX-2); ci++ {
			c := ci + cj*l.NX
			nd := [4]int{c, c + 1, c + l.NX, c + l.NX + 1}
			if s.E[nd[0]] <= r && s.E[nd[1]] <= r && s.E[nd[2]] <= r && s.E[nd[3]] <= r {
				// A cell wholly in the lined area: its two triangles as
				// they are (what the clip below gives them, vertex for
				// vertex and in the same order).
				for t := range 2 {
					va, vb, vc := vert(nd[triSlots[t][0]]), vert(nd[triSlots[t][1]]), vert(nd[triSlots[t][2]])
					if geom.PlanArea(m.V[va], m.V[vb], m.V[vc]) > 0 {
						m.T = append(m.T, va, vb, vc)
					}
				}
				continue
			}
			for t := range 2 {
				tri := [3]int{nd[triSlots[t][0]], nd[triSlots[t][1]], nd[triSlots[t][2]]}
				if !(s.E[tri[0]] <= r || s.E[tri[1]] <= r || s.E[tri[2]] <= r) {
					continue
				}
				// Clip the triangle to z ≤ r (Sutherland–Hodgman on one
				// level), keeping lattice-edge keys for shared vertices.
				var poly [4]int32
				n := 0
				for e := range 3 {
					a, b := tri[e], tri[(e+1)%3]
					ina, inb := z(a) <= r, z(b) <= r
					if ina {
						poly[n] = vert(a)
						n++
					}
					if ina != inb {
						poly[n] = cut(a, b)
						n++
					}
				}
				for q := 1; q+1 < n; q++ {
					a, b, c := poly[0], poly[q], poly[q+1]
					if geom.PlanArea(m.V[a], m.V[b], m.V[c]) > 0 {
						m.T = append(m.T, a, b, c)
					}
				}
			}
		}
	}
	return m
}
