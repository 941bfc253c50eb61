package takeoff

import (
	"cmp"
	"fmt"
	"math"
	"slices"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/units"
)

// LinerMaterial is a flexible liner: its thickness and the density of its
// compound.
type LinerMaterial struct {
	Name        string  `json:"name"`
	ThicknessM  float64 `json:"thickness_m"`
	DensityKgM3 float64 `json:"density_kg_m3"`
}

// MassPerAreaKgM2 returns the sheet's mass per square metre.
func (m LinerMaterial) MassPerAreaKgM2() float64 { return m.ThicknessM * m.DensityKgM3 }

// Liner compound densities. No published figure was confirmed for any of
// them (check-values.md §7 derives the EPDM sheet weights from an assumed
// density); all three are from memory, typical of manufacturers' data
// sheets, and a user value overrides them.
const (
	// epdmDensity: EPDM roofing and pond compound, about 1.1–1.3 g/cm³
	// (from memory).
	epdmDensity = 1200.0
	// pvcDensity: plasticised PVC sheet, about 1.3 g/cm³ (from memory).
	pvcDensity = 1300.0
	// peDensity: polyethylene (RPE, LLDPE), about 0.92–0.94 g/cm³ (from
	// memory); the scrim of reinforced PE adds little.
	peDensity = 940.0
)

// linerPresets are the liner materials offered by name. Thicknesses are
// nominal, in mils (1 mil = 0.001 in = 25.4 µm exactly); the gauges are the
// common ones of check-values.md §7 (common practice, no source).
var linerPresets = []LinerMaterial{
	{Name: "epdm45", ThicknessM: 45 * units.Mil, DensityKgM3: epdmDensity},
	{Name: "epdm60", ThicknessM: 60 * units.Mil, DensityKgM3: epdmDensity},
	{Name: "pvc20", ThicknessM: 20 * units.Mil, DensityKgM3: pvcDensity},
	{Name: "pvc32", ThicknessM: 32 * units.Mil, DensityKgM3: pvcDensity},
	{Name: "rpe20", ThicknessM: 20 * units.Mil, DensityKgM3: peDensity},
	{Name: "rpe30", ThicknessM: 30 * units.Mil, DensityKgM3: peDensity},
	{Name: "lldpe20", ThicknessM: 20 * units.Mil, DensityKgM3: peDensity},
	{Name: "lldpe30", ThicknessM: 30 * units.Mil, DensityKgM3: peDensity},
}

// LinerMaterialByName returns the preset liner material called name
// ("epdm45", "EPDM 60", "pvc-20", "rpe30", "lldpe20" ...).
func LinerMaterialByName(name string) (LinerMaterial, error) {
	return lookup("liner material", name, linerPresets, func(m LinerMaterial) []string { return []string{m.Name} })
}

// OuncePerSquareYard is one avoirdupois ounce (1/16 lb) per square yard in
// kg/m², the unit geotextile weights are sold by in the US: 33.9057 g/m².
const OuncePerSquareYard = units.Pound / 16 / units.SquareYard

// Geotextile is an underlayment fabric, by its mass per area.
type Geotextile struct {
	Name       string  `json:"name"`
	GramsPerM2 float64 `json:"grams_per_m2"`
}

// underlaymentPresets: nonwoven geotextile of 6–10 oz/yd² (200–340 g/m²)
// under a liner is common practice (check-values.md §7, no source).
var underlaymentPresets = []Geotextile{
	{Name: "geotextile-8oz", GramsPerM2: 8 * OuncePerSquareYard * 1000},
	{Name: "geotextile-6oz", GramsPerM2: 6 * OuncePerSquareYard * 1000},
	{Name: "geotextile-10oz", GramsPerM2: 10 * OuncePerSquareYard * 1000},
	{Name: "geotextile-200g", GramsPerM2: 200},
	{Name: "geotextile-300g", GramsPerM2: 300},
}

// UnderlaymentByName returns the preset underlayment called name
// ("geotextile-8oz", "geotextile 300g" ...).
func UnderlaymentByName(name string) (Geotextile, error) {
	return lookup("underlayment", name, underlaymentPresets, func(g Geotextile) []string { return []string{g.Name} })
}

// Stock is the list of liner sheet sizes a supplier cuts, and the overlap
// of a seam when one sheet is not enough.
type Stock struct {
	WidthsM      []float64 `json:"widths_m"`
	LengthsM     []float64 `json:"lengths_m"`
	SeamOverlapM float64   `json:"seam_overlap_m"`
}

