// Package design lays a pond, drawn as depth zones, on existing ground and
// computes its finished grade and earthwork: cut, fill, the water it holds
// and the areas involved.
//
// Coordinate model: planar, in the local working frame, in metres (x east,
// y north, z up). Slopes are horizontal run per unit of rise (2 = 2H:1V).
// Volumes are m³ and areas plan m².
//
// # The model
//
// Inputs: the existing ground G (a TIN, through [Terrain]); the water
// surface elevation W; the freeboard f, which puts the rim at R = W + f;
// the zones Z_i, each a floor polygon at depth d_i below W with a wall of
// slope s_i; and a berm of crest width c and outer slope b for where the
// rim stands above the ground.
//
//   - Bowl: E(p) = min_i ( W − d_i + dist(p, Z_i) / s_i ), with dist the
//     horizontal distance from p to the polygon (0 inside). Walls rise at
//     their slope from each zone's edge, corners round off like a cone,
//     nested zones (a deep zone inside a shelf) and concave outlines need
//     no special case. Where zones overlap the lowest bowl wins (the min),
//     so a deeper zone always cuts through a shallower one. A vertical
//     wall (s_i = 0) gives E = W − d_i inside the polygon, boundary
//     included, and nothing outside (E = +Inf where no zone reaches). With
//     Corners: Sharp (convex zones only), dist is the largest signed
//     distance to the edges' lines, clamped at 0: the wall is one plane
//     per edge, as a mitred cut.
//   - Finished grade: D = E where E ≤ R (the bowl up to the rim);
//     elsewhere D = max(B, min(G, E)), with the berm
//     B(p) = R − max(0, dist(p, {E ≤ R}) − c) / b. Uphill the wall goes on
//     up until it daylights into the ground; downhill a berm with a level
//     crest of width c at the rim slopes down at b until it meets the
//     ground.
//   - Cut = ∬ (G − D)⁺ and fill = ∬ (D − G)⁺ over the plan area. Fill is
//     the compacted volume in place; package cutfill converts it to bank
//     measure.
//   - Water: the region where E ≤ W, its volume ∬ (W − E) and its plan
//     area. E − W does not depend on W, so the water's shape, the rim line
//     {E = R} and the lined area are fixed by the zones and f alone.
//
// A section through a pond on ground falling from left to right:
//
//	G
//	--------\  daylight
//	  cut    \                                           crest c
//	          \  the wall goes on up at s:1            |<------>|
//	 R ........\.......................................+--------+
//	 W ~~~~~~~~~\~~~~~~~~~~~~~~~~~~~~~~~~~~~~~~~~~~~~~/   fill    \  berm b:1
//	             \_____ shelf _____       _____ shelf/              \
//	              W - d1           \     /     W - d1                \______ G
//	                                \___/
//	                           deep zone W - d2
//
// # Water level
//
// [LevelFixed] takes W from the caller. [LevelAuto] puts the rim at the
// lowest existing ground along the rim line, W = min G − f there, so no
// berm is needed. [LevelBalance] finds the W at which the cut reused as
// fill, cut × FillPerCut, equals the fill: k·cut − fill falls as W rises,
// so the search on the first lattice brackets the root between the auto
// level (little or no fill) and the level that puts the deepest floor at
// the highest ground (no cut), then refines it by Brent's method. Each
// finer lattice starts from the coarser one's root with a Newton step
// whose slope, −(k·cut area + fill area), the volumes give, and stops as
// soon as that slope, which bounds the true one, proves an evaluated level
// within 0.01 mm of the root; so the finest lattices take two or three
// evaluations each.
//
// # Computation
//
// Everything is sampled on a [grid.Lattice] over the work area: the bowl
// up to daylight and the berm down to the ground, bounded from the zones,
// their slopes and depths, the ground's range and the berm, and on each
// finer lattice also by the earthwork the coarser one found, grown by two
// of its cells (the lattice grows again if the earthwork reaches its
// edge). G comes from
// Terrain.SampleLattice; E and the distance to the rim set are computed at
// the nodes exactly from the zone polygons, with a quadtree of tiles that
// drops every zone and edge that cannot be nearest within a tile. Volumes
// and areas integrate the piecewise-linear interpolants exactly (two
// triangles per cell), so the only error is that of sampling, which is of
// second order in the cell: the automatic cell is halved until halving
// changes cut and fill by less than 0.1 %. A vertical wall makes E jump,
// which no interpolant can carry; the cells it crosses are integrated
// exactly in two parts, clipped to the zone's polygon, so a vertical-walled
// box on flat ground gives L × W × depth to round-off. (Where two vertical
// walls cross one cell, that cell is interpolated.)
//
// Results do not depend on the number of processors or on scheduling:
// the bowl field is computed on fixed tiles, each node from its own tile's
// candidates, and every integral sums fixed bands of cell rows whose
// compensated totals are merged in band order; no sum runs over a map. A
// build with fused multiply-add (GOAMD64=v3, or arm64) may differ in the
// last bits, as Go allows (the spec's "Floating-point operators").
//
// Earthwork that needs ground beyond the survey fails with an
// [*OffSurveyError] saying how far beyond; other problems are collected in
// Surface.Warnings. Outlines with shelves ([Outline.Zones]) are turned into
// zones by exact inward offsets (see erode.go); zone files are read with
// [ReadZonesGeoJSON].
package design
