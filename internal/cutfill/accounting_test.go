package cutfill

import (
	"errors"
	"math"
	"strings"
	"testing"

	"pgregory.net/rapid"
)

// TestCompute_HandCases checks accounts worked by hand from the rules in the
// package documentation: loose = bank × swell factor (FHWA PDDM ch. 9
// §9.4.C.4), fill need = compacted / compaction factor (FM 5-434 Table 1-2
// "bank to compacted"), reuse = min(cut, need), loads = ⌈loose haul /
// capacity⌉. The factors are the presets' (FM 5-434 as recalled, see
// soil.go); the arithmetic is what is checked.
func TestCompute_HandCases(t *testing.T) {
	loam := Soil{Name: "common earth", Swell: 1.25, Compaction: 0.90}
	clay := Soil{Name: "clay", Swell: 1.43, Compaction: 0.90}
	rock := Soil{Name: "rock", Swell: 1.50, Compaction: 1.30}
	truck := Truck{Name: "t", StruckM3: 10, HeapedM3: 12.5}
	cases := []struct {
		name string
		in   Inputs
		want Result
		note string // a note that must be present
	}{
		{
			// need 180/0.9 = 200; reuse 200; haul 300 bank, 375 loose;
			// 375/10 = 37.5 → 38 loads × 85 = 3230; topsoil 0.15 × 1200 =
			// 180 bank, × 1.25 = 225 loose.
			name: "surplus, struck",
			in: Inputs{CutBankM3: 500, FillCompactedM3: 180, Soil: loam, TopsoilDepthM: 0.15, TopsoilAreaM2: 1200,
				Truck: truck, ReuseCut: true, PricePerLoad: 85},
			want: Result{CutBankM3: 500, FillCompactedM3: 180, FillBankNeedM3: 200, NetBankM3: 300, ReusedBankM3: 200,
				HaulBankM3: 300, HaulLooseM3: 375, TopsoilBankM3: 180, TopsoilLooseM3: 225,
				Truckloads: 38, TruckCapacityM3: 10, HaulCost: 3230},
			note: "topsoil",
		},
		{
			// Same haul by heaped capacity: 375/12.5 = 30 loads exactly.
			name: "surplus, heaped",
			in:   Inputs{CutBankM3: 500, FillCompactedM3: 180, Soil: loam, Truck: truck, Heaped: true, ReuseCut: true},
			want: Result{CutBankM3: 500, FillCompactedM3: 180, FillBankNeedM3: 200, NetBankM3: 300, ReusedBankM3: 200,
				HaulBankM3: 300, HaulLooseM3: 375, Truckloads: 30, TruckCapacityM3: 12.5},
		},
		{
			// need 200 > cut 100: reuse 100, import 100 bank = 143 loose.
			name: "shortfall imports",
			in:   Inputs{CutBankM3: 100, FillCompactedM3: 180, Soil: clay, Truck: truck, ReuseCut: true, PricePerLoad: 85},
			want: Result{CutBankM3: 100, FillCompactedM3: 180, FillBankNeedM3: 200, NetBankM3: -100, ReusedBankM3: 100,
				ImportBankM3: 100, ImportLooseM3: 143, TruckCapacityM3: 10},
			note: "import",
		},
		{
			// No reuse: haul all 500 (625 loose → 63 loads), import all 200
			// (250 loose).
			name: "no reuse",
			in:   Inputs{CutBankM3: 500, FillCompactedM3: 180, Soil: loam, Truck: truck},
			want: Result{CutBankM3: 500, FillCompactedM3: 180, FillBankNeedM3: 200, NetBankM3: 300,
				HaulBankM3: 500, HaulLooseM3: 625, ImportBankM3: 200, ImportLooseM3: 250, Truckloads: 63, TruckCapacityM3: 10},
			note: "not reused",
		},
		{
			// Rock: 130 compacted needs 130/1.3 = 100 bank; haul 160 bank =
			// 240 loose = 20 loads of 12.
			name: "blasted rock",
			in:   Inputs{CutBankM3: 260, FillCompactedM3: 130, Soil: rock, Truck: Truck{StruckM3: 12}, ReuseCut: true},
			want: Result{CutBankM3: 260, FillCompactedM3: 130, FillBankNeedM3: 100, NetBankM3: 160, ReusedBankM3: 100,
				HaulBankM3: 160, HaulLooseM3: 240, Truckloads: 20, TruckCapacityM3: 12},
			note: "above 1",
		},
		{
			name: "no truck",
			in:   Inputs{CutBankM3: 40, Soil: loam, ReuseCut: true, PricePerLoad: 85},
			want: Result{CutBankM3: 40, NetBankM3: 40, HaulBankM3: 40, HaulLooseM3: 50},
			note: "no truck",
		},
		{
			// 0.1 + 0.2 = 0.30000000000000004 m³ at swell 1 in a 0.3 m³
			// body is one load, not two.
			name: "round-off does not add a load",
			in:   Inputs{CutBankM3: 0.1 + 0.2, Soil: Soil{Swell: 1, Compaction: 1}, Truck: Truck{StruckM3: 0.3}},
			want: Result{CutBankM3: 0.1 + 0.2, NetBankM3: 0.1 + 0.2, HaulBankM3: 0.1 + 0.2, HaulLooseM3: 0.1 + 0.2,
				Truckloads: 1, TruckCapacityM3: 0.3},
		},
		{
			name: "nothing to move",
			in:   Inputs{Soil: loam, Truck: truck},
			want: Result{TruckCapacityM3: 10},
		},
		{
			// A given topsoil soil overrides the preset: 100 × 0.2 × 1.4.
			name: "own topsoil swell",
			in:   Inputs{Soil: loam, Topsoil: Soil{Swell: 1.4}, TopsoilAreaM2: 100, TopsoilDepthM: 0.2},
			want: Result{TopsoilBankM3: 20, TopsoilLooseM3: 28},
			note: "topsoil",
		},
	}
	const rel = 1e-12 // the arithmetic is a few roundings deep
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			got, err := Compute(c.in)
			if err != nil {
				t.Fatalf("Compute: %v", err)
			}
			vols := []struct {
				name      string
				got, want float64
			}{
				{"CutBankM3", got.CutBankM3, c.want.CutBankM3},
				{"FillCompactedM3", got.FillCompactedM3, c.want.FillCompactedM3},
				{"FillBankNeedM3", got.FillBankNeedM3, c.want.FillBankNeedM3},
				{"NetBankM3", got.NetBankM3, c.want.NetBankM3},
				{"ReusedBankM3", got.ReusedBankM3, c.want.ReusedBankM3},
				{"HaulBankM3", got.HaulBankM3, c.want.HaulBankM3},
				{"HaulLooseM3", got.HaulLooseM3, c.want.HaulLooseM3},
				{"ImportBankM3", got.ImportBankM3, c.want.ImportBankM3},
				{"ImportLooseM3", got.ImportLooseM3, c.want.ImportLooseM3},
				{"TopsoilBankM3", got.TopsoilBankM3, c.want.TopsoilBankM3},
				{"TopsoilLooseM3", got.TopsoilLooseM3, c.want.TopsoilLooseM3},
				{"TruckCapacityM3", got.TruckCapacityM3, c.want.TruckCapacityM3},
				{"HaulCost", got.HaulCost, c.want.HaulCost},
			}
			for _, v := range vols {
				if !closeRel(v.got, v.want, rel, 1) {
					t.Errorf("Compute(%s).%s = %.15g, want %.15g", c.name, v.name, v.got, v.want)
				}
			}
			if got.Truckloads != c.want.Truckloads {
				t.Errorf("Compute(%s).Truckloads = %d, want %d", c.name, got.Truckloads, c.want.Truckloads)
			}
			if got.ShrinkConvention != ShrinkConvention {
				t.Errorf("Compute(%s).ShrinkConvention = %q, want the package convention", c.name, got.ShrinkConvention)
			}
			if c.note != "" && !strings.Contains(strings.Join(got.Notes, "\n"), c.note) {
				t.Errorf("Compute(%s).Notes = %q, want one mentioning %q", c.name, got.Notes, c.note)
			}
		})
	}
}

