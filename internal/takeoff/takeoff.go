package takeoff

import (
	"fmt"
	"math"
	"sync"

	"github.com/dugout-estimating/dugout/internal/contours"
	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/units"
)

// Bowl is the analytic design bowl: its elevation E (m) at a plan point in
// the local frame, +Inf where no zone reaches. BowlAt must be safe for
// concurrent use (the sheet search measures two directions at once).
// Package design's Surface satisfies it.
type Bowl interface {
	BowlAt(p geom.Vec2) float64
}

// Zone is a depth zone of the design as the takeoff needs it.
type Zone struct {
	Name string
	// Ring is the zone's floor outline.
	Ring geom.Ring
	// DepthM is the floor's depth below the water level.
	DepthM float64
	// WallSlope is horizontal per vertical; 0 is a vertical wall.
	WallSlope float64
	// FloorAreaM2 is the plan area of the zone's floor as the design
	// accounts it; 0 means the ring's area.
	FloorAreaM2 float64
}

// Input is one design as the takeoff reads it: narrow values that package
// design provides (see [FromDesign]) and that tests build by hand.
type Input struct {
	// BowlMesh is the bowl over the lined area (cells where E <= rim),
	// triangles counter-clockwise in plan.
	BowlMesh geom.TriMesh
	// TriangleZone optionally gives, for each triangle of BowlMesh, the
	// index in Zones of the zone that owns it (-1 for none); it lets gravel
	// cover a zone's walls.
	TriangleZone []int
	// Bowl is the analytic bowl, or nil to measure on the mesh alone.
	Bowl  Bowl
	Zones []Zone
	// WaterLevelM and RimM are the water level and the rim (water level +
	// freeboard).
	WaterLevelM, RimM float64
	// Water quantities of the design; a zero volume, area or maximum depth
	// is measured on the mesh instead (area and volume below the water
	// level, depth from the water to the lowest vertex).
	WaterVolumeM3, WaterAreaM2, MaxDepthM, MeanDepthM float64
	// MaxCutDepthM is the deepest excavation below existing ground (for the
	// cautions); 0 means the rim-to-deepest depth.
	MaxCutDepthM float64
	// CutM3 and Truckloads are earthwork quantities for pricing.
	CutM3, Truckloads float64
}

// Options configures a takeoff. The zero value gives every default: a 1 ft
// liner overlap, EPDM 45 mil on 8 oz/yd² geotextile from the feet stock
// list, no edge stone or gravel, a crew of 2 at 1 short ton per
// worker-hour, one turnover an hour, no price list, unclassified soil.
type Options struct {
	Liner     LinerOptions
	Shoreline ShorelineOptions
	// EdgeStone, when set, orders edge stone along the shoreline.
	EdgeStone *EdgeStoneOptions
	// Gravel lists gravel layers on zones.
	Gravel []GravelOptions
	Crew   CrewOptions
	Water  WaterOptions
	// Prices, when set, produces a cost table.
	Prices *PriceList
	Soil   SoilType
}

// Result is the whole takeoff. JSON is SI except the stone keys ending in
// _tons (short tons, see [StoneResult]).
type Result struct {
	Liner        LinerResult         `json:"liner"`
	Underlayment *UnderlaymentResult `json:"underlayment,omitempty"`
	Shoreline    ShorelineResult     `json:"shoreline"`
	Stone        StoneResult         `json:"stone"`
	Crew         CrewResult          `json:"crew"`
	Water        WaterResult         `json:"water"`
	Pump         PumpResult          `json:"pump"`
	Cost         *CostTable          `json:"cost,omitempty"`
	Cautions     []Caution           `json:"cautions"`
	// Warnings are non-fatal issues found on the way.
	Warnings []string `json:"warnings"`
}

