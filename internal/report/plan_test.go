package report

import (
	"bytes"
	"errors"
	"flag"
	"math"
	"math/rand/v2"
	"strconv"
	"strings"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/units"
)

var planSeed = flag.Uint64("report_seed", 0, "seed of the randomised report tests (0: a fixed default)")

func renderPlan(tb testing.TB, p PlanData) []byte {
	tb.Helper()
	var b bytes.Buffer
	if err := Plan(&b, p); err != nil {
		tb.Fatalf("Plan: %v", err)
	}
	return b.Bytes()
}

func TestPlan_Golden(t *testing.T) {
	got := renderPlan(t, samplePlan())
	compareGolden(t, "plan_sample.svg", got)
	// Deterministic: a second rendering gives the same bytes.
	if again := renderPlan(t, samplePlan()); !bytes.Equal(got, again) {
		t.Error("Plan is not deterministic: two renderings of the same data differ")
	}
}

func TestPlan_Structure(t *testing.T) {
	data := renderPlan(t, samplePlan())
	root := parseXML(t, data)
	if root.Name != "svg" || root.Attr["width"] != "180mm" || root.Attr["height"] != "225mm" || root.Attr["viewBox"] != "0 0 180 225" {
		t.Errorf("root = <%s width=%q height=%q viewBox=%q>, want <svg width=180mm height=225mm viewBox=\"0 0 180 225\">",
			root.Name, root.Attr["width"], root.Attr["height"], root.Attr["viewBox"])
	}
	root.walk(func(n *xmlNode) {
		if _, ok := n.Attr["id"]; ok {
			t.Errorf("<%s> has an id attribute; drawings must carry none", n.Name)
		}
	})
	// Every layer of the sample is drawn, in this order (bottom to top).
	var order []string
	root.walk(func(n *xmlNode) {
		if c := n.Attr["class"]; c != "" {
			order = append(order, c)
		}
	})
	want := []string{"depth-map", "cut-edge", "grid", "existing-contours", "existing-contour-labels", "design-contours",
		"design-contour-labels", "zones", "berm-toe", "rim", "water-line", "section-lines", "survey-points", "zone-labels",
		"north-arrow", "scale-bar", "title-block", "legend", "notes"}
	if strings.Join(order, " ") != strings.Join(want, " ") {
		t.Errorf("layers = %v\nwant     %v", order, want)
	}
	texts := strings.Join(root.texts(), "|")
	for _, w := range []string{"grid north", "Ferreira-Asante koi pond", "1 in = 20 ft (1:240) on a 180",
		"Water level", "99.90 ft", "Deep zone", "3.61 ft deep", "A'", "B'", "Edge of cut", "Legend", "Notes"} {
		if !strings.Contains(texts, w) {
			t.Errorf("plan text lacks %q", w)
		}
	}
	if n := strings.Count(string(data), "http"); n != 1 || !strings.Contains(string(data), svgNamespace) {
		t.Errorf("plan holds %d occurrences of http, want only the SVG namespace", n)
	}
}

func TestPlan_WaterLevelLabel(t *testing.T) {
	// 30.45 m / 0.3048 m per ft = 99.9016 ft (international foot, 85 FR
	// 62698), printed to 0.01 ft.
	if got, want := fmtLevel(sampleWaterM, units.Feet), "99.90 ft"; got != want {
		t.Errorf("fmtLevel(%v m, ft) = %q, want %q", sampleWaterM, got, want)
	}
	// The US survey foot is 1200/3937 m: 30.45 m = 99.9014 US ft.
	if got, want := fmtLevel(30.45, units.USFeet), "99.90 ft"; got != want {
		t.Errorf("fmtLevel(30.45 m, usft) = %q, want %q", got, want)
	}
}

