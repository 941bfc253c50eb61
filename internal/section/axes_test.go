package section

import (
	"math"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// rotRect returns the rectangle l × w centred at c with its l sides along
// the direction theta (radians), counter-clockwise.
func rotRect(c geom.Vec2, l, w, theta float64) geom.Ring {
	s, co := math.Sincos(theta)
	u, v := geom.Vec2{X: co, Y: s}, geom.Vec2{X: -s, Y: co}
	at := func(a, b float64) geom.Vec2 { return c.Add(u.Scale(a)).Add(v.Scale(b)) }
	return geom.Ring{at(-l/2, -w/2), at(l/2, -w/2), at(l/2, w/2), at(-l/2, w/2)}
}

// TestAxes_RotatedRectangle: the principal axes of a rectangle run along its
// sides (analytic: the second moments about the centre are l³w/12 and
// lw³/12 along the sides, with no product term). The long axis spans the
// length plus the margin at each end, the cross axis the width at the given
// point.
func TestAxes_RotatedRectangle(t *testing.T) {
	c := geom.Vec2{X: 5, Y: -2}
	const l, w, margin = 8.0, 3.0, 0.5
	for _, theta := range []float64{0, 0.5235987755982988, 1.2, -0.9, 1.9, math.Pi / 2} {
		r := rotRect(c, l, w, theta)
		s, co := math.Sincos(theta)
		u := geom.Vec2{X: co, Y: s}
		if u.X < 0 || (u.X == 0 && u.Y < 0) { // the long axis points east-ish
			u = u.Scale(-1)
		}
		n := geom.Vec2{X: -u.Y, Y: u.X}
		through := c.Add(u.Scale(1)).Add(n.Scale(0.5))
		for _, ring := range []geom.Ring{r, geom.Ring{r[3], r[2], r[1], r[0]}} { // both windings
			long, cross := Axes(ring, through, margin)
			if len(long) != 2 || len(cross) != 2 {
				t.Fatalf("theta %g: Axes = %v, %v", theta, long, cross)
			}
			const tol = 1e-9
			vecClose(t, "long start", long[0], c.Sub(u.Scale(l/2+margin)), tol)
			vecClose(t, "long end", long[1], c.Add(u.Scale(l/2+margin)), tol)
			base := c.Add(u.Scale(1))
			vecClose(t, "cross start", cross[0], base.Sub(n.Scale(w/2+margin)), tol)
			vecClose(t, "cross end", cross[1], base.Add(n.Scale(w/2+margin)), tol)
		}
	}
}

// TestAxes_Ellipse: a 256-gon inscribed in an ellipse with semi-axes 5 and 2
// rotated by 40° has its long axis at 40° (analytic, by symmetry).
func TestAxes_Ellipse(t *testing.T) {
	const n = 256
	th := 40 * math.Pi / 180
	s, co := math.Sincos(th)
	var r geom.Ring
	for i := range n {
		a := 2 * math.Pi * float64(i) / n
		x, y := 5*math.Cos(a), 2*math.Sin(a)
		r = append(r, geom.Vec2{X: 10 + co*x - s*y, Y: 20 + s*x + co*y})
	}
	long, _ := Axes(r, geom.Vec2{X: 10, Y: 20}, 0)
	d := long[1].Sub(long[0])
	if got := math.Atan2(d.Y, d.X); !closeAbs(got, th, 1e-9) {
		t.Errorf("ellipse long axis at %.12g rad, want %.12g", got, th)
	}
	if got := d.Norm(); !closeAbs(got, 10, 1e-9) {
		t.Errorf("ellipse long axis length %.12g, want 10 (through two vertices)", got)
	}
}

// TestAxes_NoPreferredDirection: a square and a regular polygon have equal
// second moments in every direction; the long axis is then east-west.
func TestAxes_NoPreferredDirection(t *testing.T) {
	sq := rotRect(geom.Vec2{X: 1, Y: 1}, 4, 4, 0.3)
	var oct geom.Ring
	for i := range 8 {
		a := 2*math.Pi*float64(i)/8 + 0.1
		oct = append(oct, geom.Vec2{X: 3 * math.Cos(a), Y: 3 * math.Sin(a)})
	}
	for name, r := range map[string]geom.Ring{"square": sq, "octagon": oct} {
		long, cross := Axes(r, r.Bounds().Center(), 1)
		if d := long[1].Sub(long[0]); !closeAbs(d.Y, 0, 1e-12) || !(d.X > 0) {
			t.Errorf("%s: long axis %v, want east-west", name, long)
		}
		if d := cross[1].Sub(cross[0]); !closeAbs(d.X, 0, 1e-12) || !(d.Y > 0) {
			t.Errorf("%s: cross axis %v, want south-north", name, cross)
		}
	}
}

func TestAxes_Degenerate(t *testing.T) {
	sq := geom.Ring{{}, {X: 2}, {X: 2, Y: 1}, {Y: 1}}
	cases := []struct {
		name    string
		r       geom.Ring
		through geom.Vec2
		long    bool
		cross   bool
	}{
		{"no vertices", nil, geom.Vec2{}, false, false},
		{"two vertices", geom.Ring{{}, {X: 1}}, geom.Vec2{}, false, false},
		{"collinear", geom.Ring{{}, {X: 1}, {X: 2}}, geom.Vec2{}, false, false},
		{"NaN vertex", geom.Ring{{}, {X: 1}, {X: math.NaN(), Y: 1}}, geom.Vec2{}, false, false},
		{"NaN through", sq, geom.Vec2{X: math.NaN()}, true, false},
	}
	for _, c := range cases {
		long, cross := Axes(c.r, c.through, 1)
		if (long != nil) != c.long || (cross != nil) != c.cross {
			t.Errorf("Axes(%s) = %v, %v; want long %v cross %v", c.name, long, cross, c.long, c.cross)
		}
	}
	// A through point off the ring's cross line: the axis runs from the
	// point itself, ± the margin, to the ring.
	_, cross := Axes(sq, geom.Vec2{X: 1, Y: 5}, 0.5)
	vecClose(t, "cross start", cross[0], geom.Vec2{X: 1, Y: -0.5}, 1e-12)
	vecClose(t, "cross end", cross[1], geom.Vec2{X: 1, Y: 5.5}, 1e-12)
	_, cross = Axes(sq, geom.Vec2{X: 7, Y: 5}, 0.5) // misses the ring
	vecClose(t, "cross start (miss)", cross[0], geom.Vec2{X: 7, Y: 4.5}, 1e-12)
	vecClose(t, "cross end (miss)", cross[1], geom.Vec2{X: 7, Y: 5.5}, 1e-12)
	// A negative margin counts as none.
	long, _ := Axes(sq, geom.Vec2{X: 1, Y: 0.5}, -3)
	vecClose(t, "long start", long[0], geom.Vec2{X: 0, Y: 0.5}, 1e-12)
	vecClose(t, "long end", long[1], geom.Vec2{X: 2, Y: 0.5}, 1e-12)
}
