package las

import (
	"bytes"
	"encoding/binary"
	"fmt"
	"io"
	"math"
	"strings"
	"time"

	"github.com/dugout-estimating/dugout/internal/crs"
	"github.com/dugout-estimating/dugout/internal/units"
)

// Header is the public header block of a LAS file together with the
// coordinate system its variable-length records declare.
type Header struct {
	Major, Minor   uint8  // LAS version, e.g. 1 and 2
	FileSourceID   uint16 // flight line or tile number, 0 when unused
	GlobalEncoding uint16 // bit field; bit 4 (1.4) says the CRS is given as WKT
	SystemID       string // "system identifier", trailing NULs and spaces removed
	Software       string // "generating software"
	CreationDay    uint16 // day of year, 1–366; 0 when not given
	CreationYear   uint16 // four-digit year; 0 when not given
	// Created is the creation date from day and year, or the zero time when
	// either is zero.
	Created         time.Time
	HeaderSize      uint16 // bytes in the public header block
	PointDataOffset uint32 // offset of the first point record from the file start
	NumVLRs         uint32 // number of variable-length records
	NumEVLRs        uint32 // number of extended variable-length records (1.4)
	PointFormat     uint8  // point data record format, 0–10
	RecordLength    uint16 // bytes per point record, extra bytes included
	// ExtraBytes is RecordLength minus the size of the point format's
	// standard fields: the per-point extra bytes, skipped when reading.
	ExtraBytes int
	// Count is the number of point records: the 64-bit count of LAS 1.4 when
	// set, else the legacy 32-bit count.
	Count uint64
	// ReturnCounts[i] is the number of points with return number i+1, as
	// the header states it: 5 entries, or 15 in LAS 1.4.
	ReturnCounts []uint64
	Scale        [3]float64 // x, y, z scale factors
	Offset       [3]float64 // x, y, z offsets
	Min, Max     [3]float64 // bounds the header states (file units)

	// EPSG is the horizontal coordinate system's EPSG code: the GeoKey
	// ProjectedCSTypeGeoKey (3072), else GeographicTypeGeoKey (2048) for a
	// geographic model, else the top-level authority of the WKT record; 0
	// when unknown or user-defined (32767).
	EPSG int
	// VerticalEPSG is the VerticalCSTypeGeoKey (4096), 0 when absent.
	VerticalEPSG int
	// HorizontalUnitM is the length of the x, y unit in metres: from
	// ProjLinearUnitsGeoKey (3076: 9001 metre, 9002 foot, 9003 US survey
	// foot), else the WKT's linear unit, else the known unit of EPSG; 0 when
	// unknown or when the system is geographic (degrees).
	HorizontalUnitM float64
	// VerticalUnitM is the length of the z unit in metres from
	// VerticalUnitsGeoKey (4099), else the WKT's vertical unit; 0 when
	// unknown.
	VerticalUnitM float64
	// WKT is the OGC WKT coordinate system record (LASF_Projection 2112) as
	// text, "" when absent.
	WKT string
	// GeoASCII is the GeoAsciiParamsTag record (34737), "" when absent.
	GeoASCII string
	// Warnings are non-fatal problems found in the header and its records,
	// such as a unit key that contradicts the EPSG code.
	Warnings []string
}

// HasCRS reports whether the file declares a horizontal coordinate system
// (an EPSG code or WKT text).
func (h Header) HasCRS() bool { return h.EPSG != 0 || h.WKT != "" }

// Sizes of the fixed parts (LAS 1.2 §2.2, 1.3 §2.2, 1.4 §2.4 tables).
const (
	minHeader12 = 227 // LAS 1.2 public header block
	minHeader13 = 235 // 1.3 adds the start of the waveform data packet record
	minHeader14 = 375 // 1.4 adds EVLRs, 64-bit counts and 15 return counts
	vlrHeader   = 54  // variable-length record header
	evlrHeader  = 60  // extended variable-length record header
)

