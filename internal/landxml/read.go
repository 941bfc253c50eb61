package landxml

import (
	"encoding/xml"
	"errors"
	"fmt"
	"io"
	"strconv"
	"strings"
	"unicode/utf8"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/robust"
	"github.com/dugout-estimating/dugout/internal/units"
)

// Surface is one TIN surface read from a LandXML document.
type Surface struct {
	// Name is the surface's name attribute.
	Name string
	// Description is its desc attribute.
	Description string
	// Mesh holds the points in document order (world coordinates in metres:
	// x easting, y northing, z elevation) and the visible faces, each wound
	// counter-clockwise in plan.
	Mesh geom.TriMesh
	// IDs[i] is the LandXML id of Mesh.V[i].
	IDs []int64
	// Units is the document's linear unit, already converted from.
	Units Units
	// EPSG is the document's <CoordinateSystem epsgCode>, 0 when absent.
	EPSG int
	// Warnings are non-fatal problems: a missing <Units> (metres assumed),
	// degenerate faces dropped, invisible faces skipped.
	Warnings []string
}

// Read reads every Surface of a LandXML document (version 1.0 to 1.2; any
// namespace is accepted and elements are matched by local name). Each
// surface must be a TIN with a <Definition> holding <Pnts> and <Faces>.
// Point ids may be any integers; faces refer to them. Faces with the
// attribute i="1" (invisible, such as those outside a boundary) are
// skipped. Faces of zero plan area or with a repeated point are dropped
// with a warning; clockwise faces are reversed.
//
// Errors are [*ParseError]s naming the line, the element and the point id
// or face number, wrapping [ErrSyntax], [ErrNonFinite], [ErrMissing],
// [ErrUnknownPoint], [ErrDuplicatePoint] or [ErrUnsupported]. A document
// without any Surface is an error wrapping [ErrMissing].
func Read(r io.Reader) ([]Surface, error) {
	d := xml.NewDecoder(r)
	d.CharsetReader = charsetReader
	p := &parser{d: d}
	if err := p.document(); err != nil {
		return nil, err
	}
	if len(p.surfaces) == 0 {
		return nil, &ParseError{Element: "LandXML", Err: fmt.Errorf("%w: no Surface in the document", ErrMissing)}
	}
	return p.finish()
}

// rawSurface is a surface as read, coordinates still in document units.
type rawSurface struct {
	name, desc string
	line       int
	hasDef     bool
	hasPnts    bool
	hasFaces   bool
	ids        []int64
	pts        []geom.Vec3 // x easting, y northing, z, document units
	index      map[int64]int32
	faces      []int32 // flat triples of indices into pts
	faceLines  []int   // line of each face, for errors found later
	invisible  int
	warnings   []string
}

type parser struct {
	d        *xml.Decoder
	surfaces []*rawSurface
	units    Units
	hasUnits bool
	epsg     int
	cur      *rawSurface
	curDepth int // stack depth of the current Surface's start tag
	nf       int // faces seen in the current surface, for "#n"
}

func (p *parser) line() int {
	l, _ := p.d.InputPos()
	return l
}

func (p *parser) syntax(err error) error {
	var se *xml.SyntaxError
	if errors.As(err, &se) {
		return &ParseError{Line: se.Line, Element: "document", Err: fmt.Errorf("%w: %s", ErrSyntax, se.Msg)}
	}
	return &ParseError{Line: p.line(), Element: "document", Err: fmt.Errorf("%w: %w", ErrSyntax, err)}
}

func attr(se xml.StartElement, name string) (string, bool) {
	for _, a := range se.Attr {
		if a.Name.Local == name {
			return a.Value, true
		}
	}
	return "", false
}

