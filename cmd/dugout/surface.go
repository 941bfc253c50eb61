package main

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"text/tabwriter"
	"time"

	"github.com/spf13/cobra"

	"github.com/dugout-estimating/dugout/internal/crs"
	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/landxml"
	"github.com/dugout-estimating/dugout/internal/report"
	"github.com/dugout-estimating/dugout/internal/survey"
	"github.com/dugout-estimating/dugout/internal/tin"
	"github.com/dugout-estimating/dugout/internal/units"
)

const surfaceLong = `Build the existing-ground surface (a TIN: triangles between the survey
shots) and summarise it: vertices and triangles, duplicate shots merged,
breaklines and boundaries inserted, plan and 3-D (sloped) area, elevation
range, and the longest triangle edges with where they are, which point at
gaps in the survey. Coordinates are printed in the survey's own grid and
units.

Coded strings in the survey (BL1, BL2... by default) are breaklines; more
can come from --breaklines files (GeoJSON LineStrings or coded points), and
--boundary trims the surface to a polygon (GeoJSON). All of them are read
with the survey, in the same units and coordinate system. --max-edge trims
long thin triangles from the outside, where the surface would otherwise
bridge ground nobody shot.

A LandXML file (.xml or .landxml) is read as a finished surface instead of
points, so a surface made elsewhere can be checked or turned into GeoJSON.

--landxml writes the surface as LandXML 1.2 (world coordinates, the
survey's units, the EPSG code when known); --geojson writes its triangles
as GeoJSON (longitude/latitude when the survey was lon/lat, else the
survey's grid and units, said in the file). Files are written only when
everything succeeded. --check verifies the triangulation and fails with
exit code 3 if anything is wrong.`

const surfaceExample = `  # the demo yard, shot in feet, with the wall as breaklines
  dugout surface --units ft testdata/demo/yard_total_station.csv

  # trim to the lot line and drop triangles longer than 15 ft at the edge
  dugout surface --units ft shots.csv --boundary lot.geojson --max-edge 15ft

  # send the surface to another program, checked first
  dugout surface --units ft shots.csv --check --landxml ground.xml --geojson ground.geojson`

// surfaceOptions holds the parsed arguments of `dugout surface`.
type surfaceOptions struct {
	app        *App
	files      []string
	survey     surveyFlags
	breaklines []string
	boundary   string
	maxEdge    string
	mergeTol   string
	duplicates string
	landxmlOut string
	geojsonOut string
	check      bool
	unitsSet   bool
}

// newSurfaceCmd returns the `surface` command.
func newSurfaceCmd(app *App) *cobra.Command {
	return surfaceCmdWith(app, runSurface)
}

// surfaceCmdWith returns the `surface` command running runF, so that tests can
// check the flags as parsed.
func surfaceCmdWith(app *App, runF func(context.Context, *surfaceOptions) error) *cobra.Command {
	opts := &surfaceOptions{app: app}
	cmd := &cobra.Command{
		Use:     "surface <file>... [flags]",
		Short:   "build and check the existing-ground surface (TIN)",
		Long:    surfaceLong,
		Example: surfaceExample,
		Args:    cobra.MinimumNArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			opts.files = args
			opts.unitsSet = cmd.Flags().Changed("units")
			return runF(cmd.Context(), opts)
		},
	}
	opts.survey.add(cmd)
	fl := cmd.Flags()
	fl.StringArrayVar(&opts.breaklines, "breaklines", nil, "file of breaklines: GeoJSON LineStrings or coded points (repeatable)")
	fl.StringVar(&opts.boundary, "boundary", "", "GeoJSON polygon the surface is trimmed to")
	fl.StringVar(&opts.maxEdge, "max-edge", "", "trim edge triangles with an outside edge longer than this, a length such as 15ft (a bare number is in --units)")
	fl.StringVar(&opts.mergeTol, "merge-tol", "", "shots closer than this in plan are one ground point, a length (default 1cm; 0 merges identical positions only)")
	fl.StringVar(&opts.duplicates, "duplicates", "mean", "shots at the same position: {mean|first|error}; error refuses elevations more than 5 cm (0.16 ft) apart")
	fl.StringVar(&opts.landxmlOut, "landxml", "", "write the surface to this LandXML 1.2 file (\"-\" for stdout)")
	fl.StringVar(&opts.geojsonOut, "geojson", "", "write the triangles to this GeoJSON file (\"-\" for stdout)")
	fl.BoolVar(&opts.check, "check", false, "verify the triangulation; a problem exits with code 3")
	return cmd
}

