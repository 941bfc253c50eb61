package section

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// TestAlongMesh_Breakpoints uses a 4 × 4 grid of unit cells, each split
// along its rising diagonal, with z = x² + y at the vertices. The line y =
// 0.5 crosses the vertical edges at x = 1, 2, 3 and the diagonals at x = i +
// ½, where the mesh height is the mean of the diagonal's ends, (i² + (i+1)²
// + 1)/2; on a vertical edge it is i² + ½ (worked by hand).
func TestAlongMesh_Breakpoints(t *testing.T) {
	m := gridMesh(0, 0, 4, 4, 4, 4, func(x, y float64) float64 { return x*x + y }, nil, 0)
	c, z := AlongMesh(geom.Polyline{{X: 0, Y: 0.5}, {X: 4, Y: 0.5}}, m)
	want := []float64{0, 0.5, 1, 1.5, 2, 2.5, 3, 3.5, 4}
	if len(c) != len(want) {
		t.Fatalf("AlongMesh chainage = %v, want %v", c, want)
	}
	for j, w := range want {
		var wz float64
		if i := math.Floor(w); w == i {
			wz = i*i + 0.5
		} else {
			wz = (i*i + (i+1)*(i+1) + 1) / 2
		}
		if !closeAbs(c[j], w, exactTol) || !closeAbs(z[j], wz, exactTol) {
			t.Errorf("sample %d = (%g, %g), want (%g, %g)", j, c[j], z[j], w, wz)
		}
	}
}

// TestAlongMesh_NoSamplingError checks, on a random mesh and a bent path,
// that the mesh is linear between consecutive samples: the mesh height at
// the middle of every piece equals the mean of its ends (a consistency
// check against brute-force point location).
func TestAlongMesh_NoSamplingError(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	m := gridMesh(0, 0, 10, 10, 8, 9, func(x, y float64) float64 { return rng.Float64() * 3 }, rng, 0.2)
	path := geom.Polyline{{X: 0.3, Y: 0.2}, {X: 9.1, Y: 6.7}, {X: 4.4, Y: 9.9}, {X: 0.1, Y: 3.3}}
	c, z := AlongMesh(path, m)
	xy := pointsAt(path, c)
	s := meshSampler{m}
	for j := 0; j+1 < len(c); j++ {
		mid := xy[j].Lerp(xy[j+1], 0.5)
		got, ok := s.Elevation(mid.X, mid.Y)
		if !ok || !closeAbs(got, (z[j]+z[j+1])/2, 1e-9) {
			t.Fatalf("piece %d (chainage %g–%g): mesh %g at the middle, samples give %g", j, c[j], c[j+1], got, (z[j]+z[j+1])/2)
		}
	}
	// Every sample is on the mesh.
	for j, q := range xy {
		got, _ := s.Elevation(q.X, q.Y)
		if !closeAbs(got, z[j], 1e-9) {
			t.Fatalf("sample %d at %v: z %g, mesh %g", j, q, z[j], got)
		}
	}
}

// pointsAt returns the plan positions at the given chainages along path.
func pointsAt(path geom.Polyline, chain []float64) []geom.Vec2 {
	out := make([]geom.Vec2, len(chain))
	i, c0 := 0, 0.0
	for j, c := range chain {
		for i+2 < len(path) && c > c0+path[i].Distance(path[i+1]) {
			c0 += path[i].Distance(path[i+1])
			i++
		}
		l := path[i].Distance(path[i+1])
		out[j] = path[i].Lerp(path[i+1], math.Min(1, (c-c0)/l))
	}
	return out
}

