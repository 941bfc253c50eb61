package survey

import (
	"strings"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// breaklineCode returns the string name a description code joins under:
// the code itself (upper case) when it is one of codes, or one of codes
// followed by digits only ("BL1", "BL12"), compared case-insensitively.
func breaklineCode(code string, codes []string) (name, base string, ok bool) {
	u := strings.ToUpper(code)
	for _, c := range codes {
		c = strings.ToUpper(strings.TrimSpace(c))
		if c == "" || !strings.HasPrefix(u, c) {
			continue
		}
		if rest := u[len(c):]; strings.Trim(rest, "0123456789") == "" {
			return u, c, true
		}
	}
	return "", "", false
}

// codedBreaklines joins the points of one file whose code is a breakline
// code into breaklines, one string per code per file, in point (file)
// order; BL1 and BL2 are separate strings. Points without elevation are
// left out of the strings. A string of fewer than two points is dropped
// with a warning. The points stay points as well.
func codedBreaklines(pts []Point, codes []string, f *rawFile) []Line {
	var out []Line
	index := map[string]int{}
	for _, p := range pts {
		name, base, ok := breaklineCode(CodeOf(p.Code), codes)
		if !ok || !p.HasZ() {
			continue
		}
		i, seen := index[name]
		if !seen {
			i = len(out)
			index[name] = i
			out = append(out, Line{Name: name, Code: base, File: p.File, Line: p.Line})
		}
		out[i].Pts = append(out[i].Pts, p.P)
	}
	kept := out[:0]
	for _, l := range out {
		if len(l.Pts) < 2 {
			f.warn(l.Line, "breakline %s has only one point: not used as a breakline", l.Name)
			continue
		}
		kept = append(kept, l)
	}
	return kept
}

// Length returns the plan length of l in metres.
func (l Line) Length() float64 {
	pl := make(geom.Polyline, len(l.Pts))
	for i, p := range l.Pts {
		pl[i] = p.XY()
	}
	return pl.Length()
}
