package las

import (
	"encoding/binary"
	"fmt"
	"io"
	"math"
	"os"
	"slices"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// ThinMode says which point represents a thinning cell. Its zero value is
// [ThinNone].
type ThinMode int

// The thinning modes.
const (
	// ThinNone keeps every selected point.
	ThinNone ThinMode = iota
	// ThinLowest keeps the lowest point of each cell (the first one read
	// when several share the lowest z): the usual choice for bare ground
	// under low vegetation.
	ThinLowest
	// ThinMean keeps one point per cell at the mean x, y and z of the cell's
	// points.
	ThinMean
)

// String returns "none", "lowest" or "mean".
func (m ThinMode) String() string {
	switch m {
	case ThinLowest:
		return "lowest"
	case ThinMean:
		return "mean"
	case ThinNone:
		return "none"
	}
	return fmt.Sprintf("ThinMode(%d)", int(m))
}

// ClassGround is the ASPRS classification code for ground (ASPRS standard
// point classes, LAS 1.2–1.4).
const ClassGround = 2

// Options selects and thins the points that [Read] keeps. The zero value
// keeps the ground points when the file has any, else all points, without
// thinning.
type Options struct {
	// Classes keeps only points of these ASPRS classes. When empty, the
	// ground class (2) is kept if the file has any ground point, else every
	// class; Stats says which.
	Classes []uint8
	// AllClasses keeps every point regardless of class (Classes is then
	// ignored).
	AllClasses bool
	// ThinCell is the thinning cell size in the file's horizontal units; 0
	// means no thinning. Cells are half-open squares on a grid anchored at
	// the header's minimum x and y (at the offset when those are not
	// finite): cell (i, j) holds minX + i·c ≤ x < minX + (i+1)·c, and
	// likewise in y.
	ThinCell float64
	// Thin picks the point kept per cell. It must be set exactly when
	// ThinCell > 0.
	Thin ThinMode
}

// maxThinCellsPerAxis bounds ThinCell from below: a grid finer than 2³¹
// cells across the file's extent would overflow the cell keys' useful range
// and is certainly a unit mistake (a 0.001 ft cell over 2000 km).
const maxThinCellsPerAxis = 1 << 31

// Stats reports what [Read] did.
type Stats struct {
	// Read is the number of point records read.
	Read uint64
	// Kept is the number of points returned (after thinning, the number of
	// occupied cells).
	Kept uint64
	// ClassCounts counts the points read by ASPRS class.
	ClassCounts map[uint8]uint64
	// ReturnCounts[i] counts the points read with return number i+1 (5
	// entries for formats 0–3, 15 for 6–8).
	ReturnCounts []uint64
	// Withheld counts points flagged "withheld" (to be treated as deleted,
	// LAS 1.4 R15, classification flags); they are counted by class but never kept.
	Withheld uint64
	// OutsideBounds counts points outside the header's bounds.
	OutsideBounds uint64
	// UsedGroundOnly reports whether the ground class was chosen
	// automatically because the file has ground points.
	UsedGroundOnly bool
	// Classes lists the classes kept in ascending order, nil when all were.
	Classes []uint8
	// Warnings are the header's warnings followed by those found reading
	// the points.
	Warnings []string
}

// HasGround reports whether any point read is classified as ground.
func (s Stats) HasGround() bool { return s.ClassCounts[ClassGround] > 0 }

// ReadHeader reads the header and CRS records of the LAS file at path
// without reading its points.
func ReadHeader(path string) (Header, error) {
	f, size, err := open(path)
	if err != nil {
		return Header{}, err
	}
	defer f.Close()
	return decodeHeader(f, size, path)
}

// Read reads the LAS file at path and returns its header, the selected
// points (coordinates as stored: world coordinates in file units, after
// scale and offset) and statistics. The points are in file order, or with
// thinning in the order in which their cells were first reached. See
// [Options] for the selection.
func Read(path string, opt Options) (Header, []geom.Vec3, Stats, error) {
	f, size, err := open(path)
	if err != nil {
		return Header{}, nil, Stats{}, err
	}
	defer f.Close()
	return Decode(f, size, path, opt)
}

func open(path string) (*os.File, int64, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, 0, fmt.Errorf("las: %w", err)
	}
	fi, err := f.Stat()
	if err != nil {
		f.Close()
		return nil, 0, fmt.Errorf("las: %w", err)
	}
	return f, fi.Size(), nil
}

// DecodeHeader is [ReadHeader] on size bytes of r; name is used in errors
// and to recognise a .laz file.
func DecodeHeader(r io.ReaderAt, size int64, name string) (Header, error) {
	return decodeHeader(r, size, name)
}

