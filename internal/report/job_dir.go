package report

import (
	"bytes"
	"fmt"
	"io"
	"math"
	"path/filepath"
	"slices"
	"strings"
	"time"

	"github.com/dugout-estimating/dugout/internal/contours"
	"github.com/dugout-estimating/dugout/internal/crs"
	"github.com/dugout-estimating/dugout/internal/estimate"
	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/landxml"
	"github.com/dugout-estimating/dugout/internal/section"
	"github.com/dugout-estimating/dugout/internal/sitefile"
	"github.com/dugout-estimating/dugout/internal/units"
)

// Report folder defaults (common practice, no source): contours every
// half foot for jobs in feet and every 0.2 m for metric ones, every fifth
// an index contour.
const (
	DefaultContourIntervalFeetM   = 0.5 * units.Foot
	DefaultContourIntervalMetricM = 0.2
)

// jobSectionMarginFrac and jobSectionMarginM set how far a section line
// runs past the edge of the work at each end: a tenth of its length, at
// least half a metre, so the drawing shows undisturbed ground on both
// sides.
const (
	jobSectionMarginFrac = 0.1
	jobSectionMarginM    = 0.5
)

// jobRimBisections is the number of bisection steps that place a rim
// crossing on a section: 40 halvings of a station step of a few
// centimetres leave far below a nanometre.
const jobRimBisections = 40

// jobFile is one output file, rendered before any is written.
type jobFile struct {
	name string
	data []byte
}

// WriteReportDir writes the report folder of the estimate r into dir and
// returns the paths written, in this order: report.html (the printable,
// self-contained report), plan.svg, section-a.svg (along the pond's long
// axis through the deepest point), section-b.svg (across it), one
// section-c.svg, section-d.svg … per section line of the site file
// (report.sections), contours-existing.geojson, contours-design.geojson,
// contours-cutfill.geojson (lines of equal cut or fill depth, level 0
// being the edge of the work), quantities.json ([WriteJSON]),
// quantities.csv ([WriteQuantitiesCSV]), stakeout.csv (the cut sheet) and
// design-surface.xml (the finished grade as a LandXML 1.2 TIN).
//
// The folder is checked first ([CheckOutputDir]); then every file is
// rendered in memory, and only when all have been is each written with
// [WriteFileAtomic], so a failure leaves whole files only: the old ones, or
// the new. Coordinates in the GeoJSON, the cut sheet and the LandXML file
// are world coordinates (the survey's frame) in the job's units, or
// longitude and latitude for GeoJSON when the survey was read from lon/lat;
// the LandXML surface is then in metres of the survey's UTM zone.
//
// Contours are every report.contour_interval of the site file
// ([DefaultContourIntervalFeetM] or [DefaultContourIntervalMetricM] when
// not given) with an index line every report.index_every (5). Stakes are
// spaced by opts.StakeSpacingM, or by the job's spacing (see
// estimate.StakeSpacing).
func WriteReportDir(dir string, r *estimate.Result, opts ReportOptions) ([]string, error) {
	if err := CheckOutputDir(dir); err != nil {
		return nil, err
	}
	v, err := newJobView(r)
	if err != nil {
		return nil, err
	}
	files, err := v.reportFiles(opts)
	if err != nil {
		return nil, err
	}
	var written []string
	for _, f := range files {
		path := filepath.Join(dir, f.name)
		if err := WriteFileAtomic(path, func(w io.Writer) error { _, err := w.Write(f.data); return err }); err != nil {
			return written, err
		}
		written = append(written, path)
	}
	return written, nil
}

// reportSettings are the report options of the site file, resolved.
type reportSettings struct {
	intervalM  float64
	indexEvery int
	assumed    []Row
}

