package report

import (
	"cmp"
	"fmt"
	"io"
	"math"
	"slices"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/units"
)

// TitleBlock identifies the job on every sheet and at the head of the
// report. Every field is optional text printed as given.
type TitleBlock struct {
	Site     string // site or job name, printed largest
	Client   string
	Address  string
	Date     string // as it should be printed, e.g. "14 May 2026"
	Preparer string // estimator or company
}

// PlanContour is one contour level: its lines, in local-frame metres, at
// LevelM metres. Index contours are drawn heavier and labelled.
type PlanContour struct {
	LevelM float64
	Index  bool
	Lines  []geom.Polyline // a closed loop repeats its first vertex at the end
}

// PlanZone is one depth zone of the design: its outline (local metres, either
// winding), its name and its depth below the water level in metres.
type PlanZone struct {
	Name   string
	DepthM float64
	Ring   geom.Ring
}

// PlanDepthMap is the cut/fill depth on a regular raster: DM[j*NX+i] is
// D − G (finished grade minus existing ground, metres; negative is cut,
// positive is fill, NaN is no change or no data) over the half-open cell
// [Origin.X + i·CellM, Origin.X + (i+1)·CellM) × [Origin.Y + j·CellM,
// Origin.Y + (j+1)·CellM) in local metres, j counting northwards. The zero
// value is an empty map, which draws nothing.
type PlanDepthMap struct {
	Origin geom.Vec2
	CellM  float64
	NX, NY int
	DM     []float64
}

// PlanMark is a survey point drawn as a small cross with its ID.
type PlanMark struct {
	ID string
	At geom.Vec2 // local metres
}

// PlanSectionLine is the trace of a cross-section on the plan. Its ends are
// labelled Name and Name' (A and A' for section A–A').
type PlanSectionLine struct {
	Name string
	Line geom.Polyline // local metres, at least two vertices
}

// PlanData is everything the plan sheet shows. Geometry is in local-frame
// metres (see [geom.Frame]), elevations and depths in metres; Units only
// chooses how labels, the legend and the scale bar are written. Any layer
// may be empty, but not all of them.
type PlanData struct {
	Title TitleBlock
	Units units.System
	// Frame is the local working frame; the grid ticks on the map are
	// labelled in world coordinates, Frame.ToWorld of the local ones.
	Frame geom.Frame

	// HasWaterLevel reports whether WaterLevelM is set.
	HasWaterLevel bool
	WaterLevelM   float64

	// ScaleDenominator is the plan scale 1:ScaleDenominator; 0 picks the
	// largest standard scale at which everything fits (ISO 5455 series for
	// metres, engineer's scales "1 in = N ft" for feet).
	// A chosen scale at which the site does not fit is kept, the map is cut
	// at its frame and a note on the sheet says so.
	ScaleDenominator float64

	Existing  []PlanContour // existing ground contours
	Design    []PlanContour // finished grade contours
	Zones     []PlanZone
	WaterLine []geom.Ring
	Rim       []geom.Ring     // top of bank
	BermToe   []geom.Polyline // toe of the fill berm, closed or open
	Depth     PlanDepthMap

	// DepthClassStep is the width of each cut and fill class of the legend,
	// in the drawing's Units (feet or metres); 0 picks a round step that
	// gives at most five classes on each side.
	DepthClassStep float64

	Points   []PlanMark // survey points; empty for none
	Sections []PlanSectionLine
	Notes    []string
}

// Sheet layout of the plan in millimetres. The sheet is 180 × 225 mm, which
// fits inside both US Letter (215.9 × 279.4 mm) and ISO A4 (210 × 297 mm)
// with 15 mm margins (ANSI/ASME Y14.1 and ISO 216 sizes, from memory), so the
// same drawing prints at its true scale on either.
const (
	planSheetW = 180.0
	planSheetH = 225.0
	planMapX   = 4.0
	planMapY   = 4.0
	planMapW   = 172.0
	planMapH   = 146.0
	planPadMM  = 8.0 // clear space between the drawing and the map frame
	planBandY  = 153.0
	planBandH  = 68.0

	// planMinCellMM is the smallest raster cell drawn: finer cut/fill
	// rasters are averaged over blocks until a cell is at least 0.5 mm on
	// paper, the size of a fine pen dot, which keeps the file bounded
	// (at most 344 × 292 cells inside the map frame) without visible loss.
	planMinCellMM = 0.5

	// maxDepthCells bounds the depth raster accepted (NX·NY).
	maxDepthCells = 1 << 26

	// classEdgeTol is the relative slack at a class edge of the depth
	// legend: a depth within 1e-9 of a step of an edge counts in the lower
	// class, so that a depth of exactly 0.5 ft, which is 0.1524 m and comes
	// back as 0.5 ft only to within round-off (about 1e-16 relative), is not
	// pushed into the next class. It affects shading only, never topology.
	classEdgeTol = 1e-9
)

// Plan writes the plan sheet of p as a standalone SVG drawing of 180 × 225
// mm: the map (cut/fill shading, contours, zones, water line, rim, berm toe,
// section lines, survey points, grid ticks, north arrow and scale bar) above
// a band with the title block, the legend and the notes. Output is
// deterministic: the same PlanData gives the same bytes.
//
// Plan returns a [*ValueError] for non-finite coordinates or levels, rings
// with fewer than three vertices, polylines with fewer than two, or a depth
// raster whose size does not match its data; [ErrNothingToDraw] when every
// layer is empty; and any error of w.
func Plan(w io.Writer, p PlanData) error {
	if err := validatePlan(&p); err != nil {
		return err
	}
	box := planBounds(&p)
	if box.IsEmpty() {
		return fmt.Errorf("plan: %w", ErrNothingToDraw)
	}
	// A single point or a straight line still gets a map of some size.
	const minExtentM = 5.0
	if box.Width() < minExtentM || box.Height() < minExtentM {
		c := box.Center()
		hw := math.Max(box.Width(), minExtentM) / 2
		hh := math.Max(box.Height(), minExtentM) / 2
		box = geom.Box{Min: geom.Vec2{X: c.X - hw, Y: c.Y - hh}, Max: geom.Vec2{X: c.X + hw, Y: c.Y + hh}}
	}
	need := math.Max(box.Width()*1000/(planMapW-2*planPadMM), box.Height()*1000/(planMapH-2*planPadMM))
	denom := p.ScaleDenominator
	clipped := false
	if denom == 0 {
		denom = standardScale(need, p.Units)
	} else if denom < need*(1-classEdgeTol) {
		clipped = true
	}
	// Inside the nested map viewport, paper coordinates start at the frame's
	// corner.
	t := paperTransform{C: box.Center(), P: geom.Vec2{X: planMapW / 2, Y: planMapH / 2}, Denom: denom}

	d := newSVGDoc(planSheetW, planSheetH)
	d.leaf("rect", "x", "0", "y", "0", "width", svgNum(planSheetW), "height", svgNum(planSheetH), "fill", colPaper)

	// The map: a nested viewport clips everything to the frame.
	d.open("svg", "x", svgNum(planMapX), "y", svgNum(planMapY), "width", svgNum(planMapW), "height", svgNum(planMapH),
		"viewBox", "0 0 "+svgNum(planMapW)+" "+svgNum(planMapH), "overflow", "hidden")
	classes := depthClasses(&p)
	drawDepthMap(d, t, &p.Depth, classes)
	drawGridTicks(d, t, &p)
	drawContours(d, t, p.Existing, p.Units, "existing", colExisting, 0.13, 0.25, "1.5 0.8")
	drawContours(d, t, p.Design, p.Units, "design", colDesign, 0.18, 0.35, "")
	drawZones(d, t, p.Zones)
	drawRingLayer(d, t, "berm-toe", p.BermToe, nil, colInk, 0.25, "2 1")
	drawRingLayer(d, t, "rim", nil, p.Rim, colInk, 0.5, "")
	drawRingLayer(d, t, "water-line", nil, p.WaterLine, colWater, 0.5, "4 1 1 1")
	drawSectionLines(d, t, p.Sections)
	drawMarks(d, t, p.Points)
	drawZoneLabels(d, t, p.Zones, p.Units)
	drawNorthArrow(d, planMapW-12, 5)
	drawScaleBar(d, t, p.Units, 4, planMapH-4)
	d.close("svg")
	d.leaf("rect", "x", svgNum(planMapX), "y", svgNum(planMapY), "width", svgNum(planMapW), "height", svgNum(planMapH),
		"fill", "none", "stroke", colInk, "stroke-width", "0.35")

	notes := slices.Clone(p.Notes)
	if clipped {
		notes = append([]string{fmt.Sprintf("At the chosen scale %s the site does not fit the map frame; its edges are cut off (1:%s would fit).",
			scaleLabel(denom, p.Units), trimNum(standardScale(need, p.Units), 0))}, notes...)
	}
	drawTitleBlock(d, &p, denom)
	drawLegend(d, &p, classes)
	drawNotes(d, notes)
	d.leaf("rect", "x", "0.25", "y", "0.25", "width", svgNum(planSheetW-0.5), "height", svgNum(planSheetH-0.5),
		"fill", "none", "stroke", colInk, "stroke-width", "0.5")
	return d.writeTo(w)
}

