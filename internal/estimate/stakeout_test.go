package estimate

import (
	"context"
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/sitefile"
)

// The test site is analytic: a square yard of survey points on a plane
// z = 10 + slope·(x − 10) (m), in a local frame, with a pond outline
// walked as a regular 64-gon of radius 4 m around (10, 10), code POND. The
// design is one deep zone 0.5 m below the water at 1H:1V walls with round
// corners, the water at 9.9 m and 0.1 m of freeboard, so the rim is at
// 10.0 m. The floor is the outline offset inwards by s·d = 0.5 m, so, with
// round corners, every level set of the bowl is a parallel curve of the
// floor (Euclidean distance):
//
//	floor edge  E = 9.4 m   ring of radius ≈ 3.5 m
//	water edge  E = 9.9 m   floor + 0.5 m
//	rim         E = 10.0 m  floor + 0.6 m
//
// (a 64-gon's offsets are within 4·(1 − cos(π/64)) ≈ 4.8 mm of circles).
const (
	testCX, testCY  = 10.0, 10.0
	testOutlineR    = 4.0
	testDepth       = 0.5
	testWater       = 9.9
	testRim         = 10.0
	testCell        = 0.05
	testCrest       = 0.3
	testBermSlope   = 3.0
	testPolygonSlop = 0.005 // m: 64-gon against circle, 4(1 − cos(π/64)) = 4.8 mm
	// testShoreTol bounds how far a water's-edge stake lies off the exact
	// water line (and so, on 1:1 walls, D off W): the takeoff traces the
	// line on the 5 cm lattice, whose linear interpolation of the bowl
	// (curvature 1/3.5 m⁻¹) errs by about κ·(√2·h)²/8 = 0.2 mm, and stakes
	// fall on chords up to 7 cm long, which sag c²/8R = 0.15 mm.
	testShoreTol = 0.001
)

