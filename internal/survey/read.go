package survey

import (
	"bytes"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strings"

	"github.com/dugout-estimating/dugout/internal/crs"
	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/units"
)

// isZeroSpec reports whether s is the zero Spec, which Options documents as
// auto (crs.Parse("local") names its CRS, so it is not zero).
func isZeroSpec(s crs.Spec) bool { return !s.Auto && s.CRS == (crs.CRS{}) }

// isAuto reports whether a CRS spec asks for automatic choice: "auto", or
// the zero Spec.
func isAuto(s crs.Spec) bool { return s.Auto || isZeroSpec(s) }

func specString(s crs.Spec) string {
	if isAuto(s) {
		return "auto"
	}
	return s.String()
}

// sameCRS reports whether a and b are the same system: equal EPSG codes,
// or both the local grid, or equal names when neither has a code.
func sameCRS(a, b crs.CRS) bool {
	if a.EPSG != 0 || b.EPSG != 0 {
		return a.EPSG == b.EPSG
	}
	if a.Kind != b.Kind {
		return false
	}
	return a.Kind == crs.Local || a.Name == b.Name
}

// Read reads survey files and returns them as one set in a common local
// frame. The format of each file is detected by its content, checked
// against its extension: LAS by its "LASF" signature, GeoJSON by a leading
// "{", GPX by a leading "<" and a <gpx> root, and any other text as a
// delimited file (a level book when its header has bs and fs or is
// columns). See docs/input-formats.md.
//
// All files must be in one coordinate system (see [Options.CRS]); lon/lat
// input is projected. Points are kept in file order, files in the order
// given. Read fails on the first error, as a *[ParseError] where it can name
// a file and line; findings that do not stop the read are in Set.Warnings,
// and [Set.Summary] adds the validation of the whole set.
func Read(paths []string, opt Options) (*Set, error) {
	opt = opt.withDefaults()
	if len(paths) == 0 {
		return nil, fmt.Errorf("%w: no files given", ErrEmpty)
	}
	if !isAuto(opt.CRS) && opt.CRS.CRS.Kind == crs.Geographic {
		return nil, fmt.Errorf("%w: --crs %s is longitude/latitude, not a grid to work in: use --crs auto (lon/lat goes to its UTM zone) or a UTM zone's EPSG code", ErrCRS, opt.CRS)
	}
	prog := &progress{fn: opt.Progress}
	sizes := make([]int64, len(paths))
	if opt.Progress != nil {
		for i, p := range paths {
			if fi, err := os.Stat(p); err == nil {
				sizes[i] = fi.Size()
				prog.total += fi.Size()
			}
		}
	}
	files := make([]*rawFile, 0, len(paths))
	for i, p := range paths {
		prog.size = sizes[i]
		f, err := readFile(p, &opt, prog)
		if err != nil {
			return nil, err
		}
		prog.done()
		files = append(files, f)
	}
	return assemble(files, &opt)
}

// Extensions that name a format; any other extension (.txt, .xyz, .pts,
// none) leaves the choice to the content.
var (
	delimitedExts = []string{".csv", ".tsv", ".tab"}
	geojsonExts   = []string{".geojson", ".json"}
	gpxExts       = []string{".gpx"}
	lasExts       = []string{".las", ".laz"}
)

