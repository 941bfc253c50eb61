package takeoff

import (
	"errors"
	"fmt"
	"math"
	"os/exec"
	"strconv"
	"strings"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/reftest"
)

// ramanujan2 is Ramanujan's second approximation to the perimeter of an
// ellipse of semi-axes a and b: π(a + b)(1 + 3h / (10 + sqrt(4 − 3h))),
// h = ((a − b)/(a + b))² (S. Ramanujan, "Modular equations and
// approximations to π", Quart. J. Math. 45, 1914, p. 350–372).
func ramanujan2(a, b float64) float64 {
	h := (a - b) * (a - b) / ((a + b) * (a + b))
	return math.Pi * (a + b) * (1 + 3*h/(10+math.Sqrt(4-3*h)))
}

// bowlFunc adapts a function to [Bowl].
type bowlFunc func(geom.Vec2) float64

func (f bowlFunc) BowlAt(p geom.Vec2) float64 { return f(p) }

// ellipseBasin is a smooth basin whose level set at w is exactly the
// ellipse (x/a)² + (y/b)² = 1 centred at c.
func ellipseBasin(c geom.Vec2, a, b, w float64) bowlFunc {
	return func(p geom.Vec2) float64 {
		x, y := (p.X-c.X)/a, (p.Y-c.Y)/b
		return w - 1 + x*x + y*y
	}
}

func measureOn(t *testing.T, b Bowl, m geom.TriMesh, w float64, zones []Zone, analytic bool) ShorelineResult {
	t.Helper()
	in := ShorelineInput{Lines: TraceWaterLine(m, w), WaterLevelM: w, Mesh: m, Zones: zones}
	if analytic {
		in.Bowl = b
	}
	sh, err := MeasureShoreline(in, ShorelineOptions{})
	if err != nil {
		t.Fatal(err)
	}
	return sh
}

func TestMeasureShoreline_Ellipse(t *testing.T) {
	// The water line of a basin whose level set is an ellipse, traced on the
	// lattice: its length against Ramanujan's second approximation (within
	// 0.1 %) and the shoreline-to-bounding-rectangle
	// ratio against check-values.md §7 [derived]: π/4 = 0.7853981634 for a
	// circle, 0.8073707 for a 2:1 ellipse (also within 0.1 %).
	const w = 50.0
	c := geom.Vec2{X: 3.3, Y: -1.7}
	for _, tc := range []struct {
		a, b, ratio float64
	}{{2, 2, math.Pi / 4}, {3, 1.5, 0.8073707}} {
		bb := ellipseBasin(c, tc.a, tc.b, w)
		box := geom.Box{Min: c.Sub(geom.Vec2{X: tc.a + 0.5, Y: tc.b + 0.5}), Max: c.Add(geom.Vec2{X: tc.a + 0.5, Y: tc.b + 0.5})}
		m := latticeMesh(t, bb, box, 0.03, w+0.3, 1)
		sh := measureOn(t, bb, m, w, nil, false)
		want := ramanujan2(tc.a, tc.b)
		if sh.Loops != 1 || !closeRel(sh.LengthM, want, 1e-3, 0) {
			t.Errorf("%g × %g: shoreline %d loops, %.6f m, want 1 loop of %.6f (Ramanujan)", tc.a, tc.b, sh.Loops, sh.LengthM, want)
		}
		if got := sh.LengthM / sh.BoundingRectPerimeterM; !closeRel(got, tc.ratio, 1e-3, 0) {
			t.Errorf("%g × %g: shoreline / bounding rectangle = %.7f, want %.7f", tc.a, tc.b, got, tc.ratio)
		}
		if !closeRel(sh.WaterAreaM2, math.Pi*tc.a*tc.b, 1e-3, 0) {
			t.Errorf("%g × %g: water area %.5f m², want πab = %.5f", tc.a, tc.b, sh.WaterAreaM2, math.Pi*tc.a*tc.b)
		}
		if sh.RuleOfThumbLowM != 0.75*sh.BoundingRectPerimeterM || sh.RuleOfThumbHighM != 0.85*sh.BoundingRectPerimeterM {
			t.Errorf("rule of thumb %g–%g for rectangle perimeter %g", sh.RuleOfThumbLowM, sh.RuleOfThumbHighM, sh.BoundingRectPerimeterM)
		}
	}
}

