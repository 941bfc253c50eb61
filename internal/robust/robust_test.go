package robust

import (
	"flag"
	"math"
	"math/big"
	"math/rand/v2"
	"os"
	"strconv"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// The random cases are reproducible: the seed can be set with -robust.seed or
// ROBUST_SEED and is printed on failure.
var seedFlag = flag.Uint64("robust.seed", 0, "random seed for the predicate tests (0: fixed default)")

func testSeed(tb testing.TB) uint64 {
	tb.Helper()
	if *seedFlag != 0 {
		return *seedFlag
	}
	if s := os.Getenv("ROBUST_SEED"); s != "" {
		v, err := strconv.ParseUint(s, 10, 64)
		if err != nil {
			tb.Fatalf("ROBUST_SEED=%q: %v", s, err)
		}
		return v
	}
	return 20240601
}

// p2 returns the point (x, y).
func p2(x, y float64) geom.Vec2 { return geom.Vec2{X: x, Y: y} }

// exactOrient is the reference: the orientation determinant evaluated in
// exact rational arithmetic (math/big.Rat holds every float64 exactly).
func exactOrient(a, b, c geom.Vec2) Sign {
	r := func(x float64) *big.Rat { return new(big.Rat).SetFloat64(x) }
	acx := new(big.Rat).Sub(r(a.X), r(c.X))
	bcx := new(big.Rat).Sub(r(b.X), r(c.X))
	acy := new(big.Rat).Sub(r(a.Y), r(c.Y))
	bcy := new(big.Rat).Sub(r(b.Y), r(c.Y))
	l := new(big.Rat).Mul(acx, bcy)
	rr := new(big.Rat).Mul(acy, bcx)
	return Sign(l.Sub(l, rr).Sign())
}

// exactInCircle is the reference incircle determinant in big.Rat.
func exactInCircle(a, b, c, d geom.Vec2) Sign {
	r := func(x float64) *big.Rat { return new(big.Rat).SetFloat64(x) }
	row := func(p geom.Vec2) (x, y, l *big.Rat) {
		x = new(big.Rat).Sub(r(p.X), r(d.X))
		y = new(big.Rat).Sub(r(p.Y), r(d.Y))
		l = new(big.Rat).Add(new(big.Rat).Mul(x, x), new(big.Rat).Mul(y, y))
		return
	}
	ax, ay, al := row(a)
	bx, by, bl := row(b)
	cx, cy, cl := row(c)
	m := func(p, q *big.Rat) *big.Rat { return new(big.Rat).Mul(p, q) }
	s := func(p, q *big.Rat) *big.Rat { return new(big.Rat).Sub(p, q) }
	det := new(big.Rat).Mul(al, s(m(bx, cy), m(by, cx)))
	det.Add(det, m(bl, s(m(cx, ay), m(cy, ax))))
	det.Add(det, m(cl, s(m(ax, by), m(ay, bx))))
	return Sign(det.Sign())
}

func TestSign_String(t *testing.T) {
	tests := []struct {
		s    Sign
		want string
	}{{Negative, "negative"}, {Zero, "zero"}, {Positive, "positive"}}
	for _, tt := range tests {
		if got := tt.s.String(); got != tt.want {
			t.Errorf("Sign(%d).String() = %q, want %q", tt.s, got, tt.want)
		}
	}
}

func TestOrient2D_Table(t *testing.T) {
	// Analytic cases: signs of hand-computed determinants.
	tests := []struct {
		name    string
		a, b, c geom.Vec2
		want    Sign
	}{
		{"ccw unit", p2(0, 0), p2(1, 0), p2(0, 1), Positive},
		{"cw unit", p2(0, 0), p2(0, 1), p2(1, 0), Negative},
		{"collinear", p2(0, 0), p2(1, 1), p2(3, 3), Zero},
		{"repeated point", p2(2, 5), p2(2, 5), p2(7, -1), Zero},
		{"all equal", p2(1, 1), p2(1, 1), p2(1, 1), Zero},
		// 0.1, 0.2, 0.3 are not exactly collinear once rounded to binary:
		// the exact value of the determinant decides (big.Rat agrees).
		{"decimal near-collinear", p2(0.1, 0.1), p2(0.2, 0.2), p2(0.3, 0.3), exactOrient(p2(0.1, 0.1), p2(0.2, 0.2), p2(0.3, 0.3))},
		// Points on a line at UTM-sized offsets with 1 mm spacing.
		{"utm collinear", p2(5e6, 5e6), p2(5e6+0.001, 5e6+0.001), p2(5e6+0.002, 5e6+0.002),
			exactOrient(p2(5e6, 5e6), p2(5e6+0.001, 5e6+0.001), p2(5e6+0.002, 5e6+0.002))},
		{"one ulp left", p2(0, 0), p2(1, 1), p2(0.5, math.Nextafter(0.5, 1)), Positive},
		{"one ulp right", p2(0, 0), p2(1, 1), p2(0.5, math.Nextafter(0.5, 0)), Negative},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			if got := Orient2D(tt.a, tt.b, tt.c); got != tt.want {
				t.Errorf("Orient2D(%v, %v, %v) = %v, want %v", tt.a, tt.b, tt.c, got, tt.want)
			}
		})
	}
}

