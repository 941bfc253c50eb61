package report

import (
	"bytes"
	"encoding/xml"
	"errors"
	"io"
	"math"
	"strconv"
	"strings"
	"testing"
	"unicode/utf8"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/units"
)

// xmlNode is an element parsed by encoding/xml (the standard library's XML
// 1.0 parser, our outside reference for well-formedness).
type xmlNode struct {
	Name string
	Attr map[string]string
	Text string
	Kids []*xmlNode
}

// parseXML parses data strictly into a tree, failing the test when it is
// not well-formed XML.
func parseXML(tb testing.TB, data []byte) *xmlNode {
	tb.Helper()
	root, err := parseXMLErr(data)
	if err != nil {
		tb.Fatalf("not well-formed XML: %v", err)
	}
	return root
}

func parseXMLErr(data []byte) (*xmlNode, error) {
	dec := xml.NewDecoder(bytes.NewReader(data))
	dec.Strict = true
	var stack []*xmlNode
	var root *xmlNode
	for {
		tok, err := dec.Token()
		if errors.Is(err, io.EOF) {
			break
		}
		if err != nil {
			return nil, err
		}
		switch t := tok.(type) {
		case xml.StartElement:
			n := &xmlNode{Name: t.Name.Local, Attr: map[string]string{}}
			for _, a := range t.Attr {
				n.Attr[a.Name.Local] = a.Value
			}
			if len(stack) > 0 {
				p := stack[len(stack)-1]
				p.Kids = append(p.Kids, n)
			} else if root == nil {
				root = n
			}
			stack = append(stack, n)
		case xml.EndElement:
			stack = stack[:len(stack)-1]
		case xml.CharData:
			if len(stack) > 0 {
				stack[len(stack)-1].Text += string(t)
			}
		}
	}
	if root == nil {
		return nil, errors.New("no root element")
	}
	return root, nil
}

// walk calls f on n and every element under it, depth first.
func (n *xmlNode) walk(f func(*xmlNode)) {
	f(n)
	for _, k := range n.Kids {
		k.walk(f)
	}
}

// find returns every element under n (n included) for which ok is true.
func (n *xmlNode) find(ok func(*xmlNode) bool) []*xmlNode {
	var out []*xmlNode
	n.walk(func(m *xmlNode) {
		if ok(m) {
			out = append(out, m)
		}
	})
	return out
}

// texts returns the text of every <text> element under n.
func (n *xmlNode) texts() []string {
	var out []string
	for _, t := range n.find(func(m *xmlNode) bool { return m.Name == "text" }) {
		out = append(out, t.Text)
	}
	return out
}

func TestXMLEscape(t *testing.T) {
	// Allowed characters and the five escapes: XML 1.0 (Fifth Edition), §2.2
	// "Characters" and §2.4 "Character Data and Markup".
	tests := []struct {
		name, in, want string
	}{
		{"plain", "Koi pond", "Koi pond"},
		{"markup", `a<b & "c" 'd'>`, "a&lt;b &amp; &#34;c&#34; &#39;d&#39;&gt;"},
		{"control characters dropped", "a\x00b\x1bc\x7f", "abc\x7f"},
		{"non-characters dropped", "a\uFFFEb\uFFFFc", "abc"},
		{"line breaks become spaces", "a\nb\tc\rd", "a b c d"},
		{"invalid UTF-8 replaced", "a\xffb", "a\uFFFDb"},
		{"unicode kept", "Ø 3 m² – ½", "Ø 3 m² – ½"},
		{"url defused", "see https://example.org/x", "see https&#58;/&#47;example.org/x"},
		{"scheme case-insensitive", "HTTP:x", "HTTP&#58;x"},
		{"colon elsewhere kept", "scale 1:200; Note: dig", "scale 1:200; Note: dig"},
		{"scheme inside a word kept", "xhttp:y", "xhttp:y"},
		{"single slash kept", "cut/fill", "cut/fill"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			if got := xmlEscape(tc.in); got != tc.want {
				t.Errorf("xmlEscape(%q) = %q, want %q", tc.in, got, tc.want)
			}
		})
	}
}

