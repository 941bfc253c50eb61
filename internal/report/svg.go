package report

import (
	"bytes"
	"io"
	"math"
	"strconv"
	"strings"
	"unicode/utf8"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// The drawings are written by a small SVG writer of our own so that the
// output is byte-for-byte deterministic: elements come out in the order the
// drawing code emits them, attributes in the order given, every number with
// at most [svgDecimals] decimals, and no element carries a generated id (the
// map frame is clipped by a nested <svg> viewport, which needs no id).
//
// Drawing units are millimetres on paper: the root element has
// width="Wmm" height="Hmm" and viewBox="0 0 W H", so a drawing printed at
// 100 % keeps its stated scale.

// svgDecimals is the number of decimals written for every coordinate and
// length, in millimetres on paper: 0.01 mm is far below a printer's dot
// (0.04 mm at 600 dpi), so rounding is invisible yet keeps files small.
const svgDecimals = 2

// svgFont is the font list of every drawing: fonts installed with the
// operating system only (DejaVu on Debian, Liberation, Arial on other
// systems), never a downloaded font.
const svgFont = "DejaVu Sans, Liberation Sans, Arial, Helvetica, sans-serif"

// svgNamespace is the SVG namespace, written on standalone drawings only; a
// drawing inlined in HTML needs none (HTML Living Standard, "SVG" in the
// embedded-content section), and [HTML] strips it.
const svgNamespace = `xmlns="http://www.w3.org/2000/svg"`

// svgDoc accumulates one SVG document in memory; [svgDoc.writeTo] sends it
// in one write. Building in memory means a failure half-way through never
// leaves half a drawing in the output.
type svgDoc struct {
	b bytes.Buffer
}

// newSVGDoc starts a drawing of w × h millimetres.
func newSVGDoc(w, h float64) *svgDoc {
	d := &svgDoc{}
	d.b.WriteString(`<svg ` + svgNamespace + ` version="1.1" width="`)
	d.b.WriteString(svgNum(w))
	d.b.WriteString(`mm" height="`)
	d.b.WriteString(svgNum(h))
	d.b.WriteString(`mm" viewBox="0 0 `)
	d.b.WriteString(svgNum(w) + " " + svgNum(h))
	d.b.WriteString(`" font-family="` + svgFont + `">` + "\n")
	return d
}

// writeTo closes the root element and writes the document to w in one
// write.
func (d *svgDoc) writeTo(w io.Writer) error {
	d.b.WriteString("</svg>\n")
	_, err := w.Write(d.b.Bytes())
	return err
}

// open writes a start tag; attrs alternate name and (unescaped) value.
func (d *svgDoc) open(name string, attrs ...string) {
	d.tag(name, attrs)
	d.b.WriteString(">\n")
}

// close writes an end tag.
func (d *svgDoc) close(name string) {
	d.b.WriteString("</" + name + ">\n")
}

// leaf writes an empty element.
func (d *svgDoc) leaf(name string, attrs ...string) {
	d.tag(name, attrs)
	d.b.WriteString("/>\n")
}

// text writes a <text> element at (x, y) holding s.
func (d *svgDoc) text(x, y float64, s string, attrs ...string) {
	d.tag("text", append([]string{"x", svgNum(x), "y", svgNum(y)}, attrs...))
	d.b.WriteByte('>')
	d.b.WriteString(xmlEscape(s))
	d.b.WriteString("</text>\n")
}

func (d *svgDoc) tag(name string, attrs []string) {
	d.b.WriteByte('<')
	d.b.WriteString(name)
	for i := 0; i+1 < len(attrs); i += 2 {
		d.b.WriteByte(' ')
		d.b.WriteString(attrs[i])
		d.b.WriteString(`="`)
		d.b.WriteString(xmlEscape(attrs[i+1]))
		d.b.WriteByte('"')
	}
}

// svgNum formats v with at most [svgDecimals] decimals, trailing zeros
// trimmed and negative zero written as 0, so that equal drawings give equal
// bytes. Non-finite values (which validation keeps out) are written as 0.
func svgNum(v float64) string {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return "0"
	}
	s := strconv.FormatFloat(v, 'f', svgDecimals, 64)
	if strings.IndexByte(s, '.') >= 0 {
		s = strings.TrimRight(s, "0")
		s = strings.TrimSuffix(s, ".")
	}
	if s == "-0" {
		return "0"
	}
	return s
}