// readFile detects the format of one file and reads it.
func readFile(path string, opt *Options, prog *progress) (*rawFile, error) {
	ext := strings.ToLower(filepath.Ext(path))
	fh, err := os.Open(path)
	if err != nil {
		return nil, fmt.Errorf("read %s: %w", path, err)
	}
	defer fh.Close()
	fi, err := fh.Stat()
	if err != nil {
		return nil, fmt.Errorf("read %s: %w", path, err)
	}
	if fi.IsDir() {
		return nil, perr(path, 0, "", ErrFormat, "is a directory, not a survey file")
	}
	var magic [4]byte
	n, _ := io.ReadFull(fh, magic[:])
	if slices.Contains(lasExts, ext) || (n == 4 && string(magic[:]) == "LASF") {
		fh.Close()
		return readLAS(path, opt)
	}
	if fi.Size() > MaxTextBytes {
		return nil, perr(path, 0, "", ErrTooLarge, "%d bytes is more than the %d read from a text file", fi.Size(), MaxTextBytes)
	}
	if _, err := fh.Seek(0, io.SeekStart); err != nil {
		return nil, fmt.Errorf("read %s: %w", path, err)
	}
	data, err := io.ReadAll(io.LimitReader(fh, MaxTextBytes+1))
	if err != nil {
		return nil, fmt.Errorf("read %s: %w", path, err)
	}
	return readBytes(path, ext, data, opt, prog)
}

// readBytes reads the content of a text file (what readFile does after
// opening it; the fuzz targets call it directly).
func readBytes(path, ext string, data []byte, opt *Options, prog *progress) (*rawFile, error) {
	if len(data) > MaxTextBytes {
		return nil, perr(path, 0, "", ErrTooLarge, "more than %d bytes", MaxTextBytes)
	}
	body := bytes.TrimLeft(bytes.TrimPrefix(data, utf8BOM), " \t\r\n\f")
	if len(body) == 0 {
		return nil, perr(path, 0, "", ErrEmpty, "file is empty")
	}
	if looksBinary(data[:min(len(data), 8192)]) {
		return nil, perr(path, 0, "", ErrNotText, "the file holds binary data (a spreadsheet, archive or compressed file?): export it as CSV")
	}
	mismatch := func(content string) error {
		return perr(path, 0, "", ErrFormat, "the extension %s does not match the content, which looks like %s", ext, content)
	}
	switch body[0] {
	case '{':
		if slices.Contains(delimitedExts, ext) || slices.Contains(gpxExts, ext) {
			return nil, mismatch("JSON")
		}
		return readGeoJSON(path, data, opt)
	case '[':
		return nil, perr(path, 1, "", ErrFormat, "a JSON array is not GeoJSON (an RFC 7946 document is an object)")
	case '<':
		if slices.Contains(delimitedExts, ext) || slices.Contains(geojsonExts, ext) {
			return nil, mismatch("XML")
		}
		return readGPX(path, data, opt, prog)
	}
	if slices.Contains(geojsonExts, ext) || slices.Contains(gpxExts, ext) {
		return nil, mismatch("delimited text")
	}
	return readText(path, data, opt, prog)
}