// Default seam overlap: 6 in (152.4 mm) for feet stock, 150 mm for metric
// stock (common practice, no source; seam tape makers ask for a few inches
// of lap).
const (
	defaultSeamOverlapFt = 6 * units.Inch
	defaultSeamOverlapM  = 0.150
)

// DefaultStock returns the default stock list (common practice, no
// source): widths 10 to 50 ft and lengths 10 to 100 ft in 5 ft steps, or,
// when metric, widths 3 to 15 m and lengths 3 to 30 m in 0.5 m steps.
func DefaultStock(metric bool) Stock {
	var s Stock
	if metric {
		for w := 6; w <= 30; w++ {
			s.WidthsM = append(s.WidthsM, float64(w)*0.5)
		}
		for l := 6; l <= 60; l++ {
			s.LengthsM = append(s.LengthsM, float64(l)*0.5)
		}
		s.SeamOverlapM = defaultSeamOverlapM
		return s
	}
	for w := 10; w <= 50; w += 5 {
		s.WidthsM = append(s.WidthsM, float64(w)*units.Foot)
	}
	for l := 10; l <= 100; l += 5 {
		s.LengthsM = append(s.LengthsM, float64(l)*units.Foot)
	}
	s.SeamOverlapM = defaultSeamOverlapFt
	return s
}

// StockOrder is the stock chosen for a sheet: panels of one size, laid
// PanelsAcross × PanelsAlong, joined by Seams seams of SeamOverlapM lap.
// One panel means no seam. AreaM2 is the area bought.
type StockOrder struct {
	PanelWidthM  float64 `json:"panel_width_m"`
	PanelLengthM float64 `json:"panel_length_m"`
	Panels       int     `json:"panels"`
	PanelsAcross int     `json:"panels_across"`
	PanelsAlong  int     `json:"panels_along"`
	Seams        int     `json:"seams"`
	SeamOverlapM float64 `json:"seam_overlap_m"`
	AreaM2       float64 `json:"area_m2"`
}

// stockFitTolM lets a stock size cover a sheet that is longer by less than
// a micrometre, so that round-off in a measured length never forces a seam.
const stockFitTolM = 1e-6

// ChooseStock returns the stock order for a sheet of the given length and
// width (m, any order). When one stock sheet covers it (turned either way)
// the smallest by area is chosen, ties to the narrower. Otherwise panels of
// one size are seamed: for every stock width and length, n panels of width
// w cover n·w − (n − 1)·seam, and the layout of least area wins (ties to
// fewer seams), and seamed reports true. Errors: an empty list, a size that
// is not a positive finite number, a negative seam overlap, or a sheet that
// needs seams when no stock size exceeds the seam overlap.
func ChooseStock(lengthM, widthM float64, st Stock) (order StockOrder, seamed bool, err error) {
	if len(st.WidthsM) == 0 || len(st.LengthsM) == 0 {
		return StockOrder{}, false, fmt.Errorf("%w: no stock widths or no stock lengths", ErrStock)
	}
	for _, v := range append(slices.Clone(st.WidthsM), st.LengthsM...) {
		if !(v > 0) || math.IsInf(v, 0) {
			return StockOrder{}, false, fmt.Errorf("%w: stock size must be > 0 m, got %g", ErrStock, v)
		}
	}
	if !(st.SeamOverlapM >= 0) || math.IsInf(st.SeamOverlapM, 0) {
		return StockOrder{}, false, fmt.Errorf("%w: seam overlap must be >= 0 m, got %g", ErrStock, st.SeamOverlapM)
	}
	ws := slices.Sorted(slices.Values(st.WidthsM))
	ls := slices.Sorted(slices.Values(st.LengthsM))
	order, seamed, ok := pickStock(lengthM, widthM, ws, ls, st.SeamOverlapM)
	if !ok {
		return StockOrder{}, true, fmt.Errorf("%w: a %.3f × %.3f m sheet needs seams, but no stock size is larger than the %.3f m seam overlap",
			ErrStock, max(lengthM, widthM), min(lengthM, widthM), st.SeamOverlapM)
	}
	return order, seamed, nil
}