// runSurface reads, builds, checks, writes and reports.
func runSurface(ctx context.Context, opts *surfaceOptions) error {
	app := opts.app
	opt, err := opts.survey.options()
	if err != nil {
		return err
	}
	var tinOpt tin.Options
	if tinOpt.Duplicates, err = tin.ParseDupPolicy(opts.duplicates); err != nil {
		return flagErrorf("--duplicates %q: want mean, first or error", opts.duplicates)
	}
	if tinOpt.MergeTolM, err = parseMergeTol(opts.mergeTol, opt.Units); err != nil {
		return err
	}
	if opts.maxEdge != "" {
		if tinOpt.MaxEdgeM, err = units.ParseLength(opts.maxEdge, opt.Units); err != nil {
			return flagErrorf("--max-edge: %w", err)
		}
		if !(tinOpt.MaxEdgeM > 0) {
			return flagErrorf("--max-edge must be > 0, got %s", opts.maxEdge)
		}
	}
	req := groundRequest{files: opts.files, breaklineFiles: opts.breaklines, boundaryFile: opts.boundary,
		opt: opt, unitsSet: opts.unitsSet}
	if isLandXMLPath(opts.files[0]) {
		if len(opts.files) > 1 || len(opts.breaklines) > 0 || opts.boundary != "" || opts.maxEdge != "" {
			return flagErrorf("a LandXML surface is used as it is: give it alone, without other files, --breaklines, --boundary or --max-edge")
		}
	}
	outs, err := checkOutputs(
		outputFlag{"--landxml", opts.landxmlOut},
		outputFlag{"--geojson", opts.geojsonOut},
	)
	if err != nil {
		return err
	}
	if outs.stdout != "" && app.JSON {
		return flagErrorf("%s - writes the file to stdout, which --json needs for its document: give a file name", outs.stdout)
	}
	if err := outs.notInputs(append(append(slices.Clone(opts.files), opts.breaklines...), opts.boundary)); err != nil {
		return err
	}
	// Folders made for the outputs are removed again unless a file went
	// into them.
	keep := false
	defer func() {
		if !keep {
			outs.undo()
		}
	}()

	g, err := readGround(app, req)
	if err != nil {
		return err
	}
	if err := ctx.Err(); err != nil {
		return err
	}
	s, err := g.build(tinOpt)
	if err != nil {
		return err
	}
	if err := ctx.Err(); err != nil {
		return err
	}
	checked := false
	if opts.check {
		if err := s.Validate(); err != nil {
			return &RejectedError{Err: fmt.Errorf("surface check failed: %w", err)}
		}
		checked = true
	}
	g.printWarnings(app)

	writers := map[string]func(io.Writer) error{
		"--landxml": func(w io.Writer) error { return g.writeLandXML(w, s.Mesh()) },
		"--geojson": func(w io.Writer) error { return g.writeTrianglesGeoJSON(w, s.Mesh()) },
	}
	for _, o := range outs.paths {
		if err := report.WriteFileAtomic(o.path, writers[o.flag]); err != nil {
			return err
		}
		keep = true
	}
	keep = true
	if outs.stdout != "" {
		// The document alone goes to stdout, as with points --export -.
		return writers[outs.stdout](app.IO.Out)
	}
	sum := s.Summary()
	if app.JSON {
		return writeSurfaceJSON(app.IO.Out, g, &sum, opts, tinOpt, checked)
	}
	return writeSurfaceText(app.IO.Out, app.IO.OutIsTTY, g, &sum, opts, tinOpt.MergeTolM, checked)
}

// parseMergeTol parses --merge-tol; "" gives survey.DefaultDupTolM, the
// distance within which the points command calls two shots duplicates.
func parseMergeTol(s string, u units.System) (float64, error) {
	if s == "" {
		return survey.DefaultDupTolM, nil
	}
	v, err := units.ParseLength(s, u)
	if err != nil {
		return 0, flagErrorf("--merge-tol: %w", err)
	}
	if !(v >= 0) {
		return 0, flagErrorf("--merge-tol must be >= 0, got %s", s)
	}
	return v, nil
}

// writeSurfaceText prints the surface summary in the input's units:
// aligned on a terminal, key<TAB>value lines otherwise.
func writeSurfaceText(w io.Writer, tty bool, g *groundSource, sum *tin.Summary, opts *surfaceOptions, mergeTolM float64, checked bool) error {
	t := newSummaryTable(w, tty)
	f := g.formatter()
	g.inputRows(t)
	t.row("units", "%s", g.units)
	t.row("crs", "%s", g.crsText())
	if g.mesh == nil {
		t.row("points", "%s", plural(len(g.points), "shot"))
	}
	t.row("vertices", "%d", sum.Vertices)
	t.row("triangles", "%d", sum.Triangles)
	hull := fmt.Sprintf("%d vertices", sum.HullVertices)
	if sum.Pieces > 1 {
		hull += fmt.Sprintf(" (largest of %d separate pieces)", sum.Pieces)
	}
	t.row("hull", "%s", hull)
	if g.mesh == nil {
		within := "within " + f.length(mergeTolM)
		if mergeTolM == 0 {
			within = "at identical positions"
		}
		dup := fmt.Sprintf("%d merged in %s %s", sum.DuplicatesMerged, plural(sum.DuplicateGroups, "group"), within)
		if g.vertexShots > 0 {
			dup += fmt.Sprintf(" (%d breakline vertices on their own shots)", g.vertexShots)
		}
		if sum.DuplicateConflicts > 0 {
			dup += fmt.Sprintf("; %d conflicting: elevations more than %s apart, kept the %s", sum.DuplicateConflicts, f.length(tin.DefaultConflictTolM), opts.duplicates)
		}
		t.row("duplicates", "%s", dup)
		t.row("constraints", "%d breaklines, %d boundaries: %d segments, %d splits", sum.Breaklines, sum.BoundaryRings, sum.ConstraintSegments, sum.ConstraintSplits)
		if sum.TrimmedTriangles > 0 {
			t.row("trimmed", "%d triangles", sum.TrimmedTriangles)
		}
	}
	t.row("plan area", "%s", f.area(sum.PlanAreaM2))
	t.row("3-D area", "%s", f.area(sum.SurfaceAreaM2))
	if sum.Vertices > 0 {
		t.row("elevation", "%s to %s", f.num(sum.ZMinM), f.length(sum.ZMaxM))
	}
	for _, e := range sum.LongestEdges {
		x, y := g.world(e.Mid)
		t.row("longest edge", "%s at E %s, N %s", f.length(e.LengthM), f.coord(x), f.coord(y))
	}
	if checked {
		t.row("check", "passed")
	}
	if opts.landxmlOut != "" {
		t.row("landxml", "%s", opts.landxmlOut)
	}
	if opts.geojsonOut != "" {
		t.row("geojson", "%s", opts.geojsonOut)
	}
	if n := len(g.allWarnings()); n > 0 {
		t.row("warnings", "%d (on stderr)", n)
	}
	return t.flush()
}

// surfaceJSON is the --json document of `dugout surface` (schema 1).
// Lengths are metres, areas square metres, coordinates world metres of the
// working grid.
type surfaceJSON struct {
	SchemaVersion     int               `json:"schema_version"`
	Input             groundInputJSON   `json:"input"`
	Options           surfaceOptsJSON   `json:"options"`
	Units             string            `json:"units"`
	CRS               crsJSON           `json:"crs"`
	Geographic        bool              `json:"geographic"`
	FrameOrigin       [2]float64        `json:"frame_origin_m"`
	Vertices          int               `json:"vertices"`
	Triangles         int               `json:"triangles"`
	HullVertices      int               `json:"hull_vertices"`
	Pieces            int               `json:"pieces"`
	Shots             int               `json:"shots"`
	InputPoints       int               `json:"input_points"`
	BreaklineVertices int               `json:"breakline_vertices"`
	Duplicates        tinDuplicatesJSON `json:"duplicates"`
	Constraints       constraintsJSON   `json:"constraints"`
	TrimmedTriangles  int               `json:"trimmed_triangles"`
	PlanAreaM2        float64           `json:"plan_area_m2"`
	SurfaceAreaM2     float64           `json:"surface_area_m2"`
	ElevMin           *float64          `json:"elevation_min_m"`
	ElevMax           *float64          `json:"elevation_max_m"`
	LongestEdges      []edgeJSON        `json:"longest_edges"`
	Checked           bool              `json:"checked"`
	Outputs           outputsJSON       `json:"outputs"`
	Warnings          []string          `json:"warnings"`
}

