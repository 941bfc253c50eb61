// Command gendemo writes the demo survey of dugout: a made-up back yard,
// surveyed twice, so that every step of the tool can be shown and tested on
// data that is nobody's real job.
//
// The yard belongs to an invented client, Ines Halvorsen-Obi, at 27 Cattail
// Row in the invented town of Tallgrass Bend. It is about 25 m east–west by
// 18 m north–south and falls about 1.2 m from the house (south) to the back
// fence (north), with gentle waves. A low retaining wall, 0.45 m high, holds
// a terrace along the house side. It writes:
//
//   - yard_total_station.csv: a total-station survey in international feet
//     in a local frame (control point CP1 at N 5000.000, E 1000.000,
//     elevation 100.000 ft on an assumed datum; grid north is taken as true
//     north): a jittered 1.3 m grid of ground shots, the top and bottom of
//     the wall as two coded strings (BL1, BL2), a walked pond outline of 20
//     shots (code POND, a smooth kidney shape), three re-shot duplicates
//     (one of them 8 cm off in elevation: the rod sank into soft lawn), and
//     one shot on a stake top, 0.46 m above the ground (a spike).
//   - yard_phone_gps.csv and yard_phone_gps.gpx: the same shots as a phone
//     GPS would give them: lon/lat on WGS 84 (the local frame placed in UTM
//     zone 15N at E 487215, N 4652380 and converted with package crs),
//     altitude in metres (CP1 at 298.40 m), and accuracy columns, horizontal
//     0.3–2 m and vertical 0.5–3 m. Positions and altitudes are perturbed by
//     normal errors of those accuracies: hacc is taken as the 68 % radius of
//     a circular error (σ per axis = hacc/1.5096, since a Rayleigh
//     distribution reaches 68 % at 1.5096σ) and vacc as one σ.
//
// The terrain is analytic (a plane, two waves, the terrace step) plus 6 mm
// of normal noise, drawn from a fixed seed, so the files regenerate byte for
// byte:
//
//	go run ./tools/gendemo -out testdata/demo
package main

import (
	"bytes"
	"flag"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strconv"
	"strings"

	"github.com/dugout-estimating/dugout/internal/crs"
	"github.com/dugout-estimating/dugout/internal/units"
)

// The site, in metres from CP1 (u east, v north).
const (
	yardW = 25.0 // m, east–west
	yardH = 18.0 // m, north–south

	fallM      = 1.2  // m, fall from the house side to the back fence
	terraceM   = 0.45 // m, height of the terrace above the lawn at the wall
	wallCapM   = 0.05 // m, wall cap above the terrace
	wallThickM = 0.2  // m
	noiseM     = 0.006

	gridStepM   = 1.3
	gridJitterM = 0.25
	wallStepM   = 1.25

	// Local frame of the total station, in feet.
	cp1N, cp1E, cp1Z = 5000.0, 1000.0, 100.0

	// Placement of CP1 for the phone copy.
	utmZone    = 15
	cp1UTME    = 487215.0
	cp1UTMN    = 4652380.0
	cp1AltM    = 298.40
	rayleigh68 = 1.5096 // √(−2 ln 0.32): the 68 % radius of a unit circular normal
)

// wallV returns the northing (m) of the wall's face at easting u: a gentle
// curve across the whole width.
func wallV(u float64) float64 { return 4.0 + 0.3*math.Sin(math.Pi*u/yardW) }

// ground returns the analytic ground elevation at (u, v), in metres above
// the datum on which CP1 is 100.000 ft.
func ground(u, v float64) float64 {
	f := func(u, v float64) float64 {
		z := -fallM*v/yardH + 0.06*math.Sin(2*math.Pi*u/9)*math.Cos(2*math.Pi*v/7) + 0.04*math.Sin(2*math.Pi*(u+v)/13)
		if v < wallV(u) {
			z += terraceM
		}
		return z
	}
	return cp1Z*units.Foot + f(u, v) - f(0, 0)
}

// shot is one total-station observation, in metres from CP1.
type shot struct {
	id      string
	u, v, z float64
	desc    string
}

func main() {
	out := flag.String("out", "testdata/demo", "directory to write the demo survey into")
	flag.Parse()
	if err := run(*out); err != nil {
		fmt.Fprintln(os.Stderr, "gendemo:", err)
		os.Exit(1)
	}
}