func TestCompute_BadInput(t *testing.T) {
	ok := Inputs{CutBankM3: 10, FillCompactedM3: 5, Soil: Soil{Swell: 1.25, Compaction: 0.9}, Truck: Truck{StruckM3: 8, HeapedM3: 10}}
	cases := []struct {
		name  string
		edit  func(*Inputs)
		field string
		want  error
	}{
		{"negative cut", func(in *Inputs) { in.CutBankM3 = -3 }, "CutBankM3", ErrNegative},
		{"NaN fill", func(in *Inputs) { in.FillCompactedM3 = math.NaN() }, "FillCompactedM3", ErrNonFinite},
		{"infinite cut", func(in *Inputs) { in.CutBankM3 = math.Inf(1) }, "CutBankM3", ErrNonFinite},
		{"zero swell", func(in *Inputs) { in.Soil.Swell = 0 }, "Soil.Swell", ErrNotPositive},
		{"no soil", func(in *Inputs) { in.Soil = Soil{} }, "Soil.Swell", ErrNotPositive},
		{"negative compaction", func(in *Inputs) { in.Soil.Compaction = -0.9 }, "Soil.Compaction", ErrNotPositive},
		{"negative topsoil depth", func(in *Inputs) { in.TopsoilDepthM = -0.1 }, "TopsoilDepthM", ErrNegative},
		{"infinite topsoil area", func(in *Inputs) { in.TopsoilAreaM2 = math.Inf(1) }, "TopsoilAreaM2", ErrNonFinite},
		{"topsoil without swell", func(in *Inputs) { in.Topsoil = Soil{Name: "peat"} }, "Topsoil.Swell", ErrNotPositive},
		{"negative struck", func(in *Inputs) { in.Truck.StruckM3 = -1 }, "Truck.StruckM3", ErrNegative},
		{"heaped below struck", func(in *Inputs) { in.Truck.HeapedM3 = 7 }, "Truck.HeapedM3", ErrHeapBelowStruck},
		{"heaped wanted, none given", func(in *Inputs) { in.Truck.HeapedM3 = 0; in.Heaped = true }, "Truck.HeapedM3", ErrNotPositive},
		{"struck wanted, none given", func(in *Inputs) { in.Truck.StruckM3 = 0 }, "Truck.StruckM3", ErrNotPositive},
		{"negative price", func(in *Inputs) { in.PricePerLoad = -5 }, "PricePerLoad", ErrNegative},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			in := ok
			c.edit(&in)
			_, err := Compute(in)
			var ie *InputError
			if !errors.Is(err, c.want) || !errors.As(err, &ie) || ie.Field != c.field {
				t.Fatalf("Compute(%s) error = %v, want %v on %s", c.name, err, c.want, c.field)
			}
			if msg := err.Error(); !strings.HasPrefix(msg, "cutfill: "+c.field) || !strings.Contains(msg, "got") {
				t.Errorf("error text %q: want the field and the offending value", msg)
			}
		})
	}
	if _, err := Compute(ok); err != nil {
		t.Errorf("Compute(valid) = %v", err)
	}
}

