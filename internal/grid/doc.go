// Package grid holds a regular lattice over a work area and the exact
// integrals, distance transform and meshes built on it.
//
// Coordinate model: planar, in the local working frame, in metres (x east,
// y north). Node (i, j) of a [Lattice] sits at (X0 + i·H, Y0 + j·H); values
// sampled at the nodes are stored in flat slices indexed by
// [Lattice.Index] (row-major, j·NX + i). Cell (i, j) is the square with
// corners (i, j) and (i+1, j+1); every cell is split into two triangles
// along its (i, j)–(i+1, j+1) diagonal, counter-clockwise in plan:
//
//	(i, j+1) ─── (i+1, j+1)
//	   │  second  ╱  │
//	   │        ╱    │
//	   │      ╱      │
//	   │    ╱  first │
//	(i, j) ───── (i+1, j)
//
// A lattice function means the piecewise-linear interpolant of the node
// values on those triangles. [DiffVolumes] integrates differences of such
// interpolants exactly; [Lattice.Mesh] exports the same triangles.
package grid
