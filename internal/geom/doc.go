// Package geom holds the project's own small geometric value types: planar
// vectors, 3-D vectors, boxes, rings (simple polygons), the local working
// frame, an indexed triangle mesh and compensated sums.
//
// Coordinate model: everything here is planar (Euclidean) geometry in the
// local working frame, in metres, x to the east (easting) and y to the north
// (northing), z up (elevation). Survey coordinates are large (a UTM northing
// is about 4.5e6 m), so importers subtract a [Frame] origin and every
// computation runs on small local numbers; exporters add it back.
//
// Rings are stored open (the first vertex is not repeated at the end).
// Counter-clockwise rings have positive signed area.
package geom
