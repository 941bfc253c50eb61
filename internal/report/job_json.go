package report

import (
	"bytes"
	"encoding"
	"encoding/json"
	"fmt"
	"io"
	"math"
	"path/filepath"
	"reflect"
	"slices"
	"strings"

	"github.com/dugout-estimating/dugout/internal/design"
	"github.com/dugout-estimating/dugout/internal/estimate"
	"github.com/dugout-estimating/dugout/internal/takeoff"
)

// JobSchemaVersion is the schema_version of the estimate's JSON document.
// It changes when a key is renamed or removed, not when one is added.
const JobSchemaVersion = 1

// The estimate's JSON document (WriteJSON). Keys are snake_case with the
// unit as suffix; every value is SI (m, m², m³, kg, h, m³/h) except the
// stone's *_tons keys, short tons as the takeoff names them, and the
// takeoff's US figures named by their unit (volume_gal, weight_lb ...).
type jobJSON struct {
	SchemaVersion  int                         `json:"schema_version"`
	Units          string                      `json:"units"`
	Site           jobSiteJSON                 `json:"site"`
	Inputs         jobInputsJSON               `json:"inputs"`
	FrameOriginM   [2]float64                  `json:"frame_origin_m"`
	WaterLevelM    float64                     `json:"water_level_m"`
	WaterLevelMode string                      `json:"water_level_mode"`
	RimM           float64                     `json:"rim_m"`
	FreeboardM     float64                     `json:"freeboard_m"`
	Survey         jobSurveyJSON               `json:"survey"`
	Surface        jobSurfaceJSON              `json:"surface"`
	Design         jobDesignJSON               `json:"design"`
	Earthwork      jobEarthworkJSON            `json:"earthwork"`
	Liner          takeoff.LinerResult         `json:"liner"`
	Underlayment   *takeoff.UnderlaymentResult `json:"underlayment"`
	Shoreline      takeoff.ShorelineResult     `json:"shoreline"`
	Stone          takeoff.StoneResult         `json:"stone"`
	Crew           takeoff.CrewResult          `json:"crew"`
	Water          jobWaterJSON                `json:"water"`
	Pump           takeoff.PumpResult          `json:"pump"`
	Cost           *takeoff.CostTable          `json:"cost"`
	Comparisons    []jobComparisonJSON         `json:"comparisons"`
	Cautions       []takeoff.Caution           `json:"cautions"`
	Assumed        []string                    `json:"assumed"`
	Warnings       []string                    `json:"warnings"`
}

type jobSiteJSON struct {
	Name    string `json:"name"`
	Client  string `json:"client"`
	Address string `json:"address"`
	Notes   string `json:"notes"`
}

// jobInputsJSON echoes the job's settings as resolved, defaults applied.
type jobInputsJSON struct {
	SurveyFiles    []string    `json:"survey_files"`
	ZonesFile      string      `json:"zones_file,omitempty"`
	OutlineFile    string      `json:"outline_file,omitempty"`
	OutlineCode    string      `json:"outline_code,omitempty"`
	Units          string      `json:"units"`
	OutUnits       string      `json:"out_units"`
	CRS            string      `json:"crs"`
	WaterLevel     string      `json:"water_level"`
	FreeboardM     float64     `json:"freeboard_m"`
	BermCrestM     float64     `json:"berm_crest_m"`
	BermSlope      float64     `json:"berm_slope_h_per_v"`
	CellM          float64     `json:"cell_m"`
	Soil           jobSoilJSON `json:"soil"`
	OSHASoilType   string      `json:"osha_soil_type"`
	Truck          jobTruck    `json:"truck"`
	Heaped         bool        `json:"heaped"`
	ReuseCut       bool        `json:"reuse_cut"`
	TopsoilDepthM  float64     `json:"topsoil_depth_m"`
	LinerOverlapM  float64     `json:"liner_overlap_m"`
	LinerMaterial  string      `json:"liner_material"`
	DischargePoint string      `json:"discharge_point,omitempty"`
	CrewSize       int         `json:"crew_size"`
	PumpTurnoverH  float64     `json:"pump_turnover_h"`
	SupplyM3PerH   float64     `json:"supply_m3_per_h"`
	PricesGiven    bool        `json:"priced"`
}

