package survey

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"maps"
	"math"
	"slices"
	"strconv"
	"strings"

	gg "github.com/twpayne/go-geom"
	"github.com/twpayne/go-geom/encoding/geojson"

	"github.com/dugout-estimating/dugout/internal/crs"
)

// maxGeometryDepth bounds nested GeometryCollections.
const maxGeometryDepth = 8

// gjFeature is a decoded feature and the line it starts on.
type gjFeature struct {
	f    *geojson.Feature
	line int
}

// readGeoJSON reads an RFC 7946 GeoJSON document: a FeatureCollection, a
// Feature or a bare geometry. Positions are [lon, lat, altitude] with the
// altitude in metres, unless the document is not RFC 7946 lon/lat (an old
// "crs" member, or values beyond ±180/±90) and Options.CRS names the grid it
// is in, or Options.CRS is local: then positions are projected coordinates
// in Options.Units.
func readGeoJSON(path string, data []byte, opt *Options) (*rawFile, error) {
	data = bytes.TrimPrefix(data, utf8BOM)
	feats, crsMember, err := decodeGeoJSON(path, data)
	if err != nil {
		return nil, err
	}
	f := newRaw(path, FormatGeoJSON, opt.Units)
	for i, ft := range feats {
		if err := addFeature(f, ft, i+1); err != nil {
			return nil, err
		}
	}
	if len(f.pts) == 0 && len(f.lines) == 0 && len(f.polys) == 0 {
		return nil, perr(path, 0, "", ErrEmpty, "GeoJSON has no Point, LineString or Polygon features")
	}

	// Decide whether positions are RFC 7946 lon/lat.
	lonlat := true
	why := ""
	if crsMember != "" {
		if !isLonLatCRSName(crsMember) {
			lonlat = false
			why = fmt.Sprintf("its \"crs\" member names %s", crsMember)
		}
	}
	if lonlat {
		if line, x, y, out := firstOutOfLonLat(f); out {
			lonlat = false
			why = fmt.Sprintf("line %d has [%s, %s], outside longitude/latitude range", line, fmtNum(x), fmtNum(y))
			if math.Abs(x) <= 90 && math.Abs(y) <= 180 && crsMember == "" && allSwappedLonLat(f) {
				why += " (the positions look like [latitude, longitude]: RFC 7946 puts longitude first)"
			}
		}
	}
	switch {
	case !lonlat && isAuto(opt.CRS):
		return nil, perr(path, 0, "", ErrCRS, "not RFC 7946 longitude/latitude: %s; to read projected coordinates, name their system with --crs EPSG:NNNN (or --crs local), and their unit with --units", why)
	case !lonlat:
		f.warn(0, "not RFC 7946 longitude/latitude (%s): read as %s coordinates in %s", why, specString(opt.CRS), opt.Units)
		if code, ok := epsgOfCRSName(crsMember); ok && opt.CRS.CRS.EPSG != 0 && code != opt.CRS.CRS.EPSG {
			f.warn(0, "the \"crs\" member names EPSG:%d but --crs is %s: using --crs", code, specString(opt.CRS))
		}
	case opt.CRS.CRS.Kind == crs.Local && !isAuto(opt.CRS):
		f.warn(0, "read as local grid coordinates in %s because --crs local (RFC 7946 GeoJSON is longitude/latitude)", opt.Units)
		lonlat = false
	default:
		f.geographic = true
		f.info.Geographic = true
		f.vUnitM = 1 // RFC 7946 §3.1.1: altitude in metres
	}
	f.info.Points, f.info.Breaklines, f.info.Boundaries = len(f.pts), len(f.lines), len(f.polys)
	return f, f.missingZ(opt, "no altitude in the positions")
}