func TestMeasureShoreline_EllipseSciPy(t *testing.T) {
	// The ellipse perimeter 4a·E(e²) from SciPy's complete elliptic integral
	// of the second kind (scipy.special.ellipe), an outside reference for
	// Ramanujan's formula and for the traced shoreline.
	py := reftest.Python(t, "scipy.special")
	const a, b = 3.0, 1.5
	out, err := exec.Command(py, "-c", fmt.Sprintf(
		"from scipy.special import ellipe; print(repr(4*%g*ellipe(1-(%g/%g)**2)))", a, b, a)).Output()
	if err != nil {
		t.Fatalf("scipy: %v", err)
	}
	want, err := strconv.ParseFloat(strings.TrimSpace(string(out)), 64)
	if err != nil {
		t.Fatal(err)
	}
	if r := ramanujan2(a, b); !closeRel(r, want, 1e-6, 0) {
		t.Errorf("Ramanujan II %.9f vs SciPy %.9f", r, want)
	}
	const w = 50.0
	bb := ellipseBasin(geom.Vec2{}, a, b, w)
	m := latticeMesh(t, bb, geom.Box{Min: geom.Vec2{X: -3.5, Y: -2}, Max: geom.Vec2{X: 3.5, Y: 2}}, 0.03, w+0.3, 1)
	if sh := measureOn(t, bb, m, w, nil, false); !closeRel(sh.LengthM, want, 1e-3, 0) {
		t.Errorf("shoreline %.6f m, want %.6f (SciPy)", sh.LengthM, want)
	}
}

func TestMeasureShoreline_EllipticalZone(t *testing.T) {
	// A design zone whose floor ring is a 720-gon on an ellipse. With a
	// vertical wall the water line is the ring itself; with walls at s it
	// is the parallel curve at distance s·d, whose length is P + 2π·s·d
	// (Steiner's formula for a convex set). Both against the ring's own
	// perimeter and Ramanujan's approximation to the ellipse (0.1 %). The
	// lattice is coarse (0.1 m): moving the points onto the analytic bowl
	// removes the vertical wall's smear.
	const w, d, fb = 20.0, 0.6, 0.2
	ring := ellipseRing(geom.Vec2{X: 0.31, Y: 0.17}, 3, 1.5, 720)
	for _, s := range []float64{0, 1.5} {
		pc := onePond(t, ring, w, d, fb, s, 0.1)
		sh := measureOn(t, pc.bowl, pc.mesh, w, pc.zones, true)
		wantRing := ring.Perimeter() + 2*math.Pi*s*d
		wantRam := ramanujan2(3, 1.5) + 2*math.Pi*s*d
		if sh.Loops != 1 || !closeRel(sh.LengthM, wantRing, 1e-4, 0) || !closeRel(sh.LengthM, wantRam, 1e-3, 0) {
			t.Errorf("s=%g: shoreline %d loops %.6f m, want %.6f (ring) and %.6f (Ramanujan)", s, sh.Loops, sh.LengthM, wantRing, wantRam)
		}
		// Without the analytic bowl a vertical wall's line lies inside the
		// smeared cell: measurably off.
		if s == 0 {
			raw := measureOn(t, pc.bowl, pc.mesh, w, pc.zones, false)
			if closeRel(raw.LengthM, wantRing, 1e-3, 0) {
				t.Errorf("mesh-only vertical-wall shoreline %.6f unexpectedly matches %.6f", raw.LengthM, wantRing)
			}
		}
	}
}

func TestMeasureShoreline_VerticalCorners(t *testing.T) {
	// A vertical-walled rectangle: the water line is the rectangle, corners
	// included (they are put back after the points are moved onto the
	// walls).
	r := rectRing(0.037, 0.011, 4.037, 2.511)
	pc := onePond(t, r, 100, 0.8, 0.15, 0, 0.1)
	sh := measureOn(t, pc.bowl, pc.mesh, 100, pc.zones, true)
	if !closeRel(sh.LengthM, 13, 1e-9, 0) || !closeRel(sh.WaterAreaM2, 10, 1e-9, 0) {
		t.Errorf("shoreline %.12f m, area %.12f m², want 13 and 10", sh.LengthM, sh.WaterAreaM2)
	}
	if br := sh.BoundingRect; !closeRel(br.LengthM, 4, 1e-9, 0) || !closeRel(br.WidthM, 2.5, 1e-9, 0) {
		t.Errorf("bounding rectangle %+v, want 4 × 2.5", br)
	}
}