type groundInputJSON struct {
	Format     string     `json:"format"`
	Files      []fileJSON `json:"files"`
	Breaklines []string   `json:"breakline_files"`
	Boundary   string     `json:"boundary_file,omitempty"`
	Surface    string     `json:"surface_name,omitempty"`
}

type surfaceOptsJSON struct {
	Units          string   `json:"units"`
	CRS            string   `json:"crs"`
	Columns        string   `json:"columns,omitempty"`
	BreaklineCodes []string `json:"breakline_codes"`
	Duplicates     string   `json:"duplicates"`
	MaxEdgeM       float64  `json:"max_edge_m"`
	MergeTolM      float64  `json:"merge_tolerance_m"`
	Check          bool     `json:"check"`
}

type tinDuplicatesJSON struct {
	Groups      int     `json:"groups"`
	VertexShots int     `json:"breakline_vertices_on_shots"`
	Merged      int     `json:"merged"`
	Conflicts   int     `json:"conflicts"`
	TolM        float64 `json:"conflict_tolerance_m"`
}

type constraintsJSON struct {
	Breaklines    int `json:"breaklines"`
	BoundaryRings int `json:"boundary_rings"`
	Segments      int `json:"segments"`
	Splits        int `json:"splits"`
}

type edgeJSON struct {
	LengthM float64    `json:"length_m"`
	MidE    float64    `json:"mid_easting_m"`
	MidN    float64    `json:"mid_northing_m"`
	From    [3]float64 `json:"from_m"`
	To      [3]float64 `json:"to_m"`
}

type outputsJSON struct {
	LandXML string `json:"landxml,omitempty"`
	GeoJSON string `json:"geojson,omitempty"`
}

func writeSurfaceJSON(w io.Writer, g *groundSource, sum *tin.Summary, opts *surfaceOptions, tinOpt tin.Options, checked bool) error {
	doc := surfaceJSON{
		SchemaVersion: 1,
		Input:         g.inputJSON(),
		Options: surfaceOptsJSON{Units: opts.survey.units, CRS: opts.survey.crs, Columns: opts.survey.columns,
			BreaklineCodes: breaklineCodes(opts.survey), Duplicates: strings.ToLower(strings.TrimSpace(opts.duplicates)),
			MaxEdgeM: tinOpt.MaxEdgeM, MergeTolM: tinOpt.MergeTolM, Check: opts.check},
		Units:             g.units.String(),
		CRS:               crsJSON{Kind: g.crs.Kind.String(), EPSG: g.crs.EPSG, Name: g.crs.Name},
		Geographic:        g.geographic,
		FrameOrigin:       [2]float64{g.frame.Origin.X, g.frame.Origin.Y},
		Vertices:          sum.Vertices,
		Triangles:         sum.Triangles,
		HullVertices:      sum.HullVertices,
		Pieces:            sum.Pieces,
		Shots:             len(g.points),
		InputPoints:       sum.InputPoints,
		BreaklineVertices: sum.BreaklineVertices,
		Duplicates: tinDuplicatesJSON{Groups: sum.DuplicateGroups, VertexShots: g.vertexShots, Merged: sum.DuplicatesMerged,
			Conflicts: sum.DuplicateConflicts, TolM: tin.DefaultConflictTolM},
		Constraints: constraintsJSON{Breaklines: sum.Breaklines, BoundaryRings: sum.BoundaryRings,
			Segments: sum.ConstraintSegments, Splits: sum.ConstraintSplits},
		TrimmedTriangles: sum.TrimmedTriangles,
		PlanAreaM2:       sum.PlanAreaM2,
		SurfaceAreaM2:    sum.SurfaceAreaM2,
		LongestEdges:     []edgeJSON{},
		Checked:          checked,
		Outputs:          outputsJSON{LandXML: opts.landxmlOut, GeoJSON: opts.geojsonOut},
		Warnings:         g.allWarnings(),
	}
	if sum.Vertices > 0 {
		doc.ElevMin, doc.ElevMax = finite(sum.ZMinM), finite(sum.ZMaxM)
	}
	o := g.frame.Origin
	for _, e := range sum.LongestEdges {
		doc.LongestEdges = append(doc.LongestEdges, edgeJSON{LengthM: e.LengthM, MidE: e.Mid.X + o.X, MidN: e.Mid.Y + o.Y,
			From: [3]float64{e.A.X + o.X, e.A.Y + o.Y, e.A.Z}, To: [3]float64{e.B.X + o.X, e.B.Y + o.Y, e.B.Z}})
	}
	return encodeJSON(w, doc)
}

// encodeJSON writes v as one indented JSON document.
func encodeJSON(w io.Writer, v any) error {
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	return enc.Encode(v)
}

// breaklineCodes returns the breakline codes in effect (the default BL when
// none was given).
func breaklineCodes(f surveyFlags) []string {
	if f.breaklineCodes == nil {
		return []string{"BL"}
	}
	return f.breaklineCodes
}

// ---------------------------------------------------------------------
// Reading a ground surface: shared by surface, compare and contours.
// ---------------------------------------------------------------------

// groundRequest says what to read for one ground surface.
type groundRequest struct {
	// files are survey files, or one LandXML surface.
	files []string
	// breaklineFiles and boundaryFile are read with the survey files, so
	// that they share its frame, units and coordinate system.
	breaklineFiles []string
	boundaryFile   string
	opt            survey.Options
	// unitsSet reports whether --units was given, so that a LandXML file
	// whose own unit differs can say it wins.
	unitsSet bool
	// label names the surface in messages ("before", "after"); "" for none.
	label string
}

