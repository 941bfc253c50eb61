package main

import (
	"context"
	"encoding/json"
	"fmt"
	"io"
	"math"
	"strings"
	"text/tabwriter"

	"github.com/spf13/cobra"

	"github.com/dugout-estimating/dugout/internal/report"
	"github.com/dugout-estimating/dugout/internal/survey"
	"github.com/dugout-estimating/dugout/internal/units"
)

const pointsLong = `Read survey files, check them and summarise what they hold: the number of
points, their extent and elevations, units and coordinate system, breaklines
and boundaries, duplicate and conflicting shots, suspected spikes, accuracy,
and the misclosure of a level book.

Formats are recognised by content: delimited text (total station exports,
with a header or with --columns), lon/lat CSV from a phone or handheld GPS,
GPX, GeoJSON, level books (bs/is/fs columns) and LAS. See
docs/input-formats.md for the columns and conventions.

Points without elevations (a GPX track with no <ele>) are summarised with a
warning; building a surface needs elevations.

--export writes the points in the working grid (world coordinates) as CSV
with the header id,easting,northing,elevation,description.`

const pointsExample = `  # a total station export without header, in feet
  dugout points --units ft --columns PNEZD site.txt

  # phone GPS points, projected to their UTM zone, exported in metres
  dugout points gps.csv --export gps-utm.csv

  # LiDAR ground points thinned to one per 1 ft cell
  dugout points --thin 1ft tile.las --json`

// pointsOptions holds the parsed arguments of `dugout points`.
type pointsOptions struct {
	app      *App
	files    []string
	survey   surveyFlags
	export   string
	outUnits string
}

// newPointsCmd returns the `points` command.
func newPointsCmd(app *App) *cobra.Command {
	opts := &pointsOptions{app: app}
	cmd := &cobra.Command{
		Use:     "points <file>... [flags]",
		Short:   "read, check and summarise survey points",
		Long:    pointsLong,
		Example: pointsExample,
		Args:    cobra.MinimumNArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			opts.files = args
			return runPoints(cmd.Context(), opts)
		},
	}
	opts.survey.add(cmd)
	fl := cmd.Flags()
	fl.StringVar(&opts.export, "export", "", "write the points to this CSV file in the working grid (\"-\" for stdout)")
	fl.StringVar(&opts.outUnits, "out-units", "", "units of the summary and of --export: {m|ft|usft} (default: the input's)")
	return cmd
}

// runPoints reads, validates and reports.
func runPoints(ctx context.Context, opts *pointsOptions) error {
	app := opts.app
	opt, err := opts.survey.options()
	if err != nil {
		return err
	}
	var out units.System
	if opts.outUnits != "" {
		if out, err = units.ParseSystem(opts.outUnits); err != nil {
			return flagErrorf("--out-units: %w", err)
		}
	}
	// Checking a file does not need elevations; building on it does.
	opt.AllowMissingZ = true
	if app.Progress() {
		opt.Progress = func(done, total int64) {
			if total > 0 {
				fmt.Fprintf(app.IO.ErrOut, "\rreading %3d%%", done*100/total)
			}
		}
	}
	s, err := survey.Read(opts.files, opt)
	if opt.Progress != nil {
		fmt.Fprint(app.IO.ErrOut, "\r            \r")
	}
	if err != nil {
		return surveyError(err)
	}
	if err := ctx.Err(); err != nil {
		return err
	}
	sum := s.Summary()
	for _, w := range sum.Warnings {
		app.Warnf("%s", w)
	}
	show := s.Units
	export := opt.Units
	if opts.outUnits != "" {
		show, export = out, out
	}
	if opts.export == "-" {
		return survey.WriteCSV(app.IO.Out, s, export)
	}
	if opts.export != "" {
		if err := report.WriteFileAtomic(opts.export, func(w io.Writer) error { return survey.WriteCSV(w, s, export) }); err != nil {
			return err
		}
	}
	if app.JSON {
		return writePointsJSON(app.IO.Out, s, &sum, opts)
	}
	return writePointsText(app.IO.Out, s, &sum, show)
}

