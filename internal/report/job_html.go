package report

import (
	"fmt"
	"math"
	"strings"
	"time"

	"github.com/dugout-estimating/dugout/internal/estimate"
)

// reportData maps the estimate onto the printable report.
func (v *jobView) reportData(date time.Time, st reportSettings, stakes []estimate.StakePoint, rows []StakeoutRow,
	plan string, sections []string, footer string) ReportData {
	r := v.r
	rd := ReportData{Title: v.titleBlock(date), Units: v.sys, PlanSVG: plan, SectionSVGs: sections,
		Comparisons: v.compare, Cautions: v.cautions, Stakeout: rows, Footer: footer, Warnings: r.Warnings}
	rd.Summary = v.tiles()
	for _, s := range v.sections {
		rs := ReportSection{Title: s.title, Intro: s.intro, Notes: s.notes}
		for i := range s.lines {
			rs.Rows = append(rs.Rows, s.lines[i].row(v.sys))
		}
		rd.Quantities = append(rd.Quantities, rs)
	}
	if assumed := append(append([]Row(nil), v.assumed...), st.assumed...); len(assumed) > 0 {
		rd.Quantities = append(rd.Quantities, ReportSection{Title: "Defaults assumed",
			Intro: "Settings the site file left out, and the values used for them.", Rows: assumed})
	}
	rd.Methods = v.methods(stakes)
	rd.Accuracy = v.accuracy()
	return rd
}

// line finds a quantity by its label in the view's sections.
func (v *jobView) line(label string) jobLine {
	for _, s := range v.sections {
		for _, l := range s.lines {
			if l.label == label {
				return l
			}
		}
	}
	return jobLine{label: label, kind: jkText, text: "—"}
}

// tiles are the report's headline figures: what the client asks first.
func (v *jobView) tiles() []Row {
	r := v.r
	t := r.Takeoff
	tile := func(label, from, note string) Row {
		l := v.line(from)
		row := l.row(v.sys)
		row.Label, row.Note = label, note
		return row
	}
	loads := r.Earthwork.Truckloads
	haulNote := fmt.Sprintf("%d %s", loads, plural(loads, "truckload", "truckloads"))
	if r.Job.Truck.Name != "" {
		haulNote += " (" + r.Job.Truck.Name + ")"
	}
	stock := "one sheet, no seams"
	if s := t.Liner.Stock; s.Panels > 1 {
		stock = fmt.Sprintf("%d panels, %d %s", s.Panels, s.Seams, plural(s.Seams, "seam", "seams"))
	}
	stock += fmt.Sprintf(", length laid at %.0f° from east", t.Liner.StockLengthAngleDeg)
	tiles := []Row{
		tile("Dig (cut, bank)", "Cut (bank)", fmt.Sprintf("fill %s compacted", v.oneText(jkVolume, r.Earthwork.FillCompactedM3))),
		tile("Haul off (loose)", "Haul-off (loose)", haulNote),
		tile("Liner to order", "Stock to order (length × width)", jobLinerName(t.Liner.Material)+", "+stock),
		tile("Water", "Water volume", fmt.Sprintf("level %s, %s deep", fmtLevel(r.Design.WaterLevelM, v.sys), v.depthText(r.Design.MaxDepthM))),
		tile("Stone and gravel", "Stone and gravel, total", fmt.Sprintf("crew of %d: %s h", t.Crew.Size, trimNum(t.Crew.Hours, 1))),
	}
	if c := t.Cost; c != nil {
		tiles = append(tiles, Row{Label: "Estimated cost", Value: groupDigits(fixed(c.Total, 2), v.sys), Unit: c.Currency,
			Note: fmt.Sprintf("%d priced lines", len(c.Lines))})
	} else {
		tiles = append(tiles, tile("Pump duty", "Pump flow", "at "+v.lengthText(t.Pump.HeadM)+" of head"))
	}
	return tiles
}

