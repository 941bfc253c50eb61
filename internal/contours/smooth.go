package contours

import (
	"math"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// smoothBand is the largest departure from the line's own level, as a
// fraction of the contour interval, that a smoothing cut may reach. Any value
// below 1 keeps a smoothed line off the neighbouring levels; half an interval
// leaves a visible gap between neighbours on steep banks.
const smoothBand = 0.5

// smoothEdgeMargin is how close to either end of a mesh edge, as a fraction
// of its length, a cut may cross it. It keeps the float test "the cut crosses
// the edge inside it" clear of round-off at the edge's end vertices, where the
// cut would leave the two triangles around the corner.
const smoothEdgeMargin = 1.0 / 1024

// smoothSideMargin is how far, as a fraction of |edge|·|cut|, each end of a
// cut must be from the line of the mesh edge it crosses (the cross products
// in ok measure it). Both ends lie in the triangles on either side of the
// edge, within a triangle's size of it, so each cross product is off by at
// most about 4ε·|edge|² (ε = 2⁻⁵³, three roundings plus the differences);
// that is below the margin whenever the cut is longer than
// smoothMinCut·|edge|, and shorter cuts are not made.
const (
	smoothSideMargin = 1e-9
	smoothMinCut     = 1e-6
)

// smoothFractions are the corner cuts tried in turn, as fractions of each
// neighbouring segment measured from the corner; a quarter is Chaikin's.
// Each is at most a quarter, so the cuts of two consecutive corners never
// overlap.
var smoothFractions = [...]float64{1.0 / 4, 1.0 / 8, 1.0 / 16}

// smoother cuts the corners of the lines of one level (see [Trace]).
type smoother struct {
	m     *mesh
	level float64
	band  float64 // largest |z - level| allowed along a cut, m
}

// smooth appends the smoothed positions of seq (a cleaned line; a ring
// without its closing point) to buf.
func (s *smoother) smooth(buf []geom.Vec2, seq []point, closed bool) []geom.Vec2 {
	n := len(seq)
	for i, q := range seq {
		if q.h < 0 || (!closed && (i == 0 || i == n-1)) {
			buf = append(buf, q.p)
			continue
		}
		prev, next := seq[(i+n-1)%n].p, seq[(i+1)%n].p
		cut := false
		for _, f := range smoothFractions {
			a := q.p.Add(prev.Sub(q.p).Scale(f))
			b := q.p.Add(next.Sub(q.p).Scale(f))
			if s.ok(q.h, a, b) {
				buf = append(buf, a, b)
				cut = true
				break
			}
		}
		if !cut {
			buf = append(buf, q.p)
		}
	}
	return buf
}

// ok reports whether the cut from a to b may replace the corner on
// half-edge h: a and b lie strictly on opposite sides of the edge's line,
// the cut crosses the edge away from its ends, and the surface there is
// within the band of the level. The surface is linear along the edge and on
// each triangle, so the cut then stays within the band everywhere.
func (s *smoother) ok(h int32, a, b geom.Vec2) bool {
	p, q := s.m.v[s.m.ct[h]], s.m.v[s.m.ct[next(h)]]
	e := q.XY().Sub(p.XY())
	da := e.Cross(a.Sub(p.XY()))
	db := e.Cross(b.Sub(p.XY()))
	if !(da < 0 && db > 0 || da > 0 && db < 0) {
		return false
	}
	el, cl := e.Norm(), b.Sub(a).Norm()
	if cl < smoothMinCut*el {
		return false
	}
	if m := smoothSideMargin * el * cl; math.Abs(da) <= m || math.Abs(db) <= m {
		return false
	}
	x := a.Lerp(b, da/(da-db)) // where the cut meets the edge's line
	u := x.Sub(p.XY()).Dot(e) / e.Norm2()
	if !(u > smoothEdgeMargin && u < 1-smoothEdgeMargin) {
		return false
	}
	z := p.Z + u*(q.Z-p.Z)
	d := z - s.level
	return d < s.band && d > -s.band
}