// decodeGeoJSON returns the features of a GeoJSON document with their
// lines, and the name in an old-style top-level "crs" member.
func decodeGeoJSON(path string, data []byte) ([]gjFeature, string, error) {
	lineAt := newLineCounter(data)
	dec := json.NewDecoder(bytes.NewReader(data))
	syntax := func(err error) error {
		line := lineAt(int(dec.InputOffset()))
		var se *json.SyntaxError
		if ok := asSyntax(err, &se); ok {
			line = lineAt(int(se.Offset))
		}
		return perr(path, line, "", ErrSyntax, "invalid JSON: %v", err)
	}
	tok, err := dec.Token()
	if err != nil {
		return nil, "", syntax(err)
	}
	if d, ok := tok.(json.Delim); !ok || d != '{' {
		return nil, "", perr(path, 1, "", ErrFormat, "GeoJSON must be a JSON object")
	}
	var (
		typ         string
		feats       []gjFeature
		crsName     string
		members     = map[string]json.RawMessage{}
		hasFeatures bool
	)
	for dec.More() {
		tok, err := dec.Token()
		if err != nil {
			return nil, "", syntax(err)
		}
		key, _ := tok.(string)
		switch key {
		case "type":
			if err := dec.Decode(&typ); err != nil {
				return nil, "", syntax(err)
			}
		case "crs":
			var c struct {
				Type       string         `json:"type"`
				Properties map[string]any `json:"properties"`
			}
			if err := dec.Decode(&c); err != nil {
				return nil, "", syntax(err)
			}
			crsName = crsMemberName(c.Type, c.Properties)
		case "features":
			hasFeatures = true
			if t, err := dec.Token(); err != nil {
				return nil, "", syntax(err)
			} else if d, ok := t.(json.Delim); !ok || d != '[' {
				if t == nil {
					continue // "features": null
				}
				return nil, "", perr(path, lineAt(int(dec.InputOffset())), "features", ErrSyntax, "must be an array")
			}
			for dec.More() {
				line := lineAt(skipSpace(data, int(dec.InputOffset())))
				ft := new(geojson.Feature)
				if err := dec.Decode(ft); err != nil {
					return nil, "", perr(path, line, "feature", ErrSyntax, "%v", err)
				}
				feats = append(feats, gjFeature{f: ft, line: line})
			}
			if _, err := dec.Token(); err != nil {
				return nil, "", syntax(err)
			}
		default:
			var raw json.RawMessage
			if err := dec.Decode(&raw); err != nil {
				return nil, "", syntax(err)
			}
			members[key] = raw
		}
	}
	if _, err := dec.Token(); err != nil {
		return nil, "", syntax(err)
	}
	if _, err := dec.Token(); !errors.Is(err, io.EOF) {
		return nil, "", perr(path, lineAt(int(dec.InputOffset())), "", ErrSyntax, "text after the GeoJSON object")
	}
	switch typ {
	case "FeatureCollection":
		if !hasFeatures {
			return nil, "", perr(path, 1, "features", ErrSyntax, "FeatureCollection without a \"features\" array")
		}
		return feats, crsName, nil
	case "Feature":
		ft := &geojson.Feature{}
		m := map[string]json.RawMessage{"type": json.RawMessage(`"Feature"`),
			"geometry": rawOrNull(members["geometry"]), "properties": rawOrNull(members["properties"])}
		if id, ok := members["id"]; ok {
			m["id"] = id
		}
		buf, _ := json.Marshal(m)
		if err := json.Unmarshal(buf, ft); err != nil {
			return nil, "", perr(path, 1, "feature", ErrSyntax, "%v", err)
		}
		return []gjFeature{{f: ft, line: 1}}, crsName, nil
	case "Point", "MultiPoint", "LineString", "MultiLineString", "Polygon", "MultiPolygon", "GeometryCollection":
		g := geojson.Geometry{Type: typ}
		if c, ok := members["coordinates"]; ok {
			g.Coordinates = &c
		}
		if c, ok := members["geometries"]; ok {
			g.Geometries = &c
		}
		t, err := g.Decode()
		if err != nil {
			return nil, "", perr(path, 1, "geometry", ErrSyntax, "%v", err)
		}
		return []gjFeature{{f: &geojson.Feature{Geometry: t}, line: 1}}, crsName, nil
	case "":
		return nil, "", perr(path, 1, "type", ErrFormat, "a GeoJSON object needs a \"type\" member")
	}
	return nil, "", perr(path, 1, "type", ErrFormat, "%q is not a GeoJSON type", typ)
}

func rawOrNull(r json.RawMessage) json.RawMessage {
	if r == nil {
		return json.RawMessage("null")
	}
	return r
}

func asSyntax(err error, target **json.SyntaxError) bool { return errors.As(err, target) }

// skipSpace returns the offset of the first non-space byte at or after
// off, skipping a separating comma.
func skipSpace(data []byte, off int) int {
	for off < len(data) && (data[off] == ' ' || data[off] == '\t' || data[off] == '\r' || data[off] == '\n' || data[off] == ',') {
		off++
	}
	return off
}

// newLineCounter returns a function giving the 1-based line of a byte
// offset; offsets should mostly increase (it rescans from the start
// otherwise).
func newLineCounter(data []byte) func(off int) int {
	pos, line := 0, 1
	return func(off int) int {
		off = min(max(off, 0), len(data))
		if off < pos {
			pos, line = 0, 1
		}
		line += bytes.Count(data[pos:off], []byte{'\n'})
		pos = off
		return line
	}
}

// crsMemberName returns the system named by an old-style GeoJSON "crs"
// member (GeoJSON 2008 §3): the "name" property of a named CRS, or the link.
func crsMemberName(typ string, props map[string]any) string {
	for _, k := range []string{"name", "href", "code"} {
		if v, ok := props[k]; ok {
			s := fmt.Sprint(v)
			if k == "code" {
				s = "EPSG:" + s
			}
			return s
		}
	}
	if typ == "" {
		typ = "unnamed"
	}
	return typ + " crs"
}

