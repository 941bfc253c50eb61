package cutfill

import (
	"errors"
	"math"
	"math/rand/v2"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/units"
)

func mustCompare(tb testing.TB, before, after geom.TriMesh, boundary []geom.Ring) CompareResult {
	tb.Helper()
	r, err := Compare(before, after, boundary)
	if err != nil {
		tb.Fatalf("Compare: %v", err)
	}
	return r
}

// pyramidPit returns a pit shaped as a pyramid: square base [-a,a]² at z = 0
// and apex (ax, ay, -h) inside it, as a fan of four triangles.
func pyramidPit(a, ax, ay, h float64) geom.TriMesh {
	return geom.TriMesh{
		V: []geom.Vec3{{X: -a, Y: -a}, {X: a, Y: -a}, {X: a, Y: a}, {X: -a, Y: a}, {X: ax, Y: ay, Z: -h}},
		T: []int32{0, 1, 4, 1, 2, 4, 2, 3, 4, 3, 0, 4},
	}
}

// TestCompare_Pyramid checks the pyramid pit against V = base × height / 3
// (exact mensuration; Webb 1903 §110 uses the same figure) to 1e-9 relative,
// with the ground before digging triangulated independently of the pit.
func TestCompare_Pyramid(t *testing.T) {
	rng := rand.New(rand.NewPCG(testSeed(t), 1))
	cases := []struct {
		name          string
		a, ax, ay, h  float64
		nx, ny        int
		theta, dx, dy float64
	}{
		{name: "centred apex, 2 triangles before", a: 5, h: 3, nx: 1, ny: 1},
		{name: "oblique apex", a: 5, ax: 2.5, ay: -1.25, h: 2, nx: 7, ny: 5},
		{name: "jittered before, rotated", a: 10, ax: -3, ay: 4, h: 6.5, nx: 13, ny: 11, theta: 0.5235987755982988},
		{name: "far from origin", a: 2, ax: 0.3, ay: 0.1, h: 1.2, nx: 9, ny: 9, theta: 1.1, dx: 350.25, dy: -720.5},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			after := transformMesh(pyramidPit(c.a, c.ax, c.ay, c.h), c.theta, c.dx, c.dy, 0)
			before := transformMesh(gridMesh(-c.a, -c.a, c.a, c.a, c.nx, c.ny, func(float64, float64) float64 { return 0 }, rng, 0.2), c.theta, c.dx, c.dy, 0)
			want := 4 * c.a * c.a * c.h / 3 // base (2a)² × h / 3
			r := mustCompare(t, before, after, nil)
			if !closeRel(r.CutM3, want, exactRel, 1) || r.FillM3 > exactRel*want {
				t.Errorf("Compare(pyramid) = cut %.15g fill %.3g, want cut %.15g fill 0 (seed %d)", r.CutM3, r.FillM3, want, testSeed(t))
			}
			if !closeRel(r.AreaM2, 4*c.a*c.a, exactRel, 1) {
				t.Errorf("Compare(pyramid).AreaM2 = %.15g, want %.15g", r.AreaM2, 4*c.a*c.a)
			}
			if !closeRel(r.NetM3, want, exactRel, 1) {
				t.Errorf("Compare(pyramid).NetM3 = %.15g, want %.15g", r.NetM3, want)
			}
		})
	}
}

// TestCompare_PondFrustum is the published pond: 100 ft × 70 ft at the
// surface, all four sides at 2H:1V, 12 ft deep, bottom 52 ft × 22 ft:
// 44 256 ft³ (University of Regina Math Central answer, check-values §2c
// [confirmed]).
func TestCompare_PondFrustum(t *testing.T) {
	ft := units.Foot
	bottom := []geom.Vec2{{X: 24 * ft, Y: 24 * ft}, {X: 76 * ft, Y: 24 * ft}, {X: 76 * ft, Y: 46 * ft}, {X: 24 * ft, Y: 46 * ft}}
	after := mitredPit(bottom, -12*ft, 2, 24*ft)
	before := flatMesh(-10*ft, -10*ft, 110*ft, 80*ft, 0)
	r := mustCompare(t, before, after, nil)
	want := 44256 * units.CubicFoot
	if !closeRel(r.CutM3, want, 1e-12, 1) || r.FillM3 > 1e-12*want {
		t.Errorf("Compare(pond) = cut %.12g ft³ fill %g, want 44256 ft³", r.CutM3/units.CubicFoot, r.FillM3)
	}
	if !closeRel(r.AreaM2, 100*70*units.SquareFoot, 1e-12, 1) {
		t.Errorf("Compare(pond).AreaM2 = %.12g ft², want 7000 (the rim)", r.AreaM2/units.SquareFoot)
	}
	// The prismoidal formula with the true mid-section 76 × 46 ft = 3496 ft²
	// reproduces the same volume (check-values §2c [derived]).
	if p := Prismoidal(12*ft, 100*70*units.SquareFoot, 76*46*units.SquareFoot, 52*22*units.SquareFoot); !closeRel(p, r.CutM3, 1e-12, 1) {
		t.Errorf("Prismoidal(pond) = %.12g ft³, exact overlay %.12g ft³", p/units.CubicFoot, r.CutM3/units.CubicFoot)
	}
}

