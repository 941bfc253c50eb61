package crs

import (
	"bytes"
	"fmt"
	"math"
	"math/rand/v2"
	"os/exec"
	"strconv"
	"strings"
	"testing"

	"github.com/dugout-estimating/dugout/internal/reftest"
)

// Tolerances of the comparisons with PROJ: 1 mm in grid coordinates, 1e-9°
// (about 0.1 mm) in geographic ones, the accuracy a site estimate needs
// with a wide margin. Both implementations use sixth-order Krüger series,
// so the real agreement is nanometres (the test logs it).
const (
	projTolM   = 1e-3
	projTolDeg = 1e-9
)

// cs2cs runs PROJ's cs2cs with args (source and target CRS) on pairs and
// returns the first two output columns of each line, at full precision.
func cs2cs(tb testing.TB, args []string, pairs [][2]float64) [][2]float64 {
	tb.Helper()
	exe := reftest.Tool(tb, "cs2cs")
	var in bytes.Buffer
	for _, p := range pairs {
		fmt.Fprintf(&in, "%.17g %.17g\n", p[0], p[1])
	}
	cmd := exec.Command(exe, append([]string{"-f", "%.17g"}, args...)...)
	cmd.Stdin = &in
	var stderr bytes.Buffer
	cmd.Stderr = &stderr
	out, err := cmd.Output()
	if err != nil {
		tb.Fatalf("cs2cs %v: %v: %s", args, err, stderr.String())
	}
	lines := strings.Split(strings.TrimSpace(string(out)), "\n")
	if len(lines) != len(pairs) {
		tb.Fatalf("cs2cs %v: %d lines for %d points:\n%s", args, len(lines), len(pairs), out)
	}
	res := make([][2]float64, len(pairs))
	for i, l := range lines {
		f := strings.Fields(l)
		if len(f) < 2 {
			tb.Fatalf("cs2cs %v: line %d %q", args, i+1, l)
		}
		for j := range 2 {
			v, err := strconv.ParseFloat(f[j], 64)
			if err != nil {
				tb.Fatalf("cs2cs %v: line %d %q: %v", args, i+1, l, err)
			}
			res[i][j] = v
		}
	}
	return res
}

type geoPoint struct {
	name     string
	lon, lat float64
	zone     UTM
}

// projPoints covers both hemispheres, both sides of a zone edge, the
// equator, points 3° and 5° off the central meridian and the latitude
// limits, plus seeded random points over the UTM domain.
func projPoints(tb testing.TB) []geoPoint {
	pts := []geoPoint{
		{"eugene_north", -123.0685, 44.0582, UTM{Zone: 10}},
		{"sydney_south", 151.215297, -33.856784, UTM{Zone: 56, South: true}},
		{"zone_edge_west_side", -120.0000001, 45, UTM{Zone: 10}},
		{"zone_edge_east_side", -120, 45, UTM{Zone: 11}},
		{"equator_north", 3.4, 1e-7, UTM{Zone: 31}},
		{"equator_south", -78.467834, -0.180653, UTM{Zone: 17, South: true}},
		{"equator_exact", 1.2, 0, UTM{Zone: 31}},
		{"cm_plus_3", -120, 30, UTM{Zone: 10}},
		{"cm_minus_3", -126, -60, UTM{Zone: 10, South: true}},
		{"cm_plus_5", 2, 1, UTM{Zone: 30}},
		{"cm_minus_5", -8, 62, UTM{Zone: 30}},
		{"north_limit", 15.6267, 84, UTM{Zone: 33}},
		{"south_limit", -70, -80, UTM{Zone: 19, South: true}},
	}
	seed := uint64(20261202)
	r := rand.New(rand.NewPCG(seed, 7))
	for i := range 40 {
		z := UTM{Zone: 1 + r.IntN(60)}
		lat := -80 + 164*r.Float64()
		z.South = lat < 0
		lon := math.Remainder(z.CentralMeridianDeg()+(r.Float64()*10-5), 360)
		pts = append(pts, geoPoint{fmt.Sprintf("random_%d_seed_%d", i, seed), lon, lat, z})
	}
	return pts
}

