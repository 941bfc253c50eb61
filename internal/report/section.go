package report

import (
	"fmt"
	"io"
	"math"
	"slices"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/units"
)

// ProfilePoint is one point of a profile along a section line: chainage S
// (metres along the line from its start) and elevation Z (metres). A NaN Z
// marks a gap, where the surface is not known.
type ProfilePoint struct {
	S, Z float64
}

// SectionData is one cross-section: the existing ground and the finished
// grade along the section line, the water level, where the line crosses the
// rim, and how far the liner runs on past the rim. Chainages and elevations
// are in metres; Units chooses how labels and axes are written.
type SectionData struct {
	Name  string // "A" for section A–A'
	Site  string // printed under the title; optional
	Units units.System

	Existing []ProfilePoint // chainage non-decreasing
	Finished []ProfilePoint // chainage non-decreasing

	// HasWaterLevel reports whether WaterLevelM is set.
	HasWaterLevel bool
	WaterLevelM   float64

	// RimS holds the chainages (m, increasing) where the line crosses the
	// rim, usually two. The rim elevations are read off the finished grade
	// there. With two or more, the liner is drawn from the first to the last
	// and on past each by LinerOverlapM, measured along the finished surface.
	RimS          []float64
	LinerOverlapM float64

	// Exaggeration is the vertical exaggeration (vertical scale divided by
	// horizontal); 0 chooses one (see [Section]).
	Exaggeration float64
	// ScaleDenominator is the horizontal scale 1:ScaleDenominator; 0 picks
	// the largest standard scale at which the section fits.
	ScaleDenominator float64
}

// Sheet layout of a section in millimetres: 180 × 100 mm, two to a page of
// US Letter or A4.
const (
	secSheetW = 180.0
	secSheetH = 100.0
	secPlotX  = 22.0
	secPlotY  = 17.0
	secPlotW  = 152.0
	secPlotH  = 62.0
	// secFill is the share of the plot height the relief may take; the rest
	// is room for the labels above and below.
	secFill = 0.75
	// secMinFill is the share below which a larger exaggeration is tried.
	secMinFill = 0.4
)

// sectionExaggerations are the vertical exaggerations offered, smallest
// first: round factors at which slopes still read (common practice, no
// source).
var sectionExaggerations = []float64{1, 2, 2.5, 4, 5, 10}