// validatePlan checks every number of p; it reports the first problem.
func validatePlan(p *PlanData) error {
	if err := finite("plan", "scale denominator", p.ScaleDenominator); err != nil {
		return err
	}
	if p.ScaleDenominator < 0 {
		return &ValueError{Item: "plan", Field: "scale denominator", Value: p.ScaleDenominator, Reason: "must be > 0, or 0 to choose"}
	}
	if err := finite("plan", "depth class step", p.DepthClassStep); err != nil {
		return err
	}
	if p.DepthClassStep < 0 {
		return &ValueError{Item: "plan", Field: "depth class step", Value: p.DepthClassStep, Reason: "must be > 0, or 0 to choose"}
	}
	if p.HasWaterLevel {
		if err := finite("plan", "water level (m)", p.WaterLevelM); err != nil {
			return err
		}
	}
	if err := finiteVec("plan frame", "origin", p.Frame.Origin); err != nil {
		return err
	}
	for _, set := range []struct {
		name string
		cs   []PlanContour
	}{{"existing contour", p.Existing}, {"design contour", p.Design}} {
		for i, c := range set.cs {
			item := fmt.Sprintf("%s %d", set.name, i)
			if err := finite(item, "level (m)", c.LevelM); err != nil {
				return err
			}
			for j, l := range c.Lines {
				if err := checkPolyline(fmt.Sprintf("%s, line %d", item, j), l); err != nil {
					return err
				}
			}
		}
	}
	for i, z := range p.Zones {
		item := fmt.Sprintf("zone %d (%s)", i, z.Name)
		if err := finite(item, "depth (m)", z.DepthM); err != nil {
			return err
		}
		if err := checkRing(item, z.Ring); err != nil {
			return err
		}
	}
	for _, set := range []struct {
		name  string
		rings []geom.Ring
	}{{"water line", p.WaterLine}, {"rim", p.Rim}} {
		for i, r := range set.rings {
			if err := checkRing(fmt.Sprintf("%s %d", set.name, i), r); err != nil {
				return err
			}
		}
	}
	for i, l := range p.BermToe {
		if err := checkPolyline(fmt.Sprintf("berm toe %d", i), l); err != nil {
			return err
		}
	}
	for i, m := range p.Points {
		if err := finiteVec(fmt.Sprintf("survey point %d (%s)", i, m.ID), "position", m.At); err != nil {
			return err
		}
	}
	for i, s := range p.Sections {
		if err := checkPolyline(fmt.Sprintf("section line %d (%s)", i, s.Name), s.Line); err != nil {
			return err
		}
	}
	return validateDepthMap(&p.Depth)
}

func validateDepthMap(m *PlanDepthMap) error {
	const item = "depth map"
	if m.NX == 0 && m.NY == 0 && len(m.DM) == 0 {
		return nil
	}
	if m.NX < 0 || m.NY < 0 {
		return &ValueError{Item: item, Field: "size", Value: float64(min(m.NX, m.NY)), Reason: "NX and NY must be ≥ 0"}
	}
	if m.NX > maxDepthCells || m.NY > maxDepthCells || m.NX*m.NY > maxDepthCells {
		return &SizeError{What: "depth map cells", N: m.NX * m.NY, Limit: maxDepthCells}
	}
	if len(m.DM) != m.NX*m.NY {
		return &ValueError{Item: item, Field: "len(DM)", Value: float64(len(m.DM)),
			Reason: fmt.Sprintf("must be NX·NY = %d·%d = %d", m.NX, m.NY, m.NX*m.NY)}
	}
	if err := finite(item, "cell size (m)", m.CellM); err != nil {
		return err
	}
	if m.CellM <= 0 {
		return &ValueError{Item: item, Field: "cell size (m)", Value: m.CellM, Reason: "must be > 0"}
	}
	if err := finiteVec(item, "origin", m.Origin); err != nil {
		return err
	}
	for k, v := range m.DM {
		if math.IsInf(v, 0) {
			return &ValueError{Item: fmt.Sprintf("%s cell (%d, %d)", item, k%m.NX, k/m.NX), Field: "D − G (m)", Value: v,
				Reason: "must be finite, or NaN for no change"}
		}
	}
	return nil
}

func finite(item, field string, v float64) error {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return &ValueError{Item: item, Field: field, Value: v, Reason: "must be finite"}
	}
	return nil
}

func finiteVec(item, field string, v geom.Vec2) error {
	if err := finite(item, field+" x", v.X); err != nil {
		return err
	}
	return finite(item, field+" y", v.Y)
}

func checkPolyline(item string, l geom.Polyline) error {
	if len(l) < 2 {
		return &ValueError{Item: item, Field: "vertices", Value: float64(len(l)), Reason: "a line needs at least 2"}
	}
	for k, v := range l {
		if err := finiteVec(fmt.Sprintf("%s, vertex %d", item, k), "position", v); err != nil {
			return err
		}
	}
	return nil
}

func checkRing(item string, r geom.Ring) error {
	if len(r) < 3 {
		return &ValueError{Item: item, Field: "vertices", Value: float64(len(r)), Reason: "a ring needs at least 3"}
	}
	for k, v := range r {
		if err := finiteVec(fmt.Sprintf("%s, vertex %d", item, k), "position", v); err != nil {
			return err
		}
	}
	return nil
}

