// Package tin builds and queries the existing-ground surface: a constrained
// Delaunay triangulated irregular network (TIN) of survey points, with
// breaklines and boundary polygons as constrained edges and optional
// trimming by boundary or by maximum edge length.
//
// Coordinate model: planar, local working frame (see package geom), metres;
// x east, y north, z up. Triangles are counter-clockwise in plan. Inputs are
// never modified. Topology (which triangle a point is in, which diagonal a
// quadrilateral gets, whether a constraint crosses an edge) is decided by
// the exact predicates of package robust, never by a tolerance; the only
// tolerances are the user-facing merge and conflict distances in [Options].
//
// A [Surface] answers elevation, triangle, slope, aspect, area and volume
// queries and samples regular lattices fast. Queries outside the surface
// report ok=false (or NaN) and never extrapolate.
//
// The triangulation algorithm (incremental insertion in Hilbert order with
// ghost triangles and Lawson flips; constraints by cavity retriangulation)
// and the flat array representation are described in DESIGN.md.
package tin
