package takeoff_test

import (
	"fmt"

	"github.com/dugout-estimating/dugout/internal/takeoff"
	"github.com/dugout-estimating/dugout/internal/units"
)

// A liner sheet of 23.4 × 17.9 ft fits the 20 × 25 ft stock sheet; one of
// 62 × 80 ft needs seamed panels from the default (feet) stock list.
func ExampleChooseStock() {
	st := takeoff.DefaultStock(false)
	for _, s := range [][2]float64{{23.4, 17.9}, {80, 62}} {
		o, seamed, err := takeoff.ChooseStock(s[0]*units.Foot, s[1]*units.Foot, st)
		if err != nil {
			fmt.Println(err)
			continue
		}
		fmt.Printf("%.0f × %.0f ft: %d panel(s) of %.0f × %.0f ft, %d seam(s), seamed %v\n",
			s[0], s[1], o.Panels, o.PanelWidthM/units.Foot, o.PanelLengthM/units.Foot, o.Seams, seamed)
	}
	// Output:
	// 23 × 18 ft: 1 panel(s) of 20 × 25 ft, 0 seam(s), seamed false
	// 80 × 62 ft: 2 panel(s) of 35 × 80 ft, 1 seam(s), seamed true
}
