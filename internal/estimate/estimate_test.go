package estimate

import (
	"context"
	"math"
	"path/filepath"
	"runtime"
	"testing"

	"github.com/dugout-estimating/dugout/internal/sitefile"
)

// demoSite loads the demo site file from the repository's testdata.
func demoSite(tb testing.TB) *sitefile.Site {
	tb.Helper()
	_, file, _, _ := runtime.Caller(0)
	s, err := sitefile.Load(filepath.Join(filepath.Dir(file), "..", "..", "testdata", "demo", "site.toml"))
	if err != nil {
		tb.Fatal(err)
	}
	return s
}

func runDemo(tb testing.TB, sets ...string) *Result {
	tb.Helper()
	s := demoSite(tb)
	for _, a := range sets {
		if err := s.Set(a); err != nil {
			tb.Fatal(err)
		}
	}
	j, err := FromSite(s)
	if err != nil {
		tb.Fatal(err)
	}
	r, err := Run(context.Background(), j)
	if err != nil {
		tb.Fatal(err)
	}
	return r
}

// TestDemo_Balance checks the demo job's balance level by its definition:
// the cut reused as fill, cut × compaction factor, equals the fill.
func TestDemo_Balance(t *testing.T) {
	r := runDemo(t)
	d := r.Design
	if d.Level.String() != "balance" {
		t.Fatalf("level mode = %v", d.Level)
	}
	k := r.Job.Soil.Compaction
	if got := d.CutM3*k - d.FillM3; math.Abs(got) > 1e-3*d.CutM3 {
		t.Errorf("cut·k − fill = %g m³ (cut %g, fill %g, k %g), want 0", got, d.CutM3, d.FillM3, k)
	}
	if r.Earthwork.Truckloads != 0 {
		t.Errorf("balanced job hauls %d loads", r.Earthwork.Truckloads)
	}
	if d.RefineChange > 1e-3 {
		t.Errorf("refinement change %g, want < 0.1 %%", d.RefineChange)
	}
}

// TestDemo_Auto checks the auto level: no berm is needed, so there is no
// fill, and the rim touches existing ground somewhere along the rim line.
func TestDemo_Auto(t *testing.T) {
	r := runDemo(t, "water.level=auto")
	if r.Design.FillM3 > 1e-3*r.Design.CutM3 {
		t.Errorf("auto level needs fill %g m³ (cut %g)", r.Design.FillM3, r.Design.CutM3)
	}
	if r.Earthwork.HaulBankM3 <= 0 || r.Earthwork.Truckloads == 0 {
		t.Errorf("auto level with no fill should haul the cut off: %+v", r.Earthwork)
	}
}

func TestFromSite_Errors(t *testing.T) {
	for _, set := range []string{"water.level=high", "earthwork.soil=peat", "liner.material=gold", "design.outline.deep_depth=deep"} {
		s := demoSite(t)
		if err := s.Set(set); err != nil {
			t.Fatal(err)
		}
		if _, err := FromSite(s); err == nil {
			t.Errorf("FromSite with %s: no error", set)
		}
	}
}

// BenchmarkDemoEstimate is the demo job end to end: read the survey, build
// the TIN, make the zones, lay the design, account the earthwork and run
// the takeoff. Target: under 100 ms.
func BenchmarkDemoEstimate(b *testing.B) {
	s := demoSite(b)
	b.ReportAllocs()
	for b.Loop() {
		j, err := FromSite(s)
		if err != nil {
			b.Fatal(err)
		}
		if _, err := Run(context.Background(), j); err != nil {
			b.Fatal(err)
		}
	}
}
