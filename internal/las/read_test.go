package las

import (
	"bytes"
	"encoding/binary"
	"errors"
	"fmt"
	"math"
	"runtime"
	"slices"
	"strings"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/units"
)

func v3(x, y, z float64) geom.Vec3 { return geom.Vec3{X: x, Y: y, Z: z} }

func decodeBytes(b []byte, name string, opt Options) (Header, []geom.Vec3, Stats, error) {
	return Decode(bytes.NewReader(b), int64(len(b)), name, opt)
}

// TestDecode_Formats writes every supported version and point format with
// and without extra bytes, laid out as the ASPRS LAS 1.2, 1.3 and 1.4 R15
// specifications define them, and reads them back.
func TestDecode_Formats(t *testing.T) {
	cases := []struct{ minor, format uint8 }{
		{2, 0}, {2, 1}, {2, 2}, {2, 3},
		{3, 0}, {3, 1}, {3, 2}, {3, 3},
		{4, 0}, {4, 1}, {4, 2}, {4, 3}, {4, 6}, {4, 7}, {4, 8},
	}
	for _, c := range cases {
		for _, extra := range []int{0, 3} {
			t.Run(fmt.Sprintf("1.%d_format%d_extra%d", c.minor, c.format, extra), func(t *testing.T) {
				sf := synthFile{Minor: c.minor, Format: c.format, ExtraBytes: extra,
					Scale: [3]float64{0.001, 0.002, 0.01}, Offset: [3]float64{500000, 4000000, -10},
					Points: samplePoints(40, c.format >= 6)}
				h, pts, st, err := decodeBytes(sf.bytes(t), "synthetic.las", Options{AllClasses: true})
				if err != nil {
					t.Fatal(err)
				}
				if h.PointFormat != c.format || h.Minor != c.minor || h.ExtraBytes != extra || h.Count != 40 {
					t.Errorf("header 1.%d format %d extra %d count %d, want 1.%d, %d, %d, 40", h.Minor, h.PointFormat, h.ExtraBytes, h.Count, c.minor, c.format, extra)
				}
				var want []geom.Vec3
				wantClass := map[uint8]uint64{}
				for _, p := range sf.Points {
					wantClass[p.Class]++
					if p.Withheld {
						continue
					}
					// World coordinate = stored integer · scale + offset (LAS
					// spec, "X scale factor" ff.).
					want = append(want, geom.Vec3{
						X: float64(p.X)*sf.Scale[0] + sf.Offset[0],
						Y: float64(p.Y)*sf.Scale[1] + sf.Offset[1],
						Z: float64(p.Z)*sf.Scale[2] + sf.Offset[2],
					})
				}
				if !slices.Equal(pts, want) {
					t.Errorf("points differ:\n got %v\nwant %v", pts[:3], want[:3])
				}
				if st.Withheld != 1 || st.Read != 40 || st.Kept != 39 {
					t.Errorf("read %d kept %d withheld %d, want 40, 39, 1", st.Read, st.Kept, st.Withheld)
				}
				if fmt.Sprint(st.ClassCounts) != fmt.Sprint(wantClass) {
					t.Errorf("class counts %v, want %v", st.ClassCounts, wantClass)
				}
				if !countsAgree(st.ReturnCounts, h.ReturnCounts) {
					t.Errorf("return counts %v, header %v", st.ReturnCounts, h.ReturnCounts)
				}
				if len(st.Warnings) != 0 {
					t.Errorf("warnings %q, want none", st.Warnings)
				}
			})
		}
	}
}

// TestDecode_LegacyClassFlags checks that formats 0–5 take the class from
// the low five bits of byte 15, the high bits being the synthetic, key-point
// and withheld flags (LAS 1.2, point data record format 0).
func TestDecode_LegacyClassFlags(t *testing.T) {
	sf := synthFile{Minor: 2, Format: 0, Points: []synthPoint{
		{X: 1, ClassByte: 0x20 | 2, Ret: 1, NRet: 1}, // synthetic ground
		{X: 2, ClassByte: 0x40 | 2, Ret: 1, NRet: 1}, // key-point ground
		{X: 3, ClassByte: 0x80 | 2, Ret: 1, NRet: 1}, // withheld ground
		{X: 4, ClassByte: 5, Ret: 1, NRet: 1},
	}}
	_, pts, st, err := decodeBytes(sf.bytes(t), "flags.las", Options{})
	if err != nil {
		t.Fatal(err)
	}
	if st.ClassCounts[2] != 3 || st.ClassCounts[5] != 1 || st.Withheld != 1 || len(pts) != 2 || !st.UsedGroundOnly {
		t.Errorf("classes %v withheld %d kept %d ground-only %v, want 2:3 5:1, 1, 2, true", st.ClassCounts, st.Withheld, len(pts), st.UsedGroundOnly)
	}
}

