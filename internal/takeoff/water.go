package takeoff

import (
	"fmt"
	"math"
	"strings"

	"github.com/dugout-estimating/dugout/internal/units"
)

// Hazen-Williams head loss, an empirical formula for water near ordinary
// temperatures in full, turbulent pipe flow. The SI constant 10.67 takes Q
// in m³/s and d in m. The US customary form takes Q in ft³/s and d in ft
// with the constant 4.73 and the exponent 4.87 as US texts print it (from
// memory); it is the SI form converted, 10.67 × 0.3048^(3·1.852 − 4.8704) =
// 4.725, with both constants and the exponent rounded, so the two agree to
// about 0.1 % (0.13 % at d = 0.5 m).
const (
	hwExpQ    = 1.852
	hwExpD    = 4.8704
	hwConstSI = 10.67
	hwConstUS = 4.73
	hwExpDUS  = 4.87
)

// HeadLossSI returns the Hazen-Williams friction head loss in metres for
// a pipe of lengthM and inside diameter dM (m) carrying q m³/s, with
// roughness coefficient c: h_f = 10.67·L·Q^1.852 / (C^1.852·d^4.8704).
func HeadLossSI(lengthM, q, c, dM float64) float64 {
	return hwConstSI * lengthM * math.Pow(q, hwExpQ) / (math.Pow(c, hwExpQ) * math.Pow(dM, hwExpD))
}

// HeadLossUS returns the Hazen-Williams friction head loss in feet for a
// pipe of lengthFt and inside diameter dFt (ft) carrying qCfs ft³/s, with
// roughness coefficient c: h_f = 4.73·L·Q^1.852 / (C^1.852·d^4.87).
func HeadLossUS(lengthFt, qCfs, c, dFt float64) float64 {
	return hwConstUS * lengthFt * math.Pow(qCfs, hwExpQ) / (math.Pow(c, hwExpQ) * math.Pow(dFt, hwExpDUS))
}

// PipeMaterial is a pipe's Hazen-Williams roughness coefficient C.
type PipeMaterial struct {
	Name    string   `json:"name"`
	C       float64  `json:"c"`
	Aliases []string `json:"-"`
}

// pipePresets. The C factors for new pipe are those of Fair, Geyer & Okun,
// Water and Wastewater Engineering (Wiley; Table 5.1 "Values of the
// Hazen-Williams coefficient C for different conduit materials"): coated
// cast iron 130, welded steel 140, concrete 140, cement-asbestos and
// plastic 140. PVC at 150 is the design value of AWWA Manual M23 "PVC
// Pipe — Design and Installation" (from memory) and the figure most pond
// pump charts use; "plastic" keeps the textbook's more cautious 140.
var pipePresets = []PipeMaterial{
	{Name: "pvc", C: 150, Aliases: []string{"pvc sch40", "flexible pvc", "pe", "hdpe", "polyethylene"}},
	{Name: "plastic", C: 140},
	{Name: "cast iron", C: 130},
	{Name: "steel", C: 140, Aliases: []string{"welded steel"}},
	{Name: "concrete", C: 140},
}

// PipeMaterialByName returns the pipe preset called name ("pvc", "plastic",
// "cast iron", "steel", "concrete").
func PipeMaterialByName(name string) (PipeMaterial, error) {
	return lookup("pipe material", name, pipePresets, func(p PipeMaterial) []string { return append([]string{p.Name}, p.Aliases...) })
}

// SheetFlow is the look of the water over a spillway, which sets the flow
// per width of weir. Its zero value is medium.
type SheetFlow int

// Spillway sheets.
const (
	MediumSheet SheetFlow = iota
	LightSheet
	HeavySheet
)

// String returns "light", "medium" or "heavy".
func (s SheetFlow) String() string {
	switch s {
	case LightSheet:
		return "light"
	case HeavySheet:
		return "heavy"
	}
	return "medium"
}

// ParseSheetFlow parses "light", "medium" or "heavy" ("" is medium).
func ParseSheetFlow(s string) (SheetFlow, error) {
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "", "medium":
		return MediumSheet, nil
	case "light":
		return LightSheet, nil
	case "heavy":
		return HeavySheet, nil
	}
	return MediumSheet, fmt.Errorf("%w: spillway flow %q (want light, medium or heavy)", ErrOption, s)
}

// GallonsPerHourPerInch returns the flow over a spillway per inch of weir
// width: about 100, 150 and 200 US gal/h for a light, medium and heavy
// sheet (common practice, check-values.md §7).
func (s SheetFlow) GallonsPerHourPerInch() float64 {
	switch s {
	case LightSheet:
		return 100
	case HeavySheet:
		return 200
	}
	return 150
}

// Default water settings (common practice, no source).
const (
	// DefaultTurnoverH: a stocked pond's volume once an hour
	// (check-values.md §7: ornamental 1–2 h, fish ponds at least hourly).
	DefaultTurnoverH = 1.0
	// DefaultSupplyGPM: a garden hose gives about 5–10 US gal/min.
	DefaultSupplyGPM = 7.5
)