func (v *jobView) settings() (reportSettings, error) {
	j := v.r.Job
	st := reportSettings{intervalM: DefaultContourIntervalMetricM, indexEvery: contours.DefaultIndexEvery}
	defNote := "0.2 m"
	if v.sys.IsImperial() {
		st.intervalM, defNote = DefaultContourIntervalFeetM, "0.5 ft"
	}
	var rep sitefile.Report
	if j.Site != nil {
		rep = j.Site.Report
	}
	if rep.ContourInterval.IsSet() {
		m, err := rep.ContourInterval.Metres(j.Units, 0)
		if err != nil {
			return st, fmt.Errorf("%w: report.contour_interval: %w", ErrInvalidValue, err)
		}
		if !(m > 0) || math.IsInf(m, 0) {
			return st, &ValueError{Item: "report.contour_interval", Field: "interval", Value: m, Reason: "must be a length > 0"}
		}
		st.intervalM = m
	} else {
		st.assumed = append(st.assumed, Row{Label: "report.contour_interval", Value: defNote, Note: "not in the site file"})
	}
	if rep.IndexEvery < 0 {
		return st, &ValueError{Item: "report.index_every", Field: "index_every", Value: float64(rep.IndexEvery), Reason: "must be 0 or more"}
	}
	if rep.IndexEvery > 0 {
		st.indexEvery = rep.IndexEvery
	}
	if !rep.StakeSpacing.IsSet() {
		def := "1 m"
		if j.OutUnits.IsImperial() {
			def = "3 ft"
		}
		st.assumed = append(st.assumed, Row{Label: "report.stake_spacing", Value: def, Note: "not in the site file"})
	}
	return st, nil
}

// reportFiles renders every file of the report folder.
func (v *jobView) reportFiles(opts ReportOptions) ([]jobFile, error) {
	r := v.r
	st, err := v.settings()
	if err != nil {
		return nil, err
	}
	date := opts.Date
	if date.IsZero() {
		date = time.Now()
	}
	stakes, err := estimate.Stakeout(r, opts.StakeSpacingM)
	if err != nil {
		return nil, err
	}

	// Contours.
	copt := contours.Options{IntervalM: st.intervalM, IndexEvery: st.indexEvery, MinLevel: math.NaN(), MaxLevel: math.NaN()}
	existing, err := contours.Trace(r.Terrain.Mesh(), copt)
	if err != nil {
		return nil, fmt.Errorf("report: existing contours: %w", err)
	}
	designLines, err := contours.Trace(v.workMesh(), copt)
	if err != nil {
		return nil, fmt.Errorf("report: design contours: %w", err)
	}
	cutfill, err := v.cutFillContours(copt)
	if err != nil {
		return nil, err
	}

	var files []jobFile
	render := func(name string, write func(w io.Writer) error) error {
		var b bytes.Buffer
		if err := write(&b); err != nil {
			return fmt.Errorf("report: %s: %w", name, err)
		}
		files = append(files, jobFile{name, b.Bytes()})
		return nil
	}

	// Sections.
	lines, err := v.sectionLines()
	if err != nil {
		return nil, err
	}
	var sectionSVGs []string
	for _, sl := range lines {
		sd, err := v.sectionData(sl.Name, sl.Line)
		if err != nil {
			return nil, err
		}
		if err := render("section-"+strings.ToLower(sl.Name)+".svg", func(w io.Writer) error { return Section(w, sd) }); err != nil {
			return nil, err
		}
		sectionSVGs = append(sectionSVGs, string(files[len(files)-1].data))
	}

	// The plan.
	plan := v.planData(date, st, existing, designLines, lines)
	var planSVG bytes.Buffer
	if err := Plan(&planSVG, plan); err != nil {
		return nil, fmt.Errorf("report: plan.svg: %w", err)
	}

	// The report itself, first in the folder.
	rows := v.stakeoutRows(stakes)
	rd := v.reportData(date, st, stakes, rows, planSVG.String(), sectionSVGs, opts.Footer)
	var page bytes.Buffer
	if err := HTML(&page, rd); err != nil {
		return nil, fmt.Errorf("report: report.html: %w", err)
	}
	files = append([]jobFile{{"report.html", page.Bytes()}, {"plan.svg", planSVG.Bytes()}}, files...)

	toOut, zScale, meta := v.geoJSONFrame()
	for _, c := range []struct {
		name  string
		lines []contours.Line
	}{{"contours-existing.geojson", existing}, {"contours-design.geojson", designLines}, {"contours-cutfill.geojson", cutfill}} {
		if err := render(c.name, func(w io.Writer) error { return WriteContoursGeoJSON(w, c.lines, toOut, zScale, meta) }); err != nil {
			return nil, err
		}
	}
	if err := render("quantities.json", func(w io.Writer) error { return WriteJSON(w, r) }); err != nil {
		return nil, err
	}
	if err := render("quantities.csv", func(w io.Writer) error { return WriteQuantitiesCSV(w, r) }); err != nil {
		return nil, err
	}
	if err := render("stakeout.csv", func(w io.Writer) error { return WriteStakeoutCSV(w, rows, v.sys.String()) }); err != nil {
		return nil, err
	}
	if err := render("design-surface.xml", func(w io.Writer) error { return v.writeLandXML(w, date) }); err != nil {
		return nil, err
	}
	return files, nil
}