func TestDecode_ClassSelection(t *testing.T) {
	pts := samplePoints(30, false) // classes 1, 2, 5, 6
	noGround := slices.Clone(pts)
	for i := range noGround {
		if noGround[i].Class == 2 {
			noGround[i].Class = 1
		}
	}
	tests := []struct {
		name       string
		points     []synthPoint
		opt        Options
		wantKept   int
		wantGround bool
		wantCls    []uint8
		wantWarn   string
	}{
		{"default_ground", pts, Options{}, 12, true, []uint8{2}, ""},
		{"default_no_ground_keeps_all", noGround, Options{}, 29, false, nil, "no ground"},
		{"explicit_classes", pts, Options{Classes: []uint8{5, 6}}, 11, false, []uint8{5, 6}, ""},
		{"explicit_empty_is_default", pts, Options{Classes: []uint8{}}, 12, true, []uint8{2}, ""},
		{"all_overrides_classes", pts, Options{AllClasses: true, Classes: []uint8{5}}, 29, false, nil, ""},
		{"absent_class", pts, Options{Classes: []uint8{9}}, 0, false, []uint8{9}, ""},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			sf := synthFile{Minor: 2, Format: 1, Points: tc.points}
			_, got, st, err := decodeBytes(sf.bytes(t), "classes.las", tc.opt)
			if err != nil {
				t.Fatal(err)
			}
			if len(got) != tc.wantKept || st.UsedGroundOnly != tc.wantGround || !slices.Equal(st.Classes, tc.wantCls) {
				t.Errorf("kept %d ground-only %v classes %v, want %d, %v, %v", len(got), st.UsedGroundOnly, st.Classes, tc.wantKept, tc.wantGround, tc.wantCls)
			}
			if w := strings.Join(st.Warnings, "; "); (tc.wantWarn == "") != (w == "") || !strings.Contains(w, tc.wantWarn) {
				t.Errorf("warnings %q, want one containing %q", w, tc.wantWarn)
			}
		})
	}
}

// TestDecode_Thin checks thinning on a hand-worked case: cell 1.0 (in file
// units) on a grid anchored at the header minimum (0, 0); cells half-open,
// so x = 1.00 falls in the second column.
func TestDecode_Thin(t *testing.T) {
	// Stored integers at scale 0.01: (x, y, z) in hundredths.
	raw := [][3]int32{
		{50, 50, 300},  // cell (0,0)
		{70, 20, 100},  // cell (0,0), lowest
		{10, 90, 200},  // cell (0,0)
		{100, 0, 500},  // cell (1,0): x = 1.00 is the next cell's left edge
		{199, 99, 400}, // cell (1,0)
		{0, 100, 700},  // cell (0,1)
		{20, 150, 700}, // cell (0,1), equal lowest z: the first one read wins
	}
	var sp []synthPoint
	for _, r := range raw {
		sp = append(sp, synthPoint{X: r[0], Y: r[1], Z: r[2], Class: 2, Ret: 1, NRet: 1})
	}
	data := synthFile{Minor: 2, Format: 0, Points: sp}.bytes(t)
	tests := []struct {
		mode ThinMode
		want []geom.Vec3
	}{
		{ThinLowest, []geom.Vec3{v3(0.70, 0.20, 1.00), v3(1.99, 0.99, 4.00), v3(0, 1.00, 7.00)}},
		// Means of the stored integers: (50+70+10)/3 = 43.333…, etc.
		{ThinMean, []geom.Vec3{v3(1.30/3, 1.60/3, 6.00/3), v3(2.99/2, 0.99/2, 9.00/2), v3(0.20/2, 2.50/2, 7.00)}},
	}
	for _, tc := range tests {
		t.Run(tc.mode.String(), func(t *testing.T) {
			_, got, st, err := decodeBytes(data, "thin.las", Options{ThinCell: 1, Thin: tc.mode})
			if err != nil {
				t.Fatal(err)
			}
			if len(got) != len(tc.want) || st.Kept != uint64(len(tc.want)) || st.Read != uint64(len(raw)) {
				t.Fatalf("kept %d of %d: %v, want %v", st.Kept, st.Read, got, tc.want)
			}
			const tol = 1e-12 // float64 round-off of hundredths
			for i := range got {
				d := got[i].Sub(tc.want[i])
				if math.Abs(d.X) > tol || math.Abs(d.Y) > tol || math.Abs(d.Z) > tol {
					t.Errorf("cell %d: %v, want %v", i, got[i], tc.want[i])
				}
			}
		})
	}
}