// TestUTM_PROJ compares Forward and Inverse with PROJ's cs2cs run live,
// EPSG:4326 (input "lat lon") to and from the WGS 84 UTM zone EPSG:326zz or
// 327zz.
func TestUTM_PROJ(t *testing.T) {
	byEPSG := map[int][]geoPoint{}
	for _, p := range projPoints(t) {
		byEPSG[p.zone.EPSG()] = append(byEPSG[p.zone.EPSG()], p)
	}
	worstM, worstDeg := 0.0, 0.0
	for code, pts := range byEPSG {
		target := "EPSG:" + strconv.Itoa(code)
		in := make([][2]float64, len(pts))
		for i, p := range pts {
			in[i] = [2]float64{p.lat, p.lon}
		}
		fwd := cs2cs(t, []string{"EPSG:4326", target}, in)
		inv := cs2cs(t, []string{target, "EPSG:4326"}, fwd)
		for i, p := range pts {
			e, n, err := p.zone.Forward(p.lon, p.lat)
			if err != nil {
				t.Errorf("%s: %v.Forward(%v, %v): %v", p.name, p.zone, p.lon, p.lat, err)
				continue
			}
			d := math.Max(math.Abs(e-fwd[i][0]), math.Abs(n-fwd[i][1]))
			worstM = math.Max(worstM, d)
			if d > projTolM {
				t.Errorf("%s: %v.Forward(%v, %v) = (%.6f, %.6f), cs2cs gives (%.6f, %.6f)",
					p.name, p.zone, p.lon, p.lat, e, n, fwd[i][0], fwd[i][1])
			}
			lon, lat, err := p.zone.Inverse(fwd[i][0], fwd[i][1])
			if err != nil {
				t.Errorf("%s: %v.Inverse(%v, %v): %v", p.name, p.zone, fwd[i][0], fwd[i][1], err)
				continue
			}
			dd := math.Max(math.Abs(lon-inv[i][1]), math.Abs(lat-inv[i][0]))
			worstDeg = math.Max(worstDeg, dd)
			if dd > projTolDeg {
				t.Errorf("%s: %v.Inverse(%.6f, %.6f) = (%.12f, %.12f), cs2cs gives (%.12f, %.12f)",
					p.name, p.zone, fwd[i][0], fwd[i][1], lon, lat, inv[i][1], inv[i][0])
			}
		}
	}
	t.Logf("largest difference from cs2cs: %.3g m forward, %.3g° inverse", worstM, worstDeg)
}

// TestTransverseMercator_PROJ compares general transverse Mercator
// projections (other ellipsoids, latitude of origin, scale, false origin)
// with cs2cs "+proj=tmerc", the ellipsoid given by a and 1/f so that both
// use exactly the same figure.
func TestTransverseMercator_PROJ(t *testing.T) {
	tms := []struct {
		name string
		tm   TransverseMercator
	}{
		{"airy_national_grid", TransverseMercator{Ellipsoid: Airy1830, Lon0Deg: -2, Lat0Deg: 49, K0: 0.9996012717, FalseE: 400000, FalseN: -100000}},
		{"clarke1866_k09999", TransverseMercator{Ellipsoid: Clarke1866, Lon0Deg: -89.75, Lat0Deg: 29.5, K0: 0.99995, FalseE: 200000}},
		{"grs80_southern_origin", TransverseMercator{Ellipsoid: GRS80, Lon0Deg: 173, Lat0Deg: -41, K0: 0.9996, FalseE: 1600000, FalseN: 10000000}},
		{"wgs84_plain", TransverseMercator{}},
	}
	offsets := [][2]float64{{0, 0}, {0.5, 1}, {-3, 10}, {3, -20}, {5, 45}, {-5, 60}, {2, 80}, {10, 30}, {-25, 5}}
	for _, c := range tms {
		t.Run(c.name, func(t *testing.T) {
			el := c.tm.Ellipsoid.orDefault()
			fig := fmt.Sprintf("+a=%.17g +rf=%.17g", el.A, el.InvF)
			k0 := c.tm.K0
			if k0 == 0 {
				k0 = 1
			}
			to := fmt.Sprintf("+proj=tmerc %s +lon_0=%.17g +lat_0=%.17g +k_0=%.17g +x_0=%.17g +y_0=%.17g +units=m",
				fig, c.tm.Lon0Deg, c.tm.Lat0Deg, k0, c.tm.FalseE, c.tm.FalseN)
			args := append(append([]string{"+proj=longlat"}, strings.Fields(fig)...), "+to")
			args = append(args, strings.Fields(to)...)
			in := make([][2]float64, len(offsets))
			for i, o := range offsets {
				in[i] = [2]float64{c.tm.Lon0Deg + o[0], o[1]}
			}
			fwd := cs2cs(t, args, in)
			for i, p := range in {
				x, y := c.tm.Forward(p[0], p[1])
				if math.Abs(x-fwd[i][0]) > projTolM || math.Abs(y-fwd[i][1]) > projTolM {
					t.Errorf("Forward(%v, %v) = (%.6f, %.6f), cs2cs %s gives (%.6f, %.6f)", p[0], p[1], x, y, to, fwd[i][0], fwd[i][1])
				}
				lon, lat := c.tm.Inverse(fwd[i][0], fwd[i][1])
				if math.Abs(math.Remainder(lon-p[0], 360)) > projTolDeg || math.Abs(lat-p[1]) > projTolDeg {
					t.Errorf("Inverse(%.6f, %.6f) = (%.12f, %.12f), want (%v, %v)", fwd[i][0], fwd[i][1], lon, lat, p[0], p[1])
				}
			}
		})
	}
	// The pole maps to the quarter meridian (see TestTransverseMercator_Degenerate).
	pole := cs2cs(t, []string{"+proj=longlat", "+ellps=WGS84", "+to", "+proj=tmerc", "+ellps=WGS84"}, [][2]float64{{0, 90}})
	if _, y := (TransverseMercator{}).Forward(0, 90); math.Abs(y-pole[0][1]) > projTolM {
		t.Errorf("Forward(0, 90) y = %.6f, cs2cs gives %.6f", y, pole[0][1])
	}
}

