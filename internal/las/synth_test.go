package las

import (
	"bytes"
	"encoding/binary"
	"math"
	"os"
	"path/filepath"
	"testing"
)

// synthPoint is one point record of a synthetic file, fields as the ASPRS
// LAS specification lays them out.
type synthPoint struct {
	X, Y, Z  int32
	Class    uint8 // for formats 0–5 the low 5 bits; flag bits may be set in ClassByte
	Ret      uint8
	NRet     uint8
	Withheld bool
	// ClassByte, when non-zero, is written as byte 15 of a format 0–5
	// record verbatim (to test the flag bits).
	ClassByte uint8
}

// synthFile describes a small LAS file written by [synthFile.bytes],
// following the ASPRS LAS 1.2, 1.3 and 1.4 R15 header and record layouts.
type synthFile struct {
	Minor      uint8 // 2, 3 or 4
	Format     uint8
	ExtraBytes int
	Scale      [3]float64
	Offset     [3]float64
	Points     []synthPoint
	GeoKeys    [][4]uint16 // key, location, count, value
	WKT        string
	WKTInEVLR  bool // LAS 1.4: put the WKT in an extended VLR after the points
	SystemID   string
	Software   string
	Day, Year  uint16
}

var synthFormatSize = map[uint8]int{0: 20, 1: 28, 2: 26, 3: 34, 4: 57, 5: 63, 6: 30, 7: 36, 8: 38, 9: 59, 10: 67}

