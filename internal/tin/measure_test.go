package tin

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// TestSlopeAspect on planes z = ax + by: slope is |∇z| = hypot(a, b)
// (analytic); aspect is the direction of steepest descent, −∇z, as a
// compass bearing clockwise from north (+y), the usual terrain-analysis
// definition (Burrough & McDonnell, Principles of Geographical Information
// Systems, 1998, ch. 8; from memory).
func TestSlopeAspect(t *testing.T) {
	tests := []struct {
		a, b      float64
		slope     float64
		aspectDeg float64
	}{
		{1, 0, 1, 270},    // rises to the east: faces west
		{-1, 0, 1, 90},    // falls to the east
		{0, 1, 1, 180},    // rises to the north: faces south
		{0, -0.5, 0.5, 0}, // falls to the north
		{0.3, 0.3, math.Hypot(0.3, 0.3), 225},
		{-0.02, 0.01, math.Hypot(0.02, 0.01), 90 + math.Atan2(0.01, 0.02)*180/math.Pi},
	}
	for _, tt := range tests {
		pts := grid(v2(0, 0), 1, 4, 4)
		for i := range pts {
			pts[i].Z = 10 + tt.a*pts[i].X + tt.b*pts[i].Y
		}
		s := mustBuild(t, pts, Options{})
		for tri := range s.Mesh().NumTriangles() {
			if got := s.Slope(tri); math.Abs(got-tt.slope) > 1e-12 {
				t.Errorf("z = %gx + %gy: Slope(%d) = %g, want %g", tt.a, tt.b, tri, got, tt.slope)
			}
			if got, want := s.SlopeDeg(tri), math.Atan(tt.slope)*180/math.Pi; math.Abs(got-want) > 1e-9 {
				t.Errorf("SlopeDeg(%d) = %g, want %g", tri, got, want)
			}
			got := s.AspectDeg(tri)
			if d := math.Mod(got-tt.aspectDeg+540, 360) - 180; math.Abs(d) > 1e-9 {
				t.Errorf("z = %gx + %gy: AspectDeg(%d) = %g, want %g", tt.a, tt.b, tri, got, tt.aspectDeg)
			}
		}
	}
	flat := mustBuild(t, grid(v2(0, 0), 1, 3, 3), Options{})
	if got := flat.AspectDeg(0); !math.IsNaN(got) {
		t.Errorf("level triangle: AspectDeg = %g, want NaN", got)
	}
	if got := flat.Slope(0); got != 0 {
		t.Errorf("level triangle: Slope = %g, want 0", got)
	}
	for _, bad := range []int{-1, flat.Mesh().NumTriangles()} {
		if !math.IsNaN(flat.Slope(bad)) || !math.IsNaN(flat.AspectDeg(bad)) {
			t.Errorf("triangle %d out of range: want NaN", bad)
		}
	}
}

// TestAreas: on a plane z = ax + by the developed area is the plan area
// times sqrt(1 + a² + b²) (analytic: the plane's area element).
func TestAreas(t *testing.T) {
	r := rand.New(rand.NewPCG(testSeed(t), 60))
	pts := randomPoints(r, 500, v2(0, 0), 30, 20, func(x, y float64) float64 { return 0.3*x - 0.4*y })
	pts = append(pts, v3(0, 0, 0), v3(30, 0, 9), v3(30, 20, 1), v3(0, 20, -8))
	s := mustBuild(t, pts, Options{})
	if !relClose(s.PlanArea(), 600, 1e-12) {
		t.Errorf("PlanArea = %.15g, want 600", s.PlanArea())
	}
	if want := 600 * math.Sqrt(1+0.09+0.16); !relClose(s.SurfaceArea(), want, 1e-12) {
		t.Errorf("SurfaceArea = %.15g, want %.15g", s.SurfaceArea(), want)
	}
}

// TestVolumeAbove against closed forms: the plane z = x over [0, 10]²
// (prisms and wedges) and a square pyramid of height h (V = base·h/3, and
// the part above h/2 is the similar pyramid of a quarter of the base).
func TestVolumeAbove(t *testing.T) {
	pts := grid(v2(0, 0), 2.5, 5, 5) // 0..10
	for i := range pts {
		pts[i].Z = pts[i].X
	}
	s := mustBuild(t, pts, Options{})
	for _, tt := range []struct{ datum, want float64 }{
		{0, 500}, {-3, 800}, {5, 125}, {2.5, 10 * 7.5 * 7.5 / 2}, {10, 0}, {20, 0},
	} {
		if got := s.VolumeAbove(tt.datum); math.Abs(got-tt.want) > 1e-9 {
			t.Errorf("plane z = x: VolumeAbove(%g) = %.12g, want %g", tt.datum, got, tt.want)
		}
	}
	const h = 6.0
	pyr := mustBuild(t, parsePts(t, "0 0 0; 10 0 0; 10 10 0; 0 10 0; 5 5 6"), Options{})
	for _, tt := range []struct{ datum, want float64 }{
		{0, 100 * h / 3}, {h / 2, 25 * (h / 2) / 3}, {-1, 100*h/3 + 100}, {h, 0},
	} {
		if got := pyr.VolumeAbove(tt.datum); math.Abs(got-tt.want) > 1e-9 {
			t.Errorf("pyramid: VolumeAbove(%g) = %.12g, want %g", tt.datum, got, tt.want)
		}
	}
}

// TestPositivePart checks the closed form against midpoint quadrature of
// max(0, f) on a fine subdivision of the triangle (numerical integration of
// the definition), in every sign case.
func TestPositivePart(t *testing.T) {
	r := rand.New(rand.NewPCG(testSeed(t), 61))
	for k := range 200 {
		f := [3]float64{r.Float64()*4 - 2, r.Float64()*4 - 2, r.Float64()*4 - 2}
		if k < 6 { // ensure every case: all >= 0, all <= 0, mixed, zeros
			f = [6][3]float64{{1, 2, 3}, {-1, -2, -3}, {1, -1, -2}, {2, 1, -1}, {0, 0, 1}, {0, -1, 0}}[k]
		}
		got := positivePart(1, f[0], f[1], f[2])
		// Subdivide the unit-area triangle with corners a, b, c in barycentric
		// steps of 1/n; each small triangle's centroid samples f.
		const n = 400
		var sum geom.Sum
		for i := range n {
			for j := range n - i {
				// Upright sub-triangle (i, j), centroid at (i+1/3, j+1/3)/n.
				for _, c := range [][2]float64{{float64(i) + 1.0/3, float64(j) + 1.0/3}, {float64(i) + 2.0/3, float64(j) + 2.0/3}} {
					if c[0]+c[1] > n {
						continue
					}
					u, v := c[0]/n, c[1]/n
					val := f[0]*(1-u-v) + f[1]*u + f[2]*v
					sum.Add(math.Max(0, val) / (n * n))
				}
			}
		}
		if want := sum.Value(); math.Abs(got-want) > 2e-4 {
			t.Errorf("positivePart(1, %v) = %g, quadrature %g", f, got, want)
		}
	}
}
