package takeoff

import (
	"fmt"
	"math"
	"strings"

	"github.com/dugout-estimating/dugout/internal/units"
)

// Rock is a stone for edge work by its solid (bulk rock) density, with the
// range the density is known to fall in.
type Rock struct {
	Name        string  `json:"name"`
	DensityKgM3 float64 `json:"density_kg_m3"`
	// RangeLoKgM3 and RangeHiKgM3 bound the density of the rock type.
	RangeLoKgM3 float64  `json:"-"`
	RangeHiKgM3 float64  `json:"-"`
	Aliases     []string `json:"-"`
}

// rockPresets. Densities of granite, basalt, sandstone and limestone are the
// averages of Telford, Geldart & Sheriff, Applied Geophysics, 2nd ed.
// (Cambridge UP, 1990), Table 6.1 (from memory: check-values.md §3 marks
// them [memory]). The ranges are the confirmed ones of the UBC-GIF
// "Geophysics for Practicing Geoscientists" density tables (igneous:
// granite 2.50–2.81, basalt 2.70–3.30 g/cm³; sedimentary: sandstone
// 1.61–2.76, limestone 1.93–2.90 g/cm³; check-values.md §3 [confirmed]).
// Porous limestone of the coquina kind has no published density found: it
// is bracketed by ASTM C568 Type I low-density limestone, 1760–2160 kg/m³
// (check-values.md §3 [partial]), and 1900 kg/m³ is a judgement within that
// bracket.
var rockPresets = []Rock{
	{Name: "granite", DensityKgM3: 2640, RangeLoKgM3: 2500, RangeHiKgM3: 2810},
	{Name: "basalt", DensityKgM3: 2990, RangeLoKgM3: 2700, RangeHiKgM3: 3300},
	{Name: "sandstone", DensityKgM3: 2350, RangeLoKgM3: 1610, RangeHiKgM3: 2760},
	{Name: "limestone", DensityKgM3: 2550, RangeLoKgM3: 1930, RangeHiKgM3: 2900},
	{Name: "coquina", DensityKgM3: 1900, RangeLoKgM3: 1760, RangeHiKgM3: 2160,
		Aliases: []string{"porous limestone"}},
}

// RockByName returns the rock preset called name: granite, basalt,
// sandstone, limestone, or coquina (alias "porous limestone").
func RockByName(name string) (Rock, error) {
	return lookup("rock", name, rockPresets, func(r Rock) []string { return append([]string{r.Name}, r.Aliases...) })
}

// Aggregate is a loose stone product spread in a layer, by its loose bulk
// density (voids included).
type Aggregate struct {
	Name            string   `json:"name"`
	BulkDensityKgM3 float64  `json:"bulk_density_kg_m3"`
	Aliases         []string `json:"-"`
}

// aggregatePresets: loose bulk densities of washed river rock and gravels
// are about 1.5–1.7 t/m³ (from memory / common practice; no source
// confirmed). A supplier's figure overrides them.
var aggregatePresets = []Aggregate{
	{Name: "river rock", BulkDensityKgM3: 1600, Aliases: []string{"river stone", "cobble"}},
	{Name: "pea gravel", BulkDensityKgM3: 1550},
	{Name: "gravel", BulkDensityKgM3: 1650, Aliases: []string{"crushed gravel", "washed gravel"}},
}

// AggregateByName returns the aggregate preset called name: "river rock",
// "pea gravel" or "gravel".
func AggregateByName(name string) (Aggregate, error) {
	return lookup("gravel material", name, aggregatePresets, func(a Aggregate) []string { return append([]string{a.Name}, a.Aliases...) })
}

// Mass is a mass given in kilograms, with the short tons and tonnes a stone
// order is read in.
type Mass struct {
	Kg        float64 `json:"kg"`
	ShortTons float64 `json:"short_tons"`
	Tonnes    float64 `json:"tonnes"`
}

