package survey

import (
	"bytes"
	"fmt"
	"math"
	"strings"
	"testing"

	"pgregory.net/rapid"

	"github.com/dugout-estimating/dugout/internal/crs"
	"github.com/dugout-estimating/dugout/internal/units"
)

var systems = []units.System{units.Metres, units.Feet, units.USFeet}

// TestWriteCSV_RoundTrip: reading what WriteCSV wrote, in the same units
// and system, gives the same points (ids, codes, world positions to float
// round-off of the unit conversion, a few ulps).
func TestWriteCSV_RoundTrip(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		in := rapid.SampledFrom(systems).Draw(t, "in")
		out := rapid.SampledFrom(systems).Draw(t, "out")
		n := rapid.IntRange(1, 40).Draw(t, "n")
		x0 := rapid.Float64Range(-5e6, 5e6).Draw(t, "x0")
		y0 := rapid.Float64Range(-5e6, 5e6).Draw(t, "y0")
		codeGen := rapid.StringMatching(`[A-Za-z0-9]([A-Za-z0-9 ,;"#]{0,12}[A-Za-z0-9])?`)
		var b strings.Builder
		b.WriteString("id,e,n,z,code\n")
		for i := range n {
			x := x0 + rapid.Float64Range(-500, 500).Draw(t, "dx")
			y := y0 + rapid.Float64Range(-500, 500).Draw(t, "dy")
			z := rapid.Float64Range(-400, 9000).Draw(t, "z")
			code := codeGen.Draw(t, "code")
			fmt.Fprintf(&b, "P%d,%v,%v,%v,\"%s\"\n", i, x, y, z, strings.ReplaceAll(code, `"`, `""`))
		}
		opt := Options{Units: in, CRS: crs.Spec{CRS: crs.LocalCRS()}}
		a, err := readData("a.csv", []byte(b.String()), opt)
		if err != nil {
			t.Fatalf("read generated CSV: %v\n%s", err, b.String())
		}
		var buf bytes.Buffer
		if err := WriteCSV(&buf, a, out); err != nil {
			t.Fatal(err)
		}
		opt.Units = out
		c, err := readData("c.csv", buf.Bytes(), opt)
		if err != nil {
			t.Fatalf("read written CSV: %v\n%s", err, buf.String())
		}
		if len(c.Points) != len(a.Points) {
			t.Fatalf("%d points back, want %d", len(c.Points), len(a.Points))
		}
		for i := range a.Points {
			p, q := a.Points[i], c.Points[i]
			px, py, pz := a.WorldPos(p.P, units.Metres)
			qx, qy, qz := c.WorldPos(q.P, units.Metres)
			if p.ID != q.ID || p.Code != q.Code || !ulpClose(px, qx) || !ulpClose(py, qy) || !ulpClose(pz, qz) {
				t.Fatalf("point %d: wrote %q %q (%v %v %v), read %q %q (%v %v %v)\n%s", i, p.ID, p.Code, px, py, pz, q.ID, q.Code, qx, qy, qz, buf.String())
			}
		}
	})
}

// ulpClose reports whether a and b are within 8 units in the last place of
// the larger, plus 1e-12 m: a value converted to another unit and back
// (two roundings each way, and the frame shift) stays within that.
func ulpClose(a, b float64) bool {
	m := math.Max(math.Abs(a), math.Abs(b))
	return math.Abs(a-b) <= 8*(math.Nextafter(m, math.Inf(1))-m)+1e-12
}

// TestRead_LonLatRoundTrip: lon/lat read from a CSV, projected to UTM by
// Read and taken back with the zone's inverse returns the input within
// 1e-9° (about 0.1 mm), anywhere in the UTM latitudes.
func TestRead_LonLatRoundTrip(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		lon0 := rapid.Float64Range(-179.9, 179.9).Draw(t, "lon0")
		lat0 := rapid.Float64Range(-79.9, 83.9).Draw(t, "lat0")
		n := rapid.IntRange(1, 10).Draw(t, "n")
		var b strings.Builder
		b.WriteString("lat,lon,alt\n")
		type ll struct{ lon, lat float64 }
		var in []ll
		for range n {
			p := ll{
				lon: math.Max(-180, math.Min(180, lon0+rapid.Float64Range(-0.005, 0.005).Draw(t, "dlon"))),
				lat: math.Max(-80, math.Min(84, lat0+rapid.Float64Range(-0.005, 0.005).Draw(t, "dlat"))),
			}
			fmt.Fprintf(&b, "%.12f,%.12f,100\n", p.lat, p.lon)
			var q ll
			fmt.Sscanf(fmt.Sprintf("%.12f %.12f", p.lon, p.lat), "%g %g", &q.lon, &q.lat)
			in = append(in, q)
		}
		s, err := readData("ll.csv", []byte(b.String()), Options{})
		if err != nil {
			t.Fatalf("%v\n%s", err, b.String())
		}
		if s.CRS.UTM == nil {
			t.Fatalf("CRS %v is not a UTM zone", s.CRS)
		}
		for i, p := range s.Points {
			e, n, _ := s.WorldPos(p.P, units.Metres)
			lon, lat, err := s.CRS.UTM.Inverse(e, n)
			if err != nil {
				t.Fatal(err)
			}
			dlon := math.Abs(math.Remainder(lon-in[i].lon, 360))
			if dlon > 1e-9 || math.Abs(lat-in[i].lat) > 1e-9 {
				t.Fatalf("point %d: lon/lat %v %v came back as %v %v", i, in[i].lon, in[i].lat, lon, lat)
			}
		}
	})
}