// maxCRSRecordBytes limits the size of an extended VLR read for its CRS
// text: 1 MiB is far more than any WKT (typically under 5 kB).
const maxCRSRecordBytes = 1 << 20

// formatSize is the size of the standard fields of each supported point
// data record format (LAS 1.4 R15, point data record formats 0–3 and 6–8).
var formatSize = map[uint8]int{0: 20, 1: 28, 2: 26, 3: 34, 6: 30, 7: 36, 8: 38}

// GeoTIFF keys and codes read from the GeoKeyDirectory (GeoTIFF 1.0 spec
// §6.2; EPSG unit codes).
const (
	keyModelType     = 1024
	keyGeographic    = 2048
	keyProjected     = 3072
	keyProjLinear    = 3076
	keyVerticalCS    = 4096
	keyVerticalUnits = 4099

	modelGeographic = 2
	userDefined     = 32767
)

// unitCodes are the EPSG unit-of-measure codes a ProjLinearUnitsGeoKey or
// VerticalUnitsGeoKey may hold that this reader understands.
var unitCodes = map[uint16]struct {
	m    float64
	name string
}{
	9001: {units.Metre, "metre"},
	9002: {units.Foot, "foot"},
	9003: {units.USSurveyFoot, "US survey foot"},
}

// headerReader reads fields of a LAS file with bounds checks and names the
// file in every error.
type headerReader struct {
	r    io.ReaderAt
	size int64
	name string
}

func (hr headerReader) fail(field string, err error) error {
	return &FileError{File: hr.name, Field: field, Err: err}
}

// read returns n bytes at off, or a truncation error naming field.
func (hr headerReader) read(off int64, n int, field string) ([]byte, error) {
	if off < 0 || off+int64(n) > hr.size {
		return nil, hr.fail(field, fmt.Errorf("%w: needs bytes %d–%d, the file has %d", ErrTruncated, off, off+int64(n), hr.size))
	}
	b := make([]byte, n)
	// A ReaderAt may return io.EOF together with a full read at the end.
	if m, err := hr.r.ReadAt(b, off); m < n {
		if err == nil {
			err = io.ErrUnexpectedEOF // a ReaderAt must not do this, but be safe
		}
		return nil, hr.fail(field, fmt.Errorf("read %d bytes at %d: %w", n, off, err))
	}
	return b, nil
}

func cString(b []byte) string {
	if i := bytes.IndexByte(b, 0); i >= 0 {
		b = b[:i]
	}
	return strings.TrimRight(strings.ToValidUTF8(string(b), "?"), " ")
}

