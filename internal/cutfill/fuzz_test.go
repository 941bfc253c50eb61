package cutfill

import (
	"encoding/binary"
	"math"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// meshFromBytes decodes a small mesh from fuzz data: a vertex count, then
// per vertex three int16 coordinates (quarter metres), then triangles as
// byte triples taken modulo a little more than the vertex count (so some
// indices are out of range). It consumes what it uses and returns the rest.
func meshFromBytes(data []byte) (geom.TriMesh, []byte) {
	var m geom.TriMesh
	if len(data) == 0 {
		return m, data
	}
	nv := int(data[0]%16) + 3
	data = data[1:]
	for range nv {
		if len(data) < 6 {
			break
		}
		x := float64(int16(binary.LittleEndian.Uint16(data))) / 4
		y := float64(int16(binary.LittleEndian.Uint16(data[2:]))) / 4
		z := float64(int16(binary.LittleEndian.Uint16(data[4:]))) / 4
		m.V = append(m.V, geom.Vec3{X: x, Y: y, Z: z})
		data = data[6:]
	}
	if len(data) == 0 {
		return m, data
	}
	nt := int(data[0] % 12)
	data = data[1:]
	for range nt {
		if len(data) < 3 {
			break
		}
		for k := range 3 {
			m.T = append(m.T, int32(data[k])%int32(len(m.V)+1))
		}
		data = data[3:]
	}
	return m, data
}

// FuzzCompare feeds arbitrary small meshes and a boundary to Compare. It
// must not panic; on success the volumes are finite and non-negative, net is
// cut − fill, and swapping the surfaces swaps cut and fill. Overlapping
// triangles are allowed here (the fuzzer makes them), which is why only
// these identities, and not a reference value, are checked.
func FuzzCompare(f *testing.F) {
	enc := func(m geom.TriMesh) []byte {
		b := []byte{byte(len(m.V) - 3)}
		for _, v := range m.V {
			b = binary.LittleEndian.AppendUint16(b, uint16(int16(v.X*4)))
			b = binary.LittleEndian.AppendUint16(b, uint16(int16(v.Y*4)))
			b = binary.LittleEndian.AppendUint16(b, uint16(int16(v.Z*4)))
		}
		b = append(b, byte(len(m.T)/3))
		for _, i := range m.T {
			b = append(b, byte(i))
		}
		return b
	}
	seedA := pyramidPit(5, 1, 1, 3)
	seedB := flatMesh(-6, -6, 6, 6, 0)
	f.Add(append(append(enc(seedA), enc(seedB)...), 1, 2, 3, 4, 5, 6, 7, 8))
	f.Add(append(enc(seedB), enc(seedA)...))
	f.Add([]byte{0, 0, 0, 0, 0, 0, 0, 4, 0, 0, 0, 0, 0, 0, 0, 4, 0, 0, 1, 0, 1, 2})
	f.Fuzz(func(t *testing.T, data []byte) {
		a, rest := meshFromBytes(data)
		b, rest := meshFromBytes(rest)
		var ring geom.Ring
		for len(rest) >= 2 && len(ring) < 8 {
			ring = append(ring, geom.Vec2{X: float64(int8(rest[0])) / 4, Y: float64(int8(rest[1])) / 4})
			rest = rest[2:]
		}
		var bd []geom.Ring
		if len(ring) > 0 {
			bd = []geom.Ring{ring}
		}
		r1, err := Compare(a, b, bd)
		if err != nil {
			return
		}
		r2, err := Compare(b, a, bd)
		if err != nil {
			t.Fatalf("Compare(a, b) succeeded but Compare(b, a): %v", err)
		}
		for _, v := range []float64{r1.CutM3, r1.FillM3, r1.AreaM2, r1.NetM3} {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				t.Fatalf("Compare = %+v: not finite", r1)
			}
		}
		if r1.CutM3 < 0 || r1.FillM3 < 0 || r1.AreaM2 < 0 {
			t.Fatalf("Compare = %+v: negative", r1)
		}
		scale := 1 + r1.CutM3 + r1.FillM3
		if math.Abs(r1.CutM3-r1.FillM3-r1.NetM3) > 1e-9*scale {
			t.Fatalf("Compare = %+v: net is not cut − fill", r1)
		}
		if math.Abs(r1.CutM3-r2.FillM3) > 1e-9*scale || math.Abs(r1.FillM3-r2.CutM3) > 1e-9*scale {
			t.Fatalf("Compare(a,b) = %+v, Compare(b,a) = %+v: cut and fill do not swap", r1, r2)
		}
	})
}