// WaterOptions sets the turnover, fill supply and pump circuit. Zero values
// mean the defaults; negative values are errors.
type WaterOptions struct {
	// TurnoverH is the time to circulate the whole volume once (default 1 h).
	TurnoverH float64
	// SupplyM3PerH is the fill supply (default 7.5 US gal/min, a hose).
	SupplyM3PerH float64
	// SpillwayWidthM and Sheet give a waterfall's flow; zero width means no
	// waterfall.
	SpillwayWidthM float64
	Sheet          SheetFlow
	// DischargeHeightM is the height of the discharge above the water
	// level; DischargeElevationM, when set, is the discharge's elevation
	// (a surveyed waterfall top) and replaces it.
	DischargeHeightM    float64
	DischargeElevationM *float64
	// PipeLengthM, PipeDiameterM (inside) and Pipe describe the discharge
	// line; zero length means no friction. PipeC, when > 0, overrides the
	// material's C. FittingsLengthM adds fittings as equivalent pipe length.
	PipeLengthM     float64
	PipeDiameterM   float64
	Pipe            string
	PipeC           float64
	FittingsLengthM float64
}

// WaterResult is the water in the pond.
type WaterResult struct {
	VolumeM3  float64 `json:"volume_m3"`
	VolumeGal float64 `json:"volume_gal"`
	VolumeL   float64 `json:"volume_l"`
	VolumeFt3 float64 `json:"volume_ft3"`
	AreaM2    float64 `json:"area_m2"`
	MaxDepthM float64 `json:"max_depth_m"`
	// MeanDepthM is volume / surface area.
	MeanDepthM   float64 `json:"mean_depth_m"`
	SupplyM3PerH float64 `json:"supply_m3_per_h"`
	SupplyGPM    float64 `json:"supply_gpm"`
	FillTimeH    float64 `json:"fill_time_h"`
}

// PumpResult is the duty point a pump must meet.
type PumpResult struct {
	TurnoverH          float64 `json:"turnover_h"`
	TurnoverFlowM3PerH float64 `json:"turnover_flow_m3_per_h"`
	SpillwayWidthM     float64 `json:"spillway_width_m"`
	SpillwaySheet      string  `json:"spillway_sheet,omitempty"`
	SpillwayFlowM3PerH float64 `json:"spillway_flow_m3_per_h"`
	// FlowBasis says which flow governs: "turnover" or "spillway" (the
	// larger).
	FlowBasis     string   `json:"flow_basis"`
	FlowM3PerH    float64  `json:"flow_m3_per_h"`
	FlowGalPerH   float64  `json:"flow_gal_per_h"`
	FlowLPerMin   float64  `json:"flow_l_per_min"`
	StaticLiftM   float64  `json:"static_lift_m"`
	PipeC         float64  `json:"pipe_c,omitempty"`
	PipeLengthM   float64  `json:"pipe_length_m"`
	EquivLengthM  float64  `json:"equivalent_length_m"`
	PipeDiameterM float64  `json:"pipe_diameter_m"`
	VelocityMPerS float64  `json:"velocity_m_per_s"`
	FrictionM     float64  `json:"friction_m"`
	HeadM         float64  `json:"head_m"`
	HeadFt        float64  `json:"head_ft"`
	Notes         []string `json:"notes"`
}

// TurnoverFlow returns the flow (m³/h) that circulates volumeM3 once every
// turnoverH hours. turnoverH must be > 0.
func TurnoverFlow(volumeM3, turnoverH float64) (float64, error) {
	if !(turnoverH > 0) || math.IsInf(turnoverH, 0) {
		return 0, optionError("turnover time", turnoverH, "> 0 h")
	}
	return volumeM3 / turnoverH, nil
}

