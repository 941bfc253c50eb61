package report

import (
	"fmt"
	"math"
	"strings"
	"time"
	"unicode"
	"unicode/utf8"

	"github.com/dugout-estimating/dugout/internal/design"
	"github.com/dugout-estimating/dugout/internal/estimate"
	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/survey"
	"github.com/dugout-estimating/dugout/internal/takeoff"
	"github.com/dugout-estimating/dugout/internal/units"
)

// This file maps one estimate (an *estimate.Result, SI and local frame)
// onto the quantities every output shares: the text summary, the report's
// tables, quantities.csv. Each quantity is written once here, as a jobLine
// of SI values and a kind that says which units it is printed in, so that
// the three agree to the digit. The JSON document (job_json.go) carries the
// same values at full precision.

// SummaryOptions configures [WriteSummary].
type SummaryOptions struct {
	// Date is printed under the title; the zero time prints no date.
	Date time.Time
	// WarningsElsewhere says the caller prints the result's warnings
	// itself (the command line does, on stderr): the summary then only
	// counts them instead of listing them.
	WarningsElsewhere bool
}

// ReportOptions configures [WriteReportDir].
type ReportOptions struct {
	// Date is the report's date; the zero time means today.
	Date time.Time
	// StakeSpacingM is the stake-out spacing (m); 0 means the job's
	// (estimate.StakeSpacing).
	StakeSpacingM float64
	// Footer is printed at the foot of the report, e.g. the program and
	// its version.
	Footer string
}

// jobSystem returns the unit system results of r are printed in: the
// job's out units, with the US survey foot kept when the survey was
// measured in it, so that lengths, elevations and stake coordinates agree
// with the survey's own numbers.
func jobSystem(r *estimate.Result) units.System {
	j := r.Job
	if j == nil {
		return units.Metres
	}
	if j.OutUnits.IsImperial() && j.Units == units.USFeet {
		return units.USFeet
	}
	return j.OutUnits
}

// jobKind says how a job quantity is written, and in which units.
type jobKind int

const (
	jkText      jobKind = iota // not a number: the line's text, printed as is
	jkCount                    // a whole number with a unit word (loads, seams)
	jkNumber                   // a number with dec decimals and a unit word, the same in both systems (h, %, °)
	jkVolume                   // m³: yd³ / m³
	jkElevation                // m: ft / m
	jkLength                   // m: ft / m
	jkDepth                    // m: in / mm (depths, overlaps, layers)
	jkArea                     // m²: ft² / m²
	jkWater                    // m³: US gal / L
	jkTons                     // kg: short tons / t
	jkWeight                   // kg: lb / kg
	jkFlowMin                  // m³/s: US gal/min / L/min
	jkFlowHour                 // m³/s: US gal/h / L/h
	jkSpeed                    // m/s: ft/s / m/s
	jkCubicFeet                // m³: ft³ / m³ (only as a line's "also")
)

// jobKindUnits holds, for each kind with units, the US customary and metric
// way of writing it; the kinds shared with [QuantityRow] take its units
// and decimals, so that the report's drawings and tables agree.
var jobKindUnits = map[jobKind][2]quantityUnit{
	jkVolume:    quantityUnits[Volume],
	jkElevation: quantityUnits[Elevation],
	jkLength:    quantityUnits[Length],
	jkDepth:     quantityUnits[ShortLength],
	jkArea:      quantityUnits[Area],
	jkWater:     quantityUnits[WaterVolume],
	jkTons:      quantityUnits[Mass],
	jkFlowHour:  quantityUnits[Flow],
	jkWeight:    {{units.Pound, "lb", 0}, {1, "kg", 1}},
	jkFlowMin:   {{units.GallonPerMinute, "gpm", 1}, {units.LitrePerMinute, "L/min", 0}},
	jkSpeed:     {{units.Foot, "ft/s", 1}, {1, "m/s", 2}},
	jkCubicFeet: {{units.CubicFoot, "ft³", 0}, {1, "m³", 2}},
}

