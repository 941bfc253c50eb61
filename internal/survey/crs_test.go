package survey

import (
	"bytes"
	"fmt"
	"os/exec"
	"strconv"
	"strings"
	"testing"

	"github.com/dugout-estimating/dugout/internal/reftest"
	"github.com/dugout-estimating/dugout/internal/units"
)

// TestRead_LonLatMatchesPROJ projects the phone-GPS test points with PROJ's
// cs2cs (EPSG:4326 → EPSG:32615) and compares the world coordinates of the
// set. The tolerance, 0.1 mm, is what package crs holds against PROJ.
func TestRead_LonLatMatchesPROJ(t *testing.T) {
	cs2cs := reftest.Tool(t, "cs2cs")
	s := mustRead(t, Options{}, "testdata/gps_lonlat.csv")
	if s.CRS.EPSG != 32615 {
		t.Fatalf("CRS = %v, want EPSG:32615 (the zone of longitude -92.85)", s.CRS)
	}
	// The latitude and longitude as written in the file.
	lines, _, _ := splitLines(mustReadFile(t, "testdata/gps_lonlat.csv"))
	var in bytes.Buffer
	for _, l := range lines[1:] {
		f, _ := splitFields(l.text, ',')
		fmt.Fprintf(&in, "%s %s\n", f[1], f[2]) // EPSG:4326 axis order: lat lon
	}
	cmd := exec.Command(cs2cs, "-f", "%.10f", "EPSG:4326", "EPSG:32615")
	cmd.Stdin = &in
	out, err := cmd.Output()
	if err != nil {
		t.Fatalf("cs2cs: %v", err)
	}
	rows := strings.Split(strings.TrimSpace(string(out)), "\n")
	if len(rows) != len(s.Points) {
		t.Fatalf("cs2cs gave %d rows for %d points", len(rows), len(s.Points))
	}
	const tol = 1e-4 // m
	for i, r := range rows {
		f := strings.Fields(r)
		e, _ := strconv.ParseFloat(f[0], 64)
		n, _ := strconv.ParseFloat(f[1], 64)
		x, y, _ := s.WorldPos(s.Points[i].P, units.Metres)
		if !closeTo(x, e, tol) || !closeTo(y, n, tol) {
			t.Errorf("point %s: got E %.4f N %.4f, cs2cs E %.4f N %.4f", s.Points[i].ID, x, y, e, n)
		}
	}
}