// groundSource is one ground surface as read from the command line, in the
// local frame (metres): survey points with their breaklines and boundaries
// to be triangulated, or a triangulated mesh from LandXML.
type groundSource struct {
	req        groundRequest
	set        *survey.Set      // nil for LandXML input
	xml        *landxml.Surface // nil for survey input
	frame      geom.Frame
	crs        crs.CRS
	geographic bool
	units      units.System

	points    []geom.Vec3
	pointRefs []survey.PointRef // pointRefs[i] names points[i]
	// vertexShots counts breakline vertices at exactly the position of a
	// survey shot (the shots of a coded string).
	vertexShots int
	breaklines  []tin.Breakline
	lineRefs    []string // lineRefs[i] says where breaklines[i] was read
	boundaries  []geom.Ring
	ringRefs    []string
	mesh        *geom.TriMesh // LandXML input, local frame

	warnings []string
	surface  *tin.Surface // set by build
}

// isLandXMLPath reports whether path names a LandXML file by its extension
// (.xml or .landxml, any case).
func isLandXMLPath(path string) bool {
	switch strings.ToLower(filepath.Ext(path)) {
	case ".xml", ".landxml":
		return true
	}
	return false
}

// readGround reads one ground surface: survey files (with breakline and
// boundary files, all in one survey.Read so they share one frame) or a
// single LandXML surface.
func readGround(app *App, req groundRequest) (*groundSource, error) {
	if len(req.files) == 1 && isLandXMLPath(req.files[0]) {
		return readLandXMLGround(req)
	}
	for _, f := range req.files {
		if isLandXMLPath(f) {
			return nil, flagErrorf("%s is a LandXML surface: give it alone, not with survey files", f)
		}
	}
	role := map[string]string{}
	var paths []string
	add := func(p, r string) {
		if _, ok := role[p]; !ok {
			role[p] = r
			paths = append(paths, p)
		}
	}
	for _, p := range req.files {
		add(p, "survey")
	}
	for _, p := range req.breaklineFiles {
		add(p, "breaklines")
	}
	if req.boundaryFile != "" {
		add(req.boundaryFile, "boundary")
	}
	opt := req.opt
	done := readProgress(app, &opt)
	set, err := survey.Read(paths, opt)
	done()
	if err != nil {
		return nil, labelled(req.label, surveyError(err))
	}
	g := &groundSource{req: req, set: set, frame: set.Frame, crs: set.CRS, geographic: set.Geographic, units: set.Units}
	for _, w := range set.Warnings {
		g.warnings = append(g.warnings, g.prefix()+w.String())
	}
	lines := map[string]int{}
	for _, l := range set.Breaklines {
		where := fmt.Sprintf("%s line %d", l.File, l.Line)
		if role[l.File] == "boundary" {
			g.warnings = append(g.warnings, fmt.Sprintf("%s%s: a line in the --boundary file is not a polygon; ignored", g.prefix(), where))
			continue
		}
		name := l.Name
		if name == "" {
			name = where
		}
		g.breaklines = append(g.breaklines, tin.Breakline{Name: name, Pts: l.Pts})
		g.lineRefs = append(g.lineRefs, where)
		lines[l.File]++
	}
	rings := map[string]int{}
	for _, b := range set.Boundaries {
		where := fmt.Sprintf("%s feature %d", b.File, b.Feature)
		if role[b.File] == "breaklines" {
			g.warnings = append(g.warnings, fmt.Sprintf("%s%s: a polygon in a --breaklines file has no elevations to be a breakline; ignored", g.prefix(), where))
			continue
		}
		if b.Name != "" {
			where = fmt.Sprintf("%q (%s)", b.Name, where)
		}
		g.boundaries = append(g.boundaries, b.Ring)
		g.ringRefs = append(g.ringRefs, where)
		rings[b.File]++
	}
	shots := map[geom.Vec3]bool{}
	for _, p := range set.Points {
		if role[p.File] != "survey" || !p.HasZ() {
			continue
		}
		g.points = append(g.points, p.P)
		g.pointRefs = append(g.pointRefs, survey.PointRef{ID: p.ID, File: p.File, Line: p.Line})
		shots[p.P] = true
	}
	// A coded shot is both a survey point and a breakline vertex, and the
	// TIN merges the two as duplicates (the vertex wins). The shot stays a
	// survey point, since the check that breaklines stay inside the survey
	// uses the hull of the points; the summary says how many of the merged
	// duplicates are such pairs.
	for _, b := range g.breaklines {
		for _, p := range b.Pts {
			if shots[p] {
				g.vertexShots++
			}
		}
	}
	for _, p := range req.breaklineFiles {
		if role[p] == "breaklines" && lines[p] == 0 {
			return nil, &RejectedError{Err: fmt.Errorf("%s%s: no breakline in the file (GeoJSON LineStrings, or points coded %s)", g.prefix(), p, strings.Join(codesOf(req.opt), ", "))}
		}
	}
	if p := req.boundaryFile; p != "" && role[p] == "boundary" && rings[p] == 0 {
		return nil, &RejectedError{Err: fmt.Errorf("%s%s: no polygon in the --boundary file", g.prefix(), p)}
	}
	return g, nil
}

// codesOf returns the breakline codes of opt, with the default.
func codesOf(opt survey.Options) []string {
	if opt.BreaklineCodes == nil {
		return []string{"BL"}
	}
	return opt.BreaklineCodes
}

// readProgress sets opt.Progress to show the reading on stderr when it is
// a terminal, and returns a function that clears the line afterwards.
func readProgress(app *App, opt *survey.Options) func() {
	if !app.Progress() {
		return func() {}
	}
	opt.Progress = func(done, total int64) {
		if total > 0 {
			fmt.Fprintf(app.IO.ErrOut, "\rreading %3d%%", done*100/total)
		}
	}
	return func() { fmt.Fprint(app.IO.ErrOut, "\r            \r") }
}