// TestCompare_SquareFrustum checks the square frustum, 10 × 10 ft bottom,
// 20 × 20 ft top, 6 ft deep: exactly 1400 ft³; the prismoidal formula (mid
// section 15 × 15 = 225 ft²) gives 1400 and the average-end-area method 1500
// (check-values §2c [derived]; Webb 1903 §§107–114 for the two methods).
func TestCompare_SquareFrustum(t *testing.T) {
	ft := units.Foot
	bottom := []geom.Vec2{{X: 5 * ft, Y: 5 * ft}, {X: 15 * ft, Y: 5 * ft}, {X: 15 * ft, Y: 15 * ft}, {X: 5 * ft, Y: 15 * ft}}
	after := mitredPit(bottom, -6*ft, 5.0/6, 5*ft) // 5 ft run over 6 ft depth
	rng := rand.New(rand.NewPCG(testSeed(t), 2))
	before := gridMesh(0, 0, 20*ft, 20*ft, 6, 6, func(float64, float64) float64 { return 0 }, rng, 0.2)
	r := mustCompare(t, before, after, nil)
	exact := r.CutM3 / units.CubicFoot
	if !closeRel(exact, 1400, exactRel, 1) {
		t.Errorf("Compare(frustum) = %.12g ft³, want 1400", exact)
	}
	h, a1, am, a2 := 6*ft, 100*units.SquareFoot, 225*units.SquareFoot, 400*units.SquareFoot
	if p := Prismoidal(h, a1, am, a2) / units.CubicFoot; !closeRel(p, exact, exactRel, 1) {
		t.Errorf("Prismoidal(frustum) = %.12g ft³, exact overlay %.12g", p, exact)
	}
	aea := AverageEndArea(h, a1, a2) / units.CubicFoot
	if !closeRel(aea, 1500, 1e-12, 1) {
		t.Errorf("AverageEndArea(frustum) = %.12g ft³, want 1500", aea)
	}
	if d := aea - exact; !closeRel(d, 100, 1e-6, 1) {
		t.Errorf("average end area overestimates by %.9g ft³, want 100", d)
	}
}

// TestAverageEndArea_Pyramid checks Webb's extreme case (1903 §110,
// check-values §2c [confirmed]): for a pyramid the average-end-area rule
// gives A·h/2 against the true A·h/3, so "the correction is one-third of the
// approximate volume, or one-half of the true volume".
func TestAverageEndArea_Pyramid(t *testing.T) {
	const a, h = 5.0, 3.0
	r := mustCompare(t, flatMesh(-a, -a, a, a, 0), pyramidPit(a, 0, 0, h), nil)
	aea := AverageEndArea(h, 4*a*a, 0)
	if got := aea - r.CutM3; !closeRel(got, aea/3, exactRel, 1) || !closeRel(got, r.CutM3/2, exactRel, 1) {
		t.Errorf("AEA − exact = %.12g, want AEA/3 = %.12g = exact/2 = %.12g", got, aea/3, r.CutM3/2)
	}
	if p := Prismoidal(h, 4*a*a, a*a, 0); !closeRel(p, r.CutM3, exactRel, 1) {
		t.Errorf("Prismoidal(pyramid) = %.12g, exact %.12g", p, r.CutM3)
	}
}

