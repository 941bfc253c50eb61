package crs

import (
	"errors"
	"fmt"
	"math"
)

// UTM is a zone of the Universal Transverse Mercator grid on WGS 84: zone
// 1–60 and hemisphere. South zones have a false northing of 10 000 000 m.
// The zero UTM is not a valid zone.
type UTM struct {
	Zone  int  // 1–60
	South bool // southern hemisphere (EPSG 327zz) rather than northern (326zz)
}

// UTM grid constants (NGA.STND.0037 / DMA TM 8358.2, "The Universal Grids",
// 1989; from memory, and consistent with every PROJ pair in the tests).
const (
	utmK0         = 0.9996
	utmFalseE     = 500000.0   // m
	utmFalseNS    = 10000000.0 // m, southern zones
	utmMinLatDeg  = -80.0      // UTM band C starts at 80°S
	utmMaxLatDeg  = 84.0       // UTM band X ends at 84°N
	utmZoneWidth  = 6.0        // degrees
	utmFirstEPSGN = 32600      // EPSG:32601 is WGS 84 / UTM zone 1N
	utmFirstEPSGS = 32700      // EPSG:32701 is WGS 84 / UTM zone 1S
)

// MaxUTMOffsetDeg is how far from a zone's central meridian, in degrees of
// longitude, [UTM.Forward] and [UTM.Inverse] accept a position. A zone is 3°
// wide on each side; at 9° the point scale reaches about 1.012 at the
// equator (k ≈ k0·(1 + (Δλ·cos φ)²/2), Snyder PP 1395 eq. 8-11 to second
// order), a 2.4 % error in areas, so a site that far out has almost surely
// been given the wrong zone.
const MaxUTMOffsetDeg = 9.0

// ErrDomain is returned (wrapped, with the offending values) for a position
// outside the domain of a projection or of the UTM grid.
var ErrDomain = errors.New("crs: position outside the projection domain")

// ErrZone is returned (wrapped) for a UTM zone number outside 1–60.
var ErrZone = errors.New("crs: invalid UTM zone")

// UTMZoneFor returns the UTM zone containing the position (lonDeg, latDeg):
// zone = floor((lon + 180)/6) + 1, with longitude 180° in zone 60, the
// Norway exception (zone 32 covers 3°E–12°E between 56°N and 64°N) and the
// Svalbard exceptions (between 72°N and 84°N only zones 31, 33, 35 and 37
// exist, covering 0–9°E, 9–21°E, 21–33°E and 33–42°E). South is latitude
// below zero. Bands are half-open: a position on a zone boundary belongs to
// the zone east of it. It returns an error wrapping [ErrDomain] for
// non-finite input, longitude outside [−180°, 180°] or latitude outside the
// UTM limits 80°S–84°N (both included).
func UTMZoneFor(lonDeg, latDeg float64) (UTM, error) {
	if !isFinite(lonDeg) || !isFinite(latDeg) {
		return UTM{}, fmt.Errorf("%w: lon %v, lat %v are not finite", ErrDomain, lonDeg, latDeg)
	}
	if lonDeg < -180 || lonDeg > 180 {
		return UTM{}, fmt.Errorf("%w: longitude %v° outside −180°..180°", ErrDomain, lonDeg)
	}
	if latDeg < utmMinLatDeg || latDeg > utmMaxLatDeg {
		return UTM{}, fmt.Errorf("%w: latitude %v° outside the UTM limits 80°S..84°N (polar areas use UPS)", ErrDomain, latDeg)
	}
	zone := int(math.Floor((lonDeg+180)/utmZoneWidth)) + 1
	if zone > 60 {
		zone = 60 // longitude exactly 180°
	}
	switch {
	case latDeg >= 56 && latDeg < 64 && lonDeg >= 3 && lonDeg < 12:
		zone = 32
	case latDeg >= 72 && lonDeg >= 0 && lonDeg < 42:
		switch {
		case lonDeg < 9:
			zone = 31
		case lonDeg < 21:
			zone = 33
		case lonDeg < 33:
			zone = 35
		default:
			zone = 37
		}
	}
	return UTM{Zone: zone, South: latDeg < 0}, nil
}

// UTMFromEPSG returns the WGS 84 UTM zone of an EPSG code 32601–32660
// (north) or 32701–32760 (south), and false for any other code.
func UTMFromEPSG(code int) (UTM, bool) {
	switch {
	case code > utmFirstEPSGN && code <= utmFirstEPSGN+60:
		return UTM{Zone: code - utmFirstEPSGN}, true
	case code > utmFirstEPSGS && code <= utmFirstEPSGS+60:
		return UTM{Zone: code - utmFirstEPSGS, South: true}, true
	}
	return UTM{}, false
}