// MassOf returns kg expressed in every unit of [Mass].
func MassOf(kg float64) Mass {
	return Mass{Kg: kg, ShortTons: kg / units.ShortTon, Tonnes: kg / units.Tonne}
}

// EdgeStoneOptions orders stone along the shoreline.
type EdgeStoneOptions struct {
	// Rock names a preset; "" means granite. DensityKgM3, when > 0,
	// overrides the preset's solid density.
	Rock        string
	DensityKgM3 float64
	// FaceHeightM is the visible face of the stone, ThicknessM its depth
	// into the bank; both must be > 0.
	FaceHeightM, ThicknessM float64
	// VoidFraction is the share of the stone band that is voids between
	// stones, in [0, 1): 0 for set edge stone (the default), commonly 0.3 to
	// 0.4 for a boulder pile (common practice, check-values.md §7).
	VoidFraction float64
	// BoulderPercent adds feature boulders as a percentage of the edge
	// stone's mass; BoulderKg adds a fixed mass. Both may be given.
	BoulderPercent float64
	BoulderKg      float64
	// Stretches are the stretches of shoreline to edge; none means the whole
	// shoreline, islands included.
	Stretches []Stretch
}

// EdgeStoneResult is the edge stone order.
type EdgeStoneResult struct {
	Rock         Rock    `json:"rock"`
	LengthM      float64 `json:"length_m"`
	FaceHeightM  float64 `json:"face_height_m"`
	ThicknessM   float64 `json:"thickness_m"`
	VoidFraction float64 `json:"void_fraction"`
	VolumeM3     float64 `json:"volume_m3"`
	Stone        Mass    `json:"stone"`
	Boulders     Mass    `json:"boulders"`
}

// EdgeStone computes the edge stone for the given shoreline: volume =
// length × face height × thickness, mass = volume × density × (1 − voids),
// plus the boulder allowance. Errors: an unknown rock, a thickness, face
// height or density that is not > 0, a void fraction outside [0, 1), a
// negative allowance, or a stretch that is not on the shoreline.
func EdgeStone(sh ShorelineResult, o EdgeStoneOptions) (EdgeStoneResult, error) {
	var res EdgeStoneResult
	rock, err := o.check()
	if err != nil {
		return res, err
	}
	length := sh.LengthM
	if len(o.Stretches) > 0 {
		length = 0
		for i, st := range o.Stretches {
			l, err := StretchLength(sh, i, st)
			if err != nil {
				return res, err
			}
			length += l
		}
	}
	res.Rock = rock
	res.LengthM = length
	res.FaceHeightM = o.FaceHeightM
	res.ThicknessM = o.ThicknessM
	res.VoidFraction = o.VoidFraction
	res.VolumeM3 = length * o.FaceHeightM * o.ThicknessM
	kg := res.VolumeM3 * rock.DensityKgM3 * (1 - o.VoidFraction)
	res.Stone = MassOf(kg)
	res.Boulders = MassOf(kg*o.BoulderPercent/100 + o.BoulderKg)
	return res, nil
}

// check validates o and returns its rock with the density override
// applied.
func (o EdgeStoneOptions) check() (Rock, error) {
	name := o.Rock
	if strings.TrimSpace(name) == "" {
		name = "granite"
	}
	rock, err := RockByName(name)
	if err != nil {
		return rock, err
	}
	if o.DensityKgM3 != 0 {
		if !(o.DensityKgM3 > 0) || math.IsInf(o.DensityKgM3, 0) {
			return rock, optionError("stone density", o.DensityKgM3, "> 0 kg/m³")
		}
		rock.DensityKgM3 = o.DensityKgM3
	}
	switch {
	case !(o.FaceHeightM > 0) || math.IsInf(o.FaceHeightM, 0):
		return rock, optionError("stone face height", o.FaceHeightM, "> 0 m")
	case !(o.ThicknessM > 0) || math.IsInf(o.ThicknessM, 0):
		return rock, optionError("stone thickness", o.ThicknessM, "> 0 m")
	case !(o.VoidFraction >= 0 && o.VoidFraction < 1):
		return rock, optionError("stone void fraction", o.VoidFraction, "in [0, 1)")
	case !(o.BoulderPercent >= 0) || math.IsInf(o.BoulderPercent, 0):
		return rock, optionError("boulder allowance", o.BoulderPercent, ">= 0 %")
	case !(o.BoulderKg >= 0) || math.IsInf(o.BoulderKg, 0):
		return rock, optionError("boulder allowance", o.BoulderKg, ">= 0 kg")
	}
	return rock, nil
}

