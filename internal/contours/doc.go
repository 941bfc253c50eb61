// Package contours traces contour lines (isolines of elevation) directly on
// an indexed triangle mesh ([geom.TriMesh]): the existing ground TIN, the
// finished grade lattice, or a cut/fill depth mesh D − G.
//
// Coordinate model: planar coordinates in the local working frame, in
// metres; elevations and contour levels in metres. Callers that work in feet
// convert the interval and base to metres first, so that levels fall on
// whole units of the user's datum (levels are base + k·interval).
//
// Surface model: the mesh is the piecewise-linear interpolant of its
// vertices, so on every triangle a contour is a straight segment between two
// points found by linear interpolation on the triangle's edges. Segments are
// stitched across shared edges into polylines; a polyline either closes on
// itself (a ring, whose last point is bit-identical to its first) or ends on
// the mesh boundary at both ends.
//
// Ties: a vertex whose elevation equals the level counts as above it
// (z >= level). This is a symbolic perturbation of the level downwards by an
// infinitesimal amount (Edelsbrunner and Mücke, "Simulation of Simplicity",
// ACM Trans. Graphics 9(1), 1990): every triangle is then crossed by at most
// one segment per level and the segments always form paths or cycles, so
// contours through vertices have no gaps. The geometric images of the
// perturbed lines are then cleaned of what has no width: repeated points and
// zero-length segments are dropped, a mesh edge traced twice in opposite
// directions (a ridge lying exactly on the level with lower ground on both
// sides) is cancelled and the pieces reconnected, and lines that collapse to
// nothing (a peak that just touches the level) are dropped. A triangle lying
// flat exactly at a level is wholly above it and yields no segment, so a flat
// area at a level is outlined where it meets lower ground and never crossed.
// A mesh boundary lying exactly on the level with lower ground inside it is
// traced, as the edge of the level set.
//
// Orientation: every line runs with the higher ground on its left, so rings
// around hills are counter-clockwise and rings around pits clockwise (for a
// mesh wound counter-clockwise in plan, as [geom.TriMesh] requires).
//
// Cost: [Trace] buckets the triangles by the levels they span, builds an
// edge table over the triangles that some level crosses, and then visits
// only the triangles crossing each level, so the total work is proportional
// to the mesh size plus the number of contour segments. Output is deterministic: the same mesh gives
// byte-identical lines whatever the order of its triangles and the numbering
// of its vertices. DESIGN.md describes the data structures.
package contours