type jobSoilJSON struct {
	Name             string  `json:"name"`
	SwellFactor      float64 `json:"swell_factor"`
	CompactionFactor float64 `json:"compaction_factor"`
	Shrink           float64 `json:"shrink"`
	Source           string  `json:"source"`
}

type jobTruck struct {
	Name     string  `json:"name"`
	StruckM3 float64 `json:"struck_m3"`
	HeapedM3 float64 `json:"heaped_m3"`
}

type jobSurveyJSON struct {
	Points     int              `json:"points"`
	Files      []jobFileJSON    `json:"files"`
	CRS        string           `json:"crs"`
	EPSG       int              `json:"epsg,omitempty"`
	Geographic bool             `json:"geographic"`
	Accuracy   *jobAccuracyJSON `json:"accuracy,omitempty"`
	Breaklines int              `json:"breaklines"`
	Boundaries int              `json:"boundaries"`
}

type jobFileJSON struct {
	Path   string `json:"path"`
	Format string `json:"format"`
	Points int    `json:"points"`
}

type jobAccuracyJSON struct {
	HorizontalMedianM *float64 `json:"horizontal_median_m,omitempty"`
	HorizontalP95M    *float64 `json:"horizontal_p95_m,omitempty"`
	VerticalMedianM   *float64 `json:"vertical_median_m,omitempty"`
	VerticalP95M      *float64 `json:"vertical_p95_m,omitempty"`
}

type jobSurfaceJSON struct {
	Vertices      int     `json:"vertices"`
	Triangles     int     `json:"triangles"`
	Breaklines    int     `json:"breaklines"`
	PlanAreaM2    float64 `json:"plan_area_m2"`
	SurfaceAreaM2 float64 `json:"surface_area_m2"`
	ElevationMinM float64 `json:"elevation_min_m"`
	ElevationMaxM float64 `json:"elevation_max_m"`
}

type jobDesignJSON struct {
	CellM           float64       `json:"cell_m"`
	RefineChange    float64       `json:"refine_change"`
	CutM3           float64       `json:"cut_m3"`
	FillM3          float64       `json:"fill_m3"`
	DisturbedAreaM2 float64       `json:"disturbed_area_m2"`
	CutAreaM2       float64       `json:"cut_area_m2"`
	FillAreaM2      float64       `json:"fill_area_m2"`
	Zones           []jobZoneJSON `json:"zones"`
	Warnings        []string      `json:"warnings"`
}

type jobZoneJSON struct {
	Name        string  `json:"name"`
	DepthM      float64 `json:"depth_m"`
	WallSlope   float64 `json:"wall_slope_h_per_v"`
	Corners     string  `json:"corners"`
	FloorAreaM2 float64 `json:"floor_area_m2"`
	CutM3       float64 `json:"cut_m3"`
	FillM3      float64 `json:"fill_m3"`
}

// jobEarthworkJSON is the earthwork account: cut_m3 is bank measure, fill_m3
// compacted in place, net_m3 = cut − the bank volume the fill needs
// (positive a surplus), and the haul and import in bank and loose measure.
type jobEarthworkJSON struct {
	CutM3            float64  `json:"cut_m3"`
	FillM3           float64  `json:"fill_m3"`
	FillBankNeedM3   float64  `json:"fill_bank_need_m3"`
	NetM3            float64  `json:"net_m3"`
	ReusedM3         float64  `json:"reused_bank_m3"`
	HaulBankM3       float64  `json:"haul_bank_m3"`
	LooseHaulM3      float64  `json:"loose_haul_m3"`
	ImportBankM3     float64  `json:"import_bank_m3"`
	ImportLooseM3    float64  `json:"import_loose_m3"`
	TopsoilBankM3    float64  `json:"topsoil_bank_m3"`
	TopsoilLooseM3   float64  `json:"topsoil_loose_m3"`
	Truckloads       int      `json:"truckloads"`
	TruckCapacityM3  float64  `json:"truck_capacity_m3"`
	HaulCost         float64  `json:"haul_cost"`
	ShrinkConvention string   `json:"shrink_convention"`
	Notes            []string `json:"notes"`
}

