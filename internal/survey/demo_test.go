package survey

import (
	"math"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/units"
)

const demoDir = "../../testdata/demo/"

// TestDemo_TotalStation pins what tools/gendemo planted in the demo survey
// (testdata/demo/README.md): the two wall strings, the walked pond outline,
// three check shots with one conflict, and the stake-top spike.
func TestDemo_TotalStation(t *testing.T) {
	s := mustRead(t, Options{Units: units.Feet}, demoDir+"yard_total_station.csv")
	checkInvariants(t, s, false)
	sum := s.Summary()
	if sum.Count != 328 || len(s.Breaklines) != 2 || len(s.Breaklines[0].Pts) != 20 || len(s.Breaklines[1].Pts) != 20 {
		t.Errorf("count %d, breaklines %d, want 328 and BL1, BL2 of 20", sum.Count, len(s.Breaklines))
	}
	if len(sum.Spikes) != 1 || sum.Spikes[0].Point.ID != "426" {
		t.Errorf("spikes %+v, want only point 426 (the stake top)", sum.Spikes)
	} else if r := sum.Spikes[0].ResidualM; math.Abs(r-0.46) > 0.05 {
		// 0.46 m above the lawn, against a plane through noisy neighbours.
		t.Errorf("spike residual %.3f m, want about 0.46", r)
	}
	if sum.ExactDuplicates != 0 || sum.NearDuplicates != 3 || len(sum.Conflicts) != 1 || sum.Conflicts[0].Point.ID != "425" {
		t.Errorf("duplicates %d exact, %d near, conflicts %+v; want 0, 3 and point 425", sum.ExactDuplicates, sum.NearDuplicates, sum.Conflicts)
	}
	// The walked outline is a simple loop of 20 shots: about the area of
	// its ellipse (π·3.2·2.0 = 20.1 m²) less the dent.
	pond := s.CodedString("POND")
	ring := make(geom.Ring, len(pond))
	for i, p := range pond {
		ring[i] = p.P.XY()
	}
	if a := math.Abs(ring.Area()); len(pond) != 20 || a < 15 || a > 20.1 {
		t.Errorf("POND: %d shots enclosing %.2f m², want 20 shots and 15–20 m²", len(pond), a)
	}
	// CP1 is at N 5000, E 1000, Z 100 ft.
	x, y, z := s.WorldPos(s.Points[0].P, units.Feet)
	if s.Points[0].ID != "1" || !closeTo(x, 1000, 1e-9) || !closeTo(y, 5000, 1e-9) || !closeTo(z, 100, 1e-9) {
		t.Errorf("CP1 at %v %v %v ft", x, y, z)
	}
}

// TestDemo_PhoneCSVMatchesGPX: the phone copy as lon/lat CSV and as GPX
// reads to the same local coordinates.
func TestDemo_PhoneCSVMatchesGPX(t *testing.T) {
	c := mustRead(t, Options{}, demoDir+"yard_phone_gps.csv")
	g := mustRead(t, Options{}, demoDir+"yard_phone_gps.gpx")
	if len(c.Points) != 328 || len(c.Points) != len(g.Points) || c.Frame != g.Frame || c.CRS.EPSG != 32615 || g.CRS.EPSG != 32615 {
		t.Fatalf("CSV %d points %v %v, GPX %d %v %v", len(c.Points), c.Frame, c.CRS, len(g.Points), g.Frame, g.CRS)
	}
	for i := range c.Points {
		if a, b := c.Points[i], g.Points[i]; a.P != b.P || a.ID != b.ID || a.Code != b.Code || a.HAccM != b.HAccM || a.VAccM != b.VAccM {
			t.Fatalf("point %d: CSV %+v, GPX %+v", i, a, b)
		}
	}
	sum := c.Summary()
	if sum.HAcc.MinM < 0.3 || sum.HAcc.MaxM > 2 || sum.VAcc.MinM < 0.5 || sum.VAcc.MaxM > 3 {
		t.Errorf("accuracy %+v %+v, want hacc 0.3–2 m and vacc 0.5–3 m", sum.HAcc, sum.VAcc)
	}
}
