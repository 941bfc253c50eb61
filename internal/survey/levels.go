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

// levelBook is the state of a level book being reduced.
type levelBook struct {
	f      *rawFile
	lay    *layout
	opt    *Options
	info   *LevelInfo
	xr, yr role // position columns

	hi        float64   // height of instrument, NaN between setups
	pending   *levelRow // the last foresight, waiting for its backsight
	elevOf    map[string]float64
	lineOf    map[string]int
	warnedRod bool
}

// readLevels computes elevations from the rod readings of a level book by
// the height-of-instrument method (any surveying textbook on differential
// levelling): HI = elevation + BS; elevation = HI − IS for an intermediate
// sight and HI − FS for a foresight; a turning point's foresight is followed
// by a backsight on the same row or the next (HI = its elevation + BS).
// Rod readings and elevations are in Options.Units.
func readLevels(f *rawFile, lay *layout, lines []textLine, opt *Options, prog *progress) error {
	b := &levelBook{f: f, lay: lay, opt: opt, info: &LevelInfo{}, xr: roleEast, yr: roleNorth,
		hi: nan, elevOf: map[string]float64{}, lineOf: map[string]int{}}
	if lay.geo {
		b.xr, b.yr = roleLon, roleLat
		f.geographic = true
		f.info.Geographic = true
	}
	if !lay.has(b.xr) {
		return perr(f.info.Path, lines[0].n-1, "", ErrColumns, "a level book needs position columns (easting and northing, or latitude and longitude) to place its points")
	}
	f.info.Levels = b.info
	for k, l := range lines {
		prog.step(k, len(lines))
		r, err := b.parseRow(l)
		if err != nil {
			return err
		}
		elev, err := b.reduce(&r)
		if err != nil {
			return err
		}
		if err := b.add(&r, elev, k); err != nil {
			return err
		}
	}
	f.info.Points = len(f.pts)
	if len(f.pts) == 0 {
		return perr(f.info.Path, 0, "", ErrEmpty, "the level book places no points (no row has a position)")
	}
	return nil
}

func has(v float64) bool { return !math.IsNaN(v) }

// parseRow reads the readings and position of one row and checks that its
// readings go together.
func (b *levelBook) parseRow(l textLine) (levelRow, error) {
	path, lay := b.f.info.Path, b.lay
	r := levelRow{line: l.n}
	fields, err := rowFields(path, l, lay)
	if err != nil {
		return r, err
	}
	r.id, r.code = lay.field(fields, roleID), lay.field(fields, roleDesc)
	for _, v := range []struct {
		ro  role
		dst *float64
	}{{roleBS, &r.bs}, {roleIS, &r.is}, {roleFS, &r.fs}, {lay.z, &r.z}} {
		if *v.dst, err = parseOptNum(path, l.n, lay.fieldName(v.ro), lay.field(fields, v.ro)); err != nil {
			return r, err
		}
	}
	if sx, sy := lay.field(fields, b.xr), lay.field(fields, b.yr); sx != "" || sy != "" {
		if r.x, err = parseNum(path, l.n, lay.fieldName(b.xr), sx); err != nil {
			return r, err
		}
		if r.y, err = parseNum(path, l.n, lay.fieldName(b.yr), sy); err != nil {
			return r, err
		}
		if lay.geo {
			if err := checkLonLat(path, l.n, r.x, r.y); err != nil {
				return r, err
			}
		}
		r.placed = true
	}
	switch {
	case !has(r.bs) && !has(r.is) && !has(r.fs):
		return r, perr(path, l.n, "", ErrLevels, "row has no rod reading (bs, is or fs)")
	case has(r.is) && has(r.fs):
		return r, perr(path, l.n, lay.fieldName(roleIS), ErrLevels, "row has both an intermediate sight and a foresight")
	case has(r.is) && has(r.bs):
		return r, perr(path, l.n, lay.fieldName(roleIS), ErrLevels, "row has both a backsight and an intermediate sight")
	}
	if !b.warnedRod {
		u := b.opt.Units
		for _, v := range []float64{r.bs, r.is, r.fs} {
			if has(v) && math.Abs(v)*u.Metres() > MaxRodM {
				b.f.warn(l.n, "rod reading %s %s is longer than a levelling rod (at most 25 ft, 7.62 m): are the readings in another unit than --units %s?", fmtNum(v), u, u)
				b.warnedRod = true
				break
			}
		}
	}
	return r, nil
}

