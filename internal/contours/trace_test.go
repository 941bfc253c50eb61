package contours_test

import (
	"errors"
	"flag"
	"math"
	"math/rand/v2"
	"reflect"
	"slices"
	"testing"

	"github.com/dugout-estimating/dugout/internal/contours"
	"github.com/dugout-estimating/dugout/internal/geom"
)

var seed = flag.Uint64("contours.seed", 20240601, "seed for the randomised contour tests")

func rng(tb testing.TB) *rand.Rand {
	tb.Helper()
	s := *seed
	tb.Cleanup(func() {
		if tb.Failed() {
			tb.Logf("random seed %d (rerun with -contours.seed=%d)", s, s)
		}
	})
	return rand.New(rand.NewPCG(s, s^0x9e3779b97f4a7c15))
}

func opts(interval, base float64) contours.Options {
	return contours.Options{IntervalM: interval, BaseM: base, MinLevel: math.NaN(), MaxLevel: math.NaN()}
}

func mustTrace(tb testing.TB, m geom.TriMesh, o contours.Options) []contours.Line {
	tb.Helper()
	lines, err := contours.Trace(m, o)
	if err != nil {
		tb.Fatalf("Trace: %v", err)
	}
	return lines
}

func byLevel(lines []contours.Line) map[float64][]contours.Line {
	out := map[float64][]contours.Line{}
	for _, l := range lines {
		out[l.Level] = append(out[l.Level], l)
	}
	return out
}

// TestTrace_ConeFan checks a cone over a regular 24-gon fan: every contour
// vertex lies on a spoke, where linear interpolation puts it at exactly the
// cone's radius (H − z)/s (analytic), so each level is one regular 24-gon
// ring whose area is (n/2) r² sin(2π/n) (area of a regular polygon), wound
// counter-clockwise around a hill and clockwise around a pit.
func TestTrace_ConeFan(t *testing.T) {
	const n, r, h = 24, 10.0, 10.0
	const tol = 1e-12 // relative: one interpolation's round-off
	for _, tc := range []struct {
		name   string
		zc, zr float64
		sign   float64
		lines  int
	}{
		// Levels 1..9; level 0 only touches the rim and level 10 the apex.
		{"hill", h, 0, 1, 9},
		// Levels 1..10: the rim lies exactly on level 10 with lower ground
		// inside, so it is the edge of the level set and is traced.
		{"pit", 0, h, -1, 10},
	} {
		t.Run(tc.name, func(t *testing.T) {
			m := fanMesh(n, r, tc.zc, tc.zr)
			lines := mustTrace(t, m, opts(1, 0))
			checkLines(t, m, lines, true)
			if len(lines) != tc.lines {
				t.Fatalf("Trace(cone) gave %d lines, want %d", len(lines), tc.lines)
			}
			for i, l := range lines {
				if want := float64(i + 1); l.Level != want {
					t.Errorf("line %d level %g, want %g", i, l.Level, want)
				}
				want := r * math.Abs(l.Level-tc.zc) / h // radius of the level on the cone
				if !l.Closed || len(l.Pts) != n+1 {
					t.Fatalf("level %g: closed %v with %d points, want a ring of %d+1", l.Level, l.Closed, len(l.Pts), n)
				}
				for _, p := range l.Pts {
					if got := p.Norm(); math.Abs(got-want) > tol*r {
						t.Errorf("level %g: point %v at radius %.17g, want %.17g", l.Level, p, got, want)
					}
				}
				area := geom.Ring(l.Pts[:n]).Area()
				wantA := tc.sign * n / 2 * want * want * math.Sin(2*math.Pi/n)
				if math.Abs(area-wantA) > 1e-10*math.Abs(wantA) {
					t.Errorf("level %g: ring area %.15g, want %.15g", l.Level, area, wantA)
				}
			}
		})
	}
}