// labelled prefixes err's message with a surface label ("before: ...")
// while keeping its type and chain.
func labelled(label string, err error) error {
	if label == "" || err == nil {
		return err
	}
	var re *RejectedError
	if errors.As(err, &re) && re == err {
		return &RejectedError{Err: &explainedError{msg: label + ": " + re.Err.Error(), err: re.Err}}
	}
	var fe *FlagError
	if errors.As(err, &fe) && fe == err {
		return &FlagError{Err: &explainedError{msg: label + ": " + fe.Err.Error(), err: fe.Err}}
	}
	return &explainedError{msg: label + ": " + err.Error(), err: err}
}

// explainedError replaces the message of an error from an internal package
// with one written for the user, in the user's units and with point ids
// and lines, keeping the original in the chain for errors.Is and As.
type explainedError struct {
	msg string
	err error
}

func (e *explainedError) Error() string { return e.msg }
func (e *explainedError) Unwrap() error { return e.err }

// systemOfLandXML returns the unit system of a LandXML unit.
func systemOfLandXML(u landxml.Units) units.System {
	switch u {
	case landxml.Feet:
		return units.Feet
	case landxml.USFeet:
		return units.USFeet
	}
	return units.Metres
}

// landXMLOfSystem returns the LandXML unit of a unit system.
func landXMLOfSystem(u units.System) landxml.Units {
	switch u {
	case units.Feet:
		return landxml.Feet
	case units.USFeet:
		return landxml.USFeet
	}
	return landxml.Metres
}

// readLandXMLGround reads the first TIN surface of a LandXML file and
// shifts it into a local frame at the centre of its extent.
func readLandXMLGround(req groundRequest) (*groundSource, error) {
	path := req.files[0]
	f, err := os.Open(path)
	if err != nil {
		return nil, labelled(req.label, err)
	}
	defer f.Close()
	surfs, err := landxml.Read(f)
	if err != nil {
		var pe *landxml.ParseError
		if errors.As(err, &pe) {
			return nil, labelled(req.label, &RejectedError{Err: fmt.Errorf("%s: %w", path, err)})
		}
		return nil, labelled(req.label, fmt.Errorf("%s: %w", path, err))
	}
	xs := surfs[0]
	g := &groundSource{req: req, xml: &xs, units: systemOfLandXML(xs.Units)}
	for _, w := range xs.Warnings {
		g.warnings = append(g.warnings, fmt.Sprintf("%s%s: %s", g.prefix(), path, w))
	}
	if len(surfs) > 1 {
		g.warnings = append(g.warnings, fmt.Sprintf("%s%s holds %d surfaces; using the first, %q", g.prefix(), path, len(surfs), xs.Name))
	}
	if req.unitsSet && req.opt.Units != g.units {
		g.warnings = append(g.warnings, fmt.Sprintf("%s%s states its unit, %s; --units %s is not used for it", g.prefix(), path, g.units, req.opt.Units))
	}
	if g.crs, err = landXMLCRS(path, xs.EPSG, req.opt.CRS); err != nil {
		return nil, labelled(req.label, err)
	}
	if xs.EPSG != 0 && req.opt.CRS.CRS.Kind == crs.Local && !req.opt.CRS.Auto && req.opt.CRS.CRS.Name != "" {
		g.warnings = append(g.warnings, fmt.Sprintf("%s%s names EPSG:%d; read as a local grid because --crs local", g.prefix(), path, xs.EPSG))
	}
	box := geom.EmptyBox()
	for _, v := range xs.Mesh.V {
		box = box.Extend(v.XY())
	}
	if box.IsEmpty() {
		return nil, labelled(req.label, &RejectedError{Err: fmt.Errorf("%s: surface %q has no points", path, xs.Name)})
	}
	g.frame = geom.FrameAt(box.Center())
	m := geom.TriMesh{V: make([]geom.Vec3, len(xs.Mesh.V)), T: xs.Mesh.T}
	for i, v := range xs.Mesh.V {
		l := g.frame.ToLocal(v.XY())
		m.V[i] = geom.Vec3{X: l.X, Y: l.Y, Z: v.Z}
	}
	g.mesh = &m
	return g, nil
}

// landXMLCRS decides the coordinate system of a LandXML surface from its
// EPSG code (0 when it names none) and the --crs flag.
func landXMLCRS(path string, epsg int, spec crs.Spec) (crs.CRS, error) {
	flagSet := !spec.Auto && spec.CRS != (crs.CRS{})
	if flagSet && spec.CRS.Kind == crs.Geographic {
		return crs.CRS{}, flagErrorf("--crs %s is longitude/latitude, not a grid to work in: use --crs auto or a projected EPSG code", spec)
	}
	if epsg == 0 {
		if flagSet {
			return spec.CRS, nil
		}
		return crs.LocalCRS(), nil
	}
	c, err := crs.FromEPSG(epsg)
	if err != nil {
		return crs.CRS{}, &RejectedError{Err: fmt.Errorf("%s: %w", path, err)}
	}
	if c.Kind == crs.Geographic {
		return crs.CRS{}, &RejectedError{Err: fmt.Errorf("%s: the surface is in longitude/latitude (EPSG:%d); a surface must be on a projected grid", path, epsg)}
	}
	switch {
	case flagSet && spec.CRS.Kind == crs.Local:
		return crs.LocalCRS(), nil
	case flagSet && spec.CRS.EPSG != epsg:
		return crs.CRS{}, &RejectedError{Err: fmt.Errorf("%w: %s names EPSG:%d but --crs is %s", survey.ErrMixedCRS, path, epsg, spec)}
	}
	return c, nil
}

// prefix returns "before: " for a labelled surface, else "".
func (g *groundSource) prefix() string {
	if g.req.label == "" {
		return ""
	}
	return g.req.label + ": "
}

// shift moves everything read into frame to, whose origin differs from
// g's by a whole number of metres, so the shift is exact.
func (g *groundSource) shift(to geom.Frame) {
	d := g.frame.Origin.Sub(to.Origin)
	if d == (geom.Vec2{}) {
		return
	}
	mv := func(p geom.Vec3) geom.Vec3 { return geom.Vec3{X: p.X + d.X, Y: p.Y + d.Y, Z: p.Z} }
	for i, p := range g.points {
		g.points[i] = mv(p)
	}
	for i, b := range g.breaklines {
		pts := make([]geom.Vec3, len(b.Pts))
		for k, p := range b.Pts {
			pts[k] = mv(p)
		}
		g.breaklines[i].Pts = pts
	}
	for i, r := range g.boundaries {
		nr := make(geom.Ring, len(r))
		for k, p := range r {
			nr[k] = p.Add(d)
		}
		g.boundaries[i] = nr
	}
	if g.mesh != nil {
		v := make([]geom.Vec3, len(g.mesh.V))
		for i, p := range g.mesh.V {
			v[i] = mv(p)
		}
		g.mesh = &geom.TriMesh{V: v, T: g.mesh.T}
	}
	g.frame = to
}