// writePointsText prints the summary for a surveyor, aligned, lengths in
// unit system u.
func writePointsText(w io.Writer, s *survey.Set, sum *survey.Summary, u units.System) error {
	tw := tabwriter.NewWriter(w, 0, 4, 2, ' ', 0)
	dec := 3
	if u.IsImperial() {
		dec = 2
	}
	l := func(m float64) string { return fmt.Sprintf("%.*f %s", dec, m/u.Metres(), u) }
	num := func(m float64) string { return fmt.Sprintf("%.*f", dec, m/u.Metres()) }
	row := func(k, format string, args ...any) { fmt.Fprintf(tw, "%s\t"+format+"\n", append([]any{k}, args...)...) }

	for _, f := range sum.Files {
		desc := fmt.Sprintf("%s, %d points", f.Format, f.Points)
		if f.Breaklines > 0 {
			desc += fmt.Sprintf(", %d breaklines", f.Breaklines)
		}
		if f.Boundaries > 0 {
			desc += fmt.Sprintf(", %d boundaries", f.Boundaries)
		}
		if f.Columns != "" {
			desc += " (columns " + f.Columns + ")"
		}
		row("file", "%s\t%s", f.Path, desc)
	}
	pts := fmt.Sprint(sum.Count)
	if sum.MissingZ > 0 {
		pts += fmt.Sprintf(" (%d without elevation)", sum.MissingZ)
	}
	row("points", "%s", pts)
	row("units", "%s", s.Units)
	crsText := sum.CRS.String()
	if sum.CRS.Name != "" && sum.CRS.Name != crsText {
		crsText += " (" + sum.CRS.Name + ")"
	}
	if sum.Geographic {
		crsText += ", projected from lon/lat"
	}
	row("crs", "%s", crsText)
	if b := sum.Bounds(u); !b.IsEmpty() {
		row("bounds", "E %s to %s, N %s to %s (%s × %s)", num(sum.BoundsM.Min.X), num(sum.BoundsM.Max.X),
			num(sum.BoundsM.Min.Y), num(sum.BoundsM.Max.Y), num(sum.BoundsM.Width()), l(sum.BoundsM.Height()))
	}
	if !sum.LonLat.IsEmpty() {
		row("lon/lat", "%.7f to %.7f, %.7f to %.7f", sum.LonLat.Min.X, sum.LonLat.Max.X, sum.LonLat.Min.Y, sum.LonLat.Max.Y)
	}
	if !math.IsNaN(sum.ElevMinM) {
		row("elevation", "%s to %s", num(sum.ElevMinM), l(sum.ElevMaxM))
	}
	if len(s.Breaklines) > 0 {
		var parts []string
		for _, b := range s.Breaklines {
			parts = append(parts, fmt.Sprintf("%s (%d points, %s)", b.Name, len(b.Pts), l(b.Length())))
		}
		row("breaklines", "%s", strings.Join(parts, ", "))
	}
	if len(s.Boundaries) > 0 {
		var parts []string
		for _, b := range s.Boundaries {
			parts = append(parts, fmt.Sprintf("%s (%d vertices)", b.Name, len(b.Ring)))
		}
		row("boundaries", "%s", strings.Join(parts, ", "))
	}
	dup := fmt.Sprintf("%d exact, %d within %s", sum.ExactDuplicates, sum.NearDuplicates, l(sum.DupTolM))
	if len(sum.Conflicts) > 0 {
		dup += fmt.Sprintf("; %d conflicting (elevations more than %s apart)", len(sum.Conflicts), l(sum.ConflictTolM))
	}
	row("duplicates", "%s", dup)
	switch {
	case math.IsNaN(sum.SpikeThresholdM):
		row("spikes", "not tested (too few points)")
	case len(sum.Spikes) == 0:
		row("spikes", "none beyond %s", l(sum.SpikeThresholdM))
	default:
		var parts []string
		for i, sp := range sum.Spikes {
			if i == 5 {
				parts = append(parts, fmt.Sprintf("and %d more", len(sum.Spikes)-5))
				break
			}
			parts = append(parts, fmt.Sprintf("%s (line %d, %+.*f %s beyond its neighbours)", sp.Point.ID, sp.Point.Line, dec, sp.BeyondM/u.Metres(), u))
		}
		row("spikes", "%d suspected: %s", len(sum.Spikes), strings.Join(parts, ", "))
	}
	for _, a := range []struct {
		name string
		acc  survey.Accuracy
	}{{"horizontal", sum.HAcc}, {"vertical", sum.VAcc}} {
		if a.acc.N > 0 {
			row("accuracy", "%s: min %s, median %s, 95%% %s, max %s (%d points)", a.name,
				num(a.acc.MinM), num(a.acc.MedianM), num(a.acc.P95M), l(a.acc.MaxM), a.acc.N)
		}
	}
	for _, f := range sum.Files {
		if lv := f.Levels; lv != nil {
			text := fmt.Sprintf("%s: %d setups, %d turning points", f.Path, lv.Setups, lv.TurningPoints)
			if len(lv.Checks) == 0 {
				text += ", no closing check"
			}
			for _, c := range lv.Checks {
				text += fmt.Sprintf("; misclosure %+.*f %s on %s (line %d)", dec+1, c.MisclosureM/u.Metres(), u, c.Point, c.Line)
			}
			row("levelling", "%s", text)
		}
	}
	if n := len(sum.Warnings); n > 0 {
		row("warnings", "%d (on stderr)", n)
	}
	return tw.Flush()
}

