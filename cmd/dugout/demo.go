package main

import (
	"context"
	"fmt"
	"io"
	"io/fs"
	"path/filepath"
	"time"

	"github.com/spf13/cobra"

	"github.com/dugout-estimating/dugout"
	"github.com/dugout-estimating/dugout/internal/report"
	"github.com/dugout-estimating/dugout/internal/sitefile"
)

const demoLong = `Run every step on the built-in demo: an invented back yard at 27 Cattail
Row, Tallgrass Bend, surveyed with a total station (and, for comparison, a
phone GPS), where a client wants a garden pond in the lawn.

demo writes the demo's survey files and site file into DIR/site/ (replacing
files of the same names, each written whole), checks the total-station
survey as 'dugout points' does, then runs the estimate on the site file
and writes the report into DIR: open DIR/report.html in a browser.

The site file is an ordinary one: edit DIR/site/site.toml and run
'dugout estimate --site DIR/site/site.toml --report DIR' to try your own
settings.`

const demoExample = `  dugout demo --out demo-out
  dugout demo --out demo-out --json > estimate.json`

// demoSurveyFile is the demo's total-station survey, the one checked
// before the estimate.
const demoSurveyFile = "yard_total_station.csv"

// demoOptions holds the parsed arguments of `dugout demo`.
type demoOptions struct {
	app *App
	out string
	// site gives the demo's files; nil means dugout.DemoSite().
	site fs.FS
	// now gives the report's date; nil means time.Now.
	now func() time.Time
}

// newDemoCmd returns the `demo` command.
func newDemoCmd(app *App) *cobra.Command {
	o := &demoOptions{app: app}
	cmd := &cobra.Command{
		Use:     "demo --out <dir>",
		Short:   "write the built-in demo yard and run every step on it",
		Long:    demoLong,
		Example: demoExample,
		Args:    cobra.NoArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			return runDemo(cmd.Context(), o)
		},
	}
	cmd.Flags().StringVar(&o.out, "out", "", "folder to write the demo site (into <dir>/site) and its report into (required)")
	return cmd
}

// runDemo writes the demo site, checks its survey and runs the estimate
// with the report.
func runDemo(ctx context.Context, o *demoOptions) error {
	app := o.app
	if o.out == "" {
		return flagErrorf("--out is required: the folder to write the demo into")
	}
	siteDir := filepath.Join(o.out, "site")
	if err := report.CheckOutputDir(siteDir); err != nil {
		return err
	}
	src := o.site
	if src == nil {
		src = dugout.DemoSite()
	}
	if err := writeDemoSite(src, siteDir); err != nil {
		return err
	}
	sitePath := filepath.Join(siteDir, "site.toml")
	site, err := sitefile.Load(sitePath)
	if err != nil {
		return &RejectedError{Err: err}
	}

	// The survey check, as `dugout points` prints it. With --json it goes
	// to stderr, so that stdout holds the estimate's one JSON document.
	check := &App{IO: &IOStreams{In: app.IO.In, Out: app.IO.Out, ErrOut: app.IO.ErrOut, ErrIsTTY: app.IO.ErrIsTTY}, Quiet: app.Quiet}
	if app.JSON {
		check.IO.Out = app.IO.ErrOut
	}
	if !app.JSON || !app.Quiet {
		fmt.Fprintf(check.IO.Out, "Survey check: %s\n\n", filepath.Join(siteDir, demoSurveyFile))
		po := &pointsOptions{app: check, files: []string{filepath.Join(siteDir, demoSurveyFile)},
			survey: surveyFlags{units: site.Units, crs: site.CRS, breaklineCodes: site.Survey.BreaklineCodes, thinMode: "lowest"}}
		if po.survey.units == "" {
			po.survey.units = "m"
		}
		if po.survey.crs == "" {
			po.survey.crs = "auto"
		}
		if err := runPoints(ctx, po); err != nil {
			return err
		}
		fmt.Fprintln(check.IO.Out)
	}

	if !app.JSON {
		fmt.Fprintf(app.IO.Out, "Estimate: %s\n\n", sitePath)
	}
	eo := &estimateOptions{app: app, site: sitePath, report: o.out, now: o.now}
	return runEstimate(ctx, eo)
}

// writeDemoSite copies every file of src into dir, each written whole
// (report.WriteFileAtomic), keeping the tree's folders.
func writeDemoSite(src fs.FS, dir string) error {
	return fs.WalkDir(src, ".", func(path string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		target := filepath.Join(dir, filepath.FromSlash(path))
		if d.IsDir() {
			if path == "." {
				return nil
			}
			return report.CheckOutputDir(target)
		}
		return report.WriteFileAtomic(target, func(w io.Writer) error {
			f, err := src.Open(path)
			if err != nil {
				return err
			}
			defer f.Close()
			_, err = io.Copy(w, f)
			return err
		})
	})
}
