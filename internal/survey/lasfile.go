package survey

import (
	"errors"
	"io/fs"
	"math"
	"strconv"

	"github.com/dugout-estimating/dugout/internal/crs"
	"github.com/dugout-estimating/dugout/internal/las"
	"github.com/dugout-estimating/dugout/internal/units"
)

// unitTolM is how closely a LAS header's unit factor must match a known
// unit to be called by its name: the factors are exact decimal constants,
// so only binary round-off (well under 1e-12 m) separates them.
const unitTolM = 1e-12

// systemOf returns the unit system whose unit is m metres long.
func systemOf(m float64) (units.System, bool) {
	for _, s := range []units.System{units.Metres, units.Feet, units.USFeet} {
		if math.Abs(s.Metres()-m) <= unitTolM {
			return s, true
		}
	}
	return units.Metres, false
}

// unitName names a unit length for messages.
func unitName(m float64) string {
	if s, ok := systemOf(m); ok {
		return s.String()
	}
	return fmtNum(m) + " m units"
}

// lasError passes on I/O and option errors, and turns the errors about
// the file into a *ParseError (keeping the las sentinel in the chain).
func lasError(path string, err error) error {
	if errors.Is(err, fs.ErrNotExist) || errors.Is(err, fs.ErrPermission) || errors.Is(err, las.ErrOptions) {
		return err
	}
	var fe *las.FileError
	if errors.As(err, &fe) {
		return &ParseError{File: path, Field: fe.Field, Err: fe.Err}
	}
	return &ParseError{File: path, Err: err}
}

// readLAS reads a LAS file through package las. Coordinates stay in file
// units until the set is assembled; the header's CRS and units win over
// Options, with a warning when they differ from what Options says.
func readLAS(path string, opt *Options) (*rawFile, error) {
	lo := opt.LAS
	if lo.ThinCell > 0 {
		// Options.LAS.ThinCell is in metres; las wants file units.
		hd, err := las.ReadHeader(path)
		if err != nil {
			return nil, lasError(path, err)
		}
		u := hd.HorizontalUnitM
		if u == 0 {
			if m, ok := crs.LinearUnitM(hd.EPSG); ok {
				u = m
			} else {
				u = opt.Units.Metres()
			}
		}
		lo.ThinCell /= u
	}
	h, pts, st, err := las.Read(path, lo)
	if err != nil {
		return nil, lasError(path, err)
	}
	f := newRaw(path, FormatLAS, opt.Units)
	f.info.LAS = &LASInfo{Read: st.Read, Kept: st.Kept, ClassCounts: st.ClassCounts, UsedGroundOnly: st.UsedGroundOnly, EPSG: h.EPSG}
	for _, w := range st.Warnings {
		f.warn(0, "%s", w)
	}
	hUnit := h.HorizontalUnitM
	if h.EPSG != 0 {
		c, err := crs.FromEPSG(h.EPSG)
		if err != nil {
			f.warn(0, "header names EPSG:%d, which is not a usable coordinate system code: read as --crs %s", h.EPSG, specString(opt.CRS))
		} else {
			f.statedCRS = &c
			if !isAuto(opt.CRS) && !sameCRS(c, opt.CRS.CRS) {
				f.warn(0, "header says %s; --crs %s is not used for this file", c, specString(opt.CRS))
			}
			// las already warns when the unit key contradicts the code.
			if u, ok := crs.LinearUnitM(h.EPSG); ok && hUnit == 0 {
				hUnit = u
			}
		}
	} else if h.WKT != "" {
		f.warn(0, "header gives its coordinate system only as WKT, without an EPSG code: read as --crs %s", specString(opt.CRS))
	}
	if hUnit > 0 {
		f.hUnitM = hUnit
		f.unitSys, f.unitSysOK = systemOf(hUnit)
		if opt.Units != units.Metres && math.Abs(opt.Units.Metres()-hUnit) > unitTolM {
			f.warn(0, "header says the unit is %s; --units %s is not used for this file", unitName(hUnit), opt.Units)
		}
	}
	f.vUnitM = f.hUnitM
	if h.VerticalUnitM > 0 {
		f.vUnitM = h.VerticalUnitM
	}
	f.pts = make([]rawPoint, len(pts))
	for i, p := range pts {
		f.pts[i] = rawPoint{id: strconv.Itoa(i), x: p.X, y: p.Y, z: p.Z, hacc: nan, vacc: nan, line: i}
	}
	f.info.Points = len(pts)
	if len(pts) == 0 {
		return nil, perr(path, 0, "", ErrEmpty, "no points kept (read %d; check the class filter)", st.Read)
	}
	return f, nil
}
