package design

import (
	"errors"
	"math"
	"strings"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/grid"
)

func TestBuild_BadInput(t *testing.T) {
	good := func() Params {
		return Params{Zones: []Zone{{Name: "z", Ring: rect(0, 0, 3, 2), DepthM: 0.5, WallSlope: 1}}, WaterLevelM: 100, FreeboardM: 0.1}
	}
	g := plane(100, 0.02, 0, 30)
	tests := []struct {
		name   string
		edit   func(*Params)
		want   error
		zone   int
		detail string
	}{
		{"no zones", func(p *Params) { p.Zones = nil }, ErrParams, -1, "no zones"},
		{"two vertices", func(p *Params) { p.Zones[0].Ring = ring(0, 0, 1, 1, 1, 1) }, ErrZone, 0, "2 distinct"},
		{"bow tie", func(p *Params) { p.Zones[0].Ring = ring(0, 0, 2, 2, 2, 0, 0, 2) }, ErrZone, 0, "crosses itself"},
		{"NaN vertex", func(p *Params) { p.Zones[0].Ring[1].X = math.NaN() }, ErrZone, 0, "not finite"},
		{"zero area", func(p *Params) { p.Zones[0].Ring = ring(0, 0, 1, 0, 2, 0) }, ErrZone, 0, ""},
		{"negative depth", func(p *Params) { p.Zones[0].DepthM = -0.3 }, ErrZone, 0, "depth -0.3 m"},
		{"absurd depth", func(p *Params) { p.Zones[0].DepthM = 12 }, ErrZone, 0, "outside 0 to 10 m"},
		{"absurd slope", func(p *Params) { p.Zones[0].WallSlope = 25 }, ErrZone, 0, "wall slope 25"},
		{"negative slope", func(p *Params) { p.Zones[0].WallSlope = -1 }, ErrZone, 0, "wall slope -1"},
		{"nearly vertical", func(p *Params) { p.Zones[0].WallSlope = 0.001 }, ErrZone, 0, "use 0 for a vertical wall"},
		{"corner option", func(p *Params) { p.Zones[0].Corners = 7 }, ErrZone, 0, "corner option 7"},
		{"second zone", func(p *Params) {
			p.Zones = append(p.Zones, Zone{Name: "deep", Ring: ring(0, 0, 1, 1, 1, 0, 0, 1), DepthM: 1})
		}, ErrZone, 1, `zone 1 "deep"`},
		{"freeboard", func(p *Params) { p.FreeboardM = -0.1 }, ErrParams, -1, "freeboard"},
		{"berm crest", func(p *Params) { p.BermCrestM = 80 }, ErrParams, -1, "berm crest width"},
		{"berm slope", func(p *Params) { p.BermSlope = -2 }, ErrParams, -1, "berm slope"},
		{"cell", func(p *Params) { p.CellM = -0.1 }, ErrParams, -1, "cell size"},
		{"water level", func(p *Params) { p.WaterLevelM = math.Inf(1) }, ErrParams, -1, "water level"},
		{"mode", func(p *Params) { p.Level = 9 }, ErrParams, -1, "mode 9"},
		{"fill per cut", func(p *Params) { p.Level, p.FillPerCut = LevelBalance, 5 }, ErrParams, -1, "balancing"},
		{"cell too fine", func(p *Params) { p.CellM = 0.0005 }, grid.ErrTooLarge, -1, "exceeds the limit"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			p := good()
			p.Zones[0].Ring = append(geom.Ring(nil), p.Zones[0].Ring...)
			tc.edit(&p)
			_, err := Build(g, p)
			if !errors.Is(err, tc.want) {
				t.Fatalf("Build error = %v, want %v", err, tc.want)
			}
			var ze *ZoneError
			if tc.zone >= 0 && (!errors.As(err, &ze) || ze.Index != tc.zone) {
				t.Fatalf("Build error = %v, want a ZoneError for zone %d", err, tc.zone)
			}
			if !strings.Contains(err.Error(), tc.detail) {
				t.Fatalf("Build error %q does not mention %q", err, tc.detail)
			}
		})
	}
	if _, err := Build(nil, good()); !errors.Is(err, ErrParams) {
		t.Errorf("Build(nil terrain) error = %v, want ErrParams", err)
	}
	empty := funcTerrain{f: g.f, box: geom.EmptyBox()}
	if _, err := Build(empty, good()); !errors.Is(err, ErrParams) {
		t.Errorf("Build(empty terrain) error = %v, want ErrParams", err)
	}
	far := good()
	far.Zones[0].Ring = rect(100, 100, 103, 102)
	if _, err := Build(g, far); !errors.Is(err, ErrOffSurvey) {
		t.Errorf("Build(zone off the survey) error = %v, want ErrOffSurvey", err)
	}
}

func TestBuild_WaterLevelWarnings(t *testing.T) {
	g := plane(100, 0.02, 0, 40)
	p := Params{Zones: []Zone{{Ring: rect(0, 0, 3, 2), DepthM: 0.5, WallSlope: 1}}, FreeboardM: 0.1, BermCrestM: 0.3}
	// Water above all ground: the pond stands on a berm; a warning says so.
	p.WaterLevelM = 102
	s, err := Build(g, p)
	if err != nil {
		t.Fatal(err)
	}
	if len(s.Warnings) != 1 || !strings.Contains(s.Warnings[0], "above all surveyed ground") || s.CutM3 != 0 || s.FillM3 <= 0 {
		t.Errorf("warnings %q, cut %g, fill %g: want one warning, all fill", s.Warnings, s.CutM3, s.FillM3)
	}
	// A water level typed as a depth (0.5 instead of 99.5): the walls would
	// climb 100 m; the work area needs more nodes than allowed.
	p.WaterLevelM = 0.5
	if _, err := Build(g, p); err == nil {
		t.Errorf("water level 0.5 m on ground at 100 m: no error")
	}
	// Modestly low: a warning, not an error.
	p.WaterLevelM, p.CellM = 98.7, 0.1
	s, err = Build(plane(100, 0.02, 0, 60), p)
	if err != nil {
		t.Fatal(err)
	}
	if len(s.Warnings) != 1 || !strings.Contains(s.Warnings[0], "greatest depth") {
		t.Errorf("warnings %q, want the sunken-rim warning", s.Warnings)
	}
}
