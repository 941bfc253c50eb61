package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"math"

	"github.com/spf13/cobra"

	"github.com/dugout-estimating/dugout/internal/crs"
	"github.com/dugout-estimating/dugout/internal/cutfill"
	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/survey"
	"github.com/dugout-estimating/dugout/internal/tin"
	"github.com/dugout-estimating/dugout/internal/units"
)

const compareLong = `Measure what was really moved on site by comparing two surveys of the same
ground: BEFORE, shot before digging, and AFTER, the as-built survey shot when
the work is done. This is how a contractor proves pay quantities after the
dig: the cut and fill come from the two surfaces themselves, not from the
plan.

Each file is a survey (any format the points command reads) or a LandXML
surface. Each is triangulated on its own, with its own breaklines, and the
two are laid over each other in one frame: the cut is where AFTER lies below
BEFORE, the fill where it lies above, integrated exactly over the area both
surfaces cover (or over --boundary, a GeoJSON polygon, within it). Shoot the
as-built over the whole worked area and a little beyond, on the same control.

Both surveys must be in the same coordinate system. When they were measured
in different units, give --before-units and --after-units. Volumes are bank
measure (in place), in cubic yards and cubic feet for feet surveys, or cubic
metres.`

const compareExample = `  # the pond pit, before digging and as built, both shot in feet
  dugout compare --units ft before.csv asbuilt.csv

  # only within the pay limit, the as-built in metres
  dugout compare --before-units ft --after-units m before.csv asbuilt.csv --boundary pay-limit.geojson

  # a LandXML surface from the design office against the as-built shots
  dugout compare --units ft existing.xml asbuilt.csv --json`

// compareOptions holds the parsed arguments of `dugout compare`.
type compareOptions struct {
	app         *App
	before      string
	after       string
	survey      surveyFlags
	beforeUnits string
	afterUnits  string
	boundary    string
	unitsSet    bool
}

// newCompareCmd returns the `compare` command.
func newCompareCmd(app *App) *cobra.Command {
	return compareCmdWith(app, runCompare)
}

// compareCmdWith returns the `compare` command running runF, so that tests can
// check the flags as parsed.
func compareCmdWith(app *App, runF func(context.Context, *compareOptions) error) *cobra.Command {
	opts := &compareOptions{app: app}
	cmd := &cobra.Command{
		Use:     "compare <before> <after> [flags]",
		Short:   "measure cut and fill between a before and an as-built survey",
		Long:    compareLong,
		Example: compareExample,
		Args:    cobra.ExactArgs(2),
		RunE: func(cmd *cobra.Command, args []string) error {
			opts.before, opts.after = args[0], args[1]
			opts.unitsSet = cmd.Flags().Changed("units")
			return runF(cmd.Context(), opts)
		},
	}
	opts.survey.add(cmd)
	fl := cmd.Flags()
	fl.StringVar(&opts.beforeUnits, "before-units", "", "units of BEFORE when they differ from --units: {m|ft|usft}")
	fl.StringVar(&opts.afterUnits, "after-units", "", "units of AFTER when they differ from --units: {m|ft|usft}")
	fl.StringVar(&opts.boundary, "boundary", "", "GeoJSON polygon to measure within (read in --units if given, else in BEFORE's units)")
	return cmd
}