// Compute runs the whole takeoff on in. Every option is checked before
// the geometry is measured. Errors: an empty or invalid mesh, levels that
// are not finite or a rim below the water, and every option error of the
// parts.
func Compute(in Input, o Options) (Result, error) {
	var res Result
	if !isFinite(in.WaterLevelM) || !isFinite(in.RimM) {
		return res, fmt.Errorf("%w: water level %g m and rim %g m must be finite", ErrInput, in.WaterLevelM, in.RimM)
	}
	if in.RimM < in.WaterLevelM {
		return res, fmt.Errorf("%w: the rim at %.3f m is below the water level at %.3f m", ErrInput, in.RimM, in.WaterLevelM)
	}
	if in.BowlMesh.NumTriangles() == 0 {
		return res, fmt.Errorf("%w: the bowl mesh has no triangles", ErrInput)
	}
	if err := validateMesh(in.BowlMesh); err != nil {
		return res, err
	}
	if in.TriangleZone != nil && len(in.TriangleZone) != in.BowlMesh.NumTriangles() {
		return res, fmt.Errorf("%w: %d triangle zones for %d triangles", ErrInput, len(in.TriangleZone), in.BowlMesh.NumTriangles())
	}

	// Cheap parts first, so that a bad option fails before the sheet
	// search: water and pump, gravel, the stone and crew options, prices.
	deepest := math.Inf(1)
	for _, v := range in.BowlMesh.V {
		deepest = min(deepest, v.Z)
	}
	maxDepth := in.MaxDepthM
	if maxDepth == 0 {
		maxDepth = max(0, in.WaterLevelM-deepest)
	}
	area := in.WaterAreaM2
	if area == 0 {
		area = PlanArea(in.BowlMesh, in.WaterLevelM)
	}
	vol := in.WaterVolumeM3
	if vol == 0 {
		vol = VolumeBelow(in.BowlMesh, in.WaterLevelM)
	}
	var err error
	res.Water, res.Pump, err = WaterAndPump(vol, area, maxDepth, in.MeanDepthM, in.WaterLevelM, o.Water)
	if err != nil {
		return res, err
	}
	var rows []GravelRow
	if len(o.Gravel) > 0 {
		if rows, err = Gravel(zoneAreas(in), o.Gravel); err != nil {
			return res, err
		}
	}
	if o.EdgeStone != nil {
		if _, err := o.EdgeStone.check(); err != nil {
			return res, err
		}
	}
	co, err := o.Crew.withDefaults()
	if err != nil {
		return res, err
	}
	if o.Prices != nil {
		if _, err := Cost(CostQuantities{}, *o.Prices); err != nil {
			return res, err
		}
	}

	// The shoreline does not depend on the liner: it is measured on a
	// second goroutine meanwhile (the bowl is safe for concurrent use), and
	// its result and error are taken after the liner's, as before.
	var sh ShorelineResult
	var shErr error
	var wg sync.WaitGroup
	wg.Go(func() {
		sh, shErr = MeasureShoreline(ShorelineInput{Lines: TraceWaterLine(in.BowlMesh, in.WaterLevelM), WaterLevelM: in.WaterLevelM,
			Mesh: in.BowlMesh, Bowl: in.Bowl, Zones: in.Zones}, o.Shoreline)
	})
	liner, under, warn, err := MeasureLiner(LinerInput{Mesh: in.BowlMesh, RimM: in.RimM, WaterLevelM: in.WaterLevelM,
		Bowl: in.Bowl, Zones: in.Zones}, o.Liner)
	wg.Wait()
	if err != nil {
		return res, err
	}
	res.Liner, res.Underlayment = liner, under
	res.Warnings = append(res.Warnings, warn...)

	if shErr != nil {
		return res, shErr
	}
	if sh.Loops == 0 {
		res.Warnings = append(res.Warnings, fmt.Sprintf("no water line at %.3f m: the bowl holds no water", in.WaterLevelM))
	}
	res.Shoreline = sh

	var edge *EdgeStoneResult
	if o.EdgeStone != nil {
		e, err := EdgeStone(sh, *o.EdgeStone)
		if err != nil {
			return res, err
		}
		edge = &e
	}
	res.Stone = stoneTotals(edge, rows)
	res.Crew, err = CrewTime(res.Stone.EdgeTons+res.Stone.GravelTons, res.Stone.BoulderTons,
		co.TonsPerWorkerHour, co.Size, co.MachineTonsPerHour, co.HoursPerDay)
	if err != nil {
		return res, err
	}

	if o.Prices != nil {
		q := CostQuantities{CutM3: in.CutM3, Truckloads: in.Truckloads, LinerAreaM2: liner.Stock.AreaM2,
			StoneKg:  (res.Stone.EdgeTons + res.Stone.BoulderTons) * units.ShortTon,
			GravelKg: res.Stone.GravelTons * units.ShortTon, CrewHours: res.Crew.Hours}
		if under != nil {
			q.UnderlaymentAreaM2 = under.AreaM2
		}
		ct, err := Cost(q, *o.Prices)
		if err != nil {
			return res, err
		}
		res.Cost = &ct
	}

	cut := in.MaxCutDepthM
	if cut == 0 {
		cut = liner.RimToDeepestM
	}
	res.Cautions = Cautions(CautionInput{MaxCutDepthM: cut, MaxWaterDepthM: maxDepth, Zones: in.Zones, Soil: o.Soil,
		HeavyStone: edge != nil || len(rows) > 0})
	return res, nil
}