// randomSurface returns a jittered, randomly split grid mesh over [0,w]×[0,h]
// carrying a smooth random function plus per-vertex noise.
func randomSurface(rng *rand.Rand, w, h float64, nx, ny int, noise float64) geom.TriMesh {
	a, b, c := rng.Float64()*0.4-0.2, rng.Float64()*0.4-0.2, rng.Float64()*2-1
	k1, k2 := 0.3+rng.Float64(), 0.3+rng.Float64()
	f := func(x, y float64) float64 {
		return c + a*x + b*y + 0.8*math.Sin(k1*x)*math.Cos(k2*y) + noise*(2*rng.Float64()-1)
	}
	return gridMesh(0, 0, w, h, nx, ny, f, rng, 0.24)
}

// TestCompare_SwapSurfaces checks that exchanging the surfaces exchanges cut
// and fill and negates the net (a consistency property, STYLE.md §6).
func TestCompare_SwapSurfaces(t *testing.T) {
	seed := testSeed(t)
	rng := rand.New(rand.NewPCG(seed, 3))
	for k := range 5 {
		a := randomSurface(rng, 20, 15, 17, 13, 0.3)
		b := randomSurface(rng, 20, 15, 11, 19, 0.3)
		r1 := mustCompare(t, a, b, nil)
		r2 := mustCompare(t, b, a, nil)
		if !closeRel(r1.CutM3, r2.FillM3, swapRel, 1) || !closeRel(r1.FillM3, r2.CutM3, swapRel, 1) ||
			!closeRel(r1.NetM3, -r2.NetM3, swapRel, r1.CutM3) || !closeRel(r1.AreaM2, r2.AreaM2, swapRel, 1) {
			t.Errorf("case %d (seed %d): Compare(a,b) = %+v, Compare(b,a) = %+v: cut and fill should swap", k, seed, r1, r2)
		}
		if d := r1.CutM3 - r1.FillM3 - r1.NetM3; math.Abs(d) > swapRel*(r1.CutM3+r1.FillM3) {
			t.Errorf("case %d: cut − fill − net = %g, want 0", k, d)
		}
	}
}

// TestCompare_Translation checks that moving both surfaces in plan and in
// height leaves the volumes unchanged (up to round-off on the larger
// coordinates).
func TestCompare_Translation(t *testing.T) {
	seed := testSeed(t)
	rng := rand.New(rand.NewPCG(seed, 4))
	a := randomSurface(rng, 20, 15, 17, 13, 0.3)
	b := randomSurface(rng, 20, 15, 11, 19, 0.3)
	r0 := mustCompare(t, a, b, nil)
	for _, sh := range [][3]float64{{1234.5, -987.25, 0}, {-3e4, 2e4, 250}, {0.1, 0.2, -1000}} {
		r := mustCompare(t, transformMesh(a, 0, sh[0], sh[1], sh[2]), transformMesh(b, 0, sh[0], sh[1], sh[2]), nil)
		// Coordinates of 3e4 m carry absolute errors of about 4e-12 m, so
		// the tolerance is wider than for the swap.
		if !closeRel(r.CutM3, r0.CutM3, 1e-9, 1) || !closeRel(r.FillM3, r0.FillM3, 1e-9, 1) || !closeRel(r.AreaM2, r0.AreaM2, 1e-9, 1) {
			t.Errorf("shift %v (seed %d): Compare = %+v, unshifted %+v", sh, seed, r, r0)
		}
	}
}

// TestCompare_WorkerCountIrrelevant checks that the result is bit-for-bit the
// same however many goroutines share the work (fixed chunks, merged in
// order; STYLE.md §5.6).
func TestCompare_WorkerCountIrrelevant(t *testing.T) {
	rng := rand.New(rand.NewPCG(testSeed(t), 5))
	a := randomSurface(rng, 60, 50, 61, 47, 0.3) // > 4 chunks of before-triangles
	b := randomSurface(rng, 60, 50, 43, 59, 0.3)
	ring := []geom.Ring{{{X: 3, Y: 2}, {X: 55, Y: 4}, {X: 30, Y: 25}, {X: 50, Y: 45}, {X: 5, Y: 40}}}
	for _, bd := range [][]geom.Ring{nil, ring} {
		r1, err := compare(a, b, bd, 1)
		if err != nil {
			t.Fatal(err)
		}
		for _, w := range []int{2, 3, 8} {
			rw, err := compare(a, b, bd, w)
			if err != nil {
				t.Fatal(err)
			}
			if rw != r1 {
				t.Errorf("compare(workers=%d) = %+v, workers=1 gave %+v", w, rw, r1)
			}
		}
	}
}

