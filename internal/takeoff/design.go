package takeoff

import (
	"fmt"
	"math"

	"github.com/dugout-estimating/dugout/internal/design"
)

// FromDesign runs the takeoff on a design surface: its bowl mesh over the
// lined area, the analytic bowl, the zones with the design's floor areas,
// the water level, rim and water quantities, the deepest cut below existing
// ground (for the cautions) and the bank cut volume (for pricing; haul
// loads come from the cut/fill accounting, so Truckloads is left 0: set
// prices per load through [Compute] with Input.Truckloads instead).
//
// Each triangle of the bowl mesh is given the zone that owns the lowest
// corner of the lattice cell it lies in (design.Surface.Owner), good to
// about a cell along the lines where zones meet, as the design's own split
// of the cut.
func FromDesign(s *design.Surface, o Options) (Result, error) {
	in, err := InputFromDesign(s)
	if err != nil {
		return Result{}, err
	}
	return Compute(in, o)
}

// InputFromDesign reads the takeoff's input from a design surface (see
// [FromDesign]); callers add earthwork quantities such as Truckloads before
// calling [Compute].
func InputFromDesign(s *design.Surface) (Input, error) {
	if s == nil {
		return Input{}, fmt.Errorf("%w: no design surface", ErrInput)
	}
	m := s.BowlMesh()
	in := Input{
		BowlMesh:      m,
		Bowl:          s,
		WaterLevelM:   s.WaterLevelM,
		RimM:          s.RimM,
		WaterVolumeM3: s.WaterVolumeM3,
		WaterAreaM2:   s.WaterAreaM2,
		MaxDepthM:     s.MaxDepthM,
		MeanDepthM:    s.MeanDepthM,
		CutM3:         s.CutM3,
	}
	for i, z := range s.Params.Zones {
		tz := Zone{Name: z.Name, Ring: z.Ring, DepthM: z.DepthM, WallSlope: z.WallSlope}
		if i < len(s.ByZone) && s.ByZone[i].Name == z.Name {
			tz.FloorAreaM2 = s.ByZone[i].FloorAreaM2
		}
		in.Zones = append(in.Zones, tz)
	}
	l := s.Lattice
	if l.NX > 1 && l.NY > 1 && l.H > 0 && len(s.E) == l.Len() {
		in.TriangleZone = make([]int, m.NumTriangles())
		for t := range in.TriangleZone {
			a, b, c := m.Triangle(t)
			cx, cy := (a.X+b.X+c.X)/3, (a.Y+b.Y+c.Y)/3
			i := min(max(int(math.Floor((cx-l.X0)/l.H)), 0), l.NX-2)
			j := min(max(int(math.Floor((cy-l.Y0)/l.H)), 0), l.NY-2)
			k := l.Index(i, j)
			low := k
			if q := k + 1; s.E[q] < s.E[low] {
				low = q
			}
			if q := k + l.NX; s.E[q] < s.E[low] {
				low = q
			}
			if q := k + l.NX + 1; s.E[q] < s.E[low] {
				low = q
			}
			in.TriangleZone[t] = s.Owner(low)
		}
	}
	// The deepest cut below existing ground, over the surveyed nodes.
	deepest := 0.0
	for k, d := range s.D[:min(len(s.D), len(s.G))] {
		if g := s.G[k]; isFinite(g) && isFinite(d) {
			deepest = max(deepest, g-d)
		}
	}
	in.MaxCutDepthM = deepest
	return in, nil
}

var _ Bowl = (*design.Surface)(nil)