func TestMeasureShoreline_Island(t *testing.T) {
	// A ring-shaped basin, water between radii 2 and 4 m around an island:
	// two loops (8π and 4π m), the island flagged, water area π(16 − 4).
	const w = 10.0
	bb := bowlFunc(func(p geom.Vec2) float64 { return w - 1 + math.Abs(p.Norm()-3) })
	m := latticeMesh(t, bb, geom.Box{Min: geom.Vec2{X: -4.6, Y: -4.6}, Max: geom.Vec2{X: 4.6, Y: 4.6}}, 0.02, w+0.3, 1)
	sh := measureOn(t, bb, m, w, nil, false)
	if sh.Loops != 2 {
		t.Fatalf("loops = %d, want 2", sh.Loops)
	}
	outer, island := sh.LoopDetail[0], sh.LoopDetail[1]
	if outer.Island || !island.Island || !closeRel(outer.LengthM, 8*math.Pi, 1e-4, 0) || !closeRel(island.LengthM, 4*math.Pi, 1e-4, 0) {
		t.Errorf("loops %+v / %+v, want 8π outer and 4π island", outer, island)
	}
	if !closeRel(sh.WaterAreaM2, 12*math.Pi, 1e-4, 0) || !closeRel(sh.LengthM, 12*math.Pi, 1e-4, 0) {
		t.Errorf("area %.6f, length %.6f, want 12π both", sh.WaterAreaM2, sh.LengthM)
	}
	// Canonical form: counter-clockwise, starting at the westernmost point.
	for _, l := range sh.LoopDetail {
		if l.AreaM2 <= 0 || l.Pts[0].X > -1.99 {
			t.Errorf("loop starts at %v with area %g: want the west point, counter-clockwise", l.Pts[0], l.AreaM2)
		}
	}
}

func TestStretchLength(t *testing.T) {
	sh := ShorelineResult{LoopDetail: []Loop{{Closed: true, LengthM: 20}, {Closed: false, LengthM: 5}}}
	for _, tc := range []struct {
		name string
		st   Stretch
		want float64
	}{
		{"inside", Stretch{0, 2, 7.5}, 5.5},
		{"wraps through the start", Stretch{0, 18, 3}, 5},
		{"to the end, a cm over", Stretch{0, 15, 20.005}, 5},
		{"open line", Stretch{1, 1, 4}, 3},
	} {
		got, err := StretchLength(sh, 0, tc.st)
		if err != nil || math.Abs(got-tc.want) > 1e-12 {
			t.Errorf("%s: StretchLength(%+v) = %g, %v, want %g", tc.name, tc.st, got, err, tc.want)
		}
	}
	for _, tc := range []struct {
		name string
		st   Stretch
	}{
		{"no such loop", Stretch{2, 0, 1}},
		{"negative loop", Stretch{-1, 0, 1}},
		{"past the end", Stretch{0, 10, 21}},
		{"negative chainage", Stretch{0, -1, 3}},
		{"NaN", Stretch{0, math.NaN(), 3}},
		{"empty", Stretch{0, 3, 3}},
		{"backwards on an open line", Stretch{1, 4, 1}},
	} {
		_, err := StretchLength(sh, 3, tc.st)
		var se *StretchError
		if !errors.Is(err, ErrStretch) || !errors.As(err, &se) || se.Index != 3 {
			t.Errorf("%s: StretchLength(%+v) err = %v, want a *StretchError for stretch 3", tc.name, tc.st, err)
		}
	}
}

func TestMeasureShoreline_Degenerate(t *testing.T) {
	// No lines, and lines too short to be loops: nothing measured.
	sh, err := MeasureShoreline(ShorelineInput{Lines: []Line{{Pts: []geom.Vec2{{X: 1}}, Closed: true}}}, ShorelineOptions{})
	if err != nil || sh.Loops != 0 || sh.LengthM != 0 {
		t.Errorf("degenerate: %+v, %v", sh, err)
	}
	if _, err := MeasureShoreline(ShorelineInput{}, ShorelineOptions{FactorLow: 0.9, FactorHigh: 0.8}); !errors.Is(err, ErrOption) {
		t.Errorf("low > high: err = %v, want ErrOption", err)
	}
}