// assemble resolves the coordinate system of the files, projects lon/lat,
// converts to metres, chooses the frame and builds the set.
func assemble(files []*rawFile, opt *Options) (*Set, error) {
	target, perFile, err := resolveCRS(files, opt)
	if err != nil {
		return nil, err
	}
	s := &Set{CRS: target, Units: opt.Units, tol: tolerances{dupM: opt.DupTolM, conflictM: opt.ConflictTolM}}
	// The set's unit system is the files' common one (a LAS header may
	// state feet while --units is left at metres).
	if sys, ok := commonUnits(files); ok {
		s.Units = sys
	}
	type worldFile struct {
		pts   []geom.Vec3
		lines [][]geom.Vec3
		polys []geom.Ring
	}
	worlds := make([]worldFile, len(files))
	box := geom.EmptyBox()
	for i, f := range files {
		f.info.CRS = perFile[i]
		f.info.UnitM = f.hUnitM
		if f.geographic {
			f.info.UnitM = 1
			s.Geographic = true
		}
		conv := func(x, y, z float64, line int) (geom.Vec3, error) {
			w := geom.Vec3{X: x * f.hUnitM, Y: y * f.hUnitM, Z: z * f.vUnitM}
			if f.geographic {
				e, n, err := target.UTM.Forward(x, y)
				if err != nil {
					return geom.Vec3{}, &ParseError{File: f.info.Path, Line: line, Err: fmt.Errorf("%w: %w", ErrCRS, err)}
				}
				w.X, w.Y = e, n
			}
			for _, v := range []float64{w.X, w.Y, w.Z} {
				if math.Abs(v) > MaxCoordM {
					return geom.Vec3{}, perr(f.info.Path, line, "", ErrRange, "coordinate %s m is beyond any survey (limit %g m): check the units", fmtNum(v), float64(MaxCoordM))
				}
			}
			return w, nil
		}
		w := &worlds[i]
		w.pts = make([]geom.Vec3, len(f.pts))
		for j, p := range f.pts {
			v, err := conv(p.x, p.y, p.z, p.line)
			if err != nil {
				return nil, err
			}
			w.pts[j] = v
			box = box.Extend(v.XY())
		}
		for _, l := range f.lines {
			wl := make([]geom.Vec3, len(l.pts))
			for j, q := range l.pts {
				v, err := conv(q[0], q[1], q[2], l.line)
				if err != nil {
					return nil, err
				}
				wl[j] = v
				box = box.Extend(v.XY())
			}
			w.lines = append(w.lines, wl)
		}
		for _, pg := range f.polys {
			r := make(geom.Ring, len(pg.ring))
			for j, q := range pg.ring {
				v, err := conv(q[0], q[1], 0, 0)
				if err != nil {
					return nil, err
				}
				r[j] = v.XY()
				box = box.Extend(r[j])
			}
			w.polys = append(w.polys, r)
		}
	}
	if box.IsEmpty() {
		return nil, fmt.Errorf("%w: the files hold no positions", ErrEmpty)
	}
	s.Frame = geom.FrameAt(box.Center())
	o := s.Frame.Origin
	local := func(v geom.Vec3) geom.Vec3 { return geom.Vec3{X: v.X - o.X, Y: v.Y - o.Y, Z: v.Z} }

	for i, f := range files {
		if err := checkIDs(f); err != nil {
			return nil, err
		}
		w := worlds[i]
		first := len(s.Points)
		for j, p := range f.pts {
			s.Points = append(s.Points, Point{ID: p.id, P: local(w.pts[j]), Code: p.code,
				HAccM: p.hacc, VAccM: p.vacc, File: f.info.Path, Line: p.line})
		}
		for j, l := range f.lines {
			pts := make([]geom.Vec3, len(w.lines[j]))
			for k, v := range w.lines[j] {
				pts[k] = local(v)
			}
			s.Breaklines = append(s.Breaklines, Line{Name: l.name, Code: l.code, Pts: pts, File: f.info.Path, Line: l.line})
		}
		for j, pg := range f.polys {
			r := make(geom.Ring, len(w.polys[j]))
			for k, v := range w.polys[j] {
				r[k] = v.Sub(o)
			}
			s.Boundaries = append(s.Boundaries, Polygon{Name: pg.name, Ring: r, File: f.info.Path, Feature: pg.feature})
		}
		coded := codedBreaklines(s.Points[first:], opt.BreaklineCodes, f)
		s.Breaklines = append(s.Breaklines, coded...)
		f.info.Breaklines = len(f.lines) + len(coded)
		s.Files = append(s.Files, f.info)
		s.Warnings = append(s.Warnings, f.warnings...)
	}
	s.Warnings = append(s.Warnings, crossFileIDs(files)...)
	return s, nil
}

// commonUnits returns the unit system all files were read in, when they
// agree.
func commonUnits(files []*rawFile) (units.System, bool) {
	var sys units.System
	for i, f := range files {
		if !f.unitSysOK || (i > 0 && f.unitSys != sys) {
			return 0, false
		}
		sys = f.unitSys
	}
	return sys, len(files) > 0
}

