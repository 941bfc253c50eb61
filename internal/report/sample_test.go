package report

import (
	"bytes"
	"fmt"
	"math"
	"slices"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/units"
)

// The sample job below is made up: a koi pond for an invented household on
// an invented street of an invented town, on a yard that falls gently to the
// east-south-east. Its ground and design are analytic surfaces, so every
// layer of the drawings (contours, depth raster, rim, water line, berm toe,
// sections) comes from one consistent model and the report's figures agree
// with the drawings.

// sampleFrame is the local frame of the sample yard: a rounded UTM-sized
// origin (metres), as the survey importer would choose.
var sampleFrame = geom.Frame{Origin: geom.Vec2{X: 512340, Y: 4987650}}

const (
	sampleGround0  = 30.48 // m: 100.00 ft on the site datum
	sampleRimM     = 30.60 // rim level (m), 100.39 ft
	sampleFreeM    = 0.15  // freeboard (m): water 6 in below the rim
	sampleWaterM   = sampleRimM - sampleFreeM
	sampleRimFlatM = 0.6 // flat top of bank outside the rim (m)
	sampleSlope    = 3.0 // outside grading slope, 3 horizontal : 1 vertical
	sampleRotDeg   = 20.0
	sampleCellM    = 0.25
)

// sampleGround is the existing ground G (m) at local (x, y): a plane rising
// to the west and north with gentle swells (the yard drains to the east).
func sampleGround(x, y float64) float64 {
	return sampleGround0 - 0.045*x + 0.015*y + 0.15*math.Sin(x/7)*math.Cos(y/9)
}

// sampleOutline returns the pond's rim radius (m) in direction theta
// (radians, local frame): a lobed ellipse 13 × 8.4 m turned 20°.
func sampleOutline(theta float64) float64 {
	t := theta - sampleRotDeg*math.Pi/180
	a, b := 6.5, 4.2
	r := a * b / math.Hypot(b*math.Cos(t), a*math.Sin(t))
	return r * (1 + 0.08*math.Cos(3*t+0.5))
}

// sampleZones are the depth zones, outermost first: name, depth below water
// (m), and the normalised radius of the zone's outline.
var sampleZones = []struct {
	name   string
	depthM float64
	r      float64
}{
	{"Marginal shelf", 0.25, 1.0},
	{"Mid shelf", 0.60, 0.62},
	{"Deep zone", 1.10, 0.45},
}

// sampleBowl is the finished grade inside the rim as a function of the
// normalised radius r (0 centre, 1 rim): flat zone floors joined by slopes.
func sampleBowl(r float64) float64 {
	type knot struct{ r, z float64 }
	w := sampleWaterM
	ks := []knot{{0, w - 1.10}, {0.35, w - 1.10}, {0.45, w - 0.60}, {0.62, w - 0.60}, {0.78, w - 0.25}, {0.93, w - 0.25}, {1, sampleRimM}}
	for i := 1; i < len(ks); i++ {
		if r <= ks[i].r {
			f := (r - ks[i-1].r) / (ks[i].r - ks[i-1].r)
			return ks[i-1].z + f*(ks[i].z-ks[i-1].z)
		}
	}
	return sampleRimM
}

// sampleDesign is the finished grade D (m) at local (x, y): the bowl inside
// the rim; outside it a flat top of bank, then a 3:1 slope up (cut) or down
// (fill berm) to meet the ground.
func sampleDesign(x, y float64) float64 {
	theta := math.Atan2(y, x)
	rho := sampleOutline(theta)
	d := math.Hypot(x, y)
	if d <= rho {
		return sampleBowl(d / rho)
	}
	g := sampleGround(x, y)
	e := d - rho
	if e <= sampleRimFlatM {
		return sampleRimM
	}
	lim := (e - sampleRimFlatM) / sampleSlope
	return sampleRimM + math.Max(-lim, math.Min(lim, g-sampleRimM))
}

