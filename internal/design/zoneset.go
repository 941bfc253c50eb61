package design

import (
	"math"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// kind is how a zone's wall is modelled.
type kind int8

const (
	kindRound    kind = iota // sloped, Euclidean distance
	kindSharp                // sloped, mitred distance
	kindVertical             // vertical wall
)

// pzone is a validated zone prepared for evaluation.
type pzone struct {
	name  string
	kind  kind
	depth float64 // m below the water surface
	slope float64 // H:V, > 0 unless vertical
	floor *polygon
	// rimR is the horizontal distance from the floor outline to the rim
	// line, slope·(depth + freeboard); rim is the region inside the rim
	// line for sharp corners (the floor offset by rimR with mitres).
	rimR float64
	rim  *polygon
	area float64 // floor polygon area, m²
}

// zoneSet is the prepared design: every zone and the freeboard. All its
// geometry is relative to the water surface: e(p) = E(p) − W does not
// depend on the water level W.
type zoneSet struct {
	z         []pzone
	freeboard float64
	maxDepth  float64
	hasSloped bool
}

func newZoneSet(zones []Zone, freeboard float64) (*zoneSet, error) {
	zs := &zoneSet{freeboard: freeboard}
	for i, z := range zones {
		if err := z.Validate(); err != nil {
			return nil, &ZoneError{Index: i, Name: z.Name, Err: err}
		}
		r, _ := cleanRing(z.Ring)
		p := pzone{name: z.Name, depth: z.DepthM, slope: z.WallSlope, floor: newPolygon(r), area: r.Area()}
		switch {
		case z.WallSlope == 0:
			p.kind = kindVertical
			p.rim = p.floor
		case z.Corners == Sharp:
			p.kind = kindSharp
			p.rimR = z.WallSlope * (z.DepthM + freeboard)
			p.rim = newPolygon(p.floor.mitreOffset(p.rimR))
		default:
			p.kind = kindRound
			p.rimR = z.WallSlope * (z.DepthM + freeboard)
		}
		if p.kind != kindVertical {
			zs.hasSloped = true
		}
		zs.maxDepth = max(zs.maxDepth, z.DepthM)
		zs.z = append(zs.z, p)
	}
	return zs, nil
}

// zoneRel returns e_i(p) = E_i(p) − W for zone i and its distance ρ_i(p)
// to the zone's rim region {e_i ≤ freeboard}, by brute force over the
// zone's edges.
func (zs *zoneSet) zoneRel(i int, p geom.Vec2) (e, rho float64) {
	z := &zs.z[i]
	switch z.kind {
	case kindSharp:
		m := z.floor.mitreDist(p)
		return -z.depth + m/z.slope, z.rim.dist(p)
	case kindVertical:
		d := z.floor.dist(p)
		if d == 0 {
			return -z.depth, 0
		}
		return math.Inf(1), d
	}
	d := z.floor.dist(p)
	return -z.depth + d/z.slope, max(0, d-z.rimR)
}

// rel returns e(p) = min_i e_i(p) over every zone but exclude (−1 for
// none), the zone giving it (−1 when e is +Inf), and ρ(p), the distance to
// the rim set {e ≤ freeboard}, over all zones. Ties go to the lower index.
func (zs *zoneSet) rel(p geom.Vec2, exclude int) (e float64, own int, rho float64) {
	e, own, rho = math.Inf(1), -1, math.Inf(1)
	for i := range zs.z {
		ei, ri := zs.zoneRel(i, p)
		rho = min(rho, ri)
		if i != exclude && ei < e {
			e, own = ei, i
		}
	}
	return e, own, rho
}

// floorBox returns the box of all zone floors.
func (zs *zoneSet) floorBox() geom.Box {
	b := geom.EmptyBox()
	for i := range zs.z {
		b = b.Union(zs.z[i].floor.box)
	}
	return b
}

// rimBox returns the box of the rim set {e ≤ freeboard}.
func (zs *zoneSet) rimBox() geom.Box {
	b := geom.EmptyBox()
	for i := range zs.z {
		z := &zs.z[i]
		switch z.kind {
		case kindRound:
			b = b.Union(z.floor.box.Expand(z.rimR))
		default:
			b = b.Union(z.rim.box)
		}
	}
	return b
}

// workBox returns a box holding every point where the finished grade can
// differ from existing ground whose elevations lie in [gmin, gmax], for
// water level w and a berm of crest c and outer slope bs: the bowl up to
// daylight at gmax and the berm down to gmin.
func (zs *zoneSet) workBox(w, gmin, gmax, c, bs float64) geom.Box {
	rim := w + zs.freeboard
	bermReach := c + bs*max(0, rim-gmin)
	b := zs.rimBox()
	for i := range zs.z {
		z := &zs.z[i]
		day := z.slope * max(0, gmax-(w-z.depth)) // daylight distance from the floor
		switch z.kind {
		case kindRound:
			b = b.Union(z.floor.box.Expand(max(day, z.rimR+bermReach)))
		case kindSharp:
			b = b.Union(newPolygon(z.floor.mitreOffset(day)).box)
			b = b.Union(z.rim.box.Expand(bermReach))
		case kindVertical:
			b = b.Union(z.floor.box.Expand(bermReach))
		}
	}
	return b
}

// waterBox returns a box holding the water, {e ≤ 0}: each floor grown by
// its wall's run over its depth.
func (zs *zoneSet) waterBox() geom.Box {
	b := geom.EmptyBox()
	for i := range zs.z {
		z := &zs.z[i]
		switch z.kind {
		case kindRound:
			b = b.Union(z.floor.box.Expand(z.slope * z.depth))
		case kindSharp:
			b = b.Union(newPolygon(z.floor.mitreOffset(z.slope * z.depth)).box)
		default:
			b = b.Union(z.floor.box)
		}
	}
	return b
}