func TestDecode_ThinShared(t *testing.T) {
	// Thinning the Autzen ground to 10 ft cells: every kept point is the
	// lowest of its cell, and no two share a cell.
	path := sharedLAS(t, "autzen_trim.las")
	h, all, _, err := Read(path, Options{})
	if err != nil {
		t.Fatal(err)
	}
	_, thin, st, err := Read(path, Options{ThinCell: 10, Thin: ThinLowest})
	if err != nil {
		t.Fatal(err)
	}
	lowest := map[[2]int64]float64{}
	for _, p := range all {
		k := [2]int64{int64(math.Floor((p.X - h.Min[0]) / 10)), int64(math.Floor((p.Y - h.Min[1]) / 10))}
		if z, ok := lowest[k]; !ok || p.Z < z {
			lowest[k] = p.Z
		}
	}
	if len(thin) != len(lowest) || st.Kept != uint64(len(lowest)) {
		t.Errorf("kept %d points, brute force finds %d occupied cells", len(thin), len(lowest))
	}
	for _, p := range thin {
		k := [2]int64{int64(math.Floor((p.X - h.Min[0]) / 10)), int64(math.Floor((p.Y - h.Min[1]) / 10))}
		if lowest[k] != p.Z {
			t.Errorf("cell %v kept z %v, lowest is %v", k, p.Z, lowest[k])
		}
		delete(lowest, k)
	}
}

func TestDecode_Options(t *testing.T) {
	data := synthFile{Minor: 2, Format: 0, Points: samplePoints(5, false)}.bytes(t)
	bad := []struct {
		name string
		opt  Options
	}{
		{"negative_cell", Options{ThinCell: -1, Thin: ThinLowest}},
		{"nan_cell", Options{ThinCell: math.NaN(), Thin: ThinLowest}},
		{"inf_cell", Options{ThinCell: math.Inf(1), Thin: ThinMean}},
		{"cell_without_mode", Options{ThinCell: 1}},
		{"mode_without_cell", Options{Thin: ThinMean}},
		{"unknown_mode", Options{ThinCell: 1, Thin: ThinMode(7)}},
		{"cell_too_small_for_extent", Options{ThinCell: 1e-12, Thin: ThinLowest}},
	}
	for _, tc := range bad {
		t.Run(tc.name, func(t *testing.T) {
			if _, _, _, err := decodeBytes(data, "opt.las", tc.opt); !errors.Is(err, ErrOptions) {
				t.Errorf("Decode with %+v: %v, want ErrOptions", tc.opt, err)
			}
		})
	}
}

