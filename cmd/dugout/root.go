package main

import (
	"github.com/spf13/cobra"
)

// version is set at build time with -ldflags "-X main.version=...".
var version = "0.1.0-dev"

const rootLong = `dugout estimates garden ponds, water features and small excavations from
the real ground, not from a rectangle.

The workflow follows the job:

  1. points    read the survey (total station CSV, phone GPS CSV/GPX/GeoJSON,
               laser-level rod readings, LiDAR LAS) and check it
  2. surface   build the existing-ground TIN, honouring breaklines and the
               surveyed extent
  3. estimate  lay the pond's depth zones on that ground at a level water line:
               cut, fill, berm, haul-off and truckloads, liner sheet, shoreline,
               edge stone, gravel, crew time, water volume, pump duty, cost,
               and a printable report with plan and sections
  4. compare   measure what was really dug from a before and an as-built survey

Start with 'dugout demo --out demo-out' to see every step on a made-up yard.

Units: --units says how the input is measured (m, ft or usft); results are
printed in the same family (cubic yards and feet, or cubic metres) and JSON
is always SI. Coordinates: --crs local, EPSG:NNNN or auto (lon/lat goes to
the WGS 84 UTM zone of the site).

Every estimate carries safety cautions: excavation, buried utilities,
electricity near water, lifting stone, drowning. Local codes and licensed
professionals come first.`

func newRootCmd(app *App) *cobra.Command {
	root := &cobra.Command{
		Use:           "dugout <command> [flags]",
		Short:         "earthwork, liner, stone and pump estimates for ponds from survey points",
		Long:          rootLong,
		SilenceUsage:  true,
		SilenceErrors: true,
		Version:       version,
	}
	root.CompletionOptions.DisableDefaultCmd = true
	pf := root.PersistentFlags()
	pf.BoolVarP(&app.Quiet, "quiet", "q", false, "print no warnings or progress on stderr")
	pf.BoolVar(&app.JSON, "json", false, "print one JSON document on stdout instead of text")

	root.AddCommand(
		newPointsCmd(app),
		newSurfaceCmd(app),
		newEstimateCmd(app),
		newCompareCmd(app),
		newContoursCmd(app),
		newDemoCmd(app),
		newVersionCmd(app),
		newExitCodesTopic(),
	)
	return root
}

func newVersionCmd(app *App) *cobra.Command {
	return &cobra.Command{
		Use:   "version",
		Short: "print the version",
		Args:  cobra.NoArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			if app.JSON {
				_, err := app.IO.Out.Write([]byte(`{"schema_version":1,"version":"` + version + "\"}\n"))
				return err
			}
			_, err := app.IO.Out.Write([]byte("dugout " + version + "\n"))
			return err
		},
	}
}

func newExitCodesTopic() *cobra.Command {
	return &cobra.Command{
		Use:   "exit-codes",
		Short: "what the exit codes mean",
		Long: `Exit codes:
  0    success (warnings alone do not change it)
  1    failure: a file could not be read or written, or a computation failed
  2    usage: a bad flag, argument or value
  3    input rejected: the survey, design or settings were read but failed validation
  130  interrupted (Ctrl-C)`,
		Run: func(cmd *cobra.Command, args []string) { _ = cmd.Help() },
	}
}