// document walks the token stream. The element path is kept as a stack of
// local names so that P and F are taken only inside Surface/Definition.
func (p *parser) document() error {
	var stack []string
	root := true
	for {
		tok, err := p.d.Token()
		if errors.Is(err, io.EOF) {
			if root {
				return &ParseError{Element: "document", Err: fmt.Errorf("%w: empty document", ErrSyntax)}
			}
			return nil
		}
		if err != nil {
			return p.syntax(err)
		}
		switch t := tok.(type) {
		case xml.StartElement:
			name := t.Name.Local
			if root {
				if name != "LandXML" {
					return &ParseError{Line: p.line(), Element: name, Err: fmt.Errorf("%w: root element is <%s>, want <LandXML>", ErrSyntax, name)}
				}
				root = false
			}
			parent := ""
			if len(stack) > 0 {
				parent = stack[len(stack)-1]
			}
			stack = append(stack, name)
			if name == "Surface" && parent == "Surfaces" && p.cur == nil {
				p.curDepth = len(stack)
			}
			consumed, err := p.start(t, parent)
			if err != nil {
				return err
			}
			if consumed { // P and F read through their end tag
				stack = stack[:len(stack)-1]
			}
		case xml.EndElement:
			if p.cur != nil && len(stack) == p.curDepth {
				if err := p.endSurface(); err != nil {
					return err
				}
			}
			stack = stack[:len(stack)-1]
		}
	}
}

// start handles one start tag. P and F read their text and end tag, which
// start reports as consumed.
func (p *parser) start(t xml.StartElement, parent string) (consumed bool, err error) {
	line := p.line()
	switch t.Name.Local {
	case "Metric", "Imperial":
		if parent != "Units" {
			return false, nil
		}
		lu, ok := attr(t, "linearUnit")
		if !ok {
			return false, &ParseError{Line: line, Element: t.Name.Local, Err: fmt.Errorf("%w: no linearUnit attribute", ErrMissing)}
		}
		u, ok := linearUnits[lu]
		if !ok || (t.Name.Local == "Metric") != (u == Metres) {
			return false, &ParseError{Line: line, Element: t.Name.Local, Err: fmt.Errorf(
				"%w: linearUnit %q (want meter, foot or USSurveyFoot)", ErrUnsupported, lu)}
		}
		p.units, p.hasUnits = u, true
	case "CoordinateSystem":
		if s, ok := attr(t, "epsgCode"); ok && strings.TrimSpace(s) != "" {
			n, err := strconv.Atoi(strings.TrimSpace(s))
			if err != nil || n <= 0 {
				return false, &ParseError{Line: line, Element: "CoordinateSystem", Err: fmt.Errorf("%w: epsgCode %q is not a positive integer", ErrSyntax, s)}
			}
			p.epsg = n
		}
	case "Surface":
		if parent != "Surfaces" || p.cur != nil {
			return false, nil
		}
		name, _ := attr(t, "name")
		desc, _ := attr(t, "desc")
		p.cur = &rawSurface{name: name, desc: desc, line: line, index: map[int64]int32{}}
		p.nf = 0
	case "Definition":
		if p.cur == nil || parent != "Surface" {
			return false, nil
		}
		if st, _ := attr(t, "surfType"); st != "" && !strings.EqualFold(st, "TIN") {
			return false, &ParseError{Line: line, Element: "Definition", ID: p.cur.name, Err: fmt.Errorf(
				"%w: surfType %q (only TIN surfaces are read)", ErrUnsupported, st)}
		}
		p.cur.hasDef = true
	case "Pnts":
		if p.cur != nil && parent == "Definition" {
			p.cur.hasPnts = true
		}
	case "Faces":
		if p.cur != nil && parent == "Definition" {
			p.cur.hasFaces = true
		}
	case "P":
		if p.cur != nil && parent == "Pnts" {
			return true, p.point(t, line)
		}
	case "F":
		if p.cur != nil && parent == "Faces" {
			return true, p.face(t, line)
		}
	}
	return false, nil
}

// text reads the character data of the current element up to its end tag.
func (p *parser) text(elem string, line int, id string) (string, error) {
	var b []byte
	for {
		tok, err := p.d.Token()
		if err != nil {
			if errors.Is(err, io.EOF) {
				err = io.ErrUnexpectedEOF
			}
			return "", p.syntax(err)
		}
		switch t := tok.(type) {
		case xml.CharData:
			b = append(b, t...)
		case xml.EndElement:
			return string(b), nil
		case xml.StartElement:
			return "", &ParseError{Line: line, Element: elem, ID: id, Err: fmt.Errorf("%w: unexpected <%s> inside <%s>", ErrSyntax, t.Name.Local, elem)}
		}
	}
}