// ParseBoulderAllowance reads a feature-boulder allowance written as a
// percentage of the edge stone ("10%") or a mass with its unit: short tons
// ("2 tons", "2ton", "2 tn"), tonnes ("1.5t", "1.5 tonnes"), kilograms
// ("800kg") or pounds ("500 lb"). An empty string is no allowance. The
// result is a percentage or kilograms, never both.
func ParseBoulderAllowance(s string) (percent, kg float64, err error) {
	t := strings.ToLower(strings.TrimSpace(s))
	if t == "" {
		return 0, 0, nil
	}
	bad := func() (float64, float64, error) {
		return 0, 0, fmt.Errorf("%w: boulder allowance %q: want a percentage (10%%) or a mass (2 tons, 1.5t, 800kg, 500lb)", ErrOption, s)
	}
	num := func(x string) (float64, bool) {
		v, err := units.ParseNumber(strings.TrimSpace(x))
		return v, err == nil && v >= 0
	}
	if strings.HasSuffix(t, "%") {
		v, ok := num(strings.TrimSuffix(t, "%"))
		if !ok {
			return bad()
		}
		return v, 0, nil
	}
	// Longest suffix first, so "tonnes" wins over "t" and "tons".
	for _, suf := range []struct {
		name string
		kg   float64
	}{
		{"tonnes", units.Tonne}, {"tonne", units.Tonne},
		{"tons", units.ShortTon}, {"ton", units.ShortTon}, {"tn", units.ShortTon},
		{"kg", 1}, {"lbs", units.Pound}, {"lb", units.Pound}, {"t", units.Tonne},
	} {
		if strings.HasSuffix(t, suf.name) {
			v, ok := num(strings.TrimSuffix(t, suf.name))
			if !ok {
				return bad()
			}
			return 0, v * suf.kg, nil
		}
	}
	return bad()
}

// GravelOptions spreads an aggregate over zone floors (and walls).
type GravelOptions struct {
	// Zone names the zone to cover; "" means every zone.
	Zone string
	// Material names an aggregate preset; "" means river rock.
	// BulkDensityKgM3, when > 0, overrides its loose bulk density.
	Material        string
	BulkDensityKgM3 float64
	// ThicknessM is the layer's thickness; it must be > 0.
	ThicknessM float64
	// Walls covers the zone's sloped walls too (their developed area on the
	// mesh), not only its floor.
	Walls bool
}

// GravelRow is one layer of gravel on one zone.
type GravelRow struct {
	Zone            string  `json:"zone"`
	Material        string  `json:"material"`
	FloorAreaM2     float64 `json:"floor_area_m2"`
	WallAreaM2      float64 `json:"wall_area_m2"`
	ThicknessM      float64 `json:"thickness_m"`
	VolumeM3        float64 `json:"volume_m3"`
	BulkDensityKgM3 float64 `json:"bulk_density_kg_m3"`
	Mass            Mass    `json:"mass"`
}

// ZoneArea is the area gravel can cover in one zone: its floor (plan area,
// m²) and its sloped walls (developed area, m²; negative when unknown).
type ZoneArea struct {
	Name        string
	FloorAreaM2 float64
	WallAreaM2  float64
}