// TestTrace_ConeRings checks a cone z = 20 − r over concentric 36-gons: on
// every radial edge the contour is at exactly radius 20 − z (analytic), and
// since the cone is concave its linear interpolant lies below it, so no
// contour point is outside that circle (interpolation of a concave function,
// Jensen's inequality).
func TestTrace_ConeRings(t *testing.T) {
	const n, rings = 36, 10
	m := geom.TriMesh{V: []geom.Vec3{{Z: 20}}}
	for j := 1; j <= rings; j++ {
		for i := range n {
			a := 2 * math.Pi * float64(i) / n
			rr := 2 * float64(j)
			m.V = append(m.V, geom.Vec3{X: rr * math.Cos(a), Y: rr * math.Sin(a), Z: 20 - rr})
		}
	}
	id := func(j, i int) int32 { return int32(1 + (j-1)*n + (i+n)%n) }
	for i := range n {
		m.T = append(m.T, 0, id(1, i), id(1, i+1))
	}
	for j := 1; j < rings; j++ {
		for i := range n {
			a, b, c, d := id(j, i), id(j+1, i), id(j+1, i+1), id(j, i+1)
			m.T = append(m.T, a, b, c, a, c, d)
		}
	}
	lines := mustTrace(t, m, opts(1.5, 0.25))
	checkLines(t, m, lines, true)
	for _, l := range lines {
		want := 20 - l.Level
		onSpoke := 0
		for _, p := range l.Pts[:len(l.Pts)-1] {
			got := p.Norm()
			if got > want*(1+1e-12) {
				t.Errorf("level %g: point %v at radius %.17g, outside the cone's circle %g", l.Level, p, got, want)
			}
			if math.Abs(got-want) <= 1e-12*want {
				onSpoke++
			}
		}
		if !l.Closed || onSpoke != n {
			t.Errorf("level %g: closed %v, %d points on the circle, want a ring with %d", l.Level, l.Closed, onSpoke, n)
		}
	}
	if len(lines) != 14 { // levels 0.25, 1.75, ..., 19.75
		t.Errorf("Trace(cone) gave %d lines, want 14", len(lines))
	}
}

// jitter moves every vertex of m by up to ±f·d in x and y (which keeps the
// lattice triangles counter-clockwise for f < 0.25) and re-evaluates z.
func jitter(m geom.TriMesh, r *rand.Rand, d, f float64, z func(x, y float64) float64) geom.TriMesh {
	for i := range m.V {
		p := &m.V[i]
		p.X += (2*r.Float64() - 1) * f * d
		p.Y += (2*r.Float64() - 1) * f * d
		p.Z = z(p.X, p.Y)
	}
	return m
}

// TestTrace_Plane checks that on a plane z = 0.3x − 0.2y + 5 every level is
// one straight open line across the mesh (a plane's level sets are straight
// lines) with the uphill side, the gradient (0.3, −0.2), on its left.
func TestTrace_Plane(t *testing.T) {
	f := func(x, y float64) float64 { return 0.3*x - 0.2*y + 5 }
	m := jitter(gridMesh(15, 12, 0, 0, 1, f), rng(t), 1, 0.2, f)
	lines := mustTrace(t, m, opts(0.7, 0.05))
	checkLines(t, m, lines, true)
	levels := map[float64]bool{}
	for _, l := range lines {
		if l.Closed || levels[l.Level] {
			t.Fatalf("level %g: closed %v or a second line; want one open line per level", l.Level, l.Closed)
		}
		levels[l.Level] = true
		for _, p := range l.Pts {
			if d := f(p.X, p.Y) - l.Level; math.Abs(d) > 1e-12*10 {
				t.Errorf("level %g: point %v is %g off the plane's level line", l.Level, p, d)
			}
		}
		a, b := l.Pts[0], l.Pts[len(l.Pts)-1]
		if d := b.Sub(a); d.Cross(geom.Vec2{X: 0.3, Y: -0.2}) <= 0 {
			t.Errorf("level %g runs %v to %v with the gradient on its right", l.Level, a, b)
		}
	}
	if len(levels) < 5 {
		t.Fatalf("only %d levels traced", len(levels))
	}
}

// TestTrace_Saddle checks z = x² − y² on the integer lattice over [−2, 2]²,
// whose centre vertex is a saddle exactly at level 0 (analytic): with
// "z >= level is above", level 0 bounds the two wedges |y| > |x| that lie
// strictly below it, so it is two open lines that both pass through the
// saddle and lie on |x| = |y|; levels ±0.5 are two branches each.
func TestTrace_Saddle(t *testing.T) {
	f := func(x, y float64) float64 { return x*x - y*y }
	m := gridMesh(5, 5, -2, -2, 1, f)
	o := opts(0.5, 0)
	o.MinLevel, o.MaxLevel = -0.5, 0.5
	lines := mustTrace(t, m, o)
	checkLines(t, m, lines, true)
	bl := byLevel(lines)
	for _, lv := range []float64{-0.5, 0, 0.5} {
		if got := len(bl[lv]); got != 2 {
			t.Errorf("level %g: %d lines, want 2", lv, got)
		}
		for _, l := range bl[lv] {
			if l.Closed {
				t.Errorf("level %g: ring, want open lines", lv)
			}
		}
	}
	for _, l := range bl[0] {
		if !slices.Contains(l.Pts, geom.Vec2{}) {
			t.Errorf("level 0 line %v misses the saddle vertex", l.Pts)
		}
		for _, p := range l.Pts {
			if math.Abs(math.Abs(p.X)-math.Abs(p.Y)) > 1e-15 {
				t.Errorf("level 0 point %v is off |x| = |y|", p)
			}
		}
	}
}

