package geom

// TriMesh is an indexed triangle mesh in the local frame: vertex positions
// with elevations, and triangles as triples of vertex indices, flat
// (triangle t is T[3t], T[3t+1], T[3t+2]), each wound counter-clockwise in
// plan. It is the neutral form in which a terrain TIN, a design lattice or a
// surface read from LandXML is handed to contouring, volume and export code.
// Triangles sharing an edge share its two vertex indices.
type TriMesh struct {
	V []Vec3
	T []int32
}

// NumTriangles returns the number of triangles in m.
func (m TriMesh) NumTriangles() int { return len(m.T) / 3 }

// Triangle returns the three corners of triangle t.
func (m TriMesh) Triangle(t int) (a, b, c Vec3) {
	return m.V[m.T[3*t]], m.V[m.T[3*t+1]], m.V[m.T[3*t+2]]
}

// PlanArea returns the plan area of triangle abc (positive when
// counter-clockwise).
func PlanArea(a, b, c Vec3) float64 {
	return b.XY().Sub(a.XY()).Cross(c.XY().Sub(a.XY())) / 2
}

// SurfaceArea returns the 3-D (developed) area of triangle abc.
func SurfaceArea(a, b, c Vec3) float64 {
	return b.Sub(a).Cross(c.Sub(a)).Norm() / 2
}
