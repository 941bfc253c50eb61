package design

import (
	"fmt"
	"math"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/units"
)

func relErr(got, want float64) float64 {
	if want == 0 {
		return math.Abs(got)
	}
	return math.Abs(got-want) / math.Abs(want)
}

func TestBuild_VerticalBox(t *testing.T) {
	// Vertical walls on flat ground: cut = L × W × depth, exactly (to
	// round-off), wherever the outline falls on the lattice.
	for _, tc := range []struct {
		name   string
		x0, y0 float64
		cell   float64
	}{
		{"aligned", 0, 0, 0.25},
		{"off the lattice", 0.1234, -0.0567, 0.1},
		{"coarse", 0.37, 0.11, 0.7},
	} {
		t.Run(tc.name, func(t *testing.T) {
			const L, W, depth, ground = 4.0, 3.0, 0.8, 100.0
			p := Params{
				Zones:       []Zone{{Name: "box", Ring: rect(tc.x0, tc.y0, tc.x0+L, tc.y0+W), DepthM: depth}},
				WaterLevelM: ground - 0.15, FreeboardM: 0.15, CellM: tc.cell,
			}
			s, err := Build(plane(ground, 0, 0, 50), p)
			if err != nil {
				t.Fatal(err)
			}
			want := L * W * (depth + 0.15)
			if relErr(s.CutM3, want) > 1e-12 || s.FillM3 > 1e-12 {
				t.Errorf("cut, fill = %.15g, %g, want %.15g, 0 (L·W·depth)", s.CutM3, s.FillM3, want)
			}
			if relErr(s.WaterVolumeM3, L*W*depth) > 1e-12 || relErr(s.WaterAreaM2, L*W) > 1e-12 {
				t.Errorf("water = %.15g m³ over %.15g m², want %g over %g", s.WaterVolumeM3, s.WaterAreaM2, L*W*depth, L*W)
			}
			if relErr(s.CutAreaM2, L*W) > 1e-12 {
				t.Errorf("cut area = %.15g, want %g", s.CutAreaM2, L*W)
			}
			t.Logf("cell %g, change %g, cut %.15g", s.CellM, s.RefineChange, s.CutM3)
		})
	}
}

func TestBuild_SteinerFlat(t *testing.T) {
	// Flat ground, one convex zone with wall slope s: the cut region at
	// height t above the floor is the zone dilated by s·t, so by Steiner's
	// formula for parallel sets of a convex polygon (area A + P r + π r²)
	// cut = A h + P s h²/2 + π s² h³/3 for cut depth h, the water volume is
	// the same with the water depth, and the water area is A + P s d + π (s d)².
	zones := map[string]geom.Ring{
		"rectangle": rect(-2, -1.5, 2.5, 1.5),
		"pentagon":  ring(0, -2, 2.2, -0.4, 1.4, 2.1, -1.3, 2.2, -2.1, -0.3),
	}
	for name, r := range zones {
		for _, s := range []float64{0.5, 1, 2} {
			t.Run(fmt.Sprintf("%s s=%g", name, s), func(t *testing.T) {
				const ground, depth, free = 50.0, 0.9, 0.2
				w := ground - free - 0.1 // rim 0.1 m below ground: no berm
				p := Params{Zones: []Zone{{Ring: r, DepthM: depth, WallSlope: s}}, WaterLevelM: w, FreeboardM: free}
				sf, err := Build(plane(ground, 0, 0, 100), p)
				if err != nil {
					t.Fatal(err)
				}
				A, P := r.CCW().Area(), r.Perimeter()
				steiner := func(h float64) float64 { return A*h + P*s*h*h/2 + math.Pi*s*s*h*h*h/3 }
				h := ground - (w - depth)
				if e := relErr(sf.CutM3, steiner(h)); e > 0.001 || sf.FillM3 != 0 {
					t.Errorf("cut = %.6f (fill %g), want %.6f (Steiner), error %.2g", sf.CutM3, sf.FillM3, steiner(h), e)
				}
				if e := relErr(sf.WaterVolumeM3, steiner(depth)); e > 0.001 {
					t.Errorf("water volume = %.6f, want %.6f (Steiner), error %.2g", sf.WaterVolumeM3, steiner(depth), e)
				}
				wa := A + P*s*depth + math.Pi*s*s*depth*depth
				if e := relErr(sf.WaterAreaM2, wa); e > 0.001 {
					t.Errorf("water area = %.6f, want %.6f (Steiner), error %.2g", sf.WaterAreaM2, wa, e)
				}
				t.Logf("cell %g change %.2g: cut err %.2g water err %.2g area err %.2g", sf.CellM, sf.RefineChange,
					relErr(sf.CutM3, steiner(h)), relErr(sf.WaterVolumeM3, steiner(depth)), relErr(sf.WaterAreaM2, wa))
			})
		}
	}
}

func TestBuild_SharpCorners(t *testing.T) {
	const ft = units.Foot
	tests := []struct {
		name       string
		L, W, s, h float64 // bottom L × W, slope, cut depth
		want       float64
		source     string
	}{
		// check-values.md §2c [derived]: V = L W h + s h² (L + W) + (4/3) s² h³.
		{"rectangle 4x3 1:1", 4, 3, 1, 1.1, 4*3*1.1 + 1*1.1*1.1*7 + 4.0/3*1.1*1.1*1.1, "check-values.md §2c prismoidal"},
		{"rectangle 6x2.5 2:1", 6, 2.5, 2, 0.8, 6*2.5*0.8 + 2*0.64*8.5 + 4.0/3*4*0.512, "check-values.md §2c prismoidal"},
		// check-values.md §2c [confirmed]: University of Regina Math Central
		// worked example, 100 × 70 ft at the surface, 2H:1V, 12 ft deep:
		// bottom 52 × 22 ft, 44 256 ft³.
		{"Math Central pond", 52 * ft, 22 * ft, 2, 12 * ft, 44256 * units.CubicFoot, "Math Central (U. Regina) worked example"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			const ground = 30.0
			w := ground // water and rim at the ground, so the cut depth is the zone depth
			p := Params{
				Zones:       []Zone{{Ring: rect(-tc.L/2+0.013, -tc.W/2-0.007, tc.L/2+0.013, tc.W/2-0.007), DepthM: tc.h, WallSlope: tc.s, Corners: Sharp}},
				WaterLevelM: w,
			}
			sf, err := Build(plane(ground, 0, 0, 100), p)
			if err != nil {
				t.Fatal(err)
			}
			if e := relErr(sf.CutM3, tc.want); e > 0.001 || sf.FillM3 != 0 {
				t.Errorf("cut = %.6f m³ (fill %g), want %.6f (%s), error %.2g", sf.CutM3, sf.FillM3, tc.want, tc.source, e)
			}
			if e := relErr(sf.WaterVolumeM3, tc.want); e > 0.001 {
				t.Errorf("water = %.6f m³, want %.6f (%s)", sf.WaterVolumeM3, tc.want, tc.source)
			}
			top := (tc.L + 2*tc.s*tc.h) * (tc.W + 2*tc.s*tc.h)
			if e := relErr(sf.WaterAreaM2, top); e > 0.001 {
				t.Errorf("water area = %.6f m², want %.6f (top rectangle)", sf.WaterAreaM2, top)
			}
			t.Logf("cell %g change %.2g cut err %.2g", sf.CellM, sf.RefineChange, relErr(sf.CutM3, tc.want))
		})
	}
}