func TestPlan_GridTicksInWorldFeet(t *testing.T) {
	// The label "E 1680900" must sit where world easting 1 680 900 ft
	// (= 512 338.32 m, 0.3048 m per ft exactly) falls on the map.
	p := samplePlan()
	root := parseXML(t, renderPlan(t, p))
	labels := root.find(func(n *xmlNode) bool { return n.Name == "text" && strings.HasPrefix(n.Text, "E ") })
	if len(labels) == 0 {
		t.Fatal("no easting labels")
	}
	denom := standardScale(planNeed(t, p), p.Units)
	box := planBounds(&p)
	tr := paperTransform{C: box.Center(), P: geom.Vec2{X: planMapW / 2, Y: planMapH / 2}, Denom: denom}
	for _, l := range labels {
		e, err := strconv.ParseFloat(strings.TrimPrefix(l.Text, "E "), 64)
		if err != nil {
			t.Fatal(err)
		}
		local := p.Frame.ToLocal(geom.Vec2{X: e * units.Foot})
		want := tr.apply(local).X
		got, _ := strconv.ParseFloat(l.Attr["x"], 64)
		if math.Abs(got-want) > 0.006 { // 0.005 mm rounding of svgNum
			t.Errorf("label %q at x = %v mm, want %.3f", l.Text, got, want)
		}
	}
}

// planNeed returns the scale denominator at which p just fits the map.
func planNeed(tb testing.TB, p PlanData) float64 {
	tb.Helper()
	b := planBounds(&p)
	return math.Max(b.Width()*1000/(planMapW-2*planPadMM), b.Height()*1000/(planMapH-2*planPadMM))
}

func TestScaleBarLayout(t *testing.T) {
	// At 1:240 one foot is 304.8/240 = 1.27 mm: 40 mm hold 31.5 ft, so the
	// bar is 25 ft in 5 divisions of 5 ft = 6.35 mm. At 1:200 one metre is
	// 5 mm: 40 mm hold 8 m, so 5 m in 5 divisions of 5 mm. At 1:500, 20 m
	// in 4 divisions of 10 mm; at 1:1000, 25 m in 5 divisions of 5 mm.
	tests := []struct {
		mmPerUnit   float64
		length      float64
		divisions   int
		divisionMM  float64
		description string
	}{
		{1000.0 / 240 * units.Foot, 25, 5, 6.35, "1 in = 20 ft"},
		{1000.0 / 200, 5, 5, 5, "1:200"},
		{1000.0 / 500, 20, 4, 10, "1:500"},
		{1000.0 / 1000, 25, 5, 5, "1:1000"},
	}
	for _, tc := range tests {
		l, n, div := scaleBarLayout(tc.mmPerUnit, 40)
		if l != tc.length || n != tc.divisions || math.Abs(div-tc.divisionMM) > 1e-9 {
			t.Errorf("%s: scaleBarLayout = %v, %d, %v; want %v, %d, %v", tc.description, l, n, div, tc.length, tc.divisions, tc.divisionMM)
		}
	}
}

func TestDepthColours(t *testing.T) {
	// In every set, lightness must fall with depth on both sides, so a
	// greyscale print orders the classes. Lightness here is the relative
	// luminance of WCAG 2.1 ("relative luminance", sRGB: channel c/255
	// linearised as c/12.92 below 0.03928, else ((c+0.055)/1.055)^2.4;
	// L = 0.2126 R + 0.7152 G + 0.0722 B).
	for n := 1; n <= maxDepthClasses; n++ {
		for _, cut := range []bool{true, false} {
			prev := 2.0
			for k := 1; k <= n; k++ {
				c := depthColour(cut, k, n)
				l := relativeLuminance(t, c)
				if l >= prev {
					t.Errorf("n=%d cut=%v class %d %s: luminance %.3f not below class %d's %.3f", n, cut, k, c, l, k-1, prev)
				}
				prev = l
				r, _, b := rgb(t, c)
				if cut && r <= b || !cut && b <= r {
					t.Errorf("n=%d cut=%v class %d %s: cut must be the warm (brown) arm, fill the cool one", n, cut, k, c)
				}
			}
		}
	}
}

func rgb(tb testing.TB, hex string) (r, g, b float64) {
	tb.Helper()
	v, err := strconv.ParseUint(strings.TrimPrefix(hex, "#"), 16, 32)
	if err != nil || len(hex) != 7 {
		tb.Fatalf("bad colour %q", hex)
	}
	return float64(v>>16&0xff) / 255, float64(v>>8&0xff) / 255, float64(v&0xff) / 255
}

func relativeLuminance(tb testing.TB, hex string) float64 {
	r, g, b := rgb(tb, hex)
	lin := func(c float64) float64 {
		if c <= 0.03928 {
			return c / 12.92
		}
		return math.Pow((c+0.055)/1.055, 2.4)
	}
	return 0.2126*lin(r) + 0.7152*lin(g) + 0.0722*lin(b)
}