// isLonLatCRSName reports whether an old "crs" member names WGS 84
// longitude/latitude (which RFC 7946 positions are anyway).
func isLonLatCRSName(name string) bool {
	switch strings.ToLower(strings.TrimSpace(name)) {
	case "urn:ogc:def:crs:ogc:1.3:crs84", "urn:ogc:def:crs:ogc::crs84", "crs84", "epsg:4326",
		"urn:ogc:def:crs:epsg::4326", "urn:ogc:def:crs:epsg:4326", "wgs84", "wgs 84":
		return true
	}
	return false
}

// epsgOfCRSName extracts an EPSG code from a "crs" member name such as
// "urn:ogc:def:crs:EPSG::2994" or "EPSG:2994".
func epsgOfCRSName(name string) (int, bool) {
	t := strings.ToLower(name)
	i := strings.LastIndex(t, "epsg")
	if i < 0 {
		return 0, false
	}
	num := strings.TrimLeft(t[i+4:], ":")
	code, err := strconv.Atoi(num)
	return code, err == nil && code > 0
}

// gjProps picks id, name, code and accuracy out of feature properties.
type gjProps struct {
	id, name, code string
	hacc, vacc     float64
}

func featureProps(ft *geojson.Feature) gjProps {
	p := gjProps{id: ft.ID, hacc: nan, vacc: nan}
	var desc string
	// Sorted, so that when two properties give one role the choice does
	// not depend on map order.
	for _, k := range slices.Sorted(maps.Keys(ft.Properties)) {
		v := ft.Properties[k]
		key, _ := normaliseHeader(k)
		s := propString(v)
		switch {
		case key == "name":
			p.name = s
		case key == "code":
			p.code = s
		case columnNames[key] == roleDesc:
			if desc == "" || key == "description" {
				desc = s
			}
		case columnNames[key] == roleID && p.id == "":
			p.id = s
		case columnNames[key] == roleHAcc:
			p.hacc = propNumber(v)
		case columnNames[key] == roleVAcc:
			p.vacc = propNumber(v)
		}
	}
	if p.code == "" {
		p.code = desc
	}
	return p
}

func propString(v any) string {
	switch t := v.(type) {
	case nil:
		return ""
	case string:
		return strings.TrimSpace(t)
	case float64:
		return strconv.FormatFloat(t, 'f', -1, 64)
	case bool:
		return strconv.FormatBool(t)
	}
	return ""
}

func propNumber(v any) float64 {
	switch t := v.(type) {
	case float64:
		if t >= 0 && !math.IsInf(t, 0) {
			return t
		}
	case string:
		if x, err := parseNum("", 0, "", t); err == nil && x >= 0 {
			return x
		}
	}
	return nan
}

// addFeature adds the points, breaklines and boundaries of one feature.
func addFeature(f *rawFile, ft gjFeature, num int) error {
	props := featureProps(ft.f)
	id := props.id
	if id == "" {
		id = props.name
	}
	name := props.name
	if name == "" {
		name = id
	}
	return addGeometry(f, ft.f.Geometry, ft.line, num, id, name, props, 0)
}