// testSite writes the survey and site file for ground slope slope and
// returns the result of the estimate.
func testSite(t *testing.T, slope float64) *Result {
	t.Helper()
	dir := t.TempDir()
	var b strings.Builder
	b.WriteString("Point,Northing,Easting,Elevation,Description\n")
	id := 1
	ground := func(x float64) float64 { return 10 + slope*(x-testCX) }
	for y := 0.0; y <= 20; y += 1 {
		for x := 0.0; x <= 20; x += 1 {
			fmt.Fprintf(&b, "%d,%.4f,%.4f,%.6f,GS\n", id, y+5000, x+1000, ground(x))
			id++
		}
	}
	for k := range 64 {
		th := 2 * math.Pi * float64(k) / 64
		x, y := testCX+testOutlineR*math.Cos(th), testCY+testOutlineR*math.Sin(th)
		fmt.Fprintf(&b, "%d,%.6f,%.6f,%.6f,POND\n", id, y+5000, x+1000, ground(x))
		id++
	}
	if err := os.WriteFile(filepath.Join(dir, "pts.csv"), []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	site := fmt.Sprintf(`units = "m"
crs = "local"
[survey]
files = ["pts.csv"]
[design]
cell = %g
[design.outline]
code = "POND"
wall_slope = 1.0
corners = "round"
deep_depth = %g
[water]
level = %g
freeboard = 0.1
[berm]
crest = %g
slope = %g
`, testCell, testDepth, testWater, testCrest, testBermSlope)
	path := filepath.Join(dir, "site.toml")
	if err := os.WriteFile(path, []byte(site), 0o644); err != nil {
		t.Fatal(err)
	}
	s, err := sitefile.Load(path)
	if err != nil {
		t.Fatal(err)
	}
	j, err := FromSite(s)
	if err != nil {
		t.Fatal(err)
	}
	r, err := Run(context.Background(), j)
	if err != nil {
		t.Fatal(err)
	}
	return r
}

// radius is the distance of a local point from the pond's centre, in the
// local frame (the frame origin is the survey's centre rounded to 1 m).
func radius(r *Result, p geom.Vec2) float64 {
	w := r.Survey.Frame.ToWorld(p)
	return math.Hypot(w.X-1000-testCX, w.Y-5000-testCY)
}

func TestStakeout_FlatGround(t *testing.T) {
	r := testSite(t, 0)
	if r.Design.RimM != testRim || r.Design.WaterLevelM != testWater {
		t.Fatalf("water %v rim %v, want %v and %v", r.Design.WaterLevelM, r.Design.RimM, testWater, testRim)
	}
	const spacing = 1.0
	stakes, err := Stakeout(r, spacing)
	if err != nil {
		t.Fatal(err)
	}
	floorR := testOutlineR - 1*testDepth // the floor: outline offset in by s·d
	byLine := map[StakeLine][]StakePoint{}
	for _, s := range stakes {
		byLine[s.Line] = append(byLine[s.Line], s)
		// World coordinates are the local ones plus the frame origin.
		if w := r.Survey.Frame.ToWorld(s.Local); w.X != s.EastingM || w.Y != s.NorthingM {
			t.Errorf("%s: world (%v, %v), want %v", s.ID, s.EastingM, s.NorthingM, w)
		}
		if s.CutM != s.ExistingM-s.FinishedM {
			t.Errorf("%s: cut %v, want G − D = %v", s.ID, s.CutM, s.ExistingM-s.FinishedM)
		}
		// Flat ground: G = 10 m everywhere (the TIN of a plane is the plane).
		if math.Abs(s.ExistingM-10) > 1e-9 {
			t.Errorf("%s: G = %v, want 10", s.ID, s.ExistingM)
		}
		rad := radius(r, s.Local)
		switch s.Line {
		case WaterEdge:
			// On the water line E = W: radius floor + s·d, D = W, cut = f.
			if math.Abs(rad-(floorR+testDepth)) > 2*testPolygonSlop+testShoreTol || math.Abs(s.FinishedM-testWater) > testShoreTol {
				t.Errorf("%s: radius %.4f D %.6f, want %.4f and %v", s.ID, rad, s.FinishedM, floorR+testDepth, testWater)
			}
		case FloorEdge:
			if math.Abs(rad-floorR) > 2*testPolygonSlop || math.Abs(s.FinishedM-(testWater-testDepth)) > 1e-9 {
				t.Errorf("%s: radius %.4f D %.6f, want %.4f and %v", s.ID, rad, s.FinishedM, floorR, testWater-testDepth)
			}
		case Daylight:
			// Ground at the rim: the wall daylights at the rim line,
			// floor + s·(d + f), and the edge runs through the last
			// nodes where D = G, at most a cell diagonal outside.
			rim := floorR + testDepth + 0.1
			if rad < rim-2*testPolygonSlop || rad > rim+math.Sqrt2*testCell+2*testPolygonSlop || s.FinishedM != s.ExistingM {
				t.Errorf("%s: radius %.4f, want %.4f to %.4f, D = G", s.ID, rad, rim, rim+math.Sqrt2*testCell)
			}
		default:
			t.Errorf("%s: line %v on flat ground at the rim, want no toe", s.ID, s.Line)
		}
	}
	// Stakes per closed line: ⌈L/spacing⌉ where L is the line's length:
	// the water line is near a circle of radius 4 m (2π·4 = 25.13 m), so
	// 26 stakes; the floor edge of radius 3.5 m (21.99 m) gets 22.
	for _, tc := range []struct {
		line StakeLine
		want int
	}{{WaterEdge, 26}, {FloorEdge, 22}} {
		if got := len(byLine[tc.line]); got != tc.want {
			t.Errorf("%d stakes on the %v, want %d", got, tc.line, tc.want)
		}
	}
	// Each line's stakes are evenly spaced, at most the spacing apart.
	for line, ss := range byLine {
		for i := 1; i < len(ss); i++ {
			step := ss[i].ChainageM - ss[i-1].ChainageM
			if step > spacing+1e-9 || math.Abs(step-ss[1].ChainageM) > 1e-9 {
				t.Errorf("%v: stakes %s and %s are %.6f m apart, want even steps ≤ %v", line, ss[i-1].ID, ss[i].ID, step, spacing)
			}
		}
	}
	if ids := []string{stakes[0].ID, byLine[FloorEdge][0].ID, byLine[FloorEdge][1].ID, byLine[Daylight][0].ID}; !reflect.DeepEqual(ids, []string{"W1", "Z1-1", "Z1-2", "T1"}) {
		t.Errorf("ids %q", ids)
	}
	again, err := Stakeout(r, spacing)
	if err != nil || !reflect.DeepEqual(again, stakes) {
		t.Error("a second Stakeout differs")
	}
}

func TestStakeout_SlopedGround(t *testing.T) {
	// Ground rising 5 % to the east: east of the centre the wall goes on
	// up above the rim and daylights where the bowl E meets the ground;
	// west of it the rim stands on a berm with a 0.3 m level crest and a
	// 3H:1V outer slope, B = R − (dist − c)/b, which meets the ground at
	// the toe (the design package's model). Both are checked at every
	// stake from those definitions, the bowl and berm taken as circles.
	const slope = 0.05
	r := testSite(t, slope)
	stakes, err := Stakeout(r, 0.5)
	if err != nil {
		t.Fatal(err)
	}
	floorR := testOutlineR - testDepth
	rimR := floorR + testDepth + 0.1
	// The work edge lies within a cell diagonal outside the true line:
	// the finished grade there is off the ground by at most that distance
	// times the steeper of the ground and the wall or berm.
	tol := math.Sqrt2*testCell*(1/1.0+slope) + 2*testPolygonSlop
	var nDay, nToe int
	for _, s := range stakes {
		w := r.Survey.Frame.ToWorld(s.Local)
		x := w.X - 1000
		g := 10 + slope*(x-testCX)
		if math.Abs(s.ExistingM-g) > 1e-6 {
			t.Errorf("%s: G = %v, want the plane's %v", s.ID, s.ExistingM, g)
		}
		rad := radius(r, s.Local)
		switch s.Line {
		case Daylight:
			nDay++
			e := testWater - testDepth + (rad - floorR) // wall at 1H:1V from the floor
			if e < testRim || e-g < -tol || e-g > tol || g < testRim {
				t.Errorf("%s: bowl %.4f, ground %.4f at radius %.4f: want the wall to meet the ground above the rim", s.ID, e, g, rad)
			}
		case Toe:
			nToe++
			berm := testRim - math.Max(0, rad-rimR-testCrest)/testBermSlope
			if berm-g < -tol || berm-g > tol || g >= testRim {
				t.Errorf("%s: berm %.4f, ground %.4f at radius %.4f: want the berm to meet the ground below the rim", s.ID, berm, g, rad)
			}
		case WaterEdge:
			if math.Abs(s.FinishedM-testWater) > testShoreTol || math.Abs(s.CutM-(g-testWater)) > testShoreTol {
				t.Errorf("%s: D %.6f cut %.6f, want %v and G − W = %.6f", s.ID, s.FinishedM, s.CutM, testWater, g-testWater)
			}
		}
	}
	if nDay == 0 || nToe == 0 {
		t.Errorf("%d daylight and %d toe stakes, want both", nDay, nToe)
	}
}

func TestStakeout_Errors(t *testing.T) {
	r := testSite(t, 0)
	tests := []struct {
		name    string
		r       *Result
		spacing float64
	}{
		{"no result", nil, 1},
		{"no design", &Result{}, 1},
		{"negative", r, -1},
		{"not a number", r, math.NaN()},
		{"infinite", r, math.Inf(1)},
		{"too close", r, MinStakeSpacingM / 2},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, err := Stakeout(tc.r, tc.spacing)
			if !errors.Is(err, ErrStakeout) {
				t.Errorf("Stakeout(%g) = %v, want ErrStakeout", tc.spacing, err)
			}
		})
	}
}

