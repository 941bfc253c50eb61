package survey

import (
	"errors"
	"math"
	"strings"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/units"
)

// Exactness of coordinate conversion: 1e-9 m is far below any survey
// resolution and well above float64 round-off at site-sized numbers.
const coordTolM = 1e-9

func TestRead_PNEZD(t *testing.T) {
	s := mustRead(t, Options{Units: units.Feet, Columns: "PNEZD"}, "testdata/ts_pnezd.txt")
	checkInvariants(t, s, false)
	if len(s.Points) != 12 {
		t.Fatalf("got %d points, want 12", len(s.Points))
	}
	f := s.Files[0]
	if f.Format != FormatDelimited || f.Delimiter != "," || f.Columns != "id,northing,easting,elevation,description" {
		t.Errorf("FileInfo = %+v, want delimited, \",\", id,northing,easting,elevation,description", f)
	}
	// World metres by the exact international foot (85 FR 62698); the
	// origin is the rounded centre of the bounds.
	ft := units.Foot
	wantOrigin := geom.Vec2{X: math.Round((1000*ft + 1012.020*ft) / 2), Y: math.Round((5000*ft + 5015.010*ft) / 2)}
	if s.Frame.Origin != wantOrigin {
		t.Errorf("Frame.Origin = %v, want %v", s.Frame.Origin, wantOrigin)
	}
	p := s.Points[0]
	want := geom.Vec3{X: 1000*ft - wantOrigin.X, Y: 5000*ft - wantOrigin.Y, Z: 100 * ft}
	if p.ID != "1" || p.Code != "CP1 control nail" || !closeTo(p.P.X, want.X, coordTolM) || !closeTo(p.P.Y, want.Y, coordTolM) || !closeTo(p.P.Z, want.Z, coordTolM) {
		t.Errorf("point 1 = %+v, want id 1, code CP1 control nail, at %v", p, want)
	}
	if p.Line != 3 || !math.IsNaN(p.HAccM) {
		t.Errorf("point 1 line %d hacc %v, want line 3 and NaN", p.Line, p.HAccM)
	}
	if got := s.Points[9].Code; got != "GS, near drain" {
		t.Errorf("quoted description = %q, want %q", got, "GS, near drain")
	}
	x, y, z := s.WorldPos(p.P, units.Feet)
	if !closeTo(x, 1000, 1e-9) || !closeTo(y, 5000, 1e-9) || !closeTo(z, 100, 1e-9) {
		t.Errorf("WorldPos(point 1, ft) = %v, %v, %v, want 1000, 5000, 100", x, y, z)
	}
	// BL1 (3 shots) and BL2 (2 shots) are separate strings in file order.
	if len(s.Breaklines) != 2 || s.Breaklines[0].Name != "BL1" || len(s.Breaklines[0].Pts) != 3 ||
		s.Breaklines[1].Name != "BL2" || len(s.Breaklines[1].Pts) != 2 || s.Breaklines[0].Code != "BL" {
		t.Errorf("breaklines = %+v, want BL1 (3 points) and BL2 (2 points)", s.Breaklines)
	}
	if s.Breaklines[0].Pts[0] != s.Points[4].P {
		t.Errorf("BL1 starts at %v, want point 5 %v", s.Breaklines[0].Pts[0], s.Points[4].P)
	}
	if got := s.CodedString("pond"); len(got) != 1 || got[0].ID != "11" {
		t.Errorf("CodedString(pond) = %v, want point 11", got)
	}
	if s.CRS.String() != "local" || s.Units != units.Feet || s.Geographic {
		t.Errorf("CRS %v units %v geographic %v, want local ft false", s.CRS, s.Units, s.Geographic)
	}
}

func TestRead_ColumnOrderMatters(t *testing.T) {
	// A headerless file cannot tell P,N,E from P,E,N: the same file read
	// with PENZD swaps the axes.
	a := mustRead(t, Options{Columns: "PNEZD"}, "testdata/ts_pnezd.txt")
	b := mustRead(t, Options{Columns: "PENZD"}, "testdata/ts_pnezd.txt")
	ax, ay, _ := a.WorldPos(a.Points[1].P, units.Metres)
	bx, by, _ := b.WorldPos(b.Points[1].P, units.Metres)
	if !closeTo(ax, by, coordTolM) || !closeTo(ay, bx, coordTolM) || closeTo(ax, bx, 1) {
		t.Errorf("PNEZD point 2 = (%v, %v), PENZD = (%v, %v): want the axes swapped", ax, ay, bx, by)
	}
}

