package main

import (
	"context"
	"errors"
	"fmt"
	"strconv"
	"time"

	"github.com/spf13/cobra"

	"github.com/dugout-estimating/dugout/internal/estimate"
	"github.com/dugout-estimating/dugout/internal/report"
	"github.com/dugout-estimating/dugout/internal/sitefile"
)

const estimateLong = `Estimate a pond on the real ground: lay the design's depth zones on the
existing-ground TIN at a level water line, and compute the cut and fill, the
berm, haul-off and truckloads, the liner sheet, the shoreline, edge stone and
gravel with crew time, water volume and pump duty, and the cost when priced.

The job comes from a site file (--site, see the README's "Site file") or from
flags; flags override the site file, and --set section.key=value reaches any
key of it. --report DIR writes the report (report.html), the plan and
sections (SVG), contours (GeoJSON), quantities (JSON and CSV), the
stake-out sheet (CSV) and the finished grade (LandXML), and lists the files
it wrote (on stderr with --json, so that stdout holds one JSON document).
The folder is checked before any work starts.

The summary on stdout is in the job's units with the other system beside
it; --json prints the whole estimate as one JSON document in SI units
instead. Warnings about the data go to stderr.

Water level: an elevation, "auto" (the rim at the lowest ground along the
rim line, so no berm is needed) or "balance" (the level at which the cut
reused as berm fill equals the fill).`

const estimateExample = `  # the job in a site file, with the report
  dugout estimate --site site.toml --report out/

  # a quick what-if: deeper water and a wider berm crest
  dugout estimate --site site.toml --set design.outline.deep_depth=36in --berm-crest 2ft

  # everything from flags
  dugout estimate --points shots.csv --units ft --zones zones.geojson \
      --water-level balance --freeboard 3in --berm-crest 1ft --berm-slope 3 --json`

type estimateOptions struct {
	app       *App
	site      string
	sets      []string
	points    []string
	zones     string
	outline   string
	outCode   string
	level     string
	freeboard string
	crest     string
	slope     string
	units     string
	crs       string
	columns   string
	soil      string
	truck     string
	cell      string
	overlap   string
	report    string
	outUnits  string
	stakes    string

	// now gives the report's date; nil means time.Now (tests fix it).
	now func() time.Time
}

func newEstimateCmd(app *App) *cobra.Command {
	o := &estimateOptions{app: app}
	cmd := &cobra.Command{
		Use:     "estimate [--site <file>] [flags]",
		Short:   "cut and fill, haul, liner, shoreline, stone, water and pump for a pond design",
		Long:    estimateLong,
		Example: estimateExample,
		Args:    cobra.NoArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			return runEstimate(cmd.Context(), o)
		},
	}
	f := cmd.Flags()
	f.StringVar(&o.site, "site", "", "site file (TOML) describing the job")
	f.StringArrayVar(&o.sets, "set", nil, "override any site-file key: section.key=value (repeatable)")
	f.StringArrayVar(&o.points, "points", nil, "survey file (repeatable; replaces survey.files)")
	f.StringVar(&o.zones, "zones", "", "GeoJSON depth zones (design.zones)")
	f.StringVar(&o.outline, "outline", "", "GeoJSON outline polygon of the water's edge (design.outline.file)")
	f.StringVar(&o.outCode, "outline-code", "", "survey code of the walked outline points (design.outline.code)")
	f.StringVar(&o.level, "water-level", "", "water level: an elevation, auto or balance (water.level)")
	f.StringVar(&o.freeboard, "freeboard", "", "rim above the water, a length such as 3in (water.freeboard)")
	f.StringVar(&o.crest, "berm-crest", "", "level berm crest width, a length (berm.crest)")
	f.StringVar(&o.slope, "berm-slope", "", "outer berm slope, horizontal per vertical (berm.slope)")
	f.StringVar(&o.units, "units", "", "units of the survey and of bare lengths: {m|ft|usft} (units)")
	f.StringVar(&o.crs, "crs", "", "coordinate system: {local|auto|EPSG:NNNN} (crs)")
	f.StringVar(&o.columns, "columns", "", "column order of headerless survey files, e.g. PNEZD (survey.columns)")
	f.StringVar(&o.soil, "soil", "", "soil preset: topsoil, sand, clay, common earth, gravel, rock (earthwork.soil)")
	f.StringVar(&o.truck, "truck", "", "truck preset: single-axle, tandem, tri-axle (earthwork.truck)")
	f.StringVar(&o.cell, "cell", "", "lattice cell, a length (design.cell; default: chosen to 0.1 %)")
	f.StringVar(&o.overlap, "liner-overlap", "", "liner anchor allowance beyond the rim, a length (liner.overlap)")
	f.StringVar(&o.outUnits, "out-units", "", "units results are printed in: {m|ft} (out_units)")
	f.StringVar(&o.report, "report", "", "write the report and drawings into this folder")
	f.StringVar(&o.stakes, "stake-spacing", "", "greatest distance between stakes on the cut sheet, a length such as 3ft (report.stake_spacing; default 3 ft or 1 m)")
	return cmd
}