// Gravel computes the gravel layers: area × thickness × loose bulk density.
// Errors: an unknown material or zone, a thickness or density that is not
// > 0, or walls asked for where their area is unknown.
func Gravel(zones []ZoneArea, specs []GravelOptions) ([]GravelRow, error) {
	var rows []GravelRow
	for i, g := range specs {
		name := g.Material
		if strings.TrimSpace(name) == "" {
			name = "river rock"
		}
		agg, err := AggregateByName(name)
		if err != nil {
			return nil, err
		}
		if g.BulkDensityKgM3 != 0 {
			if !(g.BulkDensityKgM3 > 0) || math.IsInf(g.BulkDensityKgM3, 0) {
				return nil, optionError(fmt.Sprintf("gravel %d density", i), g.BulkDensityKgM3, "> 0 kg/m³")
			}
			agg.BulkDensityKgM3 = g.BulkDensityKgM3
		}
		if !(g.ThicknessM > 0) || math.IsInf(g.ThicknessM, 0) {
			return nil, optionError(fmt.Sprintf("gravel %d thickness", i), g.ThicknessM, "> 0 m")
		}
		matched := false
		for _, z := range zones {
			if g.Zone != "" && z.Name != g.Zone {
				continue
			}
			matched = true
			r := GravelRow{Zone: z.Name, Material: agg.Name, FloorAreaM2: z.FloorAreaM2,
				ThicknessM: g.ThicknessM, BulkDensityKgM3: agg.BulkDensityKgM3}
			if g.Walls {
				if z.WallAreaM2 < 0 {
					return nil, fmt.Errorf("%w: gravel %d: the wall area of zone %q is not known (the mesh does not say which zone owns each triangle)",
						ErrOption, i, z.Name)
				}
				r.WallAreaM2 = z.WallAreaM2
			}
			r.VolumeM3 = (r.FloorAreaM2 + r.WallAreaM2) * g.ThicknessM
			r.Mass = MassOf(r.VolumeM3 * agg.BulkDensityKgM3)
			rows = append(rows, r)
		}
		if !matched {
			names := make([]string, len(zones))
			for k, z := range zones {
				names[k] = z.Name
			}
			return nil, fmt.Errorf("%w: gravel %d: no zone named %q (zones: %s)", ErrOption, i, g.Zone, joinNames(names))
		}
	}
	return rows, nil
}

// Crew placement rates (common practice, no source). One short ton of
// stone placed per worker-hour is the trade's rule of thumb; hand-setting
// heavy edge stone with bars and dollies is slower (about 0.1–0.3 short ton
// per worker-hour, check-values.md §7), a mini-excavator with a thumb sets
// about 1–3 short tons of boulders an hour.
const (
	DefaultTonsPerWorkerHour  = 1.0
	DefaultMachineTonsPerHour = 2.0
	DefaultCrewSize           = 2
	DefaultHoursPerDay        = 8.0
)

// CrewOptions sets the stone crew. Zero values mean the defaults; negative
// values are errors.
type CrewOptions struct {
	// Size is the number of workers placing stone (default 2).
	Size int
	// TonsPerWorkerHour is the hand placement rate in short tons per
	// worker-hour (default 1).
	TonsPerWorkerHour float64
	// MachineTonsPerHour is the rate for machine-placed boulders in short
	// tons per machine-hour (default 2).
	MachineTonsPerHour float64
	// HoursPerDay is the length of a working day (default 8).
	HoursPerDay float64
}

// CrewResult is the crew time to place the stone.
type CrewResult struct {
	Size int `json:"size"`
	// HandTons and MachineTons are the short tons placed by hand and by
	// machine.
	HandTons    float64 `json:"hand_tons"`
	MachineTons float64 `json:"machine_tons"`
	// WorkerHours is HandTons / rate; HandHours that shared by the crew.
	WorkerHours  float64 `json:"worker_hours"`
	HandHours    float64 `json:"hand_hours"`
	MachineHours float64 `json:"machine_hours"`
	// Hours is the crew's clock time, hand and machine work one after the
	// other; Days is Hours / HoursPerDay.
	Hours       float64  `json:"hours"`
	Days        float64  `json:"days"`
	HoursPerDay float64  `json:"hours_per_day"`
	Notes       []string `json:"notes"`
}