// jobWaterJSON is the takeoff's water with the surface area under the name
// the estimate's readers use.
type jobWaterJSON struct {
	takeoff.WaterResult
	SurfaceAreaM2 float64 `json:"surface_area_m2"`
}

type jobComparisonJSON struct {
	Quantity          string   `json:"quantity"`
	Unit              string   `json:"unit"`
	Measured          float64  `json:"measured"`
	RuleOfThumb       float64  `json:"rule_of_thumb"`
	DifferencePercent *float64 `json:"difference_percent"`
	Rule              string   `json:"rule"`
}

// WriteJSON writes the estimate r as one JSON object (schema
// [JobSchemaVersion]): an echo of the site and the resolved inputs, then the
// results, in SI units with snake_case keys carrying the unit
// (earthwork.cut_m3, water.volume_m3, liner.sheet_length_m …; stone
// tonnages in short tons under *_tons and in tonnes under *_tonnes).
// Numbers are written at full precision (the shortest decimal that reads
// back to the same float64); a value that is not finite is written null.
// Keys come in a fixed order and the output is deterministic: the same
// estimate gives the same bytes.
//
// It returns an error wrapping [ErrInvalidValue] for an incomplete result
// and any error of w.
func WriteJSON(w io.Writer, r *estimate.Result) error {
	doc, err := jobDocument(r)
	if err != nil {
		return err
	}
	var b bytes.Buffer
	writeJSONTree(&b, jsonTree(reflect.ValueOf(doc)), "")
	b.WriteByte('\n')
	_, err = w.Write(b.Bytes())
	return err
}