// build triangulates the survey (tin.Build with opt plus the breaklines and
// boundaries read) or wraps the LandXML mesh (tin.FromMesh). Problems with
// the data are *RejectedError values explained in the survey's terms.
func (g *groundSource) build(opt tin.Options) (*tin.Surface, error) {
	var s *tin.Surface
	var err error
	if g.mesh != nil {
		s, err = tin.FromMesh(*g.mesh)
		if err != nil {
			var me *tin.MeshError
			if errors.As(err, &me) {
				err = &RejectedError{Err: fmt.Errorf("%s: %w", g.req.files[0], err)}
			}
			return nil, labelled(g.req.label, err)
		}
	} else {
		opt.Breaklines = append(slices.Clone(opt.Breaklines), g.breaklines...)
		opt.Boundary = append(slices.Clone(opt.Boundary), g.boundaries...)
		s, err = tin.Build(g.points, opt)
		if err != nil {
			return nil, labelled(g.req.label, g.explainTIN(err))
		}
	}
	g.surface = s
	return s, nil
}

// explainTIN turns an error of tin.Build into a message about the survey:
// point ids and lines, world coordinates in the survey's units.
func (g *groundSource) explainTIN(err error) error {
	f := g.formatter()
	var (
		de *tin.DuplicateError
		be *tin.BreaklineError
		re *tin.BoundaryError
		pe *tin.PointError
		oe *tin.OptionError
	)
	msg := ""
	switch {
	case errors.As(err, &de):
		x, y := g.world(de.At)
		var who []string
		for i, ix := range de.Indices {
			if i == 10 {
				who = append(who, fmt.Sprintf("and %d more", len(de.Indices)-10))
				break
			}
			who = append(who, g.pointName(ix))
		}
		who = append(who, de.Breaklines...)
		msg = fmt.Sprintf("shots at E %s, N %s differ in elevation by %s (%s to %s, more than %s): %s; "+
			"fix the survey or use --duplicates mean or first",
			f.coord(x), f.coord(y), f.length(de.ZMaxM-de.ZMinM), f.num(de.ZMinM), f.length(de.ZMaxM),
			f.length(de.TolM), strings.Join(who, ", "))
	case errors.As(err, &be):
		where := ""
		if be.Index >= 0 && be.Index < len(g.lineRefs) {
			where = " (" + g.lineRefs[be.Index] + ")"
		}
		switch {
		case errors.Is(be, tin.ErrBreaklineOutside) && be.Index >= 0 && be.Index < len(g.breaklines) &&
			be.Vertex >= 0 && be.Vertex < len(g.breaklines[be.Index].Pts):
			p := g.breaklines[be.Index].Pts[be.Vertex]
			x, y := g.world(p.XY())
			msg = fmt.Sprintf("breakline %q%s leaves the surveyed area: its vertex %d at E %s, N %s lies %s outside the outermost shots; "+
				"shoot ground beyond it or end the line inside", be.Name, where, be.Vertex+1, f.coord(x), f.coord(y), f.length(be.DistM))
		default:
			msg = fmt.Sprintf("breakline %q%s: %s", be.Name, where, strings.TrimPrefix(be.Err.Error(), "tin: "))
		}
	case errors.As(err, &re):
		where := fmt.Sprintf("boundary %d", re.Ring+1)
		if re.Ring >= 0 && re.Ring < len(g.ringRefs) {
			where = "boundary " + g.ringRefs[re.Ring]
		}
		if errors.Is(re, tin.ErrBoundarySelfIntersect) {
			msg = fmt.Sprintf("%s crosses or touches itself (edges %d and %d): a boundary must be a simple polygon", where, re.EdgeA+1, re.EdgeB+1)
		} else {
			msg = fmt.Sprintf("%s: %s", where, re.Msg)
		}
	case errors.As(err, &pe):
		msg = fmt.Sprintf("%s: coordinate is not a finite number", g.pointName(pe.Index))
	case errors.As(err, &oe):
		return &FlagError{Err: err}
	case errors.Is(err, tin.ErrTooFewPoints):
		msg = fmt.Sprintf("%s: a surface needs at least 3 shots at different positions", plural(len(g.points), "survey point"))
	case errors.Is(err, tin.ErrCollinear):
		msg = fmt.Sprintf("all %s lie on one straight line, so they make no surface: shoot ground to the side of the line", plural(len(g.points), "survey point"))
	case errors.Is(err, tin.ErrEmptySurface):
		msg = "trimming by the boundary and --max-edge leaves no surface: is the boundary over the survey, and --max-edge longer than the shot spacing?"
	case errors.Is(err, tin.ErrTooManyPoints):
		msg = fmt.Sprintf("%s is more than a surface can hold (%d): thin the points (--thin)", plural(len(g.points), "point"), tin.MaxPoints)
	default:
		return &RejectedError{Err: err}
	}
	return &RejectedError{Err: &explainedError{msg: msg, err: err}}
}

// pointName names input point i: "point 17 (shots.csv line 20)".
func (g *groundSource) pointName(i int) string { return "point " + g.shotName(i) }

// shotName names input point i without the word: "17 (shots.csv line 20)".
func (g *groundSource) shotName(i int) string {
	if i < 0 || i >= len(g.pointRefs) {
		return fmt.Sprintf("#%d", i+1)
	}
	r := g.pointRefs[i]
	return fmt.Sprintf("%s (%s line %d)", r.ID, r.File, r.Line)
}

// andList joins words as "a, b and c".
func andList(words []string) string {
	if len(words) < 2 {
		return strings.Join(words, "")
	}
	return strings.Join(words[:len(words)-1], ", ") + " and " + words[len(words)-1]
}

