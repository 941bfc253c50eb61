package geom

import "math"

// Box is an axis-aligned rectangle, closed on all sides. The empty box has
// Min > Max (see [EmptyBox]); the zero Box is the single point (0, 0), so
// never use it as an accumulator.
type Box struct{ Min, Max Vec2 }

// EmptyBox returns a box that contains nothing and that [Box.Extend] grows
// from correctly.
func EmptyBox() Box {
	inf := math.Inf(1)
	return Box{Min: Vec2{inf, inf}, Max: Vec2{-inf, -inf}}
}

// BoxOf returns the smallest box containing all of pts, or the empty box.
func BoxOf(pts []Vec2) Box {
	b := EmptyBox()
	for _, p := range pts {
		b = b.Extend(p)
	}
	return b
}

// IsEmpty reports whether b contains no point.
func (b Box) IsEmpty() bool { return b.Min.X > b.Max.X || b.Min.Y > b.Max.Y }

// Extend returns the smallest box containing b and p.
func (b Box) Extend(p Vec2) Box {
	return Box{
		Min: Vec2{math.Min(b.Min.X, p.X), math.Min(b.Min.Y, p.Y)},
		Max: Vec2{math.Max(b.Max.X, p.X), math.Max(b.Max.Y, p.Y)},
	}
}

// Union returns the smallest box containing b and c.
func (b Box) Union(c Box) Box {
	if c.IsEmpty() {
		return b
	}
	return b.Extend(c.Min).Extend(c.Max)
}

// Expand returns b grown by d on every side (shrunk when d < 0). Expanding
// the empty box gives the empty box.
func (b Box) Expand(d float64) Box {
	if b.IsEmpty() {
		return b
	}
	return Box{Min: Vec2{b.Min.X - d, b.Min.Y - d}, Max: Vec2{b.Max.X + d, b.Max.Y + d}}
}

// Contains reports whether p lies in b, boundary included.
func (b Box) Contains(p Vec2) bool {
	return p.X >= b.Min.X && p.X <= b.Max.X && p.Y >= b.Min.Y && p.Y <= b.Max.Y
}

// Intersects reports whether b and c share at least one point.
func (b Box) Intersects(c Box) bool {
	return b.Min.X <= c.Max.X && c.Min.X <= b.Max.X && b.Min.Y <= c.Max.Y && c.Min.Y <= b.Max.Y
}

// Width returns the x extent of b (negative when empty).
func (b Box) Width() float64 { return b.Max.X - b.Min.X }

// Height returns the y extent of b (negative when empty).
func (b Box) Height() float64 { return b.Max.Y - b.Min.Y }

// Center returns the midpoint of b.
func (b Box) Center() Vec2 { return Vec2{(b.Min.X + b.Max.X) / 2, (b.Min.Y + b.Max.Y) / 2} }
