package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"math"

	"github.com/spf13/cobra"

	"github.com/dugout-estimating/dugout/internal/contours"
	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/report"
	"github.com/dugout-estimating/dugout/internal/survey"
	"github.com/dugout-estimating/dugout/internal/tin"
	"github.com/dugout-estimating/dugout/internal/units"
)

const contoursLong = `Draw contour lines of the existing ground: the surface of the survey (as
the surface command builds it, breaklines included) or of a LandXML surface,
cut at every --interval of elevation.

The interval is a length in the survey's units or with its own unit (0.5ft,
10cm). Lines fall on whole multiples of it counted from --base (0 unless
given) in the survey's own datum, so a 0.5 ft interval gives 99.0, 99.5,
100.0 ft... Every --index-every'th line (every 5th unless given) is an
index contour, drawn heavier on a plan.

--geojson writes the lines as GeoJSON LineStrings with their elevation (in
the survey's units), whether they are index lines and whether they close:
longitude/latitude when the survey was lon/lat, else the survey's grid and
units, said in the file. The file is written only when everything
succeeded. --smooth rounds the corners of the lines without letting them
cross each other or leave the ground they describe.`

const contoursExample = `  # half-foot contours of the demo yard, index every 2.5 ft
  dugout contours --units ft testdata/demo/yard_total_station.csv --interval 0.5

  # 10 cm contours on a metric survey, smoothed, for a drawing program
  dugout contours site.csv --interval 10cm --smooth --geojson contours.geojson

  # 1 ft contours of a LandXML surface, index every 10 ft
  dugout contours ground.xml --interval 1ft --index-every 10 --json`

// contoursOptions holds the parsed arguments of `dugout contours`.
type contoursOptions struct {
	app        *App
	file       string
	survey     surveyFlags
	interval   string
	base       string
	indexEvery int
	geojsonOut string
	smooth     bool
	unitsSet   bool
}

// newContoursCmd returns the `contours` command.
func newContoursCmd(app *App) *cobra.Command {
	return contoursCmdWith(app, runContours)
}

// contoursCmdWith returns the `contours` command running runF, so that tests can
// check the flags as parsed.
func contoursCmdWith(app *App, runF func(context.Context, *contoursOptions) error) *cobra.Command {
	opts := &contoursOptions{app: app}
	cmd := &cobra.Command{
		Use:     "contours <file> --interval <length> [flags]",
		Short:   "contour lines of the existing ground",
		Long:    contoursLong,
		Example: contoursExample,
		Args:    cobra.ExactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			opts.file = args[0]
			opts.unitsSet = cmd.Flags().Changed("units")
			return runF(cmd.Context(), opts)
		},
	}
	opts.survey.add(cmd)
	fl := cmd.Flags()
	fl.StringVar(&opts.interval, "interval", "", "elevation between lines, a length such as 0.5ft or 10cm (a bare number is in the survey's units); required")
	fl.StringVar(&opts.base, "base", "", "an elevation the lines fall on, a length (default 0)")
	fl.IntVar(&opts.indexEvery, "index-every", contours.DefaultIndexEvery, "every Nth line is an index contour")
	fl.StringVar(&opts.geojsonOut, "geojson", "", "write the lines to this GeoJSON file (\"-\" for stdout)")
	fl.BoolVar(&opts.smooth, "smooth", false, "round the corners of the lines")
	return cmd
}

// contourLevels are the parsed --interval and --base, in metres.
type contourLevels struct {
	intervalM, baseM float64
}

// levelDigits is the number of significant digits to which --interval and
// --base are rounded in the survey's unit. A length written in another
// unit picks up round-off on its way through metres (12in is
// 0.30479999999999996 m, 0.9999999999999999 ft); rounded to 12 digits it
// is again the decimal the user meant (1 ft), whose multiples in metres are
// bit for bit the survey's own elevations converted the same way, so a shot
// at 100.00 ft lies exactly on the 100 ft contour. Twelve digits keep
// 0.01 mm on a 10 000 ft datum.
const levelDigits = 12

