package crs

import "math"

// Ellipsoid is a reference ellipsoid of revolution given by its semi-major
// axis A (metres) and inverse flattening InvF = a/(a−b). An InvF of zero
// means a sphere. The zero Ellipsoid (A == 0) stands for [WGS84].
type Ellipsoid struct {
	A    float64 // semi-major axis, m
	InvF float64 // inverse flattening; 0 for a sphere
}

// Reference ellipsoids.
var (
	// WGS84 is the World Geodetic System 1984 ellipsoid: a = 6 378 137 m,
	// 1/f = 298.257223563 (NIMA TR8350.2, 3rd ed., 2000, Table 3.1; from
	// memory, consistent with EPSG:7030).
	WGS84 = Ellipsoid{A: 6378137, InvF: 298.257223563}
	// GRS80 is the Geodetic Reference System 1980 ellipsoid: a = 6 378 137 m,
	// 1/f = 298.257222101 (EPSG:7019; Moritz, "Geodetic Reference System
	// 1980", Bulletin Géodésique 54, 1980).
	GRS80 = Ellipsoid{A: 6378137, InvF: 298.257222101}
	// Clarke1866 is defined by a = 6 378 206.4 m and b = 6 356 583.8 m
	// (Snyder, Map Projections — A Working Manual, USGS PP 1395, 1987,
	// Table 1), so 1/f = a/(a−b) ≈ 294.978698.
	Clarke1866 = Ellipsoid{A: 6378206.4, InvF: 6378206.4 / (6378206.4 - 6356583.8)}
	// Airy1830 is defined by a = 6 377 563.396 m and b = 6 356 256.909 m
	// (Ordnance Survey, A Guide to Coordinate Systems in Great Britain,
	// Annex A), so 1/f = a/(a−b) ≈ 299.3249613.
	Airy1830 = Ellipsoid{A: 6377563.396, InvF: 6377563.396 / (6377563.396 - 6356256.909)}
)

// orDefault returns e, or WGS 84 for the zero Ellipsoid.
func (e Ellipsoid) orDefault() Ellipsoid {
	if e.A == 0 {
		return WGS84
	}
	return e
}

// Flattening returns f = 1/InvF (0 for a sphere).
func (e Ellipsoid) Flattening() float64 {
	e = e.orDefault()
	if e.InvF == 0 {
		return 0
	}
	return 1 / e.InvF
}

// E2 returns the first eccentricity squared, e² = f(2 − f).
func (e Ellipsoid) E2() float64 {
	f := e.Flattening()
	return f * (2 - f)
}

// ThirdFlattening returns n = f/(2 − f) = (a − b)/(a + b).
func (e Ellipsoid) ThirdFlattening() float64 {
	f := e.Flattening()
	return f / (2 - f)
}

// B returns the semi-minor axis b = a(1 − f) in metres.
func (e Ellipsoid) B() float64 {
	e = e.orDefault()
	return e.A * (1 - e.Flattening())
}

// valid reports whether e describes a usable oblate ellipsoid or sphere.
func (e Ellipsoid) valid() bool {
	e = e.orDefault()
	if !(e.A > 0) || math.IsInf(e.A, 0) || math.IsNaN(e.InvF) || math.IsInf(e.InvF, 0) {
		return false
	}
	// InvF must describe 0 ≤ f < 1; values of 1/f in (0, 1] would give a
	// degenerate or prolate body.
	return e.InvF == 0 || e.InvF > 1
}
