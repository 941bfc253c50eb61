package estimate

import (
	"context"
	"math"
	"path/filepath"
	"runtime"
	"testing"

	"github.com/dugout-estimating/dugout/internal/sitefile"
)

// TestReadmeWorkedExample runs docs/example (the README's worked example)
// and checks it against the closed forms for a convex floor of area A and
// perimeter P with walls of slope s on flat ground (Steiner's formula for
// the parallel sets of a convex polygon):
//
//	cut   = A h + P s h²/2 + π s² h³/3, h = ground − floor = 0.7 m
//	water = the same with h = depth = 0.6 m; area A + P s d + π (s d)²
//	liner = A + (P s H + π s² H²) √(1 + 1/s²), H = rim − floor = 0.7 m
//	shore = P + 2π s d
//
// The README quotes these numbers; keep the two in step.
func TestReadmeWorkedExample(t *testing.T) {
	_, file, _, _ := runtime.Caller(0)
	s, err := sitefile.Load(filepath.Join(filepath.Dir(file), "..", "..", "docs", "example", "site.toml"))
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
	const A, P, sl = 12.0, 14.0, 1.0
	steiner := func(h float64) float64 { return A*h + P*sl*h*h/2 + math.Pi*sl*sl*h*h*h/3 }
	tests := []struct {
		name      string
		got, want float64
		rel       float64
	}{
		{"cut m³", r.Design.CutM3, steiner(0.7), 1e-3},
		{"fill m³", r.Design.FillM3, 0, 0},
		{"water m³", r.Design.WaterVolumeM3, steiner(0.6), 1e-3},
		{"water area m²", r.Design.WaterAreaM2, A + P*sl*0.6 + math.Pi*0.36, 1e-3},
		{"liner developed m²", r.Takeoff.Liner.DevelopedAreaM2, A + (P*sl*0.7+math.Pi*0.49)*math.Sqrt(2), 2e-3},
		{"shoreline m", r.Takeoff.Shoreline.LengthM, P + 2*math.Pi*0.6, 1e-3},
	}
	for _, tc := range tests {
		if math.Abs(tc.got-tc.want) > tc.rel*math.Abs(tc.want)+1e-9 {
			t.Errorf("%s = %.4f, want %.4f (±%g relative)", tc.name, tc.got, tc.want, tc.rel)
		}
	}
}