// TestAlongMesh_Pyramid: a section through the apex of a pyramid pit
// (base 2a × 2a, depth h) is a V: rim, apex, rim, exactly.
func TestAlongMesh_Pyramid(t *testing.T) {
	const a, h = 5.0, 3.0
	pit := geom.TriMesh{
		V: []geom.Vec3{{X: -a, Y: -a}, {X: a, Y: -a}, {X: a, Y: a}, {X: -a, Y: a}, {Z: -h}},
		T: []int32{0, 1, 4, 1, 2, 4, 2, 3, 4, 3, 0, 4},
	}
	c, z := AlongMesh(geom.Polyline{{X: -a, Y: 0}, {X: a, Y: 0}}, pit)
	if len(c) != 3 || !closeAbs(c[1], a, exactTol) || !closeAbs(z[0], 0, exactTol) || !closeAbs(z[1], -h, exactTol) || !closeAbs(z[2], 0, exactTol) {
		t.Errorf("AlongMesh(pyramid) = %v, %v, want chainage [0 %g %g], z [0 %g 0]", c, z, a, 2*a, -h)
	}
	// The developed length of the V: two slopes √(a² + h²).
	if got := (Profile{Chainage: c, Z: [][]float64{z}}).DevelopedLength(0, 0, 2*a); !closeAbs(got, 2*math.Hypot(a, h), exactTol) {
		t.Errorf("DevelopedLength(V) = %.15g, want %.15g", got, 2*math.Hypot(a, h))
	}
}

// TestAlongMesh_Gaps: two unit squares one metre apart, a path starting and
// ending outside: NaN at the outside ends and in the gap, values on the
// squares.
func TestAlongMesh_Gaps(t *testing.T) {
	sq := func(x0 float64, z float64) geom.TriMesh {
		return gridMesh(x0, 0, x0+1, 1, 1, 1, func(float64, float64) float64 { return z }, nil, 0)
	}
	a, b := sq(0, 1), sq(2, 2)
	m := geom.TriMesh{V: append(append([]geom.Vec3{}, a.V...), b.V...)}
	m.T = append(m.T, a.T...)
	for _, i := range b.T {
		m.T = append(m.T, i+int32(len(a.V)))
	}
	c, z := AlongMesh(geom.Polyline{{X: -1, Y: 0.25}, {X: 4, Y: 0.25}}, m)
	type s struct{ c, z float64 }
	want := []s{{0, math.NaN()}, {1, 1}, {1.25, 1}, {2, 1}, {2.5, math.NaN()}, {3, 2}, {3.25, 2}, {4, 2}, {5, math.NaN()}}
	// On each square the path crosses the diagonal at x = x0 + 0.25.
	if len(c) != len(want) {
		t.Fatalf("AlongMesh(gaps) = %v, %v; want %v", c, z, want)
	}
	for j, w := range want {
		if !closeAbs(c[j], w.c, exactTol) || math.IsNaN(w.z) != math.IsNaN(z[j]) || (!math.IsNaN(w.z) && z[j] != w.z) {
			t.Errorf("sample %d = (%g, %g), want (%g, %g)", j, c[j], z[j], w.c, w.z)
		}
	}
}

func TestAlongMesh_Degenerate(t *testing.T) {
	good := gridMesh(0, 0, 1, 1, 1, 1, func(x, y float64) float64 { return x }, nil, 0)
	cases := []struct {
		name string
		path geom.Polyline
		m    geom.TriMesh
		n    int // samples, -1 for nil
	}{
		{"nil path", nil, good, -1},
		{"one vertex", geom.Polyline{{X: 0.5, Y: 0.5}}, good, -1},
		{"NaN vertex", geom.Polyline{{}, {X: math.NaN()}}, good, -1},
		{"empty mesh", geom.Polyline{{}, {X: 1}}, geom.TriMesh{}, 2},
		{"bad indices ignored", geom.Polyline{{X: -1, Y: 0.5}, {X: 2, Y: 0.5}}, geom.TriMesh{V: good.V, T: []int32{0, 1, 9, -1, 2, 3, 0, 1}}, 2},
		{"clockwise accepted", geom.Polyline{{X: 0, Y: 0.5}, {X: 1, Y: 0.5}}, geom.TriMesh{V: good.V, T: []int32{0, 2, 1, 0, 3, 2}}, 3},
		{"path along an edge", geom.Polyline{{X: 0, Y: 0}, {X: 1, Y: 1}}, good, 2},
	}
	for _, c := range cases {
		ch, z := AlongMesh(c.path, c.m)
		if c.n < 0 {
			if ch != nil || z != nil {
				t.Errorf("AlongMesh(%s) = %v, %v, want nil", c.name, ch, z)
			}
			continue
		}
		if len(ch) != c.n || len(z) != c.n {
			t.Errorf("AlongMesh(%s) = %v, %v, want %d samples", c.name, ch, z, c.n)
		}
	}
}