// TestDecode_BadInput is the table of malformed files: each error is a
// *FileError naming the file and the field, wrapping the right sentinel.
func TestDecode_BadInput(t *testing.T) {
	good := synthFile{Minor: 2, Format: 1, Points: samplePoints(10, false)}.bytes(t)
	good14 := synthFile{Minor: 4, Format: 6, Points: samplePoints(10, true)}.bytes(t)
	le := binary.LittleEndian
	patch := func(b []byte, f func([]byte)) []byte {
		c := slices.Clone(b)
		f(c)
		return c
	}
	laszipVLR := synthFile{Minor: 2, Format: 1, Points: samplePoints(3, false)}
	lz := laszipVLR.bytes(t)
	// Turn the file into one whose only VLR is a laszip record.
	lzv := make([]byte, 54)
	copy(lzv[2:], "laszip encoded")
	le.PutUint16(lzv[18:], 22204)
	lz = slices.Concat(lz[:227], lzv, lz[227:])
	le.PutUint32(lz[96:], 227+54)
	le.PutUint32(lz[100:], 1)

	tests := []struct {
		name      string
		file      string
		data      []byte
		want      error
		field     string
		msgSubstr string
	}{
		{"empty", "empty.las", nil, ErrNotLAS, "file signature", "only 0 bytes"},
		{"bad_signature", "sig.las", patch(good, func(b []byte) { copy(b, "LASX") }), ErrNotLAS, "file signature", `signature "LASX"`},
		{"text_file", "notes.las", []byte("x,y,z\n1,2,3\n"), ErrNotLAS, "file signature", `signature "x,y,"`},
		{"version_1_1", "v11.las", patch(good, func(b []byte) { b[25] = 1 }), ErrVersion, "version", "1.1"},
		{"version_1_5", "v15.las", patch(good, func(b []byte) { b[25] = 5 }), ErrVersion, "version", "1.5"},
		{"version_2_2", "v22.las", patch(good, func(b []byte) { b[24] = 2 }), ErrVersion, "version", "2.2"},
		{"truncated_header", "short.las", good[:100], ErrTruncated, "public header block", "the file has 100"},
		{"truncated_1_4_header", "short14.las", good14[:300], ErrTruncated, "header size", "header of 375 bytes, the file has 300"},
		{"header_size_too_small", "hs.las", patch(good, func(b []byte) { le.PutUint16(b[94:], 200) }), ErrHeader, "header size", "200 bytes is smaller than the 227"},
		{"header_size_too_small_1_4", "hs14.las", patch(good14, func(b []byte) { le.PutUint16(b[94:], 227) }), ErrHeader, "header size", "375"},
		{"point_format_4", "pf4.las", patch(good, func(b []byte) { b[104] = 4 }), ErrPointFormat, "point data format ID", "format 4"},
		{"point_format_11", "pf11.las", patch(good, func(b []byte) { b[104] = 11 }), ErrPointFormat, "point data format ID", "11"},
		{"laz_bit_7", "z.las", patch(good, func(b []byte) { b[104] |= 0x80 }), ErrLAZ, "point data format ID", "pdal translate"},
		{"laz_bit_6", "z6.las", patch(good, func(b []byte) { b[104] |= 0x40 }), ErrLAZ, "point data format ID", "laszip -i"},
		{"laz_name", "scan.LAZ", good, ErrLAZ, "file name", ".laz"},
		{"laszip_vlr", "vlr.las", lz, ErrLAZ, "variable-length records", "laszip VLR"},
		{"record_length_too_small", "rl.las", patch(good, func(b []byte) { le.PutUint16(b[105:], 20) }), ErrHeader, "point data record length", "20 bytes is smaller than the 28 bytes point format 1 needs"},
		{"offset_beyond_file", "off.las", patch(good, func(b []byte) { le.PutUint32(b[96:], 1<<20) }), ErrHeader, "offset to point data", "beyond the end of the file"},
		{"offset_inside_header", "offh.las", patch(good, func(b []byte) { le.PutUint32(b[96:], 100) }), ErrHeader, "offset to point data", "inside the 227-byte header"},
		{"truncated_points", "cut.las", good[:len(good)-5], ErrTruncated, "point data records", "says 10 point records of 28 bytes, the file holds 9"},
		{"count_too_large", "count.las", patch(good, func(b []byte) { le.PutUint32(b[107:], 1<<31) }), ErrTruncated, "point data records", "2147483648"},
		{"count64_too_large", "count64.las", patch(good14, func(b []byte) { le.PutUint64(b[247:], math.MaxUint64) }), ErrTruncated, "point data records", "18446744073709551615"},
		{"zero_scale", "scale.las", patch(good, func(b []byte) { le.PutUint64(b[139:], 0) }), ErrHeader, "y scale factor", "non-zero"},
		{"nan_offset", "nan.las", patch(good, func(b []byte) { le.PutUint64(b[171:], math.Float64bits(math.NaN())) }), ErrHeader, "z offset", "NaN"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, _, _, err := decodeBytes(tc.data, tc.file, Options{})
			if !errors.Is(err, tc.want) {
				t.Fatalf("Decode(%s) = %v, want %v", tc.name, err, tc.want)
			}
			var fe *FileError
			if !errors.As(err, &fe) || fe.File != tc.file || fe.Field != tc.field {
				t.Fatalf("Decode(%s) = %#v, want a *FileError for file %q field %q", tc.name, err, tc.file, tc.field)
			}
			if msg := err.Error(); !strings.Contains(msg, tc.msgSubstr) || !strings.HasPrefix(msg, "las: "+tc.file+": ") {
				t.Errorf("Decode(%s) message %q, want it to start with the file and contain %q", tc.name, msg, tc.msgSubstr)
			}
			if _, err := DecodeHeader(bytes.NewReader(tc.data), int64(len(tc.data)), tc.file); err == nil &&
				tc.field != "point data records" {
				t.Errorf("DecodeHeader(%s) = nil error, want %v", tc.name, tc.want)
			}
		})
	}
}