// pointsJSON is the --json document of `dugout points` (schema 1). Lengths
// are in metres (suffix _m), world coordinates of the working grid.
type pointsJSON struct {
	SchemaVersion int             `json:"schema_version"`
	Files         []fileJSON      `json:"files"`
	Options       optionsJSON     `json:"options"`
	Count         int             `json:"count"`
	MissingZ      int             `json:"missing_elevation"`
	Units         string          `json:"units"`
	CRS           crsJSON         `json:"crs"`
	Geographic    bool            `json:"geographic"`
	FrameOrigin   [2]float64      `json:"frame_origin_m"`
	Bounds        *boundsJSON     `json:"bounds"`
	LonLat        *lonLatJSON     `json:"lonlat_bounds,omitempty"`
	ElevMin       *float64        `json:"elevation_min_m"`
	ElevMax       *float64        `json:"elevation_max_m"`
	Breaklines    []breaklineJSON `json:"breaklines"`
	Boundaries    []boundaryJSON  `json:"boundaries"`
	Duplicates    duplicatesJSON  `json:"duplicates"`
	Spikes        spikesJSON      `json:"spikes"`
	Accuracy      accuracyJSON    `json:"accuracy"`
	Levelling     []levellingJSON `json:"levelling,omitempty"`
	Warnings      []warningJSON   `json:"warnings"`
}

type fileJSON struct {
	Path       string  `json:"path"`
	Format     string  `json:"format"`
	Columns    string  `json:"columns,omitempty"`
	Points     int     `json:"points"`
	Breaklines int     `json:"breaklines"`
	Boundaries int     `json:"boundaries"`
	CRS        string  `json:"crs"`
	UnitM      float64 `json:"unit_m"`
}

type optionsJSON struct {
	Units          string   `json:"units"`
	CRS            string   `json:"crs"`
	Columns        string   `json:"columns,omitempty"`
	BreaklineCodes []string `json:"breakline_codes"`
}

type crsJSON struct {
	Kind string `json:"kind"`
	EPSG int    `json:"epsg,omitempty"`
	Name string `json:"name"`
}

