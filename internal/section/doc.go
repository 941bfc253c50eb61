// Package section cuts vertical profiles (cross-sections) of surfaces along
// a plan polyline: the existing ground and the design along a pond's long
// and cross axes, for the section drawings and for the liner takeoff, which
// needs the developed (3-D) length of the design along a section.
//
// Coordinates are the local working frame of package geom, in metres, x
// east, y north, z up. A profile is indexed by chainage: the distance along
// the polyline from its first vertex, measured in plan. Where a surface has
// no value (outside its extent) the profile holds NaN, and a NaN breaks a
// drawn line.
//
// [Along] samples any [Sampler] at the path's vertices and at a fixed step;
// [AlongMesh] follows a triangle mesh exactly, with a sample at every
// crossing of a mesh edge, so that straight lines between its samples are
// the mesh itself. [Axes] finds a ring's long (principal) axis and a cross
// axis through a chosen point.
package section