// disturbed reports whether lattice node k is in the work (D ≠ G).
func (v *jobView) disturbed(k int) bool {
	d := v.r.Design
	return d.D[k] != d.G[k] && !math.IsNaN(d.D[k]) && !math.IsNaN(d.G[k])
}

// workMesh returns the finished grade over the cells that touch the work,
// so that design contours show the new ground and tie into the existing
// contours one cell outside it.
func (v *jobView) workMesh() geom.TriMesh {
	if v.work == nil {
		l := v.r.Design.Lattice
		m := l.Mesh(v.r.Design.D, func(i, j int) bool {
			return v.disturbed(l.Index(i, j)) || v.disturbed(l.Index(i+1, j)) || v.disturbed(l.Index(i, j+1)) || v.disturbed(l.Index(i+1, j+1))
		})
		v.work = &m
	}
	return *v.work
}

// cutFillContours traces lines of equal cut or fill depth on D − G at the
// contour interval (negative levels are cut, positive fill). Level 0 would
// trace the edge of the cut only, as D − G is 0 everywhere outside the
// work; it is replaced by the whole edge of the work, daylight and toe.
func (v *jobView) cutFillContours(o contours.Options) ([]contours.Line, error) {
	all, err := contours.Trace(v.r.Design.DiffMesh(), o)
	if err != nil {
		return nil, fmt.Errorf("report: cut/fill contours: %w", err)
	}
	var out []contours.Line
	for _, l := range all {
		if l.Level != 0 {
			out = append(out, l)
		}
	}
	for _, e := range v.workEdge() {
		pts := e.Pts
		if e.Closed {
			pts = append(slices.Clone(pts), pts[0])
		}
		out = append(out, contours.Line{Level: 0, Pts: pts, Closed: e.Closed, Index: true})
	}
	slices.SortStableFunc(out, func(a, b contours.Line) int {
		switch {
		case a.Level < b.Level:
			return -1
		case a.Level > b.Level:
			return 1
		}
		return 0
	})
	return out, nil
}

// geoJSONFrame says how GeoJSON coordinates are written: longitude and
// latitude (elevations in metres) when the survey was read from lon/lat,
// else world coordinates and elevations in the job's units with a note.
func (v *jobView) geoJSONFrame() (CoordMapper, float64, GeoJSONMeta) {
	set := v.r.Survey
	if set.Geographic && set.CRS.UTM != nil {
		utm := *set.CRS.UTM
		return func(p geom.Vec2) (float64, float64) {
			w := set.Frame.ToWorld(p)
			lon, lat, err := utm.Inverse(w.X, w.Y)
			if err != nil {
				return math.NaN(), math.NaN()
			}
			return lon, lat
		}, 1, GeoJSONMeta{Geographic: true}
	}
	f := v.sys.Metres()
	return func(p geom.Vec2) (float64, float64) {
		w := set.Frame.ToWorld(p)
		return w.X / f, w.Y / f
	}, 1 / f, GeoJSONMeta{CRSNote: v.frameNote()}
}