// pickStock is ChooseStock on a checked stock list, the widths ws and
// lengths ls sorted; ok is false when no layout covers the sheet. It does
// not allocate.
func pickStock(lengthM, widthM float64, ws, ls []float64, seam float64) (order StockOrder, seamed, ok bool) {
	L, W := max(lengthM, widthM), min(lengthM, widthM)
	best := StockOrder{}
	found := false
	better := func(o StockOrder) bool {
		if !found {
			return true
		}
		if c := cmp.Compare(o.AreaM2, best.AreaM2); c != 0 {
			return c < 0
		}
		if o.Seams != best.Seams {
			return o.Seams < best.Seams
		}
		return o.PanelWidthM < best.PanelWidthM
	}
	for _, w := range ws {
		for _, l := range ls {
			if (w+stockFitTolM >= W && l+stockFitTolM >= L) || (w+stockFitTolM >= L && l+stockFitTolM >= W) {
				o := StockOrder{PanelWidthM: w, PanelLengthM: l, Panels: 1, PanelsAcross: 1, PanelsAlong: 1,
					SeamOverlapM: seam, AreaM2: w * l}
				if better(o) {
					best, found = o, true
				}
			}
		}
	}
	if found {
		return best, false, true
	}
	s := seam
	need := func(x, size float64) int {
		if size+stockFitTolM >= x {
			return 1
		}
		if size <= s {
			return 0
		}
		return int(math.Ceil((x - s - stockFitTolM) / (size - s)))
	}
	for _, dims := range [2][2]float64{{W, L}, {L, W}} { // widths across dims[0]
		for _, w := range ws {
			for _, l := range ls {
				na, nl := need(dims[0], w), need(dims[1], l)
				if na == 0 || nl == 0 {
					continue
				}
				o := StockOrder{PanelWidthM: w, PanelLengthM: l, Panels: na * nl, PanelsAcross: na, PanelsAlong: nl,
					Seams: (na - 1) + (nl - 1), SeamOverlapM: s, AreaM2: float64(na*nl) * w * l}
				if better(o) {
					best, found = o, true
				}
			}
		}
	}
	return best, true, found
}

// lengthAlong reports whether the order's panels, laid with their length
// along the sheet's length L (and their width across its width W), cover
// the sheet; otherwise they are laid turned.
func (o StockOrder) lengthAlong(L, W float64) bool {
	cover := func(n int, size float64) float64 { return float64(n)*size - float64(n-1)*o.SeamOverlapM }
	return cover(o.PanelsAlong, o.PanelLengthM)+stockFitTolM >= L && cover(o.PanelsAcross, o.PanelWidthM)+stockFitTolM >= W
}

// gap returns how far a sheet of sides L and W overruns the cover of the
// order's panels (m), the larger of the two sides' overruns in the better
// of the two ways of laying them; it is <= 0 when the panels cover the
// sheet.
func (o StockOrder) gap(L, W float64) float64 {
	cover := func(n int, size float64) float64 { return float64(n)*size - float64(n-1)*o.SeamOverlapM }
	a, b := cover(o.PanelsAlong, o.PanelLengthM), cover(o.PanelsAcross, o.PanelWidthM)
	return min(max(L-a, W-b), max(L-b, W-a))
}

// LinerOptions configures the liner and underlayment order. The zero value
// means: 1 ft overlap, EPDM 45 mil, the feet stock list, 8 oz/yd²
// geotextile underlayment, automatic section spacing.
type LinerOptions struct {
	// OverlapM is the anchor allowance beyond the rim on every side; nil
	// means 1 ft (0.3048 m, common practice: 1–2 ft, check-values.md §7).
	// Zero is allowed.
	OverlapM *float64
	// Material is the liner; the zero value means EPDM 45 mil.
	Material LinerMaterial
	// Metric selects the metric default stock list.
	Metric bool
	// Stock overrides the default stock list when its lists are non-empty.
	Stock Stock
	// Underlayment is the geotextile; the zero value means 8 oz/yd².
	Underlayment Geotextile
	// NoUnderlayment leaves the underlayment out.
	NoUnderlayment bool
	// SectionSpacingM is the spacing of the parallel cross-sections that
	// measure the sheet; 0 means 1/64 of the pond's width across them (the
	// best line's offset is then refined).
	SectionSpacingM float64
	// SectionStepM is the coarse sampling step along a cross-section on the
	// analytic bowl (intervals are split where the bowl bends); 0 means
	// 1/48 of the pond's extent or half the narrowest wall band.
	SectionStepM float64
}

