package design

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math"
	"strings"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/units"
)

// Limits on zone files, so a wrong file fails fast instead of filling
// memory.
const (
	// MaxZoneFileBytes is the largest zone file read, 16 MiB.
	MaxZoneFileBytes = 16 << 20
	// MaxZoneVertices is the most vertices all zones of a file may have.
	MaxZoneVertices = 100_000
)

// ReadZonesGeoJSON reads depth zones from a GeoJSON document (RFC 7946): a
// FeatureCollection, or a single Feature, of Polygon or MultiPolygon
// features. Each polygon's exterior ring is a zone floor; holes are an
// error. Properties:
//
//   - depth (required): the floor's depth below the water surface, a
//     number in the survey's units u or a string with a unit ("9in",
//     "0.75ft", "0.3 m");
//   - wall_slope (required): horizontal run per unit of rise, a number or
//     a string such as "2", "2:1", "2H:1V" or "1V:2H" (0 is a vertical
//     wall);
//   - name (optional), and corners (optional): "round" or "sharp".
//
// Every position goes through toLocal, which converts file coordinates
// (lon/lat per RFC 7946, or projected coordinates) to the local frame and
// may reject them. name labels errors, which are [*FeatureError] values
// wrapping [ErrGeoJSON] or [ErrZone]. The rings of a MultiPolygon become
// zones named "name (part i of n)". Rings must be closed (first position
// repeated last, RFC 7946 §3.1.6) and simple.
func ReadZonesGeoJSON(r io.Reader, name string, toLocal func(x, y float64) (geom.Vec2, error), u units.System) ([]Zone, error) {
	data, err := io.ReadAll(io.LimitReader(r, MaxZoneFileBytes+1))
	if err != nil {
		return nil, fmt.Errorf("%s: %w", name, err)
	}
	if len(data) > MaxZoneFileBytes {
		return nil, fmt.Errorf("%s: %w: larger than %d bytes", name, ErrGeoJSON, MaxZoneFileBytes)
	}
	var top struct {
		Type     string            `json:"type"`
		Features []json.RawMessage `json:"features"`
	}
	if err := json.Unmarshal(data, &top); err != nil {
		return nil, fmt.Errorf("%s: %w: %w", name, ErrGeoJSON, err)
	}
	var feats []json.RawMessage
	switch top.Type {
	case "FeatureCollection":
		feats = top.Features
	case "Feature":
		feats = []json.RawMessage{data}
	default:
		return nil, fmt.Errorf("%s: %w: top-level type %q, want FeatureCollection or Feature", name, ErrGeoJSON, top.Type)
	}
	var zones []Zone
	vertices := 0
	for i, raw := range feats {
		zs, n, err := readFeature(raw, toLocal, u)
		vertices += n
		if err == nil && vertices > MaxZoneVertices {
			err = fmt.Errorf("%w: more than %d vertices in the file", ErrGeoJSON, MaxZoneVertices)
		}
		if err != nil {
			fe := &FeatureError{File: name, Feature: i, Err: err}
			var nm struct {
				Properties struct {
					Name any `json:"name"`
				} `json:"properties"`
			}
			if json.Unmarshal(raw, &nm) == nil {
				if s, ok := nm.Properties.Name.(string); ok {
					fe.Name = s
				}
			}
			return nil, fe
		}
		zones = append(zones, zs...)
	}
	if len(zones) == 0 {
		return nil, fmt.Errorf("%s: %w: no zones", name, ErrGeoJSON)
	}
	return zones, nil
}