// FuzzXMLEscape checks that any text, escaped, parses back (encoding/xml)
// to the sanitized text, both as element text and as an attribute value,
// and that the escaped form holds no URL.
func FuzzXMLEscape(f *testing.F) {
	for _, s := range []string{"", "Koi pond", `<&>"'`, "a\x00b", "\xff\xfe", "http://x//y", "1:200", "]]>", "--"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		esc := xmlEscape(s)
		doc := []byte(`<t a="` + esc + `">` + esc + `</t>`)
		n, err := parseXMLErr(doc)
		if err != nil {
			t.Fatalf("xmlEscape(%q) = %q does not parse: %v", s, esc, err)
		}
		want := xmlSanitize(s)
		if n.Text != want || n.Attr["a"] != want {
			t.Errorf("xmlEscape(%q) parses back to text %q, attribute %q; want %q", s, n.Text, n.Attr["a"], want)
		}
		low := strings.ToLower(esc)
		if strings.Contains(esc, "//") || hasScheme(low) {
			t.Errorf("xmlEscape(%q) = %q still holds a URL", s, esc)
		}
		if !utf8.ValidString(esc) {
			t.Errorf("xmlEscape(%q) = %q is not valid UTF-8", s, esc)
		}
	})
}

func TestSVGNum(t *testing.T) {
	tests := []struct {
		in   float64
		want string
	}{
		{0, "0"}, {math.Copysign(0, -1), "0"}, {-0.001, "0"}, {1.5, "1.5"}, {2.25, "2.25"}, {12, "12"},
		{-3.14159, "-3.14"}, {1e6, "1000000"}, {0.125, "0.12"}, {0.135, "0.14"}, {math.NaN(), "0"}, {math.Inf(1), "0"},
	}
	for _, tc := range tests {
		if got := svgNum(tc.in); got != tc.want {
			t.Errorf("svgNum(%v) = %q, want %q", tc.in, got, tc.want)
		}
	}
}

func TestPaperTransform(t *testing.T) {
	// A scale of 1:200 draws 1 m as 1000/200 = 5 mm (definition of a
	// representative fraction); +y (grid north) points up the sheet, which
	// is −y in SVG, whose y axis points down (SVG 1.1, §7.3 "The initial
	// coordinate system").
	tr := paperTransform{C: geom.Vec2{X: 10, Y: 20}, P: geom.Vec2{X: 90, Y: 70}, Denom: 200}
	tests := []struct {
		local, paper geom.Vec2
	}{
		{geom.Vec2{X: 10, Y: 20}, geom.Vec2{X: 90, Y: 70}},
		{geom.Vec2{X: 11, Y: 20}, geom.Vec2{X: 95, Y: 70}},
		{geom.Vec2{X: 10, Y: 21}, geom.Vec2{X: 90, Y: 65}},
		{geom.Vec2{X: 0, Y: 0}, geom.Vec2{X: 40, Y: 170}},
	}
	for _, tc := range tests {
		got := tr.apply(tc.local)
		if got.Distance(tc.paper) > 1e-12 {
			t.Errorf("apply(%v) = %v, want %v", tc.local, got, tc.paper)
		}
		if back := tr.inverse(got); back.Distance(tc.local) > 1e-12 {
			t.Errorf("inverse(apply(%v)) = %v", tc.local, back)
		}
	}
}

func TestStandardScale(t *testing.T) {
	// Metric: the 1-2-5 series of ISO 5455 (from memory) with 1:25, 1:250
	// and 1:2500. Feet: engineer's scale "1 in = N ft" is 1:(12·N), since
	// a foot is 12 inches exactly (NIST Handbook 44, Appendix C).
	tests := []struct {
		need float64
		sys  units.System
		want float64
	}{
		{150, units.Metres, 200},
		{200, units.Metres, 200},
		{201, units.Metres, 250},
		{9, units.Metres, 10},
		{60000, units.Metres, 100000},
		{130, units.Feet, 240},
		{60, units.Feet, 60},
		{61, units.USFeet, 96},
		{0, units.Metres, 10},
	}
	for _, tc := range tests {
		if got := standardScale(tc.need, tc.sys); got != tc.want {
			t.Errorf("standardScale(%v, %v) = %v, want %v", tc.need, tc.sys, got, tc.want)
		}
	}
	labels := []struct {
		denom float64
		sys   units.System
		want  string
	}{
		{240, units.Feet, "1 in = 20 ft (1:240)"},
		{96, units.USFeet, "1 in = 8 ft (1:96)"},
		{200, units.Metres, "1:200"},
		{250, units.Feet, "1:250"},
	}
	for _, tc := range labels {
		if got := scaleLabel(tc.denom, tc.sys); got != tc.want {
			t.Errorf("scaleLabel(%v, %v) = %q, want %q", tc.denom, tc.sys, got, tc.want)
		}
	}
}

