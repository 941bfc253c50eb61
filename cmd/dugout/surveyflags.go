package main

import (
	"errors"
	"strings"

	"github.com/spf13/cobra"

	"github.com/dugout-estimating/dugout/internal/crs"
	"github.com/dugout-estimating/dugout/internal/las"
	"github.com/dugout-estimating/dugout/internal/survey"
	"github.com/dugout-estimating/dugout/internal/units"
)

// surveyFlags are the flags of every command that reads survey files.
type surveyFlags struct {
	units          string
	crs            string
	columns        string
	breaklineCodes []string
	lasClasses     []int
	lasAll         bool
	thin           string
	thinMode       string
}

// add registers the flags on cmd.
func (f *surveyFlags) add(cmd *cobra.Command) {
	fl := cmd.Flags()
	fl.StringVar(&f.units, "units", "m", "how input lengths are measured: {m|ft|usft} (ft: international foot 0.3048 m; usft: US survey foot 1200/3937 m)")
	fl.StringVar(&f.crs, "crs", "auto", "coordinate system: {local|auto|EPSG:NNNN}; auto projects lon/lat into its WGS 84 UTM zone")
	fl.StringVar(&f.columns, "columns", "", "column order of a file without a header, e.g. PNEZD or PENZD (P point, N northing, E easting, Z elevation, D description)")
	fl.StringArrayVar(&f.breaklineCodes, "breakline-code", nil, "description code whose points join into a breakline; BL1, BL2... are separate strings (repeatable; default BL)")
	fl.IntSliceVar(&f.lasClasses, "las-class", nil, "keep LAS points of this ASPRS class (repeatable; default: ground, 2, when the file has any, else all)")
	fl.BoolVar(&f.lasAll, "las-all-classes", false, "keep LAS points of every class")
	fl.StringVar(&f.thin, "thin", "", "thin LAS points to one per square cell of this size, a length such as 1ft or 0.5m (a bare number is in --units)")
	fl.StringVar(&f.thinMode, "thin-mode", "lowest", "point kept per thinning cell: {lowest|mean}")
	cmd.MarkFlagsMutuallyExclusive("las-class", "las-all-classes")
}

// options turns the flags into survey options; bad values are usage errors.
func (f *surveyFlags) options() (survey.Options, error) {
	var opt survey.Options
	u, err := units.ParseSystem(f.units)
	if err != nil {
		return opt, flagErrorf("--units: %w", err)
	}
	opt.Units = u
	if opt.CRS, err = crs.Parse(f.crs); err != nil {
		return opt, flagErrorf("--crs: %w", err)
	}
	if f.columns != "" {
		if err := survey.ValidateColumns(f.columns); err != nil {
			return opt, flagErrorf("--columns: %w", err)
		}
		opt.Columns = strings.ToUpper(f.columns)
	}
	for _, c := range f.breaklineCodes {
		c = strings.TrimSpace(c)
		if c == "" || strings.ContainsAny(c, " \t") {
			return opt, flagErrorf("--breakline-code %q: a code is one word", c)
		}
		opt.BreaklineCodes = append(opt.BreaklineCodes, c)
	}
	for _, c := range f.lasClasses {
		if c < 0 || c > 255 {
			return opt, flagErrorf("--las-class %d: ASPRS classes are 0 to 255", c)
		}
		opt.LAS.Classes = append(opt.LAS.Classes, uint8(c))
	}
	opt.LAS.AllClasses = f.lasAll
	if f.thin != "" {
		cell, err := units.ParseLength(f.thin, u)
		if err != nil {
			return opt, flagErrorf("--thin: %w", err)
		}
		if !(cell > 0) {
			return opt, flagErrorf("--thin must be > 0, got %s", f.thin)
		}
		opt.LAS.ThinCell = cell // metres; survey converts to file units
		switch strings.ToLower(f.thinMode) {
		case "lowest":
			opt.LAS.Thin = las.ThinLowest
		case "mean":
			opt.LAS.Thin = las.ThinMean
		default:
			return opt, flagErrorf("--thin-mode %q: want lowest or mean", f.thinMode)
		}
	}
	return opt, nil
}

// surveyError classifies an error from survey.Read: problems with the data
// are input rejected by validation (exit 3); others, such as a file that
// cannot be opened, stay failures (exit 1).
func surveyError(err error) error {
	var pe *survey.ParseError
	for _, s := range []error{survey.ErrMixedCRS, survey.ErrCRS, survey.ErrEmpty} {
		if errors.Is(err, s) {
			return &RejectedError{Err: err}
		}
	}
	if errors.As(err, &pe) {
		return &RejectedError{Err: err}
	}
	return err
}