// decodeHeader reads and checks the public header block and the CRS
// records of a LAS file.
func decodeHeader(r io.ReaderAt, size int64, name string) (Header, error) {
	hr := headerReader{r: r, size: size, name: name}
	var h Header
	if strings.EqualFold(fileExt(name), ".laz") {
		return h, hr.fail("file name", fmt.Errorf("%w (the name ends in .laz)", ErrLAZ))
	}
	if size < 4 {
		return h, hr.fail("file signature", fmt.Errorf("%w: the file has only %d bytes", ErrNotLAS, size))
	}
	sig, err := hr.read(0, 4, "file signature")
	if err != nil {
		return h, err
	}
	if string(sig) != "LASF" {
		return h, hr.fail("file signature", fmt.Errorf("%w: signature %q", ErrNotLAS, sig))
	}
	if size < 26 {
		return h, hr.fail("version", fmt.Errorf("%w: the file has only %d bytes", ErrTruncated, size))
	}
	v, err := hr.read(24, 2, "version")
	if err != nil {
		return h, err
	}
	h.Major, h.Minor = v[0], v[1]
	if h.Major != 1 || h.Minor < 2 || h.Minor > 4 {
		return h, hr.fail("version", fmt.Errorf("%w %d.%d (want 1.2, 1.3 or 1.4)", ErrVersion, h.Major, h.Minor))
	}
	need := minHeader12
	switch h.Minor {
	case 3:
		need = minHeader13
	case 4:
		need = minHeader14
	}
	b, err := hr.read(0, minHeader12, "public header block")
	if err != nil {
		return h, err
	}
	le := binary.LittleEndian
	h.FileSourceID = le.Uint16(b[4:])
	h.GlobalEncoding = le.Uint16(b[6:])
	h.SystemID = cString(b[26:58])
	h.Software = cString(b[58:90])
	h.CreationDay = le.Uint16(b[90:])
	h.CreationYear = le.Uint16(b[92:])
	if h.CreationDay != 0 && h.CreationYear != 0 {
		h.Created = time.Date(int(h.CreationYear), 1, int(h.CreationDay), 0, 0, 0, 0, time.UTC)
	}
	h.HeaderSize = le.Uint16(b[94:])
	h.PointDataOffset = le.Uint32(b[96:])
	h.NumVLRs = le.Uint32(b[100:])
	pf := b[104]
	h.RecordLength = le.Uint16(b[105:])
	legacyCount := uint64(le.Uint32(b[107:]))
	h.ReturnCounts = make([]uint64, 5)
	for i := range 5 {
		h.ReturnCounts[i] = uint64(le.Uint32(b[111+4*i:]))
	}
	for i := range 3 {
		h.Scale[i] = math.Float64frombits(le.Uint64(b[131+8*i:]))
		h.Offset[i] = math.Float64frombits(le.Uint64(b[155+8*i:]))
		// Bounds are stored max x, min x, max y, min y, max z, min z.
		h.Max[i] = math.Float64frombits(le.Uint64(b[179+16*i:]))
		h.Min[i] = math.Float64frombits(le.Uint64(b[187+16*i:]))
	}
	if int(h.HeaderSize) < need {
		return h, hr.fail("header size", fmt.Errorf("%w: %d bytes is smaller than the %d a LAS %d.%d header needs",
			ErrHeader, h.HeaderSize, need, h.Major, h.Minor))
	}
	if int64(h.HeaderSize) > size {
		return h, hr.fail("header size", fmt.Errorf("%w: header of %d bytes, the file has %d", ErrTruncated, h.HeaderSize, size))
	}
	h.Count = legacyCount
	var evlrStart uint64
	if h.Minor >= 4 {
		x, err := hr.read(minHeader13, minHeader14-minHeader13, "LAS 1.4 header fields")
		if err != nil {
			return h, err
		}
		evlrStart = le.Uint64(x[0:])
		h.NumEVLRs = le.Uint32(x[8:])
		count64 := le.Uint64(x[12:])
		rc := make([]uint64, 15)
		set := false
		for i := range 15 {
			rc[i] = le.Uint64(x[20+8*i:])
			set = set || rc[i] != 0
		}
		if set || h.Count == 0 {
			h.ReturnCounts = rc
		}
		switch {
		case count64 != 0:
			if legacyCount != 0 && legacyCount != count64 {
				h.Warnings = append(h.Warnings, fmt.Sprintf("legacy point count %d differs from the 64-bit count %d; using %d",
					legacyCount, count64, count64))
			}
			h.Count = count64
		case legacyCount != 0:
			h.Warnings = append(h.Warnings, fmt.Sprintf("LAS 1.4 64-bit point count is 0; using the legacy count %d", legacyCount))
		}
	}

	// Point format: the top two bits mark LAZ compression.
	if pf&0xC0 != 0 {
		return h, hr.fail("point data format ID", fmt.Errorf("%w (format byte %#02x has the compression bits set)", ErrLAZ, pf))
	}
	h.PointFormat = pf
	base, ok := formatSize[pf]
	if !ok {
		return h, hr.fail("point data format ID", fmt.Errorf("%w %d (want 0, 1, 2, 3, 6, 7 or 8)", ErrPointFormat, pf))
	}
	if pf >= 6 && h.Minor < 4 {
		h.Warnings = append(h.Warnings, fmt.Sprintf("point format %d is defined only from LAS 1.4, the file says %d.%d", pf, h.Major, h.Minor))
	}
	if int(h.RecordLength) < base {
		return h, hr.fail("point data record length", fmt.Errorf("%w: %d bytes is smaller than the %d bytes point format %d needs",
			ErrHeader, h.RecordLength, base, pf))
	}
	h.ExtraBytes = int(h.RecordLength) - base
	for i := range 3 {
		if !isFinite(h.Scale[i]) || h.Scale[i] == 0 {
			return h, hr.fail(axisName[i]+" scale factor", fmt.Errorf("%w: %v (must be finite and non-zero)", ErrHeader, h.Scale[i]))
		}
		if !isFinite(h.Offset[i]) {
			return h, hr.fail(axisName[i]+" offset", fmt.Errorf("%w: %v is not finite", ErrHeader, h.Offset[i]))
		}
		if !isFinite(h.Min[i]) || !isFinite(h.Max[i]) {
			h.Warnings = append(h.Warnings, fmt.Sprintf("header %s bounds %v..%v are not finite", axisName[i], h.Min[i], h.Max[i]))
		}
	}
	if h.PointDataOffset < uint32(h.HeaderSize) {
		return h, hr.fail("offset to point data", fmt.Errorf("%w: %d lies inside the %d-byte header", ErrHeader, h.PointDataOffset, h.HeaderSize))
	}
	if int64(h.PointDataOffset) > size {
		return h, hr.fail("offset to point data", fmt.Errorf("%w: %d is beyond the end of the file (%d bytes)", ErrHeader, h.PointDataOffset, size))
	}

	recs, err := readVLRs(hr, &h)
	if err != nil {
		return h, err
	}
	if h.Minor >= 4 && h.NumEVLRs > 0 {
		end := uint64(h.PointDataOffset) + h.Count*uint64(h.RecordLength)
		if evlrStart < end || evlrStart >= uint64(size) || h.Count > uint64(size) {
			h.Warnings = append(h.Warnings, fmt.Sprintf("start of the first extended VLR (%d) is outside %d–%d; extended VLRs ignored",
				evlrStart, end, size))
		} else {
			erecs, err := readEVLRs(hr, &h, int64(evlrStart))
			if err != nil {
				return h, err
			}
			recs = append(recs, erecs...)
		}
	}
	if err := applyRecords(hr, &h, recs); err != nil {
		return h, err
	}
	return h, nil
}