// TestDecode_GeoKeys covers the CRS rules: GeoKeys (GeoTIFF 1.0 §6.3 key
// and unit codes), the WKT record, their conflicts and LAS 1.4 extended
// VLRs.
func TestDecode_GeoKeys(t *testing.T) {
	wktUTM := `PROJCS["WGS 84 / UTM zone 10N",GEOGCS["WGS 84",DATUM["WGS_1984",SPHEROID["WGS 84",6378137,298.257223563]],` +
		`PRIMEM["Greenwich",0],UNIT["degree",0.0174532925199433]],PROJECTION["Transverse_Mercator"],` +
		`PARAMETER["central_meridian",-123],PARAMETER["scale_factor",0.9996],PARAMETER["false_easting",500000],` +
		`UNIT["metre",1,AUTHORITY["EPSG","9001"]],AUTHORITY["EPSG","32610"]]`
	tests := []struct {
		name      string
		sf        synthFile
		epsg      int
		vEPSG     int
		unitM     float64
		vUnitM    float64
		warn      string
		wantWKT   bool
		wantNoCRS bool
	}{
		{name: "utm_metre", sf: synthFile{Minor: 2, GeoKeys: [][4]uint16{{1024, 0, 1, 1}, {3072, 0, 1, 32610}, {3076, 0, 1, 9001}}},
			epsg: 32610, unitM: 1},
		{name: "epsg_unit_implied", sf: synthFile{Minor: 2, GeoKeys: [][4]uint16{{3072, 0, 1, 2903}}},
			epsg: 2903, unitM: units.USSurveyFoot},
		{name: "metric_code_foot_key", sf: synthFile{Minor: 2, GeoKeys: [][4]uint16{{3072, 0, 1, 26995}, {3076, 0, 1, 9003}, {4099, 0, 1, 9003}}},
			epsg: 26995, unitM: units.USSurveyFoot, vUnitM: units.USSurveyFoot, warn: "unit key is trusted"},
		{name: "user_defined_foot", sf: synthFile{Minor: 2, GeoKeys: [][4]uint16{{3072, 0, 1, 32767}, {3076, 0, 1, 9002}}},
			epsg: 0, unitM: units.Foot, wantNoCRS: true},
		{name: "vertical", sf: synthFile{Minor: 2, GeoKeys: [][4]uint16{{3072, 0, 1, 2903}, {3076, 0, 1, 9003}, {4096, 0, 1, 5703}, {4099, 0, 1, 9001}}},
			epsg: 2903, vEPSG: 5703, unitM: units.USSurveyFoot, vUnitM: 1},
		{name: "geographic", sf: synthFile{Minor: 2, GeoKeys: [][4]uint16{{1024, 0, 1, 2}, {2048, 0, 1, 4326}}},
			epsg: 4326, unitM: 0},
		{name: "unknown_unit_code", sf: synthFile{Minor: 2, GeoKeys: [][4]uint16{{3072, 0, 1, 32767}, {3076, 0, 1, 9005}}},
			epsg: 0, unitM: 0, warn: "ProjLinearUnitsGeoKey 9005", wantNoCRS: true},
		{name: "key_stored_elsewhere_ignored", sf: synthFile{Minor: 2, GeoKeys: [][4]uint16{{3072, 34736, 1, 0}}},
			epsg: 0, wantNoCRS: true},
		{name: "wkt_vlr", sf: synthFile{Minor: 4, Format: 6, WKT: wktUTM}, epsg: 32610, unitM: 1, wantWKT: true},
		{name: "wkt_evlr", sf: synthFile{Minor: 4, Format: 7, WKT: wktUTM, WKTInEVLR: true}, epsg: 32610, unitM: 1, wantWKT: true},
		{name: "wkt_unit_clash", sf: synthFile{Minor: 2, GeoKeys: [][4]uint16{{3072, 0, 1, 32767}, {3076, 0, 1, 9002}}, WKT: wktUTM},
			epsg: 32610, unitM: units.Foot, warn: "WKT's linear unit", wantWKT: true},
		{name: "no_crs", sf: synthFile{Minor: 3}, wantNoCRS: true},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			tc.sf.Points = samplePoints(4, false)
			h, _, st, err := decodeBytes(tc.sf.bytes(t), "crs.las", Options{AllClasses: true})
			if err != nil {
				t.Fatal(err)
			}
			if h.EPSG != tc.epsg || h.VerticalEPSG != tc.vEPSG || h.HorizontalUnitM != tc.unitM || h.VerticalUnitM != tc.vUnitM {
				t.Errorf("EPSG %d vertical %d units %v/%v, want %d, %d, %v/%v", h.EPSG, h.VerticalEPSG, h.HorizontalUnitM, h.VerticalUnitM, tc.epsg, tc.vEPSG, tc.unitM, tc.vUnitM)
			}
			w := strings.Join(h.Warnings, "; ")
			if (tc.warn == "") != (w == "") || !strings.Contains(w, tc.warn) {
				t.Errorf("warnings %q, want %q", w, tc.warn)
			}
			if !slices.Equal(st.Warnings, h.Warnings) {
				t.Errorf("Stats.Warnings %q do not start with the header's %q", st.Warnings, h.Warnings)
			}
			if (h.WKT != "") != tc.wantWKT || h.HasCRS() == tc.wantNoCRS {
				t.Errorf("WKT %q HasCRS %v, want WKT %v, no CRS %v", h.WKT, h.HasCRS(), tc.wantWKT, tc.wantNoCRS)
			}
		})
	}
}

