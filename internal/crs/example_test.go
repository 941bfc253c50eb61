package crs_test

import (
	"fmt"

	"github.com/dugout-estimating/dugout/internal/crs"
)

func ExampleUTMZoneFor() {
	// Autzen Stadium, Eugene, Oregon (refbench/ANCHORS.md §5).
	lon, lat := -123.0685, 44.0582
	u, err := crs.UTMZoneFor(lon, lat)
	if err != nil {
		fmt.Println(err)
		return
	}
	e, n, err := u.Forward(lon, lat)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("%s (%s): E %.3f N %.3f\n", u, u.CRS(), e, n)
	// Output: UTM zone 10N (EPSG:32610): E 494513.445 N 4878339.300
}

func ExampleParse() {
	for _, s := range []string{"local", "auto", "epsg:32756", "EPSG:2994"} {
		spec, err := crs.Parse(s)
		if err != nil {
			fmt.Println(err)
			continue
		}
		fmt.Printf("%-10s → %-10s %s\n", s, spec, spec.CRS.Kind)
	}
	// Output:
	// local      → local      local
	// auto       → auto       local
	// epsg:32756 → EPSG:32756 projected
	// EPSG:2994  → EPSG:2994  projected
}