func TestInCircle_Table(t *testing.T) {
	// Analytic cases on the unit circle and the square grid.
	a, b, c := p2(1, 0), p2(0, 1), p2(-1, 0)
	tests := []struct {
		name string
		d    geom.Vec2
		want Sign
	}{
		{"centre inside", p2(0, 0), Positive},
		{"on circle", p2(0, -1), Zero},
		{"outside", p2(2, 2), Negative},
		{"repeated vertex", p2(1, 0), Zero},
		{"just inside", p2(0, math.Nextafter(-1, 0)), Positive},
		{"just outside", p2(0, math.Nextafter(-1, -2)), Negative},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			if got := InCircle(a, b, c, tt.d); got != tt.want {
				t.Errorf("InCircle(%v, %v, %v, %v) = %v, want %v", a, b, c, tt.d, got, tt.want)
			}
		})
	}
	// A grid cell: the four corners of a unit square are cocircular, also far
	// from the origin with millimetre cells.
	for _, off := range []float64{0, 1e3, 5e6} {
		p := func(x, y float64) geom.Vec2 { return p2(off+x, off+y) }
		for _, h := range []float64{1, 0.001} {
			if got := InCircle(p(0, 0), p(h, 0), p(h, h), p(0, h)); got != exactInCircle(p(0, 0), p(h, 0), p(h, h), p(0, h)) {
				t.Errorf("InCircle(square offset %g cell %g) = %v, want exact %v", off, h, got, exactInCircle(p(0, 0), p(h, 0), p(h, h), p(0, h)))
			}
		}
	}
}

// nearCollinear returns three points that are collinear or within a few ulps
// of it: a and b random in a box of size scale around offset, c on the line
// ab (rounded to float64) and then moved by up to two ulps per coordinate.
func nearCollinear(r *rand.Rand, offset, scale float64) (a, b, c geom.Vec2) {
	pt := func() geom.Vec2 {
		return p2(offset+(r.Float64()-0.5)*scale, offset+(r.Float64()-0.5)*scale)
	}
	a, b = pt(), pt()
	if r.IntN(4) == 0 {
		// Grid-aligned spacing, e.g. millimetre steps at a large offset.
		step := scale / 1000
		a = p2(offset+float64(r.IntN(1000))*step, offset+float64(r.IntN(1000))*step)
		b = p2(a.X+float64(r.IntN(7)-3)*step, a.Y+float64(r.IntN(7)-3)*step)
	}
	t := r.Float64()*3 - 1
	c = p2(a.X+t*(b.X-a.X), a.Y+t*(b.Y-a.Y))
	nudge := func(x float64) float64 {
		if x == 0 {
			// Nudging zero gives a subnormal number, outside the
			// documented domain (no underflow).
			return x
		}
		for range r.IntN(3) {
			if r.IntN(2) == 0 {
				x = math.Nextafter(x, math.Inf(1))
			} else {
				x = math.Nextafter(x, math.Inf(-1))
			}
		}
		return x
	}
	c = p2(nudge(c.X), nudge(c.Y))
	return
}