// allWarnings returns the warnings of reading and, once built, of the
// surface, as printed.
func (g *groundSource) allWarnings() []string {
	out := slices.Clone(g.warnings)
	if g.surface != nil {
		for _, w := range g.surface.Warnings() {
			out = append(out, g.prefix()+"surface: "+g.tinWarning(w))
		}
	}
	if out == nil {
		out = []string{}
	}
	return out
}

// printWarnings prints allWarnings on stderr (unless --quiet).
func (g *groundSource) printWarnings(app *App) {
	for _, w := range g.allWarnings() {
		app.Warnf("%s", w)
	}
}

// maxNamedShots is how many shots a warning names before "and N more".
const maxNamedShots = 10

// tinWarning writes a warning of the surface builder for the user: shots
// named by id and line instead of by index, lengths in the survey's units,
// and its place in world coordinates. A message of another form is kept as
// it is.
func (g *groundSource) tinWarning(w tin.Warning) string {
	f := g.formatter()
	x, y := g.world(w.At)
	msg := w.Msg
	if c := w.Conflict; c != nil {
		var who []string
		for k, i := range c.Points {
			if k == maxNamedShots {
				who = append(who, fmt.Sprintf("%d more", len(c.Points)-k))
				break
			}
			who = append(who, g.shotName(i))
		}
		for _, b := range c.Breaklines {
			who = append(who, "breakline "+b)
		}
		msg = fmt.Sprintf("duplicate shots %s differ in elevation by %s (more than %s); kept the %s, %s",
			andList(who), f.length(c.SpreadM), f.length(c.TolM), c.Policy, f.length(c.KeptZM))
	}
	return fmt.Sprintf("%s (near E %s, N %s %s)", msg, f.coord(x), f.coord(y), g.units)
}

// world returns the world coordinates of local position p in the survey's
// units.
func (g *groundSource) world(p geom.Vec2) (x, y float64) {
	w := g.frame.ToWorld(p)
	u := g.units.Metres()
	return w.X / u, w.Y / u
}

// crsText describes the coordinate system for the text summary.
func (g *groundSource) crsText() string {
	s := g.crs.String()
	if g.crs.Name != "" && g.crs.Name != s {
		s += " (" + g.crs.Name + ")"
	}
	if g.geographic {
		s += ", projected from lon/lat"
	}
	return s
}

// inputRows prints one row per input file.
func (g *groundSource) inputRows(t *summaryTable) {
	key := "file"
	if g.req.label != "" {
		key = g.req.label
	}
	if g.xml != nil {
		t.row(key, "%s (LandXML surface %q, %d points, %d faces)", g.req.files[0], g.xml.Name, len(g.xml.Mesh.V), g.xml.Mesh.NumTriangles())
		return
	}
	for _, f := range g.set.Files {
		desc := fmt.Sprintf("%s, %s", f.Format, plural(f.Points, "point"))
		if f.Breaklines > 0 {
			desc += ", " + plural(f.Breaklines, "breakline")
		}
		if f.Boundaries > 0 {
			desc += ", " + plural(f.Boundaries, "boundary")
		}
		t.row(key, "%s (%s)", f.Path, desc)
	}
}

// inputJSON echoes the inputs.
func (g *groundSource) inputJSON() groundInputJSON {
	in := groundInputJSON{Files: []fileJSON{}, Breaklines: slices.Clone(g.req.breaklineFiles), Boundary: g.req.boundaryFile}
	if in.Breaklines == nil {
		in.Breaklines = []string{}
	}
	if g.xml != nil {
		in.Format = "landxml"
		in.Surface = g.xml.Name
		in.Files = append(in.Files, fileJSON{Path: g.req.files[0], Format: "landxml", Points: len(g.xml.Mesh.V),
			CRS: g.crs.String(), UnitM: g.units.Metres()})
		return in
	}
	in.Format = "survey"
	for _, f := range g.set.Files {
		in.Files = append(in.Files, fileJSON{Path: f.Path, Format: f.Format.String(), Columns: f.Columns,
			Points: f.Points, Breaklines: f.Breaklines, Boundaries: f.Boundaries, CRS: f.CRS.String(), UnitM: f.UnitM})
	}
	return in
}

// outputNote says what the coordinates of a GeoJSON file that is not
// lon/lat are, for its "dugout:crs" member.
func (g *groundSource) outputNote() string {
	what := "local site grid"
	if g.crs.Kind != crs.Local {
		what = g.crs.String()
		if g.crs.Name != "" && g.crs.Name != what {
			what += " (" + g.crs.Name + ")"
		}
	}
	return fmt.Sprintf("%s; easting, northing and elevation in %s", what, unitWord(g.units))
}

// unitWord names a unit system in full for files that others read.
func unitWord(u units.System) string {
	switch u {
	case units.Feet:
		return "international feet (0.3048 m)"
	case units.USFeet:
		return "US survey feet (1200/3937 m)"
	}
	return "metres"
}

// geoJSONOut returns how to write GeoJSON of this surface: RFC 7946 lon/lat
// when the survey was lon/lat (local → world → lon/lat by the UTM zone's
// inverse), else world coordinates in the survey's units with a note.
func (g *groundSource) geoJSONOut() (report.CoordMapper, report.GeoJSONMeta) {
	if g.geographic && g.crs.UTM != nil {
		utm := *g.crs.UTM
		fr := g.frame
		return func(p geom.Vec2) (float64, float64) {
			w := fr.ToWorld(p)
			lon, lat, err := utm.Inverse(w.X, w.Y)
			if err != nil {
				return math.NaN(), math.NaN()
			}
			return lon, lat
		}, report.GeoJSONMeta{Geographic: true}
	}
	return g.world, report.GeoJSONMeta{CRSNote: g.outputNote()}
}

// writeTrianglesGeoJSON writes the mesh's triangles. RFC 7946 §4 gives a
// position's third element in metres, so geographic output keeps metres;
// otherwise elevations are in the survey's units like the plan.
func (g *groundSource) writeTrianglesGeoJSON(w io.Writer, m geom.TriMesh) error {
	mapper, meta := g.geoJSONOut()
	z := 1.0
	if !meta.Geographic {
		z = 1 / g.units.Metres()
	}
	return report.WriteTrianglesGeoJSON(w, m, mapper, z, meta)
}