// runCompare reads both surfaces into one frame, triangulates them and
// integrates their difference.
func runCompare(ctx context.Context, opts *compareOptions) error {
	app := opts.app
	opt, err := opts.survey.options()
	if err != nil {
		return err
	}
	sideOpt := func(flag, value string) (survey.Options, bool, error) {
		o := opt
		if value == "" {
			return o, opts.unitsSet, nil
		}
		u, err := units.ParseSystem(value)
		if err != nil {
			return o, false, flagErrorf("%s: %w", flag, err)
		}
		o.Units = u
		return o, true, nil
	}
	beforeOpt, beforeSet, err := sideOpt("--before-units", opts.beforeUnits)
	if err != nil {
		return err
	}
	afterOpt, afterSet, err := sideOpt("--after-units", opts.afterUnits)
	if err != nil {
		return err
	}

	before, err := readGround(app, groundRequest{files: []string{opts.before}, opt: beforeOpt, unitsSet: beforeSet, label: "before"})
	if err != nil {
		return err
	}
	afterReq := groundRequest{files: []string{opts.after}, opt: afterOpt, unitsSet: afterSet, label: "after"}
	after, err := readGround(app, afterReq)
	if err != nil {
		return err
	}
	if before.geographic && after.geographic && !sameSystem(before.crs, after.crs) && isAutoSpec(opt.CRS) {
		// Lon/lat surveys of one site near a zone boundary can fall in
		// different UTM zones when each picks its own; put AFTER in
		// BEFORE's.
		afterReq.opt.CRS = crs.Spec{CRS: before.crs}
		if after, err = readGround(app, afterReq); err != nil {
			return err
		}
	}
	if !sameSystem(before.crs, after.crs) {
		return &RejectedError{Err: fmt.Errorf("%w: before is in %s, after in %s: the two surveys must be in one coordinate system (name it with --crs)",
			survey.ErrMixedCRS, before.crs, after.crs)}
	}
	after.shift(before.frame)
	var rings []geom.Ring
	if opts.boundary != "" {
		bo := opt
		if !opts.unitsSet {
			bo.Units = before.units
		}
		if rings, err = readCompareBoundary(opts.boundary, bo, before); err != nil {
			return err
		}
	}
	if err := ctx.Err(); err != nil {
		return err
	}
	tinOpt := tin.Options{MergeTolM: survey.DefaultDupTolM}
	bs, err := before.build(tinOpt)
	if err != nil {
		return err
	}
	as, err := after.build(tinOpt)
	if err != nil {
		return err
	}
	if err := ctx.Err(); err != nil {
		return err
	}
	res, err := cutfill.Compare(bs.Mesh(), as.Mesh(), rings)
	if err != nil {
		var be *cutfill.BoundaryError
		if errors.As(err, &be) {
			return &RejectedError{Err: fmt.Errorf("--boundary %s: %w", opts.boundary, err)}
		}
		return err
	}
	if !(res.AreaM2 > 0) {
		what := "the two surfaces do not overlap"
		if len(rings) > 0 {
			what = "the two surfaces and --boundary have no area in common"
		}
		return &RejectedError{Err: fmt.Errorf("%s: are they of the same site, in the same coordinate system and units?", what)}
	}
	before.printWarnings(app)
	after.printWarnings(app)
	c := &comparison{before: before, after: after, boundary: opts.boundary, rings: len(rings), res: res}
	if app.JSON {
		return writeCompareJSON(app.IO.Out, c, opts)
	}
	return writeCompareText(app.IO.Out, app.IO.OutIsTTY, c)
}

// isAutoSpec reports whether a --crs value asks for the automatic choice.
func isAutoSpec(s crs.Spec) bool { return s.Auto || s == (crs.Spec{}) }

// sameSystem reports whether two coordinate systems are the same: equal
// EPSG codes, or both the local site grid.
func sameSystem(a, b crs.CRS) bool {
	if a.EPSG != 0 || b.EPSG != 0 {
		return a.EPSG == b.EPSG
	}
	return a.Kind == b.Kind && a.Kind == crs.Local
}

// readCompareBoundary reads the polygons of a boundary file in the
// coordinate system of the before survey and moves them into its frame.
func readCompareBoundary(path string, opt survey.Options, before *groundSource) ([]geom.Ring, error) {
	// Read in BEFORE's system, so that a grid file is taken as that grid
	// and lon/lat goes to BEFORE's UTM zone.
	opt.CRS = crs.Spec{CRS: before.crs}
	opt.AllowMissingZ = true
	set, err := survey.Read([]string{path}, opt)
	if err != nil {
		return nil, labelled("--boundary", surveyError(err))
	}
	if !sameSystem(set.CRS, before.crs) {
		return nil, &RejectedError{Err: fmt.Errorf("%w: --boundary %s is in %s, the surveys in %s", survey.ErrMixedCRS, path, set.CRS, before.crs)}
	}
	for _, w := range set.Warnings {
		before.warnings = append(before.warnings, "boundary: "+w.String())
	}
	if len(set.Boundaries) == 0 {
		return nil, &RejectedError{Err: fmt.Errorf("--boundary %s: no polygon in the file", path)}
	}
	d := set.Frame.Origin.Sub(before.frame.Origin)
	var rings []geom.Ring
	for _, b := range set.Boundaries {
		r := make(geom.Ring, len(b.Ring))
		for i, p := range b.Ring {
			r[i] = p.Add(d)
		}
		rings = append(rings, r)
	}
	return rings, nil
}

// comparison is what compare reports.
type comparison struct {
	before, after *groundSource
	boundary      string
	rings         int
	res           cutfill.CompareResult
}

