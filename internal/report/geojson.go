package report

import (
	"bufio"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"

	ggeom "github.com/twpayne/go-geom"
	"github.com/twpayne/go-geom/encoding/geojson"

	"github.com/dugout-estimating/dugout/internal/contours"
	"github.com/dugout-estimating/dugout/internal/geom"
)

// CoordMapper converts a position in the local frame (m) to the output
// coordinates of a file: world coordinates in the user's units, or
// longitude and latitude in degrees for RFC 7946 GeoJSON.
type CoordMapper func(p geom.Vec2) (x, y float64)

// GeoJSONMeta says what the coordinates of a GeoJSON file are.
//
// RFC 7946 (section 4) fixes GeoJSON coordinates to longitude and latitude on
// WGS 84, in that order. When Geographic is false the file is still valid
// GeoJSON, but its coordinates are something else (a local or projected
// frame), and CRSNote, which must then be set, is written as the top-level
// foreign member "dugout:crs" (RFC 7946 section 6.1) so that a reader can
// tell, for example "local frame; EPSG:2994; units ft".
type GeoJSONMeta struct {
	CRSNote    string
	Geographic bool
}

// ErrNoCRSNote is returned when a GeoJSON file that is not in longitude and
// latitude is asked for without a note saying what its coordinates are.
var ErrNoCRSNote = errors.New("report: GeoJSON coordinates are not lon/lat, and no CRS note says what they are")

// Number formats in GeoJSON output: values are rounded to a fixed number of
// decimals and written without trailing zeros, so the same input always
// gives the same bytes.
const (
	// geoJSONDegreeDigits: 1e-9 degree of latitude is about 0.1 mm.
	geoJSONDegreeDigits = 9
	// geoJSONLinearDigits: 1e-4 of a metre or foot, 0.1 mm or less, finer
	// than any survey.
	geoJSONLinearDigits = 4
	// geoJSONElevationDigits: as for plan coordinates.
	geoJSONElevationDigits = 4
)

// WriteContoursGeoJSON writes lines as a GeoJSON FeatureCollection of
// LineString features, one per line and in the order given, with
// properties "elevation" (Level × zScale, in the output unit), "index" and
// "closed". A closed line is written with its first point repeated at the
// end if it is not already. Plan coordinates go through toOut (nil keeps the
// local frame); zScale converts metres to the output's vertical unit (1 for
// metres, 1/[units.Foot] for feet).
//
// It returns a [*ValueError] for a line with fewer than two points, a
// non-finite coordinate or elevation, or, for geographic output, a point
// that is not a longitude and latitude; [ErrNoCRSNote] when meta needs a
// note; and the first error from w. Output is buffered and streamed (the
// lines are not copied), so after an error w may hold part of a document:
// write to a temporary file and rename it only on success.
func WriteContoursGeoJSON(w io.Writer, lines []contours.Line, toOut CoordMapper, zScale float64, meta GeoJSONMeta) error {
	gw, err := newGeoJSONWriter(w, toOut, zScale, meta)
	if err != nil {
		return err
	}
	var flat []float64
	for i, l := range lines {
		if len(l.Pts) < 2 {
			return &ValueError{Item: fmt.Sprintf("contour %d (level %g m)", i, l.Level), Field: "points",
				Value: float64(len(l.Pts)), Reason: "a LineString needs at least 2"}
		}
		flat = flat[:0]
		for j, p := range l.Pts {
			x, y, bad := gw.xy(p)
			if bad != nil {
				bad.Item = fmt.Sprintf("contour %d (level %g m), point %d", i, l.Level, j)
				return bad
			}
			flat = append(flat, x, y)
		}
		if l.Closed && l.Pts[0] != l.Pts[len(l.Pts)-1] {
			flat = append(flat, flat[0], flat[1])
		}
		z, err := gw.z(l.Level, fmt.Sprintf("contour %d", i))
		if err != nil {
			return err
		}
		props := contourProps{Elevation: z, Index: l.Index, Closed: l.Closed}
		gw.feature(ggeom.NewLineStringFlat(ggeom.XY, flat), props)
	}
	return gw.close()
}

