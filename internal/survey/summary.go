package survey

import (
	"fmt"
	"math"
	"slices"

	"github.com/dugout-estimating/dugout/internal/crs"
	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/units"
)

// Plausibility limits for elevations (see [Set.Summary]).
const (
	// MaxElevationM is the highest elevation taken as real ground: above
	// Mount Everest, 8848.86 m (2020 survey by China and Nepal; from
	// memory), with margin.
	MaxElevationM = 9000
	// MinElevationM is the lowest: below the shore of the Dead Sea, about
	// −430 m (from memory), with margin. A site grid on an assumed datum
	// (100.00 at a benchmark) stays well inside.
	MinElevationM = -500
	// MaxReliefRatio is the largest elevation range, as a multiple of the
	// plan diagonal, taken as real: a site steeper than 1:1 from corner to
	// corner is no garden, so elevations in another unit than the plan
	// (millimetres, or feet against metres) are the likelier cause.
	MaxReliefRatio = 1.0
)

// PointRef names a point for a report.
type PointRef struct {
	ID   string
	File string
	Line int
}

func refOf(p Point) PointRef { return PointRef{ID: p.ID, File: p.File, Line: p.Line} }

// Duplicate is a shot within the duplicate tolerance of an earlier one.
type Duplicate struct {
	Point, Of PointRef
	// PlanDistM is the plan distance and DzM the elevation difference
	// (Point − Of; NaN when either has none), in metres.
	PlanDistM, DzM float64
	// Exact reports whether the two positions are identical, elevation
	// included.
	Exact bool
}

// Accuracy summarises an accuracy column, in metres. N is 0 when the input
// has none. Median and P95 are linearly interpolated percentiles (the
// "linear" method, Hyndman & Fan 1996 definition 7, numpy's default).
type Accuracy struct {
	N                         int
	MinM, MedianM, P95M, MaxM float64
}

// Summary is the validation of a set of survey points.
type Summary struct {
	Count      int
	Files      []FileInfo
	Units      units.System
	CRS        crs.CRS
	Geographic bool
	// BoundsM is the plan extent in world metres (empty when no points);
	// [Summary.Bounds] gives it in another unit.
	BoundsM geom.Box
	// LonLat is the extent in degrees (X longitude, Y latitude) of a set
	// read from lon/lat; empty otherwise.
	LonLat geom.Box
	// ElevMinM and ElevMaxM are the elevation range in metres, NaN when no
	// point has an elevation.
	ElevMinM, ElevMaxM float64
	// MissingZ counts points without elevation.
	MissingZ int
	// Breaklines and Boundaries count the set's lines and polygons.
	Breaklines, Boundaries int
	// DupTolM and ConflictTolM are the tolerances used, in metres.
	DupTolM, ConflictTolM float64
	// Duplicates lists every shot within DupTolM in plan of an earlier
	// one, paired with the earliest such; ExactDuplicates and
	// NearDuplicates count them by kind.
	Duplicates                      []Duplicate
	ExactDuplicates, NearDuplicates int
	// Conflicts are the duplicates whose elevations differ by more than
	// ConflictTolM.
	Conflicts []Duplicate
	// Spikes are the suspected spikes (see the spike test in
	// docs/input-formats.md); SpikeThresholdM is the residual threshold
	// used (NaN when the set is too small to test).
	Spikes          []Spike
	SpikeThresholdM float64
	// HAcc and VAcc summarise the horizontal and vertical accuracy columns.
	HAcc, VAcc Accuracy
	// Warnings are the set's reading warnings followed by those of the
	// validation.
	Warnings []Warning
}

// Bounds returns the plan extent in world coordinates in unit system u.
func (s Summary) Bounds(u units.System) geom.Box {
	if s.BoundsM.IsEmpty() {
		return s.BoundsM
	}
	f := u.Metres()
	return geom.Box{Min: s.BoundsM.Min.Scale(1 / f), Max: s.BoundsM.Max.Scale(1 / f)}
}