// methods says how each number was computed and how far to trust it.
func (v *jobView) methods(stakes []estimate.StakePoint) []Method {
	r := v.r
	j, d, t := r.Job, r.Design, r.Takeoff
	ts := r.Terrain.Summary()
	sum := v.surveySummary()
	ground := "the survey gives no accuracy column; between shots the ground is taken as planar on each triangle, so breaks of slope need shots or breaklines"
	if sum.VAcc.N > 0 {
		ground = fmt.Sprintf("vertical accuracy of the shots: median %s, 95 %% %s (from the file); between shots the ground is planar on each triangle",
			v.depthText(sum.VAcc.MedianM), v.depthText(sum.VAcc.P95M))
	}
	liner := "on the lattice mesh of the bowl"
	if t.Liner.SectionMethod == "analytic" {
		liner = "on the exact bowl, with the zone edges as breakpoints"
	}
	ms := []Method{
		{"Existing ground", fmt.Sprintf("Triangulated (constrained Delaunay) from %d survey points and %d breaklines: %d triangles over %s.",
			ts.Vertices, ts.Breaklines, ts.Triangles, v.areaText(ts.PlanAreaM2)), sentenceOf(ground)},
		{"Finished grade, cut and fill", fmt.Sprintf("The bowl rises from each zone floor at its wall slope; the berm carries the rim at %s. Both are sampled on a lattice of %s cells, and cut and fill are the exact integrals of the difference of the surfaces over its triangles.",
			fmtLevel(d.RimM, v.sys), v.depthText(d.CellM)),
			fmt.Sprintf("Halving the cell changed cut and fill by %s %%; the error left is about a third of that.", trimNum(d.RefineChange*100, 3))},
		{"Water level", sentenceOf(jobLevelNote(d.Level)), "As the design computes it."},
		{"Earthwork and haul", fmt.Sprintf("Fill needs = compacted fill ÷ compaction factor %.2f; loose = bank × swell factor %.2f; truckloads = loose haul-off ÷ truck capacity, rounded up (%s).",
			j.Soil.Compaction, j.Soil.Swell, j.Soil.Name),
			"The factors are typical of the soil named (" + j.Soil.Source + "); the job's own soil may differ."},
		{"Liner and underlayment", "Developed area: the 3-D area of the bowl below the rim. Sheet: over all directions, the least rectangle whose sides are the longest developed cross-sections, each plus 2 × overlap.",
			"Area to the lattice cell; the sheet measured " + liner + "."},
		{"Shoreline", "The contour of the bowl at the water level, moved onto the exact bowl near steep walls.", "Within a fraction of the lattice cell."},
		{"Stone and gravel", "Edge stone: shoreline × face height × thickness × rock density, plus the boulder allowance. Gravel: floor area × layer thickness × loose bulk density.",
			"Densities are typical of the rock named; ask the yard for the product's."},
		{"Crew time", fmt.Sprintf("Hand placing at %s per worker-hour, shared by %d workers; boulders by machine; clock hours one after the other.",
			v.tonsText(t.Crew.HandTons/math.Max(t.Crew.WorkerHours, 1e-300)), t.Crew.Size), "A rule of thumb: the crew's own rate governs."},
		{"Water and pump", "Volume: the water over the bowl below the water level. Flow: the larger of the turnover and the spillway flow. Head: static lift plus Hazen-Williams friction.",
			"Fittings are counted as an equivalent pipe length."},
	}
	if len(stakes) > 0 {
		ms = append(ms, Method{"Stake-out", fmt.Sprintf("%d stakes, evenly spaced along the water's edge, each zone's floor edge and the edge of the work; existing ground from the TIN, finished grade from the exact bowl inside the rim.", len(stakes)),
			fmt.Sprintf("The edge of the work (daylight and toe) lies within %s of the true line (a lattice cell diagonal).", v.depthText(math.Sqrt2*d.CellM))})
	}
	return ms
}

// accuracy lists the numbers that bound the estimate's accuracy.
func (v *jobView) accuracy() []Row {
	r := v.r
	d := r.Design
	ts := r.Terrain.Summary()
	sum := v.surveySummary()
	lines := []jobLine{
		{label: "Survey points in the surface", kind: jkCount, vals: []float64{float64(ts.Vertices)}, unit: "points"},
		{label: "Triangles of the surface", kind: jkCount, vals: []float64{float64(ts.Triangles)}, unit: "triangles"},
		{label: "Lattice cell", kind: jkDepth, vals: []float64{d.CellM}, note: "chosen until halving it changed cut and fill by < 0.1 %"},
		{label: "Change at the last halving", kind: jkNumber, vals: []float64{d.RefineChange * 100}, dec: 3, unit: "%", note: "of cut and fill"},
	}
	if sum.HAcc.N > 0 {
		lines = append(lines, jobLine{label: "Horizontal accuracy, 95 %", kind: jkDepth, vals: []float64{sum.HAcc.P95M}, note: fmt.Sprintf("%d points", sum.HAcc.N)})
	}
	if sum.VAcc.N > 0 {
		lines = append(lines, jobLine{label: "Vertical accuracy, 95 %", kind: jkDepth, vals: []float64{sum.VAcc.P95M}, note: fmt.Sprintf("%d points", sum.VAcc.N)})
	}
	lines = append(lines, jobLine{label: "Liner cross-sections", kind: jkText, text: r.Takeoff.Liner.SectionMethod,
		note: "analytic: on the exact bowl; mesh: on the lattice"})
	rows := make([]Row, len(lines))
	for i := range lines {
		rows[i] = lines[i].row(v.sys)
	}
	return rows
}

// sentenceOf is jobSentence for text that may already end a sentence.
func sentenceOf(s string) string { return jobSentence(strings.TrimSuffix(s, ".")) }
