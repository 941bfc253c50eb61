package cutfill_test

import (
	"fmt"

	"github.com/dugout-estimating/dugout/internal/cutfill"
	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/units"
)

func ExampleCompute() {
	soil, _ := cutfill.SoilPreset("common earth")
	truck, _ := cutfill.TruckPreset("tandem")
	r, err := cutfill.Compute(cutfill.Inputs{
		CutBankM3:       120, // from the design
		FillCompactedM3: 27,
		Soil:            soil,
		Truck:           truck,
		Heaped:          true,
		ReuseCut:        true,
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("berm fill needs %.1f m³ bank; reused %.1f m³\n", r.FillBankNeedM3, r.ReusedBankM3)
	fmt.Printf("haul off %.1f m³ bank = %.1f m³ loose = %.1f yd³\n", r.HaulBankM3, r.HaulLooseM3, r.HaulLooseM3/units.CubicYard)
	fmt.Printf("%d loads of %.2f yd³\n", r.Truckloads, r.TruckCapacityM3/units.CubicYard)
	// Output:
	// berm fill needs 30.0 m³ bank; reused 30.0 m³
	// haul off 90.0 m³ bank = 112.5 m³ loose = 147.1 yd³
	// 11 loads of 13.54 yd³
}

func ExampleCompare() {
	// Flat ground at 0 m, and a pyramid pit 3 m deep under a 10 m × 10 m
	// opening: 10·10·3/3 = 100 m³ of cut.
	before := geom.TriMesh{
		V: []geom.Vec3{{X: 0, Y: 0}, {X: 10, Y: 0}, {X: 10, Y: 10}, {X: 0, Y: 10}},
		T: []int32{0, 1, 2, 0, 2, 3},
	}
	after := geom.TriMesh{
		V: []geom.Vec3{{X: 0, Y: 0}, {X: 10, Y: 0}, {X: 10, Y: 10}, {X: 0, Y: 10}, {X: 5, Y: 5, Z: -3}},
		T: []int32{0, 1, 4, 1, 2, 4, 2, 3, 4, 3, 0, 4},
	}
	r, err := cutfill.Compare(before, after, nil)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("cut %.6f m³, fill %.6f m³, over %.1f m²\n", r.CutM3, r.FillM3, r.AreaM2)
	// Output:
	// cut 100.000000 m³, fill 0.000000 m³, over 100.0 m²
}

func ExampleTruckFromBody() {
	ft := units.Foot
	t := cutfill.TruckFromBody(14*ft, 7*ft, 3*ft, cutfill.DefaultHeapSlope)
	fmt.Printf("struck %.3f yd³, heaped %.3f yd³\n", t.StruckM3/units.CubicYard, t.HeapedM3/units.CubicYard)
	// Output:
	// struck 10.889 yd³, heaped 13.535 yd³
}