// planBounds returns the box holding every layer of p (the depth map counts
// only its cells that hold a value).
func planBounds(p *PlanData) geom.Box {
	b := geom.EmptyBox()
	for _, cs := range [][]PlanContour{p.Existing, p.Design} {
		for _, c := range cs {
			for _, l := range c.Lines {
				b = b.Union(geom.BoxOf(l))
			}
		}
	}
	for _, z := range p.Zones {
		b = b.Union(z.Ring.Bounds())
	}
	for _, rs := range [][]geom.Ring{p.WaterLine, p.Rim} {
		for _, r := range rs {
			b = b.Union(r.Bounds())
		}
	}
	for _, l := range p.BermToe {
		b = b.Union(geom.BoxOf(l))
	}
	for _, m := range p.Points {
		b = b.Extend(m.At)
	}
	for _, s := range p.Sections {
		b = b.Union(geom.BoxOf(s.Line))
	}
	m := &p.Depth
	lo, hi := [2]int{m.NX, m.NY}, [2]int{-1, -1}
	for j := 0; j < m.NY; j++ {
		for i := 0; i < m.NX; i++ {
			if !math.IsNaN(m.DM[j*m.NX+i]) {
				lo = [2]int{min(lo[0], i), min(lo[1], j)}
				hi = [2]int{max(hi[0], i), max(hi[1], j)}
			}
		}
	}
	if hi[0] >= 0 {
		b = b.Extend(geom.Vec2{X: m.Origin.X + float64(lo[0])*m.CellM, Y: m.Origin.Y + float64(lo[1])*m.CellM})
		b = b.Extend(geom.Vec2{X: m.Origin.X + float64(hi[0]+1)*m.CellM, Y: m.Origin.Y + float64(hi[1]+1)*m.CellM})
	}
	return b
}

// depthLegend holds the cut and fill classes of a plan: class k (1…N) of a
// side covers depths in ((k−1)·Step, k·Step], in the drawing's units, and the
// last class also takes everything deeper.
type depthLegend struct {
	Step          float64 // class width in the drawing's units
	NCut, NFill   int     // classes present on each side
	N             int     // max(NCut, NFill): the colour set used
	OpenCut       bool    // the deepest cut class is open-ended ("over …")
	OpenFill      bool
	HasCut, HasFl bool
	UnitM         float64 // metres per drawing unit
}

// depthClasses chooses the legend classes of p's depth map.
func depthClasses(p *PlanData) depthLegend {
	var maxCut, maxFill float64
	var hasCut, hasFill bool
	for _, v := range p.Depth.DM {
		u := toUserLength(v, p.Units)
		switch {
		case u < 0:
			hasCut = true
			maxCut = math.Max(maxCut, -u)
		case u > 0:
			hasFill = true
			maxFill = math.Max(maxFill, u)
		}
	}
	lg := depthLegend{HasCut: hasCut, HasFl: hasFill, UnitM: p.Units.Metres()}
	if !hasCut && !hasFill {
		return lg
	}
	step := p.DepthClassStep
	if step == 0 {
		step = niceStep(math.Max(maxCut, maxFill) / maxDepthClasses)
	}
	lg.Step = step
	count := func(deepest float64) (int, bool) {
		n := max(int(math.Ceil(deepest/step-classEdgeTol)), 1)
		if n > maxDepthClasses {
			return maxDepthClasses, true
		}
		return n, false
	}
	if hasCut {
		lg.NCut, lg.OpenCut = count(maxCut)
	}
	if hasFill {
		lg.NFill, lg.OpenFill = count(maxFill)
	}
	lg.N = max(lg.NCut, lg.NFill)
	return lg
}

// class returns the signed class of a depth u (drawing units): −k for cut
// class k, +k for fill class k, 0 for no change.
func (lg depthLegend) class(u float64) int {
	if math.IsNaN(u) || u == 0 || lg.Step == 0 {
		return 0
	}
	k := int(math.Ceil(math.Abs(u)/lg.Step - classEdgeTol))
	k = min(max(k, 1), maxDepthClasses)
	if u < 0 {
		return -min(k, lg.NCut)
	}
	return min(k, lg.NFill)
}

// colour returns the shading of signed class c.
func (lg depthLegend) colour(c int) string {
	if c < 0 {
		return depthColour(true, -c, lg.N)
	}
	return depthColour(false, c, lg.N)
}

// label returns the legend text of signed class c, e.g. "0.50–1.00 ft".
func (lg depthLegend) label(c int, sys units.System) string {
	k := c
	open := lg.OpenFill
	n := lg.NFill
	if c < 0 {
		k, open, n = -c, lg.OpenCut, lg.NCut
	}
	lo := float64(k-1) * lg.Step
	hi := float64(k) * lg.Step
	dec := 2
	if lg.Step >= 1 && lg.Step == math.Round(lg.Step) {
		dec = 0
	} else if lg.Step*10 == math.Round(lg.Step*10) {
		dec = 1
	}
	if k == n && open {
		return "over " + fixed(lo, dec) + " " + lengthUnit(sys)
	}
	return fixed(lo, dec) + "–" + fixed(hi, dec) + " " + lengthUnit(sys)
}

// drawDepthMap shades the depth raster class by class. Each class is one
// <path> of rectangles, one per run of equal class along a raster row,
// written from the north row down; the edge of the cut area follows as a
// dotted path along cell edges.
func drawDepthMap(d *svgDoc, t paperTransform, m *PlanDepthMap, lg depthLegend) {
	if m.NX == 0 || m.NY == 0 || lg.Step == 0 {
		return
	}
	// Average over f × f blocks until a cell is at least planMinCellMM.
	f := max(1, int(math.Ceil(planMinCellMM/(m.CellM*t.mmPerM())-classEdgeTol)))
	nx, ny := (m.NX+f-1)/f, (m.NY+f-1)/f
	cell := m.CellM * float64(f)
	cls := make([]int, nx*ny)
	for bj := range ny {
		for bi := range nx {
			var s geom.Sum
			n := 0
			for j := bj * f; j < min((bj+1)*f, m.NY); j++ {
				for i := bi * f; i < min((bi+1)*f, m.NX); i++ {
					if v := m.DM[j*m.NX+i]; !math.IsNaN(v) {
						s.Add(v)
						n++
					}
				}
			}
			if n > 0 {
				cls[bj*nx+bi] = lg.class(s.Value() / float64(n) / lg.UnitM)
			}
		}
	}
	corner := func(i, j int) geom.Vec2 {
		return t.apply(geom.Vec2{X: m.Origin.X + float64(i)*cell, Y: m.Origin.Y + float64(j)*cell})
	}
	d.open("g", "class", "depth-map", "shape-rendering", "crispEdges", "stroke", "none")
	order := make([]int, 0, 2*maxDepthClasses)
	for k := lg.NCut; k >= 1; k-- {
		order = append(order, -k)
	}
	for k := 1; k <= lg.NFill; k++ {
		order = append(order, k)
	}
	for _, c := range order {
		var pd pathData
		for j := ny - 1; j >= 0; j-- {
			for i := 0; i < nx; {
				if cls[j*nx+i] != c {
					i++
					continue
				}
				i0 := i
				for i < nx && cls[j*nx+i] == c {
					i++
				}
				a, b := corner(i0, j+1), corner(i, j)
				pd.moveTo(a.X, a.Y)
				pd.hTo(b.X)
				pd.vTo(b.Y)
				pd.hTo(a.X)
				pd.closePath()
			}
		}
		if !pd.empty() {
			d.leaf("path", "fill", lg.colour(c), "d", pd.String())
		}
	}
	d.close("g")

	// Edge of the cut area: cell edges between a cut cell and any other.
	isCut := func(i, j int) bool { return i >= 0 && j >= 0 && i < nx && j < ny && cls[j*nx+i] < 0 }
	var pd pathData
	for j := ny; j >= 0; j-- { // horizontal edges between rows j−1 and j
		for i := 0; i < nx; {
			if isCut(i, j-1) == isCut(i, j) {
				i++
				continue
			}
			i0 := i
			for i < nx && isCut(i, j-1) != isCut(i, j) {
				i++
			}
			a, b := corner(i0, j), corner(i, j)
			pd.moveTo(a.X, a.Y)
			pd.hTo(b.X)
		}
	}
	for i := 0; i <= nx; i++ { // vertical edges between columns i−1 and i
		for j := ny - 1; j >= 0; {
			if isCut(i-1, j) == isCut(i, j) {
				j--
				continue
			}
			j0 := j
			for j >= 0 && isCut(i-1, j) != isCut(i, j) {
				j--
			}
			a, b := corner(i, j0+1), corner(i, j+1)
			pd.moveTo(a.X, a.Y)
			pd.vTo(b.Y)
		}
	}
	if !pd.empty() {
		d.leaf("path", "class", "cut-edge", "fill", "none", "stroke", colInk, "stroke-width", "0.2",
			"stroke-dasharray", "0.4 0.5", "d", pd.String())
	}
}

