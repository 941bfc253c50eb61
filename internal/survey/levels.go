package survey

import (
	"math"
	"strconv"
)

// LevelInfo summarises a level book.
type LevelInfo struct {
	// Setups counts instrument setups (each begins with a backsight).
	Setups int
	// TurningPoints counts foresights followed by a backsight.
	TurningPoints int
	// Checks lists the readings taken on points of known elevation after
	// the first: the closing check of a loop, or benchmarks passed on the
	// way.
	Checks []LevelCheck
	// Unplaced counts levelled rows without a position (benchmarks and
	// turning points off the site): they carry the levels but are not
	// points.
	Unplaced int
}

// LevelCheck is one reading on a point of known elevation.
type LevelCheck struct {
	Point string
	Line  int
	// ComputedM is the elevation carried through the book, KnownM the
	// elevation given, MisclosureM = ComputedM − KnownM, in metres.
	ComputedM, KnownM, MisclosureM float64
}

// MaxRodM is the longest rod reading taken as plausible: 25 ft (7.62 m),
// the longest common levelling rod; most are 4–5 m or 13–16 ft (common
// practice, no source). Longer readings suggest the wrong --units.
const MaxRodM = 7.62

// levelRow is one parsed row of a level book.
type levelRow struct {
	line          int
	id, code      string
	x, y          float64
	placed        bool
	bs, is, fs, z float64 // NaN when absent; z is a known elevation
}

// readLevels computes elevations from the rod readings of a level book by
// the height-of-instrument method (any surveying textbook on differential
// levelling): HI = elevation + BS; elevation = HI − IS for an intermediate
// sight and HI − FS for a foresight; a turning point's foresight is followed
// by a backsight on the same row or the next (HI = its elevation + BS).
// Rod readings and elevations are in Options.Units.
func readLevels(f *rawFile, lay *layout, lines []textLine, opt *Options, prog *progress) error {
	path := f.info.Path
	xr, yr := roleEast, roleNorth
	if lay.geo {
		xr, yr = roleLon, roleLat
		f.geographic = true
		f.info.Geographic = true
	}
	if !lay.has(xr) {
		return perr(path, lines[0].n-1, "", ErrColumns, "a level book needs position columns (easting and northing, or latitude and longitude) to place its points")
	}
	info := &LevelInfo{}
	f.info.Levels = info
	m := opt.Units.Metres()

	hi := nan             // current height of instrument, NaN between setups
	var pending *levelRow // last foresight, waiting for its backsight
	elevOf := map[string]float64{}
	lineOf := map[string]int{}
	warnedRod := false
	for k, l := range lines {
		prog.step(k, len(lines))
		fields, err := rowFields(path, l, lay)
		if err != nil {
			return err
		}
		r := levelRow{line: l.n, id: lay.field(fields, roleID), code: lay.field(fields, roleDesc)}
		for _, v := range []struct {
			ro  role
			dst *float64
		}{{roleBS, &r.bs}, {roleIS, &r.is}, {roleFS, &r.fs}, {lay.z, &r.z}} {
			if *v.dst, err = parseOptNum(path, l.n, lay.fieldName(v.ro), lay.field(fields, v.ro)); err != nil {
				return err
			}
		}
		sx, sy := lay.field(fields, xr), lay.field(fields, yr)
		if sx != "" || sy != "" {
			if r.x, err = parseNum(path, l.n, lay.fieldName(xr), sx); err != nil {
				return err
			}
			if r.y, err = parseNum(path, l.n, lay.fieldName(yr), sy); err != nil {
				return err
			}
			if lay.geo {
				if err := checkLonLat(path, l.n, r.x, r.y); err != nil {
					return err
				}
			}
			r.placed = true
		}
		has := func(v float64) bool { return !math.IsNaN(v) }
		switch {
		case !has(r.bs) && !has(r.is) && !has(r.fs):
			return perr(path, l.n, "", ErrLevels, "row has no rod reading (bs, is or fs)")
		case has(r.is) && has(r.fs):
			return perr(path, l.n, lay.fieldName(roleIS), ErrLevels, "row has both an intermediate sight and a foresight")
		case has(r.is) && has(r.bs):
			return perr(path, l.n, lay.fieldName(roleIS), ErrLevels, "row has both a backsight and an intermediate sight")
		}
		if !warnedRod {
			for _, v := range []float64{r.bs, r.is, r.fs} {
				if has(v) && math.Abs(v)*m > MaxRodM {
					f.warn(l.n, "rod reading %s %s is longer than a levelling rod (at most 25 ft, 7.62 m): are the readings in another unit than --units %s?", fmtNum(v), opt.Units, opt.Units)
					warnedRod = true
					break
				}
			}
		}

		elev := nan
		if math.IsNaN(hi) {
			// A new setup: this row must be a backsight on a known point.
			if has(r.is) || has(r.fs) {
				if pending != nil {
					return perr(path, l.n, "", ErrLevels, "no instrument height: after the foresight on line %d the next reading must be a backsight", pending.line)
				}
				return perr(path, l.n, "", ErrLevels, "no instrument height: the book must start with a backsight on a benchmark (a row with an elevation and a bs reading)")
			}
			ref, err := backsightRef(path, &r, pending, elevOf, lineOf)
			if err != nil {
				return err
			}
			if pending != nil && !has(r.z) {
				info.TurningPoints++
			}
			hi = ref + r.bs
			info.Setups++
			pending = nil
			elev = ref
		} else {
			switch {
			case has(r.is):
				elev = hi - r.is
			case has(r.fs):
				elev = hi - r.fs
			default: // a second backsight with no foresight before it
				if _, known := elevOf[r.id]; !has(r.z) && (r.id == "" || !known) {
					return perr(path, l.n, lay.fieldName(roleBS), ErrLevels, "backsight with no foresight before it: a new setup needs a turning point (fs) or a point of known elevation")
				}
				ref, err := backsightRef(path, &r, nil, elevOf, lineOf)
				if err != nil {
					return err
				}
				hi = ref + r.bs
				info.Setups++
				elev = ref
			}
			if has(r.is) || has(r.fs) {
				if has(r.z) {
					info.Checks = append(info.Checks, LevelCheck{Point: r.id, Line: l.n,
						ComputedM: elev * m, KnownM: r.z * m, MisclosureM: (elev - r.z) * m})
					// A benchmark keeps its known elevation, and the run
					// continues from it.
					elev = r.z
				}
				if has(r.fs) {
					if has(r.bs) {
						hi = elev + r.bs
						info.Setups++
						info.TurningPoints++
					} else {
						hi = nan
						rr := r
						rr.z = elev
						pending = &rr
					}
				}
			}
		}
		if err := addLevelled(f, &r, elev, k, opt, elevOf, lineOf, info); err != nil {
			return err
		}
	}
	f.info.Points = len(f.pts)
	if len(f.pts) == 0 {
		return perr(path, 0, "", ErrEmpty, "the level book places no points (no row has a position)")
	}
	return nil
}

