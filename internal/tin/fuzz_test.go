package tin

import (
	"encoding/binary"
	"math"
	"path/filepath"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/reftest"
)

// decodePoints turns fuzz bytes into points: each 6 bytes are x, y, z as
// int16 scaled by a factor from the first byte, so the fuzzer reaches grids,
// duplicates, collinear runs and tiny or huge spacings.
func decodePoints(data []byte) []geom.Vec3 {
	if len(data) == 0 {
		return nil
	}
	scale := math.Ldexp(1, int(int8(data[0]))/2)
	data = data[1:]
	var pts []geom.Vec3
	for len(data) >= 6 && len(pts) < 400 {
		x := float64(int16(binary.LittleEndian.Uint16(data)))
		y := float64(int16(binary.LittleEndian.Uint16(data[2:])))
		z := float64(int16(binary.LittleEndian.Uint16(data[4:])))
		pts = append(pts, v3(x*scale, y*scale, z/100))
		data = data[6:]
	}
	return pts
}

func encodePoints(scaleExp int8, pts []geom.Vec3) []byte {
	out := []byte{byte(scaleExp)}
	for _, p := range pts {
		var b [6]byte
		binary.LittleEndian.PutUint16(b[:], uint16(int16(p.X)))
		binary.LittleEndian.PutUint16(b[2:], uint16(int16(p.Y)))
		binary.LittleEndian.PutUint16(b[4:], uint16(int16(p.Z)))
		out = append(out, b[:]...)
	}
	return out
}

// FuzzBuild: for any input, Build returns an error or a surface that passes
// Validate; with a breakline and a boundary drawn from the same points too.
// Seeds: small grids, a collinear run, duplicates, and the first points of
// the delaunator fixture ukraine.json (integer lattice).
func FuzzBuild(f *testing.F) {
	f.Add(encodePoints(0, grid(v2(0, 0), 1, 4, 4)))
	f.Add(encodePoints(-100, grid(v2(0, 0), 1, 3, 5)))
	f.Add(encodePoints(60, parsePts(f, "0 0 0; 1 1 1; 2 2 2; 3 3 3; 1 0 5")))
	f.Add(encodePoints(0, parsePts(f, "0 0 0; 0 0 1; 5 0 0; 0 5 0; 5 0 3")))
	if dir := filepath.Join(reftest.SharedDir(f), "data", "delaunator"); dir != "" {
		u := readJSONPoints(f, filepath.Join(dir, "ukraine.json"))
		f.Add(encodePoints(0, u[:60]))
	}
	f.Fuzz(func(t *testing.T, data []byte) {
		pts := decodePoints(data)
		s, err := Build(pts, Options{})
		if err == nil {
			if err := s.Validate(); err != nil {
				t.Fatalf("Validate: %v", err)
			}
		}
		if len(pts) < 6 {
			return
		}
		opt := Options{
			Breaklines: []Breakline{{Name: "f", Pts: pts[len(pts)-3:]}},
			Boundary:   []geom.Ring{{v2(pts[0].X, pts[0].Y), v2(pts[1].X, pts[1].Y), v2(pts[2].X, pts[2].Y)}},
			MaxEdgeM:   math.Abs(pts[3].X) + 1,
			MergeTolM:  math.Abs(pts[4].Z) / 10,
		}
		s, err = Build(pts[:len(pts)-3], opt)
		if err == nil {
			if err := s.Validate(); err != nil {
				t.Fatalf("Validate with constraints: %v", err)
			}
		}
	})
}