// TestUTM_ANCHORS checks the PROJ 9.1.1 cs2cs outputs recorded in
// shared/refbench/ANCHORS.md §5 (ref_proj.sh, %.17g): zone choice, forward
// within 1 mm and the inverse of the recorded grid coordinates within 1e-9°.
func TestUTM_ANCHORS(t *testing.T) {
	tests := []struct {
		name       string
		lat, lon   float64
		zone       UTM
		standard   bool // the zone UTMZoneFor must choose
		east, nrth float64
	}{
		{"autzen_eugene_OR", 44.0582, -123.0685, UTM{Zone: 10}, true, 494513.44469468249, 4878339.3003019663},
		{"greenwich_observatory", 51.477928, -0.001545, UTM{Zone: 30}, true, 708210.24327226554, 5707238.6454482768},
		{"sydney_opera_house", -33.856784, 151.215297, UTM{Zone: 56, South: true}, true, 334900.26129197387, 6252290.5224060407},
		{"quito", -0.180653, -78.467834, UTM{Zone: 17, South: true}, true, 781857.67112838663, 9980012.7674409375},
		{"denver", 39.7392, -104.9903, UTM{Zone: 13}, true, 500831.1304475778, 4398811.6675874693},
		{"equator_central_meridian_31", 0, 3, UTM{Zone: 31}, true, 500000.00000000099, 0},
		{"zone_boundary_lon_-120", 45, -120, UTM{Zone: 11}, true, 263553.9738987927, 4987329.5046989135},
		{"zone_boundary_lon_-120_in_10N", 45, -120, UTM{Zone: 10}, false, 736446.02610120934, 4987329.5046989135},
		{"bergen_norway_32V", 60.3913, 5.3221, UTM{Zone: 32}, true, 297353.93272915104, 6700648.3452317351},
		{"bergen_norway_in_31N", 60.3913, 5.3221, UTM{Zone: 31}, false, 627970.85003314482, 6697245.7346488219},
		{"longyearbyen_svalbard_33X", 78.2232, 15.6267, UTM{Zone: 33}, true, 514278.71511326864, 8683355.4694705047},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			if tc.standard {
				z, err := UTMZoneFor(tc.lon, tc.lat)
				if err != nil || z != tc.zone {
					t.Errorf("UTMZoneFor(%v, %v) = %v, %v, want %v", tc.lon, tc.lat, z, err, tc.zone)
				}
			}
			e, n, err := tc.zone.Forward(tc.lon, tc.lat)
			if err != nil {
				t.Fatalf("%v.Forward(%v, %v): %v", tc.zone, tc.lon, tc.lat, err)
			}
			if math.Abs(e-tc.east) > projTolM || math.Abs(n-tc.nrth) > projTolM {
				t.Errorf("%v.Forward(%v, %v) = (%.9f, %.9f), want (%.9f, %.9f)", tc.zone, tc.lon, tc.lat, e, n, tc.east, tc.nrth)
			}
			lon, lat, err := tc.zone.Inverse(tc.east, tc.nrth)
			if err != nil {
				t.Fatalf("%v.Inverse: %v", tc.zone, err)
			}
			if math.Abs(lon-tc.lon) > projTolDeg || math.Abs(lat-tc.lat) > projTolDeg {
				t.Errorf("%v.Inverse(%v, %v) = (%.15f, %.15f), want (%v, %v)", tc.zone, tc.east, tc.nrth, lon, lat, tc.lon, tc.lat)
			}
		})
	}
}
