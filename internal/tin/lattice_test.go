package tin

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// TestSampleLattice compares the scanline sampler with Elevation at every
// node (the reference: point location per node). Both include triangle
// boundaries exactly, so the NaN pattern must be identical; the values are
// the same plane evaluated two ways and agree to round-off.
func TestSampleLattice(t *testing.T) {
	seed := testSeed(t)
	r := rand.New(rand.NewPCG(seed, 50))
	var l []geom.Vec3
	for _, p := range grid(v2(0, 0), 1, 21, 21) {
		if p.X <= 10 || p.Y <= 10 {
			p.Z = p.X*0.1 + math.Sin(p.Y)
			l = append(l, p)
		}
	}
	surfaces := []struct {
		name string
		s    *Surface
	}{
		{"random", mustBuild(t, randomPoints(r, 3000, v2(0, 0), 40, 30, func(x, y float64) float64 { return math.Sin(x/3) * y }), Options{})},
		{"L trimmed", mustBuild(t, l, Options{MaxEdgeM: 1.5})},
		{"boundary", mustBuild(t, l, Options{Boundary: []geom.Ring{{v2(1.5, 1.5), v2(19, 1.5), v2(3, 19)}}})},
	}
	lattices := []struct {
		name   string
		x0, y0 float64
		h      float64
		nx, ny int
	}{
		{"aligned with grid vertices", 0, 0, 0.5, 43, 43},
		{"offset fine", -1.3, -0.7, 0.173, 300, 250},
		{"coarse", -5, -5, 3.1, 20, 15},
		{"single node", 5, 5, 1, 1, 1},
	}
	for _, sc := range surfaces {
		fm, err := FromMesh(sc.s.Mesh())
		if err != nil {
			t.Fatal(err)
		}
		for _, lt := range lattices {
			t.Run(sc.name+"/"+lt.name, func(t *testing.T) {
				out := make([]float64, lt.nx*lt.ny)
				for _, s := range []*Surface{sc.s, fm} {
					s.SampleLattice(lt.x0, lt.y0, lt.h, lt.nx, lt.ny, out)
					for j := range lt.ny {
						for i := range lt.nx {
							x := lt.x0 + float64(float64(i)*lt.h)
							y := lt.y0 + float64(float64(j)*lt.h)
							want, ok := s.Elevation(x, y)
							got := out[j*lt.nx+i]
							if ok != !math.IsNaN(got) {
								t.Fatalf("node (%d, %d) at (%g, %g): lattice %g, Elevation %g, %v", i, j, x, y, got, want, ok)
							}
							if ok && math.Abs(got-want) > planeTol*math.Max(1, math.Abs(want)) {
								t.Fatalf("node (%d, %d): lattice %g, Elevation %g", i, j, got, want)
							}
						}
					}
				}
			})
		}
	}
}

func TestSampleLattice_Degenerate(t *testing.T) {
	s := mustBuild(t, grid(v2(0, 0), 1, 3, 3), Options{})
	out := []float64{7, 7, 7, 7}
	s.SampleLattice(0, 0, 0, 2, 2, out) // h = 0: every node NaN
	for _, v := range out {
		if !math.IsNaN(v) {
			t.Errorf("h = 0: %v, want NaN", out)
		}
	}
	s.SampleLattice(0, 0, 1, 0, 5, out[:0]) // no nodes: nothing happens
	s.SampleLattice(math.NaN(), 0, 1, 2, 2, out)
	for _, v := range out {
		if !math.IsNaN(v) {
			t.Errorf("x0 = NaN: %v, want NaN", out)
		}
	}
	s.SampleLattice(1e300, 1e300, 1e300, 2, 2, out) // far away, huge step
	for _, v := range out {
		if !math.IsNaN(v) {
			t.Errorf("far lattice: %v, want NaN", out)
		}
	}
}