// withDefaults fills the zero fields of a crew with the defaults and
// rejects negative ones.
func (co CrewOptions) withDefaults() (CrewOptions, error) {
	if co.Size < 0 || co.TonsPerWorkerHour < 0 || co.MachineTonsPerHour < 0 || co.HoursPerDay < 0 {
		return co, fmt.Errorf("%w: crew size %d, rates %g and %g short tons per hour and %g hours per day must not be negative",
			ErrOption, co.Size, co.TonsPerWorkerHour, co.MachineTonsPerHour, co.HoursPerDay)
	}
	if co.Size == 0 {
		co.Size = DefaultCrewSize
	}
	if co.TonsPerWorkerHour == 0 {
		co.TonsPerWorkerHour = DefaultTonsPerWorkerHour
	}
	if co.MachineTonsPerHour == 0 {
		co.MachineTonsPerHour = DefaultMachineTonsPerHour
	}
	if co.HoursPerDay == 0 {
		co.HoursPerDay = DefaultHoursPerDay
	}
	return co, nil
}

// TraceWaterLine returns the contour lines of the bowl mesh at the water
// level, traced by package contours.
func TraceWaterLine(m geom.TriMesh, level float64) []Line {
	cl := contours.TraceLevel(m, level)
	out := make([]Line, len(cl))
	for i, l := range cl {
		out[i] = Line{Pts: l.Pts, Closed: l.Closed}
	}
	return out
}

// zoneAreas returns each zone's floor area and, when triangle owners are
// known, its wall area: the developed area below the rim of the triangles
// it owns less its floor's plan area (the floor is flat, so its developed
// and plan areas agree; subtracting the design's floor area rather than
// summing level triangles keeps the cells that straddle the floor's edge
// from being counted twice). Without owners the wall area is -1.
func zoneAreas(in Input) []ZoneArea {
	za := make([]ZoneArea, len(in.Zones))
	for i, z := range in.Zones {
		za[i] = ZoneArea{Name: z.Name, FloorAreaM2: z.FloorAreaM2, WallAreaM2: -1}
		if za[i].FloorAreaM2 == 0 {
			za[i].FloorAreaM2 = math.Abs(z.Ring.Area())
		}
	}
	if in.TriangleZone == nil {
		return za
	}
	dev := make([]geom.Sum, len(in.Zones))
	m := in.BowlMesh
	for t := range m.NumTriangles() {
		k := in.TriangleZone[t]
		if k < 0 || k >= len(dev) {
			continue
		}
		a, b, c := m.Triangle(t)
		if f := belowFraction(a.Z, b.Z, c.Z, in.RimM); f > 0 {
			dev[k].Add(f * geom.SurfaceArea(a, b, c))
		}
	}
	for i := range za {
		za[i].WallAreaM2 = max(0, dev[i].Value()-za[i].FloorAreaM2)
	}
	return za
}