// jobDocument maps r onto the JSON document.
func jobDocument(r *estimate.Result) (*jobJSON, error) {
	v, err := newJobView(r)
	if err != nil {
		return nil, err
	}
	j, d, e, t := r.Job, r.Design, r.Earthwork, r.Takeoff
	doc := &jobJSON{
		SchemaVersion:  JobSchemaVersion,
		Units:          "SI",
		FrameOriginM:   [2]float64{r.Survey.Frame.Origin.X, r.Survey.Frame.Origin.Y},
		WaterLevelM:    d.WaterLevelM,
		WaterLevelMode: d.Level.String(),
		RimM:           d.RimM,
		FreeboardM:     d.Params.FreeboardM,
		Liner:          t.Liner,
		Underlayment:   t.Underlayment,
		Shoreline:      t.Shoreline,
		Stone:          t.Stone,
		Crew:           t.Crew,
		Water:          jobWaterJSON{WaterResult: t.Water, SurfaceAreaM2: t.Water.AreaM2},
		Pump:           t.Pump,
		Cost:           t.Cost,
		Cautions:       nonNil(t.Cautions),
		Assumed:        nonNil(j.Assumed),
		Warnings:       nonNil(r.Warnings),
	}
	if s := j.Site; s != nil {
		doc.Site = jobSiteJSON{Name: s.Name, Client: s.Client, Address: s.Address, Notes: s.Notes}
	}
	doc.Inputs = jobInputs(r)

	set := r.Survey
	sum := v.surveySummary()
	doc.Survey = jobSurveyJSON{Points: sum.Count, Files: []jobFileJSON{}, CRS: set.CRS.String(), EPSG: set.CRS.EPSG,
		Geographic: set.Geographic, Breaklines: len(set.Breaklines), Boundaries: len(set.Boundaries)}
	for _, f := range set.Files {
		doc.Survey.Files = append(doc.Survey.Files, jobFileJSON{Path: jobRelPath(j, f.Path), Format: f.Format.String(), Points: f.Points})
	}
	if sum.HAcc.N > 0 || sum.VAcc.N > 0 {
		a := &jobAccuracyJSON{}
		if sum.HAcc.N > 0 {
			a.HorizontalMedianM, a.HorizontalP95M = &sum.HAcc.MedianM, &sum.HAcc.P95M
		}
		if sum.VAcc.N > 0 {
			a.VerticalMedianM, a.VerticalP95M = &sum.VAcc.MedianM, &sum.VAcc.P95M
		}
		doc.Survey.Accuracy = a
	}
	ts := r.Terrain.Summary()
	doc.Surface = jobSurfaceJSON{Vertices: ts.Vertices, Triangles: ts.Triangles, Breaklines: ts.Breaklines,
		PlanAreaM2: ts.PlanAreaM2, SurfaceAreaM2: ts.SurfaceAreaM2, ElevationMinM: ts.ZMinM, ElevationMaxM: ts.ZMaxM}

	doc.Design = jobDesignJSON{CellM: d.CellM, RefineChange: d.RefineChange, CutM3: d.CutM3, FillM3: d.FillM3,
		DisturbedAreaM2: d.DisturbedAreaM2, CutAreaM2: d.CutAreaM2, FillAreaM2: d.FillAreaM2,
		Zones: []jobZoneJSON{}, Warnings: nonNil(d.Warnings)}
	for i, z := range r.Zones {
		zj := jobZoneJSON{Name: z.Name, DepthM: z.DepthM, WallSlope: z.WallSlope, Corners: z.Corners.String()}
		if i < len(d.ByZone) {
			zj.FloorAreaM2, zj.CutM3, zj.FillM3 = d.ByZone[i].FloorAreaM2, d.ByZone[i].CutM3, d.ByZone[i].FillM3
		}
		doc.Design.Zones = append(doc.Design.Zones, zj)
	}

	doc.Earthwork = jobEarthworkJSON{CutM3: e.CutBankM3, FillM3: e.FillCompactedM3, FillBankNeedM3: e.FillBankNeedM3,
		NetM3: e.NetBankM3, ReusedM3: e.ReusedBankM3, HaulBankM3: e.HaulBankM3, LooseHaulM3: e.HaulLooseM3,
		ImportBankM3: e.ImportBankM3, ImportLooseM3: e.ImportLooseM3, TopsoilBankM3: e.TopsoilBankM3,
		TopsoilLooseM3: e.TopsoilLooseM3, Truckloads: e.Truckloads, TruckCapacityM3: e.TruckCapacityM3,
		HaulCost: e.HaulCost, ShrinkConvention: e.ShrinkConvention, Notes: nonNil(e.Notes)}

	doc.Comparisons = []jobComparisonJSON{}
	for _, c := range v.compare {
		cj := jobComparisonJSON{Quantity: c.Label, Unit: quantitySIUnit(c.Quantity), Measured: c.Measured, RuleOfThumb: c.Rule, Rule: c.RuleText}
		if p, ok := c.DifferencePercent(); ok {
			cj.DifferencePercent = &p
		}
		doc.Comparisons = append(doc.Comparisons, cj)
	}
	return doc, nil
}

// quantitySIUnit names the SI unit of a Quantity's values.
func quantitySIUnit(q Quantity) string {
	switch q {
	case Length, Elevation, ShortLength:
		return "m"
	case Area:
		return "m2"
	case Volume, WaterVolume:
		return "m3"
	case Mass:
		return "kg"
	case Flow:
		return "m3/s"
	}
	return ""
}