func TestDepthClasses(t *testing.T) {
	ft := units.Foot
	tests := []struct {
		name     string
		dm       []float64 // metres
		step     float64   // user step (ft); 0 auto
		wantStep float64
		nCut     int
		nFill    int
		classes  []int // class of each dm
	}{
		// Auto: the deepest is 4.27 ft; 4.27/5 = 0.85 → step 1 ft, 5 cut classes.
		{"auto", []float64{-1.3, -0.1, 0.2, math.NaN()}, 0, 1, 5, 1, []int{-5, -1, 1, 0}},
		// A depth of exactly 0.5 ft (0.1524 m) stays in the first 0.5 ft class.
		{"edge", []float64{-0.5 * ft, -0.5*ft - 1e-6, 1 * ft}, 0.5, 0.5, 2, 2, []int{-1, -2, 2}},
		// Beyond five classes the last is open-ended.
		{"open", []float64{-10 * ft, 0.3 * ft}, 1, 1, 5, 1, []int{-5, 1}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			p := PlanData{Units: units.Feet, DepthClassStep: tc.step, Depth: PlanDepthMap{NX: len(tc.dm), NY: 1, CellM: 1, DM: tc.dm}}
			lg := depthClasses(&p)
			if lg.Step != tc.wantStep || lg.NCut != tc.nCut || lg.NFill != tc.nFill {
				t.Errorf("depthClasses = step %v, %d cut, %d fill; want %v, %d, %d", lg.Step, lg.NCut, lg.NFill, tc.wantStep, tc.nCut, tc.nFill)
			}
			for i, v := range tc.dm {
				if got := lg.class(v / ft); got != tc.classes[i] {
					t.Errorf("class(%v m) = %d, want %d", v, got, tc.classes[i])
				}
			}
		})
	}
	lg := depthLegend{Step: 0.5, NCut: 2, NFill: 5, OpenFill: true, N: 5}
	if got, want := lg.label(-2, units.Feet), "0.5–1.0 ft"; got != want {
		t.Errorf("label(-2) = %q, want %q", got, want)
	}
	if got, want := lg.label(5, units.Feet), "over 2.0 ft"; got != want {
		t.Errorf("label(5) = %q, want %q", got, want)
	}
}

func TestDrawDepthMap_RunsCoverCells(t *testing.T) {
	// The merged runs of each class must cover exactly the cells of that
	// class: checked against a cell-by-cell count of a random raster.
	seed := *planSeed
	if seed == 0 {
		seed = 20260514
	}
	rng := rand.New(rand.NewPCG(seed, 1))
	const nx, ny, cell = 37, 23, 0.5
	dm := make([]float64, nx*ny)
	for k := range dm {
		switch rng.IntN(4) {
		case 0:
			dm[k] = math.NaN()
		default:
			dm[k] = (rng.Float64()*2 - 1) * 1.5
		}
	}
	m := PlanDepthMap{Origin: geom.Vec2{X: -3, Y: 4}, CellM: cell, NX: nx, NY: ny, DM: dm}
	p := PlanData{Units: units.Metres, Depth: m}
	lg := depthClasses(&p)
	tr := paperTransform{C: geom.Vec2{}, P: geom.Vec2{X: 80, Y: 70}, Denom: 100} // 5 mm cells: no averaging
	d := newSVGDoc(200, 200)
	drawDepthMap(d, tr, &m, lg)
	if err := d.writeTo(&bytes.Buffer{}); err != nil {
		t.Fatal(err)
	}
	root := parseXML(t, d.b.Bytes())
	want := map[string]int{}
	for _, v := range dm {
		if c := lg.class(v); c != 0 {
			want[lg.colour(c)]++
		}
	}
	got := map[string]float64{}
	for _, path := range root.find(func(n *xmlNode) bool { return n.Name == "path" && n.Attr["fill"] != "none" && n.Attr["fill"] != "" }) {
		for _, r := range pathRects(t, path.Attr["d"]) {
			got[path.Attr["fill"]] += r.Width() * r.Height()
		}
	}
	cellMM2 := (cell * 10) * (cell * 10) // 1:100 → 10 mm per m
	for colour, n := range want {
		if math.Abs(got[colour]-float64(n)*cellMM2) > 1e-6 {
			t.Errorf("seed %d: class %s covers %.2f mm², want %d cells = %.2f mm²", seed, colour, got[colour], n, float64(n)*cellMM2)
		}
	}
	if len(got) != len(want) {
		t.Errorf("seed %d: %d classes drawn, want %d", seed, len(got), len(want))
	}
}