// Section writes the cross-section s as a standalone SVG drawing of 180 ×
// 100 mm: the cut (brown) and fill (blue-green) between existing ground and
// finished grade, the water surface, the liner with its overlap past the rim,
// labelled rim, water and floor elevations, the water depth and freeboard,
// a chainage axis, an elevation axis, and a title stating both scales and
// the vertical exaggeration.
//
// Unless s.Exaggeration is set, the smallest exaggeration of 1, 2, 2.5, 4, 5
// and 10 is chosen at which the relief fills at least 40 % of the plot
// height without passing 75 %, or the largest that stays within 75 %. The
// floor is the lowest finished point between the first and last rim
// crossing (of the whole profile when there are fewer than two).
//
// Section returns a [*ValueError] for non-finite or decreasing chainages,
// infinite elevations, rim chainages outside the finished profile, or a
// negative overlap, exaggeration or scale; [ErrNothingToDraw] when neither
// profile has a known point; and any error of w.
func Section(w io.Writer, s SectionData) error {
	if err := validateSection(&s); err != nil {
		return err
	}
	sLo, sHi, zLo, zHi, ok := sectionBounds(&s)
	if !ok {
		return fmt.Errorf("section %s: %w", s.Name, ErrNothingToDraw)
	}
	if sHi-sLo < 1 {
		c := (sHi + sLo) / 2
		sLo, sHi = c-0.5, c+0.5
	}
	relief := math.Max(zHi-zLo, 0.1) // m; a flat section still gets a height
	hNeed := (sHi - sLo) * 1000 / secPlotW
	hDenom := s.ScaleDenominator
	if hDenom == 0 {
		// Also make the relief fit at the chosen exaggeration (at none when
		// it is to be chosen).
		vNeed := relief * 1000 * math.Max(s.Exaggeration, 1) / (secPlotH * secFill)
		hDenom = standardScale(math.Max(hNeed, vNeed), s.Units)
	}
	ve := s.Exaggeration
	if ve == 0 {
		ve = chooseExaggeration(relief*1000/hDenom, secPlotH)
	}
	kh := 1000 / hDenom // paper mm per metre, horizontally
	kv := kh * ve       // and vertically
	x0 := secPlotX + (secPlotW-(sHi-sLo)*kh)/2
	zMid := (zLo + zHi) / 2
	yMid := secPlotY + secPlotH*0.55 // a little low, leaving room for the rim labels
	px := func(st float64) float64 { return x0 + (st-sLo)*kh }
	py := func(z float64) float64 { return yMid - (z-zMid)*kv }
	pt := func(p ProfilePoint) geom.Vec2 { return geom.Vec2{X: px(p.S), Y: py(p.Z)} }

	name := s.Name
	if name == "" {
		name = "A"
	}
	title := name + "–" + name + "'"
	d := newSVGDoc(secSheetW, secSheetH)
	d.leaf("rect", "x", "0", "y", "0", "width", svgNum(secSheetW), "height", svgNum(secSheetH), "fill", colPaper)
	d.text(4, 6.5, "Section "+title, "font-size", "4", "font-weight", "bold", "fill", colInk)
	vDenom := hDenom / ve
	facts := "Horizontal " + scaleLabel(hDenom, s.Units) + " · vertical " + scaleLabel(vDenom, s.Units) +
		" · vertical exaggeration " + trimNum(ve, 1) + "×"
	d.text(4, 11.5, facts, "font-size", "2.3", "fill", colInk)
	if s.Site != "" {
		d.text(secSheetW-4, 6.5, s.Site, "font-size", "2.3", "text-anchor", "end", "fill", colPointLabel)
	}

	// The plot: a nested viewport clips the profiles to the plot frame.
	d.open("svg", "x", svgNum(secPlotX), "y", svgNum(secPlotY), "width", svgNum(secPlotW), "height", svgNum(secPlotH),
		"viewBox", svgNum(secPlotX)+" "+svgNum(secPlotY)+" "+svgNum(secPlotW)+" "+svgNum(secPlotH), "overflow", "hidden")
	zTop := zMid + (yMid-secPlotY)/kv
	zBottom := zMid - (secPlotY+secPlotH-yMid)/kv
	zTicks, zDec := axisTicks(zBottom, zTop, kv, s.Units, 8)
	drawSectionGrid(d, zTicks, s.Units, py)
	drawCutFillAreas(d, s.Existing, s.Finished, pt)
	floor, hasFloor := sectionFloor(&s)
	if s.HasWaterLevel {
		drawWater(d, &s, px, py)
	}
	drawProfile(d, s.Existing, pt, colExisting, 0.3, "existing-ground")
	drawProfile(d, s.Finished, pt, colDesign, 0.4, "finished-grade")
	liner := linerProfile(&s)
	if len(liner) >= 2 {
		var pd pathData
		paper := make([]geom.Vec2, len(liner))
		for i, p := range liner {
			paper[i] = pt(p).Add(geom.Vec2{Y: 0.7}) // drawn just under the finished grade
		}
		polyPath(&pd, paper, false)
		d.leaf("path", "class", "liner", "fill", "none", "stroke", colLiner, "stroke-width", "0.5", "stroke-dasharray", "2.5 0.6", "d", pd.String())
		for _, e := range []geom.Vec2{paper[0], paper[len(paper)-1]} {
			d.leaf("path", "d", "M"+svgNum(e.X)+" "+svgNum(e.Y-1.2)+"V"+svgNum(e.Y+1.2), "stroke", colLiner, "stroke-width", "0.4")
		}
	}
	d.close("svg")
	d.leaf("rect", "x", svgNum(secPlotX), "y", svgNum(secPlotY), "width", svgNum(secPlotW), "height", svgNum(secPlotH),
		"fill", "none", "stroke", colInk, "stroke-width", "0.3")

	// Axes.
	d.open("g", "class", "axes", "font-size", "2", "fill", colInk)
	for _, z := range zTicks {
		y := py(z * s.Units.Metres())
		d.leaf("path", "d", "M"+svgNum(secPlotX-1.2)+" "+svgNum(y)+"H"+svgNum(secPlotX), "stroke", colInk, "stroke-width", "0.2")
		d.text(secPlotX-1.8, y+0.7, fixed(z, zDec), "text-anchor", "end")
	}
	d.text(5, secPlotY+secPlotH/2, "Elevation ("+lengthUnit(s.Units)+")", "text-anchor", "middle",
		"transform", "rotate(-90 5 "+svgNum(secPlotY+secPlotH/2)+")")
	sTicks, sDec := chainageTicks(sLo, sHi, kh, s.Units)
	yb := secPlotY + secPlotH
	for _, c := range sTicks {
		x := px(c * s.Units.Metres())
		if x < secPlotX-0.01 || x > secPlotX+secPlotW+0.01 {
			continue
		}
		d.leaf("path", "d", "M"+svgNum(x)+" "+svgNum(yb)+"V"+svgNum(yb+1.2), "stroke", colInk, "stroke-width", "0.2")
		d.text(x, yb+3.6, fixed(c, sDec), "text-anchor", "middle")
	}
	d.text(secPlotX+secPlotW/2, yb+7.2, "Distance along "+title+" ("+lengthUnit(s.Units)+")", "text-anchor", "middle")
	d.close("g")

	drawSectionLabels(d, &s, floor, hasFloor, pt, px, py)
	drawSectionLegend(d, &s, len(liner) >= 2)
	d.leaf("rect", "x", "0.25", "y", "0.25", "width", svgNum(secSheetW-0.5), "height", svgNum(secSheetH-0.5),
		"fill", "none", "stroke", colInk, "stroke-width", "0.5")
	return d.writeTo(w)
}

