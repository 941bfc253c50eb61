package landxml_test

import (
	"fmt"
	"os"
	"strings"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/landxml"
)

func ExampleRead() {
	doc := `<LandXML xmlns="http://www.landxml.org/schema/LandXML-1.2" version="1.2">
  <Units><Imperial linearUnit="foot" areaUnit="squareFoot" volumeUnit="cubicYard"/></Units>
  <Surfaces><Surface name="EG"><Definition surfType="TIN">
    <Pnts><P id="1">100 200 50</P><P id="2">100 210 51</P><P id="3">110 200 52</P></Pnts>
    <Faces><F>1 3 2</F></Faces>
  </Definition></Surface></Surfaces>
</LandXML>`
	surfaces, err := landxml.Read(strings.NewReader(doc))
	if err != nil {
		fmt.Println(err)
		return
	}
	s := surfaces[0]
	a, b, c := s.Mesh.Triangle(0)
	fmt.Printf("%s in %s: %d triangle, plan area %.4f m²\n", s.Name, s.Units, s.Mesh.NumTriangles(), geom.PlanArea(a, b, c))
	fmt.Printf("first point (x east, y north, z) in metres: %.4f %.4f %.4f\n", a.X, a.Y, a.Z)
	// Output:
	// EG in ft: 1 triangle, plan area 4.6452 m²
	// first point (x east, y north, z) in metres: 60.9600 30.4800 15.2400
}

func ExampleWrite() {
	m := geom.TriMesh{
		V: []geom.Vec3{{X: 0, Y: 0, Z: 10}, {X: 4, Y: 0, Z: 10.2}, {X: 0, Y: 3, Z: 9.9}},
		T: []int32{0, 1, 2},
	}
	var sb strings.Builder
	err := landxml.Write(&sb, m, landxml.WriteOptions{Name: "pond", Frame: geom.Frame{Origin: geom.Vec2{X: 500000, Y: 4500000}}})
	if err != nil {
		fmt.Fprintln(os.Stderr, err)
		return
	}
	for _, line := range strings.Split(sb.String(), "\n") {
		if strings.Contains(line, "<P ") || strings.Contains(line, "<F>") {
			fmt.Println(strings.TrimSpace(line))
		}
	}
	// Output:
	// <P id="1">4500000.0000 500000.0000 10.0000</P>
	// <P id="2">4500000.0000 500004.0000 10.2000</P>
	// <P id="3">4500003.0000 500000.0000 9.9000</P>
	// <F>1 2 3</F>
}
