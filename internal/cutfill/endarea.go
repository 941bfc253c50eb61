package cutfill

// AverageEndArea returns the volume between two cross-sections of areas a1
// and a2 (m²) lengthM apart by the average-end-area rule, L·(A1 + A2)/2
// (Webb, Railroad Construction, 1903, §§107–114). It is exact only when the
// area varies linearly along the length; for a pyramid it gives A·h/2 against
// the true A·h/3, and it overestimates every frustum of a pit with sloped
// sides ([Compare] integrates the surfaces exactly instead).
func AverageEndArea(lengthM, a1, a2 float64) float64 {
	return lengthM * (a1 + a2) / 2
}

// Prismoidal returns the volume between two cross-sections of areas a1 and a2
// (m²) lengthM apart with true mid-section area am, by the prismoidal
// formula L·(A1 + 4·Am + A2)/6 (Webb 1903, §§107–114). am is the area of the
// section half-way along, not the mean of a1 and a2. The formula is exact
// whenever the section area is a polynomial of degree at most 3 along the
// length, which includes pits with planar sides.
func Prismoidal(lengthM, a1, am, a2 float64) float64 {
	return lengthM * (a1 + 4*am + a2) / 6
}
