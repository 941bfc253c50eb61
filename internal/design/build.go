package design

import (
	"errors"
	"fmt"
	"math"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/grid"
)

// refineTarget is the relative change of cut and fill under halving at
// which the automatic cell choice stops (0.1 %).
const refineTarget = 0.001

// Build lays the design p on existing ground g and computes the finished
// grade and quantities (see the package comment for the model). Zones are
// validated first (errors are [*ZoneError]); other bad parameters wrap
// [ErrParams]. Earthwork that needs unsurveyed ground fails with an
// [*OffSurveyError]; a balance that cannot be found wraps [ErrNoBalance].
// Non-fatal issues are in Surface.Warnings.
func Build(g Terrain, p Params) (*Surface, error) {
	if g == nil {
		return nil, fmt.Errorf("%w: no existing-ground surface", ErrParams)
	}
	if p.BermSlope == 0 {
		p.BermSlope = DefaultBermSlope
	}
	if err := p.validate(); err != nil {
		return nil, err
	}
	zs, err := newZoneSet(p.Zones, p.FreeboardM)
	if err != nil {
		return nil, err
	}
	if g.Bounds().IsEmpty() {
		return nil, fmt.Errorf("%w: the existing-ground surface is empty", ErrParams)
	}
	b := &builder{g: g, p: p, zs: zs, berm: berm{crest: p.BermCrestM, slope: p.BermSlope}}
	w := p.WaterLevelM
	if p.Level == LevelAuto {
		if w, err = b.autoLevel(); err != nil {
			return nil, err
		}
	}
	start, fixed := p.CellM*2, p.CellM > 0
	if !fixed {
		start = b.startCell()
	}
	var prev, cur *level
	for k := 0; ; k++ {
		h := start / math.Exp2(float64(k))
		cur, err = b.level(h, w, prev)
		if err != nil {
			if errors.Is(err, grid.ErrTooLarge) && !fixed && prev != nil {
				if k == 1 {
					prev.change = math.NaN()
					b.warnf("the lattice could not be refined past %g m cells within %d nodes, so its accuracy is unchecked", prev.h, grid.MaxNodes)
				} else {
					b.warnf("the lattice could not be refined past %g m cells within %d nodes: halving last changed cut or fill by %.2g %%, short of the %.1g %% aimed at",
						prev.h, grid.MaxNodes, 100*prev.change, 100*refineTarget)
				}
				cur = prev
				break
			}
			return nil, err
		}
		if prev != nil {
			cur.change = relChange(prev.v, cur.v)
		}
		b.trim = cur.earthwork().Expand(2 * cur.h)
		if fixed {
			if k == 1 {
				if cur.change > refineTarget {
					b.warnf("with %g m cells, halving from %g m changed cut or fill by %.2g %%; a smaller cell would be more accurate",
						cur.h, 2*cur.h, 100*cur.change)
				}
				break
			}
		} else if k >= 2 && cur.change < refineTarget && prev.change < 8*refineTarget {
			// Two small changes in a row: one alone can be luck at coarse
			// cells, where the error is not yet of clean second order.
			break
		} else if h/2 < MinCellM {
			b.warnf("stopped at the finest cell, %g m, with halving changing cut or fill by %.2g %%", h, 100*cur.change)
			break
		}
		prev = cur
	}
	return b.surface(cur)
}