// FuzzAlongMesh: any mesh and path must be handled without a panic, with
// increasing chainage and as many heights as chainages.
func FuzzAlongMesh(f *testing.F) {
	f.Add([]byte{0, 0, 10, 0, 10, 10, 0, 1, 2, 0, 2, 3, 5, 5, 200, 1})
	f.Add([]byte{1, 2, 3})
	f.Fuzz(func(t *testing.T, data []byte) {
		if len(data) < 4 {
			return
		}
		nv := int(data[0]%8) + 1
		data = data[1:]
		var m geom.TriMesh
		for range nv {
			if len(data) < 2 {
				break
			}
			m.V = append(m.V, geom.Vec3{X: float64(int8(data[0])), Y: float64(int8(data[1])), Z: float64(data[0] ^ data[1])})
			data = data[2:]
		}
		for len(data) >= 3 && len(m.T) < 30 {
			m.T = append(m.T, int32(data[0]%10)-1, int32(data[1]%10), int32(data[2]%10))
			data = data[3:]
		}
		var path geom.Polyline
		for len(data) >= 2 {
			path = append(path, geom.Vec2{X: float64(int8(data[0])) / 3, Y: float64(int8(data[1])) / 3})
			data = data[2:]
		}
		c, z := AlongMesh(path, m)
		if len(c) != len(z) {
			t.Fatalf("%d chainages, %d heights", len(c), len(z))
		}
		for j := 1; j < len(c); j++ {
			if !(c[j] > c[j-1]) {
				t.Fatalf("chainage not increasing: %v", c)
			}
		}
	})
}

// TestAlongMesh_Cone: a cone z = r as a fan of 2n triangles around its apex
// is exact along the radial lines through its rim vertices, so a section
// through the apex and two opposite rim vertices is z = |r| (analytic), and
// between samples the profile is straight.
func TestAlongMesh_Cone(t *testing.T) {
	const n, radius = 12, 4.0
	apex := geom.Vec2{X: 1, Y: -2}
	m := geom.TriMesh{V: []geom.Vec3{{X: apex.X, Y: apex.Y}}}
	for i := range 2 * n {
		a := math.Pi * float64(i) / n
		m.V = append(m.V, geom.Vec3{X: apex.X + radius*math.Cos(a), Y: apex.Y + radius*math.Sin(a), Z: radius})
	}
	for i := range 2 * n {
		m.T = append(m.T, 0, int32(1+i), int32(1+(i+1)%(2*n)))
	}
	for _, k := range []int{0, 3, 7} { // through rim vertices k and k + n
		a := math.Pi * float64(k) / n
		d := geom.Vec2{X: math.Cos(a), Y: math.Sin(a)}
		path := geom.Polyline{apex.Sub(d.Scale(radius)), apex.Add(d.Scale(radius))}
		c, z := AlongMesh(path, m)
		for j := range c {
			if want := math.Abs(c[j] - radius); !closeAbs(z[j], want, 1e-12) {
				t.Errorf("direction %d: z at chainage %g = %.15g, want |r| = %.15g", k, c[j], z[j], want)
			}
		}
		if len(c) < 3 || !closeAbs(c[len(c)-1], 2*radius, 1e-12) {
			t.Errorf("direction %d: chainage %v, want rim, apex, rim", k, c)
		}
	}
}