func readFeature(raw json.RawMessage, toLocal func(x, y float64) (geom.Vec2, error), u units.System) ([]Zone, int, error) {
	var f struct {
		Type     string `json:"type"`
		Geometry *struct {
			Type        string          `json:"type"`
			Coordinates json.RawMessage `json:"coordinates"`
		} `json:"geometry"`
		Properties map[string]json.RawMessage `json:"properties"`
	}
	if err := json.Unmarshal(raw, &f); err != nil {
		return nil, 0, fmt.Errorf("%w: %w", ErrGeoJSON, err)
	}
	if f.Type != "Feature" {
		return nil, 0, fmt.Errorf("%w: type %q, want Feature", ErrGeoJSON, f.Type)
	}
	if f.Geometry == nil {
		return nil, 0, fmt.Errorf("%w: no geometry", ErrGeoJSON)
	}
	var polys [][][][]float64
	switch f.Geometry.Type {
	case "Polygon":
		var p [][][]float64
		if err := decodeCoords(f.Geometry.Coordinates, &p); err != nil {
			return nil, 0, err
		}
		polys = [][][][]float64{p}
	case "MultiPolygon":
		if err := decodeCoords(f.Geometry.Coordinates, &polys); err != nil {
			return nil, 0, err
		}
	default:
		return nil, 0, fmt.Errorf("%w: geometry type %q is not a zone (want Polygon or MultiPolygon)", ErrGeoJSON, f.Geometry.Type)
	}
	base := Zone{}
	var err error
	if base.Name, err = stringProp(f.Properties, "name"); err != nil {
		return nil, 0, err
	}
	if base.DepthM, err = depthProp(f.Properties, u); err != nil {
		return nil, 0, err
	}
	if base.WallSlope, err = slopeProp(f.Properties); err != nil {
		return nil, 0, err
	}
	c, err := stringProp(f.Properties, "corners")
	if err != nil {
		return nil, 0, err
	}
	switch strings.ToLower(strings.TrimSpace(c)) {
	case "", "round":
		base.Corners = Round
	case "sharp", "mitre", "miter":
		base.Corners = Sharp
	default:
		return nil, 0, fmt.Errorf("%w: corners %q, want \"round\" or \"sharp\"", ErrGeoJSON, c)
	}
	if len(polys) == 0 {
		return nil, 0, fmt.Errorf("%w: empty MultiPolygon", ErrGeoJSON)
	}
	var zones []Zone
	n := 0
	for pi, p := range polys {
		where := ""
		if len(polys) > 1 {
			where = fmt.Sprintf("polygon %d: ", pi)
		}
		if len(p) == 0 {
			return nil, n, fmt.Errorf("%w: %spolygon has no ring", ErrGeoJSON, where)
		}
		if len(p) > 1 {
			return nil, n, fmt.Errorf("%w: %spolygon has %d holes; a zone cannot have holes (make each hole its own zone, or split the zone)",
				ErrZone, where, len(p)-1)
		}
		pos := p[0]
		n += len(pos)
		if n > MaxZoneVertices {
			return nil, n, fmt.Errorf("%w: more than %d vertices in the file", ErrGeoJSON, MaxZoneVertices)
		}
		if len(pos) < 4 {
			return nil, n, fmt.Errorf("%w: %sring has %d positions, need at least 4 (3 corners and the closing repeat)", ErrZone, where, len(pos))
		}
		for k, q := range pos {
			if len(q) < 2 {
				return nil, n, fmt.Errorf("%w: %sposition %d has %d numbers, need x and y", ErrGeoJSON, where, k, len(q))
			}
		}
		first, last := pos[0], pos[len(pos)-1]
		if first[0] != last[0] || first[1] != last[1] {
			return nil, n, fmt.Errorf("%w: %sring is not closed: first position (%g, %g) differs from last (%g, %g)",
				ErrZone, where, first[0], first[1], last[0], last[1])
		}
		ring := make(geom.Ring, 0, len(pos)-1)
		for k, q := range pos[:len(pos)-1] {
			v, err := toLocal(q[0], q[1])
			if err != nil {
				return nil, n, fmt.Errorf("%sposition %d (%g, %g): %w", where, k, q[0], q[1], err)
			}
			ring = append(ring, v)
		}
		z := base
		z.Ring = ring
		if len(polys) > 1 && z.Name != "" {
			z.Name = fmt.Sprintf("%s (part %d of %d)", base.Name, pi+1, len(polys))
		}
		if err := z.Validate(); err != nil {
			if where != "" {
				return nil, n, fmt.Errorf("%s%w", where, err)
			}
			return nil, n, err
		}
		zones = append(zones, z)
	}
	return zones, n, nil
}