// TestDecode_Count14 checks the LAS 1.4 rule: the 64-bit point count wins,
// with a warning when the legacy count disagrees.
func TestDecode_Count14(t *testing.T) {
	b := synthFile{Minor: 4, Format: 1, Points: samplePoints(6, false)}.bytes(t)
	binary.LittleEndian.PutUint32(b[107:], 5)
	h, pts, _, err := decodeBytes(b, "count.las", Options{AllClasses: true})
	if err != nil {
		t.Fatal(err)
	}
	if h.Count != 6 || len(pts) != 5 || len(h.Warnings) != 1 || !strings.Contains(h.Warnings[0], "legacy point count 5") {
		t.Errorf("count %d points %d warnings %q, want 6, 5 (one withheld), one legacy-count warning", h.Count, len(pts), h.Warnings)
	}
	if len(h.ReturnCounts) != 15 {
		t.Errorf("LAS 1.4 has %d return counts, want 15", len(h.ReturnCounts))
	}
}

func TestDecode_Degenerate(t *testing.T) {
	// No points at all.
	h, pts, st, err := decodeBytes(synthFile{Minor: 2, Format: 0}.bytes(t), "empty.las", Options{})
	if err != nil || h.Count != 0 || len(pts) != 0 || st.Read != 0 || st.UsedGroundOnly {
		t.Errorf("empty file: count %d points %d read %d ground-only %v err %v", h.Count, len(pts), st.Read, st.UsedGroundOnly, err)
	}
	// One point, thinned.
	one := synthFile{Minor: 2, Format: 0, Points: []synthPoint{{X: 5, Y: 5, Z: 5, Class: 2, Ret: 1, NRet: 1}}}.bytes(t)
	if _, pts, _, err := decodeBytes(one, "one.las", Options{ThinCell: 1, Thin: ThinMean}); err != nil || len(pts) != 1 || pts[0] != (geom.Vec3{X: 0.05, Y: 0.05, Z: 0.05}) {
		t.Errorf("one point thinned: %v, %v", pts, err)
	}
	// Points outside the header bounds are a warning.
	b := synthFile{Minor: 2, Format: 0, Points: samplePoints(4, false)}.bytes(t)
	binary.LittleEndian.PutUint64(b[179:], math.Float64bits(0)) // max x = 0
	if _, _, st, err := decodeBytes(b, "bounds.las", Options{AllClasses: true}); err != nil || st.OutsideBounds != 4 {
		t.Errorf("outside bounds: %d, %v, want 4", st.OutsideBounds, err)
	}
}