func run(dir string) error {
	shots := survey(rand.New(rand.NewPCG(20260115, 27)))
	files := map[string][]byte{"yard_total_station.csv": totalStationCSV(shots)}
	gps, err := phoneCopy(shots, rand.New(rand.NewPCG(20260115, 28)))
	if err != nil {
		return err
	}
	files["yard_phone_gps.csv"] = phoneCSV(gps)
	files["yard_phone_gps.gpx"] = phoneGPX(gps)
	for name, b := range files {
		if err := os.WriteFile(filepath.Join(dir, name), b, 0o644); err != nil {
			return err
		}
	}
	return nil
}

// survey returns the shots in the order a crew would take them.
func survey(rng *rand.Rand) []shot {
	noise := func() float64 { return noiseM * rng.NormFloat64() }
	var s []shot
	s = append(s, shot{"1", 0, 0, ground(0, 0), "CP1 control, nail in patio"})
	s = append(s, shot{"2", 24.0, 0.5, ground(24.0, 0.5) + noise(), "CP2 backsight"})
	n := 100
	next := func() string { n++; return strconv.Itoa(n) }

	// The wall: top of the cap (on the terrace side of the face) and the
	// toe in front of it, as two strings.
	for u := 0.4; u < yardW; u += wallStepM {
		v := wallV(u) - wallThickM/2
		s = append(s, shot{next(), u, v, ground(u, v-0.01) + wallCapM + noise(), "BL1 top of wall"})
	}
	for u := 0.4; u < yardW; u += wallStepM {
		v := wallV(u) + 0.02
		s = append(s, shot{next(), u, v, ground(u, v) + noise(), "BL2 toe of wall"})
	}

	// Ground shots on a jittered grid, row by row in a serpentine walk,
	// leaving out the wall itself.
	var grid []shot
	rows := int(math.Floor(yardH/gridStepM)) + 1
	cols := int(math.Floor(yardW/gridStepM)) + 1
	for j := 0; j < rows; j++ {
		for k := 0; k < cols; k++ {
			i := k
			if j%2 == 1 {
				i = cols - 1 - k
			}
			u := math.Min(yardW, math.Max(0, float64(i)*gridStepM+gridJitterM*(2*rng.Float64()-1)))
			v := math.Min(yardH, math.Max(0, float64(j)*gridStepM+gridJitterM*(2*rng.Float64()-1)))
			if math.Abs(v-wallV(u)) < 0.4 || (u < 0.5 && v < 0.5) {
				continue
			}
			grid = append(grid, shot{next(), u, v, ground(u, v) + noise(), "GS"})
		}
	}
	s = append(s, grid...)

	// The pond outline painted on the lawn and walked with the prism:
	// an ellipse rotated 15° with a smooth dent on its north side.
	const cu, cv, a, b, rot, n0 = 13.0, 11.5, 3.2, 2.0, 15 * math.Pi / 180, 20
	for k := 0; k < n0; k++ {
		th := 2 * math.Pi * float64(k) / n0
		r := a * b / math.Hypot(b*math.Cos(th), a*math.Sin(th))
		d := math.Remainder(th-math.Pi/2, 2*math.Pi)
		r *= 1 - 0.3*math.Exp(-(d/0.55)*(d/0.55))
		u := cu + r*math.Cos(th+rot)
		v := cv + r*math.Sin(th+rot)
		s = append(s, shot{next(), u, v, ground(u, v) + noise(), "POND"})
	}

	// Check shots on three earlier ground shots: two agree to a few
	// millimetres, one is 8 cm low (the rod sank into soft lawn).
	for _, k := range []struct {
		i      int
		dz     float64
		remark string
	}{{12, 0.003, "GS check shot"}, {90, -0.002, "GS check shot"}, {151, -0.08, "GS check shot, soft ground"}} {
		g := grid[k.i]
		s = append(s, shot{next(), g.u + 0.002, g.v - 0.001, g.z + k.dz, k.remark})
	}

	// The blunder: a shot taken on a stake top, 0.46 m above the lawn.
	s = append(s, shot{next(), 18.2, 14.1, ground(18.2, 14.1) + 0.46, "GS"})
	return s
}

// ft formats metres as feet to 0.001 ft.
func ft(m float64) string { return strconv.FormatFloat(m/units.Foot, 'f', 3, 64) }

func csvField(s string) string {
	if strings.ContainsAny(s, ",\"") {
		return `"` + strings.ReplaceAll(s, `"`, `""`) + `"`
	}
	return s
}