func TestStakeSpacing(t *testing.T) {
	tests := []struct {
		name    string
		units   string
		out     string
		spacing string
		want    float64
		err     bool
	}{
		// 3 ft is 0.9144 m exactly (international foot, 85 FR 62698).
		{"feet default", "ft", "", "", 0.9144, false},
		{"metric default", "m", "", "", 1, false},
		{"metric survey printed in feet", "m", "ft", "", 0.9144, false},
		{"from the site file", "ft", "", "6", 6 * 0.3048, false},
		{"with a unit", "ft", "", "2m", 2, false},
		{"zero", "m", "", "0", 0, true},
		{"negative", "m", "", "-1", 0, true},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			s := &sitefile.Site{Units: tc.units, OutUnits: tc.out}
			if tc.spacing != "" {
				if err := s.Set("report.stake_spacing=" + tc.spacing); err != nil {
					t.Fatal(err)
				}
			}
			j := &Job{Site: s}
			var err error
			if j.Units, err = parseSystem(tc.units, "units"); err != nil {
				t.Fatal(err)
			}
			j.OutUnits = j.Units
			if tc.out != "" {
				j.OutUnits, _ = parseSystem(tc.out, "out_units")
			}
			got, err := StakeSpacing(j)
			if (err != nil) != tc.err || (!tc.err && math.Abs(got-tc.want) > 1e-12) {
				t.Errorf("StakeSpacing = %v, %v; want %v (error %v)", got, err, tc.want, tc.err)
			}
		})
	}
}