func (p *parser) point(t xml.StartElement, line int) error {
	idText, ok := attr(t, "id")
	if !ok {
		return &ParseError{Line: line, Element: "P", Err: fmt.Errorf("%w: no id attribute", ErrMissing)}
	}
	id, err := strconv.ParseInt(strings.TrimSpace(idText), 10, 64)
	if err != nil {
		return &ParseError{Line: line, Element: "P", ID: idText, Err: fmt.Errorf("%w: id is not an integer", ErrSyntax)}
	}
	s, err := p.text("P", line, idText)
	if err != nil {
		return err
	}
	f := strings.Fields(s)
	if len(f) != 3 {
		return &ParseError{Line: line, Element: "P", ID: idText, Err: fmt.Errorf(
			"%w: %q has %d numbers, want northing easting elevation", ErrSyntax, s, len(f))}
	}
	var c [3]float64
	for i, x := range f {
		v, err := units.ParseNumber(x)
		if err != nil {
			e := ErrSyntax
			if l := strings.ToLower(strings.TrimLeft(x, "+-")); l == "nan" || strings.HasPrefix(l, "inf") {
				e = ErrNonFinite
			}
			return &ParseError{Line: line, Element: "P", ID: idText, Err: fmt.Errorf("%w: %s %q is not a finite number",
				e, [3]string{"northing", "easting", "elevation"}[i], x)}
		}
		c[i] = v
	}
	rs := p.cur
	if _, dup := rs.index[id]; dup {
		return &ParseError{Line: line, Element: "P", ID: idText, Err: fmt.Errorf("%w: id %d appears twice in surface %q", ErrDuplicatePoint, id, rs.name)}
	}
	rs.index[id] = int32(len(rs.pts))
	rs.ids = append(rs.ids, id)
	rs.pts = append(rs.pts, geom.Vec3{X: c[1], Y: c[0], Z: c[2]})
	return nil
}

func (p *parser) face(t xml.StartElement, line int) error {
	p.nf++
	ord := "#" + strconv.Itoa(p.nf)
	s, err := p.text("F", line, ord)
	if err != nil {
		return err
	}
	if v, _ := attr(t, "i"); strings.TrimSpace(v) == "1" {
		p.cur.invisible++
		return nil
	}
	f := strings.Fields(s)
	if len(f) != 3 {
		return &ParseError{Line: line, Element: "F", ID: ord, Err: fmt.Errorf("%w: %q has %d point ids, want 3", ErrSyntax, s, len(f))}
	}
	rs := p.cur
	for _, x := range f {
		id, err := strconv.ParseInt(x, 10, 64)
		if err != nil {
			return &ParseError{Line: line, Element: "F", ID: ord, Err: fmt.Errorf("%w: point id %q is not an integer", ErrSyntax, x)}
		}
		i, ok := rs.index[id]
		if !ok {
			return &ParseError{Line: line, Element: "F", ID: ord, Err: fmt.Errorf(
				"%w: point %d is not among the %d points of surface %q", ErrUnknownPoint, id, len(rs.pts), rs.name)}
		}
		rs.faces = append(rs.faces, i)
	}
	rs.faceLines = append(rs.faceLines, line)
	return nil
}

func (p *parser) endSurface() error {
	rs := p.cur
	p.cur = nil
	switch {
	case !rs.hasDef:
		return &ParseError{Line: rs.line, Element: "Surface", ID: rs.name, Err: fmt.Errorf("%w: no <Definition>", ErrMissing)}
	case !rs.hasPnts:
		return &ParseError{Line: rs.line, Element: "Surface", ID: rs.name, Err: fmt.Errorf("%w: <Definition> has no <Pnts>", ErrMissing)}
	case !rs.hasFaces:
		return &ParseError{Line: rs.line, Element: "Surface", ID: rs.name, Err: fmt.Errorf("%w: <Definition> has no <Faces>", ErrMissing)}
	}
	rs.index = nil // no longer needed; free it before the next surface
	p.surfaces = append(p.surfaces, rs)
	return nil
}