// drawContours draws one contour set, each level as one path, and labels
// the index levels along their lines.
func drawContours(d *svgDoc, t paperTransform, cs []PlanContour, sys units.System, class, colour string, w, wIndex float64, dash string) {
	if len(cs) == 0 {
		return
	}
	attrs := []string{"class", class + "-contours", "fill", "none", "stroke", colour, "stroke-linejoin", "round"}
	if dash != "" {
		attrs = append(attrs, "stroke-dasharray", dash)
	}
	d.open("g", attrs...)
	var paper []geom.Vec2
	for _, c := range cs {
		var pd pathData
		for _, l := range c.Lines {
			paper = toPaper(paper[:0], t, l)
			polyPath(&pd, paper, false)
		}
		width := w
		if c.Index {
			width = wIndex
		}
		d.leaf("path", "stroke-width", svgNum(width), "d", pd.String())
	}
	d.close("g")

	// Labels: on index contours, one per 100 mm of line on paper, none on
	// lines shorter than 20 mm, and none where the set's other levels run
	// closer than a label's height (see labelPlacer).
	const labelEveryMM, minLineMM = 100.0, 20.0
	d.open("g", "class", class+"-contour-labels", "font-size", svgNum(contourLabelMM), "fill", colour, "text-anchor", "middle",
		"stroke", colHalo, "stroke-width", "0.6", "paint-order", "stroke", "stroke-linejoin", "round")
	lp := newLabelPlacer(t, cs)
	for li, c := range cs {
		if !c.Index {
			continue
		}
		text := fmtLevelLabel(c.LevelM, sys)
		for _, l := range c.Lines {
			paper = toPaper(paper[:0], t, l)
			length := geom.Polyline(paper).Length()
			if length < minLineMM {
				continue
			}
			n := max(1, int(length/labelEveryMM))
			for k := range n {
				at, angle, ok := lp.place(paper, length, k, n, li, text)
				if !ok {
					continue
				}
				d.text(at.X, at.Y+contourLabelMM*0.35, text, "transform", "rotate("+svgNum(angle)+" "+svgNum(at.X)+" "+svgNum(at.Y)+")")
			}
		}
	}
	d.close("g")
}

// Contour label sizes on paper (mm).
const (
	// contourLabelMM is the height of a contour label's text.
	contourLabelMM = 1.8
	// digitWidthEm is the advance of a digit or point in the sheet's sans
	// serif face, in ems: DejaVu Sans digits are 0.636 em, the point 0.318
	// em (from memory of its metrics); the larger is taken for every
	// character so that the estimate errs wide.
	digitWidthEm = 0.64
	// labelBucketMM is the side of the buckets the contour segments are
	// filed in for the crowding test: two label heights, so that a query
	// visits a few buckets.
	labelBucketMM = 2 * contourLabelMM
	// besideGapMM is the clear space between a label set beside its line
	// (at the top or the bottom of a crowded run of contours) and the line.
	besideGapMM = 0.4
)

// labelPlacer finds places for contour labels where the set's other levels
// leave room. A label is centred on its line, along it; it is crowded when
// a line of another level comes within one label height of its axis (its
// centre line, as long as the text), since that line would then cross the
// text or its halo. Along a vertical wall every level of the wall runs in
// one lattice cell, a fraction of a millimetre on paper, and the labels of
// all of them would pile up there.
//
// Each label slot (a stretch of line) is tried at its middle, then at
// points up to 0.45 of the slot either side, so that a label slides off a
// crowded stretch onto a clear one of its line. Where the whole slot is
// crowded, the label is set beside its line, on the side where no line of
// any level comes within a label height: that is possible only at the top
// and the bottom level of a crowded run, so a vertical wall gets its top
// and bottom labelled and nothing between. Labels also keep a label height
// clear of the labels already placed. Positions are tried in a fixed
// order, so the drawing stays deterministic.
type labelPlacer struct {
	segs    []labelSeg
	buckets [][]int32 // segment indices by bucket, row by row
	nx, ny  int
	seen    []int32 // per segment: the query that last visited it
	query   int32
	placed  [][2]geom.Vec2 // axes of the labels placed
}

// labelSeg is one segment of a contour line on paper and its level's
// index in the set.
type labelSeg struct {
	a, b  geom.Vec2
	level int
}

func newLabelPlacer(t paperTransform, cs []PlanContour) *labelPlacer {
	lp := &labelPlacer{nx: int(math.Ceil(planMapW / labelBucketMM)), ny: int(math.Ceil(planMapH / labelBucketMM))}
	lp.buckets = make([][]int32, lp.nx*lp.ny)
	if !slices.ContainsFunc(cs, func(c PlanContour) bool { return c.Index }) {
		return lp // no labels to place
	}
	var paper []geom.Vec2
	for li, c := range cs {
		for _, l := range c.Lines {
			paper = toPaper(paper[:0], t, l)
			for i := 1; i < len(paper); i++ {
				a, b := paper[i-1], paper[i]
				i0, j0, i1, j1, ok := lp.span(geom.BoxOf([]geom.Vec2{a, b}))
				if !ok {
					continue
				}
				k := int32(len(lp.segs))
				lp.segs = append(lp.segs, labelSeg{a, b, li})
				for j := j0; j <= j1; j++ {
					for i := i0; i <= i1; i++ {
						lp.buckets[j*lp.nx+i] = append(lp.buckets[j*lp.nx+i], k)
					}
				}
			}
		}
	}
	lp.seen = make([]int32, len(lp.segs))
	return lp
}