func TestRead_HeaderTabCRLFBOM(t *testing.T) {
	// The same shots with a header (E before N, units in brackets), tabs,
	// CRLF line ends and a UTF-8 BOM read to the same points.
	a := mustRead(t, Options{Units: units.Feet, Columns: "PNEZD"}, "testdata/ts_pnezd.txt")
	b := mustRead(t, Options{Units: units.Feet}, "testdata/ts_header_tab.txt")
	if len(a.Points) != len(b.Points) {
		t.Fatalf("got %d and %d points", len(a.Points), len(b.Points))
	}
	for i := range a.Points {
		if a.Points[i].P != b.Points[i].P || a.Points[i].ID != b.Points[i].ID || a.Points[i].Code != b.Points[i].Code {
			t.Errorf("point %d: %+v vs %+v", i, a.Points[i], b.Points[i])
		}
	}
	if b.Files[0].Delimiter != "\t" || b.Files[0].Columns != "id,easting,northing,elevation,description" {
		t.Errorf("FileInfo = %+v", b.Files[0])
	}
	if len(b.Warnings) != 0 {
		t.Errorf("warnings %v, want none", b.Warnings)
	}
	// Read in metres, the header's "(ft)" contradicts --units.
	c := mustRead(t, Options{Units: units.Metres}, "testdata/ts_header_tab.txt")
	if !hasWarning(c.Warnings, `states ft but the file is read in m`) {
		t.Errorf("warnings %v, want one about the header stating ft", c.Warnings)
	}
}

func TestHeaderRoles(t *testing.T) {
	// Column names of common exports, case and punctuation insensitive.
	tests := []struct {
		header string
		want   string
	}{
		{"Point,Northing,Easting,Elevation,Description", "id,northing,easting,elevation,description"},
		{"PT,N,E,Z,CODE", "id,northing,easting,elevation,description"},
		{"id,x,y,z", "id,easting,northing,elevation"},
		{"Name;Latitude;Longitude;Altitude;Horizontal Accuracy;Vertical Accuracy", "id,latitude,longitude,elevation,hacc,vacc"},
		{"point_no,lat,lng,height,hrms,vrms,desc", "id,latitude,longitude,elevation,hacc,vacc,description"},
		{"pnt,north_ft,east_ft,elev_ft,time", "id,northing,easting,elevation,-"},
		{"Station\tE [m]\tN [m]\tRL [m]\tRemarks", "id,easting,northing,elevation,description"},
	}
	for _, tc := range tests {
		t.Run(tc.header, func(t *testing.T) {
			lines, _, _ := splitLines([]byte(tc.header))
			delim := sniffDelimiter(lines)
			names, _ := splitFields(tc.header, delim)
			vals := []string{"1", "5000", "1000", "100", "x", "y", "z"}
			if strings.HasPrefix(tc.want, "id,lat") {
				vals = []string{"1", "44.1", "-92.8", "200", "0.5", "0.9", "x"}
			}
			content := tc.header + "\n" + strings.Join(vals[:len(names)], string(delim)) + "\n"
			s, err := readString(t, "h.csv", content, Options{AllowMissingZ: true})
			if err != nil {
				t.Fatalf("Read: %v", err)
			}
			if got := s.Files[0].Columns; got != tc.want {
				t.Errorf("Columns = %q, want %q", got, tc.want)
			}
		})
	}
}

func TestRead_DescriptionWithoutQuotes(t *testing.T) {
	// Surplus fields join the description when it is the last column.
	s, err := readString(t, "d.csv", "p,n,e,z,d\n1,5000,1000,99,GS, near drain, east\n2,5001,1001,99,GS\n", Options{})
	if err != nil {
		t.Fatal(err)
	}
	if got := s.Points[0].Code; got != "GS, near drain, east" {
		t.Errorf("description = %q, want %q", got, "GS, near drain, east")
	}
	s, err = readString(t, "d.txt", "1 5000 1000 99 BL3 top of wall\n2 5001 1001 99 BL3\n", Options{Columns: "PNEZD"})
	if err != nil {
		t.Fatal(err)
	}
	if got := s.Points[0].Code; got != "BL3 top of wall" || len(s.Breaklines) != 1 || s.Breaklines[0].Name != "BL3" {
		t.Errorf("description = %q, breaklines %v, want %q and one string BL3", got, s.Breaklines, "BL3 top of wall")
	}
}

