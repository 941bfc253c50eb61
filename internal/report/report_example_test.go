package report_test

import (
	"fmt"
	"os"

	"github.com/dugout-estimating/dugout/internal/report"
	"github.com/dugout-estimating/dugout/internal/units"
)

// The pond of the University of Regina's Math Central answer (100 × 70 ft
// at the top, 2:1 sides, 12 ft deep) holds 44 256 ft³ = 1639.1 yd³.
func ExampleQuantityRow() {
	v := 44256 * units.CubicFoot // m³
	r := report.QuantityRow("Cut, bank measure", v, report.Volume, units.Feet, "")
	fmt.Println(r.Label+":", r.Value, r.Unit, "("+r.Alt+")")
	m := report.QuantityRow("Cut, bank measure", v, report.Volume, units.Metres, "")
	fmt.Println(m.Label+":", m.Value, m.Unit, "("+m.Alt+")")
	// Output:
	// Cut, bank measure: 1,639.1 yd³ (1,253.19 m³)
	// Cut, bank measure: 1253.19 m³ (1639.1 yd³)
}

func ExampleComparison_DifferencePercent() {
	// Liner across a 10 ft pond, 2 ft deep with 2:1 sides and 1 ft overlap:
	// 12.944 ft measured along the slopes, 16 ft by the rule of thumb.
	c := report.Comparison{Label: "Liner width", Quantity: report.Length, Measured: 12.944 * units.Foot, Rule: 16 * units.Foot}
	p, _ := c.DifferencePercent()
	fmt.Printf("%.1f %%\n", p)
	// Output: -19.1 %
}

func ExampleWriteStakeoutCSV() {
	rows := []report.StakeoutRow{
		{ID: "R10", Easting: 1680926.636, Northing: 16363681.102, Existing: 99.441, Finished: 100.394, CutFill: 0.953, Note: "rim"},
		{ID: "R2", Easting: 1680918.749, Northing: 16363694.340, Existing: 100.453, Finished: 100.394, CutFill: -0.059, Note: "rim"},
	}
	if err := report.WriteStakeoutCSV(os.Stdout, rows, "ft"); err != nil {
		fmt.Println(err)
	}
	// Output:
	// id,easting_ft,northing_ft,existing_ft,finished_ft,cut_fill_ft,cut_or_fill,note
	// R10,1680926.636,16363681.102,99.441,100.394,0.953,fill,rim
	// R2,1680918.749,16363694.340,100.453,100.394,-0.059,cut,rim
}