// sampleRing returns the outline scaled to normalised radius r, as n
// vertices counter-clockwise.
func sampleRing(r float64, n int) geom.Ring {
	ring := make(geom.Ring, n)
	for k := range n {
		th := 2 * math.Pi * float64(k) / float64(n)
		rho := r * sampleOutline(th)
		ring[k] = geom.Vec2{X: rho * math.Cos(th), Y: rho * math.Sin(th)}
	}
	return ring
}

// traceContours traces the level lines of f over the box [x0, x1] × [y0,
// y1] sampled every h metres, by marching squares, keeping only cells where
// keep is true (nil keeps all). Segments are joined into polylines through
// the grid edges they share. Saddle cells are split the same way every time,
// which is good enough for drawing sample data.
func traceContours(f func(x, y float64) float64, keep func(x, y float64) bool, x0, y0, x1, y1, h float64, levels []float64) [][]geom.Polyline {
	nx := int(math.Round((x1-x0)/h)) + 1
	ny := int(math.Round((y1-y0)/h)) + 1
	v := make([]float64, nx*ny)
	for j := range ny {
		for i := range nx {
			v[j*nx+i] = f(x0+float64(i)*h, y0+float64(j)*h)
		}
	}
	pos := func(i, j int) geom.Vec2 { return geom.Vec2{X: x0 + float64(i)*h, Y: y0 + float64(j)*h} }
	out := make([][]geom.Polyline, len(levels))
	for li, z := range levels {
		// An edge key: 2·(j·nx+i) for the edge east of (i, j), +1 for north.
		type seg struct{ a, b int }
		point := map[int]geom.Vec2{}
		cross := func(i, j, di, dj int) (int, bool) {
			a, b := v[j*nx+i], v[(j+dj)*nx+i+di]
			if (a >= z) == (b >= z) {
				return 0, false
			}
			key := 2 * (j*nx + i)
			if dj == 1 {
				key++
			}
			t := (z - a) / (b - a)
			point[key] = pos(i, j).Lerp(pos(i+di, j+dj), t)
			return key, true
		}
		var segs []seg
		for j := 0; j+1 < ny; j++ {
			for i := 0; i+1 < nx; i++ {
				c := pos(i, j).Add(geom.Vec2{X: h / 2, Y: h / 2})
				if keep != nil && !keep(c.X, c.Y) {
					continue
				}
				var ks []int
				if k, ok := cross(i, j, 1, 0); ok { // south
					ks = append(ks, k)
				}
				if k, ok := cross(i+1, j, 0, 1); ok { // east
					ks = append(ks, k)
				}
				if k, ok := cross(i, j+1, 1, 0); ok { // north
					ks = append(ks, k)
				}
				if k, ok := cross(i, j, 0, 1); ok { // west
					ks = append(ks, k)
				}
				for k := 0; k+1 < len(ks); k += 2 {
					segs = append(segs, seg{ks[k], ks[k+1]})
				}
			}
		}
		adj := map[int][]int{}
		for si, s := range segs {
			adj[s.a] = append(adj[s.a], si)
			adj[s.b] = append(adj[s.b], si)
		}
		used := make([]bool, len(segs))
		walk := func(start, from int) []int {
			keys := []int{from}
			cur, si := from, start
			for {
				used[si] = true
				s := segs[si]
				next := s.a
				if next == cur {
					next = s.b
				}
				keys = append(keys, next)
				cur = next
				found := -1
				for _, o := range adj[cur] {
					if !used[o] {
						found = o
						break
					}
				}
				if found < 0 {
					return keys
				}
				si = found
			}
		}
		// Start open lines at their ends (edges with one segment), then
		// the closed loops.
		var ends []int
		for k, ss := range adj {
			if len(ss) == 1 {
				ends = append(ends, k)
			}
		}
		slices.Sort(ends)
		var lines []geom.Polyline
		emit := func(keys []int) {
			l := make(geom.Polyline, len(keys))
			for i, k := range keys {
				l[i] = point[k]
			}
			if len(l) >= 2 {
				lines = append(lines, l)
			}
		}
		for _, k := range ends {
			if si := adj[k][0]; !used[si] {
				emit(walk(si, k))
			}
		}
		for si := range segs {
			if !used[si] {
				emit(walk(si, segs[si].a))
			}
		}
		out[li] = lines
	}
	return out
}