// nearCocircular returns four points with d on (or a few ulps from) the
// circle through a, b, c, all rounded to float64.
func nearCocircular(r *rand.Rand, offset, radius float64) (a, b, c, d geom.Vec2) {
	cx, cy := offset+r.Float64()*radius, offset+r.Float64()*radius
	on := func() geom.Vec2 {
		th := r.Float64() * 2 * math.Pi
		return p2(cx+radius*math.Cos(th), cy+radius*math.Sin(th))
	}
	a, b, c, d = on(), on(), on(), on()
	if r.IntN(4) == 0 {
		// Exactly cocircular: corners of an axis-aligned rectangle.
		w, h := radius*float64(1+r.IntN(5))/8, radius*float64(1+r.IntN(5))/8
		a, b, c, d = p2(cx, cy), p2(cx+w, cy), p2(cx+w, cy+h), p2(cx, cy+h)
	}
	if Orient2D(a, b, c) < 0 {
		a, b = b, a
	}
	for range r.IntN(3) {
		d.X = math.Nextafter(d.X, math.Inf(1-2*r.IntN(2)))
	}
	return
}

func TestOrient2D_Exact(t *testing.T) {
	seed := testSeed(t)
	r := rand.New(rand.NewPCG(seed, 1))
	n := 60000
	if testing.Short() {
		n = 6000
	}
	cases := []struct {
		name          string
		offset, scale float64
	}{
		{"unit", 0, 1},
		{"site", 1000, 200},
		{"utm mm", 5e6, 1},
		{"tiny", 0, 1e-12},
	}
	for _, cs := range cases {
		t.Run(cs.name, func(t *testing.T) {
			zeros, fails := 0, 0
			for i := range n {
				a, b, c := nearCollinear(r, cs.offset, cs.scale)
				want := exactOrient(a, b, c)
				if want == 0 {
					zeros++
				}
				got := Orient2D(a, b, c)
				if got != want {
					fails++
					if fails <= 5 {
						t.Errorf("case %d (seed %d): Orient2D(%v, %v, %v) = %v, want %v", i, seed, a, b, c, got, want)
					}
				}
				// Permutation identities (Shewchuk 1997, and the
				// antisymmetry of a determinant under a row swap).
				if g := Orient2D(b, c, a); g != got {
					t.Fatalf("Orient2D(b, c, a) = %v, want %v (seed %d)", g, got, seed)
				}
				if g := Orient2D(b, a, c); g != -got {
					t.Fatalf("Orient2D(b, a, c) = %v, want %v (seed %d)", g, -got, seed)
				}
			}
			if fails > 0 {
				t.Errorf("%d of %d near-collinear cases disagree with big.Rat (seed %d)", fails, n, seed)
			}
			if zeros == 0 {
				t.Errorf("no exactly collinear case generated; the test would not cover Zero")
			}
		})
	}
}

func TestInCircle_Exact(t *testing.T) {
	seed := testSeed(t)
	r := rand.New(rand.NewPCG(seed, 2))
	n := 20000
	if testing.Short() {
		n = 2000
	}
	cases := []struct {
		name           string
		offset, radius float64
	}{
		{"unit", 0, 1},
		{"site", 1000, 50},
		{"utm mm", 5e6, 0.01},
		{"tiny", 0, 1e-9},
	}
	for _, cs := range cases {
		t.Run(cs.name, func(t *testing.T) {
			zeros, fails := 0, 0
			for i := range n {
				a, b, c, d := nearCocircular(r, cs.offset, cs.radius)
				want := exactInCircle(a, b, c, d)
				if want == 0 {
					zeros++
				}
				got := InCircle(a, b, c, d)
				if got != want {
					fails++
					if fails <= 5 {
						t.Errorf("case %d (seed %d): InCircle(%v, %v, %v, %v) = %v, want %v", i, seed, a, b, c, d, got, want)
					}
				}
				if g := InCircle(b, c, a, d); g != got {
					t.Fatalf("InCircle(b, c, a, d) = %v, want %v (seed %d)", g, got, seed)
				}
				if g := InCircle(b, a, c, d); g != -got {
					t.Fatalf("InCircle(b, a, c, d) = %v, want %v (seed %d)", g, -got, seed)
				}
			}
			if fails > 0 {
				t.Errorf("%d of %d near-cocircular cases disagree with big.Rat (seed %d)", fails, n, seed)
			}
			if zeros == 0 {
				t.Errorf("no exactly cocircular case generated; the test would not cover Zero")
			}
		})
	}
}