// span returns the buckets a paper box covers, clamped to the map; ok is
// false for a box wholly off the map.
func (lp *labelPlacer) span(b geom.Box) (i0, j0, i1, j1 int, ok bool) {
	if b.Max.X < 0 || b.Max.Y < 0 || b.Min.X > planMapW || b.Min.Y > planMapH {
		return 0, 0, 0, 0, false
	}
	cl := func(v float64, n int) int { return min(max(int(math.Floor(v/labelBucketMM)), 0), n-1) }
	return cl(b.Min.X, lp.nx), cl(b.Min.Y, lp.ny), cl(b.Max.X, lp.nx), cl(b.Max.Y, lp.ny), true
}

// clear reports whether no segment comes within r of the axis pq, leaving
// out the segments of level skip (−1 to leave out none), and no label
// placed comes within a label height of it.
func (lp *labelPlacer) clear(p, q geom.Vec2, r float64, skip int) bool {
	for _, ax := range lp.placed {
		if segDist(p, q, ax[0], ax[1]) < contourLabelMM {
			return false
		}
	}
	i0, j0, i1, j1, ok := lp.span(geom.BoxOf([]geom.Vec2{p, q}).Expand(r))
	if !ok {
		return true
	}
	lp.query++
	for j := j0; j <= j1; j++ {
		for i := i0; i <= i1; i++ {
			for _, k := range lp.buckets[j*lp.nx+i] {
				if lp.seen[k] == lp.query {
					continue
				}
				lp.seen[k] = lp.query
				if s := &lp.segs[k]; s.level != skip && segDist(p, q, s.a, s.b) < r {
					return false
				}
			}
		}
	}
	return true
}

// place returns where to put label k of n along the paper polyline pts
// (of length length, level li) and its angle, or ok false when every
// place of its slot is crowded (see labelPlacer).
func (lp *labelPlacer) place(pts []geom.Vec2, length float64, k, n, li int, text string) (at geom.Vec2, angle float64, ok bool) {
	h := contourLabelMM
	half := 0.5*digitWidthEm*h*float64(len(text)) + 0.3 // the halo
	slot := length / float64(n)
	// Offsets along the slot, as fractions of it: the middle first, then
	// outwards in twentieths.
	var offsets [19]float64
	for i := 1; i < len(offsets); i += 2 {
		offsets[i], offsets[i+1] = 0.05*float64(i/2+1), -0.05*float64(i/2+1)
	}
	axis := func(c, u geom.Vec2) (geom.Vec2, geom.Vec2) { return c.Sub(u.Scale(half)), c.Add(u.Scale(half)) }
	for _, f := range offsets {
		c, ang := pointAlong(pts, slot*(float64(k)+0.5+f))
		if !insideMap(c) {
			continue
		}
		u := unitAt(ang)
		if p, q := axis(c, u); lp.clear(p, q, h, li) {
			lp.placed = append(lp.placed, [2]geom.Vec2{p, q})
			return c, ang, true
		}
	}
	// Beside the line, at the slot's middle: the text's near edge
	// besideGapMM from the line, and no line of any level within a label
	// height of the text's far side.
	c, ang := pointAlong(pts, slot*(float64(k)+0.5))
	u := unitAt(ang)
	nrm := geom.Vec2{X: -u.Y, Y: u.X}
	for _, side := range [...]float64{1, -1} {
		b := c.Add(nrm.Scale(side * (0.5*h + besideGapMM)))
		if !insideMap(b) {
			continue
		}
		p, q := axis(b, u)
		if lp.clear(p, q, 0.5*h+besideGapMM-labelEpsMM, -1) && lp.clearFar(p, q, nrm.Scale(side), h, li) {
			lp.placed = append(lp.placed, [2]geom.Vec2{p, q})
			return b, ang, true
		}
	}
	return geom.Vec2{}, 0, false
}

// labelEpsMM keeps a label set beside its line from counting that line as
// crowding it: the line lies exactly 0.5·height + besideGapMM from the
// label's axis, and round-off must not bring it within. 1 µm on paper.
const labelEpsMM = 1e-3

// clearFar reports whether, on the far side of a label beside its line
// (the side dir points to), no line of another level than li comes within
// a label height of the axis pq: the label then marks the top or bottom
// of a crowded run, not a level in its middle.
func (lp *labelPlacer) clearFar(p, q, dir geom.Vec2, h float64, li int) bool {
	return lp.clear(p.Add(dir.Scale(0.5*h)), q.Add(dir.Scale(0.5*h)), h, li)
}

// unitAt returns the unit vector at angle deg on paper (y down, as the
// rotate transform takes it).
func unitAt(deg float64) geom.Vec2 {
	r := deg * math.Pi / 180
	return geom.Vec2{X: math.Cos(r), Y: math.Sin(r)}
}

// segDist returns the distance between segments ab and cd (0 when they
// cross). Drawing only: the crossing test is a plain floating-point one.
func segDist(a, b, c, d geom.Vec2) float64 {
	ab, cd := b.Sub(a), d.Sub(c)
	d1, d2 := ab.Cross(c.Sub(a)), ab.Cross(d.Sub(a))
	d3, d4 := cd.Cross(a.Sub(c)), cd.Cross(b.Sub(c))
	if (d1 > 0) != (d2 > 0) && (d3 > 0) != (d4 > 0) && d1 != 0 && d2 != 0 && d3 != 0 && d4 != 0 {
		return 0
	}
	return min(pointSegDist(a, c, d), pointSegDist(b, c, d), pointSegDist(c, a, b), pointSegDist(d, a, b))
}

// pointSegDist returns the distance from p to segment ab.
func pointSegDist(p, a, b geom.Vec2) float64 {
	ab := b.Sub(a)
	l2 := ab.Norm2()
	if l2 == 0 {
		return p.Distance(a)
	}
	t := min(max(p.Sub(a).Dot(ab)/l2, 0), 1)
	return p.Distance(a.Add(ab.Scale(t)))
}

// insideMap reports whether a paper point (map viewport coordinates) lies
// inside the map frame with room for a label.
func insideMap(p geom.Vec2) bool {
	const m = 2.0
	return p.X > m && p.Y > m && p.X < planMapW-m && p.Y < planMapH-m
}

func toPaper(dst []geom.Vec2, t paperTransform, pts []geom.Vec2) []geom.Vec2 {
	for _, v := range pts {
		dst = append(dst, t.apply(v))
	}
	return dst
}

// pointAlong returns the point at distance s along pts and the direction of
// its segment in degrees, turned so text along it reads left to right
// (−90° < angle ≤ 90°).
func pointAlong(pts []geom.Vec2, s float64) (geom.Vec2, float64) {
	for i := 1; i < len(pts); i++ {
		a, b := pts[i-1], pts[i]
		seg := a.Distance(b)
		if seg == 0 {
			continue
		}
		if s <= seg || i == len(pts)-1 {
			f := math.Min(math.Max(s/seg, 0), 1)
			ang := math.Atan2(b.Y-a.Y, b.X-a.X) * 180 / math.Pi
			if ang > 90 {
				ang -= 180
			} else if ang <= -90 {
				ang += 180
			}
			return a.Lerp(b, f), ang
		}
		s -= seg
	}
	return pts[0], 0
}