// jobUnits returns the first and second way of writing k in sys (US
// customary first for feet users); ok is false for kinds without units.
func jobUnits(k jobKind, sys units.System) (first, second quantityUnit, ok bool) {
	p, ok := jobKindUnits[k]
	if !ok {
		return quantityUnit{}, quantityUnit{}, false
	}
	us, metric := p[0], p[1]
	if sys == units.USFeet && (k == jkLength || k == jkElevation) {
		us.si, us.symbol = units.USSurveyFoot, "ft (US survey)"
	}
	if sys.IsImperial() {
		return us, metric, true
	}
	return metric, us, true
}

// jobLine is one quantity of the job: a label, SI values of one kind (two
// for "length × width" or a range), and a note.
type jobLine struct {
	label string
	kind  jobKind
	vals  []float64 // SI
	sep   string    // between two values: " × " (default) or " to "
	unit  string    // jkCount and jkNumber: the unit word, in both systems
	dec   int       // jkNumber: decimals
	text  string    // jkText: the value
	also  jobKind   // written beside the first value in the summary, e.g. ft³ beside yd³
	money bool      // an amount: quantities.csv keeps its two decimals
	note  string
	// parts name the values in the CSV ("length", "width"); one value
	// needs none.
	parts []string
}

// jobSection is one table of quantities.
type jobSection struct {
	key   string // the CSV's section column
	title string
	intro string
	lines []jobLine
	notes []string
}

// num writes v in unit u for sys: fixed decimals, grouped digits.
func jobNum(v float64, u quantityUnit, sys units.System) string {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return "—"
	}
	return groupDigits(fixed(v/u.si, u.dec), sys)
}

// values writes the line's values in u, joined by its separator.
func (l *jobLine) values(u quantityUnit, sys units.System) string {
	sep := l.sep
	if sep == "" {
		sep = " × "
	}
	parts := make([]string, len(l.vals))
	for i, v := range l.vals {
		parts[i] = jobNum(v, u, sys)
	}
	return strings.Join(parts, sep)
}

// cells returns the line written out: the value and unit in sys's first
// system, the same in the second ("" for kinds without units).
func (l *jobLine) cells(sys units.System) (value, unit, alt string) {
	switch l.kind {
	case jkText:
		return l.text, "", ""
	case jkCount:
		return l.values(quantityUnit{si: 1, dec: 0}, sys), l.unit, ""
	case jkNumber:
		if l.unit == "°" {
			return l.values(quantityUnit{si: 1, dec: l.dec}, sys) + "°", "", ""
		}
		return l.values(quantityUnit{si: 1, dec: l.dec}, sys), l.unit, ""
	}
	first, second, _ := jobUnits(l.kind, sys)
	return l.values(first, sys), first.symbol, l.values(second, sys) + " " + second.symbol
}

// alsoText returns the line's first value in its "also" unit, e.g. "170
// ft³", or "".
func (l *jobLine) alsoText(sys units.System) string {
	if l.also == jkText || len(l.vals) == 0 {
		return ""
	}
	first, _, ok := jobUnits(l.also, sys)
	if mine, _, _ := jobUnits(l.kind, sys); !ok || first.symbol == mine.symbol {
		return "" // ft³ beside m³ is m³ again for metric users
	}
	return jobNum(l.vals[0], first, sys) + " " + first.symbol
}

// row returns the line as a report table row.
func (l *jobLine) row(sys units.System) Row {
	v, u, alt := l.cells(sys)
	note := l.note
	if a := l.alsoText(sys); a != "" && l.also != jkCubicFeet {
		note = jobJoinNote("= "+a, note)
	}
	return Row{Label: l.label, Value: v, Unit: u, Alt: alt, Note: note}
}

