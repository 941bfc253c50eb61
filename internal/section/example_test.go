package section_test

import (
	"fmt"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/section"
)

// slope is a surface rising 1 m in 4 m toward the east.
type slope struct{}

func (slope) Elevation(x, y float64) (float64, bool) { return 100 + x/4, true }

func ExampleAlong() {
	path := geom.Polyline{{X: 0, Y: 0}, {X: 8, Y: 0}}
	p, err := section.Along(path, 2, slope{})
	if err != nil {
		fmt.Println(err)
		return
	}
	for j, c := range p.Chainage {
		fmt.Printf("%4.1f m  %6.2f m\n", c, p.Z[0][j])
	}
	fmt.Printf("developed length %.4f m\n", p.DevelopedLength(0, 0, 8))
	// Output:
	//  0.0 m  100.00 m
	//  2.0 m  100.50 m
	//  4.0 m  101.00 m
	//  6.0 m  101.50 m
	//  8.0 m  102.00 m
	// developed length 8.2462 m
}

func ExampleAxes() {
	pond := geom.Ring{{X: 0, Y: 0}, {X: 12, Y: 0}, {X: 12, Y: 5}, {X: 0, Y: 5}}
	long, cross := section.Axes(pond, geom.Vec2{X: 4, Y: 2.5}, 1)
	fmt.Println("long: ", long)
	fmt.Println("cross:", cross)
	// Output:
	// long:  [{-1 2.5} {13 2.5}]
	// cross: [{4 -1} {4 6}]
}