// drawRingLayer draws open polylines and closed rings as one path.
func drawRingLayer(d *svgDoc, t paperTransform, class string, lines []geom.Polyline, rings []geom.Ring, colour string, w float64, dash string) {
	if len(lines) == 0 && len(rings) == 0 {
		return
	}
	var pd pathData
	var paper []geom.Vec2
	for _, l := range lines {
		paper = toPaper(paper[:0], t, l)
		polyPath(&pd, paper, false)
	}
	for _, r := range rings {
		paper = toPaper(paper[:0], t, r)
		polyPath(&pd, paper, true)
	}
	attrs := []string{"class", class, "fill", "none", "stroke", colour, "stroke-width", svgNum(w), "stroke-linejoin", "round"}
	if dash != "" {
		attrs = append(attrs, "stroke-dasharray", dash)
	}
	d.leaf("path", append(attrs, "d", pd.String())...)
}

// drawZones draws the zone outlines.
func drawZones(d *svgDoc, t paperTransform, zones []PlanZone) {
	rings := make([]geom.Ring, len(zones))
	for i, z := range zones {
		rings[i] = z.Ring
	}
	drawRingLayer(d, t, "zones", nil, rings, colInk, 0.25, "")
}

// drawZoneLabels writes each zone's name and depth inside it, outside the
// zones nested in it and clear of the labels already placed (see
// [zoneLabelSpots]).
func drawZoneLabels(d *svgDoc, t paperTransform, zones []PlanZone, sys units.System) {
	if len(zones) == 0 {
		return
	}
	const size = 2.2
	d.open("g", "class", "zone-labels", "font-size", svgNum(size), "fill", colInk, "text-anchor", "middle",
		"stroke", colHalo, "stroke-width", "0.7", "paint-order", "stroke", "stroke-linejoin", "round")
	var placed []geom.Box
	for i, z := range zones {
		var holes []geom.Ring
		for j, o := range zones {
			if j != i && len(o.Ring) > 0 && z.Ring.Contains(o.Ring[0]) && !o.Ring.Contains(z.Ring[0]) {
				holes = append(holes, o.Ring)
			}
		}
		name := z.Name
		if name == "" {
			name = fmt.Sprintf("Zone %d", i+1)
		}
		depth := fmtDepth(z.DepthM, sys) + " deep"
		w := math.Max(svgTextWidth(name, size), svgTextWidth(depth, size))
		labelBox := func(at geom.Vec2) geom.Box {
			return geom.Box{Min: geom.Vec2{X: at.X - w/2, Y: at.Y - size*1.3}, Max: geom.Vec2{X: at.X + w/2, Y: at.Y + size*1.2}}
		}
		spots := zoneLabelSpots(z.Ring, outermost(holes))
		best := -1
		for pass := range 2 { // first a stretch wide enough, then any stretch
			for k, sp := range spots {
				at := t.apply(sp.at)
				if pass == 0 && sp.length*t.mmPerM() < w {
					continue
				}
				box := labelBox(at)
				if !slices.ContainsFunc(placed, box.Intersects) {
					best = k
					break
				}
			}
			if best >= 0 {
				break
			}
		}
		at := t.apply(z.Ring.Bounds().Center())
		if best >= 0 {
			at = t.apply(spots[best].at)
		} else if len(spots) > 0 {
			at = t.apply(spots[0].at)
		}
		placed = append(placed, labelBox(at))
		d.text(at.X, at.Y-0.3, name, "font-weight", "bold")
		d.text(at.X, at.Y+size, depth)
	}
	d.close("g")
}

// outermost returns the rings of rs not contained in another ring of rs.
func outermost(rs []geom.Ring) []geom.Ring {
	var out []geom.Ring
	for i, r := range rs {
		inside := false
		for j, o := range rs {
			if i != j && o.Contains(r[0]) && !r.Contains(o[0]) {
				inside = true
				break
			}
		}
		if !inside {
			out = append(out, r)
		}
	}
	return out
}

// labelSpot is a candidate place for a label: the midpoint of a stretch of
// a horizontal line, and the stretch's length (local metres).
type labelSpot struct {
	at     geom.Vec2
	length float64
}

// zoneLabelSpots returns candidate label places inside ring r but outside
// the holes (rings inside r that do not overlap one another), longest
// first: the midpoints of the stretches of horizontal lines through r, at
// several heights, that are inside r and outside every hole. The stretches
// come from the even-odd rule on the crossings of r and the holes together.
// The order is deterministic (by length, then by the order of the lines
// tried).
func zoneLabelSpots(r geom.Ring, holes []geom.Ring) []labelSpot {
	b := r.Bounds()
	var spots []labelSpot
	for _, f := range []float64{0.5, 0.4, 0.6, 0.3, 0.7, 0.2, 0.8, 0.15, 0.85} {
		y := b.Min.Y + f*b.Height()
		xs := crossings(nil, r, y)
		for _, h := range holes {
			xs = crossings(xs, h, y)
		}
		slices.Sort(xs)
		for k := 0; k+1 < len(xs); k += 2 {
			if l := xs[k+1] - xs[k]; l > 0 {
				spots = append(spots, labelSpot{geom.Vec2{X: (xs[k] + xs[k+1]) / 2, Y: y}, l})
			}
		}
	}
	slices.SortStableFunc(spots, func(a, b labelSpot) int { return cmp.Compare(b.length, a.length) })
	return spots
}

// crossings appends the x of every edge of r crossed by the horizontal line
// at y (half-open rule: an edge counts when its ends are on opposite sides,
// one at or above y and one below, so each vertex counts once).
func crossings(xs []float64, r geom.Ring, y float64) []float64 {
	for i := range r {
		a, b := r[i], r[(i+1)%len(r)]
		if (a.Y > y) != (b.Y > y) {
			xs = append(xs, a.X+(y-a.Y)*(b.X-a.X)/(b.Y-a.Y))
		}
	}
	return xs
}

// drawSectionLines draws each section trace as a long-dash-dot line with a
// lettered circle at each end.
func drawSectionLines(d *svgDoc, t paperTransform, ss []PlanSectionLine) {
	if len(ss) == 0 {
		return
	}
	d.open("g", "class", "section-lines")
	var paper []geom.Vec2
	for _, s := range ss {
		paper = toPaper(paper[:0], t, s.Line)
		var pd pathData
		polyPath(&pd, paper, false)
		d.leaf("path", "fill", "none", "stroke", colInk, "stroke-width", "0.35", "stroke-dasharray", "6 1.2 1.2 1.2", "d", pd.String())
		for end := range 2 {
			at, from, text := paper[0], paper[1], s.Name
			if end == 1 {
				at, from, text = paper[len(paper)-1], paper[len(paper)-2], s.Name+"'"
			}
			dir := at.Sub(from)
			if n := dir.Norm(); n > 0 {
				dir = dir.Scale(1 / n)
			}
			c := at.Add(dir.Scale(3))
			d.leaf("circle", "cx", svgNum(c.X), "cy", svgNum(c.Y), "r", "2.3", "fill", colPaper, "stroke", colInk, "stroke-width", "0.3")
			d.text(c.X, c.Y+0.9, text, "font-size", "2.4", "font-weight", "bold", "text-anchor", "middle", "fill", colInk)
		}
	}
	d.close("g")
}