type boundsJSON struct {
	MinE float64 `json:"min_easting_m"`
	MinN float64 `json:"min_northing_m"`
	MaxE float64 `json:"max_easting_m"`
	MaxN float64 `json:"max_northing_m"`
}

type lonLatJSON struct {
	MinLon float64 `json:"min_lon_deg"`
	MinLat float64 `json:"min_lat_deg"`
	MaxLon float64 `json:"max_lon_deg"`
	MaxLat float64 `json:"max_lat_deg"`
}

type pointRefJSON struct {
	ID   string `json:"id"`
	File string `json:"file"`
	Line int    `json:"line"`
}

type breaklineJSON struct {
	Name    string  `json:"name"`
	Code    string  `json:"code"`
	Points  int     `json:"points"`
	LengthM float64 `json:"length_m"`
	File    string  `json:"file"`
	Line    int     `json:"line"`
}

type boundaryJSON struct {
	Name     string  `json:"name"`
	Vertices int     `json:"vertices"`
	AreaM2   float64 `json:"area_m2"`
	File     string  `json:"file"`
	Feature  int     `json:"feature"`
}

type duplicatesJSON struct {
	Exact        int            `json:"exact"`
	Near         int            `json:"near"`
	TolM         float64        `json:"tolerance_m"`
	ConflictTolM float64        `json:"conflict_tolerance_m"`
	Conflicts    []conflictJSON `json:"conflicts"`
}

type conflictJSON struct {
	Point     pointRefJSON `json:"point"`
	Of        pointRefJSON `json:"of"`
	PlanDistM float64      `json:"plan_distance_m"`
	DzM       float64      `json:"dz_m"`
}

type spikesJSON struct {
	ThresholdM *float64    `json:"threshold_m"`
	Points     []spikeJSON `json:"points"`
}

type spikeJSON struct {
	Point     pointRefJSON `json:"point"`
	ResidualM float64      `json:"residual_m"`
	BeyondM   float64      `json:"beyond_neighbours_m"`
}

type accuracyJSON struct {
	Horizontal *accJSON `json:"horizontal,omitempty"`
	Vertical   *accJSON `json:"vertical,omitempty"`
}

type accJSON struct {
	Count   int     `json:"count"`
	MinM    float64 `json:"min_m"`
	MedianM float64 `json:"median_m"`
	P95M    float64 `json:"p95_m"`
	MaxM    float64 `json:"max_m"`
}

type levellingJSON struct {
	File          string      `json:"file"`
	Setups        int         `json:"setups"`
	TurningPoints int         `json:"turning_points"`
	Checks        []checkJSON `json:"checks"`
}

type checkJSON struct {
	Point       string  `json:"point"`
	Line        int     `json:"line"`
	ComputedM   float64 `json:"computed_m"`
	KnownM      float64 `json:"known_m"`
	MisclosureM float64 `json:"misclosure_m"`
}

type warningJSON struct {
	File    string `json:"file,omitempty"`
	Line    int    `json:"line,omitempty"`
	Message string `json:"message"`
}

func refJSON(r survey.PointRef) pointRefJSON {
	return pointRefJSON{ID: r.ID, File: r.File, Line: r.Line}
}

func finite(v float64) *float64 {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return nil
	}
	return &v
}

