package estimate

import (
	"errors"
	"fmt"
	"strings"

	"github.com/dugout-estimating/dugout/internal/crs"
	"github.com/dugout-estimating/dugout/internal/cutfill"
	"github.com/dugout-estimating/dugout/internal/design"
	"github.com/dugout-estimating/dugout/internal/las"
	"github.com/dugout-estimating/dugout/internal/sitefile"
	"github.com/dugout-estimating/dugout/internal/survey"
	"github.com/dugout-estimating/dugout/internal/takeoff"
	"github.com/dugout-estimating/dugout/internal/tin"
	"github.com/dugout-estimating/dugout/internal/units"
)

// Defaults applied when the site file leaves a key out. Each is common
// practice, with no published source, and is printed with the estimate.
const (
	// DefaultFreeboardM is 3 in (76.2 mm): the liner's rim above the water.
	DefaultFreeboardM = 3 * units.Inch
	// DefaultBermCrestM is 1 ft (0.3048 m) of level crest where the rim
	// stands on fill.
	DefaultBermCrestM = units.Foot
	// DefaultSoil is the soil preset used when none is named.
	DefaultSoil = "common earth"
	// DefaultTruck is the haul truck preset used when none is named.
	DefaultTruck = "tandem"
)

// ErrJob is wrapped by every error about the job's settings.
var ErrJob = errors.New("job")

// Job is a fully resolved job in SI units.
type Job struct {
	Site *sitefile.Site // as read (names, notes, report options)

	Units    units.System // the survey's and the site file's units
	OutUnits units.System // the family results are printed in (m or ft)

	SurveyFiles   []string
	Survey        survey.Options
	TIN           tin.Options // Breaklines and Boundary are filled in by Run
	DropSpikes    bool        // leave suspected spikes out of the TIN
	BoundaryFile  string
	BreaklineFile []string

	ZonesFile   string         // GeoJSON zones, or
	OutlineFile string         // a GeoJSON outline polygon, or
	OutlineCode string         // survey points with this code
	Outline     design.Outline // shelves and slopes (Ring filled in by Run)

	Design design.Params // Zones filled in by Run

	Soil          cutfill.Soil
	Truck         cutfill.Truck
	Heaped        bool
	ReuseCut      bool
	TopsoilDepthM float64

	Takeoff        takeoff.Options
	DischargePoint string // survey point id whose elevation is the pump's discharge

	Assumed []string // defaults that were applied, for the report
}

