package geom

import (
	"math"
	"testing"
)

func TestRingArea(t *testing.T) {
	sq := Ring{{0, 0}, {2, 0}, {2, 1}, {0, 1}}
	tests := []struct {
		name string
		r    Ring
		want float64
	}{
		{"ccw rectangle", sq, 2},
		{"cw rectangle", Ring{{0, 0}, {0, 1}, {2, 1}, {2, 0}}, -2},
		{"empty", nil, 0},
		{"two points", Ring{{0, 0}, {1, 1}}, 0},
		// STYLE.md §5.1: a 0.3 × 0.7 m rectangle at UTM-sized coordinates.
		{"utm offset", Ring{{500000, 4500000}, {500000.3, 4500000}, {500000.3, 4500000.7}, {500000, 4500000.7}}, 0.21},
	}
	for _, tc := range tests {
		if got := tc.r.Area(); math.Abs(got-tc.want) > 1e-9 {
			t.Errorf("%s: Area() = %.12g, want %g", tc.name, got, tc.want)
		}
	}
	if got := sq.Perimeter(); got != 6 {
		t.Errorf("Perimeter() = %g, want 6", got)
	}
	if got := sq.CCW().Area(); got != 2 {
		t.Errorf("CCW().Area() = %g", got)
	}
	if got := (Ring{{0, 0}, {0, 1}, {2, 1}, {2, 0}}).CCW().Area(); got != 2 {
		t.Errorf("CW.CCW().Area() = %g, want 2", got)
	}
}

func TestRingContainsDistance(t *testing.T) {
	// An L-shape: concave.
	l := Ring{{0, 0}, {3, 0}, {3, 1}, {1, 1}, {1, 3}, {0, 3}}
	tests := []struct {
		p    Vec2
		in   bool
		dist float64
	}{
		{Vec2{0.5, 0.5}, true, 0},
		{Vec2{2, 2}, false, 1},  // in the notch: nearest is the reflex corner (1,1)... distance to edges
		{Vec2{3, 0.5}, true, 0}, // on the boundary counts as inside
		{Vec2{4, 0.5}, false, 1},
		{Vec2{-1, -1}, false, math.Sqrt2},
	}
	for _, tc := range tests {
		if got := l.Contains(tc.p); got != tc.in {
			t.Errorf("Contains(%v) = %v, want %v", tc.p, got, tc.in)
		}
		if got := l.Distance(tc.p); math.Abs(got-tc.dist) > 1e-12 {
			t.Errorf("Distance(%v) = %g, want %g", tc.p, got, tc.dist)
		}
	}
}

func TestBox(t *testing.T) {
	b := EmptyBox()
	if !b.IsEmpty() {
		t.Fatal("EmptyBox not empty")
	}
	b = b.Extend(Vec2{1, 2}).Extend(Vec2{-1, 5})
	if b.Min != (Vec2{-1, 2}) || b.Max != (Vec2{1, 5}) {
		t.Errorf("box = %+v", b)
	}
	// The zero Box is the point (0,0): extending it includes the origin.
	if z := (Box{}).Extend(Vec2{1, 1}); !z.Contains(Vec2{0, 0}) {
		t.Error("zero Box should contain the origin")
	}
	if !b.Intersects(Box{Vec2{1, 5}, Vec2{2, 6}}) || b.Intersects(Box{Vec2{1.1, 0}, Vec2{2, 1}}) {
		t.Error("Intersects wrong")
	}
	if e := EmptyBox().Expand(3); !e.IsEmpty() {
		t.Error("expanded empty box should stay empty")
	}
}

func TestSumCompensated(t *testing.T) {
	var s Sum
	s.Add(1e16)
	for i := 0; i < 1000; i++ {
		s.Add(1)
	}
	s.Add(-1e16)
	if got := s.Value(); got != 1000 {
		t.Errorf("Sum = %g, want 1000", got)
	}
}

func TestFrame(t *testing.T) {
	f := FrameAt(Vec2{494513.44, 4878339.30})
	if f.Origin != (Vec2{494513, 4878339}) {
		t.Errorf("origin = %v", f.Origin)
	}
	w := Vec2{494513.444, 4878339.301}
	if back := f.ToWorld(f.ToLocal(w)); math.Abs(back.X-w.X) > 1e-9 || math.Abs(back.Y-w.Y) > 1e-9 {
		t.Errorf("round trip %v -> %v", w, back)
	}
}

func TestTriangleAreas(t *testing.T) {
	a, b, c := Vec3{0, 0, 0}, Vec3{1, 0, 0}, Vec3{0, 1, 1}
	if got := PlanArea(a, b, c); got != 0.5 {
		t.Errorf("PlanArea = %g", got)
	}
	// The triangle spans a plane inclined at 45°: 3-D area = plan area × √2.
	if got := SurfaceArea(a, b, c); math.Abs(got-0.5*math.Sqrt2) > 1e-15 {
		t.Errorf("SurfaceArea = %g", got)
	}
}