// maxRasterSteps bounds the raster's steps across the pond's extent: 512
// ranks the angles of a large pond as well as a finer raster would (its
// sections are off by a step at each end, 0.4 % of the extent at most),
// and bounds the sheet search's cost on a fine mesh.
const maxRasterSteps = 512

// DefaultOverlapM is the default overlap beyond the rim: 1 ft.
const DefaultOverlapM = units.Foot

// LinerResult is the liner order.
type LinerResult struct {
	// DevelopedAreaM2 is the true 3-D area of the bowl up to the rim.
	DevelopedAreaM2 float64 `json:"developed_area_m2"`
	// RimPerimeterM is the length of the rim outline.
	RimPerimeterM float64 `json:"rim_perimeter_m"`
	// OverlapM is the allowance beyond the rim on every side.
	OverlapM float64 `json:"overlap_m"`
	// OverlapAreaM2 is RimPerimeterM × OverlapM.
	OverlapAreaM2 float64 `json:"overlap_area_m2"`
	// LinerAreaM2 is the developed area plus the overlap area: the liner
	// that ends up in the ground.
	LinerAreaM2 float64 `json:"liner_area_m2"`
	// SheetLengthM and SheetWidthM are the least rectangular sheet that
	// covers the bowl, each including 2 × overlap; length is the longer
	// side.
	SheetLengthM float64 `json:"sheet_length_m"`
	SheetWidthM  float64 `json:"sheet_width_m"`
	// SheetAngleDeg is the direction of the sheet's length, degrees
	// counter-clockwise from the local x (east) axis, in [0, 180).
	SheetAngleDeg float64 `json:"sheet_angle_deg"`
	SheetAreaM2   float64 `json:"sheet_area_m2"`
	// StockSheetLengthM, StockSheetWidthM, StockSheetAngleDeg and
	// StockSheetAreaM2 are the sheet the stock is ordered for: over all
	// angles, the one that needs the least stock area, ties to the smaller
	// sheet. Sides include 2 × overlap, the length is the longer side and
	// the angle its direction, as for the least sheet, which it is unless
	// another angle takes less stock. The stock, waste, weight and
	// underlayment are for this sheet.
	StockSheetLengthM  float64 `json:"stock_sheet_length_m"`
	StockSheetWidthM   float64 `json:"stock_sheet_width_m"`
	StockSheetAngleDeg float64 `json:"stock_sheet_angle_deg"`
	StockSheetAreaM2   float64 `json:"stock_sheet_area_m2"`
	// StockLengthAngleDeg is the direction in which to lay the stock
	// panels' length, degrees counter-clockwise from east in [0, 180):
	// StockSheetAngleDeg when the panels' length runs along the sheet's
	// length, 90° more when the stock is turned.
	StockLengthAngleDeg float64 `json:"stock_length_angle_deg"`
	// SectionMethod says how the final cross-sections were measured:
	// "analytic" (the design's bowl, zone edges as breakpoints) or "mesh".
	SectionMethod string `json:"section_method"`
	// RuleOfThumbLengthM and RuleOfThumbWidthM are L + 2·Dmax + 2·overlap
	// and W + 2·Dmax + 2·overlap, with L × W the rim outline's minimum-area
	// rectangle and Dmax the depth from the rim to the deepest point.
	RuleOfThumbLengthM float64 `json:"rule_of_thumb_length_m"`
	RuleOfThumbWidthM  float64 `json:"rule_of_thumb_width_m"`
	RimRect            Rect    `json:"rim_rect"`
	RimToDeepestM      float64 `json:"rim_to_deepest_m"`
	// Stock is the stock sheet (or seamed panels) to order.
	Stock StockOrder `json:"stock"`
	// WasteRatio is the stock area over the liner area (≥ 1), WasteM2 their
	// difference.
	WasteRatio float64       `json:"waste_ratio"`
	WasteM2    float64       `json:"waste_m2"`
	Material   LinerMaterial `json:"material"`
	// WeightKg is the weight of the stock ordered.
	WeightKg float64  `json:"weight_kg"`
	WeightLb float64  `json:"weight_lb"`
	Notes    []string `json:"notes"`
}

// UnderlaymentResult is the underlayment under the liner: the same sheet
// size, by the fabric's mass per area.
type UnderlaymentResult struct {
	Material     Geotextile `json:"material"`
	SheetLengthM float64    `json:"sheet_length_m"`
	SheetWidthM  float64    `json:"sheet_width_m"`
	AreaM2       float64    `json:"area_m2"`
	AreaSquareYd float64    `json:"area_yd2"`
	WeightKg     float64    `json:"weight_kg"`
	WeightLb     float64    `json:"weight_lb"`
}

