package takeoff

import (
	"errors"
	"math"
	"testing"

	"github.com/dugout-estimating/dugout/internal/design"
	"github.com/dugout-estimating/dugout/internal/geom"
)

// flatGround is existing ground at one elevation over a box, standing in
// for the TIN.
type flatGround struct {
	z   float64
	box geom.Box
}

func (g flatGround) Elevation(x, y float64) (float64, bool) {
	return g.z, g.box.Contains(geom.Vec2{X: x, Y: y})
}

func (g flatGround) SampleLattice(x0, y0, h float64, nx, ny int, out []float64) {
	for j := range ny {
		for i := range nx {
			out[j*nx+i] = math.NaN()
			if g.box.Contains(geom.Vec2{X: x0 + float64(i)*h, Y: y0 + float64(j)*h}) {
				out[j*nx+i] = g.z
			}
		}
	}
}

func (g flatGround) Bounds() geom.Box { return g.box }

// buildDesign lays zones on flat ground at the rim (so the cut depth is the
// rim depth) with the design package itself.
func buildDesign(t *testing.T, zones []design.Zone, w, fb, cell float64) *design.Surface {
	t.Helper()
	g := flatGround{z: w + fb, box: geom.Box{Min: geom.Vec2{X: -30, Y: -30}, Max: geom.Vec2{X: 30, Y: 30}}}
	s, err := design.Build(g, design.Params{Zones: zones, WaterLevelM: w, FreeboardM: fb, CellM: cell})
	if err != nil {
		t.Fatal(err)
	}
	return s
}

func TestFromDesign_VerticalWalls(t *testing.T) {
	// Through the design package: a vertical-walled pool 4 × 2.5 m, 0.8 m
	// deep, 0.15 m freeboard, whose walls fall between lattice nodes. The
	// sheet is the rule of thumb L + 2·depth + 2·overlap exactly (1 mm).
	const L, B, d, fb = 4.0, 2.5, 0.8, 0.15
	r := rectRing(0.037, 0.011, 0.037+L, 0.011+B)
	s := buildDesign(t, []design.Zone{{Name: "pool", Ring: r, DepthM: d, WallSlope: 0}}, 100, fb, 0.1)
	res, err := FromDesign(s, Options{})
	if err != nil {
		t.Fatal(err)
	}
	o := DefaultOverlapM
	wl, ww := L+2*(d+fb)+2*o, B+2*(d+fb)+2*o
	l := res.Liner
	if math.Abs(l.SheetLengthM-wl) > sheetTolM || math.Abs(l.SheetWidthM-ww) > sheetTolM {
		t.Errorf("sheet %.6f × %.6f m, want %.6f × %.6f", l.SheetLengthM, l.SheetWidthM, wl, ww)
	}
	if math.Abs(l.RuleOfThumbLengthM-wl) > sheetTolM || math.Abs(l.RuleOfThumbWidthM-ww) > sheetTolM {
		t.Errorf("rule of thumb %.6f × %.6f m, want %.6f × %.6f", l.RuleOfThumbLengthM, l.RuleOfThumbWidthM, wl, ww)
	}
	if l.SectionMethod != "analytic" {
		t.Errorf("section method %q", l.SectionMethod)
	}
	// The water line is the pool's outline.
	if sh := res.Shoreline; sh.Loops != 1 || !closeRel(sh.LengthM, 2*(L+B), 1e-9, 0) {
		t.Errorf("shoreline %d loops, %.9f m, want %g", sh.Loops, sh.LengthM, 2*(L+B))
	}
	if res.Water.VolumeM3 != s.WaterVolumeM3 || !closeRel(res.Water.VolumeM3, L*B*d, 1e-6, 0) {
		t.Errorf("water %g m³ (design %g), want L·B·d = %g", res.Water.VolumeM3, s.WaterVolumeM3, L*B*d)
	}
}

func TestFromDesign_SlopedZones(t *testing.T) {
	// A rectangular floor with walls at 1.5:1 and an elliptical one at 1:1:
	// the sheet against the analytic cross-section (exact geometry), the
	// developed area against Steiner's formula (on the design's 5 cm
	// lattice, 0.3 %), the shoreline against the parallel curve's length
	// P + 2π·s·d (Steiner), and the water against the parallel-set volume.
	const w, d, fb = 100.0, 0.8, 0.15
	H := d + fb
	for _, tc := range []struct {
		name string
		ring geom.Ring
		s    float64
		sec  bool // the floor is a rectangle: check the sheet
	}{
		{"rectangle", rectRing(0.037, 0.011, 4.037, 2.511), 1.5, true},
		{"ellipse", ellipseRing(geom.Vec2{X: 0.3, Y: -0.2}, 3, 1.5, 360), 1, false},
	} {
		t.Run(tc.name, func(t *testing.T) {
			s := buildDesign(t, []design.Zone{{Name: "floor", Ring: tc.ring, DepthM: d, WallSlope: tc.s}}, w, fb, 0.05)
			res, err := FromDesign(s, Options{Gravel: []GravelOptions{{ThicknessM: 0.05, Walls: true}}})
			if err != nil {
				t.Fatal(err)
			}
			A, P := math.Abs(tc.ring.Area()), tc.ring.Perimeter()
			band := (P*tc.s*H + math.Pi*tc.s*tc.s*H*H) * math.Sqrt(1+1/(tc.s*tc.s))
			if got := res.Liner.DevelopedAreaM2; !closeRel(got, A+band, 3e-3, 0) {
				t.Errorf("developed area %.4f m², want %.4f", got, A+band)
			}
			if tc.sec {
				o := DefaultOverlapM
				wl := 4 + 2*slopeLen(tc.s, H) + 2*o
				ww := 2.5 + 2*slopeLen(tc.s, H) + 2*o
				if l := res.Liner; math.Abs(l.SheetLengthM-wl) > sheetTolM || math.Abs(l.SheetWidthM-ww) > sheetTolM {
					t.Errorf("sheet %.5f × %.5f m, want %.5f × %.5f", l.SheetLengthM, l.SheetWidthM, wl, ww)
				}
			}
			if sh := res.Shoreline; !closeRel(sh.LengthM, P+2*math.Pi*tc.s*d, 1e-4, 0) {
				t.Errorf("shoreline %.5f m, want %.5f", sh.LengthM, P+2*math.Pi*tc.s*d)
			}
			wantV := A*d + P*tc.s*d*d/2 + math.Pi*tc.s*tc.s*d*d*d/3
			if !closeRel(res.Water.VolumeM3, wantV, 1e-3, 0) {
				t.Errorf("water %.5f m³, want %.5f", res.Water.VolumeM3, wantV)
			}
			// Wall gravel covers the walls: the Steiner band (0.5 %, the
			// zone split is good to a cell).
			if g := res.Stone.Gravel; len(g) != 1 || !closeRel(g[0].WallAreaM2, band, 5e-3, 0) {
				t.Errorf("gravel %+v, want walls %.4f m²", g, band)
			}
			// Flat ground at the rim: the deepest cut is the rim depth.
			in, err := InputFromDesign(s)
			if err != nil {
				t.Fatal(err)
			}
			if !closeRel(in.MaxCutDepthM, H, 1e-9, 0) {
				t.Errorf("deepest cut %.6f m, want the rim depth %g", in.MaxCutDepthM, H)
			}
		})
	}
}

func TestFromDesign_Nil(t *testing.T) {
	if _, err := FromDesign(nil, Options{}); !errors.Is(err, ErrInput) {
		t.Errorf("FromDesign(nil): err = %v, want ErrInput", err)
	}
}