// chooseExaggeration picks the vertical exaggeration for a relief of
// reliefMM on paper at no exaggeration in a plot plotH mm high (see
// [Section]).
func chooseExaggeration(reliefMM, plotH float64) float64 {
	best := sectionExaggerations[0]
	for _, ve := range sectionExaggerations {
		h := reliefMM * ve
		if h > plotH*secFill {
			break
		}
		best = ve
		if h >= plotH*secMinFill {
			break
		}
	}
	return best
}

func validateSection(s *SectionData) error {
	item := "section " + s.Name
	for _, f := range []struct {
		name string
		v    float64
	}{{"liner overlap (m)", s.LinerOverlapM}, {"vertical exaggeration", s.Exaggeration}, {"scale denominator", s.ScaleDenominator}} {
		if err := finite(item, f.name, f.v); err != nil {
			return err
		}
		if f.v < 0 {
			return &ValueError{Item: item, Field: f.name, Value: f.v, Reason: "must be ≥ 0"}
		}
	}
	if s.HasWaterLevel {
		if err := finite(item, "water level (m)", s.WaterLevelM); err != nil {
			return err
		}
	}
	for _, pr := range []struct {
		name string
		ps   []ProfilePoint
	}{{"existing ground", s.Existing}, {"finished grade", s.Finished}} {
		for i, p := range pr.ps {
			where := fmt.Sprintf("%s, %s point %d", item, pr.name, i)
			if err := finite(where, "chainage (m)", p.S); err != nil {
				return err
			}
			if i > 0 && p.S < pr.ps[i-1].S {
				return &ValueError{Item: where, Field: "chainage (m)", Value: p.S,
					Reason: fmt.Sprintf("must not be less than the previous point's %g", pr.ps[i-1].S)}
			}
			if math.IsInf(p.Z, 0) {
				return &ValueError{Item: where, Field: "elevation (m)", Value: p.Z, Reason: "must be finite, or NaN for a gap"}
			}
		}
	}
	for i, r := range s.RimS {
		where := fmt.Sprintf("%s, rim crossing %d", item, i)
		if err := finite(where, "chainage (m)", r); err != nil {
			return err
		}
		if i > 0 && r <= s.RimS[i-1] {
			return &ValueError{Item: where, Field: "chainage (m)", Value: r, Reason: "rim crossings must increase"}
		}
		if _, ok := profileAt(s.Finished, r); !ok {
			return &ValueError{Item: where, Field: "chainage (m)", Value: r, Reason: "the finished grade is not known there"}
		}
	}
	return nil
}