// LinerInput is what the liner takeoff measures.
type LinerInput struct {
	// Mesh is the bowl over the lined area (the design's BowlMesh):
	// triangles with elevations, counter-clockwise in plan. Parts above
	// RimM are clipped off.
	Mesh geom.TriMesh
	RimM float64
	// WaterLevelM is the level the zones' depths are measured from.
	WaterLevelM float64
	// Bowl is the analytic bowl, or nil to measure on the mesh alone.
	Bowl Bowl
	// Zones give the breakpoints of the analytic cross-sections (their
	// rings) and which walls are vertical (WallSlope 0).
	Zones []Zone
}

// MeasureLiner computes the liner and underlayment order and returns them
// with warnings (a seamed sheet). Errors: an empty mesh, a non-finite rim,
// a bad option or stock list, or a mesh with no part below the rim.
func MeasureLiner(in LinerInput, o LinerOptions) (LinerResult, *UnderlaymentResult, []string, error) {
	var res LinerResult
	var warn []string
	if in.Mesh.NumTriangles() == 0 {
		return res, nil, nil, fmt.Errorf("%w: the bowl mesh has no triangles", ErrInput)
	}
	if err := validateMesh(in.Mesh); err != nil {
		return res, nil, nil, err
	}
	if !isFinite(in.RimM) {
		return res, nil, nil, inputError("rim elevation", in.RimM, "a finite number (m)")
	}
	overlap := DefaultOverlapM
	if o.OverlapM != nil {
		overlap = *o.OverlapM
	}
	if !(overlap >= 0) || math.IsInf(overlap, 0) {
		return res, nil, nil, optionError("liner overlap", overlap, ">= 0 m")
	}
	mat := o.Material
	if mat == (LinerMaterial{}) {
		mat = linerPresets[0]
	}
	if !(mat.ThicknessM > 0) || math.IsInf(mat.ThicknessM, 0) {
		return res, nil, nil, optionError("liner thickness", mat.ThicknessM, "> 0 m")
	}
	if !(mat.DensityKgM3 > 0) || math.IsInf(mat.DensityKgM3, 0) {
		return res, nil, nil, optionError("liner density", mat.DensityKgM3, "> 0 kg/m³")
	}
	stock := o.Stock
	if len(stock.WidthsM) == 0 && len(stock.LengthsM) == 0 {
		def := DefaultStock(o.Metric)
		stock.WidthsM, stock.LengthsM = def.WidthsM, def.LengthsM
		if stock.SeamOverlapM == 0 {
			stock.SeamOverlapM = def.SeamOverlapM
		}
	}
	if o.SectionSpacingM < 0 || math.IsNaN(o.SectionSpacingM) {
		return res, nil, nil, optionError("section spacing", o.SectionSpacingM, ">= 0 m (0 for automatic)")
	}
	if o.SectionStepM < 0 || math.IsNaN(o.SectionStepM) {
		return res, nil, nil, optionError("section step", o.SectionStepM, ">= 0 m (0 for automatic)")
	}

	R := in.RimM
	m := in.Mesh
	res.DevelopedAreaM2 = DevelopedArea(m, R)
	if !(res.DevelopedAreaM2 > 0) {
		return res, nil, nil, fmt.Errorf("%w: no part of the bowl mesh lies below the rim at %.3f m", ErrInput, R)
	}
	cell := meshCell(m)
	rim := rimOutline(m, R, in.WaterLevelM, in.Bowl, in.Zones, cell)
	res.RimPerimeterM = rim.perimeter
	res.OverlapM = overlap
	res.OverlapAreaM2 = rim.perimeter * overlap
	res.LinerAreaM2 = res.DevelopedAreaM2 + res.OverlapAreaM2

	deepest := math.Inf(1)
	for _, v := range m.V {
		deepest = min(deepest, v.Z)
	}
	res.RimToDeepestM = R - deepest
	res.RimRect = MinAreaRect(rim.points)
	res.RuleOfThumbLengthM = res.RimRect.LengthM + 2*res.RimToDeepestM + 2*overlap
	res.RuleOfThumbWidthM = res.RimRect.WidthM + 2*res.RimToDeepestM + 2*overlap

	// The sheet.
	hull := convexHull(rim.points)
	ext := 0.0
	for i := range hull {
		for j := i + 1; j < len(hull); j++ {
			ext = max(ext, hull[i].Distance(hull[j]))
		}
	}
	s := newSheetSearch(in, o, cell, hull, ext, overlap)
	res.SectionMethod = "mesh"
	if s.guided {
		res.SectionMethod = "analytic"
	}
	fit := s.run([]float64{res.RimRect.AngleDeg})
	res.SheetLengthM, res.SheetWidthM, res.SheetAngleDeg = fit.sheet(overlap)
	res.SheetAreaM2 = res.SheetLengthM * res.SheetWidthM

	// The stock: the least sheet's order, then the angle whose sheet takes
	// the least stock.
	if _, _, err := ChooseStock(res.SheetLengthM, res.SheetWidthM, stock); err != nil {
		return res, nil, nil, err
	}
	ws := slices.Sorted(slices.Values(stock.WidthsM))
	ls := slices.Sorted(slices.Values(stock.LengthsM))
	choose := func(along, across float64) (StockOrder, bool) {
		o, _, ok := pickStock(along+2*overlap, across+2*overlap, ws, ls, stock.SeamOverlapM)
		return o, ok
	}
	sf := s.cheapestStock(fit, choose)
	res.StockSheetLengthM, res.StockSheetWidthM, res.StockSheetAngleDeg = sf.sheet(overlap)
	res.StockSheetAreaM2 = res.StockSheetLengthM * res.StockSheetWidthM
	order, seamed, err := ChooseStock(res.StockSheetLengthM, res.StockSheetWidthM, stock)
	if err != nil {
		return res, nil, nil, err
	}
	res.Stock = order
	res.StockLengthAngleDeg = res.StockSheetAngleDeg
	if !order.lengthAlong(res.StockSheetLengthM, res.StockSheetWidthM) {
		res.StockLengthAngleDeg = normAngle(res.StockSheetAngleDeg + 90)
	}
	if seamed {
		warn = append(warn, fmt.Sprintf(
			"no stock sheet covers the %.2f × %.2f m liner sheet (largest stock %.2f m wide, %.2f m long): order %d panels of %.2f × %.2f m with %d seam(s) of %.3f m overlap",
			res.StockSheetLengthM, res.StockSheetWidthM, slices.Max(stock.WidthsM), slices.Max(stock.LengthsM),
			order.Panels, order.PanelWidthM, order.PanelLengthM, order.Seams, order.SeamOverlapM))
	}
	res.WasteRatio = order.AreaM2 / res.LinerAreaM2
	res.WasteM2 = order.AreaM2 - res.LinerAreaM2
	res.Material = mat
	res.WeightKg = order.AreaM2 * mat.MassPerAreaKgM2()
	res.WeightLb = res.WeightKg / units.Pound
	res.Notes = []string{
		fmt.Sprintf("developed area: 3-D area of the bowl below the rim at %.3f m; the overlap adds rim perimeter × %.3f m", R, overlap),
		"sheet: for each angle, the longest developed cross-section along it and across it, each plus 2 × overlap; angle in degrees counter-clockwise from east",
		"stock: over all angles, the sheet that takes the least stock area (ties to the smaller sheet); the stock, waste, weight and underlayment are for that sheet laid at its angle",
		"rule of thumb: L + 2·Dmax + 2·overlap by W + 2·Dmax + 2·overlap, L × W the rim outline's minimum-area rectangle, Dmax from the rim to the deepest point",
		"waste: stock area ordered / (developed area + overlap area)",
	}
	if res.SectionMethod == "mesh" {
		res.Notes = append(res.Notes, "sheet measured on the mesh (no analytic bowl): vertical walls are smeared over one mesh cell")
	}

	if o.NoUnderlayment {
		return res, nil, warn, nil
	}
	g := o.Underlayment
	if g == (Geotextile{}) {
		g = underlaymentPresets[0]
	}
	if !(g.GramsPerM2 > 0) || math.IsInf(g.GramsPerM2, 0) {
		return res, nil, nil, optionError("underlayment weight", g.GramsPerM2, "> 0 g/m²")
	}
	u := &UnderlaymentResult{Material: g, SheetLengthM: res.StockSheetLengthM, SheetWidthM: res.StockSheetWidthM}
	u.AreaM2 = res.StockSheetAreaM2
	u.AreaSquareYd = u.AreaM2 / units.SquareYard
	u.WeightKg = u.AreaM2 * g.GramsPerM2 / 1000
	u.WeightLb = u.WeightKg / units.Pound
	return res, u, warn, nil
}