// frameNote names the world frame and units, e.g. "local frame; units ft".
func (v *jobView) frameNote() string {
	c := v.r.Survey.CRS
	name := c.String()
	if c.Kind == crs.Local {
		name = "local frame"
	}
	return name + "; units " + v.sys.String()
}

// writeLandXML writes the finished grade as LandXML: the lattice cells that
// touch the work (beyond them the finished grade is the existing ground),
// in the survey's own units and frame (metres of the UTM zone for a lon/lat
// survey).
func (v *jobView) writeLandXML(w io.Writer, date time.Time) error {
	r := v.r
	u := landxml.Metres
	switch {
	case r.Survey.Geographic:
	case r.Job.Units == units.Feet:
		u = landxml.Feet
	case r.Job.Units == units.USFeet:
		u = landxml.USFeet
	}
	name := "finished grade"
	if s := r.Job.Site; s != nil && s.Name != "" {
		name = s.Name + ": finished grade"
	}
	return landxml.Write(w, v.workMesh(), landxml.WriteOptions{
		Name:        name,
		Description: fmt.Sprintf("pond design at water level %.3f m, rim %.3f m", r.Design.WaterLevelM, r.Design.RimM),
		Units:       u,
		EPSG:        r.Survey.CRS.EPSG,
		Frame:       r.Survey.Frame,
		Created:     time.Date(date.Year(), date.Month(), date.Day(), 0, 0, 0, 0, time.UTC),
	})
}

// stakeoutRows converts the stakes to the cut sheet's units.
func (v *jobView) stakeoutRows(stakes []estimate.StakePoint) []StakeoutRow {
	f := v.sys.Metres()
	rows := make([]StakeoutRow, len(stakes))
	for i, s := range stakes {
		rows[i] = StakeoutRow{ID: s.ID, Easting: s.EastingM / f, Northing: s.NorthingM / f,
			Existing: s.ExistingM / f, Finished: s.FinishedM / f, CutFill: (s.FinishedM - s.ExistingM) / f, Note: s.Note}
	}
	return rows
}

// finishedSampler is the finished grade for sections: the exact bowl at
// or below the rim, the lattice elsewhere in the work area, and the
// existing ground beyond it, where nothing changes.
type finishedSampler struct{ r *estimate.Result }

func (s finishedSampler) Elevation(x, y float64) (float64, bool) {
	d := s.r.Design
	if e := d.BowlAt(geom.Vec2{X: x, Y: y}); e <= d.RimM {
		return e, true
	}
	if z, ok := d.FinishedAt(x, y); ok && !math.IsNaN(z) {
		return z, true
	}
	return s.r.Terrain.Elevation(x, y)
}

// deepestPoint returns a point of the deepest zone's floor: the centroid of
// its ring when it lies inside, else the lattice node of that floor
// nearest the centroid.
func (v *jobView) deepestPoint() (geom.Vec2, bool) {
	zs := v.r.Zones
	if len(zs) == 0 {
		return geom.Vec2{}, false
	}
	k := 0
	for i, z := range zs {
		if z.DepthM > zs[k].DepthM {
			k = i
		}
	}
	ring := geom.Ring(zs[k].Ring)
	c := ringCentroid(ring)
	if ring.Contains(c) {
		return c, true
	}
	d := v.r.Design
	floor := v.r.Design.WaterLevelM - zs[k].DepthM
	best, bestD := geom.Vec2{}, math.Inf(1)
	for j := range d.Lattice.NY {
		for i := range d.Lattice.NX {
			if e := d.E[d.Lattice.Index(i, j)]; math.Abs(e-floor) < 1e-9 {
				p := d.Lattice.Node(i, j)
				if dd := p.DistanceSquared(c); dd < bestD {
					best, bestD = p, dd
				}
			}
		}
	}
	return best, !math.IsInf(bestD, 1)
}