// sectionBounds returns the chainage and elevation extent of everything
// drawn.
func sectionBounds(s *SectionData) (sLo, sHi, zLo, zHi float64, ok bool) {
	sLo, zLo = math.Inf(1), math.Inf(1)
	sHi, zHi = math.Inf(-1), math.Inf(-1)
	for _, ps := range [][]ProfilePoint{s.Existing, s.Finished} {
		for _, p := range ps {
			if math.IsNaN(p.Z) {
				continue
			}
			sLo, sHi = math.Min(sLo, p.S), math.Max(sHi, p.S)
			zLo, zHi = math.Min(zLo, p.Z), math.Max(zHi, p.Z)
			ok = true
		}
	}
	if ok && s.HasWaterLevel {
		zLo, zHi = math.Min(zLo, s.WaterLevelM), math.Max(zHi, s.WaterLevelM)
	}
	return sLo, sHi, zLo, zHi, ok
}

// profileAt interpolates the profile linearly at chainage st; ok is false
// outside it or in a gap. Where two points share a chainage (a vertical
// step), the first is used.
func profileAt(ps []ProfilePoint, st float64) (float64, bool) {
	i, _ := slices.BinarySearchFunc(ps, st, func(p ProfilePoint, t float64) int {
		switch {
		case p.S < t:
			return -1
		case p.S > t:
			return 1
		}
		return 0
	})
	if i < len(ps) && ps[i].S == st {
		return ps[i].Z, !math.IsNaN(ps[i].Z)
	}
	if i == 0 || i == len(ps) {
		return 0, false
	}
	a, b := ps[i-1], ps[i]
	if math.IsNaN(a.Z) || math.IsNaN(b.Z) {
		return 0, false
	}
	f := (st - a.S) / (b.S - a.S)
	return a.Z + f*(b.Z-a.Z), true
}

// floorBandM is the height band that counts as the floor when placing the
// floor label and the depth dimension: finished points within 5 mm of the
// lowest. It only places labels.
const floorBandM = 0.005

// sectionFloor returns the floor: the lowest finished elevation between the
// first and last rim crossings (the whole profile with fewer than two), at
// the middle chainage of the points within [floorBandM] of it, so that a
// flat floor is labelled at its middle.
func sectionFloor(s *SectionData) (ProfilePoint, bool) {
	lo, hi := math.Inf(-1), math.Inf(1)
	if len(s.RimS) >= 2 {
		lo, hi = s.RimS[0], s.RimS[len(s.RimS)-1]
	}
	in := func(p ProfilePoint) bool { return p.S >= lo && p.S <= hi && !math.IsNaN(p.Z) }
	zMin, ok := math.Inf(1), false
	for _, p := range s.Finished {
		if in(p) && p.Z < zMin {
			zMin, ok = p.Z, true
		}
	}
	if !ok {
		return ProfilePoint{}, false
	}
	first, last := math.NaN(), math.NaN()
	for _, p := range s.Finished {
		if in(p) && p.Z <= zMin+floorBandM {
			if math.IsNaN(first) {
				first = p.S
			}
			last = p.S
		}
	}
	return ProfilePoint{S: (first + last) / 2, Z: zMin}, true
}

// linerProfile returns the liner along the finished grade from the first
// rim crossing less the overlap to the last plus the overlap, the overlap
// measured along the (unexaggerated) finished surface. It stops early at a
// gap or at the end of the profile. With fewer than two rim crossings it
// returns nil.
func linerProfile(s *SectionData) []ProfilePoint {
	if len(s.RimS) < 2 {
		return nil
	}
	r0, r1 := s.RimS[0], s.RimS[len(s.RimS)-1]
	z0, _ := profileAt(s.Finished, r0)
	z1, _ := profileAt(s.Finished, r1)
	left := walkSurface(s.Finished, ProfilePoint{S: r0, Z: z0}, -1, s.LinerOverlapM)
	right := walkSurface(s.Finished, ProfilePoint{S: r1, Z: z1}, +1, s.LinerOverlapM)
	out := make([]ProfilePoint, 0, len(s.Finished)+2)
	out = append(out, left)
	for _, p := range s.Finished {
		if p.S > left.S && p.S < right.S {
			if math.IsNaN(p.Z) {
				return nil // a gap under the liner: nothing sensible to draw
			}
			out = append(out, p)
		}
	}
	return append(out, right)
}

