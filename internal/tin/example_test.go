package tin_test

import (
	"fmt"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/tin"
)

// A 10 m square of shots on ground falling 1 m per 10 m to the east, one
// point shot twice, and a ditch breakline across it.
func ExampleBuild() {
	pts := []geom.Vec3{
		{X: 0, Y: 0, Z: 101}, {X: 10, Y: 0, Z: 100}, {X: 10, Y: 10, Z: 100},
		{X: 0, Y: 10, Z: 101}, {X: 5, Y: 5, Z: 100.50}, {X: 5, Y: 5, Z: 100.52},
	}
	ditch := tin.Breakline{Name: "ditch", Pts: []geom.Vec3{{X: 2, Y: 1, Z: 99.8}, {X: 2, Y: 9, Z: 99.7}}}
	s, err := tin.Build(pts, tin.Options{Breaklines: []tin.Breakline{ditch}})
	if err != nil {
		fmt.Println(err)
		return
	}
	sum := s.Summary()
	fmt.Printf("%d vertices, %d triangles, %d duplicate merged\n", sum.Vertices, sum.Triangles, sum.DuplicatesMerged)
	z, ok := s.Elevation(2, 5)
	fmt.Printf("ditch at (2, 5): %.2f m %v\n", z, ok)
	z, ok = s.Elevation(5, 5)
	fmt.Printf("merged shot at (5, 5): %.2f m %v\n", z, ok)
	_, ok = s.Elevation(12, 5)
	fmt.Printf("outside: %v\n", ok)
	fmt.Printf("plan area %.1f m²\n", s.PlanArea())
	// Output:
	// 7 vertices, 8 triangles, 1 duplicate merged
	// ditch at (2, 5): 99.75 m true
	// merged shot at (5, 5): 100.51 m true
	// outside: false
	// plan area 100.0 m²
}