func (p *Params) validate() error {
	bad := func(name string, v float64, lo, hi float64, unit string) error {
		return fmt.Errorf("%w: %s must be between %g and %g%s, got %g", ErrParams, name, lo, hi, unit, v)
	}
	in := func(v, lo, hi float64) bool { return v >= lo && v <= hi }
	switch {
	case len(p.Zones) == 0:
		return fmt.Errorf("%w: the design has no zones", ErrParams)
	case !in(p.FreeboardM, 0, MaxFreeboardM):
		return bad("freeboard", p.FreeboardM, 0, MaxFreeboardM, " m")
	case !in(p.BermCrestM, 0, MaxBermCrestM):
		return bad("berm crest width", p.BermCrestM, 0, MaxBermCrestM, " m")
	case !in(p.BermSlope, 0, MaxWallSlope) || p.BermSlope == 0:
		return bad("berm slope", p.BermSlope, 0, MaxWallSlope, " (horizontal per vertical, above 0)")
	case math.IsNaN(p.CellM) || math.IsInf(p.CellM, 0) || p.CellM < 0:
		return fmt.Errorf("%w: cell size must be 0 (automatic) or a positive number of metres, got %g", ErrParams, p.CellM)
	}
	switch p.Level {
	case LevelFixed:
		if math.IsNaN(p.WaterLevelM) || math.IsInf(p.WaterLevelM, 0) {
			return fmt.Errorf("%w: water level must be a finite elevation, got %g", ErrParams, p.WaterLevelM)
		}
	case LevelAuto:
	case LevelBalance:
		if !(p.FillPerCut > 0 && p.FillPerCut <= MaxFillPerCut) {
			return fmt.Errorf("%w: balancing needs the fill made by one bank m³ of cut, above 0 and at most %g, got %g",
				ErrParams, MaxFillPerCut, p.FillPerCut)
		}
	default:
		return fmt.Errorf("%w: unknown water level mode %d", ErrParams, int(p.Level))
	}
	return nil
}

// relChange is the change from a to b of cut and fill, each relative to
// itself or to 1 % of the total earthwork when smaller.
func relChange(a, b volumes) float64 {
	floor := 0.01 * (b.cut + b.fill)
	if floor == 0 {
		return 0
	}
	c := math.Abs(b.cut-a.cut) / max(b.cut, floor)
	f := math.Abs(b.fill-a.fill) / max(b.fill, floor)
	return max(c, f)
}

type builder struct {
	g        Terrain
	p        Params
	zs       *zoneSet
	berm     berm
	warnings []string
	autoW    *float64
	boxes    map[float64]workArea
	ranges   map[geom.Box]groundRange
	quantum  float64 // work-box quantum, m (0 until first needed)
	// lastField is the field of the lattice built last, whose nodes a
	// lattice of half its cell shares.
	lastField *field
	// trim bounds the work area of the next, finer lattice: the earthwork
	// found on the last one, grown by two of its cells (empty at first).
	trim geom.Box
}

// earthwork returns the box of the lattice nodes where the finished grade
// differs from surveyed ground (empty when there are none).
func (lv *level) earthwork() geom.Box {
	l := lv.fd.lat
	i0, i1, j0, j1 := l.NX, -1, l.NY, -1
	for k, d := range lv.d {
		if g := lv.g[k]; d != g && !math.IsNaN(g) {
			i, j := k%l.NX, k/l.NX
			i0, i1, j0, j1 = min(i0, i), max(i1, i), min(j0, j), max(j1, j)
		}
	}
	if i1 < 0 {
		return geom.EmptyBox()
	}
	return geom.Box{Min: l.Node(i0, j0), Max: l.Node(i1, j1)}
}

// intersect returns the common part of a and b, or an empty box.
func intersect(a, b geom.Box) geom.Box {
	r := geom.Box{Min: geom.Vec2{X: max(a.Min.X, b.Min.X), Y: max(a.Min.Y, b.Min.Y)},
		Max: geom.Vec2{X: min(a.Max.X, b.Max.X), Y: min(a.Max.Y, b.Max.Y)}}
	if r.Min.X > r.Max.X || r.Min.Y > r.Max.Y {
		return geom.EmptyBox()
	}
	return r
}

func (b *builder) warnf(format string, args ...any) {
	b.warnings = append(b.warnings, fmt.Sprintf(format, args...))
}

// startCell picks the first cell of the automatic choice: a power of two
// of metres, at most an eighth of the largest zone's width scale (√area)
// and a sixteenth of the rim set's extent. Smaller zones need no finer
// start: the refinement test sees their error like any other.
func (b *builder) startCell() float64 {
	a := 0.0
	for i := range b.zs.z {
		a = max(a, b.zs.z[i].area)
	}
	rb := b.zs.rimBox()
	s := min(math.Sqrt(a)/8, max(rb.Width(), rb.Height())/16)
	return math.Exp2(math.Floor(math.Log2(s)))
}