// meshLocator finds the triangle of a gridMesh containing a point, by
// scanning the cells around it (test helper; brute force within ±1 cell is
// enough because jitter stays below a quarter cell).
type meshLocator struct {
	m      geom.TriMesh
	x0, y0 float64
	hx, hy float64
	nx, ny int
}

// locate returns the triangle index holding p, or -1, and the height there.
func (l meshLocator) locate(p geom.Vec2) (int, float64) {
	ci := int(math.Floor((p.X - l.x0) / l.hx))
	cj := int(math.Floor((p.Y - l.y0) / l.hy))
	for dj := -1; dj <= 1; dj++ {
		for di := -1; di <= 1; di++ {
			i, j := ci+di, cj+dj
			if i < 0 || j < 0 || i >= l.nx || j >= l.ny {
				continue
			}
			for k := range 2 {
				t := 2*(j*l.nx+i) + k
				a, b, c := l.m.Triangle(t)
				d := geom.PlanArea(a, b, c)
				w0 := geom.PlanArea(geom.Vec3{X: p.X, Y: p.Y}, b, c) / d
				w1 := geom.PlanArea(a, geom.Vec3{X: p.X, Y: p.Y}, c) / d
				w2 := 1 - w0 - w1
				if w0 >= 0 && w1 >= 0 && w2 >= 0 {
					return t, w0*a.Z + w1*b.Z + w2*c.Z
				}
			}
		}
	}
	return -1, math.NaN()
}

// maxSlope returns the largest plan gradient of any triangle of m.
func maxSlope(m geom.TriMesh) float64 {
	g := 0.0
	for t := range m.NumTriangles() {
		a, b, c := m.Triangle(t)
		det := 2 * geom.PlanArea(a, b, c)
		pl := planeOf(a, b, c, det)
		g = math.Max(g, math.Hypot(pl.gx, pl.gy))
	}
	return g
}

// midpointRef integrates (a − b)⁺ and (b − a)⁺ over square cells by the
// midpoint rule, refining a cell into four while it is not known to be
// linear, down to maxDepth levels. It returns the two integrals and a bound
// on their error.
//
// The midpoint rule is exact on a cell where a, b and the sign of a − b do
// not change, since f⁺ is then linear. A convex cell lies in one triangle
// when its four corners do, and a linear function keeps its sign on the
// cell when its corners agree. On any other cell of side s the error is at
// most s²·L·s/√2, L being a Lipschitz constant of a − b (the midpoint is
// s/√2 from every point of the cell).
type midpointRef struct {
	la, lb   meshLocator
	lip      float64
	maxDepth int
	cut      geom.Sum
	fill     geom.Sum
	bound    float64
}

func (m *midpointRef) eval(x, y float64) (ta, tb int, f float64) {
	ta, za := m.la.locate(geom.Vec2{X: x, Y: y})
	tb, zb := m.lb.locate(geom.Vec2{X: x, Y: y})
	return ta, tb, za - zb
}

func (m *midpointRef) cell(x0, y0, s float64, depth int) {
	ta0, tb0, f0 := m.eval(x0, y0)
	linear := ta0 >= 0 && tb0 >= 0
	pos, neg := f0 >= 0, f0 <= 0
	for _, q := range [3][2]float64{{x0 + s, y0}, {x0 + s, y0 + s}, {x0, y0 + s}} {
		ta, tb, f := m.eval(q[0], q[1])
		linear = linear && ta == ta0 && tb == tb0
		pos, neg = pos && f >= 0, neg && f <= 0
	}
	if !linear || !(pos || neg) {
		if depth < m.maxDepth {
			h := s / 2
			m.cell(x0, y0, h, depth+1)
			m.cell(x0+h, y0, h, depth+1)
			m.cell(x0, y0+h, h, depth+1)
			m.cell(x0+h, y0+h, h, depth+1)
			return
		}
		m.bound += s * s * m.lip * s / math.Sqrt2
	}
	_, _, fm := m.eval(x0+s/2, y0+s/2)
	m.cut.Add(s * s * math.Max(0, fm))
	m.fill.Add(s * s * math.Max(0, -fm))
}

func meanZ(m geom.TriMesh) float64 {
	var s geom.Sum
	for _, v := range m.V {
		s.Add(v.Z)
	}
	return s.Value() / float64(len(m.V))
}