type contourProps struct {
	Elevation json.Number `json:"elevation"`
	Index     bool        `json:"index"`
	Closed    bool        `json:"closed"`
}

type triangleProps struct {
	Triangle int `json:"triangle"`
}

// WriteTrianglesGeoJSON writes the triangles of m as a GeoJSON
// FeatureCollection of Polygon features with three-dimensional positions
// (x, y, elevation × zScale), one per triangle in mesh order, each with the
// property "triangle" (its index in m). Every ring is wound
// counter-clockwise in the output coordinates, as RFC 7946 section 3.1.6
// asks, whatever toOut does to the winding. toOut and zScale are as for
// [WriteContoursGeoJSON].
//
// It returns a [*ValueError] for a vertex index out of range, a non-finite
// coordinate, or a geographic point that is not a longitude and latitude;
// [ErrNoCRSNote] when meta needs a note; and the first error from w, after
// which w may hold part of a document.
func WriteTrianglesGeoJSON(w io.Writer, m geom.TriMesh, toOut CoordMapper, zScale float64, meta GeoJSONMeta) error {
	gw, err := newGeoJSONWriter(w, toOut, zScale, meta)
	if err != nil {
		return err
	}
	if len(m.T)%3 != 0 {
		return &ValueError{Item: "triangle mesh", Field: "indices", Value: float64(len(m.T)), Reason: "not a multiple of 3"}
	}
	var flat [12]float64
	for t := range m.NumTriangles() {
		for k := range 3 {
			i := m.T[3*t+k]
			if i < 0 || int(i) >= len(m.V) {
				return &ValueError{Item: fmt.Sprintf("triangle %d", t), Field: "vertex index", Value: float64(i),
					Reason: fmt.Sprintf("out of range 0 to %d", len(m.V)-1)}
			}
			v := m.V[i]
			x, y, bad := gw.xy(v.XY())
			if bad == nil && (math.IsNaN(v.Z) || math.IsInf(v.Z, 0)) {
				bad = &ValueError{Field: "z", Value: v.Z, Reason: "not finite"}
			}
			if bad != nil {
				bad.Item = fmt.Sprintf("triangle %d, vertex %d", t, i)
				return bad
			}
			flat[3*k], flat[3*k+1], flat[3*k+2] = x, y, gw.round(v.Z*gw.zScale, geoJSONElevationDigits)
		}
		// Counter-clockwise in the output plane: swap the last two corners
		// if the rounded output triangle turns the other way.
		ax, ay := flat[0], flat[1]
		if float64((flat[3]-ax)*(flat[7]-ay))-float64((flat[4]-ay)*(flat[6]-ax)) < 0 {
			for c := range 3 {
				flat[3+c], flat[6+c] = flat[6+c], flat[3+c]
			}
		}
		flat[9], flat[10], flat[11] = flat[0], flat[1], flat[2]
		gw.feature(ggeom.NewPolygonFlat(ggeom.XYZ, flat[:], []int{12}), triangleProps{Triangle: t})
	}
	return gw.close()
}

// geoJSONWriter streams one FeatureCollection, one feature per line, with a
// sticky error checked once at the end.
type geoJSONWriter struct {
	bw       *bufio.Writer
	toOut    CoordMapper
	zScale   float64
	geo      bool
	digits   int
	n        int
	err      error
	encoding []geojson.EncodeGeometryOption
}

func newGeoJSONWriter(w io.Writer, toOut CoordMapper, zScale float64, meta GeoJSONMeta) (*geoJSONWriter, error) {
	if !(zScale > 0) || math.IsInf(zScale, 0) {
		return nil, &ValueError{Item: "GeoJSON output", Field: "z scale", Value: zScale, Reason: "must be a finite number > 0"}
	}
	if !meta.Geographic && meta.CRSNote == "" {
		return nil, ErrNoCRSNote
	}
	if toOut == nil {
		toOut = func(p geom.Vec2) (float64, float64) { return p.X, p.Y }
	}
	gw := &geoJSONWriter{bw: bufio.NewWriter(w), toOut: toOut, zScale: zScale, geo: meta.Geographic,
		digits: geoJSONLinearDigits}
	if meta.Geographic {
		gw.digits = geoJSONDegreeDigits
	}
	gw.encoding = []geojson.EncodeGeometryOption{geojson.EncodeGeometryWithMaxDecimalDigits(gw.digits)}
	gw.write([]byte(`{"type":"FeatureCollection"`))
	if meta.CRSNote != "" {
		note, err := json.Marshal(meta.CRSNote)
		if err != nil {
			return nil, err
		}
		gw.write([]byte(`,"dugout:crs":`))
		gw.write(note)
	}
	gw.write([]byte(`,"features":[`))
	return gw, nil
}

