package contours_test

import (
	"math"
	"testing"

	"github.com/dugout-estimating/dugout/internal/contours"
	"github.com/dugout-estimating/dugout/internal/geom"
)

// meshFromBytes decodes a small mesh: a vertex count, then x, y, z as
// signed bytes on a coarse lattice (so that ties, repeated points and
// levels on vertices are common), then triangles as byte indices that may
// be out of range or repeat.
func meshFromBytes(data []byte) (geom.TriMesh, float64) {
	var m geom.TriMesh
	if len(data) < 2 {
		return m, 0
	}
	level := float64(int8(data[0])) / 4
	nv := int(data[1] % 32)
	data = data[2:]
	for i := 0; i < nv && len(data) >= 3; i++ {
		m.V = append(m.V, geom.Vec3{X: float64(int8(data[0])), Y: float64(int8(data[1])), Z: float64(int8(data[2])) / 4})
		data = data[3:]
	}
	for len(data) >= 3 {
		m.T = append(m.T, int32(int8(data[0])), int32(int8(data[1])), int32(int8(data[2])))
		data = data[3:]
	}
	return m, level
}

func checkFuzzLines(t *testing.T, lines []contours.Line) {
	t.Helper()
	for i, l := range lines {
		if len(l.Pts) < 2 {
			t.Fatalf("line %d has %d points", i, len(l.Pts))
		}
		if l.Closed && (len(l.Pts) < 4 || l.Pts[0] != l.Pts[len(l.Pts)-1]) {
			t.Fatalf("ring %d not closed: %v", i, l.Pts)
		}
		for j, p := range l.Pts {
			if !p.IsFinite() || (j > 0 && p == l.Pts[j-1]) {
				t.Fatalf("line %d point %d: %v", i, j, l.Pts)
			}
		}
	}
}

// FuzzTraceLevel checks that arbitrary meshes, valid or not, never make
// TraceLevel or Trace panic, and that whatever they return keeps the
// invariants of a line.
func FuzzTraceLevel(f *testing.F) {
	seed := func(level int8, m geom.TriMesh) []byte {
		b := []byte{byte(level), byte(len(m.V))}
		for _, v := range m.V {
			b = append(b, byte(int8(v.X)), byte(int8(v.Y)), byte(int8(v.Z*4)))
		}
		for _, i := range m.T {
			b = append(b, byte(int8(i)))
		}
		return b
	}
	f.Add(seed(4, fanMesh(6, 10, 2, 0)))
	f.Add(seed(4, gridMesh(4, 4, 0, 0, 1, func(x, y float64) float64 { return math.Mod(x*y, 3) })))
	f.Add(seed(0, gridMesh(3, 3, -1, -1, 1, func(x, y float64) float64 { return x*x - y*y })))
	f.Add([]byte{1, 3, 0, 0, 4, 1, 0, 0, 0, 1, 0, 0, 1, 2, 0, 1, 2, 0, 2, 1})
	f.Fuzz(func(t *testing.T, data []byte) {
		m, level := meshFromBytes(data)
		checkFuzzLines(t, contours.TraceLevel(m, level))
		lines, err := contours.Trace(m, contours.Options{IntervalM: 0.25, MinLevel: math.NaN(), MaxLevel: math.NaN(), Smooth: len(data)%2 == 0})
		if err == nil {
			checkFuzzLines(t, lines)
		}
	})
}