// drawMarks draws survey points as small crosses with their IDs.
func drawMarks(d *svgDoc, t paperTransform, ms []PlanMark) {
	if len(ms) == 0 {
		return
	}
	const arm = 0.6
	var pd pathData
	for _, m := range ms {
		p := t.apply(m.At)
		pd.moveTo(p.X-arm, p.Y-arm)
		pd.lineTo(p.X+arm, p.Y+arm)
		pd.moveTo(p.X-arm, p.Y+arm)
		pd.lineTo(p.X+arm, p.Y-arm)
	}
	d.open("g", "class", "survey-points")
	d.leaf("path", "fill", "none", "stroke", colInk, "stroke-width", "0.15", "d", pd.String())
	d.open("g", "font-size", "1.4", "fill", colPointLabel)
	for _, m := range ms {
		if m.ID == "" {
			continue
		}
		p := t.apply(m.At)
		d.text(p.X+0.9, p.Y-0.7, m.ID)
	}
	d.close("g")
	d.close("g")
}

// drawGridTicks marks the world grid with small crosses inside the map and
// labels the lines along the bottom (eastings) and left (northings) edges,
// in the drawing's units, at a round interval about 40 mm apart on paper.
func drawGridTicks(d *svgDoc, t paperTransform, p *PlanData) {
	u := p.Units.Metres()
	lo := t.inverse(geom.Vec2{X: 0, Y: planMapH})
	hi := t.inverse(geom.Vec2{X: planMapW, Y: 0})
	loW, hiW := p.Frame.ToWorld(lo), p.Frame.ToWorld(hi)
	step := niceStep(40 / t.mmPerM() / u) // user units
	firstE, firstN := math.Ceil(loW.X/u/step), math.Ceil(loW.Y/u/step)
	const maxLines = 20
	var es, ns []float64
	for k := firstE; k*step <= hiW.X/u && len(es) < maxLines; k++ {
		es = append(es, k*step)
	}
	for k := firstN; k*step <= hiW.Y/u && len(ns) < maxLines; k++ {
		ns = append(ns, k*step)
	}
	if len(es) == 0 && len(ns) == 0 {
		return
	}
	toPaperW := func(e, n float64) geom.Vec2 {
		return t.apply(p.Frame.ToLocal(geom.Vec2{X: e * u, Y: n * u}))
	}
	const arm = 1.0
	var pd pathData
	for _, e := range es {
		for _, n := range ns {
			q := toPaperW(e, n)
			pd.moveTo(q.X-arm, q.Y)
			pd.hTo(q.X + arm)
			pd.moveTo(q.X, q.Y-arm)
			pd.vTo(q.Y + arm)
		}
	}
	for _, e := range es { // edge ticks
		q := toPaperW(e, 0)
		pd.moveTo(q.X, planMapH)
		pd.vTo(planMapH - 1.5)
		pd.moveTo(q.X, 0)
		pd.vTo(1.5)
	}
	for _, n := range ns {
		q := toPaperW(0, n)
		pd.moveTo(0, q.Y)
		pd.hTo(1.5)
		pd.moveTo(planMapW, q.Y)
		pd.hTo(planMapW - 1.5)
	}
	d.open("g", "class", "grid")
	d.leaf("path", "fill", "none", "stroke", colGridTick, "stroke-width", "0.13", "d", pd.String())
	dec := 0
	if step < 1 {
		dec = 2
	}
	d.open("g", "font-size", "1.6", "fill", colGridTick)
	for _, e := range es {
		q := toPaperW(e, 0)
		if q.X < 20 || q.X > planMapW-8 { // keep clear of the scale bar corner and the edge
			continue
		}
		d.text(q.X, planMapH-2.2, "E "+fixed(e, dec), "text-anchor", "middle")
	}
	for _, n := range ns {
		q := toPaperW(0, n)
		if q.Y < 8 || q.Y > planMapH-14 {
			continue
		}
		d.text(2.2, q.Y, "N "+fixed(n, dec), "transform", "rotate(-90 2.2 "+svgNum(q.Y)+")", "text-anchor", "middle", "dominant-baseline", "hanging")
	}
	d.close("g")
	d.close("g")
}

// drawNorthArrow draws an arrow pointing up the sheet (the local frame's +y,
// grid north) with its top at (x, y).
func drawNorthArrow(d *svgDoc, x, y float64) {
	d.open("g", "class", "north-arrow")
	d.leaf("rect", "x", svgNum(x-6), "y", svgNum(y-1), "width", "12", "height", "19", "fill", colPaper, "fill-opacity", "0.85")
	d.text(x, y+3, "N", "font-size", "3.2", "font-weight", "bold", "text-anchor", "middle", "fill", colInk)
	var left, right pathData
	left.moveTo(x, y+4)
	left.lineTo(x-2.2, y+13)
	left.lineTo(x, y+11)
	left.closePath()
	right.moveTo(x, y+4)
	right.lineTo(x+2.2, y+13)
	right.lineTo(x, y+11)
	right.closePath()
	d.leaf("path", "fill", colInk, "stroke", colInk, "stroke-width", "0.2", "stroke-linejoin", "round", "d", left.String())
	d.leaf("path", "fill", colPaper, "stroke", colInk, "stroke-width", "0.2", "stroke-linejoin", "round", "d", right.String())
	d.text(x, y+16.5, "grid north", "font-size", "1.8", "text-anchor", "middle", "fill", colInk)
	d.close("g")
}

// scaleBarLayout chooses a scale bar: its length in user units (the longest
// round length of at most maxMM on paper), the number of divisions and the
// length of one division on paper.
func scaleBarLayout(mmPerUnit, maxMM float64) (length float64, divisions int, divMM float64) {
	length = niceFloor(maxMM / mmPerUnit)
	e := math.Pow(10, math.Floor(math.Log10(length)))
	switch m := math.Round(length / e * 10); m {
	case 20:
		divisions = 4
	default: // 1, 2.5 and 5 × 10^k
		divisions = 5
	}
	return length, divisions, length * mmPerUnit / float64(divisions)
}

// drawScaleBar draws a bar of alternating black and white divisions with
// its lower-left corner at (x, y).
func drawScaleBar(d *svgDoc, t paperTransform, sys units.System, x, y float64) {
	mmPerUnit := t.mmPerM() * sys.Metres()
	length, n, div := scaleBarLayout(mmPerUnit, 40)
	const h = 1.6
	d.open("g", "class", "scale-bar")
	d.leaf("rect", "x", svgNum(x-1), "y", svgNum(y-h-5.2), "width", svgNum(float64(n)*div+10), "height", svgNum(h+6.2),
		"fill", colPaper, "fill-opacity", "0.85")
	for k := range n {
		fill := colInk
		if k%2 == 1 {
			fill = colPaper
		}
		d.leaf("rect", "x", svgNum(x+float64(k)*div), "y", svgNum(y-h), "width", svgNum(div), "height", svgNum(h),
			"fill", fill, "stroke", colInk, "stroke-width", "0.15")
	}
	d.open("g", "font-size", "1.7", "fill", colInk, "text-anchor", "middle")
	// Label every division when they are at least 6 mm apart, else the ends.
	for k := 0; k <= n; k++ {
		if div < 6 && k != 0 && k != n {
			continue
		}
		text := trimNum(length*float64(k)/float64(n), 2)
		if k == n {
			text += " " + lengthUnit(sys)
		}
		d.text(x+float64(k)*div, y-h-0.8, text)
	}
	d.close("g")
	d.close("g")
}