func (s synthFile) bytes(tb testing.TB) []byte {
	tb.Helper()
	le := binary.LittleEndian
	if s.Scale == [3]float64{} {
		s.Scale = [3]float64{0.01, 0.01, 0.01}
	}
	hsize := map[uint8]int{2: 227, 3: 235, 4: 375}[s.Minor]
	if hsize == 0 {
		tb.Fatalf("synthFile: minor version %d", s.Minor)
	}
	var vlrs bytes.Buffer
	nvlr := 0
	addVLR := func(user string, id uint16, data []byte) {
		var h [54]byte
		copy(h[2:18], user)
		le.PutUint16(h[18:], id)
		le.PutUint16(h[20:], uint16(len(data)))
		copy(h[22:54], "synthetic record")
		vlrs.Write(h[:])
		vlrs.Write(data)
		nvlr++
	}
	if len(s.GeoKeys) > 0 {
		d := make([]byte, 8+8*len(s.GeoKeys))
		le.PutUint16(d[0:], 1)
		le.PutUint16(d[2:], 1)
		le.PutUint16(d[4:], 0)
		le.PutUint16(d[6:], uint16(len(s.GeoKeys)))
		for i, k := range s.GeoKeys {
			for j := range 4 {
				le.PutUint16(d[8+8*i+2*j:], k[j])
			}
		}
		addVLR("LASF_Projection", 34735, d)
	}
	if s.WKT != "" && !s.WKTInEVLR {
		addVLR("LASF_Projection", 2112, append([]byte(s.WKT), 0))
	}
	base, ok := synthFormatSize[s.Format&0x3F]
	if !ok {
		base = 20
	}
	reclen := base + s.ExtraBytes
	hdr := make([]byte, hsize)
	copy(hdr[0:4], "LASF")
	hdr[24], hdr[25] = 1, s.Minor
	copy(hdr[26:58], s.SystemID)
	copy(hdr[58:90], s.Software)
	le.PutUint16(hdr[90:], s.Day)
	le.PutUint16(hdr[92:], s.Year)
	le.PutUint16(hdr[94:], uint16(hsize))
	le.PutUint32(hdr[96:], uint32(hsize+vlrs.Len()))
	le.PutUint32(hdr[100:], uint32(nvlr))
	hdr[104] = s.Format
	le.PutUint16(hdr[105:], uint16(reclen))
	n := len(s.Points)
	legacyFmt := s.Format&0x3F < 6
	if legacyFmt {
		le.PutUint32(hdr[107:], uint32(n))
	}
	var byReturn [15]uint64
	mn := [3]float64{math.Inf(1), math.Inf(1), math.Inf(1)}
	mx := [3]float64{math.Inf(-1), math.Inf(-1), math.Inf(-1)}
	var pts bytes.Buffer
	for _, p := range s.Points {
		rec := make([]byte, reclen)
		le.PutUint32(rec[0:], uint32(p.X))
		le.PutUint32(rec[4:], uint32(p.Y))
		le.PutUint32(rec[8:], uint32(p.Z))
		le.PutUint16(rec[12:], 100) // intensity
		if legacyFmt {
			rec[14] = p.Ret&7 | (p.NRet&7)<<3
			rec[15] = p.Class & 0x1F
			if p.Withheld {
				rec[15] |= 0x80
			}
			if p.ClassByte != 0 {
				rec[15] = p.ClassByte
			}
		} else {
			rec[14] = p.Ret&15 | p.NRet<<4
			if p.Withheld {
				rec[15] = 0x04
			}
			rec[16] = p.Class
		}
		for i := base; i < reclen; i++ {
			rec[i] = 0xAB // extra bytes: junk the reader must skip
		}
		pts.Write(rec)
		if p.Ret >= 1 && p.Ret <= 15 {
			byReturn[p.Ret-1]++
		}
		c := [3]int32{p.X, p.Y, p.Z}
		for i := range 3 {
			v := float64(c[i])*s.Scale[i] + s.Offset[i]
			mn[i] = math.Min(mn[i], v)
			mx[i] = math.Max(mx[i], v)
		}
	}
	if n == 0 {
		mn, mx = [3]float64{}, [3]float64{}
	}
	for i := range 5 {
		if legacyFmt {
			le.PutUint32(hdr[111+4*i:], uint32(byReturn[i]))
		}
	}
	for i := range 3 {
		le.PutUint64(hdr[131+8*i:], math.Float64bits(s.Scale[i]))
		le.PutUint64(hdr[155+8*i:], math.Float64bits(s.Offset[i]))
		le.PutUint64(hdr[179+16*i:], math.Float64bits(mx[i]))
		le.PutUint64(hdr[187+16*i:], math.Float64bits(mn[i]))
	}
	var evlr bytes.Buffer
	if s.Minor == 4 {
		if s.WKT != "" && s.WKTInEVLR {
			var h [60]byte
			copy(h[2:18], "LASF_Projection")
			le.PutUint16(h[18:], 2112)
			le.PutUint64(h[20:], uint64(len(s.WKT)+1))
			evlr.Write(h[:])
			evlr.WriteString(s.WKT)
			evlr.WriteByte(0)
			le.PutUint64(hdr[235:], uint64(hsize+vlrs.Len()+pts.Len()))
			le.PutUint32(hdr[243:], 1)
		}
		le.PutUint64(hdr[247:], uint64(n))
		for i := range 15 {
			le.PutUint64(hdr[255+8*i:], byReturn[i])
		}
	}
	var out bytes.Buffer
	out.Write(hdr)
	out.Write(vlrs.Bytes())
	out.Write(pts.Bytes())
	out.Write(evlr.Bytes())
	return out.Bytes()
}

// writeTemp writes b to a file named name in a test temp dir and returns
// its path.
func writeTemp(tb testing.TB, name string, b []byte) string {
	tb.Helper()
	p := filepath.Join(tb.TempDir(), name)
	if err := os.WriteFile(p, b, 0o644); err != nil {
		tb.Fatal(err)
	}
	return p
}

// samplePoints returns n deterministic points covering classes, returns
// and one withheld point.
func samplePoints(n int, wideClasses bool) []synthPoint {
	pts := make([]synthPoint, n)
	for i := range pts {
		nret := uint8(1 + i%3)
		cls := []uint8{1, 2, 2, 5, 6}[i%5]
		if wideClasses && i%7 == 6 {
			cls = 64 + uint8(i%50) // classes above 31 exist only in formats 6–10
		}
		pts[i] = synthPoint{
			X: int32(100000 + 37*i), Y: int32(-50000 + 101*(i%13)), Z: int32(2000 - 3*i),
			Class: cls, Ret: 1 + uint8(i)%nret, NRet: nret,
		}
	}
	if n > 3 {
		pts[3].Withheld = true
	}
	return pts
}