func (u UTM) check() error {
	if u.Zone < 1 || u.Zone > 60 {
		return fmt.Errorf("%w: zone %d (want 1–60)", ErrZone, u.Zone)
	}
	return nil
}

// EPSG returns the EPSG code of the zone (32601–32660 north, 32701–32760
// south), or 0 for an invalid zone.
func (u UTM) EPSG() int {
	if u.check() != nil {
		return 0
	}
	if u.South {
		return utmFirstEPSGS + u.Zone
	}
	return utmFirstEPSGN + u.Zone
}

// CentralMeridianDeg returns the longitude of the zone's central meridian,
// 6·zone − 183 degrees.
func (u UTM) CentralMeridianDeg() float64 { return utmZoneWidth*float64(u.Zone) - 183 }

// String returns the zone as "UTM zone 10N" or "UTM zone 56S".
func (u UTM) String() string {
	h := "N"
	if u.South {
		h = "S"
	}
	return fmt.Sprintf("UTM zone %d%s", u.Zone, h)
}

// CRS returns the projected system of the zone, e.g. EPSG:32610, "WGS 84 /
// UTM zone 10N".
func (u UTM) CRS() CRS {
	uu := u
	return CRS{Kind: Projected, EPSG: u.EPSG(), Name: "WGS 84 / " + u.String(), UTM: &uu}
}

// TM returns the transverse Mercator projection of the zone: WGS 84,
// k0 = 0.9996, false easting 500 000 m, false northing 0 (north) or
// 10 000 000 m (south).
func (u UTM) TM() TransverseMercator {
	t := TransverseMercator{Ellipsoid: WGS84, Lon0Deg: u.CentralMeridianDeg(), K0: utmK0, FalseE: utmFalseE}
	if u.South {
		t.FalseN = utmFalseNS
	}
	return t
}

// Forward returns the easting and northing in metres of (lonDeg, latDeg) on
// WGS 84 in zone u. The position need not lie in the zone (a site on a zone
// boundary is projected in the zone chosen for the whole site), and a
// southern latitude in a northern zone gives a negative northing as in EPSG.
// It returns an error for an invalid zone ([ErrZone]), and wrapping
// [ErrDomain] for non-finite input, latitude outside 80°S–84°N, or a
// longitude more than [MaxUTMOffsetDeg] from the central meridian.
func (u UTM) Forward(lonDeg, latDeg float64) (e, n float64, err error) {
	if err := u.check(); err != nil {
		return 0, 0, err
	}
	if !isFinite(lonDeg) || !isFinite(latDeg) {
		return 0, 0, fmt.Errorf("%w: lon %v, lat %v are not finite", ErrDomain, lonDeg, latDeg)
	}
	if latDeg < utmMinLatDeg || latDeg > utmMaxLatDeg {
		return 0, 0, fmt.Errorf("%w: latitude %v° outside the UTM limits 80°S..84°N", ErrDomain, latDeg)
	}
	if d := math.Remainder(lonDeg-u.CentralMeridianDeg(), 360); math.Abs(d) > MaxUTMOffsetDeg {
		return 0, 0, fmt.Errorf("%w: longitude %v° is %.3g° from the central meridian %v° of %v (limit %v°)",
			ErrDomain, lonDeg, math.Abs(d), u.CentralMeridianDeg(), u, MaxUTMOffsetDeg)
	}
	e, n = u.TM().Forward(lonDeg, latDeg)
	return e, n, nil
}

// Inverse returns the longitude and latitude in degrees (WGS 84) of the
// grid point (e, n) in metres of zone u. It returns an error for an invalid
// zone ([ErrZone]), and wrapping [ErrDomain] for non-finite input or a point
// that maps more than [MaxUTMOffsetDeg] from the central meridian. The
// latitude band is not checked, so that a northing a little past 84°N still
// converts.
func (u UTM) Inverse(e, n float64) (lonDeg, latDeg float64, err error) {
	if err := u.check(); err != nil {
		return 0, 0, err
	}
	if !isFinite(e) || !isFinite(n) {
		return 0, 0, fmt.Errorf("%w: easting %v, northing %v are not finite", ErrDomain, e, n)
	}
	lonDeg, latDeg = u.TM().Inverse(e, n)
	if d := math.Remainder(lonDeg-u.CentralMeridianDeg(), 360); !(math.Abs(d) <= MaxUTMOffsetDeg) {
		return 0, 0, fmt.Errorf("%w: easting %v m, northing %v m lie %.3g° from the central meridian of %v (limit %v°)",
			ErrDomain, e, n, math.Abs(d), u, MaxUTMOffsetDeg)
	}
	return lonDeg, latDeg, nil
}

func isFinite(f float64) bool { return !math.IsNaN(f) && !math.IsInf(f, 0) }