// drawTitleBlock writes the job, the sheet name and the drawing facts in
// the left column of the band below the map.
func drawTitleBlock(d *svgDoc, p *PlanData, denom float64) {
	const x, w = 4.0, 62.0
	y := planBandY
	d.open("g", "class", "title-block", "fill", colInk)
	d.leaf("rect", "x", svgNum(x), "y", svgNum(y), "width", svgNum(w), "height", svgNum(planBandH),
		"fill", "none", "stroke", colInk, "stroke-width", "0.35")
	site := p.Title.Site
	if site == "" {
		site = "Pond plan"
	}
	ty := y + 6
	for i, line := range wrapText(site, w-4, 3.6) {
		if i == 2 {
			break
		}
		d.text(x+2, ty, line, "font-size", "3.6", "font-weight", "bold")
		ty += 4.4
	}
	d.text(x+2, ty, "Plan: cut and fill", "font-size", "2.6")
	ty += 2.2
	d.leaf("path", "d", "M"+svgNum(x)+" "+svgNum(ty)+"H"+svgNum(x+w), "stroke", colInk, "stroke-width", "0.2")
	ty += 4
	rows := [][2]string{
		{"Client", p.Title.Client},
		{"Address", p.Title.Address},
		{"Date", p.Title.Date},
		{"Prepared by", p.Title.Preparer},
		{"Units", unitsName(p.Units)},
	}
	if p.HasWaterLevel {
		rows = append(rows, [2]string{"Water level", fmtLevel(p.WaterLevelM, p.Units)})
	}
	rows = append(rows, [2]string{"Scale", scaleLabel(denom, p.Units) + " on a 180 × 225 mm sheet"})
	const size = 2.2
	for _, r := range rows {
		if r[1] == "" {
			continue
		}
		lines := wrapText(r[1], w-22, size)
		for i, line := range lines {
			if ty > y+planBandH-1.5 {
				break
			}
			if i == 0 {
				d.text(x+2, ty, r[0], "font-size", svgNum(size), "fill", colPointLabel)
			}
			d.text(x+20, ty, line, "font-size", svgNum(size))
			ty += size * 1.35
		}
	}
	d.close("g")
}

// legendItem is one line style of the legend.
type legendItem struct {
	text  string
	draw  func(d *svgDoc, x, y float64) // sample 8 mm long, centred at y
	shown bool
}

func lineSample(colour string, w float64, dash string) func(d *svgDoc, x, y float64) {
	return func(d *svgDoc, x, y float64) {
		attrs := []string{"d", "M" + svgNum(x) + " " + svgNum(y) + "H" + svgNum(x+8), "stroke", colour, "stroke-width", svgNum(w), "fill", "none"}
		if dash != "" {
			attrs = append(attrs, "stroke-dasharray", dash)
		}
		d.leaf("path", attrs...)
	}
}

// drawLegend writes the cut and fill classes and the line styles in the
// middle column of the band.
func drawLegend(d *svgDoc, p *PlanData, lg depthLegend) {
	const x, w = 68.0, 64.0
	y := planBandY
	d.open("g", "class", "legend", "fill", colInk, "font-size", "2")
	d.leaf("rect", "x", svgNum(x), "y", svgNum(y), "width", svgNum(w), "height", svgNum(planBandH),
		"fill", "none", "stroke", colInk, "stroke-width", "0.35")
	d.text(x+2, y+4.5, "Legend", "font-size", "2.6", "font-weight", "bold")
	ty := y + 9.0
	if lg.HasCut || lg.HasFl {
		d.text(x+2, ty, "Cut (dig), depth below existing", "font-size", "1.9")
		d.text(x+2+w/2, ty, "Fill (build up), height above", "font-size", "1.9")
		ty += 1.5
		rows := max(lg.NCut, lg.NFill)
		for k := 1; k <= rows; k++ {
			yy := ty + float64(k-1)*3.6
			if k <= lg.NCut {
				d.leaf("rect", "x", svgNum(x+2), "y", svgNum(yy), "width", "5", "height", "2.8", "fill", lg.colour(-k), "stroke", colInk, "stroke-width", "0.1")
				d.text(x+8.5, yy+2.2, lg.label(-k, p.Units))
			}
			if k <= lg.NFill {
				d.leaf("rect", "x", svgNum(x+2+w/2), "y", svgNum(yy), "width", "5", "height", "2.8", "fill", lg.colour(k), "stroke", colInk, "stroke-width", "0.1")
				d.text(x+8.5+w/2, yy+2.2, lg.label(k, p.Units))
			}
		}
		ty += float64(rows)*3.6 + 1.5
	}
	items := []legendItem{
		{"Existing contour", lineSample(colExisting, 0.25, "1.5 0.8"), len(p.Existing) > 0},
		{"Design contour", lineSample(colDesign, 0.35, ""), len(p.Design) > 0},
		{"Water line", lineSample(colWater, 0.5, "4 1 1 1"), len(p.WaterLine) > 0},
		{"Rim (top of bank)", lineSample(colInk, 0.5, ""), len(p.Rim) > 0},
		{"Zone edge", lineSample(colInk, 0.25, ""), len(p.Zones) > 0},
		{"Berm toe", lineSample(colInk, 0.25, "2 1"), len(p.BermToe) > 0},
		{"Edge of cut", lineSample(colInk, 0.2, "0.4 0.5"), lg.HasCut},
		{"Section line", lineSample(colInk, 0.35, "6 1.2 1.2 1.2"), len(p.Sections) > 0},
		{"Survey point", func(d *svgDoc, x, y float64) {
			d.leaf("path", "d", "M"+svgNum(x+3.4)+" "+svgNum(y-0.6)+"L"+svgNum(x+4.6)+" "+svgNum(y+0.6)+
				"M"+svgNum(x+3.4)+" "+svgNum(y+0.6)+"L"+svgNum(x+4.6)+" "+svgNum(y-0.6), "stroke", colInk, "stroke-width", "0.15")
		}, len(p.Points) > 0},
	}
	col := 0
	for _, it := range items {
		if !it.shown {
			continue
		}
		if ty > y+planBandH-2 {
			break
		}
		xx := x + 2 + float64(col)*w/2
		it.draw(d, xx, ty-0.7)
		d.text(xx+9.5, ty, it.text)
		col++
		if col == 2 {
			col = 0
			ty += 3.4
		}
	}
	d.close("g")
}

// drawNotes writes the notes, wrapped, in the right column of the band; a
// note that does not fit is cut short with an ellipsis.
func drawNotes(d *svgDoc, notes []string) {
	const x, w, size = 134.0, 42.0, 1.9
	y := planBandY
	d.open("g", "class", "notes", "fill", colInk, "font-size", svgNum(size))
	d.leaf("rect", "x", svgNum(x), "y", svgNum(y), "width", svgNum(w), "height", svgNum(planBandH),
		"fill", "none", "stroke", colInk, "stroke-width", "0.35")
	d.text(x+2, y+4.5, "Notes", "font-size", "2.6", "font-weight", "bold")
	ty := y + 8.5
	bottom := y + planBandH - 1.5
	for i, n := range notes {
		lines := wrapText(n, w-7, size)
		for k, line := range lines {
			if ty > bottom {
				break
			}
			if ty+size*1.3 > bottom && (k < len(lines)-1 || i < len(notes)-1) {
				line += " …"
			}
			if k == 0 {
				d.text(x+2, ty, fmt.Sprintf("%d.", i+1))
			}
			d.text(x+5, ty, line)
			ty += size * 1.3
		}
		ty += 0.6
	}
	d.close("g")
}
