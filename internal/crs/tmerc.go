package crs

import (
	"math"
	"math/cmplx"
)

// TransverseMercator is an ellipsoidal transverse Mercator projection: the
// ellipsoid, the longitude of the central meridian Lon0Deg and latitude of
// the origin Lat0Deg (degrees), the scale factor K0 on the central meridian
// and the false easting and northing FalseE, FalseN (metres). The zero K0 is
// taken as 1 and the zero Ellipsoid as WGS 84, so the zero value is the
// plain projection of WGS 84 about the Greenwich meridian and the equator.
//
// The mapping follows Karney (2011): the conformal latitude, the
// Gauss–Schreiber projection of the conformal sphere, then Krüger's series to
// sixth order in n (Karney eqs. 35 and 36). The series is accurate to a few
// nanometres within 3900 km of the central meridian (Karney 2011, abstract;
// from memory of the paper) and is used here for any longitude within 90° of
// the central meridian; results beyond that are not meaningful.
type TransverseMercator struct {
	Ellipsoid
	Lon0Deg, Lat0Deg float64 // central meridian and latitude of origin, degrees
	K0               float64 // scale on the central meridian; 0 means 1
	FalseE, FalseN   float64 // added to x and y, metres
}

// series holds the constants of Krüger's series for one ellipsoid.
type series struct {
	a1    float64    // rectifying radius A (Karney eq. 14), m
	e     float64    // first eccentricity
	e2m   float64    // 1 − e²
	alpha [7]float64 // α1..α6 (Karney eq. 35), index 0 unused
	beta  [7]float64 // β1..β6 (Karney eq. 36), index 0 unused
}

// newSeries evaluates Karney's (2011) series coefficients for el by Horner's
// rule in the third flattening n.
func newSeries(el Ellipsoid) series {
	el = el.orDefault()
	n := el.ThirdFlattening()
	n2 := n * n
	var s series
	s.e = math.Sqrt(el.E2())
	s.e2m = 1 - el.E2()
	// A = a/(1+n) · (1 + n²/4 + n⁴/64 + n⁶/256)  (Karney eq. 14).
	s.a1 = el.A / (1 + n) * (1 + n2*(1.0/4+n2*(1.0/64+n2/256)))
	// α (Karney eq. 35), forward: conformal → rectifying.
	s.alpha[1] = n * (1.0/2 + n*(-2.0/3+n*(5.0/16+n*(41.0/180+n*(-127.0/288+n*7891.0/37800)))))
	s.alpha[2] = n2 * (13.0/48 + n*(-3.0/5+n*(557.0/1440+n*(281.0/630+n*(-1983433.0/1935360)))))
	s.alpha[3] = n2 * n * (61.0/240 + n*(-103.0/140+n*(15061.0/26880+n*167603.0/181440)))
	s.alpha[4] = n2 * n2 * (49561.0/161280 + n*(-179.0/168+n*6601661.0/7257600))
	s.alpha[5] = n2 * n2 * n * (34729.0/80640 + n*(-3418889.0/1995840))
	s.alpha[6] = n2 * n2 * n2 * (212378941.0 / 319334400)
	// β (Karney eq. 36), inverse: rectifying → conformal.
	s.beta[1] = n * (1.0/2 + n*(-2.0/3+n*(37.0/96+n*(-1.0/360+n*(-81.0/512+n*96199.0/604800)))))
	s.beta[2] = n2 * (1.0/48 + n*(1.0/15+n*(-437.0/1440+n*(46.0/105+n*(-1118711.0/3870720)))))
	s.beta[3] = n2 * n * (17.0/480 + n*(-37.0/840+n*(-209.0/4480+n*5569.0/90720)))
	s.beta[4] = n2 * n2 * (4397.0/161280 + n*(-11.0/504+n*(-830251.0/7257600)))
	s.beta[5] = n2 * n2 * n * (4583.0/161280 + n*(-108847.0/3991680))
	s.beta[6] = n2 * n2 * n2 * (20648693.0 / 638668800)
	return s
}

