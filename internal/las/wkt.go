package las

import (
	"strconv"
	"strings"
)

// wktInfo is what this reader takes from an OGC WKT coordinate system: the
// EPSG code of the horizontal system (its top-level AUTHORITY or ID), its
// linear unit and, for a compound system, the vertical unit.
type wktInfo struct {
	epsg       int
	unitM      float64 // 0 when not found
	vertUnitM  float64 // 0 when not found
	geographic bool
}

// wktNode is one KEYWORD[arg, ...] element; args are quoted strings (kept
// without quotes), bare numbers or words, or nested nodes.
type wktNode struct {
	key  string
	args []wktArg
}

type wktArg struct {
	text string
	node *wktNode
}

// maxWKTDepth bounds nesting so that hostile input cannot exhaust the stack;
// real WKT nests about six deep (COMPD_CS > PROJCS > GEOGCS > DATUM >
// SPHEROID > AUTHORITY).
const maxWKTDepth = 32

// parseWKT extracts the EPSG code and units from WKT 1 (OGC 01-009) or WKT 2
// (ISO 19162) text. It is lenient: anything it cannot parse yields the zero
// wktInfo, since the WKT is only a second source beside the GeoKeys.
func parseWKT(s string) wktInfo {
	p := wktParser{s: s}
	root, ok := p.node(0)
	if !ok {
		return wktInfo{}
	}
	var info wktInfo
	h := root
	switch root.key {
	case "COMPD_CS", "COMPOUNDCRS":
		h = nil
		for _, a := range root.args {
			if a.node == nil {
				continue
			}
			switch a.node.key {
			case "PROJCS", "PROJCRS", "PROJECTEDCRS", "GEOGCS", "GEOGCRS", "GEODCRS", "GEOGRAPHICCRS":
				if h == nil {
					h = a.node
				}
			case "VERT_CS", "VERTCRS", "VERTICALCRS":
				info.vertUnitM = a.node.unit()
			}
		}
		if h == nil {
			return info
		}
	}
	switch h.key {
	case "PROJCS", "PROJCRS", "PROJECTEDCRS":
		info.unitM = h.unit()
	case "GEOGCS", "GEOGCRS", "GEODCRS", "GEOGRAPHICCRS":
		info.geographic = true
	default:
		return info
	}
	info.epsg = h.epsg()
	return info
}

// unit returns the conversion factor of the node's own UNIT or LENGTHUNIT
// child (for WKT 2, possibly inside its first AXIS), 0 if none.
func (n *wktNode) unit() float64 {
	for _, a := range n.args {
		if a.node != nil && (a.node.key == "UNIT" || a.node.key == "LENGTHUNIT") && len(a.node.args) >= 2 {
			if v, err := strconv.ParseFloat(a.node.args[1].text, 64); err == nil && v > 0 && isFinite(v) {
				return v
			}
		}
	}
	for _, a := range n.args {
		if a.node != nil && a.node.key == "AXIS" {
			return a.node.unit()
		}
	}
	return 0
}

// epsg returns the code of the node's own AUTHORITY["EPSG", "n"] or
// ID["EPSG", n] child, 0 if none.
func (n *wktNode) epsg() int {
	for _, a := range n.args {
		if a.node != nil && (a.node.key == "AUTHORITY" || a.node.key == "ID") && len(a.node.args) >= 2 &&
			strings.EqualFold(a.node.args[0].text, "EPSG") {
			if v, err := strconv.Atoi(strings.TrimSpace(a.node.args[1].text)); err == nil && v > 0 && v <= 32766 {
				return v
			}
		}
	}
	return 0
}

type wktParser struct {
	s string
	i int
}

func (p *wktParser) space() {
	for p.i < len(p.s) && strings.IndexByte(" \t\r\n", p.s[p.i]) >= 0 {
		p.i++
	}
}

func (p *wktParser) word() string {
	start := p.i
	for p.i < len(p.s) && strings.IndexByte("[](),\" \t\r\n", p.s[p.i]) < 0 {
		p.i++
	}
	return p.s[start:p.i]
}

// node parses KEYWORD[args] (or parentheses).
func (p *wktParser) node(depth int) (*wktNode, bool) {
	if depth > maxWKTDepth {
		return nil, false
	}
	p.space()
	key := strings.ToUpper(p.word())
	p.space()
	if key == "" || p.i >= len(p.s) || (p.s[p.i] != '[' && p.s[p.i] != '(') {
		return nil, false
	}
	p.i++
	n := &wktNode{key: key}
	for {
		p.space()
		if p.i >= len(p.s) {
			return nil, false
		}
		switch c := p.s[p.i]; {
		case c == ']' || c == ')':
			p.i++
			return n, true
		case c == ',':
			p.i++
			continue
		case c == '"':
			p.i++
			var b strings.Builder
			for {
				if p.i >= len(p.s) {
					return nil, false
				}
				if p.s[p.i] == '"' {
					if p.i+1 < len(p.s) && p.s[p.i+1] == '"' { // "" is an escaped quote
						b.WriteByte('"')
						p.i += 2
						continue
					}
					p.i++
					break
				}
				b.WriteByte(p.s[p.i])
				p.i++
			}
			n.args = append(n.args, wktArg{text: b.String()})
		default:
			save := p.i
			w := p.word()
			p.space()
			if p.i < len(p.s) && (p.s[p.i] == '[' || p.s[p.i] == '(') {
				p.i = save
				child, ok := p.node(depth + 1)
				if !ok {
					return nil, false
				}
				n.args = append(n.args, wktArg{node: child})
				continue
			}
			if w == "" {
				return nil, false // a stray character
			}
			n.args = append(n.args, wktArg{text: w})
		}
	}
}