func writePointsJSON(w io.Writer, s *survey.Set, sum *survey.Summary, opts *pointsOptions) error {
	codes := opts.survey.breaklineCodes
	if codes == nil {
		codes = []string{"BL"}
	}
	doc := pointsJSON{
		SchemaVersion: 1,
		Options:       optionsJSON{Units: opts.survey.units, CRS: opts.survey.crs, Columns: opts.survey.columns, BreaklineCodes: codes},
		Count:         sum.Count,
		MissingZ:      sum.MissingZ,
		Units:         s.Units.String(),
		CRS:           crsJSON{Kind: sum.CRS.Kind.String(), EPSG: sum.CRS.EPSG, Name: sum.CRS.Name},
		Geographic:    sum.Geographic,
		FrameOrigin:   [2]float64{s.Frame.Origin.X, s.Frame.Origin.Y},
		ElevMin:       finite(sum.ElevMinM),
		ElevMax:       finite(sum.ElevMaxM),
		Breaklines:    []breaklineJSON{},
		Boundaries:    []boundaryJSON{},
		Duplicates: duplicatesJSON{Exact: sum.ExactDuplicates, Near: sum.NearDuplicates, TolM: sum.DupTolM,
			ConflictTolM: sum.ConflictTolM, Conflicts: []conflictJSON{}},
		Spikes:   spikesJSON{ThresholdM: finite(sum.SpikeThresholdM), Points: []spikeJSON{}},
		Warnings: []warningJSON{},
	}
	for _, f := range sum.Files {
		doc.Files = append(doc.Files, fileJSON{Path: f.Path, Format: f.Format.String(), Columns: f.Columns,
			Points: f.Points, Breaklines: f.Breaklines, Boundaries: f.Boundaries, CRS: f.CRS.String(), UnitM: f.UnitM})
		if lv := f.Levels; lv != nil {
			l := levellingJSON{File: f.Path, Setups: lv.Setups, TurningPoints: lv.TurningPoints, Checks: []checkJSON{}}
			for _, c := range lv.Checks {
				l.Checks = append(l.Checks, checkJSON{Point: c.Point, Line: c.Line, ComputedM: c.ComputedM, KnownM: c.KnownM, MisclosureM: c.MisclosureM})
			}
			doc.Levelling = append(doc.Levelling, l)
		}
	}
	if b := sum.BoundsM; !b.IsEmpty() {
		doc.Bounds = &boundsJSON{MinE: b.Min.X, MinN: b.Min.Y, MaxE: b.Max.X, MaxN: b.Max.Y}
	}
	if b := sum.LonLat; !b.IsEmpty() {
		doc.LonLat = &lonLatJSON{MinLon: b.Min.X, MinLat: b.Min.Y, MaxLon: b.Max.X, MaxLat: b.Max.Y}
	}
	for _, b := range s.Breaklines {
		doc.Breaklines = append(doc.Breaklines, breaklineJSON{Name: b.Name, Code: b.Code, Points: len(b.Pts), LengthM: b.Length(), File: b.File, Line: b.Line})
	}
	for _, b := range s.Boundaries {
		doc.Boundaries = append(doc.Boundaries, boundaryJSON{Name: b.Name, Vertices: len(b.Ring), AreaM2: math.Abs(b.Ring.Area()), File: b.File, Feature: b.Feature})
	}
	for _, d := range sum.Conflicts {
		doc.Duplicates.Conflicts = append(doc.Duplicates.Conflicts, conflictJSON{Point: refJSON(d.Point), Of: refJSON(d.Of), PlanDistM: d.PlanDistM, DzM: d.DzM})
	}
	for _, sp := range sum.Spikes {
		doc.Spikes.Points = append(doc.Spikes.Points, spikeJSON{Point: refJSON(sp.Point), ResidualM: sp.ResidualM, BeyondM: sp.BeyondM})
	}
	acc := func(a survey.Accuracy) *accJSON {
		if a.N == 0 {
			return nil
		}
		return &accJSON{Count: a.N, MinM: a.MinM, MedianM: a.MedianM, P95M: a.P95M, MaxM: a.MaxM}
	}
	doc.Accuracy = accuracyJSON{Horizontal: acc(sum.HAcc), Vertical: acc(sum.VAcc)}
	for _, wn := range sum.Warnings {
		doc.Warnings = append(doc.Warnings, warningJSON{File: wn.File, Line: wn.Line, Message: wn.Msg})
	}
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	return enc.Encode(doc)
}