// eatanhe returns e·atanh(e·x).
func (s series) eatanhe(x float64) float64 { return s.e * math.Atanh(s.e*x) }

// taup returns τ′ = tan χ, the tangent of the conformal latitude, for
// τ = tan φ (Karney eqs. 7–9):
// τ′ = τ·√(1+σ²) − σ·√(1+τ²), σ = sinh(e·atanh(e·τ/√(1+τ²))).
func (s series) taup(tau float64) float64 {
	tau1 := math.Hypot(1, tau)
	sig := math.Sinh(s.eatanhe(tau / tau1))
	return math.Hypot(1, sig)*tau - sig*tau1
}

// Newton's method for τ from τ′ converges quadratically (Karney 2011, §2,
// eqs. 19–21, where two or three iterations are reported to suffice; from
// memory of the paper). Once a step is below √ε/10 relative to max(1, |τ′|)
// the next one would be below the float64 resolution, so iteration stops;
// taufIters is only a cap for non-finite or absurd input.
const (
	taufTol   = 1.4901161193847656e-08 / 10 // √ε/10 with ε = 2⁻⁵²
	taufIters = 5
)

// tauf inverts [series.taup]: it returns τ = tan φ for τ′ = tan χ by Newton's
// method (Karney 2011, eqs. 19–21).
func (s series) tauf(taup float64) float64 {
	tau := taup / s.e2m
	stol := taufTol * math.Max(1, math.Abs(taup))
	for range taufIters {
		tp := s.taup(tau)
		dtau := (taup - tp) * (1 + s.e2m*tau*tau) / (s.e2m * math.Hypot(1, tau) * math.Hypot(1, tp))
		tau += dtau
		if !(math.Abs(dtau) >= stol) {
			break
		}
	}
	return tau
}

// sinSeries returns Σ_{j=1..6} c[j]·sin(2jz) for complex z by Clenshaw's
// recurrence (Clenshaw, "A note on the summation of Chebyshev series",
// MTAC 9, 1955): b_j = c_j + 2cos(2z)·b_{j+1} − b_{j+2}, sum = b_1·sin(2z).
func sinSeries(c *[7]float64, z complex128) complex128 {
	w := 2 * cmplx.Cos(2*z)
	var b1, b2 complex128
	for j := 6; j >= 1; j-- {
		b1, b2 = w*b1-b2+complex(c[j], 0), b1
	}
	return cmplx.Sin(2*z) * b1
}

// cosSeriesDeriv returns 1 + Σ_{j=1..6} 2j·c[j]·cos(2jz), the derivative of
// z + Σ c[j]·sin(2jz), by Clenshaw's recurrence for a cosine series
// (sum = b_1·cos(2z) − b_2).
func cosSeriesDeriv(c *[7]float64, z complex128) complex128 {
	w := 2 * cmplx.Cos(2*z)
	var b1, b2 complex128
	for j := 6; j >= 1; j-- {
		b1, b2 = w*b1-b2+complex(2*float64(j)*c[j], 0), b1
	}
	return 1 + cmplx.Cos(2*z)*b1 - b2
}

func (t TransverseMercator) k0() float64 {
	if t.K0 == 0 {
		return 1
	}
	return t.K0
}

// lonDiff returns lon − lon0 reduced to [−180°, 180°], in radians.
func lonDiff(lonDeg, lon0Deg float64) float64 {
	return math.Remainder(lonDeg-lon0Deg, 360) * math.Pi / 180
}

// gaussSchreiber returns ζ′ = ξ′ + iη′ (Karney eq. 10) and τ, τ′.
func (s series) gaussSchreiber(lam, phi float64) (zp complex128, tau, taup float64) {
	tau = math.Tan(phi)
	taup = s.taup(tau)
	c := math.Cos(lam)
	xip := math.Atan2(taup, c)
	etap := math.Asinh(math.Sin(lam) / math.Hypot(taup, c))
	return complex(xip, etap), tau, taup
}

