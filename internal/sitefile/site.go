package sitefile

import (
	"bytes"
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"sort"
	"strings"

	"github.com/BurntSushi/toml"
)

// Site is the whole site file. Every field is optional unless its comment
// says otherwise; the estimate applies documented defaults.
type Site struct {
	Name    string `toml:"name"`    // job or site name, for the report's title block
	Client  string `toml:"client"`  // owner or client
	Address string `toml:"address"` // street and town
	Notes   string `toml:"notes"`   // free text printed in the report
	Units   string `toml:"units"`   // m | ft | usft: the survey's units and bare lengths here
	// OutUnits is the family results are printed in (m | ft); default: ft
	// for ft and usft surveys, m otherwise.
	OutUnits string `toml:"out_units"`
	CRS      string `toml:"crs"` // local | auto | EPSG:NNNN

	Survey    Survey    `toml:"survey"`
	Design    Design    `toml:"design"`
	Water     Water     `toml:"water"`
	Berm      Berm      `toml:"berm"`
	Earthwork Earthwork `toml:"earthwork"`
	Liner     Liner     `toml:"liner"`
	Stone     Stone     `toml:"stone"`
	Gravel    Gravel    `toml:"gravel"`
	Crew      Crew      `toml:"crew"`
	Pump      Pump      `toml:"pump"`
	Prices    Prices    `toml:"prices"`
	Report    Report    `toml:"report"`

	// Dir is the folder relative paths are resolved against (the site
	// file's folder, or the working folder for a site built from flags).
	Dir string `toml:"-"`
}

// Survey says which files hold the existing ground and how to read them.
type Survey struct {
	Files          []string `toml:"files"`           // survey files (CSV, GeoJSON, GPX, level book, LAS)
	Columns        string   `toml:"columns"`         // PNEZD | PENZD ... for headerless files
	BreaklineCodes []string `toml:"breakline_codes"` // description codes joined into breaklines
	Breaklines     []string `toml:"breaklines"`      // extra breakline files (GeoJSON LineStrings)
	Boundary       string   `toml:"boundary"`        // a GeoJSON polygon that trims the surface
	MaxEdge        Length   `toml:"max_edge"`        // trim triangles with longer outer edges
	Duplicates     string   `toml:"duplicates"`      // mean | first | error
	DropSpikes     bool     `toml:"drop_spikes"`     // leave suspected spikes out of the surface
	LASClasses     []int    `toml:"las_classes"`     // LAS classes to keep (default ground)
	Thin           Length   `toml:"thin"`            // LAS thinning cell
	ThinMode       string   `toml:"thin_mode"`       // lowest | mean
}

// Design is the pond: zones from a file, or an outline with shelves.
type Design struct {
	Zones   string  `toml:"zones"` // GeoJSON polygons with depth and wall_slope properties
	Outline Outline `toml:"outline"`
	Cell    Length  `toml:"cell"` // lattice cell; default chosen automatically
}

// Outline derives the zones from the water's edge by inward offsets.
type Outline struct {
	File      string  `toml:"file"`       // a GeoJSON polygon, or
	Code      string  `toml:"code"`       // survey points with this code, joined in order
	WallSlope float64 `toml:"wall_slope"` // horizontal per vertical
	Corners   string  `toml:"corners"`    // round | sharp
	DeepDepth Length  `toml:"deep_depth"` // depth of the deep zone below the water
	Shelves   []Shelf `toml:"shelf"`      // from the edge inwards
}

// Shelf is one step of an outline design.
type Shelf struct {
	Width Length `toml:"width"`
	Depth Length `toml:"depth"`
}

// Water is the water level.
type Water struct {
	Level     Number `toml:"level"`     // an elevation, "auto" or "balance"
	Freeboard Length `toml:"freeboard"` // rim above the water
}

// Berm is the fill on low ground that carries the level rim.
type Berm struct {
	Crest Length  `toml:"crest"` // level crest width at the rim
	Slope float64 `toml:"slope"` // outer slope, horizontal per vertical
}