// minLineM is the shortest contour line kept, 1 µm. A shot whose elevation
// is a level in the survey's decimal datum but one unit in the last place
// off it in binary (k × 0.1 ft is not always the double nearest the decimal)
// leaves a ring or a stub around itself of about 1e-12 m; such lines are
// round-off, not ground, and are dropped. No survey resolves a micrometre.
const minLineM = 1e-6

// roundInUnit rounds a length m (metres) to levelDigits significant digits
// in unit u and returns it in metres.
func roundInUnit(m float64, u units.System) float64 {
	f := u.Metres()
	v := m / f
	if v == 0 || math.IsInf(v, 0) || math.IsNaN(v) {
		return m
	}
	e := math.Pow10(levelDigits - 1 - int(math.Floor(math.Log10(math.Abs(v)))))
	return math.Round(v*e) / e * f
}

// parseLevels parses --interval and --base, bare numbers in u, rounded in
// u as roundInUnit says.
func (opts *contoursOptions) parseLevels(u units.System) (contourLevels, error) {
	var l contourLevels
	if opts.interval == "" {
		return l, flagErrorf("--interval is required, e.g. --interval 0.5ft")
	}
	var err error
	if l.intervalM, err = units.ParseLength(opts.interval, u); err != nil {
		return l, flagErrorf("--interval: %w", err)
	}
	if !(l.intervalM > 0) {
		return l, flagErrorf("--interval must be > 0, got %s", opts.interval)
	}
	if opts.base != "" {
		if l.baseM, err = units.ParseLength(opts.base, u); err != nil {
			return l, flagErrorf("--base: %w", err)
		}
	}
	l.intervalM, l.baseM = roundInUnit(l.intervalM, u), roundInUnit(l.baseM, u)
	if !(l.intervalM > 0) {
		return l, flagErrorf("--interval %s is too small to draw", opts.interval)
	}
	return l, nil
}

// runContours reads the ground, traces its contours, writes and reports.
func runContours(ctx context.Context, opts *contoursOptions) error {
	app := opts.app
	opt, err := opts.survey.options()
	if err != nil {
		return err
	}
	// Check the values now; bare numbers are read again below in the
	// units of the surface, which a LandXML file states itself.
	if _, err := opts.parseLevels(opt.Units); err != nil {
		return err
	}
	if opts.indexEvery < 1 {
		return flagErrorf("--index-every must be 1 or more, got %d", opts.indexEvery)
	}
	outs, err := checkOutputs(outputFlag{"--geojson", opts.geojsonOut})
	if err != nil {
		return err
	}
	if outs.stdout != "" && app.JSON {
		return flagErrorf("--geojson - writes the file to stdout, which --json needs for its document: give a file name")
	}
	if err := outs.notInputs([]string{opts.file}); err != nil {
		return err
	}
	keep := false
	defer func() {
		if !keep {
			outs.undo()
		}
	}()

	g, err := readGround(app, groundRequest{files: []string{opts.file}, opt: opt, unitsSet: opts.unitsSet})
	if err != nil {
		return err
	}
	lv, err := opts.parseLevels(g.units)
	if err != nil {
		return err
	}
	if err := ctx.Err(); err != nil {
		return err
	}
	s, err := g.build(tin.Options{MergeTolM: survey.DefaultDupTolM})
	if err != nil {
		return err
	}
	co := contours.Options{IntervalM: lv.intervalM, BaseM: lv.baseM, IndexEvery: opts.indexEvery,
		Smooth: opts.smooth, MinLevel: math.NaN(), MaxLevel: math.NaN()}
	sum := s.Summary()
	levels, err := contours.Levels(sum.ZMinM, sum.ZMaxM, co)
	if err != nil {
		return g.explainLevels(err, opts)
	}
	if err := ctx.Err(); err != nil {
		return err
	}
	traced, err := contours.Trace(s.Mesh(), co)
	if err != nil {
		return err
	}
	lines := traced[:0:0]
	for _, l := range traced {
		if geom.Polyline(l.Pts).Length() >= minLineM {
			lines = append(lines, l)
		}
	}
	g.printWarnings(app)
	write := func(w io.Writer) error {
		mapper, meta := g.geoJSONOut()
		return report.WriteContoursGeoJSON(w, lines, mapper, 1/g.units.Metres(), meta)
	}
	for _, o := range outs.paths {
		if err := report.WriteFileAtomic(o.path, write); err != nil {
			return err
		}
		keep = true
	}
	keep = true
	if outs.stdout != "" {
		return write(app.IO.Out)
	}
	st := contourStatsOf(levels, lines, co)
	if app.JSON {
		return writeContoursJSON(app.IO.Out, g, &st, lv, opts)
	}
	return writeContoursText(app.IO.Out, app.IO.OutIsTTY, g, &st, lv, opts)
}

