package geom

import "math"

// Vec2 is a planar vector or point in metres.
type Vec2 struct{ X, Y float64 }

// Vec3 is a point with an elevation, in metres.
type Vec3 struct{ X, Y, Z float64 }

// Add returns v + w.
func (v Vec2) Add(w Vec2) Vec2 { return Vec2{v.X + w.X, v.Y + w.Y} }

// Sub returns v - w.
func (v Vec2) Sub(w Vec2) Vec2 { return Vec2{v.X - w.X, v.Y - w.Y} }

// Scale returns s·v.
func (v Vec2) Scale(s float64) Vec2 { return Vec2{s * v.X, s * v.Y} }

// Dot returns the dot product v·w. Products are kept unfused (see the Go
// spec on floating-point operators) so results agree across architectures.
func (v Vec2) Dot(w Vec2) float64 { return float64(v.X*w.X) + float64(v.Y*w.Y) }

// Cross returns the z component of the cross product v×w, unfused.
func (v Vec2) Cross(w Vec2) float64 { return float64(v.X*w.Y) - float64(v.Y*w.X) }

// Norm2 returns the squared length of v.
func (v Vec2) Norm2() float64 { return v.Dot(v) }

// Norm returns the length of v.
func (v Vec2) Norm() float64 { return math.Hypot(v.X, v.Y) }

// DistanceSquared returns the squared distance between v and w.
func (v Vec2) DistanceSquared(w Vec2) float64 { return v.Sub(w).Norm2() }

// Distance returns the distance between v and w.
func (v Vec2) Distance(w Vec2) float64 { return math.Hypot(v.X-w.X, v.Y-w.Y) }

// Lerp returns v + t·(w − v).
func (v Vec2) Lerp(w Vec2, t float64) Vec2 {
	return Vec2{v.X + t*(w.X-v.X), v.Y + t*(w.Y-v.Y)}
}

// IsFinite reports whether both coordinates are finite numbers.
func (v Vec2) IsFinite() bool { return isFinite(v.X) && isFinite(v.Y) }

// XY returns the plan position of p.
func (p Vec3) XY() Vec2 { return Vec2{p.X, p.Y} }

// Sub returns p − q.
func (p Vec3) Sub(q Vec3) Vec3 { return Vec3{p.X - q.X, p.Y - q.Y, p.Z - q.Z} }

// Cross returns the cross product p×q, unfused.
func (p Vec3) Cross(q Vec3) Vec3 {
	return Vec3{
		float64(p.Y*q.Z) - float64(p.Z*q.Y),
		float64(p.Z*q.X) - float64(p.X*q.Z),
		float64(p.X*q.Y) - float64(p.Y*q.X),
	}
}

// Norm returns the length of p.
func (p Vec3) Norm() float64 {
	return math.Sqrt(float64(p.X*p.X) + float64(p.Y*p.Y) + float64(p.Z*p.Z))
}

// IsFinite reports whether all three coordinates are finite numbers.
func (p Vec3) IsFinite() bool { return isFinite(p.X) && isFinite(p.Y) && isFinite(p.Z) }

func isFinite(f float64) bool { return !math.IsNaN(f) && !math.IsInf(f, 0) }