// walkSurface walks from p along the profile in direction dir (−1 or +1)
// for a surface length of length metres and returns where it ends.
func walkSurface(ps []ProfilePoint, p ProfilePoint, dir int, length float64) ProfilePoint {
	cur := p
	left := length
	n := len(ps)
	for k := range n {
		i := k
		if dir < 0 {
			i = n - 1 - k
		}
		q := ps[i]
		if (dir > 0 && q.S <= cur.S) || (dir < 0 && q.S >= cur.S) {
			continue
		}
		if math.IsNaN(q.Z) {
			return cur
		}
		seg := math.Hypot(q.S-cur.S, q.Z-cur.Z)
		if seg >= left {
			f := left / seg
			return ProfilePoint{S: cur.S + f*(q.S-cur.S), Z: cur.Z + f*(q.Z-cur.Z)}
		}
		left -= seg
		cur = q
	}
	return cur
}

// axisTicks returns round elevations (in the units of sys) at least minMM
// apart on paper over [zLo, zHi] metres, and the decimals to print them
// with.
func axisTicks(zLo, zHi, kv float64, sys units.System, minMM float64) ([]float64, int) {
	u := sys.Metres()
	step := niceStep(minMM / kv / u)
	var ts []float64
	for k := math.Ceil(zLo / u / step); k*step <= zHi/u*(1+niceTol) && len(ts) < 40; k++ {
		ts = append(ts, k*step)
	}
	return ts, decimalsFor(step)
}

// chainageTicks returns round chainages (units of sys) at least 15 mm apart
// on paper over [sLo, sHi] metres, and their decimals.
func chainageTicks(sLo, sHi, kh float64, sys units.System) ([]float64, int) {
	u := sys.Metres()
	step := niceStep(15 / kh / u)
	var ts []float64
	for k := math.Ceil(sLo / u / step); k*step <= sHi/u*(1+niceTol) && len(ts) < 40; k++ {
		ts = append(ts, k*step)
	}
	return ts, decimalsFor(step)
}

// decimalsFor returns the decimals needed to print multiples of step (a
// value from [niceStep]); a step counts as whole at a decimal when it is
// within [niceTol] (relative) of it, which absorbs the binary round-off of
// steps such as 0.1 or 0.25.
func decimalsFor(step float64) int {
	for dec := 0; dec < 4; dec++ {
		p := math.Pow(10, float64(dec))
		if math.Abs(step*p-math.Round(step*p)) <= niceTol*step*p {
			return dec
		}
	}
	return 4
}

// drawSectionGrid draws faint level lines at the elevation ticks (ticks in
// the units of sys).
func drawSectionGrid(d *svgDoc, zTicks []float64, sys units.System, py func(float64) float64) {
	var pd pathData
	for _, z := range zTicks {
		y := py(z * sys.Metres())
		pd.moveTo(secPlotX, y)
		pd.hTo(secPlotX + secPlotW)
	}
	if !pd.empty() {
		d.leaf("path", "class", "level-lines", "fill", "none", "stroke", colGridTick, "stroke-width", "0.1", "d", pd.String())
	}
}

// drawProfile draws a profile as a path, broken at gaps.
func drawProfile(d *svgDoc, ps []ProfilePoint, pt func(ProfilePoint) geom.Vec2, colour string, w float64, class string) {
	var pd pathData
	var run []geom.Vec2
	flush := func() {
		if len(run) >= 2 {
			polyPath(&pd, run, false)
		}
		run = run[:0]
	}
	for _, p := range ps {
		if math.IsNaN(p.Z) {
			flush()
			continue
		}
		run = append(run, pt(p))
	}
	flush()
	if !pd.empty() {
		d.leaf("path", "class", class, "fill", "none", "stroke", colour, "stroke-width", svgNum(w), "stroke-linejoin", "round", "d", pd.String())
	}
}