func TestRead_GridAndLonLatColumns(t *testing.T) {
	// A file with both lon/lat and grid columns: auto uses lon/lat, an
	// explicit system the grid.
	content := "id,lat,lon,northing,easting,z\n1,44.0415,-92.8464,5000,1000,100\n2,44.0416,-92.8463,5010,1010,101\n"
	s, err := readString(t, "both.csv", content, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if !s.Geographic || s.CRS.EPSG != 32615 || !hasWarning(s.Warnings, "using latitude/longitude") {
		t.Errorf("auto: geographic %v CRS %v warnings %v, want lon/lat in EPSG:32615", s.Geographic, s.CRS, s.Warnings)
	}
	s, err = readString(t, "both.csv", content, Options{CRS: mustSpec(t, "local")})
	if err != nil {
		t.Fatal(err)
	}
	if s.Geographic || s.CRS.String() != "local" || !hasWarning(s.Warnings, "using the grid columns") {
		t.Errorf("local: geographic %v CRS %v warnings %v, want the grid columns", s.Geographic, s.CRS, s.Warnings)
	}
}

func TestRead_EllipsoidalHeight(t *testing.T) {
	content := "name,lat,lon,ellipsoidal height,orthometric height\n1,44.0415,-92.8464,210.5,240.1\n"
	s, err := readString(t, "g.csv", content, Options{})
	if err != nil {
		t.Fatal(err)
	}
	// The orthometric height (an elevation) is preferred.
	if !closeTo(s.Points[0].P.Z, 240.1, 1e-12) || !hasWarning(s.Warnings, `"ellipsoidal height" not used`) {
		t.Errorf("z = %v, warnings %v, want 240.1 from the orthometric column", s.Points[0].P.Z, s.Warnings)
	}
	s, err = readString(t, "g.csv", "name,lat,lon,hae\n1,44.0415,-92.8464,210.5\n", Options{})
	if err != nil {
		t.Fatal(err)
	}
	if !hasWarning(s.Warnings, "ellipsoidal heights") {
		t.Errorf("warnings %v, want one about ellipsoidal heights", s.Warnings)
	}
}

func TestRead_MissingZAllowed(t *testing.T) {
	content := "id,n,e,z\n1,5000,1000,100\n2,5001,1001,\n"
	if _, err := readString(t, "z.csv", content, Options{}); !errors.Is(err, ErrNoElevation) {
		t.Fatalf("Read without AllowMissingZ: %v, want ErrNoElevation", err)
	}
	s, err := readString(t, "z.csv", content, Options{AllowMissingZ: true})
	if err != nil {
		t.Fatal(err)
	}
	if s.Points[1].HasZ() || s.Files[0].MissingZ != 1 || len(s.Positions()) != 1 || !hasWarning(s.Warnings, "no elevation") {
		t.Errorf("missing z: %+v, MissingZ %d, positions %d, warnings %v", s.Points[1], s.Files[0].MissingZ, len(s.Positions()), s.Warnings)
	}
	if sum := s.Summary(); sum.MissingZ != 1 || sum.ElevMaxM != 100 {
		t.Errorf("Summary MissingZ %d ElevMax %v, want 1 and 100", sum.MissingZ, sum.ElevMaxM)
	}
}

func TestRead_DuplicateIDSamePosition(t *testing.T) {
	s, err := readString(t, "d.csv", "id,n,e,z\n7,5000,1000,100\n7,5000,1000,100\n", Options{})
	if err != nil {
		t.Fatal(err)
	}
	if !hasWarning(s.Warnings, `"7" repeats line 2 exactly`) {
		t.Errorf("warnings %v, want the repeat", s.Warnings)
	}
}

func TestRead_CrossFileIDs(t *testing.T) {
	a := writeTemp(t, "day1.csv", "id,n,e,z\n1,5000,1000,100\n2,5001,1000,100\n")
	b := writeTemp(t, "day2.csv", "id,n,e,z\n1,5010,1010,99\n")
	s := mustRead(t, Options{}, a, b)
	if len(s.Points) != 3 || !hasWarning(s.Warnings, `point id "1" is also used in`) {
		t.Errorf("points %d warnings %v, want 3 and a warning about id 1", len(s.Points), s.Warnings)
	}
}