// Earthwork holds the soil and haul settings.
type Earthwork struct {
	Soil         string   `toml:"soil"`          // preset: topsoil, sand, clay, common earth, gravel, rock
	Swell        float64  `toml:"swell"`         // bank-to-loose factor override (e.g. 1.25)
	Compaction   float64  `toml:"compaction"`    // bank-to-compacted factor override (e.g. 0.90)
	SoilType     string   `toml:"soil_type"`     // OSHA type for the slope check: rock, A, B, C
	TopsoilDepth Length   `toml:"topsoil_depth"` // stripping depth
	Truck        string   `toml:"truck"`         // preset name
	TruckBody    []Length `toml:"truck_body"`    // length, width, depth of a custom body
	Heaped       *bool    `toml:"heaped"`        // count heaped rather than struck capacity
	ReuseCut     *bool    `toml:"reuse_cut"`     // reuse cut as berm fill (default true)
}

// Liner is the liner and underlayment order.
type Liner struct {
	Overlap      Length   `toml:"overlap"`       // anchor allowance beyond the rim
	Material     string   `toml:"material"`      // preset, e.g. epdm45
	StockWidths  []Length `toml:"stock_widths"`  // available roll widths
	StockLengths []Length `toml:"stock_lengths"` // available lengths
	Underlayment string   `toml:"underlayment"`  // preset or "none"
}

// Stone is the edge stone.
type Stone struct {
	Rock       string    `toml:"rock"`        // preset: granite, limestone, sandstone, basalt, coquina
	Density    float64   `toml:"density"`     // solid density override, kg/m³
	FaceHeight Length    `toml:"face_height"` // visible face height
	Thickness  Length    `toml:"thickness"`   // depth into the bank
	Boulders   string    `toml:"boulders"`    // allowance: "10%" or tons, e.g. "2t"
	Stretches  []Stretch `toml:"stretch"`     // chosen stretches of shoreline (default all)
}

// Stretch is a stretch of shoreline by chainage along one loop.
type Stretch struct {
	Loop int    `toml:"loop"`
	From Length `toml:"from"`
	To   Length `toml:"to"`
}

// Gravel is shelf stone and floor gravel.
type Gravel struct {
	Material  string `toml:"material"`  // preset: river rock, pea gravel ...
	Thickness Length `toml:"thickness"` // layer thickness
	Walls     bool   `toml:"walls"`     // cover the walls too, not only the floors
}

// Crew is the crew that places stone.
type Crew struct {
	Size           int     `toml:"size"`
	TonsPerHour    float64 `toml:"tons_per_worker_hour"`  // short tons per worker-hour
	MachineTonsPer float64 `toml:"machine_tons_per_hour"` // for machine-placed boulders
	HoursPerDay    float64 `toml:"hours_per_day"`
}

// Pump is the pump duty.
type Pump struct {
	TurnoverHours   float64 `toml:"turnover_hours"`   // volume turned over once every N hours
	DischargeHeight Length  `toml:"discharge_height"` // height above the water level, or
	DischargePoint  string  `toml:"discharge_point"`  // a survey point id (e.g. a waterfall top)
	PipeLength      Length  `toml:"pipe_length"`      //
	PipeDiameter    Length  `toml:"pipe_diameter"`    // inside diameter
	PipeMaterial    string  `toml:"pipe_material"`    // preset for the Hazen-Williams C factor
	FittingsLength  Length  `toml:"fittings_length"`  // fittings as equivalent pipe length
	SpillwayWidth   Length  `toml:"spillway_width"`   // waterfall weir width
	SpillwayFlow    string  `toml:"spillway_flow"`    // light | medium | heavy
	SupplyGPM       float64 `toml:"supply_gpm"`       // fill supply, US gal/min
	SupplyLPM       float64 `toml:"supply_lpm"`       // or litres/min
}

// Prices is an optional price list; zero means not priced.
type Prices struct {
	Currency         string  `toml:"currency"`
	PerCubicYardDug  float64 `toml:"per_cubic_yard_dug"`
	PerCubicMetreDug float64 `toml:"per_cubic_metre_dug"`
	PerTruckload     float64 `toml:"per_truckload"`
	PerSquareFtLiner float64 `toml:"per_square_foot_liner"`
	PerSquareMLiner  float64 `toml:"per_square_metre_liner"`
	PerSquareFtUnder float64 `toml:"per_square_foot_underlayment"`
	PerSquareMUnder  float64 `toml:"per_square_metre_underlayment"`
	PerTonStone      float64 `toml:"per_ton_stone"`
	PerTonGravel     float64 `toml:"per_ton_gravel"`
	PerCrewHour      float64 `toml:"per_crew_hour"`
	Fixed            []Item  `toml:"item"`
}