// FromSite resolves a site file into a job.
func FromSite(s *sitefile.Site) (*Job, error) {
	j := &Job{Site: s}
	var err error
	if j.Units, err = parseSystem(s.Units, "units"); err != nil {
		return nil, err
	}
	j.OutUnits = units.Metres
	if j.Units.IsImperial() {
		j.OutUnits = units.Feet
	}
	if s.OutUnits != "" {
		if j.OutUnits, err = parseSystem(s.OutUnits, "out_units"); err != nil {
			return nil, err
		}
		if j.OutUnits == units.USFeet {
			j.OutUnits = units.Feet
		}
	}
	length := func(l sitefile.Length, key string, def float64, defNote string) (float64, error) {
		if !l.IsSet() && defNote != "" {
			j.Assumed = append(j.Assumed, key+" = "+defNote)
		}
		v, err := l.Metres(j.Units, def)
		if err != nil {
			return 0, fmt.Errorf("%w: %s: %w", ErrJob, key, err)
		}
		return v, nil
	}

	// Survey.
	if len(s.Survey.Files) == 0 {
		return nil, fmt.Errorf("%w: no survey files (survey.files or --points)", ErrJob)
	}
	for _, f := range s.Survey.Files {
		j.SurveyFiles = append(j.SurveyFiles, s.Path(f))
	}
	spec := crs.Spec{Auto: true}
	if s.CRS != "" {
		if spec, err = crs.Parse(s.CRS); err != nil {
			return nil, fmt.Errorf("%w: crs: %w", ErrJob, err)
		}
	}
	j.Survey = survey.Options{Units: j.Units, CRS: spec, Columns: s.Survey.Columns, BreaklineCodes: s.Survey.BreaklineCodes}
	for _, c := range s.Survey.LASClasses {
		if c < 0 || c > 255 {
			return nil, fmt.Errorf("%w: survey.las_classes: class %d outside 0..255", ErrJob, c)
		}
		j.Survey.LAS.Classes = append(j.Survey.LAS.Classes, uint8(c))
	}
	if s.Survey.Thin.IsSet() {
		if j.Survey.LAS.ThinCell, err = length(s.Survey.Thin, "survey.thin", 0, ""); err != nil {
			return nil, err
		}
		j.Survey.LAS.Thin = las.ThinLowest
		if strings.EqualFold(s.Survey.ThinMode, "mean") {
			j.Survey.LAS.Thin = las.ThinMean
		} else if s.Survey.ThinMode != "" && !strings.EqualFold(s.Survey.ThinMode, "lowest") {
			return nil, fmt.Errorf("%w: survey.thin_mode %q: want lowest or mean", ErrJob, s.Survey.ThinMode)
		}
	}
	if s.Survey.Duplicates != "" {
		if j.TIN.Duplicates, err = tin.ParseDupPolicy(s.Survey.Duplicates); err != nil {
			return nil, fmt.Errorf("%w: survey.duplicates: %w", ErrJob, err)
		}
	}
	// Shots within the survey's duplicate distance (1 cm) are one position
	// on the ground: merge them, as `dugout surface` does.
	j.TIN.MergeTolM = survey.DefaultDupTolM
	if j.TIN.MaxEdgeM, err = length(s.Survey.MaxEdge, "survey.max_edge", 0, ""); err != nil {
		return nil, err
	}
	j.DropSpikes = s.Survey.DropSpikes
	j.BoundaryFile = s.Path(s.Survey.Boundary)
	for _, f := range s.Survey.Breaklines {
		j.BreaklineFile = append(j.BreaklineFile, s.Path(f))
	}

	// Design.
	o := s.Design.Outline
	switch {
	case s.Design.Zones != "" && (o.File != "" || o.Code != ""):
		return nil, fmt.Errorf("%w: give design.zones or design.outline, not both", ErrJob)
	case s.Design.Zones != "":
		j.ZonesFile = s.Path(s.Design.Zones)
	case o.File != "" && o.Code != "":
		return nil, fmt.Errorf("%w: design.outline: give file or code, not both", ErrJob)
	case o.File != "" || o.Code != "":
		j.OutlineFile, j.OutlineCode = s.Path(o.File), o.Code
		j.Outline.WallSlope = o.WallSlope
		if j.Outline.Corners, err = parseCorners(o.Corners); err != nil {
			return nil, err
		}
		if j.Outline.DeepDepthM, err = length(o.DeepDepth, "design.outline.deep_depth", 0, ""); err != nil {
			return nil, err
		}
		if !o.DeepDepth.IsSet() {
			return nil, fmt.Errorf("%w: design.outline.deep_depth is required", ErrJob)
		}
		for k, sh := range o.Shelves {
			w, err := length(sh.Width, fmt.Sprintf("design.outline.shelf[%d].width", k+1), 0, "")
			if err != nil {
				return nil, err
			}
			d, err := length(sh.Depth, fmt.Sprintf("design.outline.shelf[%d].depth", k+1), 0, "")
			if err != nil {
				return nil, err
			}
			j.Outline.Shelves = append(j.Outline.Shelves, design.Shelf{WidthM: w, DepthM: d})
		}
	default:
		return nil, fmt.Errorf("%w: no design: give design.zones (a GeoJSON file) or design.outline (file or code)", ErrJob)
	}
	if j.Design.CellM, err = length(s.Design.Cell, "design.cell", 0, ""); err != nil {
		return nil, err
	}

	// Water and berm.
	switch lv := strings.ToLower(strings.TrimSpace(s.Water.Level.Raw)); lv {
	case "", "auto":
		j.Design.Level = design.LevelAuto
		if lv == "" {
			j.Assumed = append(j.Assumed, "water.level = auto (rim at the lowest ground along the rim line)")
		}
	case "balance":
		j.Design.Level = design.LevelBalance
	default:
		j.Design.Level = design.LevelFixed
		if j.Design.WaterLevelM, err = units.ParseLength(s.Water.Level.Raw, j.Units); err != nil {
			return nil, fmt.Errorf("%w: water.level: want an elevation, auto or balance: %w", ErrJob, err)
		}
	}
	fbNote := "3 in"
	if !j.Units.IsImperial() {
		fbNote = "76 mm"
	}
	if j.Design.FreeboardM, err = length(s.Water.Freeboard, "water.freeboard", DefaultFreeboardM, fbNote); err != nil {
		return nil, err
	}
	crestNote := "1 ft"
	if !j.Units.IsImperial() {
		crestNote = "0.3 m"
	}
	if j.Design.BermCrestM, err = length(s.Berm.Crest, "berm.crest", DefaultBermCrestM, crestNote); err != nil {
		return nil, err
	}
	j.Design.BermSlope = s.Berm.Slope
	if s.Berm.Slope == 0 {
		j.Assumed = append(j.Assumed, fmt.Sprintf("berm.slope = %gH:1V", design.DefaultBermSlope))
	}

	// Earthwork.
	soil := s.Earthwork.Soil
	if soil == "" {
		soil = DefaultSoil
		j.Assumed = append(j.Assumed, "earthwork.soil = "+DefaultSoil)
	}
	if j.Soil, err = cutfill.SoilPreset(soil); err != nil {
		return nil, fmt.Errorf("%w: earthwork.soil: %w", ErrJob, err)
	}
	if s.Earthwork.Swell != 0 {
		j.Soil.Swell = s.Earthwork.Swell
		j.Soil.Source = "site file"
	}
	if s.Earthwork.Compaction != 0 {
		j.Soil.Compaction = s.Earthwork.Compaction
		j.Soil.Source = "site file"
	}
	j.Design.FillPerCut = j.Soil.Compaction
	switch {
	case len(s.Earthwork.TruckBody) > 0:
		if len(s.Earthwork.TruckBody) != 3 {
			return nil, fmt.Errorf("%w: earthwork.truck_body wants [length, width, depth], got %d values", ErrJob, len(s.Earthwork.TruckBody))
		}
		var dims [3]float64
		for i, l := range s.Earthwork.TruckBody {
			if dims[i], err = length(l, "earthwork.truck_body", 0, ""); err != nil {
				return nil, err
			}
		}
		j.Truck = cutfill.TruckFromBody(dims[0], dims[1], dims[2], cutfill.DefaultHeapSlope)
		j.Truck.Name = "custom body"
	default:
		name := s.Earthwork.Truck
		if name == "" {
			name = DefaultTruck
			j.Assumed = append(j.Assumed, "earthwork.truck = "+DefaultTruck)
		}
		if j.Truck, err = cutfill.TruckPreset(name); err != nil {
			return nil, fmt.Errorf("%w: earthwork.truck: %w", ErrJob, err)
		}
	}
	j.Heaped = sitefile.BoolOr(s.Earthwork.Heaped, false)
	j.ReuseCut = sitefile.BoolOr(s.Earthwork.ReuseCut, true)
	if j.TopsoilDepthM, err = length(s.Earthwork.TopsoilDepth, "earthwork.topsoil_depth", 0, ""); err != nil {
		return nil, err
	}
	if err := j.takeoffFromSite(s, length); err != nil {
		return nil, err
	}
	return j, nil
}