// resolveCRS decides the working coordinate system and each file's.
//
// With --crs auto: lon/lat files are projected into the WGS 84 UTM zone of
// the centre of their positions, or into the one UTM zone a projected file
// states; projected files keep the system they state; files that state
// none are in the local grid. With --crs local or EPSG:NNNN, files that
// state no system are taken to be in it, and lon/lat is projected into it
// when it is a UTM zone. A LAS header's system wins over --crs. Files that
// end up in different systems, or lon/lat beside a grid that names no
// system, are an error wrapping [ErrMixedCRS].
func resolveCRS(files []*rawFile, opt *Options) (crs.CRS, []crs.CRS, error) {
	auto := isAuto(opt.CRS)
	per := make([]crs.CRS, len(files))
	var geo, stated, unstated []int
	for i, f := range files {
		switch {
		case f.geographic:
			geo = append(geo, i)
		case f.statedCRS != nil:
			stated = append(stated, i)
			per[i] = *f.statedCRS
		default:
			unstated = append(unstated, i)
			if !auto {
				per[i] = opt.CRS.CRS
			}
		}
	}
	name := func(i int) string { return files[i].info.Path }
	// Every stated system must agree.
	for _, i := range stated[min(1, len(stated)):] {
		if j := stated[0]; !sameCRS(per[i], per[j]) {
			return crs.CRS{}, nil, fmt.Errorf("%w: %s is in %s but %s is in %s", ErrMixedCRS, name(j), per[j], name(i), per[i])
		}
	}
	var target crs.CRS
	switch {
	case !auto && (len(stated) == 0 || len(unstated) > 0 || len(geo) > 0):
		target = opt.CRS.CRS
		if target.Kind == crs.Local && target.Name == "" {
			target = crs.LocalCRS()
		}
		for _, i := range stated {
			if !sameCRS(per[i], target) {
				return crs.CRS{}, nil, fmt.Errorf("%w: %s states %s but --crs is %s", ErrMixedCRS, name(i), per[i], target)
			}
		}
	case len(stated) > 0:
		target = per[stated[0]]
		if auto && len(unstated) > 0 {
			return crs.CRS{}, nil, fmt.Errorf("%w: %s is in %s but %s states no coordinate system; if it is in the same one, pass --crs %s", ErrMixedCRS, name(stated[0]), target, name(unstated[0]), target)
		}
	case len(geo) > 0:
		if len(unstated) > 0 {
			return crs.CRS{}, nil, fmt.Errorf("%w: %s is longitude/latitude but %s has grid coordinates in no stated system: they cannot be placed together (pass --crs EPSG:NNNN if the grid is a UTM zone)", ErrMixedCRS, name(geo[0]), name(unstated[0]))
		}
		u, err := siteZone(files, geo)
		if err != nil {
			return crs.CRS{}, nil, err
		}
		target = u.CRS()
	default:
		target = crs.LocalCRS()
	}
	for _, i := range unstated {
		per[i] = target
	}
	if len(geo) > 0 {
		if !target.IsUTM() {
			how := "it is not a WGS 84 UTM zone (EPSG:326zz or 327zz), the only grids lon/lat is projected into"
			if target.Kind == crs.Local {
				how = "the local grid has no geodetic meaning: use --crs auto, or a UTM zone's EPSG code"
			}
			return crs.CRS{}, nil, fmt.Errorf("%w: %s is longitude/latitude and cannot be put into %s: %s", ErrCRS, name(geo[0]), target, how)
		}
		for _, i := range geo {
			per[i] = target
		}
	}
	// Grid files read in a unit that is not the system's own.
	if u, ok := crs.LinearUnitM(target.EPSG); ok && target.EPSG != 0 {
		for i, f := range files {
			if !f.geographic && f.statedCRS == nil && math.Abs(f.hUnitM-u) > unitTolM {
				files[i].warn(0, "read in %s, but %s is in %s: check --units", unitName(f.hUnitM), target, unitName(u))
			}
		}
	}
	return target, per, nil
}

