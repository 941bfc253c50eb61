package cutfill

import (
	"math"
	"math/big"
	"math/rand/v2"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// TestPosNeg checks the split of a linear function's integral over a
// triangle at its zero line against hand-integrated cases (the closed forms
// of the refbench README, method 5) and the identity ∫f⁺ − ∫f⁻ = A·mean.
func TestPosNeg(t *testing.T) {
	cases := []struct {
		name     string
		a, b, c  float64
		pos, neg float64 // for area 1
	}{
		{"all positive", 1, 2, 3, 2, 0},
		{"all negative", -1, -2, -3, 0, 2},
		{"all zero", 0, 0, 0, 0, 0},
		// Only f₁ = 1 > 0 with f₂ = f₃ = −1: the corner triangle has sides
		// ½ of the triangle's, area ¼, mean ⅓: ∫f⁺ = 1/12.
		{"one positive corner", 1, -1, -1, 1.0 / 12, 1.0/12 + 1.0/3},
		// Mirror image.
		{"one negative corner", -1, 1, 1, 1.0/12 + 1.0/3, 1.0 / 12},
		// A zero corner and a sign change: f = 0, 1, −1. Corner at f₁ = 1
		// spans ½ of one side and all of the other: area ½, ∫f⁺ = ½·⅓.
		{"zero corner", 0, 1, -1, 1.0 / 6, 1.0 / 6},
		{"touching zero", 0, 0, 2, 2.0 / 3, 0},
	}
	for _, c := range cases {
		for _, perm := range [][3]float64{{c.a, c.b, c.c}, {c.b, c.c, c.a}, {c.c, c.a, c.b}, {c.b, c.a, c.c}} {
			p, n := posNeg(1, perm[0], perm[1], perm[2])
			if math.Abs(p-c.pos) > 1e-15 || math.Abs(n-c.neg) > 1e-15 {
				t.Errorf("posNeg(1, %v) = %.17g, %.17g, want %.17g, %.17g (%s)", perm, p, n, c.pos, c.neg, c.name)
			}
		}
	}
	rng := rand.New(rand.NewPCG(testSeed(t), 9))
	for range 1000 {
		a, b, c := rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()
		ar := rng.Float64() * 10
		p, n := posNeg(ar, a, b, c)
		if p < 0 || n < 0 || math.Abs(p-n-ar*(a+b+c)/3) > 1e-12*ar*(math.Abs(a)+math.Abs(b)+math.Abs(c)) {
			t.Fatalf("posNeg(%g, %g, %g, %g) = %g, %g: not a split of %g", ar, a, b, c, p, n, ar*(a+b+c)/3)
		}
	}
}

// TestOrient checks the filtered orientation against rational arithmetic on
// points within a few units in the last place of a line, where the plain
// floating-point determinant gets the sign wrong (Shewchuk 1997, §1; the
// classic near-collinear grid of Kettner et al., "Classroom examples of
// robustness problems in geometric computations", 2008).
func TestOrient(t *testing.T) {
	exact := func(a, b, c geom.Vec2) int {
		r := func(v float64) *big.Rat { return new(big.Rat).SetFloat64(v) }
		l := new(big.Rat).Mul(new(big.Rat).Sub(r(b.X), r(a.X)), new(big.Rat).Sub(r(c.Y), r(a.Y)))
		m := new(big.Rat).Mul(new(big.Rat).Sub(r(b.Y), r(a.Y)), new(big.Rat).Sub(r(c.X), r(a.X)))
		return l.Cmp(m)
	}
	q, r := geom.Vec2{X: 12, Y: 12}, geom.Vec2{X: 24, Y: 24}
	wrong := 0
	for i := range 64 {
		for j := range 64 {
			p := geom.Vec2{X: 0.5 + float64(i)*0x1p-53, Y: 0.5 + float64(j)*0x1p-53}
			want := exact(p, q, r)
			if got := orient(p, q, r); got != want {
				t.Fatalf("orient(%v, q, r) = %d, want %d", p, got, want)
			}
			det, _ := orientFloat(p, q, r)
			if (det > 0) != (want > 0) || (det < 0) != (want < 0) {
				wrong++
			}
		}
	}
	if wrong == 0 {
		t.Error("the plain determinant never erred: the case does not exercise the exact path")
	}
}

// TestEarClip checks that the ear triangles of random star-shaped rings (and
// a comb, with many reflex corners) cover the ring: they are counter-
// clockwise and their areas add up to the ring's (Meisters 1975: a simple
// polygon of n vertices has n − 2 triangles).
func TestEarClip(t *testing.T) {
	rng := rand.New(rand.NewPCG(testSeed(t), 10))
	var rings []geom.Ring
	for range 50 {
		n := 3 + rng.IntN(40)
		r := make(geom.Ring, n)
		for i := range n {
			th := 2 * math.Pi * (float64(i) + 0.8*rng.Float64()) / float64(n)
			rad := 1 + 4*rng.Float64()
			r[i] = geom.Vec2{X: rad * math.Cos(th), Y: rad * math.Sin(th)}
		}
		rings = append(rings, r)
	}
	var comb geom.Ring
	for i := range 10 {
		x := float64(i)
		comb = append(comb, geom.Vec2{X: x, Y: 0})
	}
	comb = append(comb, geom.Vec2{X: 10, Y: 0}, geom.Vec2{X: 10, Y: 5})
	for i := 9; i >= 0; i-- {
		x := float64(i)
		comb = append(comb, geom.Vec2{X: x + 0.5, Y: 5}, geom.Vec2{X: x + 0.25, Y: 1}, geom.Vec2{X: x, Y: 5})
	}
	rings = append(rings, comb)
	for k, r := range rings {
		tris, err := boundaryTriangles([]geom.Ring{r})
		if err != nil {
			t.Fatalf("ring %d: %v", k, err)
		}
		var s geom.Sum
		for _, tr := range tris {
			a := geom.Ring(tr[:]).Area()
			if a <= 0 {
				t.Fatalf("ring %d: triangle %v not counter-clockwise", k, tr)
			}
			s.Add(a)
		}
		if want := math.Abs(r.Area()); !closeRel(s.Value(), want, 1e-12, 1) {
			t.Errorf("ring %d: triangles cover %.15g, ring area %.15g", k, s.Value(), want)
		}
	}
}

func TestBucketGrid(t *testing.T) {
	rng := rand.New(rand.NewPCG(testSeed(t), 11))
	boxes := make([]geom.Box, 500)
	for i := range boxes {
		p := geom.Vec2{X: rng.Float64() * 100, Y: rng.Float64() * 30}
		q := p.Add(geom.Vec2{X: rng.ExpFloat64() * 3, Y: rng.ExpFloat64()})
		boxes[i] = geom.EmptyBox().Extend(p).Extend(q)
	}
	boxes[7] = geom.EmptyBox()                                                        // left out
	boxes[8] = geom.Box{Min: geom.Vec2{X: -50, Y: 10}, Max: geom.Vec2{X: 200, Y: 10}} // long and flat
	g := newBucketGrid(boxes)
	q := newBucketQuery(&g)
	for range 200 {
		p := geom.Vec2{X: rng.Float64()*140 - 20, Y: rng.Float64()*50 - 10}
		b := geom.EmptyBox().Extend(p).Extend(p.Add(geom.Vec2{X: rng.Float64() * 10, Y: rng.Float64() * 10}))
		got := map[int32]bool{}
		last := int32(-1)
		for _, i := range q.find(&g, b) {
			if i <= last {
				t.Fatalf("find: items not increasing: %d after %d", i, last)
			}
			last = i
			got[i] = true
		}
		for i, bb := range boxes {
			if bb.Intersects(b) && !got[int32(i)] {
				t.Fatalf("find(%v) misses item %d with box %v", b, i, bb)
			}
		}
	}
}
