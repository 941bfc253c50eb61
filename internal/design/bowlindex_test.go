package design

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// bowlIndexZones are zones of every kind for the index tests: the sloped
// yard's shelf, deep zone and sharp bog, the kidney pond's eroded zones
// (long runs of short arc chords), a vertical-walled L and a vertical box
// inside a sloped zone.
func bowlIndexZones(tb testing.TB) []Zone {
	tb.Helper()
	_, _, zones := slopedYard()
	o := Outline{Ring: kidneyOutline(tb), Shelves: []Shelf{{WidthM: 0.3, DepthM: 0.25}}, DeepDepthM: 0.75, WallSlope: 1}
	kz, err := o.Zones()
	if err != nil {
		tb.Fatal(err)
	}
	for _, z := range kz {
		r := make(geom.Ring, len(z.Ring))
		for i, p := range z.Ring {
			r[i] = p.Add(geom.Vec2{X: 9, Y: 1})
		}
		z.Ring = r
		zones = append(zones, z)
	}
	return append(zones,
		Zone{Name: "vertical L", Ring: ring(4, -3, 7, -3, 7, -1, 5, -1, 5, 1, 4, 1), DepthM: 0.5},
		Zone{Name: "sloped around", Ring: rect(-8, -6, -3, -3), DepthM: 0.2, WallSlope: 2},
		Zone{Name: "vertical box", Ring: rect(-6, -5, -5, -4), DepthM: 1.1})
}

// TestBowlAt_MatchesBruteForce checks the indexed BowlAt against the
// definition by brute force over every edge of every zone (zoneSet.rel):
// the values must agree bit for bit, at random points near and far, at
// every vertex, on every edge and just either side of it.
func TestBowlAt_MatchesBruteForce(t *testing.T) {
	zones := bowlIndexZones(t)
	zs, err := newZoneSet(zones, 0.12)
	if err != nil {
		t.Fatal(err)
	}
	s := &Surface{WaterLevelM: 100, zs: zs, bowl: &lazyBowl{}}
	check := func(what string, p geom.Vec2) {
		t.Helper()
		e, _, _ := zs.rel(p, -1)
		if got, want := s.BowlAt(p), 100+e; got != want && !(math.IsInf(got, 1) && math.IsInf(want, 1)) {
			t.Fatalf("%s: BowlAt(%v) = %.17g, brute force %.17g", what, p, got, want)
		}
	}
	seed := uint64(20260303)
	rng := rand.New(rand.NewPCG(seed, 4))
	box := zs.rimBox().Expand(3)
	for range 100000 {
		p := geom.Vec2{X: box.Min.X + rng.Float64()*box.Width(), Y: box.Min.Y + rng.Float64()*box.Height()}
		check("random point (seed 20260303)", p)
	}
	for i := range zs.z {
		r := zs.z[i].floor.pts
		for k, a := range r {
			b := r[(k+1)%len(r)]
			check("vertex", a)
			for _, f := range []float64{0.5, 0.25, 1.0 / 3, rng.Float64()} {
				m := a.Lerp(b, f)
				check("on an edge", m)
				d := b.Sub(a)
				nrm := geom.Vec2{X: -d.Y, Y: d.X}.Scale(1 / d.Norm())
				for _, off := range []float64{1e-12, 1e-9, 1e-6, 1e-3} {
					check("beside an edge", m.Add(nrm.Scale(off)))
					check("beside an edge", m.Sub(nrm.Scale(off)))
				}
				check("next float up", geom.Vec2{X: m.X, Y: math.Nextafter(m.Y, math.Inf(1))})
				check("next float down", geom.Vec2{X: math.Nextafter(m.X, math.Inf(-1)), Y: m.Y})
			}
		}
	}
}

// BenchmarkBowlAt is the indexed exact bowl at 10 000 points over the
// demo pond's rim box.
func BenchmarkBowlAt(b *testing.B) {
	g, p := demoCase(b)
	s, err := Build(g, p)
	if err != nil {
		b.Fatal(err)
	}
	pts := bowlBenchPoints(s)
	s.BowlAt(pts[0]) // build the index outside the loop
	b.ReportAllocs()
	for b.Loop() {
		for _, q := range pts {
			s.BowlAt(q)
		}
	}
}

// BenchmarkBowlAtNaive is the baseline: the same points by brute force
// over every edge.
func BenchmarkBowlAtNaive(b *testing.B) {
	g, p := demoCase(b)
	s, err := Build(g, p)
	if err != nil {
		b.Fatal(err)
	}
	pts := bowlBenchPoints(s)
	b.ReportAllocs()
	for b.Loop() {
		for _, q := range pts {
			s.zs.rel(q, -1)
		}
	}
}

func bowlBenchPoints(s *Surface) []geom.Vec2 {
	box := s.zs.rimBox()
	rng := rand.New(rand.NewPCG(1, 2))
	pts := make([]geom.Vec2, 10000)
	for i := range pts {
		pts[i] = geom.Vec2{X: box.Min.X + rng.Float64()*box.Width(), Y: box.Min.Y + rng.Float64()*box.Height()}
	}
	return pts
}

// BenchmarkBowlIndexBuild is the one-off cost of BowlAt's index for the
// demo pond.
func BenchmarkBowlIndexBuild(b *testing.B) {
	g, p := demoCase(b)
	s, err := Build(g, p)
	if err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	for b.Loop() {
		newBowlIndex(s.zs)
	}
}