// reduce carries the levels through one row and returns the row's
// elevation (in file units).
func (b *levelBook) reduce(r *levelRow) (float64, error) {
	path := b.f.info.Path
	if math.IsNaN(b.hi) {
		// A new setup: this row must be a backsight on a known point.
		if has(r.is) || has(r.fs) {
			if b.pending != nil {
				return 0, perr(path, r.line, "", ErrLevels, "no instrument height: after the foresight on line %d the next reading must be a backsight", b.pending.line)
			}
			return 0, perr(path, r.line, "", ErrLevels, "no instrument height: the book must start with a backsight on a benchmark (a row with an elevation and a bs reading)")
		}
		ref, err := b.backsightRef(r, b.pending)
		if err != nil {
			return 0, err
		}
		if b.pending != nil && !has(r.z) {
			b.info.TurningPoints++
		}
		b.hi = ref + r.bs
		b.info.Setups++
		b.pending = nil
		return ref, nil
	}
	var elev float64
	switch {
	case has(r.is):
		elev = b.hi - r.is
	case has(r.fs):
		elev = b.hi - r.fs
	default: // a second backsight with no foresight before it
		if _, known := b.elevOf[r.id]; !has(r.z) && (r.id == "" || !known) {
			return 0, perr(path, r.line, b.lay.fieldName(roleBS), ErrLevels, "backsight with no foresight before it: a new setup needs a turning point (fs) or a point of known elevation")
		}
		ref, err := b.backsightRef(r, nil)
		if err != nil {
			return 0, err
		}
		b.hi = ref + r.bs
		b.info.Setups++
		return ref, nil
	}
	if has(r.z) {
		m := b.opt.Units.Metres()
		b.info.Checks = append(b.info.Checks, LevelCheck{Point: r.id, Line: r.line,
			ComputedM: elev * m, KnownM: r.z * m, MisclosureM: (elev - r.z) * m})
		// A benchmark keeps its known elevation, and the run continues
		// from it.
		elev = r.z
	}
	if has(r.fs) {
		if has(r.bs) {
			b.hi = elev + r.bs
			b.info.Setups++
			b.info.TurningPoints++
		} else {
			b.hi = nan
			tp := *r
			tp.z = elev
			b.pending = &tp
		}
	}
	return elev, nil
}

// backsightRef returns the elevation a backsight is taken on: the row's
// known elevation, else the turning point of the pending foresight (the
// same id or none), else an earlier point with that id.
func (b *levelBook) backsightRef(r *levelRow, pending *levelRow) (float64, error) {
	path := b.f.info.Path
	if has(r.z) {
		return r.z, nil
	}
	if pending != nil && (r.id == "" || r.id == pending.id) {
		r.id = pending.id
		return pending.z, nil
	}
	if z, ok := b.elevOf[r.id]; ok && r.id != "" {
		return z, nil
	}
	if pending == nil && len(b.elevOf) == 0 {
		return 0, perr(path, r.line, "", ErrLevels, "the first backsight must be on a benchmark: give its elevation")
	}
	return 0, perr(path, r.line, "", ErrLevels, "backsight on %q, whose elevation is not known (give it, or level to it first)", r.id)
}

// add records a levelled row as a point when it has a position. A point
// levelled a second time keeps its first elevation; a difference beyond
// ConflictTolM is reported.
func (b *levelBook) add(r *levelRow, elev float64, k int) error {
	f := b.f
	if r.id != "" {
		if z0, seen := b.elevOf[r.id]; seen {
			if d := math.Abs(elev-z0) * b.opt.Units.Metres(); d > b.opt.ConflictTolM {
				f.warn(r.line, "point %q levelled again differs by %.3f m from line %d", r.id, d, b.lineOf[r.id])
			}
			return nil
		}
		b.elevOf[r.id] = elev
		b.lineOf[r.id] = r.line
	}
	if !r.placed {
		if has(r.is) {
			return perr(f.info.Path, r.line, "", ErrColumns, "intermediate sight with no position: give its easting and northing")
		}
		b.info.Unplaced++
		return nil
	}
	p := rawPoint{id: r.id, explicitID: r.id != "", x: r.x, y: r.y, z: elev, code: r.code, hacc: nan, vacc: nan, line: r.line}
	if !p.explicitID {
		p.id = strconv.Itoa(k + 1)
	}
	f.pts = append(f.pts, p)
	return nil
}