// explainLevels turns an error of contours.Levels into a usage error in
// the survey's units.
func (g *groundSource) explainLevels(err error, opts *contoursOptions) error {
	var tm *contours.TooManyLevelsError
	if errors.As(err, &tm) {
		f := g.formatter()
		return &FlagError{Err: &explainedError{err: err, msg: fmt.Sprintf(
			"--interval %s would make %.0f contour levels between %s and %s, more than %d: choose a larger interval",
			opts.interval, tm.N, f.num(tm.LoM), f.length(tm.HiM), tm.Limit)}}
	}
	if errors.Is(err, contours.ErrInterval) || errors.Is(err, contours.ErrOptions) {
		return &FlagError{Err: err}
	}
	return err
}

// levelStats sums the lines of one level.
type levelStats struct {
	LevelM  float64
	Index   bool
	Lines   int
	Closed  int
	LengthM float64
}

// contourStats is what contours reports.
type contourStats struct {
	Levels       []float64
	PerLevel     []levelStats // levels with at least one line, ascending
	Lines        int
	Closed       int
	Index        kindStats
	Intermediate kindStats
}

type kindStats struct {
	Lines   int
	LengthM float64
}

// contourStatsOf counts the lines and sums their plan lengths (compensated)
// per level and per kind.
func contourStatsOf(levels []float64, lines []contours.Line, co contours.Options) contourStats {
	st := contourStats{Levels: levels}
	var idx, mid geom.Sum
	var cur geom.Sum
	for i, l := range lines {
		if i == 0 || l.Level != lines[i-1].Level {
			if len(st.PerLevel) > 0 {
				st.PerLevel[len(st.PerLevel)-1].LengthM = cur.Value()
			}
			cur = geom.Sum{}
			st.PerLevel = append(st.PerLevel, levelStats{LevelM: l.Level, Index: l.Index})
		}
		pl := &st.PerLevel[len(st.PerLevel)-1]
		n := geom.Polyline(l.Pts).Length()
		cur.Add(n)
		pl.Lines++
		st.Lines++
		if l.Closed {
			pl.Closed++
			st.Closed++
		}
		if l.Index {
			st.Index.Lines++
			idx.Add(n)
		} else {
			st.Intermediate.Lines++
			mid.Add(n)
		}
	}
	if len(st.PerLevel) > 0 {
		st.PerLevel[len(st.PerLevel)-1].LengthM = cur.Value()
	}
	st.Index.LengthM, st.Intermediate.LengthM = idx.Value(), mid.Value()
	return st
}

// writeContoursText prints the contour summary in the survey's units.
func writeContoursText(w io.Writer, tty bool, g *groundSource, st *contourStats, lv contourLevels, opts *contoursOptions) error {
	t := newSummaryTable(w, tty)
	f := g.formatter()
	g.inputRows(t)
	t.row("units", "%s", g.units)
	t.row("crs", "%s", g.crsText())
	sum := g.surface.Summary()
	t.row("elevation", "%s to %s", f.num(sum.ZMinM), f.length(sum.ZMaxM))
	t.row("interval", "%s from base %s, index every %d (%s)", f.length(lv.intervalM), f.length(lv.baseM),
		opts.indexEvery, f.length(lv.intervalM*float64(opts.indexEvery)))
	if n := len(st.Levels); n > 0 {
		t.row("levels", "%d, %s to %s", n, f.num(st.Levels[0]), f.length(st.Levels[n-1]))
	} else {
		t.row("levels", "none: the ground lies between two levels")
	}
	t.row("lines", "%d (%s)", st.Lines, plural(st.Closed, "closed ring"))
	t.row("index", "%s, %s", plural(st.Index.Lines, "line"), f.length(st.Index.LengthM))
	t.row("intermediate", "%s, %s", plural(st.Intermediate.Lines, "line"), f.length(st.Intermediate.LengthM))
	if opts.smooth {
		t.row("smoothed", "yes")
	}
	if opts.geojsonOut != "" {
		t.row("geojson", "%s", opts.geojsonOut)
	}
	if n := len(g.allWarnings()); n > 0 {
		t.row("warnings", "%d (on stderr)", n)
	}
	return t.flush()
}