// takeoffFromSite maps the liner, stone, gravel, crew, pump and price
// sections onto the takeoff's options.
func (j *Job) takeoffFromSite(s *sitefile.Site, length func(sitefile.Length, string, float64, string) (float64, error)) error {
	o := &j.Takeoff
	var err error
	if o.Soil, err = takeoff.ParseSoilType(s.Earthwork.SoilType); err != nil {
		return fmt.Errorf("%w: earthwork.soil_type: %w", ErrJob, err)
	}
	if s.Earthwork.SoilType == "" {
		j.Assumed = append(j.Assumed, "earthwork.soil_type = unclassified (treated as OSHA Type C for the slope check)")
	}

	// Liner.
	o.Liner.Metric = j.OutUnits == units.Metres
	if s.Liner.Overlap.IsSet() {
		v, err := length(s.Liner.Overlap, "liner.overlap", 0, "")
		if err != nil {
			return err
		}
		o.Liner.OverlapM = &v
	} else {
		j.Assumed = append(j.Assumed, "liner.overlap = 1 ft")
	}
	if s.Liner.Material != "" {
		if o.Liner.Material, err = takeoff.LinerMaterialByName(s.Liner.Material); err != nil {
			return fmt.Errorf("%w: liner.material: %w", ErrJob, err)
		}
	}
	for _, w := range s.Liner.StockWidths {
		v, err := length(w, "liner.stock_widths", 0, "")
		if err != nil {
			return err
		}
		o.Liner.Stock.WidthsM = append(o.Liner.Stock.WidthsM, v)
	}
	for _, w := range s.Liner.StockLengths {
		v, err := length(w, "liner.stock_lengths", 0, "")
		if err != nil {
			return err
		}
		o.Liner.Stock.LengthsM = append(o.Liner.Stock.LengthsM, v)
	}
	switch u := strings.TrimSpace(s.Liner.Underlayment); {
	case strings.EqualFold(u, "none"):
		o.Liner.NoUnderlayment = true
	case u != "":
		if o.Liner.Underlayment, err = takeoff.UnderlaymentByName(u); err != nil {
			return fmt.Errorf("%w: liner.underlayment: %w", ErrJob, err)
		}
	}

	// Edge stone (ordered when any stone key is given).
	st := s.Stone
	if st.Rock != "" || st.FaceHeight.IsSet() || st.Thickness.IsSet() || st.Density != 0 {
		es := &takeoff.EdgeStoneOptions{Rock: st.Rock, DensityKgM3: st.Density}
		if es.FaceHeightM, err = length(st.FaceHeight, "stone.face_height", 0.2032, "8 in"); err != nil {
			return err
		}
		if es.ThicknessM, err = length(st.Thickness, "stone.thickness", 0.3048, "12 in"); err != nil {
			return err
		}
		if es.BoulderPercent, es.BoulderKg, err = takeoff.ParseBoulderAllowance(st.Boulders); err != nil {
			return fmt.Errorf("%w: stone.boulders: %w", ErrJob, err)
		}
		for k, sr := range st.Stretches {
			from, err := length(sr.From, fmt.Sprintf("stone.stretch[%d].from", k+1), 0, "")
			if err != nil {
				return err
			}
			to, err := length(sr.To, fmt.Sprintf("stone.stretch[%d].to", k+1), 0, "")
			if err != nil {
				return err
			}
			es.Stretches = append(es.Stretches, takeoff.Stretch{Loop: sr.Loop, FromM: from, ToM: to})
		}
		o.EdgeStone = es
	}

	// Gravel (ordered when a thickness or material is given).
	if g := s.Gravel; g.Thickness.IsSet() || g.Material != "" {
		t, err := length(g.Thickness, "gravel.thickness", 2*units.Inch, "2 in")
		if err != nil {
			return err
		}
		o.Gravel = []takeoff.GravelOptions{{Material: g.Material, ThicknessM: t, Walls: g.Walls}}
	}

	// Crew.
	o.Crew = takeoff.CrewOptions{Size: s.Crew.Size, TonsPerWorkerHour: s.Crew.TonsPerHour,
		MachineTonsPerHour: s.Crew.MachineTonsPer, HoursPerDay: s.Crew.HoursPerDay}

	// Water and pump.
	p := s.Pump
	w := &o.Water
	w.TurnoverH = p.TurnoverHours
	switch {
	case p.SupplyGPM > 0 && p.SupplyLPM > 0:
		return fmt.Errorf("%w: pump: give supply_gpm or supply_lpm, not both", ErrJob)
	case p.SupplyGPM > 0:
		w.SupplyM3PerH = p.SupplyGPM * units.GallonPerMinute * 3600
	case p.SupplyLPM > 0:
		w.SupplyM3PerH = p.SupplyLPM * units.LitrePerMinute * 3600
	case p.SupplyGPM < 0 || p.SupplyLPM < 0:
		return fmt.Errorf("%w: pump: a supply rate must be > 0", ErrJob)
	}
	if p.DischargeHeight.IsSet() && p.DischargePoint != "" {
		return fmt.Errorf("%w: pump: give discharge_height or discharge_point, not both", ErrJob)
	}
	if w.DischargeHeightM, err = length(p.DischargeHeight, "pump.discharge_height", 0, ""); err != nil {
		return err
	}
	j.DischargePoint = p.DischargePoint
	if w.PipeLengthM, err = length(p.PipeLength, "pump.pipe_length", 0, ""); err != nil {
		return err
	}
	if w.PipeDiameterM, err = length(p.PipeDiameter, "pump.pipe_diameter", 0, ""); err != nil {
		return err
	}
	w.Pipe = p.PipeMaterial
	if w.FittingsLengthM, err = length(p.FittingsLength, "pump.fittings_length", 0, ""); err != nil {
		return err
	}
	if w.SpillwayWidthM, err = length(p.SpillwayWidth, "pump.spillway_width", 0, ""); err != nil {
		return err
	}
	if w.Sheet, err = takeoff.ParseSheetFlow(p.SpillwayFlow); err != nil {
		return fmt.Errorf("%w: pump.spillway_flow: %w", ErrJob, err)
	}

	// Prices.
	pr := s.Prices
	priced := pr.PerCubicYardDug != 0 || pr.PerCubicMetreDug != 0 || pr.PerTruckload != 0 || pr.PerSquareFtLiner != 0 ||
		pr.PerSquareMLiner != 0 || pr.PerSquareFtUnder != 0 || pr.PerSquareMUnder != 0 || pr.PerTonStone != 0 ||
		pr.PerTonGravel != 0 || pr.PerCrewHour != 0 || len(pr.Fixed) > 0
	if priced {
		pl := &takeoff.PriceList{Currency: pr.Currency,
			PerCubicYardDug: pr.PerCubicYardDug, PerCubicMetreDug: pr.PerCubicMetreDug, PerTruckload: pr.PerTruckload,
			PerSquareFootLiner: pr.PerSquareFtLiner, PerSquareMetreLiner: pr.PerSquareMLiner,
			PerSquareFootUnderlayment: pr.PerSquareFtUnder, PerSquareMetreUnderlayment: pr.PerSquareMUnder,
			PerTonStone: pr.PerTonStone, PerTonGravel: pr.PerTonGravel, PerCrewHour: pr.PerCrewHour}
		for _, it := range pr.Fixed {
			pl.Fixed = append(pl.Fixed, takeoff.FixedItem{Name: it.Name, Amount: it.Amount})
		}
		o.Prices = pl
	}
	return nil
}

func parseSystem(s, key string) (units.System, error) {
	if s == "" {
		return units.Metres, nil
	}
	u, err := units.ParseSystem(s)
	if err != nil {
		return 0, fmt.Errorf("%w: %s: %w", ErrJob, key, err)
	}
	return u, nil
}

func parseCorners(s string) (design.Corners, error) {
	switch strings.ToLower(s) {
	case "", "round":
		return design.Round, nil
	case "sharp":
		return design.Sharp, nil
	}
	return 0, fmt.Errorf("%w: corners %q: want round or sharp", ErrJob, s)
}