func jobJoinNote(a, b string) string {
	switch {
	case a == "":
		return b
	case b == "":
		return a
	}
	return a + "; " + b
}

// jobView is an estimate prepared for printing.
type jobView struct {
	r        *estimate.Result
	sys      units.System
	sections []jobSection
	compare  []Comparison
	cautions []Caution
	assumed  []Row

	// Computed once, on first use.
	edge    []takeoff.Line
	edgeOK  bool
	work    *geom.TriMesh
	summary *survey.Summary
}

// workEdge returns r.WorkEdge(), traced once.
func (v *jobView) workEdge() []takeoff.Line {
	if !v.edgeOK {
		v.edge, v.edgeOK = v.r.WorkEdge(), true
	}
	return v.edge
}

// surveySummary returns the survey's validation summary, computed once.
func (v *jobView) surveySummary() *survey.Summary {
	if v.summary == nil {
		s := v.r.Survey.Summary()
		v.summary = &s
	}
	return v.summary
}

// newJobView maps r onto its printed quantities.
func newJobView(r *estimate.Result) (*jobView, error) {
	if r == nil || r.Job == nil || r.Design == nil || r.Survey == nil || r.Terrain == nil {
		return nil, fmt.Errorf("%w: the estimate is incomplete (no job, survey, surface or design)", ErrInvalidValue)
	}
	v := &jobView{r: r, sys: jobSystem(r)}
	v.sections = []jobSection{v.waterLevel(), v.earthwork(), v.liner(), v.shoreline(), v.stone(), v.waterPump()}
	if c := v.cost(); len(c.lines) > 0 {
		v.sections = append(v.sections, c)
	}
	v.compare = v.comparisons()
	for _, c := range r.Takeoff.Cautions {
		v.cautions = append(v.cautions, Caution{Title: jobCautionTitle(c), Text: jobSentence(c.Message), Rule: c.Rule})
	}
	for _, a := range r.Job.Assumed {
		key, val, ok := strings.Cut(a, " = ")
		if !ok {
			key, val = a, ""
		}
		v.assumed = append(v.assumed, Row{Label: key, Value: val, Note: "not in the site file"})
	}
	return v, nil
}

// jobLevelNote explains how the water level was chosen.
func jobLevelNote(m design.LevelMode) string {
	switch m {
	case design.LevelAuto:
		return "auto: the rim at the lowest ground along the rim line, so no berm is needed"
	case design.LevelBalance:
		return "balance: the level at which the cut reused as berm fill equals the fill"
	}
	return "fixed: as given"
}

func (v *jobView) waterLevel() jobSection {
	d := v.r.Design
	return jobSection{key: "water level", title: "Water level and rim", lines: []jobLine{
		{label: "Water level", kind: jkElevation, vals: []float64{d.WaterLevelM}, note: jobLevelNote(d.Level)},
		{label: "Rim (top of liner)", kind: jkElevation, vals: []float64{d.RimM}, note: "water level + freeboard"},
		{label: "Freeboard", kind: jkDepth, vals: []float64{d.RimM - d.WaterLevelM}},
		{label: "Deepest water", kind: jkDepth, vals: []float64{d.MaxDepthM}},
		{label: "Ground disturbed (plan)", kind: jkArea, vals: []float64{d.DisturbedAreaM2}, note: "where the finished grade differs from the ground"},
	}}
}