// gradeSample is the existing (G) and finished (D) elevation at one
// chainage.
type gradeSample struct{ S, G, D float64 }

// gradeSamples samples both profiles at the union of their chainages where
// both are known, inserting the chainages where D − G changes sign. Runs
// separated by a gap are separated by a NaN sample.
func gradeSamples(ex, fin []ProfilePoint) []gradeSample {
	ss := make([]float64, 0, len(ex)+len(fin))
	for _, p := range ex {
		ss = append(ss, p.S)
	}
	for _, p := range fin {
		ss = append(ss, p.S)
	}
	slices.Sort(ss)
	ss = slices.Compact(ss)
	var out []gradeSample
	var prev *gradeSample
	for _, st := range ss {
		g, ok1 := profileAt(ex, st)
		dz, ok2 := profileAt(fin, st)
		if !ok1 || !ok2 {
			if prev != nil {
				out = append(out, gradeSample{S: st, G: math.NaN(), D: math.NaN()})
			}
			prev = nil
			continue
		}
		cur := gradeSample{S: st, G: g, D: dz}
		if prev != nil {
			a, b := prev.D-prev.G, cur.D-cur.G
			if (a < 0 && b > 0) || (a > 0 && b < 0) {
				f := a / (a - b)
				z := prev.G + f*(cur.G-prev.G)
				out = append(out, gradeSample{S: prev.S + f*(cur.S-prev.S), G: z, D: z})
			}
		}
		out = append(out, cur)
		prev = &out[len(out)-1]
	}
	return out
}

// drawCutFillAreas shades the areas between existing ground and finished
// grade: cut where the finished grade is below the ground, fill where above.
func drawCutFillAreas(d *svgDoc, ex, fin []ProfilePoint, pt func(ProfilePoint) geom.Vec2) {
	samples := gradeSamples(ex, fin)
	var cut, fill pathData
	var run []gradeSample
	sign := 0
	flush := func() {
		if len(run) >= 2 && sign != 0 {
			pd := &fill
			if sign < 0 {
				pd = &cut
			}
			paper := make([]geom.Vec2, 0, 2*len(run))
			for _, r := range run {
				paper = append(paper, pt(ProfilePoint{S: r.S, Z: r.G}))
			}
			for i := len(run) - 1; i >= 0; i-- {
				paper = append(paper, pt(ProfilePoint{S: run[i].S, Z: run[i].D}))
			}
			polyPath(pd, paper, true)
		}
	}
	for _, smp := range samples {
		if math.IsNaN(smp.G) { // a gap ends the run
			flush()
			run, sign = nil, 0
			continue
		}
		sg := 0
		switch diff := smp.D - smp.G; {
		case diff < 0:
			sg = -1
		case diff > 0:
			sg = 1
		}
		switch {
		case sg == 0: // the grades meet: close the run, start the next here
			run = append(run, smp)
			flush()
			run, sign = []gradeSample{smp}, 0
		case sign == 0 || sg == sign:
			run, sign = append(run, smp), sg
		default: // cannot happen: gradeSamples inserts every crossing
			flush()
			run, sign = []gradeSample{smp}, sg
		}
	}
	flush()
	d.open("g", "class", "cut-fill", "stroke", "none")
	if !cut.empty() {
		d.leaf("path", "class", "cut", "fill", depthColour(true, 1, 2), "d", cut.String())
	}
	if !fill.empty() {
		d.leaf("path", "class", "fill", "fill", depthColour(false, 1, 2), "d", fill.String())
	}
	d.close("g")
}