// newSheetSearch sets up the sheet search over the lined part of in's mesh
// (cell its lattice spacing, hull the convex hull of the rim outline, ext
// the hull's diameter): a raster of the mesh for the coarse and fine
// stages, and the analytic bowl for the exact stage when in has one.
func newSheetSearch(in LinerInput, o LinerOptions, cell float64, hull []geom.Vec2, ext, overlap float64) *sheetSearch {
	R, m := in.RimM, in.Mesh
	// The raster ranks angles; half a mesh cell resolves the mesh, and
	// maxRasterSteps across the pond is enough to rank a large one.
	hr := max(cell/2, ext/maxRasterSteps)
	if !(hr > 0) {
		hr = ext / 200
	}
	ras := newRaster(m, R, hr)
	// res is the coarser of the mesh's and the raster's resolution: walls
	// steeper than two of it are smeared.
	resol := max(cell, 2*ras.h)
	s := &sheetSearch{
		coarse:      &rasterProfile{r: ras, step: 2 * ras.h},
		fine:        &rasterProfile{r: ras, step: ras.h},
		hull:        hull,
		margin:      2*cell + ras.h,
		overlap:     overlap,
		coarseLines: 32,
		fineLines:   64,
		hopeTol:     2*resol + 4*ras.h,
		fineStep:    ras.h,
	}
	s.exact, s.exactLines = s.fine, s.fineLines
	if in.Bowl != nil {
		// The coarse step along a line: 1/48 of the extent, and at most half
		// the narrowest sloped wall band (run of a wall from its floor to the
		// rim), so that no wall is stepped over; 1/1024 of the extent at
		// least.
		step := o.SectionStepM
		if step == 0 {
			step = ext / 48
			for _, z := range in.Zones {
				if band := z.WallSlope * (R - (in.WaterLevelM - z.DepthM)); z.WallSlope > 0 && band > 0 {
					step = min(step, band/2)
				}
			}
			step = max(step, ext/1024)
		}
		ap := &analyticProfile{bowl: in.Bowl, rim: R, step: step}
		// The raster overstates lines on sloped walls (its capped cells
		// reach past the rim) and understates them by at most a couple of
		// its steps; but a wall steeper than the mesh and raster resolve (a
		// band narrower than two of resol, vertical included) it smears
		// into a gentle slope, and a line crossing it at a grazing angle
		// loses up to the wall's height at each of its two crossings.
		slack := 2 * ras.h
		s.steadyRaster = true
		for _, z := range in.Zones {
			if len(z.Ring) < 3 {
				continue
			}
			ap.rings = append(ap.rings, breakRing{ring: z.Ring, vertical: z.WallSlope == 0})
			h := R - (in.WaterLevelM - z.DepthM)
			if z.WallSlope*h < 2*resol {
				slack += 2 * max(h, 0)
				s.steadyRaster = false
			}
		}
		s.exact = ap
		s.exactLines = s.fineLines
		s.guided = true
		s.slack = slack
	}
	if o.SectionSpacingM > 0 {
		// Lines across the widest extent at the given spacing.
		s.exactLines = max(1, int(math.Ceil(ext/o.SectionSpacingM)))
		s.fineLines = s.exactLines
	}
	return s
}