func (v *jobView) earthwork() jobSection {
	j, e, d := v.r.Job, v.r.Earthwork, v.r.Design
	soil := j.Soil
	s := jobSection{key: "earthwork", title: "Earthwork and haul",
		intro: "Bank is soil in place, loose is soil dug (in the truck or a pile), compacted is soil placed and rolled in a fill."}
	vol := func(label string, m3 float64, note string) jobLine {
		return jobLine{label: label, kind: jkVolume, vals: []float64{m3}, also: jkCubicFeet, note: note}
	}
	reuse := "cut placed in the berm and fill"
	if !j.ReuseCut {
		reuse = "not reused (earthwork.reuse_cut = false)"
	}
	net := "surplus, hauled off"
	if first, _, _ := jobUnits(jkVolume, v.sys); strings.Trim(jobNum(e.NetBankM3, first, v.sys), "0.−") == "" {
		net = "balanced"
	} else if e.NetBankM3 < 0 {
		net = "shortfall, imported"
	}
	s.lines = []jobLine{
		vol("Cut (bank)", e.CutBankM3, fmt.Sprintf("dug below existing ground, over %s", v.areaText(d.CutAreaM2))),
		vol("Fill (compacted)", e.FillCompactedM3, fmt.Sprintf("built up above existing ground, over %s", v.areaText(d.FillAreaM2))),
		vol("Fill needs (bank)", e.FillBankNeedM3, fmt.Sprintf("compacted fill ÷ compaction factor %.2f (%s)", soil.Compaction, soil.Name)),
		vol("Cut reused as fill (bank)", e.ReusedBankM3, reuse),
		vol("Net: cut − fill needs (bank)", e.NetBankM3, net),
		vol("Haul-off (bank)", e.HaulBankM3, ""),
		vol("Haul-off (loose)", e.HaulLooseM3, fmt.Sprintf("bank × swell factor %.2f (%.0f %% swell)", soil.Swell, soil.SwellPercent())),
	}
	truck := j.Truck.Name
	if truck == "" {
		truck = "no truck"
	}
	capWord := "struck"
	if j.Heaped {
		capWord = "heaped"
	}
	s.lines = append(s.lines,
		jobLine{label: "Truckloads", kind: jkCount, vals: []float64{float64(e.Truckloads)}, unit: plural(e.Truckloads, "load", "loads"),
			note: fmt.Sprintf("%s truck, counted by its %s capacity", truck, capWord)},
		vol("Truck capacity ("+capWord+")", e.TruckCapacityM3, truck),
	)
	if e.ImportBankM3 > 0 {
		s.lines = append(s.lines, vol("Import (bank)", e.ImportBankM3, "fill the cut does not give"), vol("Import (loose)", e.ImportLooseM3, "as delivered"))
	}
	if e.TopsoilBankM3 > 0 {
		s.lines = append(s.lines,
			vol("Topsoil stripped (bank)", e.TopsoilBankM3, fmt.Sprintf("%s deep over the ground disturbed", v.depthText(j.TopsoilDepthM))),
			vol("Topsoil stockpile (loose)", e.TopsoilLooseM3, "stockpiled and re-spread, not hauled"))
	}
	s.notes = append(s.notes, "Shrink convention: "+e.ShrinkConvention+".")
	for _, n := range e.Notes {
		s.notes = append(s.notes, jobSentence(n))
	}
	return s
}