// drawWater draws the water surface wherever the finished grade between
// the rims lies below the water level. The water is not shaded, so that the
// cut below it stays visible; the water-level mark says where it is.
func drawWater(d *svgDoc, s *SectionData, px, py func(float64) float64) {
	wl := s.WaterLevelM
	lo, hi := math.Inf(-1), math.Inf(1)
	if len(s.RimS) >= 2 {
		lo, hi = s.RimS[0], s.RimS[len(s.RimS)-1]
	}
	// Finished grade with the water-level crossings inserted.
	var pts []ProfilePoint
	for i, p := range s.Finished {
		if math.IsNaN(p.Z) {
			pts = append(pts, p)
			continue
		}
		if i > 0 && !math.IsNaN(s.Finished[i-1].Z) {
			q := s.Finished[i-1]
			if (q.Z < wl) != (p.Z < wl) && q.Z != p.Z {
				f := (wl - q.Z) / (p.Z - q.Z)
				pts = append(pts, ProfilePoint{S: q.S + f*(p.S-q.S), Z: wl})
			}
		}
		pts = append(pts, p)
	}
	var line pathData
	var run []ProfilePoint
	flush := func() {
		if len(run) >= 2 && run[len(run)-1].S >= lo && run[0].S <= hi {
			line.moveTo(px(run[0].S), py(wl))
			line.hTo(px(run[len(run)-1].S))
		}
		run = run[:0]
	}
	for _, p := range pts {
		if math.IsNaN(p.Z) || p.Z > wl {
			flush()
			continue
		}
		run = append(run, p)
	}
	flush()
	if line.empty() {
		return
	}
	d.leaf("path", "class", "water-line", "fill", "none", "stroke", colWater, "stroke-width", "0.4", "d", line.String())
}

// drawSectionLabels writes the rim, water and floor elevations and the
// depth dimension.
func drawSectionLabels(d *svgDoc, s *SectionData, floor ProfilePoint, hasFloor bool, pt func(ProfilePoint) geom.Vec2, px, py func(float64) float64) {
	const size = 2.1
	d.open("g", "class", "labels", "font-size", svgNum(size), "fill", colInk,
		"stroke", colHalo, "stroke-width", "0.6", "paint-order", "stroke", "stroke-linejoin", "round")
	rimZ := math.Inf(-1)
	for i, r := range s.RimS {
		z, _ := profileAt(s.Finished, r)
		rimZ = math.Max(rimZ, z)
		p := pt(ProfilePoint{S: r, Z: z})
		d.leaf("path", "d", "M"+svgNum(p.X)+" "+svgNum(p.Y-0.8)+"V"+svgNum(p.Y-4), "stroke", colInk, "stroke-width", "0.2")
		anchor := "end"
		dx := -0.6
		if i == len(s.RimS)-1 && i > 0 {
			anchor, dx = "start", 0.6
		}
		d.text(p.X+dx, p.Y-4.6, "rim "+fmtLevel(z, s.Units), "text-anchor", anchor)
	}
	if hasFloor {
		p := pt(floor)
		d.text(p.X, p.Y+4.2, "floor "+fmtLevel(floor.Z, s.Units), "text-anchor", "middle")
	}
	if s.HasWaterLevel {
		// The water-level mark (a triangle standing on its point, with
		// short lines under the surface) and the level, near the left end
		// of the water.
		if xs := waterExtent(s); len(xs) == 2 {
			x := px(xs[0]) + math.Min(8, (px(xs[1])-px(xs[0]))*0.12)
			y := py(s.WaterLevelM)
			var mark pathData
			mark.moveTo(x-1.1, y-1.9)
			mark.lineTo(x+1.1, y-1.9)
			mark.lineTo(x, y)
			mark.closePath()
			d.leaf("path", "d", mark.String(), "fill", colPaper, "stroke", colWater, "stroke-width", "0.25")
			var ripples pathData
			for k, half := range []float64{1.3, 0.85, 0.4} {
				yy := y + 0.8 + 0.7*float64(k)
				ripples.moveTo(x-half, yy)
				ripples.hTo(x + half)
			}
			d.leaf("path", "d", ripples.String(), "fill", "none", "stroke", colWater, "stroke-width", "0.2")
			d.text(x+1.8, y-0.8, "water "+fmtLevel(s.WaterLevelM, s.Units), "fill", colWater)
		}
	}
	if hasFloor && (s.HasWaterLevel || len(s.RimS) > 0) {
		// Depth dimension at the middle of the floor: floor to water, and
		// water to rim (freeboard) above it, its text above the top.
		x := px(floor.S)
		yf := py(floor.Z)
		top := floor.Z
		if s.HasWaterLevel && s.WaterLevelM > floor.Z {
			top = s.WaterLevelM
			dimension(d, x, yf, py(top), fmtDepth(top-floor.Z, s.Units)+" water depth", (yf+py(top))/2+0.7)
		}
		if len(s.RimS) > 0 && rimZ > top {
			if top == floor.Z {
				dimension(d, x, yf, py(rimZ), fmtDepth(rimZ-floor.Z, s.Units)+" deep", (yf+py(rimZ))/2+0.7)
			} else {
				dimension(d, x, py(top), py(rimZ), fmtDepth(rimZ-top, s.Units)+" freeboard", py(rimZ)-1.6)
			}
		}
	}
	d.close("g")
}