// ringCentroid returns the area centroid of r (its first vertex for a ring
// of no area).
func ringCentroid(r geom.Ring) geom.Vec2 {
	if len(r) == 0 {
		return geom.Vec2{}
	}
	o := r[0]
	var a, cx, cy geom.Sum
	for i := range r {
		p, q := r[i].Sub(o), r[(i+1)%len(r)].Sub(o)
		cr := p.Cross(q)
		a.Add(cr)
		cx.Add((p.X + q.X) * cr)
		cy.Add((p.Y + q.Y) * cr)
	}
	if a.Value() == 0 {
		return o
	}
	return geom.Vec2{X: o.X + cx.Value()/(3*a.Value()), Y: o.Y + cy.Value()/(3*a.Value())}
}

// sectionLines returns the section lines: A along the pond's long axis
// (the principal axis of the water line) through the deepest point, B
// across it through the same point, each running over the whole work and
// a margin past it; then one per site-file section line, named C, D ….
func (v *jobView) sectionLines() ([]PlanSectionLine, error) {
	r := v.r
	var shape geom.Ring
	if sh := r.Takeoff.Shoreline.LoopDetail; len(sh) > 0 && sh[0].Closed {
		shape = geom.Ring(sh[0].Pts)
	} else if len(r.Zones) > 0 {
		shape = geom.Ring(r.Zones[0].Ring)
	}
	var out []PlanSectionLine
	centre, ok := v.deepestPoint()
	if long, _ := section.Axes(shape, centre, 0); ok && len(long) == 2 {
		dir := long[1].Sub(long[0])
		dir = dir.Scale(1 / dir.Norm())
		extent := shape
		if edge := v.workEdge(); len(edge) > 0 && edge[0].Closed {
			extent = geom.Ring(edge[0].Pts)
		}
		for _, s := range []struct {
			name string
			d    geom.Vec2
		}{{"A", dir}, {"B", geom.Vec2{X: -dir.Y, Y: dir.X}}} {
			if l := lineAcross(extent, centre, s.d); l != nil {
				out = append(out, PlanSectionLine{Name: s.name, Line: l})
			}
		}
	}
	if r.Job.Site == nil {
		return out, nil
	}
	names := "CDEFGHJKLMNPQRSTUVWXYZ"
	for k, flat := range r.Job.Site.Report.Sections {
		item := fmt.Sprintf("report.sections[%d]", k)
		if k >= len(names) {
			return nil, &SizeError{What: "report.sections", N: len(r.Job.Site.Report.Sections), Limit: len(names)}
		}
		if len(flat) < 4 || len(flat)%2 != 0 {
			return nil, &ValueError{Item: item, Field: "coordinates", Value: float64(len(flat)), Reason: "must be an even count of at least 4 numbers (x1, y1, x2, y2 …)"}
		}
		var line geom.Polyline
		for i := 0; i < len(flat); i += 2 {
			p, err := v.surveyToLocal(flat[i], flat[i+1])
			if err != nil || !p.IsFinite() {
				return nil, &ValueError{Item: item, Field: fmt.Sprintf("point %d", i/2+1), Value: flat[i], Reason: "is not a position in the survey's coordinates"}
			}
			line = append(line, p)
		}
		if line.Length() == 0 {
			return nil, &ValueError{Item: item, Field: "length", Value: 0, Reason: "must be > 0"}
		}
		out = append(out, PlanSectionLine{Name: names[k : k+1], Line: line})
	}
	return out, nil
}

// surveyToLocal converts a position written in the survey's coordinates
// (lon/lat for a lon/lat survey, else world coordinates in its units) to
// the local frame.
func (v *jobView) surveyToLocal(x, y float64) (geom.Vec2, error) {
	set := v.r.Survey
	if set.Geographic && set.CRS.UTM != nil {
		e, n, err := set.CRS.UTM.Forward(x, y)
		if err != nil {
			return geom.Vec2{}, err
		}
		return set.Frame.ToLocal(geom.Vec2{X: e, Y: n}), nil
	}
	f := v.r.Job.Units.Metres()
	return set.Frame.ToLocal(geom.Vec2{X: x * f, Y: y * f}), nil
}