// level is the design evaluated on one lattice.
type level struct {
	h      float64
	fd     *field
	g, d   []float64
	w      float64
	v      volumes
	change float64
	gmin   float64
	gmax   float64
	hasNaN bool // some node is off the surveyed surface
}

// terrainRange returns the lowest and highest ground sampled on a coarse
// lattice over box (NaN samples skipped); ok is false with no sample.
func (b *builder) terrainRange(box geom.Box) (lo, hi float64, ok bool) {
	tb := b.g.Bounds()
	x0, y0 := max(box.Min.X, tb.Min.X), max(box.Min.Y, tb.Min.Y)
	x1, y1 := min(box.Max.X, tb.Max.X), min(box.Max.Y, tb.Max.Y)
	if x0 > x1 || y0 > y1 {
		return 0, 0, false
	}
	const n = 65
	h := max(x1-x0, y1-y0) / (n - 1)
	if h == 0 {
		h = 1
	}
	nx, ny := int((x1-x0)/h)+1, int((y1-y0)/h)+1
	out := make([]float64, nx*ny)
	b.g.SampleLattice(x0, y0, h, nx, ny, out)
	lo, hi = math.Inf(1), math.Inf(-1)
	for _, z := range out {
		if !math.IsNaN(z) {
			lo, hi = min(lo, z), max(hi, z)
		}
	}
	return lo, hi, lo <= hi
}

// workBox bounds the work area for water level w: the zones' reach down
// to the lowest and up to the highest ground sampled in the box, grown
// until it no longer changes. Boxes are snapped outward to whole
// multiples of a quantum (a power of two near 1/64 of the rim set's
// extent), so the growth settles in a few steps and nearby water levels
// share their boxes and the ground ranges sampled over them.
func (b *builder) workBox(w float64) (box geom.Box, gmin, gmax float64, err error) {
	if r, ok := b.boxes[w]; ok {
		return r.box, r.gmin, r.gmax, nil
	}
	box = b.snap(b.zs.rimBox())
	for range 30 {
		lo, hi, ok := b.rangeOver(box)
		if !ok {
			return box, 0, 0, fmt.Errorf("%w: the zones (x %.2f to %.2f m, y %.2f to %.2f m) lie outside the surveyed surface",
				ErrOffSurvey, box.Min.X, box.Max.X, box.Min.Y, box.Max.Y)
		}
		gmin, gmax = lo, hi
		nb := b.snap(b.zs.workBox(w, lo, hi, b.berm.crest, b.berm.slope)).Union(box)
		if nb == box {
			break
		}
		box = nb
	}
	if b.boxes == nil {
		b.boxes = map[float64]workArea{}
	}
	b.boxes[w] = workArea{box, gmin, gmax}
	return box, gmin, gmax, nil
}

// workArea is a memoised result of [builder.workBox].
type workArea struct {
	box        geom.Box
	gmin, gmax float64
}

// snap returns the smallest box with corners on whole multiples of the
// work-box quantum that holds box. The quantum is a power of two, so the
// corners are exact.
func (b *builder) snap(box geom.Box) geom.Box {
	if b.quantum == 0 {
		rb := b.zs.rimBox()
		b.quantum = math.Exp2(math.Floor(math.Log2(max(rb.Width(), rb.Height()) / 64)))
	}
	q := b.quantum
	return geom.Box{
		Min: geom.Vec2{X: math.Floor(box.Min.X/q) * q, Y: math.Floor(box.Min.Y/q) * q},
		Max: geom.Vec2{X: math.Ceil(box.Max.X/q) * q, Y: math.Ceil(box.Max.Y/q) * q},
	}
}

// groundRange is a memoised result of [builder.terrainRange].
type groundRange struct {
	lo, hi float64
	ok     bool
}