func jobInputs(r *estimate.Result) jobInputsJSON {
	j := r.Job
	in := jobInputsJSON{
		SurveyFiles:    []string{},
		Units:          j.Units.String(),
		OutUnits:       j.OutUnits.String(),
		CRS:            "auto",
		WaterLevel:     r.Design.Level.String(),
		FreeboardM:     j.Design.FreeboardM,
		BermCrestM:     j.Design.BermCrestM,
		BermSlope:      j.Design.BermSlope,
		CellM:          j.Design.CellM,
		Soil:           jobSoilJSON{Name: j.Soil.Name, SwellFactor: j.Soil.Swell, CompactionFactor: j.Soil.Compaction, Shrink: j.Soil.Shrink(), Source: j.Soil.Source},
		OSHASoilType:   j.Takeoff.Soil.String(),
		Truck:          jobTruck{Name: j.Truck.Name, StruckM3: j.Truck.StruckM3, HeapedM3: j.Truck.HeapedM3},
		Heaped:         j.Heaped,
		ReuseCut:       j.ReuseCut,
		TopsoilDepthM:  j.TopsoilDepthM,
		LinerOverlapM:  r.Takeoff.Liner.OverlapM,
		LinerMaterial:  r.Takeoff.Liner.Material.Name,
		DischargePoint: j.DischargePoint,
		CrewSize:       r.Takeoff.Crew.Size,
		PumpTurnoverH:  r.Takeoff.Pump.TurnoverH,
		SupplyM3PerH:   r.Takeoff.Water.SupplyM3PerH,
		PricesGiven:    j.Takeoff.Prices != nil,
	}
	if in.BermSlope == 0 {
		in.BermSlope = design.DefaultBermSlope
	}
	if j.Design.Level == design.LevelFixed {
		in.WaterLevel = fmt.Sprint(j.Design.WaterLevelM)
	}
	for _, f := range j.SurveyFiles {
		in.SurveyFiles = append(in.SurveyFiles, jobRelPath(j, f))
	}
	in.ZonesFile, in.OutlineFile, in.OutlineCode = jobRelPath(j, j.ZonesFile), jobRelPath(j, j.OutlineFile), j.OutlineCode
	if s := j.Site; s != nil && s.CRS != "" {
		in.CRS = s.CRS
	}
	return in
}

// jobRelPath writes a path of the job relative to the site file's folder
// when it lies inside it, so that the document does not depend on where
// the command ran; other paths are kept as they are.
func jobRelPath(j *estimate.Job, p string) string {
	if p == "" || j.Site == nil || j.Site.Dir == "" {
		return filepath.ToSlash(p)
	}
	rel, err := filepath.Rel(j.Site.Dir, p)
	if err != nil || rel == ".." || strings.HasPrefix(rel, ".."+string(filepath.Separator)) {
		return filepath.ToSlash(p)
	}
	return filepath.ToSlash(rel)
}

func nonNil[T any](s []T) []T {
	if s == nil {
		return []T{}
	}
	return s
}

// The JSON writer. encoding/json refuses NaN and ±Inf and would fail the
// whole document over one undefined value; jsonTree converts a value into
// a tree of objects (in field order), arrays and scalars, following
// encoding/json's rules for the types used here (json tags with omitempty
// and "-", embedded structs flattened, nil slices null, map keys sorted,
// encoding.TextMarshaler as a string), with non-finite floats as null.

// jsonObject is an object with its members in order.
type jsonObject []jsonMember

type jsonMember struct {
	key string
	val any
}

var textMarshalerType = reflect.TypeFor[encoding.TextMarshaler]()

// jsonTree converts v to a tree of jsonObject, []any, string, bool,
// float64, int64, uint64 and nil.
func jsonTree(v reflect.Value) any {
	if !v.IsValid() {
		return nil
	}
	if v.Type().Implements(textMarshalerType) && (v.Kind() != reflect.Pointer || !v.IsNil()) {
		if b, err := v.Interface().(encoding.TextMarshaler).MarshalText(); err == nil {
			return string(b)
		}
	}
	switch v.Kind() {
	case reflect.Pointer, reflect.Interface:
		if v.IsNil() {
			return nil
		}
		return jsonTree(v.Elem())
	case reflect.Struct:
		var obj jsonObject
		jsonFields(v, &obj)
		return obj
	case reflect.Slice:
		if v.IsNil() {
			return nil
		}
		fallthrough
	case reflect.Array:
		out := make([]any, v.Len())
		for i := range out {
			out[i] = jsonTree(v.Index(i))
		}
		return out
	case reflect.Map:
		if v.IsNil() {
			return nil
		}
		keys := v.MapKeys()
		slices.SortFunc(keys, func(a, b reflect.Value) int {
			return strings.Compare(fmt.Sprint(a.Interface()), fmt.Sprint(b.Interface()))
		})
		var obj jsonObject
		for _, k := range keys {
			obj = append(obj, jsonMember{fmt.Sprint(k.Interface()), jsonTree(v.MapIndex(k))})
		}
		return obj
	case reflect.Float32, reflect.Float64:
		f := v.Float()
		if math.IsNaN(f) || math.IsInf(f, 0) {
			return nil
		}
		return f
	case reflect.Int, reflect.Int8, reflect.Int16, reflect.Int32, reflect.Int64:
		return v.Int()
	case reflect.Uint, reflect.Uint8, reflect.Uint16, reflect.Uint32, reflect.Uint64:
		return v.Uint()
	case reflect.String:
		return v.String()
	case reflect.Bool:
		return v.Bool()
	}
	return nil
}