// lineAcross returns the segment through c in direction d (a unit vector)
// from its farthest crossing of ring on one side to the farthest on the
// other, extended by the section margin; nil when the line misses ring.
func lineAcross(ring geom.Ring, c, d geom.Vec2) geom.Polyline {
	lo, hi := math.Inf(1), math.Inf(-1)
	for i := range ring {
		a, b := ring[i], ring[(i+1)%len(ring)]
		e := b.Sub(a)
		den := d.Cross(e)
		if den == 0 {
			continue
		}
		// c + t·d = a + u·e
		ac := a.Sub(c)
		t := ac.Cross(e) / den
		u := ac.Cross(d) / den
		if u >= 0 && u <= 1 {
			lo, hi = math.Min(lo, t), math.Max(hi, t)
		}
	}
	if !(hi > lo) {
		return nil
	}
	m := math.Max(jobSectionMarginM, jobSectionMarginFrac*(hi-lo))
	return geom.Polyline{c.Add(d.Scale(lo - m)), c.Add(d.Scale(hi + m))}
}

// sectionData profiles the existing ground (the TIN, exactly) and the
// finished grade along path, with the rim crossings.
func (v *jobView) sectionData(name string, path geom.Polyline) (SectionData, error) {
	r := v.r
	d := r.Design
	sd := SectionData{Name: name, Units: v.sys, HasWaterLevel: true, WaterLevelM: d.WaterLevelM, LinerOverlapM: r.Takeoff.Liner.OverlapM}
	if s := r.Job.Site; s != nil {
		sd.Site = s.Name
	}
	ch, z := section.AlongMesh(path, r.Terrain.Mesh())
	for i := range ch {
		sd.Existing = append(sd.Existing, ProfilePoint{S: ch[i], Z: z[i]})
	}
	step := math.Max(d.CellM/2, path.Length()/4000)
	prof, err := section.Along(path, step, finishedSampler{r})
	if err != nil {
		return sd, fmt.Errorf("report: section %s: %w", name, err)
	}
	fz := prof.Z[0]
	for i, s := range prof.Chainage {
		sd.Finished = append(sd.Finished, ProfilePoint{S: s, Z: fz[i]})
	}
	// Rim crossings: where the bowl passes the rim between stations,
	// placed by bisection on the exact bowl.
	in := func(p geom.Vec2) bool { return d.BowlAt(p) <= d.RimM }
	for i := 1; i < len(prof.XY); i++ {
		a, b := prof.XY[i-1], prof.XY[i]
		ia := in(a)
		if ia == in(b) {
			continue
		}
		lo, hi := 0.0, 1.0
		for range jobRimBisections {
			mid := (lo + hi) / 2
			if in(a.Lerp(b, mid)) == ia {
				lo = mid
			} else {
				hi = mid
			}
		}
		t := (lo + hi) / 2
		sd.RimS = append(sd.RimS, prof.Chainage[i-1]+t*(prof.Chainage[i]-prof.Chainage[i-1]))
	}
	// The finished grade passes through the rim exactly there: add those
	// points, so the rim is not cut off between two stations.
	for _, s := range sd.RimS {
		k, _ := slices.BinarySearchFunc(sd.Finished, s, func(p ProfilePoint, s float64) int {
			switch {
			case p.S < s:
				return -1
			case p.S > s:
				return 1
			}
			return 0
		})
		sd.Finished = slices.Insert(sd.Finished, k, ProfilePoint{S: s, Z: d.RimM})
	}
	return sd, nil
}