// TestTrace_PyramidLattice checks z = 6 − max(|x|, |y|) on the integer
// lattice over [−6, 6]² with integer levels, where every contour runs
// exactly through lattice vertices (analytic): level k is the square of
// half-side s = 6 − k, traced counter-clockwise through all 8s lattice
// points of its perimeter from its south-west corner, with no repeated
// point and no gap; the peak (level 6) and the base (level 0) give nothing.
func TestTrace_PyramidLattice(t *testing.T) {
	f := func(x, y float64) float64 { return 6 - math.Max(math.Abs(x), math.Abs(y)) }
	m := gridMesh(13, 13, -6, -6, 1, f)
	lines := mustTrace(t, m, opts(1, 0))
	checkLines(t, m, lines, true)
	if len(lines) != 5 {
		t.Fatalf("Trace(pyramid) gave %d lines, want 5", len(lines))
	}
	for _, l := range lines {
		s := 6 - l.Level
		var want []geom.Vec2
		for x := -s; x < s; x++ {
			want = append(want, geom.Vec2{X: x, Y: -s})
		}
		for y := -s; y < s; y++ {
			want = append(want, geom.Vec2{X: s, Y: y})
		}
		for x := s; x > -s; x-- {
			want = append(want, geom.Vec2{X: x, Y: s})
		}
		for y := s; y > -s; y-- {
			want = append(want, geom.Vec2{X: -s, Y: y})
		}
		want = append(want, want[0])
		if !l.Closed || !slices.Equal(l.Pts, want) {
			t.Errorf("level %g: closed %v, points %v\nwant ring %v", l.Level, l.Closed, l.Pts, want)
		}
	}
}

// directedHausdorff returns the largest distance from a point of a to the
// nearest segment of b (segments touching a NaN point separate lines).
func directedHausdorff(a, b []geom.Vec2) float64 {
	worst := 0.0
	for _, p := range a {
		best := math.Inf(1)
		for i := 1; i < len(b); i++ {
			if d := geom.SegmentDistanceSquared(p, b[i-1], b[i]); d < best {
				best = d
			}
		}
		worst = math.Max(worst, best)
	}
	return math.Sqrt(worst)
}

// TestTrace_IntegerLattice checks random integer elevations 0..3 on the
// integer lattice at the integer levels, where many vertices lie exactly on
// a level: the lines keep every invariant (no repeated points or segments,
// rings closed exactly, open ends on the boundary), and every point lies
// within 1e-6 of the lines at level − 1e-7, where no vertex is on the level
// (the symbolic perturbation, Edelsbrunner and Mücke 1990, is the limit of
// that real perturbation; the ridges the perturbed lines trace twice are
// cancelled, so the converse does not hold).
func TestTrace_IntegerLattice(t *testing.T) {
	r := rng(t)
	for trial := range 20 {
		m := gridMesh(10, 9, 0, 0, 1, func(x, y float64) float64 { return float64(r.IntN(4)) })
		for lv := 1.0; lv <= 3; lv++ {
			got := contours.TraceLevel(m, lv)
			checkLines(t, m, got, true)
			var near []geom.Vec2 // all perturbed lines, NaN-separated
			for _, n := range contours.TraceLevel(m, lv-1e-7) {
				near = append(append(near, n.Pts...), geom.Vec2{X: math.NaN(), Y: math.NaN()})
			}
			for _, l := range got {
				if d := directedHausdorff(l.Pts, near); !(d <= 1e-6) {
					t.Fatalf("trial %d level %g: line %v is %g from the lines at the perturbed level", trial, lv, l.Pts, d)
				}
			}
		}
	}
}