// sampleBox is the surveyed area of the sample yard (local metres).
var sampleBox = geom.Box{Min: geom.Vec2{X: -14, Y: -11}, Max: geom.Vec2{X: 14, Y: 11}}

// samplePlan returns the plan of the sample job.
func samplePlan() PlanData {
	p := PlanData{
		Title:         sampleTitle(),
		Units:         units.Feet,
		Frame:         sampleFrame,
		HasWaterLevel: true,
		WaterLevelM:   sampleWaterM,
	}
	// Contours every 0.25 ft, index every 1 ft.
	var levels []float64
	var index []bool
	for k := 390; k <= 412; k++ {
		levels = append(levels, float64(k)*0.25*units.Foot)
		index = append(index, k%4 == 0)
	}
	b := sampleBox
	ex := traceContours(sampleGround, nil, b.Min.X, b.Min.Y, b.Max.X, b.Max.Y, 0.25, levels)
	graded := func(x, y float64) bool { return math.Abs(sampleDesign(x, y)-sampleGround(x, y)) > 0.005 }
	des := traceContours(sampleDesign, graded, b.Min.X, b.Min.Y, b.Max.X, b.Max.Y, 0.25, levels)
	for i, z := range levels {
		if len(ex[i]) > 0 {
			p.Existing = append(p.Existing, PlanContour{LevelM: z, Index: index[i], Lines: ex[i]})
		}
		if len(des[i]) > 0 {
			p.Design = append(p.Design, PlanContour{LevelM: z, Index: index[i], Lines: des[i]})
		}
	}
	for _, z := range sampleZones {
		p.Zones = append(p.Zones, PlanZone{Name: z.name, DepthM: z.depthM, Ring: sampleRing(z.r, 120)})
	}
	// The water meets the bowl's outer slope (0.93 < r < 1).
	rw := 0.93 + 0.07*0.25/(sampleRimM-sampleWaterM+0.25)
	p.WaterLine = []geom.Ring{sampleRing(rw, 120)}
	p.Rim = []geom.Ring{sampleRing(1, 120)}
	p.BermToe = sampleBermToe()

	nx := int(b.Width() / sampleCellM)
	ny := int(b.Height() / sampleCellM)
	p.Depth = PlanDepthMap{Origin: b.Min, CellM: sampleCellM, NX: nx, NY: ny, DM: make([]float64, nx*ny)}
	for j := range ny {
		for i := range nx {
			x := b.Min.X + (float64(i)+0.5)*sampleCellM
			y := b.Min.Y + (float64(j)+0.5)*sampleCellM
			dz := sampleDesign(x, y) - sampleGround(x, y)
			if math.Abs(dz) < 1e-9 {
				dz = math.NaN()
			}
			p.Depth.DM[j*nx+i] = dz
		}
	}
	p.Points = samplePoints()
	p.Sections = []PlanSectionLine{
		{Name: "A", Line: sampleSectionTrace(sampleRotDeg, 11)},
		{Name: "B", Line: sampleSectionTrace(sampleRotDeg+90, 8.5)},
	}
	p.Notes = []string{
		"Elevations on the site datum: BM1, top of the water-meter lid by the drive, = 100.00 ft.",
		"Existing ground from 70 total-station shots taken 2 May 2026.",
		"Contours every 0.25 ft; index contours every 1 ft are labelled.",
		"Finished grade is the subgrade under the liner and underlayment.",
		"Grid ticks are UTM zone 10N coordinates in feet.",
	}
	return p
}

// sampleTitle is the invented job.
func sampleTitle() TitleBlock {
	return TitleBlock{
		Site:     "Ferreira-Asante koi pond",
		Client:   "Dolores & Kwame Ferreira-Asante",
		Address:  "118 Ashgrove Lane, Tamsin Falls",
		Date:     "14 May 2026",
		Preparer: "Brightwater Ponds & Grading (J. Lindqvist)",
	}
}