// Item is a fixed line in the price list.
type Item struct {
	Name   string  `toml:"name"`
	Amount float64 `toml:"amount"`
}

// Report holds report options.
type Report struct {
	ContourInterval Length      `toml:"contour_interval"`
	IndexEvery      int         `toml:"index_every"`
	StakeSpacing    Length      `toml:"stake_spacing"`
	ShowPoints      *bool       `toml:"show_points"`
	Sections        [][]float64 `toml:"sections"` // extra section polylines, as [x1, y1, x2, y2, ...] in survey coordinates
}

// ErrSiteFile is wrapped by every error about the content of a site file.
var ErrSiteFile = errors.New("site file")

// Load reads and checks a site file.
func Load(path string) (*Site, error) {
	data, err := os.ReadFile(path)
	if err != nil {
		return nil, err
	}
	s, err := Parse(data, path)
	if err != nil {
		return nil, err
	}
	s.Dir = filepath.Dir(path)
	return s, nil
}

// Parse decodes a site file's text; name is used in errors. Unknown keys
// are errors.
func Parse(data []byte, name string) (*Site, error) {
	var s Site
	md, err := toml.Decode(string(data), &s)
	if err != nil {
		var pe toml.ParseError
		if errors.As(err, &pe) {
			return nil, fmt.Errorf("%w %s: line %d: %s", ErrSiteFile, name, pe.Position.Line, pe.Message)
		}
		return nil, fmt.Errorf("%w %s: %w", ErrSiteFile, name, err)
	}
	if und := md.Undecoded(); len(und) > 0 {
		keys := make([]string, len(und))
		for i, k := range und {
			keys[i] = k.String()
		}
		sort.Strings(keys)
		return nil, fmt.Errorf("%w %s: unknown key %s", ErrSiteFile, name, strings.Join(keys, ", "))
	}
	return &s, nil
}

// Set overrides one key, written "section.key=value" (or "key=value" for a
// top-level key) as on the command line: `--set liner.overlap=2ft`. The
// value is read as TOML when it parses as a TOML value (numbers, booleans,
// quoted strings, arrays) and as a plain string otherwise.
func (s *Site) Set(assign string) error {
	key, val, ok := strings.Cut(assign, "=")
	key = strings.TrimSpace(key)
	if !ok || key == "" {
		return fmt.Errorf("%w: --set wants section.key=value, got %q", ErrSiteFile, assign)
	}
	val = strings.TrimSpace(val)
	// Encode the current state, then decode it again with the override
	// applied on top of the generic tree, so that every key of the schema is
	// reachable without a flag of its own.
	var buf bytes.Buffer
	if err := toml.NewEncoder(&buf).Encode(s); err != nil {
		return fmt.Errorf("%w: %w", ErrSiteFile, err)
	}
	var tree map[string]any
	if _, err := toml.Decode(buf.String(), &tree); err != nil {
		return fmt.Errorf("%w: %w", ErrSiteFile, err)
	}
	var v struct{ V any }
	if _, err := toml.Decode("V = "+val, &v); err != nil {
		v.V = val
	}
	parts := strings.Split(key, ".")
	m := tree
	for _, p := range parts[:len(parts)-1] {
		sub, ok := m[p].(map[string]any)
		if !ok {
			sub = map[string]any{}
			m[p] = sub
		}
		m = sub
	}
	m[parts[len(parts)-1]] = v.V
	buf.Reset()
	if err := toml.NewEncoder(&buf).Encode(tree); err != nil {
		return fmt.Errorf("%w: --set %s: %w", ErrSiteFile, key, err)
	}
	ns, err := Parse(buf.Bytes(), "--set "+key)
	if err != nil {
		return err
	}
	ns.Dir = s.Dir
	*s = *ns
	return nil
}

// Path resolves a path from the site file against its folder.
func (s *Site) Path(p string) string {
	if p == "" || filepath.IsAbs(p) || s.Dir == "" {
		return p
	}
	return filepath.Join(s.Dir, p)
}

// BoolOr returns *b, or def when b is nil.
func BoolOr(b *bool, def bool) bool {
	if b == nil {
		return def
	}
	return *b
}