// TestCompare_RandomAgainstMidpointGrid compares the exact overlay of two
// random surfaces with a fine (adaptive) midpoint grid of their difference,
// within the grid's proven error bound (see [midpointRef]).
func TestCompare_RandomAgainstMidpointGrid(t *testing.T) {
	seed := testSeed(t)
	rng := rand.New(rand.NewPCG(seed, 6))
	const w, hgt = 8.0, 6.0
	na, ma := 9, 7
	nb, mb := 6, 10
	a := randomSurface(rng, w, hgt, na, ma, 0.05)
	b := randomSurface(rng, w, hgt, nb, mb, 0.05)
	b = transformMesh(b, 0, 0, 0, meanZ(a)-meanZ(b)) // so that there is both cut and fill
	ref := midpointRef{
		la:       meshLocator{m: a, hx: w / float64(na), hy: hgt / float64(ma), nx: na, ny: ma},
		lb:       meshLocator{m: b, hx: w / float64(nb), hy: hgt / float64(mb), nx: nb, ny: mb},
		lip:      maxSlope(a) + maxSlope(b),
		maxDepth: 5,
	}
	if testing.Short() {
		ref.maxDepth = 3
	}
	const h = 0.1
	for j := range int(math.Round(hgt / h)) {
		for i := range int(math.Round(w / h)) {
			ref.cell(float64(i)*h, float64(j)*h, h, 0)
		}
	}
	r := mustCompare(t, a, b, nil)
	if d := math.Abs(r.CutM3 - ref.cut.Value()); d > ref.bound {
		t.Errorf("seed %d: exact cut %.9g, midpoint %.9g: differ by %.3g > bound %.3g", seed, r.CutM3, ref.cut.Value(), d, ref.bound)
	}
	if d := math.Abs(r.FillM3 - ref.fill.Value()); d > ref.bound {
		t.Errorf("seed %d: exact fill %.9g, midpoint %.9g: differ by %.3g > bound %.3g", seed, r.FillM3, ref.fill.Value(), d, ref.bound)
	}
	if !testing.Short() && ref.bound > 1e-3*(r.CutM3+r.FillM3) {
		t.Errorf("seed %d: bound %.3g too loose to test anything (cut %.3g, fill %.3g)", seed, ref.bound, r.CutM3, r.FillM3)
	}
	if !closeRel(r.AreaM2, w*hgt, 1e-12, 1) {
		t.Errorf("AreaM2 = %.15g, want %g", r.AreaM2, w*hgt)
	}
}

// TestCompare_Boundary clips to a concave (L-shaped) boundary: before is the
// plane z = 1 + 0.1x, after is flat at 0, so the cut over a polygon is
// ∬(1 + 0.1x) dA = A·(1 + 0.1·x̄), x̄ the polygon's centroid (exact).
func TestCompare_Boundary(t *testing.T) {
	rng := rand.New(rand.NewPCG(testSeed(t), 7))
	before := gridMesh(0, 0, 10, 10, 7, 6, func(x, y float64) float64 { return 1 + 0.1*x }, rng, 0.2)
	after := gridMesh(0, 0, 10, 10, 5, 9, func(x, y float64) float64 { return 0 }, rng, 0.2)
	// L: [1,7]×[1,3] ∪ [1,3]×[3,8]: area 12 + 10 = 22, ∫x = 12·4 + 10·2 = 68.
	l := geom.Ring{{X: 1, Y: 1}, {X: 7, Y: 1}, {X: 7, Y: 3}, {X: 3, Y: 3}, {X: 3, Y: 8}, {X: 1, Y: 8}}
	wantL := 22 + 0.1*68
	// A square [5,9]×[5,9] beside it: area 16, ∫x = 16·7.
	sq := geom.Ring{{X: 5, Y: 5}, {X: 9, Y: 5}, {X: 9, Y: 9}, {X: 5, Y: 9}}
	wantSq := 16 + 0.1*16*7
	// A ring reaching beyond the meshes: only [8,10]×[0,2] counts, ∫x = 4·9.
	out := geom.Ring{{X: 8, Y: -3}, {X: 14, Y: -3}, {X: 14, Y: 2}, {X: 8, Y: 2}}
	wantOut := 4 + 0.1*4*9
	rev := func(r geom.Ring) geom.Ring {
		o := make(geom.Ring, len(r))
		for i := range r {
			o[len(r)-1-i] = r[i]
		}
		return o
	}
	cases := []struct {
		name     string
		rings    []geom.Ring
		cut, ar  float64
		rotation float64
	}{
		{"L", []geom.Ring{l}, wantL, 22, 0},
		{"L clockwise, closed", []geom.Ring{append(rev(l), rev(l)[0])}, wantL, 22, 0},
		{"L and square", []geom.Ring{l, sq}, wantL + wantSq, 38, 0},
		{"partly outside", []geom.Ring{out}, wantOut, 4, 0},
		{"L rotated with the meshes", []geom.Ring{l}, wantL, 22, 0.7},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			b, a := before, after
			rings := c.rings
			if c.rotation != 0 {
				b = transformMesh(b, c.rotation, 3, -2, 0)
				a = transformMesh(a, c.rotation, 3, -2, 0)
				rings = []geom.Ring{transformRing(rings[0], c.rotation, 3, -2)}
			}
			r := mustCompare(t, b, a, rings)
			if !closeRel(r.CutM3, c.cut, exactRel, 1) || r.FillM3 != 0 || !closeRel(r.AreaM2, c.ar, exactRel, 1) {
				t.Errorf("Compare(%s) = %+v, want cut %.12g area %g", c.name, r, c.cut, c.ar)
			}
		})
	}
}