// writeLandXML writes the mesh as LandXML 1.2 in world coordinates and the
// survey's units.
func (g *groundSource) writeLandXML(w io.Writer, m geom.TriMesh) error {
	name := "existing ground"
	var from []string
	for _, f := range g.req.files {
		from = append(from, filepath.Base(f))
	}
	return landxml.Write(w, m, landxml.WriteOptions{
		Name:        name,
		Description: "existing ground from " + strings.Join(from, ", "),
		Units:       landXMLOfSystem(g.units),
		EPSG:        g.crs.EPSG,
		Frame:       g.frame,
		Created:     time.Now(),
	})
}

// ---------------------------------------------------------------------
// Output files and text tables.
// ---------------------------------------------------------------------

// outputFlag is a flag naming an output file.
type outputFlag struct {
	flag, path string
}

// outputs are the checked output files of a command.
type outputs struct {
	paths []outputFlag
	// stdout names the flag whose value is "-", if any.
	stdout string
	// created are folders made by the check, deepest last, removed again
	// by undo when the command fails.
	created []string
}

// checkOutputs makes sure every output file can be written before any
// work starts: its folder exists (it is created, with report.CheckOutputDir)
// and is writable, it is not a folder itself, and no two flags name the
// same file. At most one output may be "-" (stdout).
func checkOutputs(flags ...outputFlag) (*outputs, error) {
	o := &outputs{}
	seen := map[string]string{}
	for _, f := range flags {
		if f.path == "" {
			continue
		}
		if f.path == "-" {
			if o.stdout != "" {
				return nil, flagErrorf("%s - and %s -: only one output can go to stdout", o.stdout, f.flag)
			}
			o.stdout = f.flag
			continue
		}
		abs, err := filepath.Abs(f.path)
		if err != nil {
			return nil, fmt.Errorf("%s %s: %w", f.flag, f.path, err)
		}
		if prev, ok := seen[abs]; ok {
			return nil, flagErrorf("%s and %s name the same file, %s", prev, f.flag, f.path)
		}
		seen[abs] = f.flag
		if fi, err := os.Stat(f.path); err == nil && fi.IsDir() {
			return nil, flagErrorf("%s %s is a folder: give a file name", f.flag, f.path)
		}
		o.paths = append(o.paths, f)
	}
	for _, f := range o.paths {
		dir := filepath.Dir(f.path)
		var missing []string
		for d := dir; ; d = filepath.Dir(d) {
			if _, err := os.Stat(d); !errors.Is(err, fs.ErrNotExist) {
				break
			}
			missing = append(missing, d)
			if filepath.Dir(d) == d {
				break
			}
		}
		if err := report.CheckOutputDir(dir); err != nil {
			o.undo()
			return nil, fmt.Errorf("%s %s: %w", f.flag, f.path, err)
		}
		for i := len(missing) - 1; i >= 0; i-- {
			o.created = append(o.created, missing[i])
		}
	}
	return o, nil
}

// notInputs refuses an output that would overwrite an input file.
func (o *outputs) notInputs(inputs []string) error {
	for _, in := range inputs {
		if in == "" || in == "-" {
			continue
		}
		a, err := filepath.Abs(in)
		if err != nil {
			continue
		}
		for _, f := range o.paths {
			if b, err := filepath.Abs(f.path); err == nil && a == b {
				return flagErrorf("%s %s would overwrite an input file", f.flag, f.path)
			}
		}
	}
	return nil
}

// undo removes the folders the check created, if they are still empty, so
// that a failed command leaves nothing behind.
func (o *outputs) undo() {
	for i := len(o.created) - 1; i >= 0; i-- {
		_ = os.Remove(o.created[i])
	}
	o.created = nil
}

// summaryTable prints key/value rows: aligned in columns on a terminal,
// and as key<TAB>value lines (easy to cut and grep) otherwise.
type summaryTable struct {
	w   io.Writer
	tw  *tabwriter.Writer
	err error
}

func newSummaryTable(w io.Writer, tty bool) *summaryTable {
	t := &summaryTable{w: w}
	if tty {
		t.tw = tabwriter.NewWriter(w, 0, 4, 2, ' ', 0)
		t.w = t.tw
	}
	return t
}

func (t *summaryTable) row(key, format string, args ...any) {
	if t.err != nil {
		return
	}
	_, t.err = fmt.Fprintf(t.w, "%s\t"+format+"\n", append([]any{key}, args...)...)
}

func (t *summaryTable) flush() error {
	if t.err == nil && t.tw != nil {
		t.err = t.tw.Flush()
	}
	return t.err
}

// lengthFormat writes SI values in a unit system with the decimals a
// surveyor reads: 2 in feet (0.01 ft, about 3 mm), 3 in metres (1 mm).
type lengthFormat struct {
	u   units.System
	dec int
}

func (g *groundSource) formatter() lengthFormat { return newLengthFormat(g.units) }

func newLengthFormat(u units.System) lengthFormat {
	f := lengthFormat{u: u, dec: 3}
	if u.IsImperial() {
		f.dec = 2
	}
	return f
}

// num writes a length in metres as a number in the unit.
func (f lengthFormat) num(m float64) string { return fmt.Sprintf("%.*f", f.dec, m/f.u.Metres()) }

// length writes a length in metres with the unit.
func (f lengthFormat) length(m float64) string { return f.num(m) + " " + f.u.String() }

// coord writes a world coordinate already in the unit.
func (f lengthFormat) coord(v float64) string { return fmt.Sprintf("%.*f", f.dec, v) }

// area writes an area in square metres: ft² with 1 decimal, m² with 2.
func (f lengthFormat) area(m2 float64) string {
	u := f.u.Metres()
	if f.u.IsImperial() {
		return fmt.Sprintf("%.1f %s²", m2/(u*u), f.u)
	}
	return fmt.Sprintf("%.2f m²", m2)
}

// plural writes "1 point" or "3 points".
func plural(n int, word string) string {
	if n == 1 {
		return "1 " + word
	}
	if strings.HasSuffix(word, "y") {
		return fmt.Sprintf("%d %sies", n, strings.TrimSuffix(word, "y"))
	}
	return fmt.Sprintf("%d %ss", n, word)
}
