package takeoff

import (
	"cmp"
	"fmt"
	"math"
	"slices"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// Line is a contour line as traced on a mesh: its points in order, and
// whether it closes on itself (a closed line may or may not repeat its first
// point at the end).
type Line struct {
	Pts    []geom.Vec2
	Closed bool
}

// Loop is one piece of the shoreline after measurement: a closed loop (or
// an open line where the water reaches the edge of the mesh), counter-
// clockwise in plan, starting at its westernmost point (least x, then least
// y). Chainage along the loop runs from that point in that direction.
type Loop struct {
	Pts     []geom.Vec2 `json:"-"`
	Closed  bool        `json:"closed"`
	LengthM float64     `json:"length_m"`
	// AreaM2 is the plan area enclosed by a closed loop (0 when open).
	AreaM2 float64 `json:"area_m2"`
	// Island reports whether the loop lies inside another loop (the edge of
	// an island rather than of the pond).
	Island bool `json:"island"`
}

// Shoreline rule-of-thumb factors: the shoreline of a compact oval pond is
// 0.75 to 0.85 of the perimeter of its bounding rectangle (common practice,
// check-values.md §7; a circle in its square gives π/4 ≈ 0.785).
const (
	DefaultShoreFactorLow  = 0.75
	DefaultShoreFactorHigh = 0.85
)

// ShorelineOptions configures the shoreline rule of thumb; zero factors mean
// the defaults.
type ShorelineOptions struct {
	FactorLow, FactorHigh float64
}

// ShorelineResult is the water line measured on the design.
type ShorelineResult struct {
	// LengthM is the total length of the water line, islands included.
	LengthM float64 `json:"length_m"`
	// Loops is the number of separate pieces of water line.
	Loops int `json:"loops"`
	// LoopDetail gives each piece, longest first: loop numbers for stone
	// stretches index this list.
	LoopDetail []Loop `json:"loop_detail"`
	// WaterAreaM2 is the plan area of the water surface.
	WaterAreaM2 float64 `json:"water_area_m2"`
	// BoundingRect is the minimum-area rectangle around the water line and
	// BoundingRectPerimeterM its perimeter.
	BoundingRect           Rect    `json:"bounding_rect"`
	BoundingRectPerimeterM float64 `json:"bounding_rect_perimeter_m"`
	// RuleOfThumbM is the middle of the rule-of-thumb range, RuleOfThumbLowM
	// and RuleOfThumbHighM its ends: factor × BoundingRectPerimeterM.
	RuleOfThumbM     float64  `json:"rule_of_thumb_m"`
	RuleOfThumbLowM  float64  `json:"rule_of_thumb_low_m"`
	RuleOfThumbHighM float64  `json:"rule_of_thumb_high_m"`
	Notes            []string `json:"notes"`
}

// ShorelineInput is what the shoreline takeoff measures.
type ShorelineInput struct {
	// Lines are the contour lines of the bowl mesh at the water level.
	Lines []Line
	// WaterLevelM is the level they were traced at.
	WaterLevelM float64
	// Mesh is the bowl mesh: the water area when a line is open, and the
	// cell size for moving points onto the analytic bowl.
	Mesh geom.TriMesh
	// Bowl and Zones, when given, move the contour points onto the
	// analytic bowl and put vertical-wall corners back into the line.
	Bowl  Bowl
	Zones []Zone
}

// MeasureShoreline measures the water line. Each contour line becomes a
// [Loop] (closing point dropped, wound counter-clockwise, started at its
// westernmost point); with an analytic bowl its points near walls steeper
// than the lattice resolves are first moved onto the level along the
// line's normal, within 1.5 mesh cells, and corners of vertical-walled
// zones that lie on the water line are put back. Loops are sorted longest first. The water area is the nested area
// of the closed loops (islands subtracted) when every loop closes, else the
// plan area of the mesh below the water level.
func MeasureShoreline(in ShorelineInput, o ShorelineOptions) (ShorelineResult, error) {
	var res ShorelineResult
	lo, hi := o.FactorLow, o.FactorHigh
	if lo == 0 {
		lo = DefaultShoreFactorLow
	}
	if hi == 0 {
		hi = DefaultShoreFactorHigh
	}
	if !(lo > 0) || !(hi >= lo) || math.IsInf(hi, 0) {
		return res, fmt.Errorf("%w: shoreline factors must satisfy 0 < low <= high, got %g and %g", ErrOption, lo, hi)
	}
	cell := meshCell(in.Mesh)
	var corners []geom.Vec2
	var boxes []geom.Box
	if in.Bowl != nil {
		corners = wallCorners(in.Bowl, in.Zones, in.WaterLevelM)
		boxes = steepBoxes(in.Zones, in.WaterLevelM, in.WaterLevelM, cell, 1.5*cell)
	}
	var loops []Loop
	for _, ln := range in.Lines {
		pts := slices.Clone(ln.Pts)
		closed := ln.Closed
		if closed && len(pts) > 1 && pts[0] == pts[len(pts)-1] {
			pts = pts[:len(pts)-1]
		}
		pts = slices.Compact(pts)
		if len(pts) < 2 || (closed && len(pts) < 3) {
			continue
		}
		if in.Bowl != nil && cell > 0 {
			pts = snapLine(in.Bowl, pts, closed, in.WaterLevelM, 1.5*cell, boxes)
			if closed {
				pts = insertCorners(pts, corners, 1.5*cell)
			}
		}
		loops = append(loops, canonicalLoop(pts, closed))
	}
	allClosed := true
	for i := range loops {
		if !loops[i].Closed {
			allClosed = false
		}
	}
	// Islands: loops inside an odd number of other loops.
	for i := range loops {
		if !loops[i].Closed {
			continue
		}
		depth := 0
		for j := range loops {
			if i != j && loops[j].Closed && geom.Ring(loops[j].Pts).Contains(loops[i].Pts[0]) {
				depth++
			}
		}
		loops[i].Island = depth%2 == 1
	}
	slices.SortStableFunc(loops, func(a, b Loop) int {
		if c := cmp.Compare(b.LengthM, a.LengthM); c != 0 {
			return c
		}
		if c := cmp.Compare(a.Pts[0].X, b.Pts[0].X); c != 0 {
			return c
		}
		return cmp.Compare(a.Pts[0].Y, b.Pts[0].Y)
	})
	var total, area geom.Sum
	var all []geom.Vec2
	for _, l := range loops {
		total.Add(l.LengthM)
		if l.Island {
			area.Add(-l.AreaM2)
		} else {
			area.Add(l.AreaM2)
		}
		all = append(all, l.Pts...)
	}
	res.LoopDetail = loops
	res.Loops = len(loops)
	res.LengthM = total.Value()
	if allClosed && len(loops) > 0 {
		res.WaterAreaM2 = area.Value()
	} else {
		res.WaterAreaM2 = PlanArea(in.Mesh, in.WaterLevelM)
	}
	res.BoundingRect = MinAreaRect(all)
	res.BoundingRectPerimeterM = res.BoundingRect.PerimeterM()
	res.RuleOfThumbLowM = lo * res.BoundingRectPerimeterM
	res.RuleOfThumbHighM = hi * res.BoundingRectPerimeterM
	res.RuleOfThumbM = (lo + hi) / 2 * res.BoundingRectPerimeterM
	res.Notes = []string{
		fmt.Sprintf("shoreline: the contour of the bowl at the water level %.3f m, islands included, each loop measured separately", in.WaterLevelM),
		fmt.Sprintf("rule of thumb: %.2f to %.2f × the perimeter of the water line's minimum-area bounding rectangle (common practice)", lo, hi),
	}
	if !allClosed {
		res.Notes = append(res.Notes, "the water line reaches the edge of the mesh: the water area is measured on the mesh")
	}
	return res, nil
}

// canonicalLoop winds a closed loop counter-clockwise and starts it at its
// westernmost point; an open line starts at its westernmost end.
func canonicalLoop(pts []geom.Vec2, closed bool) Loop {
	west := func(a, b geom.Vec2) bool { return a.X < b.X || (a.X == b.X && a.Y < b.Y) }
	if !closed {
		if west(pts[len(pts)-1], pts[0]) {
			slices.Reverse(pts)
		}
		return Loop{Pts: pts, LengthM: geom.Polyline(pts).Length()}
	}
	r := geom.Ring(pts)
	if r.Area() < 0 {
		slices.Reverse(pts)
	}
	k := 0
	for i, p := range pts {
		if west(p, pts[k]) {
			k = i
		}
	}
	pts = append(pts[k:], pts[:k]...)
	r = geom.Ring(pts)
	return Loop{Pts: pts, Closed: true, LengthM: r.Perimeter(), AreaM2: r.Area()}
}

// snapLine moves each point of a contour line inside one of boxes onto
// bowl = level along the line's normal at that point (the perpendicular of
// the chord between its neighbours), within reach. The normal's sign does
// not matter: snap brackets both ways.
func snapLine(b Bowl, pts []geom.Vec2, closed bool, level, reach float64, boxes []geom.Box) []geom.Vec2 {
	out := make([]geom.Vec2, len(pts))
	n := len(pts)
	for i, p := range pts {
		if !inAny(boxes, p) {
			out[i] = p
			continue
		}
		var a, c geom.Vec2
		switch {
		case closed:
			a, c = pts[(i+n-1)%n], pts[(i+1)%n]
		case i == 0:
			a, c = pts[0], pts[1]
		case i == n-1:
			a, c = pts[n-2], pts[n-1]
		default:
			a, c = pts[i-1], pts[i+1]
		}
		d := c.Sub(a)
		if d.Norm2() == 0 {
			out[i] = p
			continue
		}
		nrm := geom.Vec2{X: -d.Y, Y: d.X}.Scale(1 / d.Norm())
		out[i], _ = snap(b, p, nrm, level, reach)
	}
	return out
}

// insertCorners puts each corner into the loop segment nearest to it, when
// that segment is within reach (the traced line cuts a vertical wall's
// corner by up to a cell).
func insertCorners(pts, corners []geom.Vec2, reach float64) []geom.Vec2 {
	for _, c := range corners {
		best, bestD := -1, reach*reach
		for i := range pts {
			d := geom.SegmentDistanceSquared(c, pts[i], pts[(i+1)%len(pts)])
			if d == 0 {
				best = -1 // already on the line
				break
			}
			if d < bestD {
				best, bestD = i, d
			}
		}
		if best >= 0 {
			pts = slices.Insert(pts, best+1, c)
		}
	}
	return pts
}

// Stretch is a stretch of shoreline chosen for edge stone: loop number (an
// index into ShorelineResult.LoopDetail) and chainages from the loop's
// start (m). On a closed loop FromM > ToM wraps through the start.
type Stretch struct {
	Loop       int
	FromM, ToM float64
}

// stretchTolM lets a chainage overshoot the loop's end by up to 1 cm, the
// precision chainages are written to, and clamps it.
const stretchTolM = 0.01

// StretchLength returns the length of stretch st along the shoreline, or a
// [*StretchError] when the stretch is not on it: a loop that does not
// exist, a negative or non-finite chainage, a chainage past the loop's end,
// an empty stretch, or FromM > ToM on an open line.
func StretchLength(sh ShorelineResult, i int, st Stretch) (float64, error) {
	e := &StretchError{Index: i, Loop: st.Loop, FromM: st.FromM, ToM: st.ToM, Loops: len(sh.LoopDetail)}
	if st.Loop < 0 || st.Loop >= len(sh.LoopDetail) {
		return 0, e
	}
	l := sh.LoopDetail[st.Loop]
	e.LoopLengthM = l.LengthM
	switch {
	case !isFinite(st.FromM) || !isFinite(st.ToM) || st.FromM < 0 || st.ToM < 0:
		e.Reason = "chainages must be finite and >= 0 m"
		return 0, e
	case st.FromM > l.LengthM+stretchTolM || st.ToM > l.LengthM+stretchTolM:
		e.Reason = "chainage past the end of the loop"
		return 0, e
	case st.FromM == st.ToM:
		e.Reason = "empty stretch"
		return 0, e
	}
	from, to := min(st.FromM, l.LengthM), min(st.ToM, l.LengthM)
	if from < to {
		return to - from, nil
	}
	if !l.Closed {
		e.Reason = "from is past to on an open line"
		return 0, e
	}
	return l.LengthM - from + to, nil
}