// sampleSectionTrace returns a straight section line through the centre at
// bearing deg (degrees from +x), half-length m.
func sampleSectionTrace(deg, half float64) geom.Polyline {
	t := deg * math.Pi / 180
	d := geom.Vec2{X: math.Cos(t), Y: math.Sin(t)}
	return geom.Polyline{d.Scale(-half), d.Scale(half)}
}

// sampleBermToe returns the toe of the fill berm: along each direction
// where the ground at the rim is below the rim level, the distance where the
// 3:1 berm slope meets the ground.
func sampleBermToe() []geom.Polyline {
	const n = 360
	pts := make([]geom.Vec2, n)
	has := make([]bool, n)
	for k := range n {
		th := 2 * math.Pi * float64(k) / n
		rho := sampleOutline(th)
		u := geom.Vec2{X: math.Cos(th), Y: math.Sin(th)}
		at := func(e float64) geom.Vec2 { return u.Scale(rho + e) }
		g0 := sampleGround(at(sampleRimFlatM).X, at(sampleRimFlatM).Y)
		if g0 >= sampleRimM {
			continue
		}
		// berm(e) − G(e) falls from > 0 to < 0: bisect.
		lo, hi := sampleRimFlatM, 20.0
		for range 60 {
			mid := (lo + hi) / 2
			p := at(mid)
			if sampleRimM-(mid-sampleRimFlatM)/sampleSlope > sampleGround(p.X, p.Y) {
				lo = mid
			} else {
				hi = mid
			}
		}
		pts[k], has[k] = at(lo), true
	}
	// Start at a direction without berm so that each run is whole.
	start := slices.Index(has, false)
	if start < 0 {
		return []geom.Polyline{pts}
	}
	var lines []geom.Polyline
	var cur geom.Polyline
	for k := range n + 1 {
		i := (start + k) % n
		if has[i] {
			cur = append(cur, pts[i])
			continue
		}
		if len(cur) >= 2 {
			lines = append(lines, cur)
		}
		cur = nil
	}
	return lines
}

// samplePoints returns the survey shots: a jittered 3.2 m grid over the yard
// plus shots on the old ground at the pond's centre line.
func samplePoints() []PlanMark {
	var ms []PlanMark
	n := 1
	for j := 0; j < 7; j++ {
		for i := 0; i < 10; i++ {
			jx := 0.8 * math.Sin(float64(i)*12.9898+float64(j)*78.233)
			jy := 0.8 * math.Sin(float64(i)*39.3468+float64(j)*11.135)
			at := geom.Vec2{X: -13 + float64(i)*2.9 + jx, Y: -10 + float64(j)*3.3 + jy}
			ms = append(ms, PlanMark{ID: fmt.Sprintf("%d", 100+n), At: at})
			n++
		}
	}
	return ms
}

// sampleSection returns the cross-section along the sample section trace
// name ("A" or "B").
func sampleSection(name string) SectionData {
	deg, half := sampleRotDeg, 11.0
	if name == "B" {
		deg, half = sampleRotDeg+90, 8.5
	}
	line := sampleSectionTrace(deg, half)
	s := SectionData{Name: name, Site: sampleTitle().Site, Units: units.Feet, HasWaterLevel: true,
		WaterLevelM: sampleWaterM, LinerOverlapM: 0.6096} // 2 ft overlap
	const step = 0.05
	n := int(2*half/step) + 1
	inside := func(p geom.Vec2) float64 { return p.Norm() - sampleOutline(math.Atan2(p.Y, p.X)) }
	prevIn := 0.0
	for k := range n {
		st := float64(k) * step
		p := line[0].Lerp(line[1], st/(2*half))
		s.Existing = append(s.Existing, ProfilePoint{S: st, Z: sampleGround(p.X, p.Y)})
		s.Finished = append(s.Finished, ProfilePoint{S: st, Z: sampleDesign(p.X, p.Y)})
		in := inside(p)
		if k > 0 && (in < 0) != (prevIn < 0) {
			// Bisect the rim crossing between the last two samples.
			lo, hi := st-step, st
			for range 50 {
				mid := (lo + hi) / 2
				q := line[0].Lerp(line[1], mid/(2*half))
				if (inside(q) < 0) == (prevIn < 0) {
					lo = mid
				} else {
					hi = mid
				}
			}
			s.RimS = append(s.RimS, (lo+hi)/2)
		}
		prevIn = in
	}
	return s
}

