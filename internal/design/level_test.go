package design

import (
	"errors"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
)

func TestBuild_AutoLevel(t *testing.T) {
	// On a plane G = z0 + g·p, the lowest ground along the rim line of a
	// convex round-cornered zone is min over the zone's vertices v of
	// G(v) − r·|g|, where r = s·(d + f) is the rim line's distance from the
	// zone (the minimum of a linear function over a polygon dilated by a
	// disc: support functions add). Auto sets W to that minus f.
	const z0, gx, gy = 100.0, 0.05, -0.03
	r := ring(-2, -1.5, 2.5, -1.5, 3, 1, -1, 2)
	for _, tc := range []struct {
		name    string
		s, d, f float64
	}{{"1:1", 1, 0.6, 0.1}, {"2:1", 2, 0.9, 0.2}, {"steep", 0.5, 0.4, 0.05}} {
		t.Run(tc.name, func(t *testing.T) {
			p := Params{Zones: []Zone{{Ring: r, DepthM: tc.d, WallSlope: tc.s}}, Level: LevelAuto,
				FreeboardM: tc.f, BermCrestM: 0.3}
			s, err := Build(plane(z0, gx, gy, 50), p)
			if err != nil {
				t.Fatal(err)
			}
			low := math.Inf(1)
			for _, v := range r {
				low = min(low, z0+gx*v.X+gy*v.Y)
			}
			want := low - tc.s*(tc.d+tc.f)*math.Hypot(gx, gy) - tc.f
			if math.Abs(s.WaterLevelM-want) > 1e-5 || s.Level != LevelAuto {
				t.Errorf("auto water level = %.7f (%v), want %.7f", s.WaterLevelM, s.Level, want)
			}
			// With the rim at the lowest ground on the rim line the berm
			// crest is the only fill, a thin sliver at the low point.
			if s.FillM3 > 0.01*s.CutM3 {
				t.Errorf("fill %g m³ against cut %g m³ at the auto level", s.FillM3, s.CutM3)
			}
		})
	}
}

func TestBuild_AutoLevelVertical(t *testing.T) {
	// A vertical-walled zone: the rim line is the outline itself, so the
	// rim sits at the ground's lowest vertex.
	r := rect(0, 0, 3, 2)
	s, err := Build(plane(50, 0.1, 0.2, 20), Params{Zones: []Zone{{Ring: r, DepthM: 0.5}}, Level: LevelAuto, FreeboardM: 0.1})
	if err != nil {
		t.Fatal(err)
	}
	if want := 50 - 0.1; math.Abs(s.WaterLevelM-want) > 1e-9 {
		t.Errorf("auto water level = %.9f, want %.9f", s.WaterLevelM, want)
	}
}

func TestBuild_Balance(t *testing.T) {
	// The balance level satisfies its definition: rebuilding at that fixed
	// level on the same lattice gives FillPerCut × cut = fill.
	g, _, zones := slopedYard()
	for _, k := range []float64{0.8, 1, 1.25} {
		p := Params{Zones: zones, Level: LevelBalance, FillPerCut: k, FreeboardM: 0.15, BermCrestM: 0.5, BermSlope: 2}
		s, err := Build(g, p)
		if err != nil {
			t.Fatal(err)
		}
		if s.Level != LevelBalance {
			t.Errorf("Level = %v, want balance", s.Level)
		}
		q := p
		q.Level, q.WaterLevelM, q.CellM = LevelFixed, s.WaterLevelM, s.CellM
		f, err := Build(g, q)
		if err != nil {
			t.Fatal(err)
		}
		if d := k*f.CutM3 - f.FillM3; math.Abs(d) > 1e-4*f.CutM3 {
			t.Errorf("k = %g: at W = %.6f, k·cut − fill = %.3g (cut %.4f, fill %.4f), want 0", k, s.WaterLevelM, d, f.CutM3, f.FillM3)
		}
		if math.Abs(s.CutM3-f.CutM3) > 1e-9*f.CutM3 {
			t.Errorf("k = %g: balance cut %.9f, fixed rebuild %.9f", k, s.CutM3, f.CutM3)
		}
	}
}