// TestTrace_FlatAtLevel checks flat triangles lying exactly on a level
// (common practice for a flat pond bottom or terrace; analytic): a plateau
// at the level is wholly "above" it, so the level is traced once round the
// plateau's rim and never across it; a terrace at the level between higher
// and lower ground gives one line along its lower edge; a mesh flat at the
// level gives nothing.
func TestTrace_FlatAtLevel(t *testing.T) {
	t.Run("plateau", func(t *testing.T) {
		f := func(x, y float64) float64 { return math.Min(1, 3-math.Max(math.Abs(x), math.Abs(y))) }
		m := gridMesh(7, 7, -3, -3, 1, f)
		lines := contours.TraceLevel(m, 1)
		checkLines(t, m, lines, true)
		if len(lines) != 1 || !lines[0].Closed || len(lines[0].Pts) != 17 {
			t.Fatalf("TraceLevel(plateau, 1) = %v, want one ring of 16 points round the plateau", lines)
		}
		for _, p := range lines[0].Pts {
			if math.Max(math.Abs(p.X), math.Abs(p.Y)) != 2 {
				t.Errorf("point %v is not on the plateau's rim", p)
			}
		}
	})
	t.Run("terrace", func(t *testing.T) {
		f := func(x, y float64) float64 { return math.Min(x, math.Max(1, x-2)) }
		m := gridMesh(6, 4, 0, 0, 1, f)
		lines := contours.TraceLevel(m, 1)
		checkLines(t, m, lines, true)
		if len(lines) != 1 || lines[0].Closed {
			t.Fatalf("TraceLevel(terrace, 1) = %v, want one open line", lines)
		}
		for _, p := range lines[0].Pts {
			if p.X != 1 {
				t.Errorf("point %v is not on the terrace's lower edge x = 1", p)
			}
		}
	})
	t.Run("flat", func(t *testing.T) {
		m := gridMesh(4, 4, 0, 0, 1, func(x, y float64) float64 { return 2 })
		if lines := contours.TraceLevel(m, 2); len(lines) != 0 {
			t.Errorf("TraceLevel(flat at 2, 2) = %v, want none", lines)
		}
		if lines := mustTrace(t, m, opts(1, 0)); len(lines) != 0 {
			t.Errorf("Trace(flat at 2) = %v, want none", lines)
		}
	})
	t.Run("ridge", func(t *testing.T) {
		// A ridge along y = 1 exactly at the level with lower ground on
		// both sides only touches the level: no line (like a peak).
		f := func(x, y float64) float64 { return 1 - math.Abs(y-1) }
		m := gridMesh(5, 3, 0, 0, 1, f)
		checkLines(t, m, contours.TraceLevel(m, 1), true)
		if lines := contours.TraceLevel(m, 1); len(lines) != 0 {
			t.Errorf("TraceLevel(ridge, 1) = %v, want none", lines)
		}
	})
}

// TestTrace_Index checks that levels base + k·interval with k a multiple of
// IndexEvery are index lines (common practice: every fifth contour is an
// index contour, no source).
func TestTrace_Index(t *testing.T) {
	m := fanMesh(8, 10, 10, 0)
	for _, tc := range []struct {
		every int
		base  float64
		want  []float64
	}{
		{0, 0, []float64{5}},
		{2, 0, []float64{2, 4, 6, 8}},
		{3, 0.5, []float64{0.5, 0.5 + 3, 0.5 + 6, 0.5 + 9}},
		{4, -3, []float64{1, 5, 9}},
	} {
		o := opts(1, tc.base)
		o.IndexEvery = tc.every
		var got []float64
		for _, l := range mustTrace(t, m, o) {
			if l.Index {
				got = append(got, l.Level)
			}
		}
		if !slices.Equal(got, tc.want) {
			t.Errorf("Trace(IndexEvery %d, base %g) index levels %v, want %v", tc.every, tc.base, got, tc.want)
		}
	}
}

// terrain is the reference bench's synthetic site surface
// (../shared/refbench/README.md, "The synthetic site"), in local metres
// with u = x, v = y.
func terrain(x, y float64) float64 {
	return 100 + 0.02*x + 0.01*y + 0.5*math.Sin(2*math.Pi*x/80)*math.Cos(2*math.Pi*y/60) +
		0.3*math.Cos(2*math.Pi*(x/45+y/110))
}