// sampleReport returns the full report of the sample job, with the plan and
// both sections drawn. Its numbers are computed from the same model.
func sampleReport(tb testing.TB) ReportData {
	tb.Helper()
	sys := units.Feet
	plan := samplePlan()
	var planSVG bytes.Buffer
	if err := Plan(&planSVG, plan); err != nil {
		tb.Fatal(err)
	}
	var secSVGs []string
	var linerLen [2]float64
	for i, name := range []string{"A", "B"} {
		sd := sampleSection(name)
		var b bytes.Buffer
		if err := Section(&b, sd); err != nil {
			tb.Fatal(err)
		}
		secSVGs = append(secSVGs, b.String())
		l := linerProfile(&sd)
		for k := 1; k < len(l); k++ {
			linerLen[i] += math.Hypot(l[k].S-l[k-1].S, l[k].Z-l[k-1].Z)
		}
	}

	// Earthwork from the depth raster (bank measure).
	var cut, fill geom.Sum
	cell2 := plan.Depth.CellM * plan.Depth.CellM
	for _, v := range plan.Depth.DM {
		switch {
		case v < 0:
			cut.Add(-v * cell2)
		case v > 0:
			fill.Add(v * cell2)
		}
	}
	// Water volume and floor area on a finer lattice.
	var water, floor geom.Sum
	const h = 0.05
	for y := -9.0; y < 9; y += h {
		for x := -9.0; x < 9; x += h {
			cx, cy := x+h/2, y+h/2
			if math.Hypot(cx, cy) > sampleOutline(math.Atan2(cy, cx)) {
				continue
			}
			if d := sampleDesign(cx, cy); d < sampleWaterM {
				water.Add((sampleWaterM - d) * h * h)
				floor.Add(h * h)
			}
		}
	}
	rim := sampleRing(1, 720)
	rw := 0.93 + 0.07*0.25/(sampleRimM-sampleWaterM+0.25)
	shore := sampleRing(rw, 720).Perimeter()
	box := rim.Bounds()
	const swell = 1.25 // loam, bank to loose (FM 5-434 Table 1-2, from memory)
	const truckM3 = 10 * units.CubicYard
	export := cut.Value() - fill.Value()
	loose := export * swell
	loads := math.Ceil(loose / truckM3)
	stoneKg := rim.Perimeter() * 0.45 * 0.2 * 2640 * (1 - 0.35)
	gravelKg := floor.Value() * 0.05 * 1600
	crewH := stoneKg/units.ShortTon/(0.2*3) + 4
	pumpQ := water.Value() / 3600 // one turnover an hour, m³/s
	maxDepth := sampleWaterM - sampleBowl(0)
	overlap := 0.6096
	ruleL := box.Width() + 2*maxDepth + 2*overlap
	ruleW := box.Height() + 2*maxDepth + 2*overlap
	sheetL := math.Ceil(linerLen[0]/units.Foot/5) * 5 * units.Foot // sheets come in 5 ft steps
	sheetW := math.Ceil(linerLen[1]/units.Foot/5) * 5 * units.Foot
	area := sheetL * sheetW
	ruleGal := box.Width() * box.Height() * maxDepth * 0.6

	money := func(v float64) string { return groupDigits(fixed(v, 0), sys) }
	linerCost := area / units.SquareFoot * 1.10
	underCost := area / units.SquareFoot * 0.32
	digCost := loose / units.CubicYard * 38
	stoneCost := stoneKg / units.ShortTon * 310
	gravelCost := gravelKg / units.ShortTon * 62
	labour := crewH * 3 * 58
	total := linerCost + underCost + digCost + stoneCost + gravelCost + labour

	q := func(label string, si float64, k Quantity, note string) Row {
		return QuantityRow(label, si, k, sys, note)
	}
	r := ReportData{
		Title:   sampleTitle(),
		Heading: "Pond estimate",
		Units:   sys,
		Summary: []Row{
			q("Dig (bank measure)", cut.Value(), Volume, ""),
			q("Haul away (loose)", loose, Volume, fmt.Sprintf("%d loads of 10 yd³", int(loads))),
			{Label: "Liner sheet", Value: trimNum(sheetL/units.Foot, 0) + " × " + trimNum(sheetW/units.Foot, 0), Unit: "ft",
				Alt: fixed(sheetL, 2) + " × " + fixed(sheetW, 2) + " m", Note: "EPDM 45 mil"},
			q("Water when full", water.Value(), WaterVolume, ""),
			q("Edge stone", stoneKg, Mass, ""),
			{Label: "Price", Value: "$" + money(total), Note: "before tax"},
		},
		PlanSVG:     planSVG.String(),
		SectionSVGs: secSVGs,
		Quantities: []ReportSection{
			{Title: "Earthwork and haul", Rows: []Row{
				q("Cut, bank measure", cut.Value(), Volume, "finished grade below existing ground"),
				q("Fill, bank measure", fill.Value(), Volume, "berm on the east side, from the cut"),
				q("Net to haul away, bank", export, Volume, ""),
				{Label: "Swell factor", Value: "1.25", Note: "loam, bank to loose (FM 5-434 Table 1-2)"},
				q("Net to haul away, loose", loose, Volume, ""),
				{Label: "Truck loads", Value: fmt.Sprintf("%d", int(loads)), Note: "tandem dump truck, 10 yd³ struck"},
			}},
			{Title: "Liner and underlayment", Rows: []Row{
				q("Liner length, measured along A–A'", linerLen[0], Length, "follows the slopes, with the overlap"),
				q("Liner width, measured along B–B'", linerLen[1], Length, ""),
				{Label: "Sheet to order", Value: trimNum(sheetL/units.Foot, 0) + " × " + trimNum(sheetW/units.Foot, 0), Unit: "ft",
					Alt: fixed(sheetL, 2) + " × " + fixed(sheetW, 2) + " m", Note: "next 5 ft size up"},
				q("Sheet area", area, Area, ""),
				q("Overlap past the rim", overlap, ShortLength, "each side, along the ground"),
				q("Underlayment (nonwoven, 8 oz/yd²)", area, Area, "same size as the liner"),
			}},
			{Title: "Shoreline", Rows: []Row{
				q("Water line", shore, Length, "length of the shore at full water"),
				q("Rim (top of bank)", rim.Perimeter(), Length, ""),
			}},
			{Title: "Stone, gravel and crew", Rows: []Row{
				q("Edge stone", stoneKg, Mass, "granite, 18 in band, 35 % voids"),
				q("Gravel on the floors", gravelKg, Mass, "2 in layer on the shelves and deep zone"),
				{Label: "Crew time", Value: fixed(crewH, 1), Unit: "h", Note: "3 workers, hand-set stone, plus 4 h set-up"},
			}},
			{Title: "Water and pump", Rows: []Row{
				q("Water volume", water.Value(), WaterVolume, "at the water line, 6 in below the rim"),
				q("Pump flow for one turnover an hour", pumpQ, Flow, "koi: at least once an hour"),
				q("Deepest water", maxDepth, Elevation, ""),
			}},
			{Title: "Cost", Intro: "Prices from the contractor's 2026 price list; tax not included.", Rows: []Row{
				{Label: "Liner", Value: "$" + money(linerCost), Note: "$1.10 per ft²"},
				{Label: "Underlayment", Value: "$" + money(underCost), Note: "$0.32 per ft²"},
				{Label: "Excavation and haul", Value: "$" + money(digCost), Note: "$38 per loose yd³"},
				{Label: "Edge stone", Value: "$" + money(stoneCost), Note: "$310 per ton delivered"},
				{Label: "Gravel", Value: "$" + money(gravelCost), Note: "$62 per ton"},
				{Label: "Labour", Value: "$" + money(labour), Note: "$58 per worker-hour"},
				{Label: "Total", Value: "$" + money(total)},
			}},
		},
		Comparisons: []Comparison{
			{Label: "Liner length", Quantity: Length, Measured: linerLen[0], Rule: ruleL, RuleText: "length + 2 × max depth + 2 × overlap"},
			{Label: "Liner width", Quantity: Length, Measured: linerLen[1], Rule: ruleW, RuleText: "width + 2 × max depth + 2 × overlap"},
			{Label: "Shoreline", Quantity: Length, Measured: shore, Rule: 0.8 * 2 * (box.Width() + box.Height()), RuleText: "0.8 × perimeter of the bounding rectangle"},
			{Label: "Water volume", Quantity: WaterVolume, Measured: water.Value(), Rule: ruleGal, RuleText: "length × width × max depth × 0.6"},
		},
		Methods: []Method{
			{"Cut and fill", "Existing ground as a TIN of the survey shots; finished grade from the zone design; D − G integrated exactly per lattice cell.", "± 3 % (cell refinement changed the total by 0.6 %)"},
			{"Liner", "Length and width measured along the finished surface on sections A–A' and B–B', plus the overlap each side.", "± 0.5 ft"},
			{"Water volume", "Water level minus finished grade, integrated inside the water line.", "± 2 %"},
			{"Stone and gravel", "Band length × width × thickness × density × (1 − voids).", "± 10 %: stone sizes vary"},
		},
		Accuracy: []Row{
			q("Lattice cell", sampleCellM, Length, ""),
			{Label: "Change on halving the cell", Value: "0.6", Unit: "%", Note: "cut volume"},
			q("Survey point accuracy (total station)", 0.006, Elevation, "vertical, stated by the surveyor"),
		},
		Warnings: []string{
			"2 duplicate shots (same position) were merged: 117 and 118.",
		},
		Cautions: []Caution{
			{Title: "Buried utilities", Text: "Have buried lines located and marked before you dig: call 811 at least 2–3 working days ahead, and hand-dig near the marks.", Rule: "OSHA 29 CFR 1926.651(b); 811 one-call"},
			{Title: "Electricity near water", Text: "The pump and any lights need GFCI protection; have a licensed electrician wire them.", Rule: "NFPA 70 (NEC) article 680"},
			{Title: "Deep water", Text: "The deep zone is more than 24 in deep. Check whether the local code asks for a barrier or fence.", Rule: "local pool-barrier ordinance"},
			{Title: "Lifting stone", Text: "Edge stones over about 50 lb are placed with a machine or a team lift.", Rule: "common practice"},
		},
		Footer: "Prepared with dugout. Quantities are estimates from the survey and design shown; check on site before ordering.",
	}
	for i, ang := range []float64{0, 45, 90, 135, 180, 225, 270, 315} {
		th := ang * math.Pi / 180
		p := geom.Vec2{X: math.Cos(th), Y: math.Sin(th)}.Scale(sampleOutline(th))
		w := sampleFrame.ToWorld(p)
		g, d := sampleGround(p.X, p.Y), sampleDesign(p.X, p.Y)
		r.Stakeout = append(r.Stakeout, StakeoutRow{ID: fmt.Sprintf("R%d", i+1), Easting: w.X / units.Foot, Northing: w.Y / units.Foot,
			Existing: g / units.Foot, Finished: d / units.Foot, CutFill: (d - g) / units.Foot, Note: "rim"})
	}
	w := sampleFrame.ToWorld(geom.Vec2{})
	g, d := sampleGround(0, 0), sampleDesign(0, 0)
	r.Stakeout = append(r.Stakeout, StakeoutRow{ID: "C1", Easting: w.X / units.Foot, Northing: w.Y / units.Foot,
		Existing: g / units.Foot, Finished: d / units.Foot, CutFill: (d - g) / units.Foot, Note: "deep zone centre"})
	return r
}
