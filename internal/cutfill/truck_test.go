package cutfill

import (
	"errors"
	"math"
	"testing"

	"github.com/dugout-estimating/dugout/internal/units"
)

// TestTruckFromBody_WorkedCheck is check-values §2b [derived]: a body 14 ft ×
// 7 ft × 3 ft with a 2:1 heap holds struck 294 ft³ = 10.889 yd³, heap
// 71.458 ft³ = 2.647 yd³, heaped 13.535 yd³ (the 2:1 rule is SAE J1363 as
// summarised, [partial]).
func TestTruckFromBody_WorkedCheck(t *testing.T) {
	ft := units.Foot
	tr := TruckFromBody(14*ft, 7*ft, 3*ft, 2)
	if got := tr.StruckM3 / units.CubicFoot; !closeRel(got, 294, 1e-12, 1) {
		t.Errorf("struck = %.12g ft³, want 294", got)
	}
	// Printed to 3 decimals: compare to the digits printed.
	for _, c := range []struct {
		name      string
		got, want float64
	}{
		{"struck yd³", tr.StruckM3 / units.CubicYard, 10.889},
		{"heap ft³", (tr.HeapedM3 - tr.StruckM3) / units.CubicFoot, 71.458},
		{"heap yd³", (tr.HeapedM3 - tr.StruckM3) / units.CubicYard, 2.647},
		{"heaped yd³", tr.HeapedM3 / units.CubicYard, 13.535},
	} {
		if math.Round(c.got*1000)/1000 != c.want {
			t.Errorf("TruckFromBody(14×7×3 ft, 2:1) %s = %.6f, want %.3f", c.name, c.got, c.want)
		}
	}
	// The heap exactly: W²(3L − W)/24 for 2:1 = 49·35/24 ft³ (check-values §2b
	// [derived]).
	if got := (tr.HeapedM3 - tr.StruckM3) / units.CubicFoot; !closeRel(got, 49.0*35/24, 1e-12, 1) {
		t.Errorf("heap = %.12g ft³, want %.12g", got, 49.0*35/24)
	}
}

// TestTruckFromBody_Geometry checks the hip-roof heap against its special
// cases (check-values §2b [derived]): a square body gives the pyramid
// m·W³/6, the order of length and width does not matter, and an infinite
// heap slope gives no heap.
func TestTruckFromBody_Geometry(t *testing.T) {
	sq := TruckFromBody(2, 2, 1, 2) // m = 1/2: pyramid 0.5·8/6
	if got := sq.HeapedM3 - sq.StruckM3; !closeRel(got, 0.5*8/6, 1e-12, 1) {
		t.Errorf("square body heap = %.15g, want %.15g", got, 0.5*8/6)
	}
	// A 3:1 heap over a 4 × 2 body: (1/3)·4·(12 − 2)/12.
	a, b := TruckFromBody(4, 2, 1.5, 3), TruckFromBody(2, 4, 1.5, 3)
	if a != b || !closeRel(a.HeapedM3-a.StruckM3, 4.0*10/36, 1e-12, 1) || a.StruckM3 != 12 {
		t.Errorf("TruckFromBody(4,2,1.5,3) = %+v, (2,4,…) = %+v, want heap %.15g struck 12", a, b, 4.0*10/36)
	}
	if f := TruckFromBody(4, 2, 1, math.Inf(1)); f.HeapedM3 != f.StruckM3 {
		t.Errorf("flat heap: %+v, want heaped = struck", f)
	}
}

func TestTruckFromBody_Bad(t *testing.T) {
	for _, c := range [][4]float64{
		{0, 2, 1, 2}, {-1, 2, 1, 2}, {3, math.NaN(), 1, 2}, {3, 2, math.Inf(1), 2},
		{3, 2, 1, 0}, {3, 2, 1, -2}, {3, 2, 1, math.NaN()},
	} {
		tr := TruckFromBody(c[0], c[1], c[2], c[3])
		if !math.IsNaN(tr.StruckM3) || !math.IsNaN(tr.HeapedM3) {
			t.Errorf("TruckFromBody%v = %+v, want NaN capacities", c, tr)
		}
		_, err := Compute(Inputs{CutBankM3: 10, Soil: mustSoil(t, "sand"), Truck: tr})
		if !errors.Is(err, ErrNonFinite) {
			t.Errorf("Compute with TruckFromBody%v: error %v, want ErrNonFinite", c, err)
		}
	}
}

// TestTruckPresets checks that each preset's struck capacity lies in its
// class's usual range (check-values §2b [practice]: single-axle 5–8 yd³,
// tandem 10–14, tri-axle 14–18) and that heaped follows the 2:1 rule. The
// ranges are common practice, not a published source.
func TestTruckPresets(t *testing.T) {
	ranges := map[string][2]float64{"single-axle": {5, 8}, "tandem": {10, 14}, "tri-axle": {14, 18}}
	ps := TruckPresets()
	if len(ps) != len(ranges) {
		t.Fatalf("TruckPresets() has %d trucks, want %d", len(ps), len(ranges))
	}
	for _, p := range ps {
		r, ok := ranges[p.Name]
		yd := p.StruckM3 / units.CubicYard
		if !ok || yd < r[0] || yd > r[1] || !(p.HeapedM3 > p.StruckM3) {
			t.Errorf("preset %q: struck %.2f yd³ heaped %.2f yd³, want struck in %v", p.Name, yd, p.HeapedM3/units.CubicYard, r)
		}
		got, err := TruckPreset(p.Name)
		if err != nil || got != p {
			t.Errorf("TruckPreset(%q) = %+v, %v, want %+v", p.Name, got, err, p)
		}
	}
	// The tandem preset is the worked-check body.
	td, _ := TruckPreset("Tandem")
	if math.Round(td.HeapedM3/units.CubicYard*1000)/1000 != 13.535 {
		t.Errorf("tandem heaped = %.4f yd³, want 13.535", td.HeapedM3/units.CubicYard)
	}
	for _, name := range []string{"tri axle", "TRI_AXLE", "single", "tandem axle"} {
		if _, err := TruckPreset(name); err != nil {
			t.Errorf("TruckPreset(%q): %v", name, err)
		}
	}
	if _, err := TruckPreset("semi"); !errors.Is(err, ErrUnknownTruck) {
		t.Errorf("TruckPreset(semi) error = %v, want ErrUnknownTruck", err)
	}
}