func TestZoneLabelSpots(t *testing.T) {
	// A 10 × 10 m square with a 4 × 4 m hole in its middle: the best spot
	// is outside the hole and inside the square.
	square := geom.Ring{{X: 0, Y: 0}, {X: 10, Y: 0}, {X: 10, Y: 10}, {X: 0, Y: 10}}
	hole := geom.Ring{{X: 3, Y: 3}, {X: 7, Y: 3}, {X: 7, Y: 7}, {X: 3, Y: 7}}
	spots := zoneLabelSpots(square, []geom.Ring{hole})
	if len(spots) == 0 {
		t.Fatal("no spots")
	}
	for i, s := range spots {
		if !square.Contains(s.at) || (hole.Contains(s.at) && !onBoundary(hole, s.at)) {
			t.Errorf("spot %d at %v is not in the square outside the hole", i, s.at)
		}
		if i > 0 && s.length > spots[i-1].length {
			t.Errorf("spots not sorted longest first at %d", i)
		}
	}
	if spots[0].length != 10 {
		t.Errorf("longest stretch = %v m, want the full 10 m width above or below the hole", spots[0].length)
	}
}

func onBoundary(r geom.Ring, p geom.Vec2) bool { return r.BoundaryDistance(p) == 0 }

func TestPlan_ChosenScaleTooSmall(t *testing.T) {
	p := samplePlan()
	p.ScaleDenominator = 50
	root := parseXML(t, renderPlan(t, p))
	texts := strings.Join(root.texts(), " ")
	if !strings.Contains(texts, "does not fit") || !strings.Contains(texts, "1:50") {
		t.Errorf("a plan at too large a scale must say it is cut off; texts: %.300s", texts)
	}
}