// backsightRef returns the elevation a backsight is taken on: the row's
// known elevation, else the turning point of the pending foresight (the
// same id or none), else an earlier point with that id.
func backsightRef(path string, r *levelRow, pending *levelRow, elevOf map[string]float64, lineOf map[string]int) (float64, error) {
	if !math.IsNaN(r.z) {
		return r.z, nil
	}
	if pending != nil && (r.id == "" || r.id == pending.id) {
		if r.id == "" {
			r.id = pending.id
		}
		return pending.z, nil
	}
	if z, ok := elevOf[r.id]; ok && r.id != "" {
		return z, nil
	}
	if pending == nil && len(elevOf) == 0 {
		return 0, perr(path, r.line, "", ErrLevels, "the first backsight must be on a benchmark: give its elevation")
	}
	return 0, perr(path, r.line, "", ErrLevels, "backsight on %q, whose elevation is not known (give it, or level to it first)", r.id)
}

// addLevelled records a levelled row as a point when it has a position.
// A point levelled a second time keeps its first elevation; a difference
// beyond ConflictTolM is reported.
func addLevelled(f *rawFile, r *levelRow, elev float64, k int, opt *Options, elevOf map[string]float64, lineOf map[string]int, info *LevelInfo) error {
	if r.id != "" {
		if z0, seen := elevOf[r.id]; seen {
			if d := math.Abs(elev-z0) * opt.Units.Metres(); d > opt.ConflictTolM {
				f.warn(r.line, "point %q levelled again differs by %.3f m from line %d", r.id, d, lineOf[r.id])
			}
			return nil
		}
		elevOf[r.id] = elev
		lineOf[r.id] = r.line
	}
	if !r.placed {
		if !math.IsNaN(r.is) {
			return perr(f.info.Path, r.line, "", ErrColumns, "intermediate sight with no position: give its easting and northing")
		}
		info.Unplaced++
		return nil
	}
	p := rawPoint{id: r.id, explicitID: r.id != "", x: r.x, y: r.y, z: elev, code: r.code, hacc: nan, vacc: nan, line: r.line}
	if !p.explicitID {
		p.id = strconv.Itoa(k + 1)
	}
	f.pts = append(f.pts, p)
	return nil
}