// TestCompute_Balances checks, over random inputs, the identities the
// account rests on: reused + haul = cut, reused + import = need, haul and
// import are never both positive when cut is reused, and the loads carry the
// haul with less than one load to spare (or none when the haul is under
// SpreadOnSiteFraction of a load).
func TestCompute_Balances(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		in := Inputs{
			CutBankM3:       rapid.Float64Range(0, 1e5).Draw(t, "cut"),
			FillCompactedM3: rapid.Float64Range(0, 1e5).Draw(t, "fill"),
			Soil: Soil{
				Swell:      rapid.Float64Range(0.8, 2).Draw(t, "swell"),
				Compaction: rapid.Float64Range(0.7, 1.4).Draw(t, "compaction"),
			},
			Truck:    Truck{StruckM3: rapid.Float64Range(0.5, 30).Draw(t, "truck")},
			ReuseCut: rapid.Bool().Draw(t, "reuse"),
		}
		r, err := Compute(in)
		if err != nil {
			t.Fatal(err)
		}
		tol := 1e-12 * (in.CutBankM3 + r.FillBankNeedM3 + 1)
		if math.Abs(r.ReusedBankM3+r.HaulBankM3-r.CutBankM3) > tol {
			t.Fatalf("reused %g + haul %g != cut %g", r.ReusedBankM3, r.HaulBankM3, r.CutBankM3)
		}
		if math.Abs(r.ReusedBankM3+r.ImportBankM3-r.FillBankNeedM3) > tol {
			t.Fatalf("reused %g + import %g != need %g", r.ReusedBankM3, r.ImportBankM3, r.FillBankNeedM3)
		}
		if in.ReuseCut && r.HaulBankM3 > 0 && r.ImportBankM3 > 0 {
			t.Fatalf("both haul %g and import %g with reuse", r.HaulBankM3, r.ImportBankM3)
		}
		if r.HaulBankM3 < 0 || r.ImportBankM3 < 0 {
			t.Fatalf("negative haul %g or import %g", r.HaulBankM3, r.ImportBankM3)
		}
		c := r.TruckCapacityM3
		if r.HaulLooseM3 < SpreadOnSiteFraction*c {
			if r.Truckloads != 0 {
				t.Fatalf("%d loads for %g loose, under %g of a %g load", r.Truckloads, r.HaulLooseM3, SpreadOnSiteFraction, c)
			}
			return
		}
		if float64(r.Truckloads)*c < r.HaulLooseM3*(1-1e-9) || float64(r.Truckloads-1)*c >= r.HaulLooseM3 && r.Truckloads > 0 {
			t.Fatalf("%d loads of %g for %g loose", r.Truckloads, c, r.HaulLooseM3)
		}
	})
}