// planData assembles the plan sheet.
func (v *jobView) planData(date time.Time, st reportSettings, existing, design []contours.Line, sections []PlanSectionLine) PlanData {
	r := v.r
	d := r.Design
	window := v.planWindow(sections)
	p := PlanData{Title: v.titleBlock(date), Units: v.sys, Frame: r.Survey.Frame, HasWaterLevel: true, WaterLevelM: d.WaterLevelM,
		Existing: planContours(clipLines(existing, window)), Design: planContours(clipLines(design, window)), Sections: sections}
	for _, z := range r.Zones {
		p.Zones = append(p.Zones, PlanZone{Name: z.Name, DepthM: z.DepthM, Ring: z.Ring})
	}
	for _, l := range r.Takeoff.Shoreline.LoopDetail {
		if l.Closed && len(l.Pts) >= 3 {
			p.WaterLine = append(p.WaterLine, geom.Ring(l.Pts))
		}
	}
	for _, l := range contours.TraceLevel(d.BowlMesh(), d.RimM) {
		if l.Closed && len(l.Pts) >= 4 {
			p.Rim = append(p.Rim, geom.Ring(l.Pts[:len(l.Pts)-1]))
		}
	}
	p.BermToe = v.bermToe()
	l := d.Lattice
	p.Depth = PlanDepthMap{Origin: geom.Vec2{X: l.X0 - l.H/2, Y: l.Y0 - l.H/2}, CellM: l.H, NX: l.NX, NY: l.NY, DM: make([]float64, l.NX*l.NY)}
	for k := range p.Depth.DM {
		p.Depth.DM[k] = math.NaN()
		if v.disturbed(k) {
			p.Depth.DM[k] = d.D[k] - d.G[k]
		}
	}
	if r.Job.Site != nil && sitefile.BoolOr(r.Job.Site.Report.ShowPoints, false) {
		for _, pt := range r.Survey.Points {
			if window.Contains(pt.P.XY()) {
				p.Points = append(p.Points, PlanMark{ID: pt.ID, At: pt.P.XY()})
			}
		}
	}
	if s := r.Job.Site; s != nil && s.Notes != "" {
		p.Notes = append(p.Notes, s.Notes)
	}
	p.Notes = append(p.Notes,
		fmt.Sprintf("Water level %s (%s), rim %s.", fmtLevel(d.WaterLevelM, v.sys), d.Level, fmtLevel(d.RimM, v.sys)),
		fmt.Sprintf("Contours every %s, index every %s; coordinates and elevations in the survey's frame (%s).",
			fmtStep(st.intervalM, v.sys), fmtStep(st.intervalM*float64(st.indexEvery), v.sys), v.frameNote()),
		"Berm toe: where the fill berm meets the existing ground. Edge of cut: the line between digging and building up.",
	)
	return p
}

// fmtStep writes a contour interval (m) in sys: "0.5 ft", "0.2 m".
func fmtStep(m float64, sys units.System) string {
	return trimNum(toUserLength(m, sys), 3) + " " + lengthUnit(sys)
}

// bermToe returns the stretches of the edge of the work where the ground
// is below the rim: the toe of the fill berm.
func (v *jobView) bermToe() []geom.Polyline {
	r := v.r
	below := func(p geom.Vec2) bool {
		g, ok := r.Terrain.Elevation(p.X, p.Y)
		return ok && g < r.Design.RimM
	}
	var out []geom.Polyline
	for _, e := range v.workEdge() {
		pts := e.Pts
		n := len(pts)
		if n < 2 {
			continue
		}
		flags := make([]bool, n)
		all := true
		for i, p := range pts {
			flags[i] = below(p)
			all = all && flags[i]
		}
		if all && e.Closed {
			out = append(out, append(slices.Clone(pts), pts[0]))
			continue
		}
		// Runs of toe points; on a closed line start after a daylight
		// point so that no run is split at the start.
		start := 0
		if e.Closed {
			for i := range n {
				if !flags[i] {
					start = (i + 1) % n
					break
				}
			}
		}
		var run geom.Polyline
		count := n
		if e.Closed {
			count = n + 1
		}
		for k := range count {
			i := (start + k) % n
			if flags[i] {
				run = append(run, pts[i])
				continue
			}
			if len(run) >= 2 {
				out = append(out, run)
			}
			run = nil
		}
		if len(run) >= 2 {
			out = append(out, run)
		}
	}
	return out
}