// Summary validates the set and summarises it: counts, bounds, elevation
// range, duplicates and conflicting duplicates, suspected spikes, accuracy
// statistics and the plausibility of the elevations for the units. It
// recomputes everything on each call (O(n log n) in the point count).
func (s *Set) Summary() Summary {
	tol := s.tol
	if tol == (tolerances{}) {
		tol = tolerances{dupM: DefaultDupTolM, conflictM: DefaultConflictTolM}
	}
	sum := Summary{
		Count: len(s.Points), Files: s.Files, Units: s.Units, CRS: s.CRS, Geographic: s.Geographic,
		BoundsM: geom.EmptyBox(), LonLat: geom.EmptyBox(),
		ElevMinM: math.NaN(), ElevMaxM: math.NaN(),
		Breaklines: len(s.Breaklines), Boundaries: len(s.Boundaries),
		DupTolM: tol.dupM, ConflictTolM: tol.conflictM,
		Warnings: slices.Clone(s.Warnings),
	}
	var hacc, vacc []float64
	for _, p := range s.Points {
		w := s.Frame.ToWorld(p.P.XY())
		sum.BoundsM = sum.BoundsM.Extend(w)
		if p.HasZ() {
			sum.ElevMinM = minNaN(sum.ElevMinM, p.P.Z)
			sum.ElevMaxM = maxNaN(sum.ElevMaxM, p.P.Z)
		} else {
			sum.MissingZ++
		}
		if !math.IsNaN(p.HAccM) {
			hacc = append(hacc, p.HAccM)
		}
		if !math.IsNaN(p.VAccM) {
			vacc = append(vacc, p.VAccM)
		}
		if s.Geographic && s.CRS.UTM != nil {
			if lon, lat, err := s.CRS.UTM.Inverse(w.X, w.Y); err == nil {
				sum.LonLat = sum.LonLat.Extend(geom.Vec2{X: lon, Y: lat})
			}
		}
	}
	sum.HAcc, sum.VAcc = accuracyOf(hacc), accuracyOf(vacc)
	sum.Duplicates = findDuplicates(s.Points, tol.dupM)
	for _, d := range sum.Duplicates {
		if d.Exact {
			sum.ExactDuplicates++
		} else {
			sum.NearDuplicates++
		}
		if math.Abs(d.DzM) > tol.conflictM {
			sum.Conflicts = append(sum.Conflicts, d)
		}
	}
	sum.Spikes, sum.SpikeThresholdM = findSpikes(s.Points, tol.dupM)
	sum.Warnings = append(sum.Warnings, validationWarnings(&sum)...)
	return sum
}

func minNaN(a, b float64) float64 {
	if math.IsNaN(a) {
		return b
	}
	return math.Min(a, b)
}

func maxNaN(a, b float64) float64 {
	if math.IsNaN(a) {
		return b
	}
	return math.Max(a, b)
}

// maxListed is how many conflicts and spikes get a warning each; the rest
// are counted in one (all of them are in the Summary).
const maxListed = 10

// validationWarnings turns the findings of a summary into warnings with
// their evidence.
func validationWarnings(sum *Summary) []Warning {
	var out []Warning
	u := sum.Units
	in := func(m float64) string { return fmt.Sprintf("%.3f %s", m/u.Metres(), u) }
	if n := sum.ExactDuplicates; n > 0 {
		d := firstOf(sum.Duplicates, true)
		out = append(out, warnf(d.Point.File, d.Point.Line, "%s; first: %q repeats %q (line %d)", plural(n, "exact duplicate shot"), d.Point.ID, d.Of.ID, d.Of.Line))
	}
	if n := sum.NearDuplicates; n > 0 {
		d := firstOf(sum.Duplicates, false)
		out = append(out, warnf(d.Point.File, d.Point.Line, "%s within %s of an earlier one; first: %q is %s from %q (line %d)", plural(n, "shot"), in(sum.DupTolM), d.Point.ID, in(d.PlanDistM), d.Of.ID, d.Of.Line))
	}
	for i, d := range sum.Conflicts {
		if i == maxListed {
			out = append(out, warnf("", 0, "... and %d more conflicting duplicates", len(sum.Conflicts)-maxListed))
			break
		}
		out = append(out, warnf(d.Point.File, d.Point.Line, "conflicting duplicate: %q and %q (%s line %d) are %s apart in plan but differ by %s in elevation (tolerance %s)",
			d.Point.ID, d.Of.ID, d.Of.File, d.Of.Line, in(d.PlanDistM), in(math.Abs(d.DzM)), in(sum.ConflictTolM)))
	}
	for i, sp := range sum.Spikes {
		if i == maxListed {
			out = append(out, warnf("", 0, "... and %d more suspected spikes", len(sum.Spikes)-maxListed))
			break
		}
		dir := "above the highest"
		if sp.BeyondM < 0 {
			dir = "below the lowest"
		}
		out = append(out, warnf(sp.Point.File, sp.Point.Line, "suspected spike: %q lies %s %s of its %d nearest neighbours (residual %s against their plane, threshold %s): a rod on a stake or in a hole?",
			sp.Point.ID, in(math.Abs(sp.BeyondM)), dir, SpikeNeighbours, in(sp.ResidualM), in(sum.SpikeThresholdM)))
	}
	if !math.IsNaN(sum.ElevMaxM) {
		if sum.ElevMaxM > MaxElevationM {
			out = append(out, warnf("", 0, "the highest elevation, %s (%.0f m), is above any ground on Earth: are the elevations in another unit than --units %s?", in(sum.ElevMaxM), sum.ElevMaxM, u))
		}
		if sum.ElevMinM < MinElevationM {
			out = append(out, warnf("", 0, "the lowest elevation, %s (%.0f m), is below any dry ground on Earth: are the elevations in another unit than --units %s?", in(sum.ElevMinM), sum.ElevMinM, u))
		}
		relief := sum.ElevMaxM - sum.ElevMinM
		diag := sum.BoundsM.Max.Distance(sum.BoundsM.Min)
		if sum.Count >= 3 && diag > 0 && relief > MaxReliefRatio*diag {
			out = append(out, warnf("", 0, "the elevations span %s over a site %s across, steeper than 1:1 overall: are the elevations in the same unit as the positions (--units %s)?", in(relief), in(diag), u))
		}
	}
	return out
}

