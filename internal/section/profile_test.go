package section

import (
	"errors"
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/units"
)

// exactTol is for values that are exact up to a few roundings of numbers
// of order 10 (metres).
const exactTol = 1e-12

func TestAlong_Stations(t *testing.T) {
	path := geom.Polyline{{X: 0, Y: 0}, {X: 10, Y: 0}, {X: 10, Y: 5}}
	cases := []struct {
		step  float64
		chain []float64
		xy    []geom.Vec2
	}{
		// Every 4 m plus the vertices at 0, 10 and 15.
		{4, []float64{0, 4, 8, 10, 12, 15}, []geom.Vec2{{X: 0}, {X: 4}, {X: 8}, {X: 10}, {X: 10, Y: 2}, {X: 10, Y: 5}}},
		// A station on a vertex is one sample.
		{5, []float64{0, 5, 10, 15}, []geom.Vec2{{X: 0}, {X: 5}, {X: 10}, {X: 10, Y: 5}}},
		// A step longer than the path gives the vertices only.
		{100, []float64{0, 10, 15}, []geom.Vec2{{X: 0}, {X: 10}, {X: 10, Y: 5}}},
	}
	for _, c := range cases {
		p, err := Along(path, c.step)
		if err != nil {
			t.Fatal(err)
		}
		if !slices.Equal(p.Chainage, c.chain) {
			t.Errorf("Along(step %g).Chainage = %v, want %v", c.step, p.Chainage, c.chain)
			continue
		}
		for j := range c.xy {
			vecClose(t, "XY", p.XY[j], c.xy[j], exactTol)
		}
		if len(p.Z) != 0 {
			t.Errorf("Along with no surface: %d rows of Z", len(p.Z))
		}
	}
	// Repeated vertices give one station; 0.1 m steps over 0.3 m keep four
	// stations although 3 × 0.1 is not 0.3 in binary.
	p, err := Along(geom.Polyline{{X: 0}, {X: 0}, {X: 0.3}, {X: 0.3}}, 0.1)
	if err != nil {
		t.Fatal(err)
	}
	if len(p.Chainage) != 4 || !closeAbs(p.Chainage[3], 0.3, exactTol) {
		t.Errorf("Along(repeated vertices, 0.1).Chainage = %v, want 4 stations 0 … 0.3", p.Chainage)
	}
}

// TestAlong_PlaneIsStraight checks that a plane, sampled through a mesh
// carrying it, gives a profile that is straight along each leg of the path:
// every sample equals the plane (an analytic case).
func TestAlong_PlaneIsStraight(t *testing.T) {
	plane := func(x, y float64) float64 { return 2 + 0.3*x - 0.1*y }
	rng := rand.New(rand.NewPCG(1, 2))
	m := gridMesh(0, 0, 10, 8, 7, 6, plane, rng, 0.2)
	path := geom.Polyline{{X: 0.5, Y: 0.5}, {X: 9.5, Y: 3}, {X: 2, Y: 7.5}}
	p, err := Along(path, 0.37, meshSampler{m})
	if err != nil {
		t.Fatal(err)
	}
	for j, q := range p.XY {
		if !closeAbs(p.Z[0][j], plane(q.X, q.Y), exactTol) {
			t.Errorf("Z at %v = %.15g, plane %.15g", q, p.Z[0][j], plane(q.X, q.Y))
		}
	}
	c, z := AlongMesh(path, m)
	if len(c) < 10 {
		t.Fatalf("AlongMesh gave %d samples", len(c))
	}
	// On the first leg z is linear in chainage: z = z0 + slope·chainage.
	leg := path[0].Distance(path[1])
	d := path[1].Sub(path[0]).Scale(1 / leg)
	for j := range c {
		if c[j] > leg {
			break
		}
		q := path[0].Add(d.Scale(c[j]))
		if !closeAbs(z[j], plane(q.X, q.Y), exactTol) {
			t.Errorf("AlongMesh z at chainage %g = %.15g, plane %.15g", c[j], z[j], plane(q.X, q.Y))
		}
	}
}

// TestAlong_Cone checks profiles of the cone z = r (distance from its apex,
// analytic): |s − s₀| through the apex, √(d² + (s − s₀)²) at offset d, and
// no value beyond the cone's radius.
func TestAlong_Cone(t *testing.T) {
	apex := geom.Vec2{X: 3, Y: 4}
	const radius = 6.0
	cone := funcSampler(func(x, y float64) (float64, bool) {
		r := math.Hypot(x-apex.X, y-apex.Y)
		return r, r <= radius
	})
	for _, off := range []float64{0, 1.5} {
		path := geom.Polyline{{X: -4, Y: 4 + off}, {X: 10, Y: 4 + off}}
		p, err := Along(path, 0.25, cone)
		if err != nil {
			t.Fatal(err)
		}
		for j, s := range p.Chainage {
			x := -4 + s
			want := math.Hypot(off, x-apex.X)
			if want > radius {
				if !math.IsNaN(p.Z[0][j]) {
					t.Errorf("offset %g, chainage %g: z = %g, want NaN beyond the cone", off, s, p.Z[0][j])
				}
				continue
			}
			if !closeAbs(p.Z[0][j], want, exactTol) {
				t.Errorf("offset %g, chainage %g: z = %.15g, want %.15g", off, s, p.Z[0][j], want)
			}
		}
	}
}