// decodeCoords decodes GeoJSON coordinates, rejecting anything but numbers.
func decodeCoords(raw json.RawMessage, v any) error {
	if len(raw) == 0 || bytes.Equal(raw, []byte("null")) {
		return fmt.Errorf("%w: no coordinates", ErrGeoJSON)
	}
	if err := json.Unmarshal(raw, v); err != nil {
		return fmt.Errorf("%w: coordinates: %w", ErrGeoJSON, err)
	}
	return nil
}

func stringProp(props map[string]json.RawMessage, key string) (string, error) {
	raw, ok := props[key]
	if !ok || bytes.Equal(raw, []byte("null")) {
		return "", nil
	}
	var s string
	if err := json.Unmarshal(raw, &s); err != nil {
		return "", fmt.Errorf("%w: property %q: want a string, got %s", ErrGeoJSON, key, raw)
	}
	return s, nil
}

// numberOrString returns a property that is a JSON number (as text) or a
// string.
func numberOrString(props map[string]json.RawMessage, key string) (num *float64, str string, err error) {
	raw, ok := props[key]
	if !ok || bytes.Equal(raw, []byte("null")) {
		return nil, "", fmt.Errorf("%w: property %q is missing", ErrZone, key)
	}
	var f float64
	if json.Unmarshal(raw, &f) == nil {
		return &f, "", nil
	}
	if err := json.Unmarshal(raw, &str); err != nil {
		return nil, "", fmt.Errorf("%w: property %q: want a number or a string, got %s", ErrGeoJSON, key, raw)
	}
	return nil, str, nil
}

func depthProp(props map[string]json.RawMessage, u units.System) (float64, error) {
	num, s, err := numberOrString(props, "depth")
	if err != nil {
		return 0, err
	}
	if num != nil {
		return *num * u.Metres(), nil
	}
	d, err := units.ParseLength(s, u)
	if err != nil {
		return 0, fmt.Errorf("%w: depth: %w", ErrZone, err)
	}
	return d, nil
}

// errSlope is wrapped for a wall slope that cannot be read.
var errSlope = errors.New("want a number of horizontal units per vertical unit, such as 2, \"2:1\" or \"2H:1V\"")

func slopeProp(props map[string]json.RawMessage) (float64, error) {
	num, s, err := numberOrString(props, "wall_slope")
	if err != nil {
		if errors.Is(err, ErrZone) {
			return 0, fmt.Errorf("%w (0 for a vertical wall)", err)
		}
		return 0, err
	}
	if num != nil {
		return *num, nil
	}
	v, err := parseSlope(s)
	if err != nil {
		return 0, fmt.Errorf("%w: wall_slope %q: %w", ErrZone, s, err)
	}
	return v, nil
}

// parseSlope reads "2", "2:1", "2H:1V", "1V:2H" (case-insensitive) as
// horizontal per vertical. A bare ratio "a:b" is horizontal:vertical, the
// trade's usual order.
func parseSlope(s string) (float64, error) {
	t := strings.ToLower(strings.ReplaceAll(strings.TrimSpace(s), " ", ""))
	if !strings.Contains(t, ":") {
		v, err := units.ParseNumber(t)
		if err != nil {
			return 0, errSlope
		}
		return v, nil
	}
	a, b, _ := strings.Cut(t, ":")
	num := func(p string) (float64, byte, error) {
		var tag byte
		if n := len(p); n > 0 && (p[n-1] == 'h' || p[n-1] == 'v') {
			tag, p = p[n-1], p[:n-1]
		}
		v, err := units.ParseNumber(p)
		return v, tag, err
	}
	x, ta, err1 := num(a)
	y, tb, err2 := num(b)
	if err1 != nil || err2 != nil || ta == tb && ta != 0 {
		return 0, errSlope
	}
	if ta == 'v' || tb == 'h' {
		x, y = y, x
	}
	if y == 0 || math.IsInf(x/y, 0) {
		return 0, errSlope
	}
	return x / y, nil
}