// TestStages drives each adaptive stage with inputs chosen so that stage A
// cannot decide, and checks the result against big.Rat: differences that are
// exact (tails zero, stage B decides or returns), differences with rounding
// tails (stage C), and cases that need the exact stage D.
func TestStages(t *testing.T) {
	seed := testSeed(t)
	r := rand.New(rand.NewPCG(seed, 3))
	for i := range 20000 {
		// Coordinates with many significant bits so that differences are
		// inexact, then d pushed onto the circle to within an ulp.
		base := 1 + r.Float64()
		a := p2(base+r.Float64()*1e-8, base)
		b := p2(base, base+r.Float64()*1e-8)
		c := p2(base-r.Float64()*1e-8, base-r.Float64()*1e-9)
		if Orient2D(a, b, c) < 0 {
			a, b = b, a
		}
		d := p2(c.X+r.Float64()*1e-16, c.Y+r.Float64()*1e-16)
		if got, want := InCircle(a, b, c, d), exactInCircle(a, b, c, d); got != want {
			t.Fatalf("case %d (seed %d): InCircle(%v, %v, %v, %v) = %v, want %v", i, seed, a, b, c, d, got, want)
		}
		e := p2(a.X+(b.X-a.X)*0.5+r.Float64()*1e-17, a.Y+(b.Y-a.Y)*0.5)
		if got, want := Orient2D(a, b, e), exactOrient(a, b, e); got != want {
			t.Fatalf("case %d (seed %d): Orient2D(%v, %v, %v) = %v, want %v", i, seed, a, b, e, got, want)
		}

		// Orientation stages C and D: p, 2p and 2^-k·p are exactly
		// collinear through the origin, and the tiny point makes every
		// coordinate difference inexact (non-zero tails). Moving the tiny
		// point by a few ulps gives determinants of order 1e-40 and below.
		p := p2(r.Float64()+0.5, r.Float64()+0.5)
		q := p2(2*p.X, 2*p.Y)
		k := 60 + r.IntN(40)
		tiny := p2(math.Ldexp(p.X, -k), math.Ldexp(p.Y, -k))
		for range r.IntN(3) {
			tiny.Y = math.Nextafter(tiny.Y, math.Inf(1-2*r.IntN(2)))
		}
		if got, want := Orient2D(p, q, tiny), exactOrient(p, q, tiny); got != want {
			t.Fatalf("case %d (seed %d): Orient2D(%v, %v, %v) = %v, want %v", i, seed, p, q, tiny, got, want)
		}
		if got, want := Orient2D(tiny, p, q), exactOrient(tiny, p, q); got != want {
			t.Fatalf("case %d (seed %d): Orient2D(%v, %v, %v) = %v, want %v", i, seed, tiny, p, q, got, want)
		}
	}
}

// TestOrient2DErrBound: results certified by the exported bound agree with
// big.Rat on the near-collinear cases.
func TestOrient2DErrBound(t *testing.T) {
	r := rand.New(rand.NewPCG(testSeed(t), 5))
	for range 20000 {
		a, b, c := nearCollinear(r, 5e6, 1)
		l := float64((a.X - c.X) * (b.Y - c.Y))
		rr := float64((a.Y - c.Y) * (b.X - c.X))
		det := l - rr
		if math.Abs(det) > Orient2DErrBound*(math.Abs(l)+math.Abs(rr)) && signOf(det) != exactOrient(a, b, c) {
			t.Fatalf("certified sign %v for %v %v %v, exact %v", signOf(det), a, b, c, exactOrient(a, b, c))
		}
	}
}