func (v *jobView) liner() jobSection {
	l := v.r.Takeoff.Liner
	st := l.Stock
	s := jobSection{key: "liner", title: "Liner and underlayment"}
	material := jobLinerName(l.Material)
	stockNote := "one sheet, no seams"
	if st.Panels > 1 {
		stockNote = fmt.Sprintf("%d panels (%d across × %d along), %d %s of %s lap", st.Panels, st.PanelsAcross, st.PanelsAlong,
			st.Seams, plural(st.Seams, "seam", "seams"), v.depthText(st.SeamOverlapM))
	}
	stockSheetNote := "the smallest sheet takes the least stock"
	if l.StockSheetAngleDeg != l.SheetAngleDeg || l.StockSheetAreaM2 != l.SheetAreaM2 {
		stockSheetNote = fmt.Sprintf("laid at %.0f°, the angle that takes the least stock; each side includes 2 × overlap", l.StockSheetAngleDeg)
	}
	s.lines = []jobLine{
		{label: "Developed area (bowl to the rim)", kind: jkArea, vals: []float64{l.DevelopedAreaM2}, note: "true 3-D area of the bowl below the rim"},
		{label: "Overlap beyond the rim", kind: jkDepth, vals: []float64{l.OverlapM}, note: "anchor allowance on every side"},
		{label: "Liner in the ground", kind: jkArea, vals: []float64{l.LinerAreaM2}, note: "developed area + rim perimeter × overlap"},
		{label: "Smallest sheet (length × width)", kind: jkLength, vals: []float64{l.SheetLengthM, l.SheetWidthM}, parts: []string{"length", "width"},
			note: "least area over all angles; each side includes 2 × overlap"},
		{label: "Smallest sheet laid at", kind: jkNumber, vals: []float64{l.SheetAngleDeg}, dec: 0, unit: "°", note: "length counter-clockwise from east"},
		{label: "Sheet as laid (length × width)", kind: jkLength, vals: []float64{l.StockSheetLengthM, l.StockSheetWidthM}, parts: []string{"length", "width"},
			note: stockSheetNote},
		{label: "Stock to order (length × width)", kind: jkLength, vals: []float64{st.PanelLengthM, st.PanelWidthM}, parts: []string{"length", "width"},
			note: material + ", " + stockNote},
		{label: "Lay the stock at", kind: jkNumber, vals: []float64{l.StockLengthAngleDeg}, dec: 0, unit: "°", note: "stock length counter-clockwise from east"},
		{label: "Seams", kind: jkCount, vals: []float64{float64(st.Seams)}, unit: plural(st.Seams, "seam", "seams")},
		{label: "Stock bought", kind: jkArea, vals: []float64{st.AreaM2}},
		{label: "Waste", kind: jkArea, vals: []float64{l.WasteM2}, note: fmt.Sprintf("stock ÷ liner in the ground = %.2f", l.WasteRatio)},
		{label: "Liner weight", kind: jkWeight, vals: []float64{l.WeightKg}, note: "of the stock ordered"},
	}
	if u := v.r.Takeoff.Underlayment; u != nil {
		s.lines = append(s.lines,
			jobLine{label: "Underlayment sheet (length × width)", kind: jkLength, vals: []float64{u.SheetLengthM, u.SheetWidthM}, parts: []string{"length", "width"},
				note: fmt.Sprintf("%s, %.0f g/m², laid with the liner", u.Material.Name, u.Material.GramsPerM2)},
			jobLine{label: "Underlayment area", kind: jkArea, vals: []float64{u.AreaM2}},
			jobLine{label: "Underlayment weight", kind: jkWeight, vals: []float64{u.WeightKg}},
		)
	}
	for _, n := range l.Notes {
		s.notes = append(s.notes, jobSentence(n))
	}
	return s
}

func (v *jobView) shoreline() jobSection {
	sh := v.r.Takeoff.Shoreline
	islands := 0
	for _, lp := range sh.LoopDetail {
		if lp.Island {
			islands++
		}
	}
	loops := fmt.Sprintf("%d %s", sh.Loops, plural(sh.Loops, "loop", "loops"))
	if islands > 0 {
		loops += fmt.Sprintf(", %d around %s", islands, plural(islands, "an island", "islands"))
	}
	s := jobSection{key: "shoreline", title: "Shoreline", lines: []jobLine{
		{label: "Shoreline (water's edge)", kind: jkLength, vals: []float64{sh.LengthM}, note: loops},
		{label: "Water surface", kind: jkArea, vals: []float64{sh.WaterAreaM2}},
		{label: "Bounding rectangle", kind: jkLength, vals: []float64{sh.BoundingRect.LengthM, sh.BoundingRect.WidthM}, parts: []string{"length", "width"},
			note: "least-area rectangle around the water line"},
		{label: "Rule of thumb", kind: jkLength, vals: []float64{sh.RuleOfThumbLowM, sh.RuleOfThumbHighM}, sep: " to ", parts: []string{"low", "high"},
			note: fmt.Sprintf("%.2f to %.2f × the rectangle's perimeter", takeoff.DefaultShoreFactorLow, takeoff.DefaultShoreFactorHigh)},
	}}
	if sh.RuleOfThumbLowM > 0 {
		// Keep the factors as the takeoff used them.
		s.lines[3].note = fmt.Sprintf("%.2f to %.2f × the rectangle's perimeter", sh.RuleOfThumbLowM/sh.BoundingRectPerimeterM, sh.RuleOfThumbHighM/sh.BoundingRectPerimeterM)
	}
	for _, n := range sh.Notes {
		s.notes = append(s.notes, jobSentence(n))
	}
	return s
}

