package grid

import (
	"errors"
	"math"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
)

func TestNewLattice(t *testing.T) {
	tests := []struct {
		name           string
		box            geom.Box
		h              float64
		x0, y0         float64
		nx, ny         int
		wantErr, wantN error
	}{
		{name: "aligned", box: box(0, 0, 2, 1), h: 0.5, x0: 0, y0: 0, nx: 5, ny: 3},
		{name: "snapped outward", box: box(0.3, -0.2, 1.1, 0.9), h: 0.5, x0: 0, y0: -0.5, nx: 4, ny: 4},
		{name: "negative", box: box(-3.7, -2.2, -1.1, -0.1), h: 1, x0: -4, y0: -3, nx: 4, ny: 4},
		{name: "point gets one cell", box: box(2, 2, 2, 2), h: 1, x0: 2, y0: 2, nx: 2, ny: 2},
		{name: "zero cell", box: box(0, 0, 1, 1), h: 0, wantErr: ErrLattice},
		{name: "negative cell", box: box(0, 0, 1, 1), h: -1, wantErr: ErrLattice},
		{name: "NaN cell", box: box(0, 0, 1, 1), h: math.NaN(), wantErr: ErrLattice},
		{name: "infinite cell", box: box(0, 0, 1, 1), h: math.Inf(1), wantErr: ErrLattice},
		{name: "empty box", box: geom.EmptyBox(), h: 1, wantErr: ErrLattice},
		{name: "infinite box", box: box(0, 0, math.Inf(1), 1), h: 1, wantErr: ErrLattice},
		{name: "too many nodes", box: box(0, 0, 1000, 1000), h: 0.01, wantErr: ErrTooLarge},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			l, err := NewLattice(tc.box, tc.h)
			if tc.wantErr != nil {
				if !errors.Is(err, tc.wantErr) {
					t.Fatalf("NewLattice(%v, %g) error = %v, want %v", tc.box, tc.h, err, tc.wantErr)
				}
				return
			}
			if err != nil {
				t.Fatalf("NewLattice(%v, %g): %v", tc.box, tc.h, err)
			}
			if l.X0 != tc.x0 || l.Y0 != tc.y0 || l.NX != tc.nx || l.NY != tc.ny {
				t.Fatalf("NewLattice(%v, %g) = %+v, want X0 %g Y0 %g NX %d NY %d", tc.box, tc.h, l, tc.x0, tc.y0, tc.nx, tc.ny)
			}
			bb := l.Bounds()
			if bb.Min.X > tc.box.Min.X || bb.Min.Y > tc.box.Min.Y || bb.Max.X < tc.box.Max.X || bb.Max.Y < tc.box.Max.Y {
				t.Fatalf("lattice bounds %v do not cover %v", bb, tc.box)
			}
		})
	}
}

func TestSizeError(t *testing.T) {
	_, err := NewLattice(box(0, 0, 100, 50), 0.001)
	var se *SizeError
	if !errors.As(err, &se) {
		t.Fatalf("NewLattice error = %v, want *SizeError", err)
	}
	if se.NX != 100001 || se.NY != 50001 || se.Limit != MaxNodes {
		t.Fatalf("SizeError = %+v, want NX 100001 NY 50001 Limit %d", se, MaxNodes)
	}
}

func TestLattice_Interpolate(t *testing.T) {
	// A linear function is reproduced exactly by the piecewise-linear
	// interpolant (any triangulation interpolates linear functions exactly).
	l, err := NewLattice(box(-1, -1, 3, 2), 0.25)
	if err != nil {
		t.Fatal(err)
	}
	fn := func(p geom.Vec2) float64 { return 2 + 0.3*p.X - 0.7*p.Y }
	z := sample(l, fn)
	for _, p := range pts(0, 0, 0.1, 0.2, 0.2, 0.1, 2.99, 1.99, 3, 2, -1, -1, 1.125, 0.875) {
		got, ok := l.Interpolate(z, p)
		if !ok || math.Abs(got-fn(p)) > 1e-12 {
			t.Errorf("Interpolate(%v) = %g, %v, want %g", p, got, ok, fn(p))
		}
	}
	if _, ok := l.Interpolate(z, geom.Vec2{X: 3.01, Y: 0}); ok {
		t.Errorf("Interpolate outside reported ok")
	}
	// A bilinear term is not linear on the triangles: at a cell centre the
	// interpolant is the mean of the two diagonal corners (first triangle).
	zz := sample(l, func(p geom.Vec2) float64 { return p.X * p.Y })
	got, _ := l.Interpolate(zz, geom.Vec2{X: 0.125 + 1e-9, Y: 0.125})
	want := (0*0 + 0.25*0.25) / 2
	if math.Abs(got-want) > 1e-9 {
		t.Errorf("Interpolate(x·y) at centre = %g, want %g", got, want)
	}
}

func box(x0, y0, x1, y1 float64) geom.Box {
	return geom.Box{Min: geom.Vec2{X: x0, Y: y0}, Max: geom.Vec2{X: x1, Y: y1}}
}

func sample(l Lattice, fn func(geom.Vec2) float64) []float64 {
	z := make([]float64, l.Len())
	for j := 0; j < l.NY; j++ {
		for i := 0; i < l.NX; i++ {
			z[l.Index(i, j)] = fn(l.Node(i, j))
		}
	}
	return z
}

func pts(c ...float64) []geom.Vec2 {
	out := make([]geom.Vec2, len(c)/2)
	for i := range out {
		out[i] = geom.Vec2{X: c[2*i], Y: c[2*i+1]}
	}
	return out
}