func (gw *geoJSONWriter) write(b []byte) {
	if gw.err == nil {
		_, gw.err = gw.bw.Write(b)
	}
}

// round rounds v to d decimals and clears the sign of zero, so that the
// encoder's fixed-decimal output is the same for every input that rounds
// alike.
func (gw *geoJSONWriter) round(v float64, d int) float64 {
	s := math.Pow10(d)
	if math.Abs(v*s) >= 1<<53 {
		return v // no digits left to round at this magnitude
	}
	r := math.Round(v*s) / s
	if r == 0 {
		return 0
	}
	return r
}

// xy maps p to output coordinates and checks them; a bad value comes back
// as a ValueError for the caller to name.
func (gw *geoJSONWriter) xy(p geom.Vec2) (float64, float64, *ValueError) {
	x, y := gw.toOut(p)
	switch {
	case math.IsNaN(x) || math.IsInf(x, 0):
		return 0, 0, &ValueError{Field: "x", Value: x, Reason: "not finite"}
	case math.IsNaN(y) || math.IsInf(y, 0):
		return 0, 0, &ValueError{Field: "y", Value: y, Reason: "not finite"}
	case gw.geo && (x < -180 || x > 180):
		return 0, 0, &ValueError{Field: "longitude", Value: x, Reason: "outside -180 to 180 degrees"}
	case gw.geo && (y < -90 || y > 90):
		return 0, 0, &ValueError{Field: "latitude", Value: y, Reason: "outside -90 to 90 degrees"}
	}
	return gw.round(x, gw.digits), gw.round(y, gw.digits), nil
}

// z converts an elevation in metres to the output unit as a fixed-decimal
// JSON number.
func (gw *geoJSONWriter) z(zm float64, item string) (json.Number, error) {
	z := zm * gw.zScale
	if math.IsNaN(z) || math.IsInf(z, 0) {
		return "", &ValueError{Item: item, Field: "elevation", Value: zm, Reason: "not finite"}
	}
	return json.Number(formatFixed(gw.round(z, geoJSONElevationDigits), geoJSONElevationDigits)), nil
}

// formatFixed formats v with d decimals and drops trailing zeros, the same
// rule the geometry encoder applies to coordinates.
func formatFixed(v float64, d int) string {
	b := strconv.AppendFloat(nil, v, 'f', d, 64)
	for len(b) > 1 && b[len(b)-1] == '0' {
		b = b[:len(b)-1]
	}
	if b[len(b)-1] == '.' {
		b = b[:len(b)-1]
	}
	return string(b)
}

// feature writes one Feature: geometry, then properties (struct fields, so
// the key order is fixed).
func (gw *geoJSONWriter) feature(g ggeom.T, props any) {
	if gw.err != nil {
		return
	}
	enc, err := geojson.Encode(g, gw.encoding...)
	if err != nil {
		gw.err = fmt.Errorf("report: encode GeoJSON geometry: %w", err)
		return
	}
	b, err := json.Marshal(struct {
		Type       string            `json:"type"`
		Geometry   *geojson.Geometry `json:"geometry"`
		Properties any               `json:"properties"`
	}{"Feature", enc, props})
	if err != nil {
		gw.err = fmt.Errorf("report: encode GeoJSON feature: %w", err)
		return
	}
	if gw.n > 0 {
		gw.write([]byte{','})
	}
	gw.write([]byte{'\n'})
	gw.write(b)
	gw.n++
}

func (gw *geoJSONWriter) close() error {
	gw.write([]byte("\n]}\n"))
	if gw.err == nil {
		gw.err = gw.bw.Flush()
	}
	return gw.err
}