func TestPlan_Degenerate(t *testing.T) {
	nan := math.NaN()
	pt := func(x, y float64) geom.Vec2 { return geom.Vec2{X: x, Y: y} }
	tests := []struct {
		name    string
		p       PlanData
		wantErr error // nil: must draw
		inMsg   string
	}{
		{"empty", PlanData{}, ErrNothingToDraw, ""},
		{"one point", PlanData{Points: []PlanMark{{ID: "1", At: pt(3, 4)}}}, nil, ""},
		{"collinear contour", PlanData{Existing: []PlanContour{{LevelM: 10, Lines: []geom.Polyline{{pt(0, 0), pt(10, 0)}}}}}, nil, ""},
		{"empty depth map only", PlanData{Depth: PlanDepthMap{NX: 2, NY: 1, CellM: 1, DM: []float64{nan, nan}}}, ErrNothingToDraw, ""},
		{"all zero change", PlanData{Depth: PlanDepthMap{NX: 2, NY: 1, CellM: 1, DM: []float64{0, 0}}}, nil, ""},
		{"NaN vertex", PlanData{Existing: []PlanContour{{LevelM: 10, Lines: []geom.Polyline{{pt(0, 0), pt(nan, 1)}}}}},
			ErrInvalidValue, "existing contour 0, line 0, vertex 1"},
		{"NaN level", PlanData{Design: []PlanContour{{LevelM: nan, Lines: []geom.Polyline{{pt(0, 0), pt(1, 1)}}}}}, ErrInvalidValue, "design contour 0"},
		{"short line", PlanData{BermToe: []geom.Polyline{{pt(0, 0)}}}, ErrInvalidValue, "berm toe 0"},
		{"short ring", PlanData{Rim: []geom.Ring{{pt(0, 0), pt(1, 0)}}}, ErrInvalidValue, "rim 0"},
		{"zone depth inf", PlanData{Zones: []PlanZone{{Name: "deep", DepthM: math.Inf(1), Ring: geom.Ring{pt(0, 0), pt(1, 0), pt(0, 1)}}}},
			ErrInvalidValue, "zone 0 (deep)"},
		{"depth size mismatch", PlanData{Depth: PlanDepthMap{NX: 3, NY: 2, CellM: 1, DM: make([]float64, 5)}}, ErrInvalidValue, "len(DM)"},
		{"depth cell size", PlanData{Depth: PlanDepthMap{NX: 1, NY: 1, CellM: -1, DM: []float64{1}}}, ErrInvalidValue, "cell size"},
		{"depth inf", PlanData{Depth: PlanDepthMap{NX: 2, NY: 1, CellM: 1, DM: []float64{1, math.Inf(-1)}}}, ErrInvalidValue, "cell (1, 0)"},
		{"depth too large", PlanData{Depth: PlanDepthMap{NX: 1 << 14, NY: 1 << 13, CellM: 1}}, ErrTooLarge, ""},
		{"negative scale", PlanData{ScaleDenominator: -100, Points: []PlanMark{{At: pt(0, 0)}}}, ErrInvalidValue, "scale"},
		{"water level NaN", PlanData{HasWaterLevel: true, WaterLevelM: nan, Points: []PlanMark{{At: pt(0, 0)}}}, ErrInvalidValue, "water level"},
		{"section NaN", PlanData{Sections: []PlanSectionLine{{Name: "A", Line: geom.Polyline{pt(0, 0), pt(0, nan)}}}}, ErrInvalidValue, "section line 0 (A)"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			var b bytes.Buffer
			err := Plan(&b, tc.p)
			if tc.wantErr == nil {
				if err != nil {
					t.Fatalf("Plan = %v, want a drawing", err)
				}
				parseXML(t, b.Bytes())
				return
			}
			if !errors.Is(err, tc.wantErr) {
				t.Fatalf("Plan = %v, want %v", err, tc.wantErr)
			}
			if !strings.Contains(err.Error(), tc.inMsg) {
				t.Errorf("error %q does not name %q", err, tc.inMsg)
			}
			if b.Len() != 0 {
				t.Errorf("Plan wrote %d bytes before failing", b.Len())
			}
		})
	}
	var ve *ValueError
	err := Plan(&bytes.Buffer{}, PlanData{Rim: []geom.Ring{{pt(0, 0), pt(1, nan), pt(1, 1)}}})
	if !errors.As(err, &ve) || ve.Item != "rim 0, vertex 1" || ve.Field != "position y" {
		t.Errorf("Plan error = %#v, want a *ValueError for rim 0, vertex 1, position y", err)
	}
}

// FuzzPlanText checks that any title, note, zone name or point ID gives a
// well-formed drawing (encoding/xml) that holds no URL.
func FuzzPlanText(f *testing.F) {
	f.Add("Koi pond", "Note: dig <here> & there", "Deep", "P1")
	f.Add("\x00\xff", "https://example.org//x", "--", "]]>")
	f.Fuzz(func(t *testing.T, site, note, zone, id string) {
		p := PlanData{
			Title:    TitleBlock{Site: site, Client: note, Address: site, Date: id},
			Zones:    []PlanZone{{Name: zone, DepthM: 0.5, Ring: geom.Ring{{X: 0, Y: 0}, {X: 8, Y: 0}, {X: 8, Y: 5}, {X: 0, Y: 5}}}},
			Points:   []PlanMark{{ID: id, At: geom.Vec2{X: 2, Y: 2}}},
			Sections: []PlanSectionLine{{Name: zone, Line: geom.Polyline{{X: -1, Y: 2}, {X: 9, Y: 2}}}},
			Notes:    []string{note, site},
		}
		var b bytes.Buffer
		if err := Plan(&b, p); err != nil {
			t.Fatalf("Plan: %v", err)
		}
		if _, err := parseXMLErr(b.Bytes()); err != nil {
			t.Fatalf("plan is not well-formed: %v", err)
		}
		body := strings.Replace(b.String(), svgNamespace, "", 1)
		if strings.Contains(body, "//") || hasScheme(strings.ToLower(body)) {
			t.Errorf("plan holds a URL")
		}
	})
}

func BenchmarkPlanSample(b *testing.B) {
	p := samplePlan()
	b.ReportAllocs()
	var buf bytes.Buffer
	for b.Loop() {
		buf.Reset()
		if err := Plan(&buf, p); err != nil {
			b.Fatal(err)
		}
	}
}