// WaterAndPump computes the water quantities and the pump duty from the
// design's water volume, area and depths and the water level. Errors: a
// negative volume or area, a turnover, supply, width, length or diameter
// out of range, both a discharge height and elevation, an unknown pipe.
func WaterAndPump(volumeM3, areaM2, maxDepthM, meanDepthM, waterLevelM float64, o WaterOptions) (WaterResult, PumpResult, error) {
	var w WaterResult
	var p PumpResult
	if !(volumeM3 >= 0) || math.IsInf(volumeM3, 0) {
		return w, p, inputError("water volume", volumeM3, ">= 0 m³")
	}
	if !(areaM2 >= 0) || math.IsInf(areaM2, 0) {
		return w, p, inputError("water area", areaM2, ">= 0 m²")
	}
	turn := o.TurnoverH
	if turn == 0 {
		turn = DefaultTurnoverH
	}
	supply := o.SupplyM3PerH
	if supply == 0 {
		supply = DefaultSupplyGPM * units.GallonPerMinute * 3600
	}
	if !(supply > 0) || math.IsInf(supply, 0) {
		return w, p, optionError("fill supply", supply, "> 0 m³/h")
	}
	w.VolumeM3 = volumeM3
	w.VolumeGal = volumeM3 / units.USGallon
	w.VolumeL = volumeM3 / units.Litre
	w.VolumeFt3 = volumeM3 / units.CubicFoot
	w.AreaM2 = areaM2
	w.MaxDepthM = maxDepthM
	w.MeanDepthM = meanDepthM
	if w.MeanDepthM == 0 && areaM2 > 0 {
		w.MeanDepthM = volumeM3 / areaM2
	}
	w.SupplyM3PerH = supply
	w.SupplyGPM = supply / 3600 / units.GallonPerMinute
	w.FillTimeH = volumeM3 / supply

	q, err := TurnoverFlow(volumeM3, turn)
	if err != nil {
		return w, p, err
	}
	p.TurnoverH = turn
	p.TurnoverFlowM3PerH = q
	p.FlowBasis = "turnover"
	p.FlowM3PerH = q
	if !(o.SpillwayWidthM >= 0) || math.IsInf(o.SpillwayWidthM, 0) {
		return w, p, optionError("spillway width", o.SpillwayWidthM, ">= 0 m")
	}
	if o.SpillwayWidthM > 0 {
		p.SpillwayWidthM = o.SpillwayWidthM
		p.SpillwaySheet = o.Sheet.String()
		gph := o.SpillwayWidthM / units.Inch * o.Sheet.GallonsPerHourPerInch()
		p.SpillwayFlowM3PerH = gph * units.USGallon
		if p.SpillwayFlowM3PerH > q {
			p.FlowBasis = "spillway"
			p.FlowM3PerH = p.SpillwayFlowM3PerH
		}
	}
	p.FlowGalPerH = p.FlowM3PerH / units.USGallon
	p.FlowLPerMin = p.FlowM3PerH / units.Litre / 60

	// Static lift.
	if o.DischargeElevationM != nil && o.DischargeHeightM != 0 {
		return w, p, fmt.Errorf("%w: give the discharge as a height above the water or as an elevation, not both", ErrOption)
	}
	switch {
	case o.DischargeElevationM != nil:
		if !isFinite(*o.DischargeElevationM) {
			return w, p, optionError("discharge elevation", *o.DischargeElevationM, "a finite number (m)")
		}
		p.StaticLiftM = *o.DischargeElevationM - waterLevelM
	default:
		if !(o.DischargeHeightM >= 0) || math.IsInf(o.DischargeHeightM, 0) {
			return w, p, optionError("discharge height", o.DischargeHeightM, ">= 0 m above the water")
		}
		p.StaticLiftM = o.DischargeHeightM
	}
	// Friction.
	switch {
	case !(o.PipeLengthM >= 0) || math.IsInf(o.PipeLengthM, 0):
		return w, p, optionError("pipe length", o.PipeLengthM, ">= 0 m")
	case !(o.FittingsLengthM >= 0) || math.IsInf(o.FittingsLengthM, 0):
		return w, p, optionError("fittings equivalent length", o.FittingsLengthM, ">= 0 m")
	}
	if o.PipeLengthM > 0 || o.FittingsLengthM > 0 {
		if !(o.PipeDiameterM > 0) || math.IsInf(o.PipeDiameterM, 0) {
			return w, p, optionError("pipe inside diameter", o.PipeDiameterM, "> 0 m")
		}
		c := o.PipeC
		if c == 0 {
			name := o.Pipe
			if strings.TrimSpace(name) == "" {
				name = "pvc"
			}
			pm, err := PipeMaterialByName(name)
			if err != nil {
				return w, p, err
			}
			c = pm.C
		}
		if !(c > 0) || math.IsInf(c, 0) {
			return w, p, optionError("Hazen-Williams C", c, "> 0")
		}
		p.PipeC = c
		p.PipeLengthM = o.PipeLengthM
		p.EquivLengthM = o.PipeLengthM + o.FittingsLengthM
		p.PipeDiameterM = o.PipeDiameterM
		qs := p.FlowM3PerH / 3600
		p.VelocityMPerS = qs / (math.Pi * o.PipeDiameterM * o.PipeDiameterM / 4)
		p.FrictionM = HeadLossSI(p.EquivLengthM, qs, c, o.PipeDiameterM)
	}
	p.HeadM = p.StaticLiftM + p.FrictionM
	p.HeadFt = p.HeadM / units.Foot
	p.Notes = []string{
		fmt.Sprintf("flow: the larger of the turnover flow (volume every %g h) and the spillway flow; %s governs", turn, p.FlowBasis),
		"head: static lift from the water level to the discharge plus Hazen-Williams friction over the pipe and fittings' equivalent length",
	}
	return w, p, nil
}
