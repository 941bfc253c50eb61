package crs

import (
	"errors"
	"fmt"
	"strconv"
	"strings"

	"github.com/dugout-estimating/dugout/internal/units"
)

// Kind says how a system's coordinates are to be read. Its zero value is
// [Local].
type Kind int

// The kinds of coordinate system.
const (
	// Local is a site grid with no geodetic meaning (a total-station or
	// laser-level frame): coordinates are used as they are.
	Local Kind = iota
	// Projected is a map grid (UTM, state plane, national grid): easting and
	// northing in the system's linear unit.
	Projected
	// Geographic is longitude and latitude in degrees.
	Geographic
)

// String returns "local", "projected" or "geographic".
func (k Kind) String() string {
	switch k {
	case Projected:
		return "projected"
	case Geographic:
		return "geographic"
	}
	return "local"
}

// CRS is a coordinate reference system. The zero CRS is the local site grid.
type CRS struct {
	Kind Kind
	EPSG int    // EPSG code; 0 when unknown or local
	Name string // e.g. "WGS 84 / UTM zone 10N", "local"
	UTM  *UTM   // set when the system is a WGS 84 UTM zone (EPSG 32601–32660, 32701–32760)
}

// LocalCRS returns the local site grid.
func LocalCRS() CRS { return CRS{Kind: Local, Name: "local"} }

// String returns "local" for the local grid, "EPSG:NNNN" when the code is
// known, else the name (or "unknown").
func (c CRS) String() string {
	switch {
	case c.Kind == Local && c.EPSG == 0:
		return "local"
	case c.EPSG != 0:
		return "EPSG:" + strconv.Itoa(c.EPSG)
	case c.Name != "":
		return c.Name
	}
	return "unknown"
}

// IsUTM reports whether c is a WGS 84 UTM zone that [UTM.Forward] can
// project to.
func (c CRS) IsUTM() bool { return c.UTM != nil }

// Spec is a parsed --crs value: either Auto (project longitude and latitude
// to the WGS 84 UTM zone of the site, found later with [UTMZoneFor]) or a
// definite CRS.
type Spec struct {
	Auto bool // pick the UTM zone from the data; CRS is then the zero value
	CRS  CRS
}

// String returns "auto" or the CRS's string.
func (s Spec) String() string {
	if s.Auto {
		return "auto"
	}
	return s.CRS.String()
}

// ErrSpec is returned (wrapped, with the text) for a CRS spec that cannot be
// parsed.
var ErrSpec = errors.New("crs: invalid CRS")

// EPSG codes of coordinate systems are 1024–32766; 32767 means
// user-defined, and 1–1023 and 32768–65535 are reserved or private (GeoTIFF
// 1.0 specification, §6.3 "GeoKey value ranges"; from memory).
const (
	minEPSG = 1024
	maxEPSG = 32766
)

// Parse parses a CRS spec as given on the command line or in a site file:
// "local", "auto", "EPSG:NNNN" (case-insensitive, also the OGC URN
// "urn:ogc:def:crs:EPSG::NNNN") or "urn:ogc:def:crs:OGC:1.3:CRS84" (WGS 84
// longitude/latitude). Surrounding space is ignored. See [FromEPSG] for how
// codes are classified.
func Parse(s string) (spec Spec, err error) {
	t := strings.ToLower(strings.TrimSpace(s))
	switch t {
	case "local":
		return Spec{CRS: LocalCRS()}, nil
	case "auto":
		return Spec{Auto: true}, nil
	case "urn:ogc:def:crs:ogc:1.3:crs84", "crs84":
		c, _ := FromEPSG(4326)
		return Spec{CRS: c}, nil
	case "":
		return Spec{}, fmt.Errorf("%w: empty (want local, auto or EPSG:NNNN)", ErrSpec)
	}
	var num string
	switch {
	case strings.HasPrefix(t, "epsg:"):
		num = t[len("epsg:"):]
	case strings.HasPrefix(t, "urn:ogc:def:crs:epsg::"):
		num = t[len("urn:ogc:def:crs:epsg::"):]
	default:
		return Spec{}, fmt.Errorf("%w: %q (want local, auto or EPSG:NNNN)", ErrSpec, s)
	}
	if num == "" || len(num) > 5 || strings.Trim(num, "0123456789") != "" {
		return Spec{}, fmt.Errorf("%w: %q: EPSG code must be a whole number", ErrSpec, s)
	}
	code, _ := strconv.Atoi(num)
	c, err := FromEPSG(code)
	if err != nil {
		return Spec{}, err
	}
	return Spec{CRS: c}, nil
}