// CrewTime returns the crew time to place handTons short tons by hand at
// rate short tons per worker-hour with crew workers, and machineTons by
// machine at machineRate short tons per hour, in days of hoursPerDay.
// Every rate, the crew size and the day length must be > 0 (the machine
// rate only when there are machine tons).
func CrewTime(handTons, machineTons, rate float64, crew int, machineRate, hoursPerDay float64) (CrewResult, error) {
	var res CrewResult
	switch {
	case crew <= 0:
		return res, optionError("crew size", float64(crew), "> 0 workers")
	case !(rate > 0) || math.IsInf(rate, 0):
		return res, optionError("placement rate", rate, "> 0 short tons per worker-hour")
	case !(hoursPerDay > 0 && hoursPerDay <= 24):
		return res, optionError("hours per day", hoursPerDay, "in (0, 24] h")
	case !(handTons >= 0) || !(machineTons >= 0):
		return res, inputError("stone tonnage", min(handTons, machineTons), ">= 0 short tons")
	case machineTons > 0 && (!(machineRate > 0) || math.IsInf(machineRate, 0)):
		return res, optionError("machine placement rate", machineRate, "> 0 short tons per hour")
	}
	res.Size = crew
	res.HandTons = handTons
	res.MachineTons = machineTons
	res.WorkerHours = handTons / rate
	res.HandHours = res.WorkerHours / float64(crew)
	if machineTons > 0 {
		res.MachineHours = machineTons / machineRate
	}
	res.Hours = res.HandHours + res.MachineHours
	res.HoursPerDay = hoursPerDay
	res.Days = res.Hours / hoursPerDay
	res.Notes = []string{
		fmt.Sprintf("hand placement at %g short tons per worker-hour with %d workers; boulders by machine at %g short tons per hour (common practice, no source)",
			rate, crew, machineRate),
	}
	return res, nil
}

// StoneResult gathers the stone order. The JSON keys ending in _tons are
// short tons (2000 lb), those ending in _tonnes metric tonnes.
type StoneResult struct {
	Edge          *EdgeStoneResult `json:"edge,omitempty"`
	Gravel        []GravelRow      `json:"gravel,omitempty"`
	EdgeTons      float64          `json:"edge_tons"`
	BoulderTons   float64          `json:"boulder_tons"`
	GravelTons    float64          `json:"gravel_tons"`
	TotalTons     float64          `json:"total_tons"`
	EdgeTonnes    float64          `json:"edge_tonnes"`
	BoulderTonnes float64          `json:"boulder_tonnes"`
	GravelTonnes  float64          `json:"gravel_tonnes"`
	TotalTonnes   float64          `json:"total_tonnes"`
}

func stoneTotals(edge *EdgeStoneResult, rows []GravelRow) StoneResult {
	s := StoneResult{Edge: edge, Gravel: rows}
	var ek, bk, gk float64
	if edge != nil {
		ek, bk = edge.Stone.Kg, edge.Boulders.Kg
	}
	for _, r := range rows {
		gk += r.Mass.Kg
	}
	s.EdgeTons, s.EdgeTonnes = ek/units.ShortTon, ek/units.Tonne
	s.BoulderTons, s.BoulderTonnes = bk/units.ShortTon, bk/units.Tonne
	s.GravelTons, s.GravelTonnes = gk/units.ShortTon, gk/units.Tonne
	s.TotalTons = (ek + bk + gk) / units.ShortTon
	s.TotalTonnes = (ek + bk + gk) / units.Tonne
	return s
}