func TestBuild_BalanceErrors(t *testing.T) {
	g, _, zones := slopedYard()
	_, err := Build(g, Params{Zones: zones, Level: LevelBalance, FreeboardM: 0.1})
	if !errors.Is(err, ErrParams) {
		t.Fatalf("balance without FillPerCut: error %v, want ErrParams", err)
	}
	// A survey that stops just beyond the pond: raising the water to
	// balance would need a berm on unsurveyed ground.
	small := plane(100, 0.06, 0.02, 5)
	_, err = Build(small, Params{Zones: zones, Level: LevelBalance, FillPerCut: 0.5, FreeboardM: 0.15, BermCrestM: 0.5})
	var oe *OffSurveyError
	if !errors.Is(err, ErrNoBalance) || !errors.As(err, &oe) {
		t.Fatalf("balance on a small survey: error %v, want ErrNoBalance wrapping *OffSurveyError", err)
	}
}

func TestBuild_OffSurvey(t *testing.T) {
	// The zone runs past the survey's east edge at x = 3.
	g := funcTerrain{f: func(x, y float64) float64 { return 10 }, box: geom.Box{Min: geom.Vec2{X: -10, Y: -10}, Max: geom.Vec2{X: 3, Y: 10}}}
	_, err := Build(g, Params{Zones: []Zone{{Ring: rect(-1, -1, 2.7, 1), DepthM: 0.5, WallSlope: 1}}, WaterLevelM: 10})
	var oe *OffSurveyError
	if !errors.As(err, &oe) || !errors.Is(err, ErrOffSurvey) {
		t.Fatalf("error = %v, want *OffSurveyError", err)
	}
	// The wall daylights 0.5 m beyond the zone, at x = 3.2: the cut needs
	// ground 0.2 m beyond the edge (the estimate is a bound: it counts
	// every unsurveyed node the work area could need).
	if !(oe.BeyondM > 0 && oe.BeyondM < 1) || oe.InBowl {
		t.Errorf("OffSurveyError = %+v, want a wall less than a metre beyond", oe)
	}
	_, err = Build(g, Params{Zones: []Zone{{Ring: rect(1, -1, 4, 1), DepthM: 0.5, WallSlope: 1}}, WaterLevelM: 10})
	if !errors.As(err, &oe) || !oe.InBowl || oe.BeyondM < 1 {
		t.Fatalf("error = %v (%+v), want the bowl itself off the survey by more than 1 m", err, oe)
	}
}

func TestBuild_AutoLevelOffSurvey(t *testing.T) {
	// The rim line, 1 m out from the zone (2:1 wall, 0.4 m depth and
	// 0.1 m freeboard), crosses the survey's edge at x = 3.
	g := funcTerrain{f: func(x, y float64) float64 { return 10 + 0.01*x }, box: geom.Box{Min: geom.Vec2{X: -10, Y: -10}, Max: geom.Vec2{X: 3, Y: 10}}}
	_, err := Build(g, Params{Zones: []Zone{{Ring: rect(-1, -1, 2.5, 1), DepthM: 0.4, WallSlope: 2}}, Level: LevelAuto, FreeboardM: 0.1})
	if !errors.Is(err, ErrOffSurvey) || !strings.Contains(err.Error(), "rim line leaves the surveyed surface") {
		t.Fatalf("error = %v, want the rim line off the survey", err)
	}
}