// volumeText writes a volume in m³ as cubic yards and feet for feet
// surveys, else cubic metres.
func volumeText(m3 float64, u units.System) string {
	if u.IsImperial() {
		return fmt.Sprintf("%.2f yd³ (%.1f ft³)", m3/units.CubicYard, m3/units.CubicFoot)
	}
	return fmt.Sprintf("%.2f m³", m3)
}

// writeCompareText prints the comparison in BEFORE's units.
func writeCompareText(w io.Writer, tty bool, c *comparison) error {
	t := newSummaryTable(w, tty)
	u := c.before.units
	f := newLengthFormat(u)
	c.before.inputRows(t)
	c.after.inputRows(t)
	if c.boundary != "" {
		t.row("boundary", "%s (%s)", c.boundary, plural(c.rings, "polygon"))
	}
	t.row("units", "%s", u)
	t.row("crs", "%s", c.before.crsText())
	t.row("before area", "%s", f.area(c.before.surface.PlanArea()))
	t.row("after area", "%s", f.area(c.after.surface.PlanArea()))
	t.row("common area", "%s", f.area(c.res.AreaM2))
	t.row("cut", "%s", volumeText(c.res.CutM3, u))
	t.row("fill", "%s", volumeText(c.res.FillM3, u))
	net := volumeText(math.Abs(c.res.NetM3), u)
	switch {
	case c.res.NetM3 > 0:
		net += " more cut than fill"
	case c.res.NetM3 < 0:
		net += " more fill than cut"
	}
	t.row("net", "%s", net)
	if n := len(c.before.allWarnings()) + len(c.after.allWarnings()); n > 0 {
		t.row("warnings", "%d (on stderr)", n)
	}
	return t.flush()
}

// compareJSON is the --json document of `dugout compare` (schema 1).
// Volumes are cubic metres (bank measure), areas square metres.
type compareJSON struct {
	SchemaVersion int             `json:"schema_version"`
	Before        compareSideJSON `json:"before"`
	After         compareSideJSON `json:"after"`
	Boundary      string          `json:"boundary_file,omitempty"`
	Options       compareOptsJSON `json:"options"`
	Units         string          `json:"units"`
	CRS           crsJSON         `json:"crs"`
	FrameOrigin   [2]float64      `json:"frame_origin_m"`
	CutM3         float64         `json:"cut_m3"`
	FillM3        float64         `json:"fill_m3"`
	NetM3         float64         `json:"net_m3"`
	AreaM2        float64         `json:"area_m2"`
	OverlayCells  int             `json:"overlay_cells"`
	Warnings      []string        `json:"warnings"`
}

type compareSideJSON struct {
	Input      groundInputJSON `json:"input"`
	Units      string          `json:"units"`
	Vertices   int             `json:"vertices"`
	Triangles  int             `json:"triangles"`
	PlanAreaM2 float64         `json:"plan_area_m2"`
}

type compareOptsJSON struct {
	Units       string `json:"units"`
	BeforeUnits string `json:"before_units,omitempty"`
	AfterUnits  string `json:"after_units,omitempty"`
	CRS         string `json:"crs"`
}

func compareSide(g *groundSource) compareSideJSON {
	sum := g.surface.Summary()
	return compareSideJSON{Input: g.inputJSON(), Units: g.units.String(), Vertices: sum.Vertices,
		Triangles: sum.Triangles, PlanAreaM2: sum.PlanAreaM2}
}

func writeCompareJSON(w io.Writer, c *comparison, opts *compareOptions) error {
	b := c.before
	doc := compareJSON{
		SchemaVersion: 1,
		Before:        compareSide(c.before),
		After:         compareSide(c.after),
		Boundary:      c.boundary,
		Options: compareOptsJSON{Units: opts.survey.units, BeforeUnits: opts.beforeUnits,
			AfterUnits: opts.afterUnits, CRS: opts.survey.crs},
		Units:        b.units.String(),
		CRS:          crsJSON{Kind: b.crs.Kind.String(), EPSG: b.crs.EPSG, Name: b.crs.Name},
		FrameOrigin:  [2]float64{b.frame.Origin.X, b.frame.Origin.Y},
		CutM3:        c.res.CutM3,
		FillM3:       c.res.FillM3,
		NetM3:        c.res.NetM3,
		AreaM2:       c.res.AreaM2,
		OverlayCells: c.res.Triangles,
		Warnings:     append(c.before.allWarnings(), c.after.allWarnings()...),
	}
	return encodeJSON(w, doc)
}
