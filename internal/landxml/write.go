package landxml

import (
	"bufio"
	"encoding/xml"
	"fmt"
	"io"
	"math"
	"strconv"
	"time"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// Namespace is the LandXML 1.2 namespace written on the root element.
const Namespace = "http://www.landxml.org/schema/LandXML-1.2"

// Decimals is the number of decimals written for coordinates, in the
// document's unit: 0.1 mm in metres, 0.03 mm in feet, far below survey
// accuracy while keeping files compact.
const Decimals = 4

// roundScale is 10^Decimals.
var roundScale = math.Pow10(Decimals)

// WriteOptions describes the document [Write] produces.
type WriteOptions struct {
	// Name is the surface name; "" writes "surface".
	Name string
	// Description is written as the surface's desc attribute when not
	// empty.
	Description string
	// Units is the unit coordinates are written in.
	Units Units
	// EPSG, when not 0, is written as <CoordinateSystem epsgCode="...">.
	EPSG int
	// Frame is the local frame of the mesh: its origin (metres) is added to
	// every vertex before conversion to Units.
	Frame geom.Frame
	// Created is written as the root's date and time attributes, which the
	// schema requires; the zero time writes 0001-01-01 00:00:00, so output
	// depends only on the inputs.
	Created time.Time
}

// Write writes m (local frame, metres, triangles counter-clockwise) as a
// LandXML 1.2 document with one TIN surface. Points get ids 1..len(m.V) in
// order, and every vertex is written, referenced or not. The output is
// streamed through a buffer, so memory does not grow with the mesh. It
// returns an error wrapping [ErrMesh] for a triangle list whose length is
// not a multiple of three, an index out of range or a non-finite vertex,
// before anything is written; or the first error of w.
func Write(w io.Writer, m geom.TriMesh, opt WriteOptions) error {
	unit := opt.Units.Metres()
	if unit == 0 {
		return fmt.Errorf("%w: unknown units %d", ErrMesh, int(opt.Units))
	}
	if err := checkMesh(m, opt.Frame); err != nil {
		return err
	}
	name := opt.Name
	if name == "" {
		name = "surface"
	}
	e := &encoder{w: bufio.NewWriterSize(w, 64<<10)}
	c := opt.Created
	e.str(`<?xml version="1.0" encoding="UTF-8"?>` + "\n")
	e.str(`<LandXML xmlns="` + Namespace + `" xmlns:xsi="http://www.w3.org/2001/XMLSchema-instance" ` +
		`xsi:schemaLocation="` + Namespace + ` ` + Namespace + `/LandXML-1.2.xsd" version="1.2"`)
	e.str(` date="` + c.Format("2006-01-02") + `" time="` + c.Format("15:04:05") + `">` + "\n")
	e.str("  <Units>\n")
	switch opt.Units {
	case Metres:
		e.str(`    <Metric areaUnit="squareMeter" linearUnit="meter" volumeUnit="cubicMeter" temperatureUnit="celsius" ` +
			`pressureUnit="milliBars" angularUnit="decimal degrees" directionUnit="decimal degrees"/>` + "\n")
	default:
		lin := "foot"
		if opt.Units == USFeet {
			lin = "USSurveyFoot"
		}
		e.str(`    <Imperial areaUnit="squareFoot" linearUnit="` + lin + `" volumeUnit="cubicYard" temperatureUnit="fahrenheit" ` +
			`pressureUnit="inHG" angularUnit="decimal degrees" directionUnit="decimal degrees"/>` + "\n")
	}
	e.str("  </Units>\n")
	if opt.EPSG != 0 {
		e.str(`  <CoordinateSystem epsgCode="` + strconv.Itoa(opt.EPSG) + `"/>` + "\n")
	}
	e.str(`  <Application name="dugout" desc="pond and landscape earthwork estimating"/>` + "\n")
	e.str("  <Surfaces>\n")
	e.str(`    <Surface name="`)
	e.escape(name)
	if opt.Description != "" {
		e.str(`" desc="`)
		e.escape(opt.Description)
	}
	e.str(`">` + "\n")
	e.str(`      <Definition surfType="TIN">` + "\n")
	e.str("        <Pnts>\n")
	for i, v := range m.V {
		w := opt.Frame.ToWorld(v.XY())
		b := append(e.buf[:0], `          <P id="`...)
		b = strconv.AppendInt(b, int64(i+1), 10)
		b = append(b, `">`...)
		b = appendNum(b, w.Y/unit) // northing first
		b = append(b, ' ')
		b = appendNum(b, w.X/unit)
		b = append(b, ' ')
		b = appendNum(b, v.Z/unit)
		b = append(b, "</P>\n"...)
		e.buf = b
		e.bytes(b)
	}
	e.str("        </Pnts>\n")
	e.str("        <Faces>\n")
	for t := 0; t+2 < len(m.T); t += 3 {
		b := append(e.buf[:0], "          <F>"...)
		b = strconv.AppendInt(b, int64(m.T[t])+1, 10)
		b = append(b, ' ')
		b = strconv.AppendInt(b, int64(m.T[t+1])+1, 10)
		b = append(b, ' ')
		b = strconv.AppendInt(b, int64(m.T[t+2])+1, 10)
		b = append(b, "</F>\n"...)
		e.buf = b
		e.bytes(b)
	}
	e.str("        </Faces>\n")
	e.str("      </Definition>\n")
	e.str("    </Surface>\n")
	e.str("  </Surfaces>\n")
	e.str("</LandXML>\n")
	return e.flush()
}

// checkMesh validates m before anything is written.
func checkMesh(m geom.TriMesh, f geom.Frame) error {
	if !f.Origin.IsFinite() {
		return fmt.Errorf("%w: frame origin %v is not finite", ErrMesh, f.Origin)
	}
	if len(m.T)%3 != 0 {
		return fmt.Errorf("%w: %d triangle indices is not a multiple of 3", ErrMesh, len(m.T))
	}
	for i, v := range m.V {
		if !v.IsFinite() {
			return fmt.Errorf("%w: vertex %d is %v", ErrMesh, i, v)
		}
	}
	for i, x := range m.T {
		if x < 0 || int(x) >= len(m.V) {
			return fmt.Errorf("%w: triangle %d refers to vertex %d of %d", ErrMesh, i/3, x, len(m.V))
		}
	}
	return nil
}

// encoder writes through a buffer and keeps the first error (a sticky
// error, checked once by flush).
type encoder struct {
	w   *bufio.Writer
	err error
	buf []byte
}

func (e *encoder) str(s string) {
	if e.err == nil {
		_, e.err = e.w.WriteString(s)
	}
}

func (e *encoder) bytes(b []byte) {
	if e.err == nil {
		_, e.err = e.w.Write(b)
	}
}

// appendNum appends v with [Decimals] decimals; a value that rounds to
// zero is written as 0 rather than -0.
func appendNum(b []byte, v float64) []byte {
	if math.Round(v*roundScale) == 0 {
		v = 0
	}
	return strconv.AppendFloat(b, v, 'f', Decimals, 64)
}

// escape writes s as XML character data safe inside a double-quoted
// attribute.
func (e *encoder) escape(s string) {
	if e.err == nil {
		e.err = xml.EscapeText(e.w, []byte(s))
	}
}

func (e *encoder) flush() error {
	if e.err != nil {
		return fmt.Errorf("landxml: write: %w", e.err)
	}
	if err := e.w.Flush(); err != nil {
		return fmt.Errorf("landxml: write: %w", err)
	}
	return nil
}