// largeDepthPlan is a 200 × 150 m site with a 0.1 m cut/fill raster (3
// million cells), a smooth bowl of cut with a fill ring.
func largeDepthPlan() PlanData {
	const nx, ny, cell = 2000, 1500, 0.1
	dm := make([]float64, nx*ny)
	for j := range ny {
		for i := range nx {
			x, y := float64(i)*cell-100, float64(j)*cell-75
			r := math.Hypot(x/60, y/40)
			switch {
			case r < 1:
				dm[j*nx+i] = -2.5 * (1 - r*r)
			case r < 1.3:
				dm[j*nx+i] = 0.8 * math.Sin((r-1)/0.3*math.Pi)
			default:
				dm[j*nx+i] = math.NaN()
			}
		}
	}
	return PlanData{Units: units.Metres, Depth: PlanDepthMap{Origin: geom.Vec2{X: -100, Y: -75}, CellM: cell, NX: nx, NY: ny, DM: dm}}
}

func TestPlan_LargeRasterIsBounded(t *testing.T) {
	if testing.Short() {
		t.Skip("large raster")
	}
	out := renderPlan(t, largeDepthPlan())
	// Cells are averaged to at least planMinCellMM on paper, so at most
	// (172/0.5)·(146/0.5) ≈ 100 000 cells remain: the file stays in
	// megabytes, not the hundreds the raw raster would take.
	if len(out) > 4<<20 {
		t.Errorf("plan of a 3-million-cell raster is %d bytes, want under 4 MiB", len(out))
	}
	parseXML(t, out)
}

func BenchmarkPlanLargeRaster3M(b *testing.B) {
	p := largeDepthPlan()
	b.ReportAllocs()
	var buf bytes.Buffer
	for b.Loop() {
		buf.Reset()
		if err := Plan(&buf, p); err != nil {
			b.Fatal(err)
		}
	}
}

// wallPlan is a 4 × 3 m pool 1.2 m deep below a 100 m rim whose 13 design
// contours, every 0.1 m and all index, lie band apart in plan from one
// to the next (the bottom one on the floor's edge): band = 5 cm / 12
// draws a vertical wall smeared over a 5 cm lattice cell, band = 0.1 m a
// 1:1 wall.
func wallPlan(band float64) PlanData {
	p := PlanData{Units: units.Metres, Zones: []PlanZone{{Name: "pool", DepthM: 1.1, Ring: geom.Ring{{X: 0, Y: 0}, {X: 4, Y: 0}, {X: 4, Y: 3}, {X: 0, Y: 3}}}}}
	for k := range 13 {
		d := band * float64(k)
		p.Design = append(p.Design, PlanContour{LevelM: 98.8 + 0.1*float64(k), Index: true,
			Lines: []geom.Polyline{{{X: -d, Y: -d}, {X: 4 + d, Y: -d}, {X: 4 + d, Y: 3 + d}, {X: -d, Y: 3 + d}, {X: -d, Y: -d}}}})
	}
	return p
}

// contourLabel is a contour label read back from the drawing: its text and
// the point on paper it is centred on (its rotation centre).
type contourLabel struct {
	text string
	at   geom.Vec2
}

func designLabels(tb testing.TB, data []byte) (labels []contourLabel, paths int) {
	tb.Helper()
	root := parseXML(tb, data)
	for _, g := range root.find(func(n *xmlNode) bool { return n.Attr["class"] == "design-contours" }) {
		paths += len(g.find(func(n *xmlNode) bool { return n.Name == "path" }))
	}
	for _, g := range root.find(func(n *xmlNode) bool { return n.Attr["class"] == "design-contour-labels" }) {
		for _, n := range g.find(func(n *xmlNode) bool { return n.Name == "text" }) {
			f := strings.Fields(strings.TrimSuffix(strings.TrimPrefix(n.Attr["transform"], "rotate("), ")"))
			if len(f) != 3 {
				tb.Fatalf("label %q: transform %q, want rotate(a x y)", n.Text, n.Attr["transform"])
			}
			x, _ := strconv.ParseFloat(f[1], 64)
			y, _ := strconv.ParseFloat(f[2], 64)
			labels = append(labels, contourLabel{n.Text, geom.Vec2{X: x, Y: y}})
		}
	}
	return labels, paths
}

