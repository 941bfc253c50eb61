// Package las reads airborne and terrestrial LiDAR point clouds in the ASPRS
// LAS format, versions 1.2, 1.3 and 1.4 (ASPRS, "LAS Specification",
// versions 1.2, 1.3 and 1.4 R15), point data record formats 0, 1, 2, 3, 6,
// 7 and 8.
//
// Coordinates are returned as the file stores them: world coordinates in
// the file's own horizontal and vertical units, after applying the header's
// scale and offset (X·scale + offset). Nothing is reprojected and no unit is
// converted; the [Header] says which EPSG code and units the file declares
// (from the GeoTIFF GeoKeyDirectory record or the OGC WKT record) so that
// the caller can convert to metres and shift into a local frame.
//
// Reading streams the point records in fixed-size chunks from an
// [io.ReaderAt]: memory holds the chunk buffer and the points kept, never
// the whole file. Choosing "ground if the file has any" reads the file twice
// (the first pass only counts classes). Thinning keeps one point per grid
// cell, with memory bounded by the number of cells that receive a point.
//
// Compressed LAZ files are rejected with [ErrLAZ], whose message says how to
// decompress them with an open tool.
package las