// waterExtent returns the chainages of the first and last points where the
// water meets the finished grade between the rims, or nil.
func waterExtent(s *SectionData) []float64 {
	wl := s.WaterLevelM
	lo, hi := math.Inf(-1), math.Inf(1)
	if len(s.RimS) >= 2 {
		lo, hi = s.RimS[0], s.RimS[len(s.RimS)-1]
	}
	first, last := math.NaN(), math.NaN()
	for i := 1; i < len(s.Finished); i++ {
		q, p := s.Finished[i-1], s.Finished[i]
		if math.IsNaN(q.Z) || math.IsNaN(p.Z) || p.S < lo || q.S > hi {
			continue
		}
		if (q.Z-wl)*(p.Z-wl) <= 0 && q.Z != p.Z {
			x := q.S + (wl-q.Z)/(p.Z-q.Z)*(p.S-q.S)
			if math.IsNaN(first) {
				first = x
			}
			last = x
		}
	}
	if math.IsNaN(first) || last <= first {
		return nil
	}
	return []float64{first, last}
}

// dimension draws a vertical dimension line from y0 to y1 (paper) at x with
// arrowheads, and its text to the right at height ty.
func dimension(d *svgDoc, x, y0, y1 float64, text string, ty float64) {
	if math.Abs(y1-y0) < 0.5 {
		return
	}
	var pd pathData
	pd.moveTo(x, y0)
	pd.vTo(y1)
	sgn := 1.0
	if y1 < y0 {
		sgn = -1
	}
	for _, e := range []struct{ y, s float64 }{{y0, -sgn}, {y1, sgn}} {
		pd.moveTo(x-0.5, e.y-e.s*1.2)
		pd.lineTo(x, e.y)
		pd.lineTo(x+0.5, e.y-e.s*1.2)
	}
	d.leaf("path", "d", pd.String(), "fill", "none", "stroke", colInk, "stroke-width", "0.2")
	d.text(x+1.2, ty, text)
}

// drawSectionLegend writes the line and area styles along the bottom of the
// sheet.
func drawSectionLegend(d *svgDoc, s *SectionData, liner bool) {
	y := secSheetH - 4.5
	x := 4.0
	d.open("g", "class", "legend", "font-size", "1.9", "fill", colInk)
	item := func(sample func(x, y float64), text string) {
		sample(x, y)
		d.text(x+9.5, y+0.7, text)
		x += 12 + svgTextWidth(text, 1.9)
	}
	line := func(colour string, w float64, dash string) func(x, y float64) {
		return func(x, y float64) { lineSample(colour, w, dash)(d, x, y) }
	}
	box := func(fill string) func(x, y float64) {
		return func(x, y float64) {
			d.leaf("rect", "x", svgNum(x), "y", svgNum(y-1.2), "width", "5.5", "height", "2.4", "fill", fill, "stroke", colInk, "stroke-width", "0.1")
		}
	}
	item(line(colExisting, 0.3, ""), "existing ground")
	item(line(colDesign, 0.4, ""), "finished grade")
	if liner {
		item(line(colLiner, 0.5, "2.5 0.6"), "liner (overlap "+fmtDepth(s.LinerOverlapM, s.Units)+" past the rim)")
	}
	if s.HasWaterLevel {
		item(line(colWater, 0.4, ""), "water level")
	}
	item(box(depthColour(true, 1, 2)), "cut")
	item(box(depthColour(false, 1, 2)), "fill")
	d.close("g")
}
