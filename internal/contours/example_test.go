package contours_test

import (
	"fmt"
	"math"

	"github.com/dugout-estimating/dugout/internal/contours"
	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/units"
)

// ExampleTrace contours a small square mound at half-foot intervals: the
// caller converts the interval and base to metres, and the levels land on
// whole and half feet.
func ExampleTrace() {
	ft := units.Foot
	mound := geom.TriMesh{
		V: []geom.Vec3{{X: 0, Y: 0, Z: 2 * ft}, {X: -2, Y: -2}, {X: 2, Y: -2}, {X: 2, Y: 2}, {X: -2, Y: 2}},
		T: []int32{0, 1, 2, 0, 2, 3, 0, 3, 4, 0, 4, 1},
	}
	lines, err := contours.Trace(mound, contours.Options{
		IntervalM: 0.5 * ft, IndexEvery: 2, MinLevel: math.NaN(), MaxLevel: math.NaN(),
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, l := range lines {
		fmt.Printf("%.1f ft index=%v closed=%v from (%.2f, %.2f), %d points\n",
			l.Level/ft, l.Index, l.Closed, l.Pts[0].X, l.Pts[0].Y, len(l.Pts))
	}
	// Output:
	// 0.5 ft index=false closed=true from (-1.50, -1.50), 5 points
	// 1.0 ft index=true closed=true from (-1.00, -1.00), 5 points
	// 1.5 ft index=false closed=true from (-0.50, -0.50), 5 points
}