func addGeometry(f *rawFile, g gg.T, line, num int, id, name string, props gjProps, depth int) error {
	path := f.info.Path
	z := func(c gg.Coord, layout gg.Layout) float64 {
		if i := layout.ZIndex(); i >= 0 && i < len(c) {
			return c[i]
		}
		return nan
	}
	suffix := func(base string, i, n int, gen string) (string, bool) {
		if base == "" {
			return gen, false
		}
		if n == 1 {
			return base, true
		}
		return base + "-" + strconv.Itoa(i+1), true
	}
	if _, coll := g.(*gg.GeometryCollection); g != nil && !coll && g.Stride() == 0 {
		// A geometry without "coordinates" decodes with no layout, and
		// go-geom cannot even list its (no) coordinates.
		f.warn(line, "feature %d has a geometry without coordinates: skipped", num)
		return nil
	}
	switch t := g.(type) {
	case nil:
		f.warn(line, "feature %d has no geometry: skipped", num)
	case *gg.Point:
		if t.Empty() {
			f.warn(line, "feature %d is an empty Point: skipped", num)
			return nil
		}
		c := t.Coords()
		pid, explicit := suffix(id, 0, 1, "f"+strconv.Itoa(num))
		f.pts = append(f.pts, rawPoint{id: pid, explicitID: explicit, x: c[0], y: c[1], z: z(c, t.Layout()),
			code: props.code, hacc: props.hacc, vacc: props.vacc, line: line})
	case *gg.MultiPoint:
		n := t.NumPoints()
		for i := range n {
			c := t.Point(i).Coords()
			if len(c) < 2 {
				continue
			}
			pid, explicit := suffix(id, i, n, "f"+strconv.Itoa(num)+"-"+strconv.Itoa(i+1))
			f.pts = append(f.pts, rawPoint{id: pid, explicitID: explicit, x: c[0], y: c[1], z: z(c, t.Layout()),
				code: props.code, hacc: props.hacc, vacc: props.vacc, line: line})
		}
	case *gg.LineString:
		f.addLine(name, props.code, t.Coords(), t.Layout(), line, num)
	case *gg.MultiLineString:
		n := t.NumLineStrings()
		for i := range n {
			nm, _ := suffix(name, i, n, "")
			f.addLine(nm, props.code, t.LineString(i).Coords(), t.Layout(), line, num)
		}
	case *gg.Polygon:
		return f.addPolygon(name, t, line, num)
	case *gg.MultiPolygon:
		n := t.NumPolygons()
		for i := range n {
			nm, _ := suffix(name, i, n, "")
			if err := f.addPolygon(nm, t.Polygon(i), line, num); err != nil {
				return err
			}
		}
	case *gg.GeometryCollection:
		if depth >= maxGeometryDepth {
			return perr(path, line, "geometries", ErrSyntax, "GeometryCollections nested deeper than %d", maxGeometryDepth)
		}
		for i, sub := range t.Geoms() {
			sid, _ := suffix(id, i, t.NumGeoms(), "")
			if err := addGeometry(f, sub, line, num, sid, name, props, depth+1); err != nil {
				return err
			}
		}
	default:
		f.warn(line, "feature %d: geometry %T not used", num, g)
	}
	return nil
}

func (f *rawFile) addLine(name, code string, cs []gg.Coord, layout gg.Layout, line, num int) {
	if len(cs) < 2 {
		f.warn(line, "feature %d: a line needs at least 2 positions, has %d: skipped", num, len(cs))
		return
	}
	if name == "" {
		name = "f" + strconv.Itoa(num)
	}
	l := rawLine{name: name, code: code, line: line}
	zi := layout.ZIndex()
	for _, c := range cs {
		q := [3]float64{c[0], c[1], nan}
		if zi >= 0 && zi < len(c) {
			q[2] = c[zi]
		}
		l.pts = append(l.pts, q)
	}
	f.lines = append(f.lines, l)
}

func (f *rawFile) addPolygon(name string, p *gg.Polygon, line, num int) error {
	if p.NumLinearRings() == 0 {
		f.warn(line, "feature %d is an empty Polygon: skipped", num)
		return nil
	}
	if p.NumLinearRings() > 1 {
		f.warn(line, "feature %d: polygon holes are not used (only the outer ring bounds the survey)", num)
	}
	cs := p.LinearRing(0).Coords()
	ring := make([][2]float64, 0, len(cs))
	for _, c := range cs {
		ring = append(ring, [2]float64{c[0], c[1]})
	}
	// RFC 7946 §3.1.6: a linear ring is closed; our rings are stored open.
	if n := len(ring); n > 1 && ring[0] == ring[n-1] {
		ring = ring[:n-1]
	}
	if len(ring) < 3 {
		return perr(f.info.Path, line, "coordinates", ErrSyntax, "feature %d: a polygon ring needs at least 3 distinct positions, has %d", num, len(ring))
	}
	if name == "" {
		name = "f" + strconv.Itoa(num)
	}
	f.polys = append(f.polys, rawPoly{name: name, ring: ring, feature: num})
	return nil
}

// firstOutOfLonLat returns the first position outside longitude ±180 and
// latitude ±90.
func firstOutOfLonLat(f *rawFile) (line int, x, y float64, out bool) {
	bad := func(x, y float64) bool { return math.Abs(x) > 180 || math.Abs(y) > 90 }
	for _, p := range f.pts {
		if bad(p.x, p.y) {
			return p.line, p.x, p.y, true
		}
	}
	for _, l := range f.lines {
		for _, q := range l.pts {
			if bad(q[0], q[1]) {
				return l.line, q[0], q[1], true
			}
		}
	}
	for _, p := range f.polys {
		for _, q := range p.ring {
			if bad(q[0], q[1]) {
				return 0, q[0], q[1], true
			}
		}
	}
	return 0, 0, 0, false
}

// allSwappedLonLat reports whether every position would be a valid
// longitude/latitude with its first two values exchanged.
func allSwappedLonLat(f *rawFile) bool {
	ok := func(x, y float64) bool { return math.Abs(x) <= 90 && math.Abs(y) <= 180 }
	for _, p := range f.pts {
		if !ok(p.x, p.y) {
			return false
		}
	}
	for _, l := range f.lines {
		for _, q := range l.pts {
			if !ok(q[0], q[1]) {
				return false
			}
		}
	}
	return true
}