// TestTrace_Deterministic checks that the lines depend only on the surface:
// renumbering the vertices, shuffling the triangles and rotating the
// corners of each triangle gives identical output, as do repeated calls.
func TestTrace_Deterministic(t *testing.T) {
	r := rng(t)
	m := jitter(gridMesh(41, 31, 0, 0, 5, terrain), r, 5, 0.2, terrain)
	o := opts(0.1, 0)
	want := mustTrace(t, m, o)
	checkLines(t, m, want[:40], true)
	if got := mustTrace(t, m, o); !reflect.DeepEqual(got, want) {
		t.Fatal("second Trace differs from the first")
	}
	perm := r.Perm(len(m.V))
	p := geom.TriMesh{V: make([]geom.Vec3, len(m.V))}
	for i, v := range m.V {
		p.V[perm[i]] = v
	}
	order := r.Perm(m.NumTriangles())
	for _, tt := range order {
		c := []int32{int32(perm[m.T[3*tt]]), int32(perm[m.T[3*tt+1]]), int32(perm[m.T[3*tt+2]])}
		k := r.IntN(3)
		p.T = append(p.T, c[k], c[(k+1)%3], c[(k+2)%3])
	}
	if got := mustTrace(t, p, o); !reflect.DeepEqual(got, want) {
		t.Fatalf("Trace of the renumbered mesh differs: %d lines, want %d", len(got), len(want))
	}
	for _, lv := range []float64{want[0].Level, want[len(want)/2].Level, want[len(want)-1].Level} {
		var fromTrace []contours.Line
		for _, l := range want {
			if l.Level == lv {
				l.Index = false
				fromTrace = append(fromTrace, l)
			}
		}
		if got := contours.TraceLevel(m, lv); !reflect.DeepEqual(got, fromTrace) {
			t.Errorf("TraceLevel(%g) gave %d lines, Trace %d", lv, len(got), len(fromTrace))
		}
	}
}

// TestTrace_BadMesh puts degenerate and invalid meshes through Trace (which
// rejects them with a MeshError naming the triangle) and TraceLevel (which
// skips what it cannot use, and never panics).
func TestTrace_BadMesh(t *testing.T) {
	good := fanMesh(6, 1, 1, 0)
	nan := fanMesh(6, 1, 1, 0)
	nan.V[3].Z = math.NaN()
	nonManifold := fanMesh(6, 1, 1, 0)
	nonManifold.V = append(nonManifold.V, geom.Vec3{X: 0.5, Y: 2, Z: 1}) // so that level 0.5 crosses all three
	nonManifold.T = append(nonManifold.T, 1, 2, 7, 2, 1, 7)
	for _, tc := range []struct {
		name  string
		m     geom.TriMesh
		want  error
		tri   int
		lines int // from TraceLevel at 0.5
	}{
		{"empty", geom.TriMesh{}, nil, -1, 0},
		{"no triangles", geom.TriMesh{V: good.V}, nil, -1, 0},
		{"ragged", geom.TriMesh{V: good.V, T: append(slices.Clone(good.T), 1)}, contours.ErrTriangleList, -1, 1},
		{"index", geom.TriMesh{V: good.V, T: append(slices.Clone(good.T), 1, 2, 9)}, contours.ErrIndex, 6, 1},
		{"negative index", geom.TriMesh{V: good.V, T: append([]int32{0, -1, 2}, good.T...)}, contours.ErrIndex, 0, 1},
		{"repeated vertex", geom.TriMesh{V: good.V, T: append(slices.Clone(good.T), 1, 1, 2)}, contours.ErrDegenerate, 6, 1},
		{"nan", nan, contours.ErrNonFinite, 1, 1}, // triangle 1 is (0, 2, 3)
		{"non-manifold", nonManifold, contours.ErrNonManifold, 0, 1},
	} {
		t.Run(tc.name, func(t *testing.T) {
			lines, err := contours.Trace(tc.m, opts(0.5, 0))
			if !errors.Is(err, tc.want) {
				t.Fatalf("Trace error %v, want %v", err, tc.want)
			}
			var me *contours.MeshError
			if tc.want != nil && (!errors.As(err, &me) || me.Triangle != tc.tri) {
				t.Fatalf("Trace error %#v, want a MeshError for triangle %d", err, tc.tri)
			}
			if err == nil && len(lines) != 0 {
				t.Fatalf("Trace gave %d lines, want none", len(lines))
			}
			got := contours.TraceLevel(tc.m, 0.5)
			if len(got) != tc.lines {
				t.Errorf("TraceLevel gave %d lines, want %d", len(got), tc.lines)
			}
		})
	}
	for _, lv := range []float64{math.NaN(), math.Inf(1), math.Inf(-1), -1, 1, 2} {
		if got := contours.TraceLevel(good, lv); len(got) != 0 {
			t.Errorf("TraceLevel(fan, %g) = %v, want none", lv, got)
		}
	}
	if _, err := contours.Trace(good, contours.Options{}); !errors.Is(err, contours.ErrInterval) {
		t.Errorf("Trace(zero Options) error %v, want ErrInterval", err)
	}
}