func (v *jobView) stone() jobSection {
	st, c := v.r.Takeoff.Stone, v.r.Takeoff.Crew
	s := jobSection{key: "stone", title: "Stone, gravel and crew"}
	if e := st.Edge; e != nil {
		s.lines = append(s.lines, jobLine{label: "Edge stone", kind: jkTons, vals: []float64{e.Stone.Kg},
			note: fmt.Sprintf("%s, %s face × %s deep along %s", e.Rock.Name, v.depthText(e.FaceHeightM), v.depthText(e.ThicknessM), v.lengthText(e.LengthM))})
		if e.Boulders.Kg > 0 {
			s.lines = append(s.lines, jobLine{label: "Feature boulders", kind: jkTons, vals: []float64{e.Boulders.Kg}, note: "allowance"})
		}
	}
	for _, g := range st.Gravel {
		where := "floor"
		if g.WallAreaM2 > 0 {
			where = "floor and walls"
		}
		s.lines = append(s.lines, jobLine{label: "Gravel on " + g.Zone, kind: jkTons, vals: []float64{g.Mass.Kg},
			note: fmt.Sprintf("%s, %s over %s of %s", g.Material, v.depthText(g.ThicknessM), v.areaText(g.FloorAreaM2+g.WallAreaM2), where)})
	}
	if st.Edge == nil && len(st.Gravel) == 0 {
		s.notes = []string{"No edge stone or gravel is ordered: the site file has no [stone] or [gravel] section."}
		return s
	}
	s.lines = append(s.lines, jobLine{label: "Stone and gravel, total", kind: jkTons, vals: []float64{st.TotalTons * units.ShortTon}})
	s.lines = append(s.lines,
		jobLine{label: "Crew", kind: jkCount, vals: []float64{float64(c.Size)}, unit: plural(c.Size, "worker", "workers")},
		jobLine{label: "Hand placing", kind: jkNumber, vals: []float64{c.WorkerHours}, dec: 1, unit: "worker-hours",
			note: fmt.Sprintf("%s placed by hand", v.tonsText(c.HandTons))},
	)
	if c.MachineTons > 0 {
		s.lines = append(s.lines, jobLine{label: "Machine placing", kind: jkNumber, vals: []float64{c.MachineHours}, dec: 1, unit: "h",
			note: fmt.Sprintf("%s of boulders by machine", v.tonsText(c.MachineTons))})
	}
	s.lines = append(s.lines,
		jobLine{label: "Crew time", kind: jkNumber, vals: []float64{c.Hours}, dec: 1, unit: "h", note: "clock hours, hand and machine work one after the other"},
		jobLine{label: "Working days", kind: jkNumber, vals: []float64{c.Days}, dec: 2, unit: jobPlural(c.Days, "day", "days"), note: fmt.Sprintf("of %g h", c.HoursPerDay)},
	)
	for _, n := range c.Notes {
		s.notes = append(s.notes, jobSentence(n))
	}
	return s
}