// originY returns A·ξ at (λ = 0, φ = Lat0): the rectifying arc from the
// equator to the latitude of origin, in metres on the unscaled ellipsoid.
func (t TransverseMercator) originY(s series) float64 {
	if t.Lat0Deg == 0 {
		return 0
	}
	chi := math.Atan(s.taup(math.Tan(t.Lat0Deg * math.Pi / 180)))
	return s.a1 * real(complex(chi, 0)+sinSeries(&s.alpha, complex(chi, 0)))
}

// Forward projects the geographic position (lonDeg, latDeg) to grid
// coordinates x (easting) and y (northing) in metres. The longitude may be
// given in any turn; it is reduced about the central meridian. Inputs more
// than 90° of longitude from the central meridian, and non-finite inputs,
// give meaningless or NaN results: check the domain first (as [UTM.Forward]
// does).
func (t TransverseMercator) Forward(lonDeg, latDeg float64) (x, y float64) {
	s := newSeries(t.Ellipsoid)
	zp, _, _ := s.gaussSchreiber(lonDiff(lonDeg, t.Lon0Deg), latDeg*math.Pi/180)
	z := zp + sinSeries(&s.alpha, zp) // Karney eq. 11
	k0 := t.k0()
	x = t.FalseE + k0*s.a1*imag(z)
	y = t.FalseN + k0*(s.a1*real(z)-t.originY(s))
	return x, y
}

// Inverse returns the geographic position (longitude, latitude in degrees,
// longitude in [−180°, 180°]) of the grid point (x, y) in metres. It is the
// inverse of [TransverseMercator.Forward] on the same domain.
func (t TransverseMercator) Inverse(x, y float64) (lonDeg, latDeg float64) {
	s := newSeries(t.Ellipsoid)
	k0 := t.k0()
	xi := (y - t.FalseN + k0*t.originY(s)) / (k0 * s.a1)
	eta := (x - t.FalseE) / (k0 * s.a1)
	z := complex(xi, eta)
	zp := z - sinSeries(&s.beta, z) // Karney eq. 15
	xip, etap := real(zp), imag(zp)
	sh := math.Sinh(etap)
	c := math.Cos(xip)
	taup := math.Sin(xip) / math.Hypot(sh, c) // Karney eq. 18
	lam := math.Atan2(sh, c)
	tau := s.tauf(taup)
	latDeg = math.Atan(tau) * 180 / math.Pi
	lonDeg = math.Remainder(t.Lon0Deg+lam*180/math.Pi, 360)
	return lonDeg, latDeg
}

// ScaleAndConvergence returns the point scale factor k (grid distance over
// ellipsoidal distance, K0 included) and the meridian convergence γ in
// degrees at (lonDeg, latDeg). γ is the bearing of grid north measured
// clockwise from true north, positive east of the central meridian in the
// northern hemisphere (Karney 2011, eqs. 12–13, γ = γ′ + γ″, k = k0·k′·k″).
// Some manuals (the GDA Technical Manual among them) quote the opposite
// sign.
func (t TransverseMercator) ScaleAndConvergence(lonDeg, latDeg float64) (k, gammaDeg float64) {
	s := newSeries(t.Ellipsoid)
	lam := lonDiff(lonDeg, t.Lon0Deg)
	phi := latDeg * math.Pi / 180
	zp, tau, taup := s.gaussSchreiber(lam, phi)
	// Gauss–Schreiber convergence and scale (Karney eq. 12).
	c := math.Cos(lam)
	gamp := math.Atan2(taup*math.Sin(lam), c*math.Hypot(1, taup))
	sphi := math.Sin(phi)
	kp := math.Sqrt(1-s.e*s.e*sphi*sphi) * math.Hypot(1, tau) / math.Hypot(taup, c)
	// Krüger's series rotates and scales by its derivative (Karney eq. 13).
	d := cosSeriesDeriv(&s.alpha, zp)
	el := t.Ellipsoid.orDefault()
	gammaDeg = (gamp - cmplx.Phase(d)) * 180 / math.Pi
	k = t.k0() * kp * (s.a1 / el.A) * cmplx.Abs(d)
	return k, gammaDeg
}