// pathData builds the d attribute of a <path>.
type pathData struct {
	b []byte
}

func (p *pathData) cmd(c byte, vs ...float64) {
	p.b = append(p.b, c)
	for i, v := range vs {
		if i > 0 {
			p.b = append(p.b, ' ')
		}
		p.b = append(p.b, svgNum(v)...)
	}
}

// moveTo, lineTo, hTo, vTo and closePath append the absolute commands M, L,
// H, V and Z.
func (p *pathData) moveTo(x, y float64) { p.cmd('M', x, y) }
func (p *pathData) lineTo(x, y float64) { p.cmd('L', x, y) }
func (p *pathData) hTo(x float64)       { p.cmd('H', x) }
func (p *pathData) vTo(y float64)       { p.cmd('V', y) }
func (p *pathData) closePath()          { p.b = append(p.b, 'Z') }
func (p *pathData) empty() bool         { return len(p.b) == 0 }
func (p *pathData) String() string      { return string(p.b) }

// xmlSanitize returns s with invalid UTF-8 replaced by U+FFFD and every
// character that XML 1.0 does not allow removed (XML 1.0, Fifth Edition,
// W3C 2008, §2.2 "Characters": Char ::= #x9 | #xA | #xD | [#x20-#xD7FF] |
// [#xE000-#xFFFD] | [#x10000-#x10FFFF]). Tabs and line breaks become spaces:
// drawing and report text is single-line.
func xmlSanitize(s string) string {
	clean := true
	for _, r := range s {
		if r == utf8.RuneError || !xmlChar(r) || r == '\t' || r == '\n' || r == '\r' {
			clean = false
			break
		}
	}
	if clean {
		return s
	}
	var b strings.Builder
	for i := 0; i < len(s); {
		r, n := utf8.DecodeRuneInString(s[i:])
		i += n
		switch {
		case r == utf8.RuneError && n <= 1:
			b.WriteRune('\uFFFD')
		case r == '\t' || r == '\n' || r == '\r':
			b.WriteByte(' ')
		case xmlChar(r):
			b.WriteRune(r)
		}
	}
	return b.String()
}

func xmlChar(r rune) bool {
	return r == 0x9 || r == 0xA || r == 0xD ||
		(r >= 0x20 && r <= 0xD7FF) || (r >= 0xE000 && r <= 0xFFFD) || (r >= 0x10000 && r <= 0x10FFFF)
}

// xmlEscape sanitizes s (see [xmlSanitize]), escapes the five characters
// that XML and HTML give meaning to, so that the result is safe both as
// element text and inside a double- or single-quoted attribute, and defuses
// anything that looks like a URL: "//" is written "/&#47;" and the colon
// after a URI scheme name (see [uriSchemes]) "&#58;". Readers see the same
// characters, but the drawings' and the report's source then holds no URL,
// which keeps the promise that they refer to nothing outside themselves
// easy to check. Text is never a link in any case.
func xmlEscape(s string) string {
	s = xmlSanitize(s)
	if !strings.ContainsAny(s, `&<>"':/`) {
		return s
	}
	var b strings.Builder
	for i := 0; i < len(s); i++ {
		switch c := s[i]; c {
		case '&':
			b.WriteString("&amp;")
		case '<':
			b.WriteString("&lt;")
		case '>':
			b.WriteString("&gt;")
		case '"':
			b.WriteString("&#34;")
		case '\'':
			b.WriteString("&#39;")
		case '/':
			if i > 0 && s[i-1] == '/' {
				b.WriteString("&#47;")
			} else {
				b.WriteByte(c)
			}
		case ':':
			if endsWithScheme(s[:i]) {
				b.WriteString("&#58;")
			} else {
				b.WriteByte(c)
			}
		default:
			b.WriteByte(c)
		}
	}
	return b.String()
}

// uriSchemes are the URI schemes whose "name:" is defused in text.
var uriSchemes = []string{"http", "https", "ftp", "file", "data", "javascript", "mailto", "ws", "wss"}

// endsWithScheme reports whether s ends with a word that is one of
// [uriSchemes] (case-insensitive).
func endsWithScheme(s string) bool {
	for _, sc := range uriSchemes {
		n := len(sc)
		if len(s) >= n && strings.EqualFold(s[len(s)-n:], sc) && (len(s) == n || !isLetter(s[len(s)-n-1])) {
			return true
		}
	}
	return false
}