// TestRead_Streaming checks that memory holds the points kept, not the
// file: reading autzen_trim.las (3.7 MB) while keeping no point allocates
// less than a third of the file in total.
func TestRead_Streaming(t *testing.T) {
	path := sharedLAS(t, "autzen_trim.las")
	var before, after runtime.MemStats
	runtime.GC()
	runtime.ReadMemStats(&before)
	_, pts, st, err := Read(path, Options{Classes: []uint8{7}})
	runtime.ReadMemStats(&after)
	if err != nil {
		t.Fatal(err)
	}
	if len(pts) != 0 || st.Read != 110000 {
		t.Fatalf("kept %d of %d, want 0 of 110000", len(pts), st.Read)
	}
	if got := after.TotalAlloc - before.TotalAlloc; got > 3742038/3 {
		t.Errorf("reading allocated %d bytes, want < %d (a third of the file)", got, 3742038/3)
	}
}

// FuzzReadLAS decodes arbitrary bytes: it must never panic, and on success
// the statistics must be consistent and every point finite.
func FuzzReadLAS(f *testing.F) {
	seeds := [][]byte{
		synthFile{Minor: 2, Format: 0, Points: samplePoints(5, false)}.bytes(f),
		synthFile{Minor: 2, Format: 1, Points: samplePoints(5, false), GeoKeys: [][4]uint16{{3072, 0, 1, 26995}, {3076, 0, 1, 9003}}}.bytes(f),
		synthFile{Minor: 3, Format: 3, Points: samplePoints(5, false), ExtraBytes: 2}.bytes(f),
		synthFile{Minor: 4, Format: 6, Points: samplePoints(5, true), WKT: `PROJCS["x",UNIT["foot",0.3048],AUTHORITY["EPSG","2994"]]`, WKTInEVLR: true}.bytes(f),
	}
	for _, s := range seeds {
		f.Add(s, uint8(0))
		f.Add(s[:len(s)-7], uint8(1))
		f.Add(s[:240], uint8(2))
	}
	f.Fuzz(func(t *testing.T, b []byte, mode uint8) {
		opt := Options{}
		switch mode % 4 {
		case 1:
			opt.AllClasses = true
		case 2:
			opt = Options{ThinCell: 0.5, Thin: ThinLowest}
		case 3:
			opt = Options{ThinCell: 2, Thin: ThinMean, Classes: []uint8{1, 2}}
		}
		h, pts, st, err := decodeBytes(b, "fuzz.las", opt)
		if err != nil {
			var fe *FileError
			if !errors.As(err, &fe) && !errors.Is(err, ErrOptions) {
				t.Fatalf("error %v is neither a *FileError nor ErrOptions", err)
			}
			return
		}
		var n uint64
		for _, c := range st.ClassCounts {
			n += c
		}
		if st.Read != h.Count || n != st.Read || st.Kept != uint64(len(pts)) || st.Kept > st.Read {
			t.Fatalf("count %d read %d classes %d kept %d points %d", h.Count, st.Read, n, st.Kept, len(pts))
		}
		for _, p := range pts {
			if !p.IsFinite() {
				t.Fatalf("non-finite point %v", p)
			}
		}
	})
}