// rimData is the rim outline measured on the mesh: its length and the
// points that span it (outline ends, moved onto the analytic bowl near
// steep walls, plus vertical-wall corners on the rim).
type rimData struct {
	perimeter float64
	points    []geom.Vec2
}

// steepBoxes returns, for every zone whose wall the lattice cannot resolve
// (a run from floor to rim shorter than two cells, vertical walls
// included), its floor's bounding box grown by reach. Only contour points
// inside these boxes need moving onto the analytic bowl: elsewhere the mesh
// interpolates a bowl it resolves, and its level line is within O(h²) of
// the true one.
func steepBoxes(zones []Zone, water, rim, cell, reach float64) []geom.Box {
	var bs []geom.Box
	for _, z := range zones {
		if len(z.Ring) < 3 {
			continue
		}
		h := rim - (water - z.DepthM)
		if z.WallSlope*h < 2*cell {
			bs = append(bs, z.Ring.Bounds().Expand(z.WallSlope*max(h, 0)+reach))
		}
	}
	return bs
}

func inAny(bs []geom.Box, p geom.Vec2) bool {
	for _, b := range bs {
		if b.Contains(p) {
			return true
		}
	}
	return false
}

// rimOutline measures the outline of the part of m below level. With an
// analytic bowl, each outline end near a steep wall (see steepBoxes) is
// moved onto bowl = level along the outward direction within 1.5 cells (a
// vertical wall is smeared over one cell of the lattice), and the corners
// of vertical-walled zones that lie on the level line are added to the
// points.
func rimOutline(m geom.TriMesh, level, water float64, b Bowl, zones []Zone, cell float64) rimData {
	segs := levelOutline(m, level)
	var d rimData
	var s geom.Sum
	type moved struct {
		q  geom.Vec2
		ok bool
	}
	reach := 1.5 * cell
	var boxes []geom.Box
	if b != nil {
		boxes = steepBoxes(zones, water, level, cell, reach)
	}
	cache := map[geom.Vec2]moved{}
	mv := func(p, dir geom.Vec2) (geom.Vec2, bool) {
		if !inAny(boxes, p) {
			return p, true
		}
		if c, ok := cache[p]; ok {
			return c.q, c.ok
		}
		q, ok := snapAround(b, p, dir, level, reach)
		cache[p] = moved{q, ok}
		return q, ok
	}
	for _, sg := range segs {
		a, aok := mv(sg.a, sg.out)
		c, cok := mv(sg.b, sg.out)
		s.Add(a.Distance(c))
		// A point that no direction brings onto the level lies beside a
		// vertical wall's corner, outside both walls: it would widen the
		// rectangle, and the corner itself is added below.
		if aok {
			d.points = append(d.points, a)
		}
		if cok {
			d.points = append(d.points, c)
		}
	}
	d.perimeter = s.Value()
	if b != nil {
		d.points = append(d.points, wallCorners(b, zones, level)...)
	}
	if len(d.points) == 0 { // nothing snapped: keep the mesh outline
		for _, sg := range segs {
			d.points = append(d.points, sg.a, sg.b)
		}
	}
	return d
}