func (v *jobView) waterPump() jobSection {
	w, p := v.r.Takeoff.Water, v.r.Takeoff.Pump
	perS := func(m3h float64) float64 { return m3h / 3600 }
	s := jobSection{key: "water", title: "Water and pump", lines: []jobLine{
		{label: "Water volume", kind: jkWater, vals: []float64{w.VolumeM3}, also: jkCubicFeet},
		{label: "Water surface", kind: jkArea, vals: []float64{w.AreaM2}},
		{label: "Deepest water", kind: jkDepth, vals: []float64{w.MaxDepthM}},
		{label: "Mean depth", kind: jkDepth, vals: []float64{w.MeanDepthM}, note: "volume ÷ surface"},
		{label: "Fill supply", kind: jkFlowMin, vals: []float64{perS(w.SupplyM3PerH)}},
		{label: "Time to fill", kind: jkNumber, vals: []float64{w.FillTimeH}, dec: 1, unit: "h"},
		{label: "Pump flow", kind: jkFlowHour, vals: []float64{perS(p.FlowM3PerH)}, also: jkFlowMin,
			note: fmt.Sprintf("the larger of the turnover (volume every %g h) and the spillway flow: the %s governs", p.TurnoverH, p.FlowBasis)},
	}}
	if p.SpillwayWidthM > 0 {
		s.lines = append(s.lines, jobLine{label: "Spillway flow", kind: jkFlowHour, vals: []float64{perS(p.SpillwayFlowM3PerH)},
			note: fmt.Sprintf("%s sheet over %s of weir", p.SpillwaySheet, v.depthText(p.SpillwayWidthM))})
	}
	s.lines = append(s.lines, jobLine{label: "Static lift", kind: jkLength, vals: []float64{p.StaticLiftM}, note: "water level to the discharge"})
	if p.PipeLengthM > 0 {
		s.lines = append(s.lines, jobLine{label: "Friction loss", kind: jkLength, vals: []float64{p.FrictionM},
			note: fmt.Sprintf("Hazen-Williams, C = %g, over %s of pipe and fittings", p.PipeC, v.lengthText(p.EquivLengthM))})
	}
	headNote := "static lift + friction"
	if p.PipeLengthM == 0 {
		headNote = "static lift only: the site file gives no pipe"
	}
	s.lines = append(s.lines, jobLine{label: "Total head (duty point)", kind: jkLength, vals: []float64{p.HeadM}, note: headNote})
	if p.PipeDiameterM > 0 {
		s.lines = append(s.lines, jobLine{label: "Pipe velocity", kind: jkSpeed, vals: []float64{p.VelocityMPerS},
			note: fmt.Sprintf("in %s inside diameter", v.depthText(p.PipeDiameterM))})
	}
	for _, n := range p.Notes {
		s.notes = append(s.notes, jobSentence(n))
	}
	return s
}

// cost returns the priced estimate as a section whose values are amounts.
func (v *jobView) cost() jobSection {
	c := v.r.Takeoff.Cost
	s := jobSection{key: "cost", title: "Cost"}
	if c == nil {
		return s
	}
	cur := c.Currency
	for _, l := range c.Lines {
		s.lines = append(s.lines, jobLine{label: jobSentenceCase(l.Item), kind: jkNumber, vals: []float64{l.Amount}, dec: 2, unit: cur, money: true,
			note: fmt.Sprintf("%s per %s × %s", groupDigits(fixed(l.UnitPrice, 2), v.sys), l.Unit, trimNum(l.Quantity, 2))})
	}
	s.lines = append(s.lines, jobLine{label: "Total", kind: jkNumber, vals: []float64{c.Total}, dec: 2, unit: cur, money: true})
	s.notes = []string{"Quantities are those above: excavation by the bank cut, liner by the stock bought, stone and gravel by the ton, crew by its clock hours."}
	return s
}