// TestRimField_MatchesField checks the banded rim-line field of the auto
// level against the full field: every node it computes has the full
// field's e and owner, and every lattice edge on which the full field
// puts a rim crossing that the auto level uses (finite ends, no vertical
// owner) has both ends computed.
func TestRimField_MatchesField(t *testing.T) {
	_, _, zones := slopedYard()
	zones = append(zones,
		Zone{Name: "vertical L", Ring: ring(4, -3, 7, -3, 7, -1, 5, -1, 5, 1, 4, 1), DepthM: 0.5},
		Zone{Name: "sharp", Ring: ring(-6, 2, -4, 2.5, -4.5, 4), DepthM: 0.4, WallSlope: 0.7, Corners: Sharp})
	zs, err := newZoneSet(zones, 0.12)
	if err != nil {
		t.Fatal(err)
	}
	f := zs.freeboard
	for _, h := range []float64{0.125, 0.03125} {
		l, err := gridLattice(zs.rimBox().Expand(2*h), h)
		if err != nil {
			t.Fatal(err)
		}
		full, band := newField(zs, l), newRimField(zs, l)
		computed := 0
		for k := range band.e {
			if math.IsNaN(band.e[k]) {
				continue
			}
			computed++
			if band.e[k] != full.e[k] || (full.own[k] >= 0 && band.own[k] != full.own[k]) {
				t.Fatalf("h %g node %d: rim field e %g own %d, full field %g %d", h, k, band.e[k], band.own[k], full.e[k], full.own[k])
			}
		}
		used := func(k int) bool {
			o := full.own[k]
			return !math.IsInf(full.e[k], 0) && !(o >= 0 && zs.z[o].kind == kindVertical)
		}
		crossings := 0
		for k := range full.e {
			i, j := k%l.NX, k/l.NX
			for _, m := range []int{k + 1, k + l.NX} {
				if (m == k+1 && i+1 >= l.NX) || (m == k+l.NX && j+1 >= l.NY) {
					continue
				}
				if (full.e[k] <= f) == (full.e[m] <= f) || !used(k) || !used(m) {
					continue
				}
				crossings++
				if math.IsNaN(band.e[k]) || math.IsNaN(band.e[m]) {
					t.Fatalf("h %g: the rim line crosses edge %d–%d (e %g, %g) outside the rim field", h, k, m, full.e[k], full.e[m])
				}
			}
		}
		if crossings == 0 || h < 0.1 && 2*computed > l.Len() {
			t.Errorf("h %g: %d crossings, %d of %d nodes computed: the rim field should be a band", h, crossings, computed, l.Len())
		}
		t.Logf("h %g: %d crossings, %d of %d nodes computed", h, crossings, computed, l.Len())
	}
}

// TestCloseEnd checks the bracket shortcut of the balance search on
// functions whose slope obeys the bound it is given: a returned end is
// within the tolerance of the root (found here analytically), and a
// bracket the bound cannot settle is left to the search.
func TestCloseEnd(t *testing.T) {
	const tol = 1e-5
	seed := uint64(20260304)
	rng := rand.New(rand.NewPCG(seed, 5))
	returned := 0
	for k := range 20000 {
		// f(W) = S·(r − W)·(1 − c·(W − r)), decreasing on the bracket with
		// |f′| ≤ S·(1 + 2c·|W − r|); the bound passed is that maximum.
		r := 29 + rng.Float64()
		s := 5 + 50*rng.Float64()
		c := 10 * rng.Float64()
		lo := r - 3e-5*rng.Float64()
		hi := r + 3e-5*rng.Float64()
		f := func(w float64) float64 { return s * (r - w) * (1 - c*(w-r)) }
		bound := s * (1 + 2*c*max(r-lo, hi-r))
		w, ok := closeEnd(lo, hi, f(lo), f(hi), bound, tol)
		if !ok {
			continue
		}
		returned++
		if w != lo && w != hi {
			t.Fatalf("case %d (seed %d): closeEnd = %.17g, not an end of [%.17g, %.17g]", k, seed, w, lo, hi)
		}
		if d := math.Abs(w - r); d > tol {
			t.Fatalf("case %d (seed %d): closeEnd = %.12f is %.3g m from the root %.12f, more than %g", k, seed, w, d, r, tol)
		}
	}
	if returned < 1000 {
		t.Errorf("only %d of 20000 brackets settled", returned)
	}
	// A bracket far wider than the tolerance with a steep slope at its
	// ends says nothing about where the root is.
	if _, ok := closeEnd(29, 29.01, 0.5, -0.5, 100, tol); ok {
		t.Errorf("closeEnd settled a 1 cm bracket")
	}
}