// finish converts units and winds the faces, once the whole document (and
// so its <Units>, wherever it stood) has been read.
func (p *parser) finish() ([]Surface, error) {
	unit := p.units.Metres()
	out := make([]Surface, 0, len(p.surfaces))
	for _, rs := range p.surfaces {
		s := Surface{Name: rs.name, Description: rs.desc, Units: p.units, EPSG: p.epsg, IDs: rs.ids, Warnings: rs.warnings}
		if !p.hasUnits {
			s.Warnings = append(s.Warnings, "the document has no <Units>; coordinates taken in metres")
		}
		if rs.invisible > 0 {
			s.Warnings = append(s.Warnings, fmt.Sprintf("%d invisible faces (i=\"1\") skipped", rs.invisible))
		}
		v := rs.pts
		if unit != 1 {
			for i := range v {
				v[i] = geom.Vec3{X: v[i].X * unit, Y: v[i].Y * unit, Z: v[i].Z * unit}
			}
		}
		for i, x := range v {
			if !x.IsFinite() { // a huge number in feet can overflow to ±Inf in metres
				return nil, &ParseError{Element: "P", ID: strconv.FormatInt(rs.ids[i], 10), Err: fmt.Errorf(
					"%w: %v after conversion to metres", ErrNonFinite, x)}
			}
		}
		tri := make([]int32, 0, len(rs.faces))
		var degenerate []string
		for f := 0; f < len(rs.faces); f += 3 {
			a, b, c := rs.faces[f], rs.faces[f+1], rs.faces[f+2]
			switch robust.Orient2D(v[a].XY(), v[b].XY(), v[c].XY()) {
			case robust.Positive:
				tri = append(tri, a, b, c)
			case robust.Negative:
				tri = append(tri, a, c, b)
			default:
				if len(degenerate) < 5 {
					degenerate = append(degenerate, fmt.Sprintf("#%d (line %d)", f/3+1, rs.faceLines[f/3]))
				}
				if len(degenerate) == 5 {
					degenerate = append(degenerate, "…")
				}
			}
		}
		if n := len(rs.faces)/3 - len(tri)/3; n > 0 {
			s.Warnings = append(s.Warnings, fmt.Sprintf("%d faces of zero plan area dropped in surface %q: %s",
				n, rs.name, strings.Join(degenerate, ", ")))
		}
		s.Mesh = geom.TriMesh{V: v, T: tri}
		out = append(out, s)
	}
	return out, nil
}

// charsetReader lets documents declared as ISO-8859-1 (Latin-1) or
// US-ASCII be read; Go's decoder reads only UTF-8 by itself.
func charsetReader(label string, in io.Reader) (io.Reader, error) {
	switch strings.ToLower(label) {
	case "iso-8859-1", "latin1", "latin-1", "iso8859-1", "l1":
		return &latin1Reader{r: in}, nil
	case "us-ascii", "ascii":
		return in, nil
	}
	return nil, fmt.Errorf("encoding %q is not read (want UTF-8, ISO-8859-1 or US-ASCII)", label)
}

// latin1Reader converts ISO-8859-1 bytes to UTF-8 as it streams: every
// byte is the code point of the same value (ISO/IEC 8859-1 = the first 256
// code points of Unicode).
type latin1Reader struct {
	r    io.Reader
	in   [4096]byte
	pend []byte // converted bytes not yet returned
	err  error
}

func (l *latin1Reader) Read(p []byte) (int, error) {
	for len(l.pend) == 0 {
		if l.err != nil {
			return 0, l.err
		}
		n, err := l.r.Read(l.in[:])
		l.err = err
		out := l.pend[:0]
		for _, c := range l.in[:n] {
			out = utf8.AppendRune(out, rune(c))
		}
		l.pend = out
	}
	n := copy(p, l.pend)
	l.pend = l.pend[n:]
	return n, nil
}