func totalStationCSV(shots []shot) []byte {
	var b bytes.Buffer
	b.WriteString("# Demo survey: back yard of 27 Cattail Row, Tallgrass Bend (an invented site).\n")
	b.WriteString("# Total station, local frame in international feet; CP1 N 5000.000 E 1000.000 Z 100.000 (assumed datum).\n")
	b.WriteString("# Written by tools/gendemo; do not edit.\n")
	b.WriteString("Point,Northing,Easting,Elevation,Description\n")
	for _, s := range shots {
		fmt.Fprintf(&b, "%s,%s,%s,%s,%s\n", s.id, ft(cp1N*units.Foot+s.v), ft(cp1E*units.Foot+s.u), ft(s.z), csvField(s.desc))
	}
	return b.Bytes()
}

// gpsShot is one shot of the phone copy.
type gpsShot struct {
	id, code   string
	lon, lat   float64
	altM       float64
	hacc, vacc float64
}

// phoneCopy re-observes the shots as a phone GPS would: positions in UTM
// zone 15N, perturbed by the accuracy each fix reports, then lon/lat.
func phoneCopy(shots []shot, rng *rand.Rand) ([]gpsShot, error) {
	u := crs.UTM{Zone: utmZone}
	out := make([]gpsShot, 0, len(shots))
	z0 := cp1Z * units.Foot
	for _, s := range shots {
		hacc := 0.3 + 1.7*rng.Float64()
		vacc := math.Min(3, math.Max(0.5, hacc*(1.2+0.6*rng.Float64())))
		// Round to what is written, so that the errors drawn match the
		// stated accuracies exactly.
		hacc = math.Round(hacc*10) / 10
		vacc = math.Round(vacc*10) / 10
		sh := hacc / rayleigh68
		e := cp1UTME + s.u + sh*rng.NormFloat64()
		n := cp1UTMN + s.v + sh*rng.NormFloat64()
		lon, lat, err := u.Inverse(e, n)
		if err != nil {
			return nil, fmt.Errorf("shot %s: %w", s.id, err)
		}
		out = append(out, gpsShot{id: s.id, code: s.desc, lon: lon, lat: lat,
			altM: cp1AltM + (s.z - z0) + vacc*rng.NormFloat64(), hacc: hacc, vacc: vacc})
	}
	return out, nil
}

func deg(v float64) string { return strconv.FormatFloat(v, 'f', 9, 64) }

func phoneCSV(gps []gpsShot) []byte {
	var b bytes.Buffer
	b.WriteString("# Demo survey: the yard of yard_total_station.csv as a phone GPS records it (invented data).\n")
	b.WriteString("# WGS 84 lon/lat; altitude, horizontal and vertical accuracy in metres. Written by tools/gendemo.\n")
	b.WriteString("name,latitude,longitude,altitude_m,hacc_m,vacc_m,code\n")
	for _, g := range gps {
		fmt.Fprintf(&b, "%s,%s,%s,%.2f,%.1f,%.1f,%s\n", g.id, deg(g.lat), deg(g.lon), g.altM, g.hacc, g.vacc, csvField(g.code))
	}
	return b.Bytes()
}

func xmlText(s string) string {
	r := strings.NewReplacer("&", "&amp;", "<", "&lt;", ">", "&gt;")
	return r.Replace(s)
}

func phoneGPX(gps []gpsShot) []byte {
	var b bytes.Buffer
	b.WriteString(`<?xml version="1.0" encoding="UTF-8"?>` + "\n")
	b.WriteString(`<gpx version="1.1" creator="dugout tools/gendemo" xmlns="http://www.topografix.com/GPX/1/1" xmlns:acc="urn:x-dugout:accuracy:1">` + "\n")
	b.WriteString("  <metadata><name>27 Cattail Row, Tallgrass Bend (invented demo site)</name></metadata>\n")
	for _, g := range gps {
		fmt.Fprintf(&b, "  <wpt lat=\"%s\" lon=\"%s\"><ele>%.2f</ele><name>%s</name><desc>%s</desc>"+
			"<extensions><acc:hacc>%.1f</acc:hacc><acc:vacc>%.1f</acc:vacc></extensions></wpt>\n",
			deg(g.lat), deg(g.lon), g.altM, xmlText(g.id), xmlText(g.code), g.hacc, g.vacc)
	}
	b.WriteString("</gpx>\n")
	return b.Bytes()
}