// plural returns "1 shot" or "n shots".
func plural(n int, noun string) string {
	if n == 1 {
		return "1 " + noun
	}
	return fmt.Sprintf("%d %ss", n, noun)
}

func firstOf(ds []Duplicate, exact bool) Duplicate {
	for _, d := range ds {
		if d.Exact == exact {
			return d
		}
	}
	return Duplicate{}
}

// findDuplicates pairs every point with the earliest earlier point within
// tolM in plan. Points are hashed into square cells of side tolM (or by
// exact position when tolM is 0), so each is compared only with the points
// of its own and the 8 surrounding cells.
func findDuplicates(pts []Point, tolM float64) []Duplicate {
	type key struct{ i, j int64 }
	cell := tolM
	if !(cell > 0) {
		cell = 0
	}
	keyOf := func(v geom.Vec2) key {
		if cell == 0 {
			return key{int64(math.Float64bits(v.X)), int64(math.Float64bits(v.Y))}
		}
		return key{int64(math.Floor(v.X / cell)), int64(math.Floor(v.Y / cell))}
	}
	buckets := make(map[key][]int32, len(pts))
	var out []Duplicate
	tol2 := tolM * tolM
	for i, p := range pts {
		v := p.P.XY()
		k := keyOf(v)
		best := -1
		span := int64(1)
		if cell == 0 {
			span = 0
		}
		for dj := -span; dj <= span; dj++ {
			for di := -span; di <= span; di++ {
				for _, j := range buckets[key{k.i + di, k.j + dj}] {
					if v.DistanceSquared(pts[j].P.XY()) <= tol2 && (best < 0 || int(j) < best) {
						best = int(j)
					}
				}
			}
		}
		if best >= 0 {
			q := pts[best]
			out = append(out, Duplicate{Point: refOf(p), Of: refOf(q),
				PlanDistM: v.Distance(q.P.XY()), DzM: p.P.Z - q.P.Z,
				Exact: p.P == q.P})
		}
		buckets[k] = append(buckets[k], int32(i))
	}
	return out
}

// accuracyOf summarises accuracy values (reordering v).
func accuracyOf(v []float64) Accuracy {
	if len(v) == 0 {
		return Accuracy{MinM: math.NaN(), MedianM: math.NaN(), P95M: math.NaN(), MaxM: math.NaN()}
	}
	slices.Sort(v)
	return Accuracy{N: len(v), MinM: v[0], MedianM: percentile(v, 0.5), P95M: percentile(v, 0.95), MaxM: v[len(v)-1]}
}

// percentile returns the q-quantile (0 ≤ q ≤ 1) of sorted v by linear
// interpolation between closest ranks: h = (n−1)·q, v[⌊h⌋] + (h−⌊h⌋)·(v[⌊h⌋+1]
// − v[⌊h⌋]) (Hyndman & Fan, "Sample quantiles in statistical packages",
// Am. Stat. 50, 1996, definition 7).
func percentile(v []float64, q float64) float64 {
	h := float64(len(v)-1) * q
	lo := int(math.Floor(h))
	if lo >= len(v)-1 {
		return v[len(v)-1]
	}
	return v[lo] + (h-float64(lo))*(v[lo+1]-v[lo])
}
