package survey

import (
	"errors"
	"math"
	"strings"
	"testing"
)

// TestRead_GPXMatchesLonLatCSV reads the same phone-GPS shots as GPX and as
// a lon/lat CSV (written with identical digits): they must land on the same
// local coordinates, with the same accuracies and codes.
func TestRead_GPXMatchesLonLatCSV(t *testing.T) {
	c := mustRead(t, Options{}, "testdata/gps_lonlat.csv")
	g := mustRead(t, Options{}, "testdata/gps.gpx")
	checkInvariants(t, c, false)
	checkInvariants(t, g, false)
	if len(c.Points) != len(g.Points) || c.Frame != g.Frame || c.CRS.EPSG != g.CRS.EPSG || c.CRS.EPSG != 32615 {
		t.Fatalf("CSV %d points frame %v %v; GPX %d points frame %v %v", len(c.Points), c.Frame, c.CRS, len(g.Points), g.Frame, g.CRS)
	}
	for i := range c.Points {
		a, b := c.Points[i], g.Points[i]
		if a.P != b.P || a.ID != b.ID || a.Code != b.Code || a.HAccM != b.HAccM || a.VAccM != b.VAccM {
			t.Errorf("point %d: CSV %+v, GPX %+v", i, a, b)
		}
	}
	if g.Points[0].Line != 3 || g.Files[0].Format != FormatGPX {
		t.Errorf("GPX first point line %d format %v, want 3 and gpx", g.Points[0].Line, g.Files[0].Format)
	}
}

func TestRead_GPXNoElevation(t *testing.T) {
	_, err := Read([]string{"testdata/track_noele.gpx"}, Options{})
	if !errors.Is(err, ErrNoElevation) || !strings.Contains(err.Error(), "GPX has no <ele>: elevations are needed to build a surface") {
		t.Fatalf("Read = %v, want ErrNoElevation saying GPX has no <ele>", err)
	}
	s, err := Read([]string{"testdata/track_noele.gpx"}, Options{AllowMissingZ: true})
	if err != nil {
		t.Fatal(err)
	}
	checkInvariants(t, s, true)
	if len(s.Points) != 5 || s.Points[0].ID != "trk1-1" || !math.IsNaN(s.Points[0].P.Z) {
		t.Errorf("points = %+v, want 5 track points trk1-1... without z", s.Points)
	}
	if !hasWarning(s.Warnings, "GPX has no <ele>") || !hasWarning(s.Warnings, "hdop/vdop") {
		t.Errorf("warnings %v, want no-elevation and dilution-of-precision warnings", s.Warnings)
	}
}

func TestReadGPX_Bad(t *testing.T) {
	gpx := func(body string) string {
		return `<?xml version="1.0"?><gpx version="1.1" xmlns="http://www.topografix.com/GPX/1/1">` + body + `</gpx>`
	}
	tests := []struct {
		name, doc string
		want      error
	}{
		{"not XML", `<gpx><wpt lat="1" lon="2"></gpx>`, ErrSyntax},
		{"root not gpx", `<kml><Placemark/></kml>`, ErrFormat},
		{"no points", gpx(`<metadata><name>x</name></metadata>`), ErrEmpty},
		{"no lat", gpx(`<wpt lon="-92.8"><ele>1</ele></wpt>`), ErrSyntax},
		{"lat out of range", gpx(`<wpt lat="95" lon="-92.8"><ele>1</ele></wpt>`), ErrRange},
		{"lon out of range", gpx(`<wpt lat="44" lon="-192.8"><ele>1</ele></wpt>`), ErrRange},
		{"bad ele", gpx(`<wpt lat="44" lon="-92.8"><ele>1.2.3</ele></wpt>`), ErrSyntax},
		{"NaN ele", gpx(`<wpt lat="44" lon="-92.8"><ele>NaN</ele></wpt>`), ErrNonFinite},
		{"some without ele", gpx(`<wpt lat="44" lon="-92.8"><ele>1</ele></wpt><wpt lat="44" lon="-92.8001"/>`), ErrNoElevation},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, err := readString(t, "b.gpx", tc.doc, Options{})
			var pe *ParseError
			if !errors.Is(err, tc.want) || !errors.As(err, &pe) {
				t.Errorf("Read = %v, want a ParseError wrapping %v", err, tc.want)
			}
		})
	}
}