// comparisons sets the measured quantities beside the trade's rules of
// thumb.
func (v *jobView) comparisons() []Comparison {
	t := v.r.Takeoff
	l, sh, c := t.Liner, t.Shoreline, t.Crew
	cs := []Comparison{
		{Label: "Liner sheet length", Quantity: Length, Measured: l.SheetLengthM, Rule: l.RuleOfThumbLengthM, RuleText: "L + 2·Dmax + 2·overlap",
			Note: "The rule assumes vertical walls"},
		{Label: "Liner sheet width", Quantity: Length, Measured: l.SheetWidthM, Rule: l.RuleOfThumbWidthM, RuleText: "W + 2·Dmax + 2·overlap",
			Note: "L × W is the rim's least-area rectangle, Dmax the depth from the rim to the deepest point"},
		{Label: "Shoreline", Quantity: Length, Measured: sh.LengthM, Rule: sh.RuleOfThumbM, RuleText: "middle of the range, about 0.8 × the bounding rectangle's perimeter"},
	}
	if tons := t.Stone.TotalTons; tons > 0 && c.Size > 0 {
		cs = append(cs, Comparison{Label: "Crew time (h)", Quantity: Number, Measured: c.Hours, Rule: tons / float64(c.Size),
			RuleText: fmt.Sprintf("1 short ton per worker-hour, %d workers", c.Size), Note: "Common practice, no source"})
	}
	return cs
}

// lengthText, depthText, areaText and tonsText write one SI value in the
// first system, for notes.
func (v *jobView) lengthText(m float64) string { return v.oneText(jkLength, m) }
func (v *jobView) depthText(m float64) string  { return v.oneText(jkDepth, m) }
func (v *jobView) areaText(m2 float64) string  { return v.oneText(jkArea, m2) }
func (v *jobView) tonsText(shortTons float64) string {
	return v.oneText(jkTons, shortTons*units.ShortTon)
}

func (v *jobView) oneText(k jobKind, si float64) string {
	first, _, _ := jobUnits(k, v.sys)
	return jobNum(si, first, v.sys) + " " + first.symbol
}

// jobLinerName writes a liner material preset's name for people: "epdm45"
// becomes "EPDM 45 mil".
func jobLinerName(m takeoff.LinerMaterial) string {
	n := m.Name
	i := strings.IndexFunc(n, unicode.IsDigit)
	if i <= 0 {
		return strings.ToUpper(n)
	}
	return strings.ToUpper(strings.TrimRight(n[:i], " -_")) + " " + n[i:] + " mil"
}

// jobCautionTitles names the takeoff's caution keys as headings.
var jobCautionTitles = map[string]string{
	"utilities":         "Buried utilities",
	"spoil-setback":     "Spoil and equipment setback",
	"electrical":        "Electricity near water",
	"heavy-stone":       "Lifting stone",
	"barrier":           "Drowning: barrier or fence",
	"local-codes":       "Local codes come first",
	"protective-system": "Protective system for deep excavation",
	"engineer-design":   "Excavation design by an engineer",
	"wall-slope":        "Wall slope for the soil type",
}

func jobCautionTitle(c takeoff.Caution) string {
	if t, ok := jobCautionTitles[c.Key]; ok {
		return t
	}
	return jobSentenceCase(strings.ReplaceAll(c.Key, "-", " "))
}

// sentence returns s with its first letter in upper case and a final
// period.
func jobSentence(s string) string {
	s = jobSentenceCase(strings.TrimSpace(s))
	if s != "" && !strings.HasSuffix(s, ".") && !strings.HasSuffix(s, "!") && !strings.HasSuffix(s, "?") {
		s += "."
	}
	return s
}

func jobSentenceCase(s string) string {
	r, n := utf8.DecodeRuneInString(s)
	if n == 0 {
		return s
	}
	return string(unicode.ToUpper(r)) + s[n:]
}

// jobPlural is plural for a non-integer count: "1.00 day", "0.16 days".
func jobPlural(v float64, one, many string) string {
	if fixed(v, 2) == "1.00" {
		return one
	}
	return many
}