// TestTrace_Smooth checks the smoothing guarantee on the bench terrain:
// every point of a smoothed line is on the mesh within half an interval of
// its level, line ends are unchanged, and no two segments of any smoothed
// lines cross or touch except consecutive ones (brute force).
func TestTrace_Smooth(t *testing.T) {
	r := rng(t)
	m := jitter(gridMesh(21, 16, 0, 0, 10, terrain), r, 10, 0.2, terrain)
	o := opts(0.25, 0)
	plain := mustTrace(t, m, o)
	o.Smooth = true
	smooth := mustTrace(t, m, o)
	if len(plain) != len(smooth) {
		t.Fatalf("smoothing changed the number of lines: %d, want %d", len(smooth), len(plain))
	}
	cut := 0
	type seg struct {
		a, b geom.Vec2
		line int
	}
	var segs []seg
	ends := map[[3]geom.Vec2]int{} // level, first and last point of the open plain lines
	rings := map[float64]int{}
	for _, p := range plain {
		if p.Closed {
			rings[p.Level]++
		} else {
			ends[[3]geom.Vec2{{X: p.Level}, p.Pts[0], p.Pts[len(p.Pts)-1]}]++
		}
		cut -= len(p.Pts)
	}
	for i, l := range smooth {
		if l.Closed {
			rings[l.Level]--
			if l.Pts[0] != l.Pts[len(l.Pts)-1] {
				t.Errorf("line %d: smoothed ring not closed", i)
			}
		} else {
			k := [3]geom.Vec2{{X: l.Level}, l.Pts[0], l.Pts[len(l.Pts)-1]}
			if ends[k] == 0 {
				t.Errorf("line %d: smoothed open line %v has ends no plain line has", i, k)
			}
			ends[k]--
		}
		cut += len(l.Pts)
		for j, q := range l.Pts {
			z, ok := evalMesh(m, q)
			if !ok || math.Abs(z-l.Level) >= 0.5*o.IntervalM {
				t.Fatalf("line %d point %d %v: z %g, want within half an interval of %g", i, j, q, z, l.Level)
			}
			if j > 0 {
				segs = append(segs, seg{l.Pts[j-1], q, i})
			}
		}
	}
	for lv, n := range rings {
		if n != 0 {
			t.Errorf("level %g: smoothing changed the number of rings by %d", lv, -n)
		}
	}
	if cut < len(plain) {
		t.Errorf("smoothing added only %d points to %d lines", cut, len(plain))
	}
	for i := range segs {
		for j := i + 1; j < len(segs); j++ {
			a, b := segs[i], segs[j]
			if a.line == b.line && (a.b == b.a || b.b == a.a) {
				continue // consecutive segments of a line
			}
			if segmentsMeet(a.a, a.b, b.a, b.b) {
				t.Fatalf("smoothed segments %v-%v (line %d) and %v-%v (line %d) meet", a.a, a.b, a.line, b.a, b.b, b.line)
			}
		}
	}
}

// segmentsMeet reports whether closed segments ab and cd share a point, in
// floating point (fine for a test on well-separated data).
func segmentsMeet(a, b, c, d geom.Vec2) bool {
	o := func(p, q, r geom.Vec2) float64 { return q.Sub(p).Cross(r.Sub(p)) }
	d1, d2 := o(c, d, a), o(c, d, b)
	d3, d4 := o(a, b, c), o(a, b, d)
	if ((d1 > 0 && d2 < 0) || (d1 < 0 && d2 > 0)) && ((d3 > 0 && d4 < 0) || (d3 < 0 && d4 > 0)) {
		return true
	}
	on := func(p, q, r geom.Vec2) bool { return geom.SegmentDistanceSquared(r, p, q) == 0 }
	return on(c, d, a) || on(c, d, b) || on(a, b, c) || on(a, b, d)
}