// planContours groups traced lines by level for the plan.
func planContours(lines []contours.Line) []PlanContour {
	var out []PlanContour
	for _, l := range lines {
		if len(out) == 0 || out[len(out)-1].LevelM != l.Level {
			out = append(out, PlanContour{LevelM: l.Level, Index: l.Index})
		}
		pts := geom.Polyline(l.Pts)
		if l.Closed && len(pts) > 0 && pts[0] != pts[len(pts)-1] {
			pts = append(slices.Clone(pts), pts[0])
		}
		out[len(out)-1].Lines = append(out[len(out)-1].Lines, pts)
	}
	return out
}

func (v *jobView) titleBlock(date time.Time) TitleBlock {
	t := TitleBlock{Date: date.Format("2 January 2006")}
	if s := v.r.Job.Site; s != nil {
		t.Site, t.Client, t.Address = s.Name, s.Client, s.Address
	}
	return t
}

// jobPlanMarginFrac and jobPlanMarginM set the plan's window: the work and
// the section lines, with a quarter of their size (at least 1.5 m) of
// surrounding ground, so the pond fills the sheet and the existing
// contours show how it sits in the yard.
const (
	jobPlanMarginFrac = 0.25
	jobPlanMarginM    = 1.5
)

// planWindow returns the part of the site the plan shows.
func (v *jobView) planWindow(sections []PlanSectionLine) geom.Box {
	b := geom.EmptyBox()
	for _, e := range v.workEdge() {
		b = b.Union(geom.BoxOf(e.Pts))
	}
	for _, z := range v.r.Zones {
		b = b.Union(geom.Ring(z.Ring).Bounds())
	}
	for _, s := range sections {
		b = b.Union(geom.BoxOf(s.Line))
	}
	if b.IsEmpty() {
		return v.r.Terrain.Bounds()
	}
	return b.Expand(math.Max(jobPlanMarginM, jobPlanMarginFrac*math.Max(b.Width(), b.Height())))
}

// clipLines returns the parts of lines inside box b (boundary included),
// each part an open line unless a closed line lies wholly inside.
func clipLines(lines []contours.Line, b geom.Box) []contours.Line {
	var out []contours.Line
	for _, l := range lines {
		inside := true
		for _, p := range l.Pts {
			if !b.Contains(p) {
				inside = false
				break
			}
		}
		if inside {
			out = append(out, l)
			continue
		}
		var cur []geom.Vec2
		flush := func() {
			if len(cur) >= 2 {
				out = append(out, contours.Line{Level: l.Level, Pts: cur, Index: l.Index})
			}
			cur = nil
		}
		for i := 1; i < len(l.Pts); i++ {
			a, c, ok := clipSegment(l.Pts[i-1], l.Pts[i], b)
			if !ok {
				flush()
				continue
			}
			if len(cur) == 0 || cur[len(cur)-1] != a {
				flush()
				cur = append(cur, a)
			}
			cur = append(cur, c)
			if c != l.Pts[i] {
				flush()
			}
		}
		flush()
	}
	return out
}

// clipSegment clips the segment pq to box b (Liang and Barsky, "A new
// concept and method for line clipping", ACM TOG 3(1), 1984); ok is false
// when no part of it is inside. Ends inside b are returned unchanged.
func clipSegment(p, q geom.Vec2, b geom.Box) (geom.Vec2, geom.Vec2, bool) {
	t0, t1 := 0.0, 1.0
	d := q.Sub(p)
	for _, e := range [4][2]float64{{-d.X, p.X - b.Min.X}, {d.X, b.Max.X - p.X}, {-d.Y, p.Y - b.Min.Y}, {d.Y, b.Max.Y - p.Y}} {
		pk, qk := e[0], e[1]
		if pk == 0 {
			if qk < 0 {
				return p, q, false
			}
			continue
		}
		t := qk / pk
		if pk < 0 {
			t0 = math.Max(t0, t)
		} else {
			t1 = math.Min(t1, t)
		}
	}
	if t0 > t1 {
		return p, q, false
	}
	a, c := p, q
	if t0 > 0 {
		a = p.Add(d.Scale(t0))
	}
	if t1 < 1 {
		c = p.Add(d.Scale(t1))
	}
	return a, c, true
}