func TestNiceStep(t *testing.T) {
	tests := []struct{ in, step, floor float64 }{
		{0.7, 1, 0.5}, {1, 1, 1}, {1.2, 2, 1}, {2.2, 2.5, 2}, {3, 5, 2.5}, {7, 10, 5}, {0.03, 0.05, 0.025}, {31.5, 50, 25},
	}
	for _, tc := range tests {
		if got := niceStep(tc.in); math.Abs(got-tc.step) > 1e-12*tc.step {
			t.Errorf("niceStep(%v) = %v, want %v", tc.in, got, tc.step)
		}
		if got := niceFloor(tc.in); math.Abs(got-tc.floor) > 1e-12*tc.floor {
			t.Errorf("niceFloor(%v) = %v, want %v", tc.in, got, tc.floor)
		}
	}
}

func TestWrapText(t *testing.T) {
	// At 2 mm type a 12 mm line holds 12/(2·0.6) = 10 characters.
	got := wrapText("dig the deep zone first then shelves", 12, 2)
	want := []string{"dig the", "deep zone", "first then", "shelves"}
	if strings.Join(got, "|") != strings.Join(want, "|") {
		t.Errorf("wrapText = %q, want %q", got, want)
	}
	long := wrapText("aaaaaaaaaaaaaaaaaaaaaaaaa", 12, 2)
	for _, l := range long {
		if n := utf8.RuneCountInString(l); n > 10 {
			t.Errorf("wrapText line %q has %d characters, want ≤ 10", l, n)
		}
	}
}

// pathRects returns the rectangles of a path written as "M x y H x V y H x
// Z" runs (the depth map's form) as boxes in paper mm.
func pathRects(tb testing.TB, d string) []geom.Box {
	tb.Helper()
	var out []geom.Box
	for _, sub := range strings.Split(d, "Z") {
		if sub == "" {
			continue
		}
		var x0, y0, x1, y1, x2 float64
		if _, err := fmtSscanPath(sub, &x0, &y0, &x1, &y1, &x2); err != nil {
			tb.Fatalf("path %q: %v", sub, err)
		}
		out = append(out, geom.Box{Min: geom.Vec2{X: math.Min(x0, x1), Y: math.Min(y0, y1)}, Max: geom.Vec2{X: math.Max(x0, x1), Y: math.Max(y0, y1)}})
	}
	return out
}

// fmtSscanPath reads "M x0 y0 H x1 V y1 H x2".
func fmtSscanPath(s string, x0, y0, x1, y1, x2 *float64) (int, error) {
	s = strings.NewReplacer("M", " M ", "H", " H ", "V", " V ").Replace(s)
	f := strings.Fields(s)
	if len(f) != 9 || f[0] != "M" || f[3] != "H" || f[5] != "V" || f[7] != "H" {
		return 0, errors.New("not a rectangle run")
	}
	vals := []*float64{x0, y0, x1, y1, x2}
	idx := []int{1, 2, 4, 6, 8}
	for i, k := range idx {
		v, err := strconv.ParseFloat(f[k], 64)
		if err != nil {
			return i, err
		}
		*vals[i] = v
	}
	return 5, nil
}

// polygonsArea returns the total shoelace area (paper mm²) of a path made
// of "M … L … Z" subpaths with absolute coordinates.
func polygonsArea(tb testing.TB, d string) float64 {
	tb.Helper()
	var total float64
	for _, sub := range strings.Split(d, "Z") {
		sub = strings.TrimSpace(sub)
		if sub == "" {
			continue
		}
		f := strings.Fields(strings.NewReplacer("M", " ", "L", " ").Replace(sub))
		if len(f)%2 != 0 {
			tb.Fatalf("odd coordinate count in %q", sub)
		}
		var ring geom.Ring
		for i := 0; i < len(f); i += 2 {
			x, err1 := strconv.ParseFloat(f[i], 64)
			y, err2 := strconv.ParseFloat(f[i+1], 64)
			if err1 != nil || err2 != nil {
				tb.Fatalf("bad coordinates in %q", sub)
			}
			ring = append(ring, geom.Vec2{X: x, Y: y})
		}
		total += math.Abs(ring.Area())
	}
	return total
}