// siteZone returns the UTM zone of the centre of the lon/lat positions of
// the given files. The centre is that of the bounding box, taken across the
// antimeridian when the positions straddle it.
func siteZone(files []*rawFile, geo []int) (crs.UTM, error) {
	lo, la := math.Inf(1), math.Inf(1)
	hiLon, hiLat := math.Inf(-1), math.Inf(-1)
	var lons []float64
	each := func(fn func(x, y float64)) {
		for _, i := range geo {
			f := files[i]
			for _, p := range f.pts {
				fn(p.x, p.y)
			}
			for _, l := range f.lines {
				for _, q := range l.pts {
					fn(q[0], q[1])
				}
			}
			for _, pg := range f.polys {
				for _, q := range pg.ring {
					fn(q[0], q[1])
				}
			}
		}
	}
	each(func(x, y float64) {
		lons = append(lons, x)
		lo, hiLon = math.Min(lo, x), math.Max(hiLon, x)
		la, hiLat = math.Min(la, y), math.Max(hiLat, y)
	})
	clon := (lo + hiLon) / 2
	if hiLon-lo > 180 { // straddles ±180°: shift the western part by 360°
		lo, hiLon = math.Inf(1), math.Inf(-1)
		for _, x := range lons {
			if x < 0 {
				x += 360
			}
			lo, hiLon = math.Min(lo, x), math.Max(hiLon, x)
		}
		clon = math.Remainder((lo+hiLon)/2, 360)
	}
	clat := (la + hiLat) / 2
	u, err := crs.UTMZoneFor(clon, clat)
	if err != nil {
		hint := ""
		if math.Abs(clon) <= 84 && math.Abs(clat) > 80 {
			hint = " (are latitude and longitude swapped?)"
		}
		return crs.UTM{}, fmt.Errorf("%w: the site centre lon %s, lat %s has no UTM zone%s: %w", ErrCRS, fmtNum(clon), fmtNum(clat), hint, err)
	}
	return u, nil
}

// checkIDs rejects a point id given twice in one file for different
// positions; the same position twice is a warning.
func checkIDs(f *rawFile) error {
	seen := make(map[string]int, len(f.pts))
	for i, p := range f.pts {
		if !p.explicitID {
			continue
		}
		j, dup := seen[p.id]
		if !dup {
			seen[p.id] = i
			continue
		}
		q := f.pts[j]
		if q.x == p.x && q.y == p.y && (q.z == p.z || math.IsNaN(q.z) && math.IsNaN(p.z)) {
			f.warn(p.line, "point %q repeats line %d exactly", p.id, q.line)
			continue
		}
		return perr(f.info.Path, p.line, "", ErrDuplicatePoint, "point %q here and on line %d has different coordinates (%s, %s, %s and %s, %s, %s)",
			p.id, q.line, fmtNum(p.x), fmtNum(p.y), fmtNum(p.z), fmtNum(q.x), fmtNum(q.y), fmtNum(q.z))
	}
	return nil
}

// crossFileIDs warns about a point id used in two files for different
// positions: surveys of different days often restart their numbering, so
// this is not an error.
func crossFileIDs(files []*rawFile) []Warning {
	if len(files) < 2 {
		return nil
	}
	type at struct {
		file    int
		line    int
		x, y, z float64
	}
	first := map[string]at{}
	var out []Warning
	reported := map[string]bool{}
	for i, f := range files {
		for _, p := range f.pts {
			if !p.explicitID || f.info.Format == FormatLAS {
				continue
			}
			a, ok := first[p.id]
			if !ok {
				first[p.id] = at{i, p.line, p.x, p.y, p.z}
				continue
			}
			if a.file != i && !reported[p.id] && (a.x != p.x || a.y != p.y) {
				reported[p.id] = true
				out = append(out, warnf(f.info.Path, p.line, "point id %q is also used in %s line %d for another position", p.id, files[a.file].info.Path, a.line))
			}
		}
	}
	return out
}