var axisName = [3]string{"x", "y", "z"}

func isFinite(f float64) bool { return !math.IsNaN(f) && !math.IsInf(f, 0) }

func fileExt(name string) string {
	i := strings.LastIndexByte(name, '.')
	if i < 0 || strings.ContainsAny(name[i:], `/\`) {
		return ""
	}
	return name[i:]
}

// record is a VLR or EVLR whose payload was kept.
type record struct {
	user string
	id   uint16
	data []byte
}

// wanted reports whether a record's payload matters here: the CRS records
// and the laszip marker.
func wanted(user string, id uint16) bool {
	switch user {
	case "LASF_Projection":
		return id == 34735 || id == 34737 || id == 2112
	case "laszip encoded":
		return true
	}
	return false
}

// readVLRs reads the variable-length records between the header and the
// point data. A record that runs past the point data is a warning: the
// points can still be read, only the CRS records after it are lost.
func readVLRs(hr headerReader, h *Header) ([]record, error) {
	var recs []record
	pos := int64(h.HeaderSize)
	end := int64(h.PointDataOffset)
	for i := uint32(0); i < h.NumVLRs; i++ {
		if pos+vlrHeader > end {
			h.Warnings = append(h.Warnings, fmt.Sprintf("variable-length record %d of %d starts at %d and overruns the point data at %d; it and later records ignored",
				i+1, h.NumVLRs, pos, end))
			break
		}
		b, err := hr.read(pos, vlrHeader, fmt.Sprintf("variable-length record %d header", i+1))
		if err != nil {
			return nil, err
		}
		user := cString(b[2:18])
		id := binary.LittleEndian.Uint16(b[18:])
		n := int64(binary.LittleEndian.Uint16(b[20:]))
		pos += vlrHeader
		if pos+n > end {
			h.Warnings = append(h.Warnings, fmt.Sprintf("variable-length record %d (%s %d, %d bytes) overruns the point data at %d; it and later records ignored",
				i+1, user, id, n, end))
			break
		}
		if wanted(user, id) {
			data, err := hr.read(pos, int(n), fmt.Sprintf("variable-length record %d (%s %d)", i+1, user, id))
			if err != nil {
				return nil, err
			}
			recs = append(recs, record{user, id, data})
		}
		pos += n
	}
	return recs, nil
}

// readEVLRs reads the LAS 1.4 extended variable-length records after the
// point data, keeping only CRS records up to maxCRSRecordBytes.
func readEVLRs(hr headerReader, h *Header, pos int64) ([]record, error) {
	var recs []record
	for i := uint32(0); i < h.NumEVLRs; i++ {
		if pos+evlrHeader > hr.size {
			h.Warnings = append(h.Warnings, fmt.Sprintf("extended VLR %d of %d starts at %d, past the end of the file (%d bytes); ignored",
				i+1, h.NumEVLRs, pos, hr.size))
			break
		}
		b, err := hr.read(pos, evlrHeader, fmt.Sprintf("extended VLR %d header", i+1))
		if err != nil {
			return nil, err
		}
		user := cString(b[2:18])
		id := binary.LittleEndian.Uint16(b[18:])
		n := binary.LittleEndian.Uint64(b[20:])
		pos += evlrHeader
		if n > uint64(hr.size-pos) {
			h.Warnings = append(h.Warnings, fmt.Sprintf("extended VLR %d (%s %d, %d bytes) runs past the end of the file; ignored",
				i+1, user, id, n))
			break
		}
		if wanted(user, id) {
			if n > maxCRSRecordBytes {
				h.Warnings = append(h.Warnings, fmt.Sprintf("extended VLR %d (%s %d) has %d bytes, more than %d; ignored",
					i+1, user, id, n, maxCRSRecordBytes))
			} else {
				data, err := hr.read(pos, int(n), fmt.Sprintf("extended VLR %d (%s %d)", i+1, user, id))
				if err != nil {
					return nil, err
				}
				recs = append(recs, record{user, id, data})
			}
		}
		pos += int64(n)
	}
	return recs, nil
}

// applyRecords fills the CRS fields of h from the kept records and checks
// for the laszip marker.
func applyRecords(hr headerReader, h *Header, recs []record) error {
	var keys map[uint16]uint16
	for _, r := range recs {
		switch {
		case r.user == "laszip encoded":
			return hr.fail("variable-length records", fmt.Errorf("%w (the file has a laszip VLR, record %d)", ErrLAZ, r.id))
		case r.id == 34735 && keys == nil:
			k, err := geoKeys(r.data)
			if err != nil {
				h.Warnings = append(h.Warnings, "GeoKeyDirectory record ignored: "+err.Error())
				continue
			}
			keys = k
		case r.id == 34737 && h.GeoASCII == "":
			h.GeoASCII = cString(r.data)
		case r.id == 2112 && h.WKT == "":
			h.WKT = strings.TrimSpace(cString(r.data))
		}
	}

	var unitKeyM float64
	var unitKeyName string
	if keys != nil {
		if pcs := int(keys[keyProjected]); pcs != 0 && pcs != userDefined {
			h.EPSG = pcs
		} else if gcs := int(keys[keyGeographic]); keys[keyModelType] == modelGeographic && gcs != 0 && gcs != userDefined {
			h.EPSG = gcs
		}
		if v := int(keys[keyVerticalCS]); v != 0 && v != userDefined {
			h.VerticalEPSG = v
		}
		if c, ok := keys[keyProjLinear]; ok {
			if u, ok := unitCodes[c]; ok {
				unitKeyM, unitKeyName = u.m, u.name
			} else {
				h.Warnings = append(h.Warnings, fmt.Sprintf("ProjLinearUnitsGeoKey %d is not metre, foot or US survey foot; horizontal unit unknown", c))
			}
		}
		if c, ok := keys[keyVerticalUnits]; ok {
			if u, ok := unitCodes[c]; ok {
				h.VerticalUnitM = u.m
			} else {
				h.Warnings = append(h.Warnings, fmt.Sprintf("VerticalUnitsGeoKey %d is not metre, foot or US survey foot; vertical unit unknown", c))
			}
		}
	}
	var w wktInfo
	if h.WKT != "" {
		w = parseWKT(h.WKT)
		if h.EPSG == 0 {
			h.EPSG = w.epsg
		}
		if h.VerticalUnitM == 0 {
			h.VerticalUnitM = w.vertUnitM
		}
	}
	geographic := (keys != nil && keys[keyModelType] == modelGeographic && keys[keyProjected] == 0) || w.geographic
	if c, err := crs.FromEPSG(h.EPSG); err == nil && c.Kind == crs.Geographic {
		geographic = true
	}
	known, knownOK := crs.LinearUnitM(h.EPSG)
	switch {
	case geographic:
		h.HorizontalUnitM = 0
	case unitKeyM != 0:
		h.HorizontalUnitM = unitKeyM
		if knownOK && !sameUnit(known, unitKeyM) {
			h.Warnings = append(h.Warnings, fmt.Sprintf(
				"ProjectedCSTypeGeoKey says EPSG:%d, whose unit is the %s, but ProjLinearUnitsGeoKey says %s; the unit key is trusted",
				h.EPSG, unitName(known), unitKeyName))
		}
		if w.unitM != 0 && !sameUnit(w.unitM, unitKeyM) {
			h.Warnings = append(h.Warnings, fmt.Sprintf(
				"the WKT's linear unit (%g m) differs from ProjLinearUnitsGeoKey (%s); the unit key is trusted",
				w.unitM, unitKeyName))
		}
	case w.unitM != 0:
		h.HorizontalUnitM = w.unitM
	case knownOK:
		h.HorizontalUnitM = known
	}
	return nil
}

// sameUnit reports whether two unit lengths agree to 1e-9 relative, enough
// to tell the international foot from the US survey foot (2e-6 apart) while
// accepting a WKT factor printed with 10 or more digits.
func sameUnit(a, b float64) bool { return math.Abs(a-b) <= 1e-9*math.Max(a, b) }

func unitName(m float64) string {
	for _, u := range unitCodes {
		if sameUnit(u.m, m) {
			return u.name
		}
	}
	return fmt.Sprintf("%g m", m)
}

// geoKeys decodes the GeoKeyDirectoryTag record (GeoTIFF 1.0 §2.4): a
// header of four shorts (version, revision, minor revision, number of keys)
// then one (key, location, count, value) quadruple per key. Only keys whose
// value is stored inline (location 0) are returned.
func geoKeys(b []byte) (map[uint16]uint16, error) {
	if len(b) < 8 {
		return nil, fmt.Errorf("%d bytes, too short for its header", len(b))
	}
	le := binary.LittleEndian
	n := int(le.Uint16(b[6:]))
	if 8+8*n > len(b) {
		return nil, fmt.Errorf("declares %d keys but holds %d", n, (len(b)-8)/8)
	}
	keys := make(map[uint16]uint16, n)
	for i := range n {
		e := b[8+8*i:]
		if le.Uint16(e[2:]) == 0 {
			keys[le.Uint16(e[0:])] = le.Uint16(e[6:])
		}
	}
	return keys, nil
}
