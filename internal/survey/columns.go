package survey

import (
	"strings"
	"unicode"

	"github.com/dugout-estimating/dugout/internal/units"
)

// role is what a column holds.
type role int

const (
	roleNone role = iota
	roleID
	roleNorth
	roleEast
	roleElev // elevation, orthometric height, reduced level
	roleAlt  // altitude of unstated kind (GPS)
	roleEllH // ellipsoidal height
	roleHeight
	roleDesc
	roleLat
	roleLon
	roleHAcc
	roleVAcc
	roleBS
	roleIS
	roleFS
	roleIgnore // known and deliberately not used (time, satellites, ...)
)

func (r role) String() string {
	switch r {
	case roleID:
		return "id"
	case roleNorth:
		return "northing"
	case roleEast:
		return "easting"
	case roleElev, roleAlt, roleEllH, roleHeight:
		return "elevation"
	case roleDesc:
		return "description"
	case roleLat:
		return "latitude"
	case roleLon:
		return "longitude"
	case roleHAcc:
		return "hacc"
	case roleVAcc:
		return "vacc"
	case roleBS:
		return "bs"
	case roleIS:
		return "is"
	case roleFS:
		return "fs"
	case roleIgnore:
		return "ignored"
	}
	return "unknown"
}

// columnNames maps normalised header names (lower case, letters and digits
// only, unit annotation removed: see normaliseHeader) to roles.
var columnNames = map[string]role{
	"point": roleID, "pointid": roleID, "pointno": roleID, "pointnumber": roleID, "pointname": roleID,
	"p": roleID, "pt": roleID, "ptid": roleID, "ptno": roleID, "pnt": roleID, "id": roleID, "name": roleID,
	"no": roleID, "number": roleID, "station": roleID, "stn": roleID,

	"northing": roleNorth, "north": roleNorth, "n": roleNorth, "y": roleNorth, "northings": roleNorth,
	"easting": roleEast, "east": roleEast, "e": roleEast, "x": roleEast, "eastings": roleEast,

	"elevation": roleElev, "elev": roleElev, "elv": roleElev, "el": roleElev, "z": roleElev,
	"rl": roleElev, "reducedlevel": roleElev, "orthometricheight": roleElev, "orthoheight": roleElev,
	"height": roleHeight, "h": roleHeight,
	"altitude": roleAlt, "alt": roleAlt, "ele": roleAlt,
	"ellipsoidalheight": roleEllH, "ellipsoidheight": roleEllH, "hae": roleEllH, "ellheight": roleEllH,

	"description": roleDesc, "desc": roleDesc, "d": roleDesc, "descr": roleDesc, "code": roleDesc, "featurecode": roleDesc,
	"feature": roleDesc, "remark": roleDesc, "remarks": roleDesc, "note": roleDesc, "notes": roleDesc,

	"latitude": roleLat, "lat": roleLat,
	"longitude": roleLon, "lon": roleLon, "long": roleLon, "lng": roleLon,

	"hacc": roleHAcc, "horizontalaccuracy": roleHAcc, "haccuracy": roleHAcc, "hrms": roleHAcc,
	"hprec": roleHAcc, "hprecision": roleHAcc, "horizontalprecision": roleHAcc, "accuracy": roleHAcc,
	"horizontalerror": roleHAcc, "herr": roleHAcc, "sdh": roleHAcc,
	"vacc": roleVAcc, "verticalaccuracy": roleVAcc, "vaccuracy": roleVAcc, "vrms": roleVAcc,
	"vprec": roleVAcc, "vprecision": roleVAcc, "verticalprecision": roleVAcc, "altitudeaccuracy": roleVAcc,
	"verticalerror": roleVAcc, "verr": roleVAcc, "sdv": roleVAcc,

	"bs": roleBS, "backsight": roleBS, "plus": roleBS,
	"is": roleIS, "intermediatesight": roleIS, "intersight": roleIS, "ss": roleIS, "sideshot": roleIS,
	"fs": roleFS, "foresight": roleFS, "minus": roleFS,

	"time": roleIgnore, "date": roleIgnore, "datetime": roleIgnore, "timestamp": roleIgnore,
	"utc": roleIgnore, "sats": roleIgnore, "satellites": roleIgnore, "fix": roleIgnore,
	"fixtype": roleIgnore, "hdop": roleIgnore, "vdop": roleIgnore, "pdop": roleIgnore,
	"speed": roleIgnore, "course": roleIgnore, "heading": roleIgnore, "bearing": roleIgnore,
	"quality": roleIgnore, "hi": roleIgnore, "rise": roleIgnore, "fall": roleIgnore,
}

// unitWords are unit annotations recognised in a header ("Northing (ft)",
// "alt_m", "Elevation [usft]") and the unit they state; deg marks degrees.
var unitWords = map[string]string{
	"m": "m", "metre": "m", "metres": "m", "meter": "m", "meters": "m",
	"ft": "ft", "feet": "ft", "foot": "ft", "intft": "ft", "ift": "ft",
	"usft": "usft", "ftus": "usft", "sft": "usft",
	"deg": "deg", "degree": "deg", "degrees": "deg", "dd": "deg",
}

// normaliseHeader returns the lookup key of a header name and the unit it
// states, if any: case and punctuation are dropped, and a unit in brackets
// or as the last word ("alt_m", "Height (m)") is split off.
func normaliseHeader(name string) (key, unit string) {
	s := strings.ToLower(strings.TrimSpace(name))
	// A bracketed part names the unit, or is dropped.
	for _, br := range [][2]string{{"(", ")"}, {"[", "]"}, {"{", "}"}} {
		if i := strings.Index(s, br[0]); i >= 0 {
			j := strings.Index(s[i:], br[1])
			inner := s[i+1:]
			rest := ""
			if j >= 0 {
				inner = s[i+1 : i+j]
				rest = s[i+j+1:]
			}
			if u, ok := unitWords[strings.TrimSpace(inner)]; ok {
				unit = u
			}
			s = s[:i] + " " + rest
		}
	}
	words := strings.FieldsFunc(s, func(r rune) bool { return !unicode.IsLetter(r) && !unicode.IsDigit(r) })
	if len(words) > 1 {
		if u, ok := unitWords[words[len(words)-1]]; ok {
			joined := strings.Join(words[:len(words)-1], "")
			if _, known := columnNames[joined]; known {
				unit = u
				words = words[:len(words)-1]
			}
		}
	}
	return strings.Join(words, ""), unit
}

// unitConflict reports whether a unit stated in a header contradicts the
// unit system the file is read in.
func unitConflict(stated string, sys units.System) bool {
	return stated != "" && stated != "deg" && stated != sys.String()
}