// contoursJSON is the --json document of `dugout contours` (schema 1).
// Elevations and lengths are metres.
type contoursJSON struct {
	SchemaVersion int              `json:"schema_version"`
	Input         groundInputJSON  `json:"input"`
	Options       contourOptsJSON  `json:"options"`
	Units         string           `json:"units"`
	CRS           crsJSON          `json:"crs"`
	Geographic    bool             `json:"geographic"`
	FrameOrigin   [2]float64       `json:"frame_origin_m"`
	IntervalM     float64          `json:"interval_m"`
	BaseM         float64          `json:"base_m"`
	IndexEvery    int              `json:"index_every"`
	ElevMin       *float64         `json:"elevation_min_m"`
	ElevMax       *float64         `json:"elevation_max_m"`
	LevelsM       []float64        `json:"levels_m"`
	Lines         int              `json:"lines"`
	Closed        int              `json:"closed_rings"`
	Index         kindJSON         `json:"index"`
	Intermediate  kindJSON         `json:"intermediate"`
	PerLevel      []levelStatsJSON `json:"per_level"`
	Outputs       outputsJSON      `json:"outputs"`
	Warnings      []string         `json:"warnings"`
}

type contourOptsJSON struct {
	Units      string `json:"units"`
	CRS        string `json:"crs"`
	Interval   string `json:"interval"`
	Base       string `json:"base"`
	IndexEvery int    `json:"index_every"`
	Smooth     bool   `json:"smooth"`
}

type kindJSON struct {
	Lines   int     `json:"lines"`
	LengthM float64 `json:"length_m"`
}

type levelStatsJSON struct {
	ElevationM float64 `json:"elevation_m"`
	Index      bool    `json:"index"`
	Lines      int     `json:"lines"`
	Closed     int     `json:"closed_rings"`
	LengthM    float64 `json:"length_m"`
}

func writeContoursJSON(w io.Writer, g *groundSource, st *contourStats, lv contourLevels, opts *contoursOptions) error {
	sum := g.surface.Summary()
	doc := contoursJSON{
		SchemaVersion: 1,
		Input:         g.inputJSON(),
		Options: contourOptsJSON{Units: opts.survey.units, CRS: opts.survey.crs, Interval: opts.interval,
			Base: opts.base, IndexEvery: opts.indexEvery, Smooth: opts.smooth},
		Units:        g.units.String(),
		CRS:          crsJSON{Kind: g.crs.Kind.String(), EPSG: g.crs.EPSG, Name: g.crs.Name},
		Geographic:   g.geographic,
		FrameOrigin:  [2]float64{g.frame.Origin.X, g.frame.Origin.Y},
		IntervalM:    lv.intervalM,
		BaseM:        lv.baseM,
		IndexEvery:   opts.indexEvery,
		ElevMin:      finite(sum.ZMinM),
		ElevMax:      finite(sum.ZMaxM),
		LevelsM:      append([]float64{}, st.Levels...),
		Lines:        st.Lines,
		Closed:       st.Closed,
		Index:        kindJSON{Lines: st.Index.Lines, LengthM: st.Index.LengthM},
		Intermediate: kindJSON{Lines: st.Intermediate.Lines, LengthM: st.Intermediate.LengthM},
		PerLevel:     []levelStatsJSON{},
		Outputs:      outputsJSON{GeoJSON: opts.geojsonOut},
		Warnings:     g.allWarnings(),
	}
	for _, l := range st.PerLevel {
		doc.PerLevel = append(doc.PerLevel, levelStatsJSON{ElevationM: l.LevelM, Index: l.Index, Lines: l.Lines,
			Closed: l.Closed, LengthM: l.LengthM})
	}
	return encodeJSON(w, doc)
}