// jsonFields appends the exported fields of struct v to obj.
func jsonFields(v reflect.Value, obj *jsonObject) {
	t := v.Type()
	for i := range t.NumField() {
		f := t.Field(i)
		tag := f.Tag.Get("json")
		if tag == "-" {
			continue
		}
		name, opts, _ := strings.Cut(tag, ",")
		fv := v.Field(i)
		if f.Anonymous && name == "" {
			ft := f.Type
			if ft.Kind() == reflect.Pointer {
				if fv.IsNil() {
					continue
				}
				fv, ft = fv.Elem(), ft.Elem()
			}
			if ft.Kind() == reflect.Struct {
				jsonFields(fv, obj)
				continue
			}
		}
		if !f.IsExported() {
			continue
		}
		if name == "" {
			name = f.Name
		}
		if strings.Contains(","+opts+",", ",omitempty,") && jsonEmpty(fv) {
			continue
		}
		*obj = append(*obj, jsonMember{name, jsonTree(fv)})
	}
}

// jsonEmpty reports whether v is empty in the sense of omitempty.
func jsonEmpty(v reflect.Value) bool {
	switch v.Kind() {
	case reflect.Array, reflect.Map, reflect.Slice, reflect.String:
		return v.Len() == 0
	case reflect.Bool, reflect.Int, reflect.Int8, reflect.Int16, reflect.Int32, reflect.Int64,
		reflect.Uint, reflect.Uint8, reflect.Uint16, reflect.Uint32, reflect.Uint64,
		reflect.Float32, reflect.Float64, reflect.Interface, reflect.Pointer:
		return v.IsZero()
	}
	return false
}

// writeJSONTree writes t indented by two spaces per level, without
// escaping <, > and & (the document is data, not HTML).
func writeJSONTree(b *bytes.Buffer, t any, indent string) {
	switch t := t.(type) {
	case jsonObject:
		if len(t) == 0 {
			b.WriteString("{}")
			return
		}
		b.WriteString("{\n")
		for i, m := range t {
			b.WriteString(indent + "  ")
			writeJSONString(b, m.key)
			b.WriteString(": ")
			writeJSONTree(b, m.val, indent+"  ")
			if i < len(t)-1 {
				b.WriteByte(',')
			}
			b.WriteByte('\n')
		}
		b.WriteString(indent + "}")
	case []any:
		if len(t) == 0 {
			b.WriteString("[]")
			return
		}
		b.WriteString("[\n")
		for i, e := range t {
			b.WriteString(indent + "  ")
			writeJSONTree(b, e, indent+"  ")
			if i < len(t)-1 {
				b.WriteByte(',')
			}
			b.WriteByte('\n')
		}
		b.WriteString(indent + "]")
	case string:
		writeJSONString(b, t)
	case nil:
		b.WriteString("null")
	default:
		// Numbers and booleans: encoding/json's shortest round-trip form.
		out, err := json.Marshal(t)
		if err != nil {
			b.WriteString("null")
			return
		}
		b.Write(out)
	}
}

func writeJSONString(b *bytes.Buffer, s string) {
	enc := json.NewEncoder(b)
	enc.SetEscapeHTML(false)
	_ = enc.Encode(s) // a string always encodes
	b.Truncate(b.Len() - 1)
}