// ringDistance returns the distance on paper from p to contour c.
func ringDistance(tr paperTransform, c PlanContour, p geom.Vec2) float64 {
	d := math.Inf(1)
	for _, l := range c.Lines {
		pts := toPaper(nil, tr, l)
		for i := 1; i < len(pts); i++ {
			d = math.Min(d, pointSegDist(p, pts[i-1], pts[i]))
		}
	}
	return d
}

func TestPlan_WallContourLabels(t *testing.T) {
	// A vertical wall: the 13 contours run 0.08 mm apart on paper (1:50),
	// and a label on any of them would cover its neighbours. Plain
	// geometry of the drawing, no outside reference: every line is kept;
	// only the wall's top (100 m, set outside beside its line) and bottom
	// (98.8 m, inside) are labelled; labels keep a label height apart.
	p := wallPlan(0.05 / 12)
	data := renderPlan(t, p)
	labels, paths := designLabels(t, data)
	if paths != len(p.Design) {
		t.Errorf("%d design contour paths, want %d: the lines are kept", paths, len(p.Design))
	}
	denom := standardScale(planNeed(t, p), p.Units)
	box := planBounds(&p)
	tr := paperTransform{C: box.Center(), P: geom.Vec2{X: planMapW / 2, Y: planMapH / 2}, Denom: denom}
	seen := map[string]int{}
	for i, l := range labels {
		seen[l.text]++
		var c PlanContour
		switch l.text {
		case "100":
			c = p.Design[12]
		case "98.8":
			c = p.Design[0]
		default:
			t.Errorf("label %q at %v: only the wall's top and bottom are labelled", l.text, l.at)
			continue
		}
		// Beside its line, on the open side: outside the pool for the top,
		// inside for the bottom (0.01 mm, the drawing's number precision).
		if d, want := ringDistance(tr, c, l.at), 0.5*contourLabelMM+besideGapMM; math.Abs(d-want) > 0.01 {
			t.Errorf("label %q at %v is %.3f mm from its line, want %.3f beside it", l.text, l.at, d, want)
		}
		in := geom.BoxOf(p.Design[0].Lines[0])
		inside := geom.Box{Min: tr.apply(geom.Vec2{X: in.Min.X, Y: in.Max.Y}), Max: tr.apply(geom.Vec2{X: in.Max.X, Y: in.Min.Y})}.Contains(l.at)
		if inside != (l.text == "98.8") {
			t.Errorf("label %q at %v: inside the pool %v", l.text, l.at, inside)
		}
		for _, m := range labels[:i] {
			if d := l.at.Distance(m.at); d < contourLabelMM {
				t.Errorf("labels %q at %v and %q at %v are %.2f mm apart, under a label height", l.text, l.at, m.text, m.at, d)
			}
		}
	}
	if seen["100"] == 0 || seen["98.8"] == 0 {
		t.Errorf("labels %v: want the top (100) and the bottom (98.8) of the wall", seen)
	}
}

func TestPlan_SlopedContourLabels(t *testing.T) {
	// The same levels on a 1:1 wall run 2 mm apart on paper (1:50), more
	// than a label height: every level is labelled on its line, as before.
	p := wallPlan(0.1)
	data := renderPlan(t, p)
	labels, _ := designLabels(t, data)
	denom := standardScale(planNeed(t, p), p.Units)
	box := planBounds(&p)
	tr := paperTransform{C: box.Center(), P: geom.Vec2{X: planMapW / 2, Y: planMapH / 2}, Denom: denom}
	byText := map[string]PlanContour{}
	for _, c := range p.Design {
		byText[fmtLevelLabel(c.LevelM, p.Units)] = c
	}
	seen := map[string]bool{}
	for _, l := range labels {
		c, ok := byText[l.text]
		if !ok {
			t.Fatalf("label %q is no level of the drawing", l.text)
		}
		seen[l.text] = true
		if d := ringDistance(tr, c, l.at); d > 0.01 {
			t.Errorf("label %q at %v is %.3f mm off its line, want on it", l.text, l.at, d)
		}
	}
	if len(seen) != len(p.Design) {
		t.Errorf("%d of %d levels labelled: %v", len(seen), len(p.Design), seen)
	}
}
