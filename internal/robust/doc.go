// Package robust holds exact planar predicates: the orientation of three
// points and the position of a point relative to the circle through three
// others. Topological decisions in the project (which side of an edge a point
// lies on, whether a Delaunay edge must be flipped) are taken with these
// predicates and never with a tolerance.
//
// Coordinate model: points are [geom.Vec2] in any planar frame (the local
// working frame, metres, in practice), given as float64 values that are taken
// to be exact. The sign returned is the sign of the exact real-number
// determinant of those inputs as long as no intermediate product overflows
// or underflows: every coordinate must be zero or between 1e-50 and 1e50 in
// magnitude. (Then coordinate differences are zero or at least about 1e-66,
// so the degree-four products of differences and their rounding errors stay
// above the smallest normal number, 2.2e-308, and below overflow.)
//
// The method is Shewchuk's: J. R. Shewchuk, "Adaptive Precision
// Floating-Point Arithmetic and Fast Robust Geometric Predicates", Discrete &
// Computational Geometry 18 (1997) 305–363. A floating-point evaluation is
// accepted when it exceeds a proven error bound (stage A); otherwise the
// determinant is re-evaluated with more precision in adaptive stages that
// reuse the earlier work (B, C) and, if still undecided, exactly with
// floating-point expansions (D). Almost every call ends after stage A.
//
// Fused multiply-adds: the Go specification allows x*y + z to be computed
// with one rounding (and the compiler does so on arm64, and on amd64 with
// GOAMD64=v3). The error-free transformations below rely on every product
// being rounded on its own, so every product is written float64(x*y), and the
// rounding error of a product is obtained exactly with [math.FMA].
package robust