func TestCompare_Degenerate(t *testing.T) {
	rng := rand.New(rand.NewPCG(testSeed(t), 8))
	a := randomSurface(rng, 10, 10, 6, 6, 0.1)
	far := transformMesh(a, 0, 100, 0, 0)
	cases := []struct {
		name         string
		before, afte geom.TriMesh
		want         CompareResult
		area         float64
	}{
		{name: "both empty", want: CompareResult{}},
		{name: "before empty", afte: a},
		{name: "no overlap", before: a, afte: far},
		{name: "coincident surfaces", before: a, afte: a, area: 100},
		{name: "single degenerate triangle", before: geom.TriMesh{V: []geom.Vec3{{}, {X: 1, Y: 1}, {X: 2, Y: 2, Z: 5}}, T: []int32{0, 1, 2}}, afte: a},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			r := mustCompare(t, c.before, c.afte, nil)
			if r.CutM3 != 0 || r.FillM3 != 0 || math.Abs(r.NetM3) > 1e-12 || !closeRel(r.AreaM2, c.area, 1e-12, 1) {
				t.Errorf("Compare(%s) = %+v, want no volume and area %g", c.name, r, c.area)
			}
		})
	}
}

func TestCompare_BadInput(t *testing.T) {
	good := flatMesh(0, 0, 10, 10, 0)
	tri := func(v []geom.Vec3, idx ...int32) geom.TriMesh { return geom.TriMesh{V: v, T: idx} }
	v3 := []geom.Vec3{{}, {X: 1}, {Y: 1}}
	sq := geom.Ring{{X: 1, Y: 1}, {X: 4, Y: 1}, {X: 4, Y: 4}, {X: 1, Y: 4}}
	cases := []struct {
		name     string
		before   geom.TriMesh
		boundary []geom.Ring
		want     error
		mesh     *MeshError
		ring     *BoundaryError
	}{
		{name: "index out of range", before: tri(v3, 0, 1, 3), want: ErrBadIndex, mesh: &MeshError{Mesh: "before", Triangle: 0, Vertex: 3}},
		{name: "negative index", before: tri(v3, 0, -1, 2), want: ErrBadIndex, mesh: &MeshError{Mesh: "before", Triangle: 0, Vertex: -1}},
		{name: "partial triangle", before: tri(v3, 0, 1, 2, 0), want: ErrBadIndex, mesh: &MeshError{Mesh: "before", Triangle: 1, Vertex: -1}},
		{name: "NaN vertex", before: tri([]geom.Vec3{{}, {X: 1}, {Y: 1, Z: math.NaN()}}, 0, 1, 2), want: ErrNonFinite, mesh: &MeshError{Mesh: "before", Triangle: -1, Vertex: 2}},
		{name: "infinite vertex", before: tri([]geom.Vec3{{}, {X: math.Inf(1)}, {Y: 1}}, 0, 1, 2), want: ErrNonFinite, mesh: &MeshError{Mesh: "before", Triangle: -1, Vertex: 1}},
		{name: "clockwise triangle", before: tri(v3, 0, 2, 1), want: ErrClockwise, mesh: &MeshError{Mesh: "before", Triangle: 0, Vertex: -1}},
		{name: "ring too short", before: good, boundary: []geom.Ring{{{X: 0, Y: 0}, {X: 1, Y: 1}}}, want: ErrRingTooSmall, ring: &BoundaryError{Ring: 0, Vertex: -1, Other: -1}},
		{name: "ring repeated points", before: good, boundary: []geom.Ring{{{X: 0, Y: 0}, {X: 1, Y: 1}, {X: 1, Y: 1}, {X: 0, Y: 0}}}, want: ErrRingTooSmall, ring: &BoundaryError{Ring: 0, Vertex: -1, Other: -1}},
		{name: "ring collinear", before: good, boundary: []geom.Ring{{{X: 0, Y: 0}, {X: 1, Y: 1}, {X: 2, Y: 2}}}, want: ErrRingTooSmall, ring: &BoundaryError{Ring: 0, Vertex: -1, Other: -1}},
		{name: "ring NaN", before: good, boundary: []geom.Ring{sq, {{X: 0, Y: 0}, {X: math.NaN(), Y: 1}, {X: 2, Y: 0}}}, want: ErrNonFinite, ring: &BoundaryError{Ring: 1, Vertex: 1, Other: -1}},
		{name: "bow tie with zero area", before: good, boundary: []geom.Ring{{{X: 0, Y: 0}, {X: 2, Y: 2}, {X: 2, Y: 0}, {X: 0, Y: 2}}}, want: ErrRingTooSmall},
		// Edges 0 ((0,0)→(4,4)) and 2 ((4,0)→(0,2)) cross; the net area is
		// −4, so the ring is also reversed internally.
		{name: "bow tie", before: good, boundary: []geom.Ring{{{X: 0, Y: 0}, {X: 4, Y: 4}, {X: 4, Y: 0}, {X: 0, Y: 2}}}, want: ErrRingCrossing, ring: &BoundaryError{Ring: 0, Vertex: 2, Other: -1}},
		{name: "ring touching itself", before: good, boundary: []geom.Ring{{{X: 0, Y: 0}, {X: 4, Y: 0}, {X: 4, Y: 4}, {X: 2, Y: 0}, {X: 0, Y: 4}}}, want: ErrRingCrossing},
		{name: "spike", before: good, boundary: []geom.Ring{{{X: 0, Y: 0}, {X: 4, Y: 0}, {X: 6, Y: 0}, {X: 5, Y: 0}, {X: 4, Y: 4}}}, want: ErrRingCrossing},
		{name: "rings crossing", before: good, boundary: []geom.Ring{sq, transformRing(sq, 0, 2, 2)}, want: ErrRingCrossing, ring: &BoundaryError{Ring: 0, Vertex: 1, Other: 1}},
		{name: "rings sharing an edge", before: good, boundary: []geom.Ring{sq, transformRing(sq, 0, 3, 0)}, want: ErrRingCrossing},
		{name: "ring nested", before: good, boundary: []geom.Ring{{{X: 0, Y: 0}, {X: 9, Y: 0}, {X: 9, Y: 9}, {X: 0, Y: 9}}, sq}, want: ErrRingNested, ring: &BoundaryError{Ring: 1, Vertex: -1, Other: 0}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			_, err := Compare(c.before, good, c.boundary)
			if !errors.Is(err, c.want) {
				t.Fatalf("Compare(%s) error = %v, want %v", c.name, err, c.want)
			}
			if c.mesh != nil {
				var me *MeshError
				if !errors.As(err, &me) || me.Mesh != c.mesh.Mesh || me.Triangle != c.mesh.Triangle || me.Vertex != c.mesh.Vertex {
					t.Errorf("Compare(%s) error = %#v, want %+v", c.name, err, c.mesh)
				}
			}
			if c.ring != nil {
				var be *BoundaryError
				if !errors.As(err, &be) || be.Ring != c.ring.Ring || be.Vertex != c.ring.Vertex || be.Other != c.ring.Other {
					t.Errorf("Compare(%s) error = %#v, want %+v", c.name, err, c.ring)
				}
			}
			if err.Error() == "" {
				t.Errorf("empty error text")
			}
		})
	}
	// The after surface is checked and named too.
	_, err := Compare(good, tri(v3, 0, 2, 1), nil)
	var me *MeshError
	if !errors.As(err, &me) || me.Mesh != "after" || !errors.Is(err, ErrClockwise) {
		t.Errorf("Compare(good, clockwise) error = %v, want an after-surface ErrClockwise", err)
	}
}