// Decode is [Read] on size bytes of r; name is used in errors and to
// recognise a .laz file.
func Decode(r io.ReaderAt, size int64, name string, opt Options) (Header, []geom.Vec3, Stats, error) {
	if err := opt.check(); err != nil {
		return Header{}, nil, Stats{}, err
	}
	h, err := decodeHeader(r, size, name)
	if err != nil {
		return h, nil, Stats{}, err
	}
	st := Stats{Warnings: slices.Clone(h.Warnings)}
	if opt.ThinCell > 0 {
		for i := range 2 {
			if n := (h.Max[i] - h.Min[i]) / opt.ThinCell; n > maxThinCellsPerAxis {
				return h, nil, st, fmt.Errorf("%w: thin cell %g (file units) gives %.3g cells across the %s extent %g–%g (limit %d)",
					ErrOptions, opt.ThinCell, n, axisName[i], h.Min[i], h.Max[i], maxThinCellsPerAxis)
			}
		}
	}
	sc, err := newScanner(r, size, name, h)
	if err != nil {
		return h, nil, st, err
	}

	var keep [256]bool
	var firstPass [256]uint64 // points that would be kept, by class, when a first pass runs
	sizeHint := uint64(0)
	switch {
	case opt.AllClasses:
		for i := range keep {
			keep[i] = true
		}
		sizeHint = h.Count
	case len(opt.Classes) > 0:
		for _, c := range opt.Classes {
			keep[c] = true
		}
	default:
		// Ground if present: a first pass counts classes only.
		err := sc.scan(func(p rawPoint) {
			if !p.withheld {
				firstPass[p.class]++
			}
		})
		if err != nil {
			return h, nil, st, err
		}
		if firstPass[ClassGround] > 0 {
			keep[ClassGround] = true
			st.UsedGroundOnly = true
		} else {
			for i := range keep {
				keep[i] = true
			}
			st.Warnings = append(st.Warnings, "no ground (class 2) points; all classes kept")
		}
	}
	if !opt.AllClasses && !allTrue(&keep) {
		for c := range keep {
			if keep[c] {
				st.Classes = append(st.Classes, uint8(c))
			}
		}
	}

	st.ClassCounts = map[uint8]uint64{}
	// Formats 0–5 hold return numbers up to 7, formats 6–10 up to 15;
	// the header has 5 counts, or 15 in LAS 1.4.
	st.ReturnCounts = make([]uint64, len(h.ReturnCounts))
	if h.PointFormat >= 6 && len(st.ReturnCounts) < 15 {
		st.ReturnCounts = make([]uint64, 15)
	}
	var classCounts [256]uint64
	var returnZero, returnPastCount uint64
	th := newThinner(h, opt)
	if sizeHint == 0 {
		for c, n := range firstPass {
			if keep[c] {
				sizeHint += n
			}
		}
	}
	// The size is known exactly (or as the point count when keeping every
	// class) before keeping; thinning keeps fewer, so it grows as it goes.
	var pts []geom.Vec3
	if th == nil {
		pts = make([]geom.Vec3, 0, sizeHint)
	}
	err = sc.scan(func(p rawPoint) {
		st.Read++
		classCounts[p.class]++
		if p.ret == 0 {
			returnZero++
		} else if int(p.ret) <= len(st.ReturnCounts) {
			st.ReturnCounts[p.ret-1]++
		}
		if p.ret > p.nret {
			returnPastCount++
		}
		v := h.world(p)
		if h.outside(v) {
			st.OutsideBounds++
		}
		if p.withheld {
			st.Withheld++
			return
		}
		if !keep[p.class] {
			return
		}
		if th != nil {
			th.add(p, v)
			return
		}
		pts = append(pts, v)
	})
	if err != nil {
		return h, nil, st, err
	}
	if th != nil {
		pts = th.points(h)
	}
	st.Kept = uint64(len(pts))
	for c, n := range classCounts {
		if n > 0 {
			st.ClassCounts[uint8(c)] = n
		}
	}
	if returnZero > 0 {
		st.Warnings = append(st.Warnings, fmt.Sprintf("%d points have return number 0", returnZero))
	}
	if returnPastCount > 0 {
		st.Warnings = append(st.Warnings, fmt.Sprintf("%d points have a return number above their number of returns", returnPastCount))
	}
	if st.OutsideBounds > 0 {
		st.Warnings = append(st.Warnings, fmt.Sprintf("%d points lie outside the header bounds", st.OutsideBounds))
	}
	if !countsAgree(st.ReturnCounts, h.ReturnCounts) && slices.ContainsFunc(h.ReturnCounts, func(n uint64) bool { return n != 0 }) {
		st.Warnings = append(st.Warnings, fmt.Sprintf("header counts by return %v differ from the points %v", h.ReturnCounts, st.ReturnCounts))
	}
	return h, pts, st, nil
}

// outside reports whether v lies outside the header bounds by more than
// half a scale step on some axis. Writers store bounds as the scaled
// integers rounded to decimal, so a point on the boundary may compute a
// unit in the last place beyond it; half a step is the most that rounding
// of a bound can move it while still naming the same stored integer.
func (h *Header) outside(v geom.Vec3) bool {
	c := [3]float64{v.X, v.Y, v.Z}
	for i := range 3 {
		slack := math.Abs(h.Scale[i]) / 2
		if c[i] < h.Min[i]-slack || c[i] > h.Max[i]+slack {
			return true
		}
	}
	return false
}

