package takeoff

import (
	"math"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// polyBowl is a stand-in for the design's analytic bowl, written from the
// design model: E(p) = min over zones of (W − d_i + dist(p, Z_i)/s_i); a
// vertical-walled zone (s = 0) gives W − d_i inside its ring and nothing
// outside. Where no zone reaches, E is +Inf.
type polyBowl struct {
	w     float64
	zones []Zone
}

func (b polyBowl) BowlAt(p geom.Vec2) float64 {
	e := math.Inf(1)
	for _, z := range b.zones {
		floor := b.w - z.DepthM
		if z.WallSlope == 0 {
			if z.Ring.Contains(p) {
				e = math.Min(e, floor)
			}
			continue
		}
		e = math.Min(e, floor+z.Ring.Distance(p)/z.WallSlope)
	}
	return e
}

// latticeMesh samples f on a square lattice of spacing h covering box and
// keeps the cells with a node below rim, two counter-clockwise triangles a
// cell, as the design's BowlMesh does. Node values are capped at rim + capAbove
// so that a vertical wall's outside (+Inf) becomes a steep finite face.
func latticeMesh(tb testing.TB, f func(geom.Vec2) float64, box geom.Box, h, rim, capAbove float64) geom.TriMesh {
	tb.Helper()
	nx := int(math.Ceil(box.Width()/h)) + 1
	ny := int(math.Ceil(box.Height()/h)) + 1
	z := make([]float64, nx*ny)
	for j := range ny {
		for i := range nx {
			p := geom.Vec2{X: box.Min.X + float64(i)*h, Y: box.Min.Y + float64(j)*h}
			z[j*nx+i] = math.Min(f(p), rim+capAbove)
		}
	}
	idx := make([]int32, nx*ny)
	for i := range idx {
		idx[i] = -1
	}
	var m geom.TriMesh
	node := func(i, j int) int32 {
		k := j*nx + i
		if idx[k] < 0 {
			idx[k] = int32(len(m.V))
			m.V = append(m.V, geom.Vec3{X: box.Min.X + float64(i)*h, Y: box.Min.Y + float64(j)*h, Z: z[k]})
		}
		return idx[k]
	}
	for j := range ny - 1 {
		for i := range nx - 1 {
			k := j*nx + i
			if min(z[k], z[k+1], z[k+nx], z[k+nx+1]) >= rim {
				continue
			}
			a, b, c, d := node(i, j), node(i+1, j), node(i+1, j+1), node(i, j+1)
			m.T = append(m.T, a, b, c, a, c, d)
		}
	}
	return m
}

// rectRing returns the counter-clockwise rectangle [x0, x1] × [y0, y1].
func rectRing(x0, y0, x1, y1 float64) geom.Ring {
	return geom.Ring{{X: x0, Y: y0}, {X: x1, Y: y0}, {X: x1, Y: y1}, {X: x0, Y: y1}}
}

// ellipseRing returns n vertices on the ellipse of semi-axes a (along x) and
// b centred at c, counter-clockwise.
func ellipseRing(c geom.Vec2, a, b float64, n int) geom.Ring {
	r := make(geom.Ring, n)
	for i := range r {
		t := 2 * math.Pi * float64(i) / float64(n)
		r[i] = geom.Vec2{X: c.X + a*math.Cos(t), Y: c.Y + b*math.Sin(t)}
	}
	return r
}

// closeRel reports whether got is within rel of want, relative to want with
// an absolute floor of abs.
func closeRel(got, want, rel, abs float64) bool {
	return math.Abs(got-want) <= math.Max(rel*math.Abs(want), abs)
}

// pondCase is a single-zone pond on flat ground built for a test.
type pondCase struct {
	bowl  polyBowl
	w     float64
	rim   float64
	mesh  geom.TriMesh
	zones []Zone
}

// onePond builds a pond with one zone of floor ring r, depth d below the
// water at w, freeboard fb and wall slope s, on a lattice of spacing h.
func onePond(tb testing.TB, r geom.Ring, w, d, fb, s, h float64) pondCase {
	tb.Helper()
	z := Zone{Name: "floor", Ring: r, DepthM: d, WallSlope: s}
	b := polyBowl{w: w, zones: []Zone{z}}
	rim := w + fb
	reach := s*(d+fb) + 2*h
	// Shift the lattice off the ring so that no node sits exactly on a
	// vertical wall (where the ring test decides by round-off).
	box := r.Bounds().Expand(reach)
	box.Min = box.Min.Sub(geom.Vec2{X: 0.37 * h, Y: 0.19 * h})
	return pondCase{bowl: b, w: w, rim: rim, zones: []Zone{z}, mesh: latticeMesh(tb, b.BowlAt, box, h, rim, 0.5)}
}

// liner returns the liner input for the pond, with the analytic bowl.
func (pc pondCase) liner() LinerInput {
	return LinerInput{Mesh: pc.mesh, RimM: pc.rim, WaterLevelM: pc.w, Bowl: pc.bowl, Zones: pc.zones}
}