// rangeOver is [builder.terrainRange] remembered by box.
func (b *builder) rangeOver(box geom.Box) (lo, hi float64, ok bool) {
	if r, found := b.ranges[box]; found {
		return r.lo, r.hi, r.ok
	}
	lo, hi, ok = b.terrainRange(box)
	if b.ranges == nil {
		b.ranges = map[geom.Box]groundRange{}
	}
	b.ranges[box] = groundRange{lo, hi, ok}
	return lo, hi, ok
}

// build samples the ground and prepares the field on a lattice of cell h
// over box.
func (b *builder) build(h float64, box geom.Box) (*level, error) {
	lat, err := grid.NewLattice(box.Expand(2*h), h)
	if err != nil {
		return nil, err
	}
	lv := &level{h: h, g: make([]float64, lat.Len()), d: make([]float64, lat.Len())}
	b.g.SampleLattice(lat.X0, lat.Y0, lat.H, lat.NX, lat.NY, lv.g)
	lv.fd = newFieldFrom(b.zs, lat, b.lastField)
	b.lastField = lv.fd
	lv.gmin, lv.gmax = math.Inf(1), math.Inf(-1)
	for _, z := range lv.g {
		if math.IsNaN(z) {
			lv.hasNaN = true
		} else {
			lv.gmin, lv.gmax = min(lv.gmin, z), max(lv.gmax, z)
		}
	}
	return lv, nil
}

// touchesBorder reports whether the finished grade differs from surveyed
// ground on the lattice's outer nodes, so the work area was cut short.
func (lv *level) touchesBorder() bool {
	l := lv.fd.lat
	check := func(i, j int) bool {
		k := l.Index(i, j)
		return !math.IsNaN(lv.g[k]) && lv.d[k] != lv.g[k]
	}
	for i := 0; i < l.NX; i++ {
		if check(i, 0) || check(i, l.NY-1) {
			return true
		}
	}
	for j := 0; j < l.NY; j++ {
		if check(0, j) || check(l.NX-1, j) {
			return true
		}
	}
	return false
}

// evalAt evaluates the design at water level w on a lattice of cell h,
// reusing lv when its lattice covers the work area, growing the area when
// the earthwork reaches its edge, and checking that no needed ground is
// unsurveyed.
func (b *builder) evalAt(lv *level, h, w float64) (*level, error) {
	box, _, _, err := b.workBox(w)
	if err != nil {
		return nil, err
	}
	if !b.trim.IsEmpty() {
		box = intersect(box, b.trim).Union(b.snap(b.zs.rimBox()))
	}
	if lv != nil {
		lb := lv.fd.lat.Bounds()
		if lb.Min.X <= box.Min.X && lb.Min.Y <= box.Min.Y && lb.Max.X >= box.Max.X && lb.Max.Y >= box.Max.Y {
			box = lb
		} else {
			box = box.Union(lb).Expand(0.1 * max(box.Width(), box.Height()))
			lv = nil
		}
	}
	for attempt := 0; ; attempt++ {
		if lv == nil {
			if lv, err = b.build(h, box); err != nil {
				return nil, err
			}
		}
		lv.v = lv.fd.evaluate(w, lv.g, lv.d, b.berm)
		lv.w = w
		if !lv.touchesBorder() {
			break
		}
		if attempt == 6 {
			return nil, fmt.Errorf("%w: the earthwork still reaches the edge of a %.0f × %.0f m work area", ErrOffSurvey, box.Width(), box.Height())
		}
		box = lv.fd.lat.Bounds()
		box = box.Expand(0.25*max(box.Width(), box.Height()) + 4*h)
		lv = nil
	}
	if lv.hasNaN {
		if err := b.coverage(lv); err != nil {
			return nil, err
		}
	}
	return lv, nil
}