// TestTwoProduct checks the error-free product against big.Float with 106
// bits (enough for any product of two float64 values): x + y must equal a·b
// exactly. Under GOAMD64=v3, where the compiler may fuse, this also checks
// that nothing was fused.
func TestTwoProduct(t *testing.T) {
	r := rand.New(rand.NewPCG(testSeed(t), 4))
	for i := range 10000 {
		a := (r.Float64() - 0.5) * math.Ldexp(1, r.IntN(80)-40)
		b := (r.Float64() - 0.5) * math.Ldexp(1, r.IntN(80)-40)
		x, y := twoProduct(a, b)
		want := new(big.Float).SetPrec(106).Mul(new(big.Float).SetFloat64(a), new(big.Float).SetFloat64(b))
		got := new(big.Float).SetPrec(106).Add(new(big.Float).SetFloat64(x), new(big.Float).SetFloat64(y))
		if got.Cmp(want) != 0 {
			t.Fatalf("case %d: twoProduct(%v, %v) = %v + %v, want sum %v", i, a, b, x, y, want)
		}
		s, e := twoSum(a, b)
		ws := new(big.Float).SetPrec(2000).Add(new(big.Float).SetFloat64(a), new(big.Float).SetFloat64(b))
		gs := new(big.Float).SetPrec(2000).Add(new(big.Float).SetFloat64(s), new(big.Float).SetFloat64(e))
		if gs.Cmp(ws) != 0 {
			t.Fatalf("case %d: twoSum(%v, %v) = %v + %v, want sum %v", i, a, b, s, e, ws)
		}
	}
}

func BenchmarkOrient2DRandom(b *testing.B) {
	r := rand.New(rand.NewPCG(1, 2))
	pts := make([]geom.Vec2, 3*1024)
	for i := range pts {
		pts[i] = p2(r.Float64(), r.Float64())
	}
	b.ReportAllocs()
	var s Sign
	i := 0
	for b.Loop() {
		j := 3 * (i & 1023)
		s += Orient2D(pts[j], pts[j+1], pts[j+2])
		i++
	}
	sinkSign = s
}

func BenchmarkOrient2DNearCollinear(b *testing.B) {
	r := rand.New(rand.NewPCG(1, 2))
	pts := make([]geom.Vec2, 3*1024)
	for i := 0; i < len(pts); i += 3 {
		pts[i], pts[i+1], pts[i+2] = nearCollinear(r, 5e6, 1)
	}
	b.ReportAllocs()
	var s Sign
	i := 0
	for b.Loop() {
		j := 3 * (i & 1023)
		s += Orient2D(pts[j], pts[j+1], pts[j+2])
		i++
	}
	sinkSign = s
}

// BenchmarkOrient2DNearCollinearRat is the naive baseline: big.Rat for every
// call.
func BenchmarkOrient2DNearCollinearRat(b *testing.B) {
	r := rand.New(rand.NewPCG(1, 2))
	pts := make([]geom.Vec2, 3*1024)
	for i := 0; i < len(pts); i += 3 {
		pts[i], pts[i+1], pts[i+2] = nearCollinear(r, 5e6, 1)
	}
	b.ReportAllocs()
	var s Sign
	i := 0
	for b.Loop() {
		j := 3 * (i & 1023)
		s += exactOrient(pts[j], pts[j+1], pts[j+2])
		i++
	}
	sinkSign = s
}

func BenchmarkInCircleRandom(b *testing.B) {
	r := rand.New(rand.NewPCG(1, 2))
	pts := make([]geom.Vec2, 4*1024)
	for i := range pts {
		pts[i] = p2(r.Float64(), r.Float64())
	}
	b.ReportAllocs()
	var s Sign
	i := 0
	for b.Loop() {
		j := 4 * (i & 1023)
		s += InCircle(pts[j], pts[j+1], pts[j+2], pts[j+3])
		i++
	}
	sinkSign = s
}

func BenchmarkInCircleNearCocircular(b *testing.B) {
	r := rand.New(rand.NewPCG(1, 2))
	pts := make([]geom.Vec2, 4*1024)
	for i := 0; i < len(pts); i += 4 {
		pts[i], pts[i+1], pts[i+2], pts[i+3] = nearCocircular(r, 5e6, 0.01)
	}
	b.ReportAllocs()
	var s Sign
	i := 0
	for b.Loop() {
		j := 4 * (i & 1023)
		s += InCircle(pts[j], pts[j+1], pts[j+2], pts[j+3])
		i++
	}
	sinkSign = s
}

var sinkSign Sign