func TestAlong_SeveralSurfaces(t *testing.T) {
	g := funcSampler(func(x, y float64) (float64, bool) { return 10, true })
	d := funcSampler(func(x, y float64) (float64, bool) { return math.Inf(1), true }) // a broken surface
	p, err := Along(geom.Polyline{{}, {X: 2}}, 1, g, d)
	if err != nil {
		t.Fatal(err)
	}
	if len(p.Z) != 2 || p.Z[0][1] != 10 || !math.IsNaN(p.Z[1][1]) {
		t.Errorf("Along(two surfaces).Z = %v, want [10 …] and NaN for a non-finite value", p.Z)
	}
}

func TestAlong_BadInput(t *testing.T) {
	ok := geom.Polyline{{}, {X: 5}}
	cases := []struct {
		name  string
		path  geom.Polyline
		step  float64
		surf  []Sampler
		want  error
		index int
	}{
		{"empty path", nil, 1, nil, ErrShortPath, -1},
		{"one vertex", geom.Polyline{{X: 1}}, 1, nil, ErrShortPath, -1},
		{"NaN vertex", geom.Polyline{{}, {X: math.NaN()}}, 1, nil, ErrNonFinite, 1},
		{"infinite vertex", geom.Polyline{{Y: math.Inf(-1)}, {X: 1}}, 1, nil, ErrNonFinite, 0},
		{"zero length", geom.Polyline{{X: 2}, {X: 2}}, 1, nil, ErrZeroLength, -1},
		{"zero step", ok, 0, nil, ErrStep, -1},
		{"negative step", ok, -2, nil, ErrStep, -1},
		{"NaN step", ok, math.NaN(), nil, ErrStep, -1},
		{"infinite step", ok, math.Inf(1), nil, ErrStep, -1},
		{"too many samples", geom.Polyline{{}, {X: 1e5}}, 1e-3, nil, ErrTooManySamples, -1},
		{"nil surface", ok, 1, []Sampler{funcSampler(nil), nil}, ErrNilSurface, 1},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			_, err := Along(c.path, c.step, c.surf...)
			var ie *InputError
			if !errors.Is(err, c.want) || !errors.As(err, &ie) || ie.Index != c.index {
				t.Fatalf("Along(%s) error = %v, want %v at index %d", c.name, err, c.want, c.index)
			}
		})
	}
}

// TestDevelopedLength_LinerAcrossPit checks the across-section liner length
// of check-values §7 [derived]: top width 10 ft, depth 2 ft, 1 ft overlap:
// Wb + 2·d·√(1 + z²) + 2·overlap with Wb = Wtop − 2·z·d gives 12.944 ft for
// z = 2 and 13.657 ft for z = 1 (the rule of thumb, 16 ft, assumes vertical
// walls). The profile comes from AlongMesh across a pit with planar sides,
// so it is exact.
func TestDevelopedLength_LinerAcrossPit(t *testing.T) {
	ft := units.Foot
	for _, c := range []struct{ run, want float64 }{{2, 12.944}, {1, 13.657}} {
		depth, top := 2*ft, 10*ft
		inset := c.run * depth
		// 10 ft wide across x (rim at x = 0 and 10 ft), 40 ft long in y.
		pit := rectPit(inset, inset, top-inset, 40*ft-inset, depth, c.run)
		path := geom.Polyline{{X: 0, Y: 20 * ft}, {X: top, Y: 20 * ft}}
		ch, z := AlongMesh(path, pit)
		prof := Profile{Chainage: ch, Z: [][]float64{z}}
		got := (prof.DevelopedLength(0, 0, top) + 2*ft) / ft
		if math.Round(got*1000)/1000 != c.want {
			t.Errorf("liner across (z = %g) = %.6f ft, want %.3f", c.run, got, c.want)
		}
		exact := top - 2*c.run*depth + 2*depth*math.Sqrt(1+c.run*c.run) + 2*ft
		if !closeAbs(got*ft, exact, exactTol) {
			t.Errorf("liner across (z = %g) = %.15g m, formula %.15g m", c.run, got*ft, exact)
		}
	}
}

func TestDevelopedLength(t *testing.T) {
	// A 3-4-5 slope, then flat, then no surface.
	p := Profile{Chainage: []float64{0, 4, 6, 8}, Z: [][]float64{{0, 3, 3, math.NaN()}}}
	cases := []struct {
		k        int
		from, to float64
		want     float64
	}{
		{0, 0, 8, 5 + 2},
		{0, 8, 0, 7},          // either order
		{0, -10, 100, 7},      // clamped
		{0, 2, 5, 2.5 + 1},    // half the slope, half the flat
		{0, 6, 8, 0},          // no surface
		{0, 3, 3, 0},          // empty range
		{1, 0, 8, math.NaN()}, // no such surface
	}
	for _, c := range cases {
		got := p.DevelopedLength(c.k, c.from, c.to)
		if math.IsNaN(c.want) != math.IsNaN(got) || (!math.IsNaN(c.want) && !closeAbs(got, c.want, exactTol)) {
			t.Errorf("DevelopedLength(%d, %g, %g) = %g, want %g", c.k, c.from, c.to, got, c.want)
		}
	}
	if got := (Profile{}).DevelopedLength(0, 0, 1); !math.IsNaN(got) {
		t.Errorf("empty Profile DevelopedLength = %g, want NaN", got)
	}
}