// countsAgree reports whether two per-return tallies are equal, entries
// missing from the shorter one counting as zero.
func countsAgree(a, b []uint64) bool {
	for i := range max(len(a), len(b)) {
		var x, y uint64
		if i < len(a) {
			x = a[i]
		}
		if i < len(b) {
			y = b[i]
		}
		if x != y {
			return false
		}
	}
	return true
}

func allTrue(k *[256]bool) bool {
	for _, v := range k {
		if !v {
			return false
		}
	}
	return true
}

func (o Options) check() error {
	switch {
	case math.IsNaN(o.ThinCell) || math.IsInf(o.ThinCell, 0) || o.ThinCell < 0:
		return fmt.Errorf("%w: thin cell must be a finite size ≥ 0 in file units, got %v", ErrOptions, o.ThinCell)
	case o.Thin < ThinNone || o.Thin > ThinMean:
		return fmt.Errorf("%w: unknown thin mode %d", ErrOptions, int(o.Thin))
	case o.ThinCell > 0 && o.Thin == ThinNone:
		return fmt.Errorf("%w: thin cell %g given without a thin mode (lowest or mean)", ErrOptions, o.ThinCell)
	case o.ThinCell == 0 && o.Thin != ThinNone:
		return fmt.Errorf("%w: thin mode %v given without a thin cell size", ErrOptions, o.Thin)
	}
	return nil
}

// rawPoint is the part of a point record this reader uses, coordinates
// still as the stored integers.
type rawPoint struct {
	x, y, z   int32
	ret, nret uint8
	class     uint8
	withheld  bool
}

// world applies the header's scale and offset.
func (h *Header) world(p rawPoint) geom.Vec3 {
	return geom.Vec3{
		X: float64(p.x)*h.Scale[0] + h.Offset[0],
		Y: float64(p.y)*h.Scale[1] + h.Offset[1],
		Z: float64(p.z)*h.Scale[2] + h.Offset[2],
	}
}

// chunkBytes is the size of the buffer point records are read into: large
// enough that per-read overhead is negligible, small enough to stay in the
// CPU's cache.
const chunkBytes = 256 << 10

// scanner streams the point records of one file.
type scanner struct {
	r      io.ReaderAt
	name   string
	off    int64
	count  uint64
	reclen int
	legacy bool // formats 0–5: 3-bit returns and a 5-bit class
	buf    []byte
}

func newScanner(r io.ReaderAt, size int64, name string, h Header) (*scanner, error) {
	reclen := int64(h.RecordLength)
	avail := (size - int64(h.PointDataOffset)) / reclen
	if h.Count > uint64(avail) {
		return nil, &FileError{File: name, Field: "point data records", Err: fmt.Errorf(
			"%w: the header says %d point records of %d bytes, the file holds %d complete records after offset %d",
			ErrTruncated, h.Count, reclen, avail, h.PointDataOffset)}
	}
	perChunk := max(1, chunkBytes/int(reclen))
	if uint64(perChunk) > h.Count {
		perChunk = int(h.Count)
	}
	return &scanner{
		r: r, name: name, off: int64(h.PointDataOffset), count: h.Count, reclen: int(reclen),
		legacy: h.PointFormat < 6, buf: make([]byte, perChunk*int(reclen)),
	}, nil
}

// scan calls fn for every point record in file order.
func (s *scanner) scan(fn func(rawPoint)) error {
	le := binary.LittleEndian
	off := s.off
	for left := s.count; left > 0; {
		n := uint64(len(s.buf) / s.reclen)
		n = min(n, left)
		b := s.buf[:n*uint64(s.reclen)]
		if m, err := s.r.ReadAt(b, off); m < len(b) {
			if err == nil {
				err = io.ErrUnexpectedEOF
			}
			return &FileError{File: s.name, Field: "point data records", Err: fmt.Errorf(
				"%w: read %d bytes at %d: %w", ErrTruncated, len(b), off, err)}
		}
		for i := 0; i < len(b); i += s.reclen {
			rec := b[i : i+s.reclen]
			p := rawPoint{
				x: int32(le.Uint32(rec[0:])),
				y: int32(le.Uint32(rec[4:])),
				z: int32(le.Uint32(rec[8:])),
			}
			if s.legacy {
				// Byte 14: return number bits 0–2, number of returns 3–5;
				// byte 15: class bits 0–4, withheld bit 7 (LAS 1.2, point data record format 0).
				p.ret = rec[14] & 0x07
				p.nret = rec[14] >> 3 & 0x07
				p.class = rec[15] & 0x1F
				p.withheld = rec[15]&0x80 != 0
			} else {
				// Byte 14: return number bits 0–3, number of returns 4–7;
				// byte 15: withheld is flag bit 2; byte 16: class (LAS 1.4
				// R15, point data record format 6).
				p.ret = rec[14] & 0x0F
				p.nret = rec[14] >> 4
				p.withheld = rec[15]&0x04 != 0
				p.class = rec[16]
			}
			fn(p)
		}
		off += int64(len(b))
		left -= n
	}
	return nil
}