// coverage fails when the design needs ground where there is no survey:
// an unsurveyed node in the bowl, or a surveyed node next to an
// unsurveyed one where the finished grade differs from the ground.
func (b *builder) coverage(lv *level) error {
	fd := lv.fd
	l := fd.lat
	f := b.zs.freeboard
	needed, inBowl := false, false
	edge := map[int]bool{} // unsurveyed nodes next to surveyed earthwork
	for j := 0; j < l.NY; j++ {
		for i := 0; i < l.NX; i++ {
			k := l.Index(i, j)
			if math.IsNaN(lv.g[k]) {
				if fd.e[k] <= f {
					needed, inBowl = true, true
				}
				continue
			}
			if lv.d[k] == lv.g[k] {
				continue
			}
			for _, q := range [4][2]int{{i - 1, j}, {i + 1, j}, {i, j - 1}, {i, j + 1}} {
				if q[0] >= 0 && q[0] < l.NX && q[1] >= 0 && q[1] < l.NY && math.IsNaN(lv.g[l.Index(q[0], q[1])]) {
					needed = true
					edge[l.Index(q[0], q[1])] = true
				}
			}
		}
	}
	if !needed {
		return nil
	}
	valid := make([]bool, l.Len())
	for k, z := range lv.g {
		valid[k] = !math.IsNaN(z)
	}
	dist := grid.EDT(l, valid)
	oe := &OffSurveyError{Box: geom.EmptyBox(), InBowl: inBowl}
	for k, z := range lv.g {
		if !math.IsNaN(z) {
			continue
		}
		e := fd.e[k]
		bz := lv.w + f - max(0, fd.rho[k]-b.berm.crest)/b.berm.slope
		if edge[k] || e <= f || lv.w+e < lv.gmax || bz > lv.gmin {
			oe.BeyondM = max(oe.BeyondM, dist[k])
			oe.Box = oe.Box.Extend(l.Node(k%l.NX, k/l.NX))
		}
	}
	return oe
}

// level evaluates the design on a lattice of cell h: at water level w, or
// for LevelBalance at the balancing level found on that lattice.
func (b *builder) level(h, w float64, prev *level) (*level, error) {
	if b.p.Level == LevelBalance {
		return b.balance(h, prev)
	}
	return b.evalAt(nil, h, w)
}

// surface assembles the result from the chosen level.
func (b *builder) surface(lv *level) (*Surface, error) {
	fd := lv.fd
	zs := b.zs
	s := &Surface{
		Params: b.p, Lattice: fd.lat, G: lv.g, D: lv.d,
		WaterLevelM: lv.w, RimM: lv.w + zs.freeboard, Level: b.p.Level,
		CutM3: lv.v.cut, FillM3: lv.v.fill,
		CutAreaM2: lv.v.cutArea, FillAreaM2: lv.v.fillArea, DisturbedAreaM2: lv.v.cutArea + lv.v.fillArea,
		CellM: lv.h, RefineChange: lv.change, MaxDepthM: zs.maxDepth,
		fd: fd, zs: zs, berm: b.berm, bowl: &lazyBowl{},
	}
	s.E = make([]float64, len(fd.e))
	for k, e := range fd.e {
		s.E[k] = lv.w + e
	}
	s.WaterVolumeM3, s.WaterAreaM2 = fd.water()
	if s.WaterAreaM2 > 0 {
		s.MeanDepthM = s.WaterVolumeM3 / s.WaterAreaM2
	}
	floors := fd.floorAreas()
	for i := range zs.z {
		s.ByZone = append(s.ByZone, ZoneVolume{Name: zs.z[i].name, CutM3: lv.v.zoneCut[i], FillM3: lv.v.zoneFill[i], FloorAreaM2: floors[i]})
	}
	switch {
	case lv.w > lv.gmax:
		b.warnf("the water level %.3f m is above all surveyed ground of the work area (highest %.3f m): the pond stands entirely on fill",
			lv.w, lv.gmax)
	case lv.w+zs.freeboard < lv.gmin-zs.maxDepth:
		b.warnf("the rim %.3f m is more than the pond's greatest depth (%.2f m) below all ground of the work area (lowest %.3f m): the walls run up far above the rim; check that the water level is an elevation, not a depth",
			lv.w+zs.freeboard, zs.maxDepth, lv.gmin)
	}
	s.Warnings = b.warnings
	return s, nil
}