// FromEPSG returns the CRS for an EPSG code. The WGS 84 UTM zones carry a
// [UTM]; a few common geographic systems (WGS 84, NAD83, NAD83(HARN), ETRS89,
// GDA94, GDA2020) are of kind [Geographic]; every other code is taken as
// [Projected] and carried as a label, its coordinates used as they are. It
// returns an error wrapping [ErrSpec] for a code outside 1024–32766.
func FromEPSG(code int) (CRS, error) {
	if code < minEPSG || code > maxEPSG {
		return CRS{}, fmt.Errorf("%w: EPSG code %d outside %d–%d", ErrSpec, code, minEPSG, maxEPSG)
	}
	if u, ok := UTMFromEPSG(code); ok {
		return u.CRS(), nil
	}
	if name, ok := geographicNames[code]; ok {
		return CRS{Kind: Geographic, EPSG: code, Name: name}, nil
	}
	c := CRS{Kind: Projected, EPSG: code, Name: projectedNames[code]}
	if c.Name == "" {
		if z := code - 26900; z >= 1 && z <= 23 {
			c.Name = fmt.Sprintf("NAD83 / UTM zone %dN", z)
		} else {
			c.Name = "EPSG:" + strconv.Itoa(code)
		}
	}
	return c, nil
}

// geographicNames are the geographic 2-D systems recognised by code (EPSG
// registry names; from memory, except 4152 which the Autzen sample's CRS
// chain in refbench/ANCHORS.md §5 uses).
var geographicNames = map[int]string{
	4326: "WGS 84",
	4269: "NAD83",
	4152: "NAD83(HARN)",
	4258: "ETRS89",
	4283: "GDA94",
	7844: "GDA2020",
}

// projectedNames are projected systems named by code beyond the UTM zones.
// 2994, 2903, 26995 and 2255 are named in shared/data/SOURCES.md, 3740 in
// refbench/ANCHORS.md §5; 27700 is from memory.
var projectedNames = map[int]string{
	2994:  "NAD83(HARN) / Oregon GIC Lambert (ft)",
	2903:  "NAD83(HARN) / New Mexico Central (ftUS)",
	26995: "NAD83 / Mississippi West",
	2255:  "NAD83 / Mississippi West (ftUS)",
	3740:  "NAD83(HARN) / UTM zone 10N",
	27700: "OSGB36 / British National Grid",
}

// LinearUnitM returns the length in metres of the linear unit of the
// projected system with the given EPSG code, when the package knows it, and
// false otherwise. It knows the WGS 84 and NAD83 UTM zones (metre) and the
// codes named in [FromEPSG]'s table; the NAD83 state-plane block 26929–26998
// is in metres (EPSG registry, from memory: 26995 confirmed by
// shared/data/SOURCES.md). Readers use it to flag a file whose unit key
// contradicts its EPSG code.
func LinearUnitM(code int) (float64, bool) {
	if _, ok := UTMFromEPSG(code); ok {
		return 1, true
	}
	switch {
	case code >= 26901 && code <= 26923, code >= 26929 && code <= 26998:
		return 1, true
	}
	switch code {
	case 3740, 27700:
		return 1, true
	case 2994:
		return units.Foot, true
	case 2903, 2255:
		return units.USSurveyFoot, true
	}
	return 0, false
}
