package geom

import "math"

// Frame is the local working frame: local = world − Origin, in metres.
// World coordinates are the projected coordinates of the survey (a UTM or
// state-plane zone, or an arbitrary total-station frame) converted to metres.
// Subtracting a rounded origin near the site keeps float64 arithmetic exact
// to well below a millimetre (a 0.3 × 0.7 m rectangle at UTM northings
// loses 4e-5 m² of area by raw shoelace and none after the shift).
type Frame struct {
	Origin Vec2
}

// FrameAt returns a frame whose origin is c rounded to the nearest whole
// metre, so that the shift itself is exact in binary floating point.
func FrameAt(c Vec2) Frame {
	return Frame{Origin: Vec2{math.Round(c.X), math.Round(c.Y)}}
}

// ToLocal converts a world position (metres) to the local frame.
func (f Frame) ToLocal(w Vec2) Vec2 { return w.Sub(f.Origin) }

// ToWorld converts a local position back to world metres.
func (f Frame) ToWorld(l Vec2) Vec2 { return l.Add(f.Origin) }