// siteFromFlags loads the site file (if any) and applies the flags on top.
func (o *estimateOptions) siteFromFlags() (*sitefile.Site, error) {
	s := &sitefile.Site{Dir: "."}
	if o.site != "" {
		var err error
		if s, err = sitefile.Load(o.site); err != nil {
			return nil, &RejectedError{Err: err}
		}
	}
	var sets []string
	str := func(key, v string) {
		if v != "" {
			sets = append(sets, key+"="+strconv.Quote(v))
		}
	}
	str("units", o.units)
	str("crs", o.crs)
	str("out_units", o.outUnits)
	str("survey.columns", o.columns)
	str("design.zones", o.zones)
	str("design.outline.file", o.outline)
	str("design.outline.code", o.outCode)
	str("water.level", o.level)
	str("water.freeboard", o.freeboard)
	str("berm.crest", o.crest)
	str("earthwork.soil", o.soil)
	str("earthwork.truck", o.truck)
	str("design.cell", o.cell)
	str("liner.overlap", o.overlap)
	str("report.stake_spacing", o.stakes)
	if o.slope != "" {
		if _, err := strconv.ParseFloat(o.slope, 64); err != nil {
			return nil, flagErrorf("--berm-slope %q: want a number (horizontal per vertical)", o.slope)
		}
		sets = append(sets, "berm.slope="+o.slope)
	}
	sets = append(sets, o.sets...)
	for _, a := range sets {
		if err := s.Set(a); err != nil {
			return nil, flagErrorf("%w", err)
		}
	}
	if len(o.points) > 0 {
		// Paths given on the command line are relative to the working
		// folder, not to the site file.
		s.Survey.Files = nil
		for _, p := range o.points {
			s.Survey.Files = append(s.Survey.Files, absFrom(".", p))
		}
	}
	return s, nil
}

func runEstimate(ctx context.Context, o *estimateOptions) error {
	s, err := o.siteFromFlags()
	if err != nil {
		return err
	}
	if o.report != "" {
		// Before any work: a folder that cannot be written fails now,
		// not after the estimate.
		if err := report.CheckOutputDir(o.report); err != nil {
			return err
		}
	}
	job, err := estimate.FromSite(s)
	if err != nil {
		if errors.Is(err, estimate.ErrJob) {
			return &RejectedError{Err: err}
		}
		return err
	}
	res, err := estimate.Run(ctx, job)
	if err != nil {
		return classify(err)
	}
	return renderEstimate(o.app, res, o)
}

// classify maps a failed run to an exit code: data that was read but
// rejected by validation exits 3.
func classify(err error) error {
	if errors.Is(err, context.Canceled) {
		return err
	}
	var re *RejectedError
	if errors.As(err, &re) {
		return err
	}
	if se := surveyError(err); se != err {
		return se
	}
	return &RejectedError{Err: err}
}

// renderEstimate prints the estimate: warnings on stderr, the summary (or
// with --json the JSON document) on stdout, and with --report the report
// folder, listing the files written on stdout after the summary, or on
// stderr with --json.
func renderEstimate(app *App, r *estimate.Result, o *estimateOptions) error {
	for _, w := range r.Warnings {
		app.Warnf("%s", w)
	}
	date := time.Now()
	if o.now != nil {
		date = o.now()
	}
	if app.JSON {
		if err := report.WriteJSON(app.IO.Out, r); err != nil {
			return err
		}
	} else if err := report.WriteSummary(app.IO.Out, r, report.SummaryOptions{Date: date, WarningsElsewhere: true}); err != nil {
		return err
	}
	if o.report == "" {
		return nil
	}
	files, err := report.WriteReportDir(o.report, r, report.ReportOptions{Date: date, Footer: "dugout " + version})
	if err != nil {
		if errors.Is(err, estimate.ErrStakeout) || errors.Is(err, report.ErrInvalidValue) || errors.Is(err, report.ErrTooLarge) {
			return &RejectedError{Err: err}
		}
		return err
	}
	list := app.IO.Out
	if app.JSON {
		if app.Quiet {
			return nil
		}
		list = app.IO.ErrOut
	} else {
		fmt.Fprintf(list, "\nReport written to %s:\n", o.report)
	}
	for _, f := range files {
		fmt.Fprintln(list, "  "+f)
	}
	return nil
}
