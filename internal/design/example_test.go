package design_test

import (
	"fmt"
	"math"

	"github.com/dugout-estimating/dugout/internal/design"
	"github.com/dugout-estimating/dugout/internal/geom"
)

// flat is level ground at elevation z over a box (a stand-in for a TIN).
type flat struct {
	z   float64
	box geom.Box
}

func (f flat) Elevation(x, y float64) (float64, bool) {
	return f.z, f.box.Contains(geom.Vec2{X: x, Y: y})
}

func (f flat) SampleLattice(x0, y0, h float64, nx, ny int, out []float64) {
	for j := 0; j < ny; j++ {
		for i := 0; i < nx; i++ {
			z, ok := f.Elevation(x0+float64(i)*h, y0+float64(j)*h)
			if !ok {
				z = math.NaN()
			}
			out[j*nx+i] = z
		}
	}
}

func (f flat) Bounds() geom.Box { return f.box }

func ExampleBuild() {
	ground := flat{z: 100, box: geom.Box{Min: geom.Vec2{X: -20, Y: -20}, Max: geom.Vec2{X: 20, Y: 20}}}
	box := geom.Ring{{X: 0, Y: 0}, {X: 4, Y: 0}, {X: 4, Y: 3}, {X: 0, Y: 3}}
	s, err := design.Build(ground, design.Params{
		Zones:       []design.Zone{{Name: "box", Ring: box, DepthM: 0.8}}, // vertical walls
		WaterLevelM: 99.9, FreeboardM: 0.1,
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("cut %.3f m³, fill %.3f m³, water %.3f m³ over %.2f m²\n", s.CutM3, s.FillM3, s.WaterVolumeM3, s.WaterAreaM2)
	// Output: cut 10.800 m³, fill 0.000 m³, water 9.600 m³ over 12.00 m²
}

func ExampleOutline_Zones() {
	o := design.Outline{
		Ring:       geom.Ring{{X: 0, Y: 0}, {X: 8, Y: 0}, {X: 8, Y: 5}, {X: 0, Y: 5}},
		Shelves:    []design.Shelf{{WidthM: 0.4, DepthM: 0.3}},
		DeepDepthM: 0.9, WallSlope: 1, Corners: design.Sharp,
	}
	zones, err := o.Zones()
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, z := range zones {
		fmt.Printf("%s: %.2f m², %.1f m deep\n", z.Name, z.Ring.Area(), z.DepthM)
	}
	// Output:
	// shelf 1: 32.56 m², 0.3 m deep
	// deep zone: 12.96 m², 0.9 m deep
}