func isLetter(c byte) bool { return c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z' }

// paperTransform maps local-frame metres to millimetres on paper at a scale
// of 1:Denom: a point c (local metres) lands at paper point P, and y is
// flipped so that +y (grid north) points up the sheet.
//
//	paper x = P.X + (x − C.X) · 1000/Denom
//	paper y = P.Y − (y − C.Y) · 1000/Denom
type paperTransform struct {
	C     geom.Vec2 // local point (m) drawn at P
	P     geom.Vec2 // paper point (mm)
	Denom float64   // scale denominator (1:Denom), > 0
}

// mmPerM returns the paper millimetres per metre on the ground.
func (t paperTransform) mmPerM() float64 { return 1000 / t.Denom }

// apply maps a local point (m) to paper (mm).
func (t paperTransform) apply(v geom.Vec2) geom.Vec2 {
	k := t.mmPerM()
	return geom.Vec2{X: t.P.X + (v.X-t.C.X)*k, Y: t.P.Y - (v.Y-t.C.Y)*k}
}

// inverse maps a paper point (mm) back to local metres.
func (t paperTransform) inverse(p geom.Vec2) geom.Vec2 {
	k := t.mmPerM()
	return geom.Vec2{X: t.C.X + (p.X-t.P.X)/k, Y: t.C.Y - (p.Y-t.P.Y)/k}
}

// svgMinStepMM is the shortest step kept when a polyline is written on
// paper: vertices closer than 0.1 mm to the last kept one are dropped. The
// thinnest pen in the drawings is 0.13 mm (the finest ISO 128 line width,
// from memory), so a 0.1 mm step is not visible, while dense contour lines
// shrink many times over.
const svgMinStepMM = 0.1

// polyPath appends pts (already on paper) as one subpath, dropping vertices
// closer than [svgMinStepMM] to the last kept one (the last vertex is always
// kept). closed adds Z.
func polyPath(p *pathData, pts []geom.Vec2, closed bool) {
	if len(pts) == 0 {
		return
	}
	const min2 = svgMinStepMM * svgMinStepMM
	last := pts[0]
	p.moveTo(last.X, last.Y)
	n := 1
	for i := 1; i < len(pts); i++ {
		q := pts[i]
		if i < len(pts)-1 && q.DistanceSquared(last) < min2 {
			continue
		}
		p.lineTo(q.X, q.Y)
		last = q
		n++
	}
	if closed && n > 2 {
		p.closePath()
	}
}

// niceStep returns the smallest value of the form {1, 2, 2.5, 5} × 10^k
// that is at least x (x > 0); for x ≤ 0 or non-finite x it returns 1.
func niceStep(x float64) float64 {
	if !(x > 0) || math.IsInf(x, 0) {
		return 1
	}
	e := math.Floor(math.Log10(x))
	base := math.Pow(10, e)
	for _, m := range []float64{1, 2, 2.5, 5, 10} {
		if v := m * base; v >= x*(1-niceTol) {
			return v
		}
	}
	return 10 * base
}

// svgTextWidth estimates the width in mm of s set at size mm, taking 0.6 em
// per character: DejaVu Sans, the widest of the fonts in [svgFont], averages
// a little under 0.6 em for mixed text (estimate, not measured per glyph).
// Layout uses it to wrap notes and size boxes.
func svgTextWidth(s string, size float64) float64 {
	return float64(utf8.RuneCountInString(s)) * size * 0.6
}

// wrapText breaks s into lines of at most width mm at font size mm,
// breaking at spaces (a word longer than a line is cut).
func wrapText(s string, width, size float64) []string {
	maxRunes := int(width / (size * 0.6))
	if maxRunes < 4 {
		maxRunes = 4
	}
	var lines []string
	var cur []rune
	for _, word := range strings.Fields(xmlSanitize(s)) {
		w := []rune(word)
		for len(w) > maxRunes {
			if len(cur) > 0 {
				lines = append(lines, string(cur))
				cur = nil
			}
			lines = append(lines, string(w[:maxRunes]))
			w = w[maxRunes:]
		}
		switch {
		case len(cur) == 0:
			cur = append(cur, w...)
		case len(cur)+1+len(w) <= maxRunes:
			cur = append(cur, ' ')
			cur = append(cur, w...)
		default:
			lines = append(lines, string(cur))
			cur = append([]rune(nil), w...)
		}
	}
	if len(cur) > 0 {
		lines = append(lines, string(cur))
	}
	return lines
}