// snapAround snaps p onto the level along dir, or failing that along the
// perpendicular and the two diagonals, and reports whether p is on the
// level (already or after moving).
func snapAround(b Bowl, p, dir geom.Vec2, level, reach float64) (geom.Vec2, bool) {
	if g := b.BowlAt(p) - level; math.Abs(g) <= snapZTolM {
		return p, true
	}
	perp := geom.Vec2{X: -dir.Y, Y: dir.X}
	r := math.Sqrt2 / 2
	for _, d := range []geom.Vec2{dir, perp, dir.Add(perp).Scale(r), dir.Sub(perp).Scale(r)} {
		if q, ok := snap(b, p, d, level, reach); ok {
			return q, true
		}
	}
	return p, false
}

// cornerProbeM is how far either side of a vertical wall's corner the bowl
// is sampled to decide whether the corner lies on a level line: 1 µm, well
// clear of round-off at local coordinates and far below any cell.
const cornerProbeM = 1e-6

// wallCorners returns the vertices of vertical-walled zones that lie on the
// level line of the bowl: just inside the corner the bowl is below the
// level, just outside it is at or above.
func wallCorners(b Bowl, zones []Zone, level float64) []geom.Vec2 {
	var out []geom.Vec2
	for _, z := range zones {
		if z.WallSlope != 0 || len(z.Ring) < 3 {
			continue
		}
		r := z.Ring.CCW()
		for i, v := range r {
			a, c := r[(i+len(r)-1)%len(r)], r[(i+1)%len(r)]
			n := edgeNormal(a, v).Add(edgeNormal(v, c))
			if n.Norm2() == 0 {
				continue
			}
			n = n.Scale(1 / n.Norm())
			in := b.BowlAt(v.Sub(n.Scale(cornerProbeM)))
			ou := b.BowlAt(v.Add(n.Scale(cornerProbeM)))
			if in < level && ou >= level {
				out = append(out, v)
			}
		}
	}
	return out
}

// edgeNormal returns the outward unit normal of edge ab of a
// counter-clockwise ring (zero for a degenerate edge).
func edgeNormal(a, b geom.Vec2) geom.Vec2 {
	d := b.Sub(a)
	l := d.Norm()
	if l == 0 {
		return geom.Vec2{}
	}
	return geom.Vec2{X: d.Y / l, Y: -d.X / l}
}
