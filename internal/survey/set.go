package survey

import (
	"fmt"
	"math"
	"strings"

	"github.com/dugout-estimating/dugout/internal/crs"
	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/units"
)

// Point is one surveyed shot.
type Point struct {
	// ID is the point number or name from the file. Files without one get
	// a generated id (see docs/input-formats.md); a LAS point's id is its
	// index among the kept points.
	ID string
	// P is the position in the local frame, metres (world metres minus
	// Set.Frame.Origin). P.Z is NaN only when the file gave no elevation
	// and [Options.AllowMissingZ] was set.
	P geom.Vec3
	// Code is the description as written; its first word is the code
	// proper (see [CodeOf]).
	Code string
	// HAccM and VAccM are the horizontal and vertical accuracy in metres,
	// NaN when the file has none.
	HAccM, VAccM float64
	// File and Line say where the point was read: the 1-based line of a
	// text file, the feature's first line in GeoJSON, the element's line in
	// GPX, the point's index in a LAS file.
	File string
	Line int
}

// HasZ reports whether p has an elevation.
func (p Point) HasZ() bool { return !math.IsNaN(p.P.Z) }

// Line is a breakline in the local frame, metres: a string of coded
// points, or a GeoJSON LineString.
type Line struct {
	Name, Code string
	Pts        []geom.Vec3
	File       string
	Line       int
}

// Polygon is a boundary (a GeoJSON Polygon's outer ring) in the local
// frame, metres. Feature is the 1-based feature number in the file.
type Polygon struct {
	Name    string
	Ring    geom.Ring
	File    string
	Feature int
}

// Warning is a non-fatal finding about the input. Line is 0 when it
// concerns a whole file, File is empty when it concerns the whole set.
type Warning struct {
	File string
	Line int
	Msg  string
}

// String returns "file:line: msg", leaving out what is unknown.
func (w Warning) String() string {
	switch {
	case w.File == "":
		return w.Msg
	case w.Line > 0:
		return fmt.Sprintf("%s:%d: %s", w.File, w.Line, w.Msg)
	}
	return w.File + ": " + w.Msg
}

// Format is a survey file format.
type Format int

// The formats Read recognises.
const (
	FormatUnknown Format = iota
	FormatDelimited
	FormatLevels
	FormatGeoJSON
	FormatGPX
	FormatLAS
)

// String returns a short lower-case name of f.
func (f Format) String() string {
	switch f {
	case FormatDelimited:
		return "delimited text"
	case FormatLevels:
		return "level book"
	case FormatGeoJSON:
		return "geojson"
	case FormatGPX:
		return "gpx"
	case FormatLAS:
		return "las"
	}
	return "unknown"
}

// FileInfo describes one input file as read.
type FileInfo struct {
	Path   string
	Format Format
	// Columns says how a delimited file or level book was read: the header
	// as normalised roles ("id,northing,easting,elevation,code") or the
	// --columns order for a headerless file.
	Columns string
	// Delimiter is the field separator of a delimited file: ",", ";",
	// "\t" or " " (runs of white space).
	Delimiter string
	// Points, Breaklines and Boundaries count what the file gave.
	Points, Breaklines, Boundaries int
	// MissingZ counts points without elevation (kept only with
	// AllowMissingZ).
	MissingZ int
	// Geographic reports whether the file's coordinates were lon/lat.
	Geographic bool
	// CRS is the file's coordinate system as resolved.
	CRS crs.CRS
	// UnitM is the length of the file's horizontal coordinate unit in
	// metres (1 for lon/lat files, whose positions are projected).
	UnitM float64
	// Levels summarises a level book (nil for other formats).
	Levels *LevelInfo
	// LAS summarises a LAS file (nil for other formats).
	LAS *LASInfo
}

// LASInfo is what the LAS reader reports about one file.
type LASInfo struct {
	Read, Kept     uint64
	ClassCounts    map[uint8]uint64
	UsedGroundOnly bool
	EPSG           int
}

// Set is everything read from one or more survey files.
type Set struct {
	Points     []Point
	Breaklines []Line
	Boundaries []Polygon
	// Frame maps local to world: local = world metres − Frame.Origin. The
	// origin is the centre of the world bounds rounded to 1 m.
	Frame geom.Frame
	// CRS is the coordinate system of the world coordinates.
	CRS crs.CRS
	// Units is the input's unit system, used to report back.
	Units units.System
	// Geographic reports whether any input was lon/lat (projected here).
	Geographic bool
	Files      []FileInfo
	Warnings   []Warning

	// tol holds the validation tolerances Read was given, for Summary.
	tol tolerances
}

type tolerances struct{ dupM, conflictM float64 }

// WorldPos converts a local position to world coordinates in the unit
// system out (x easting, y northing, z elevation).
func (s *Set) WorldPos(p geom.Vec3, out units.System) (x, y, z float64) {
	w := s.Frame.ToWorld(p.XY())
	f := out.Metres()
	return w.X / f, w.Y / f, p.Z / f
}

// Positions returns the positions of all points that have an elevation, in
// point order, for building a surface. Points without elevation (kept by
// AllowMissingZ) are left out.
func (s *Set) Positions() []geom.Vec3 {
	out := make([]geom.Vec3, 0, len(s.Points))
	for _, p := range s.Points {
		if p.HasZ() {
			out = append(out, p.P)
		}
	}
	return out
}

// CodedString returns the points whose code (the first word of the
// description, see [CodeOf]) equals code, case-insensitively, in file order
// and then in the order the files were given. It is how a walked outline,
// such as a pond edge shot with code "POND", is picked out.
func (s *Set) CodedString(code string) []Point {
	var out []Point
	for _, p := range s.Points {
		if strings.EqualFold(CodeOf(p.Code), code) {
			out = append(out, p)
		}
	}
	return out
}

// CodeOf returns the code of a description: its first white-space
// separated word ("BL1 top of wall" has code "BL1"). The rest of a
// description is a free note.
func CodeOf(desc string) string {
	f := strings.Fields(desc)
	if len(f) == 0 {
		return ""
	}
	return f[0]
}
