package estimate

import (
	"cmp"
	"errors"
	"fmt"
	"math"
	"slices"

	"github.com/dugout-estimating/dugout/internal/contours"
	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/takeoff"
	"github.com/dugout-estimating/dugout/internal/units"
)

// StakeLine says which line of the job a grade stake marks.
type StakeLine int

const (
	// NoLine is the zero StakeLine; Stakeout never returns it.
	NoLine StakeLine = iota
	// WaterEdge is the water's edge at the water level (the shoreline).
	WaterEdge
	// FloorEdge is the edge of a zone's flat floor, where its wall starts.
	FloorEdge
	// Daylight is where a cut wall comes out of the existing ground, above
	// the rim: the outer edge of the cut.
	Daylight
	// Toe is where a fill berm meets the existing ground, below the rim:
	// the outer edge of the fill.
	Toe
)

// String returns the line's name as a crew reads it on a cut sheet.
func (l StakeLine) String() string {
	switch l {
	case WaterEdge:
		return "water's edge"
	case FloorEdge:
		return "floor edge"
	case Daylight:
		return "daylight (top of cut)"
	case Toe:
		return "toe of fill"
	}
	return "no line"
}

// Stake spacing defaults and limits.
const (
	// DefaultStakeSpacingFeetM is the stake spacing for jobs printed in
	// feet, 3 ft (0.9144 m), and DefaultStakeSpacingMetricM the one for
	// metric jobs, 1 m (common practice for a small pond, no source).
	DefaultStakeSpacingFeetM   = 3 * units.Foot
	DefaultStakeSpacingMetricM = 1.0
	// MinStakeSpacingM is the closest spacing accepted, 1 cm: closer stakes
	// could not be told apart on the ground, and a spacing typed in the
	// wrong unit fails instead of writing a huge sheet.
	MinStakeSpacingM = 0.01
	// MaxStakes bounds the number of stakes of one cut sheet.
	MaxStakes = 20000
	// minEdgeCells is the shortest piece of the work edge kept, in lattice
	// cells of length: shorter pieces are specks where the finished grade
	// happens to equal the ground at one or two lattice nodes, not a line
	// anyone stakes.
	minEdgeCells = 8
)

// ErrStakeout is wrapped by every error of [Stakeout] and [StakeSpacing].
var ErrStakeout = errors.New("stakeout")

// StakePoint is one grade stake of the cut sheet. Positions are in metres:
// Local in the local frame, EastingM and NorthingM in the survey's world
// frame (Survey.Frame.ToWorld of Local); elevations are metres on the
// survey's datum.
type StakePoint struct {
	// ID names the stake: W1, W2 … along the water's edge, Z<k>-1, Z<k>-2 …
	// along the floor edge of zone k (1-based, in Result.Zones order), and
	// T1, T2 … along the outer edge of the work (daylight and toe).
	ID   string
	Line StakeLine
	// Zone is the zone's name, for FloorEdge stakes.
	Zone string
	// Piece is the 0-based piece of its line the stake is on: the
	// shoreline loop, the zone index, or the piece of the work edge.
	Piece int
	// ChainageM is the distance along the piece from its first stake.
	ChainageM float64

	Local               geom.Vec2
	EastingM, NorthingM float64
	// ExistingM is the existing ground G from the TIN, FinishedM the
	// finished grade D, and CutM = G − D: positive is cut (dig), negative
	// is fill (build up).
	ExistingM, FinishedM, CutM float64
	// Note says which line the stake is on, e.g. "floor edge of shelf 1".
	Note string
}

// StakeSpacing returns the stake spacing of job j in metres: the site
// file's report.stake_spacing when given, else DefaultStakeSpacingFeetM
// when results are printed in feet and DefaultStakeSpacingMetricM
// otherwise.
func StakeSpacing(j *Job) (float64, error) {
	if j == nil {
		return 0, fmt.Errorf("%w: no job", ErrStakeout)
	}
	if j.Site != nil && j.Site.Report.StakeSpacing.IsSet() {
		v, err := j.Site.Report.StakeSpacing.Metres(j.Units, 0)
		if err != nil {
			return 0, fmt.Errorf("%w: report.stake_spacing: %w", ErrStakeout, err)
		}
		if err := checkSpacing(v); err != nil {
			return 0, fmt.Errorf("report.stake_spacing: %w", err)
		}
		return v, nil
	}
	if j.OutUnits.IsImperial() {
		return DefaultStakeSpacingFeetM, nil
	}
	return DefaultStakeSpacingMetricM, nil
}

func checkSpacing(s float64) error {
	if !(s >= MinStakeSpacingM) || math.IsInf(s, 0) {
		return fmt.Errorf("%w: spacing must be a finite length >= %g m, got %g", ErrStakeout, MinStakeSpacingM, s)
	}
	return nil
}

// Stakeout returns the cut sheet of r: stakes along the water's edge (the
// takeoff's shoreline loops, or the outline ring when there are none),
// along the floor edge of every zone, and along the outer edge of the work
// ([Result.WorkEdge]), in that order, each line's stakes in order along it.
// spacingM is the greatest distance between stakes along a line (m); 0
// means [StakeSpacing] of the job. A closed line of length L gets
// n = ⌈L/spacing⌉ stakes exactly L/n apart, starting at its westernmost
// point (least x, then least y) and running counter-clockwise; an open line
// gets a stake at both ends and n − 1 evenly between.
//
// Elevations: G is the TIN (the lattice's G where the TIN has no value;
// a point with neither is left out). D is the exact bowl inside the rim
// (the water's edge and floor edges, so D there is the water level and the
// floor's elevation to round-off) and the lattice's finished grade outside
// it. On the work edge D = G by definition: those stakes mark where the
// earthwork stops, and lie on the last lattice nodes where D = G, at most
// one lattice cell diagonal outside the true line. A work-edge stake is
// Daylight where the ground there is at or above the rim, Toe where it is
// below.
//
// Errors, wrapping ErrStakeout: a result without a design, a spacing that
// is negative, not finite or under MinStakeSpacingM, and more than
// MaxStakes stakes. The result is deterministic.
func Stakeout(r *Result, spacingM float64) ([]StakePoint, error) {
	if r == nil || r.Design == nil || r.Survey == nil || r.Terrain == nil {
		return nil, fmt.Errorf("%w: the result has no design", ErrStakeout)
	}
	if spacingM == 0 {
		var err error
		if spacingM, err = StakeSpacing(r.Job); err != nil {
			return nil, err
		}
	} else if err := checkSpacing(spacingM); err != nil {
		return nil, err
	}

	type piece struct {
		line   StakeLine
		zone   string
		zoneNo int
		index  int
		pts    []geom.Vec2
		closed bool
	}
	var pieces []piece
	shore := r.Takeoff.Shoreline.LoopDetail
	for i, l := range shore {
		pieces = append(pieces, piece{line: WaterEdge, index: i, pts: l.Pts, closed: l.Closed})
	}
	if len(shore) == 0 && r.Job != nil && len(r.Job.Outline.Ring) >= 3 {
		pieces = append(pieces, piece{line: WaterEdge, pts: startWest(r.Job.Outline.Ring), closed: true})
	}
	for k, z := range r.Zones {
		pieces = append(pieces, piece{line: FloorEdge, zone: z.Name, zoneNo: k + 1, index: k, pts: startWest(z.Ring), closed: true})
	}
	for i, l := range r.WorkEdge() {
		pieces = append(pieces, piece{line: Toe, index: i, pts: l.Pts, closed: l.Closed})
	}

	total := 0
	for _, p := range pieces {
		total += stakeCount(pathLength(p.pts, p.closed), spacingM, p.closed)
		if total > MaxStakes {
			return nil, fmt.Errorf("%w: more than %d stakes at a spacing of %g m: choose a wider spacing", ErrStakeout, MaxStakes, spacingM)
		}
	}

	var out []StakePoint
	count := map[StakeLine]int{}
	for _, p := range pieces {
		length := pathLength(p.pts, p.closed)
		n := stakeCount(length, spacingM, p.closed)
		div := float64(n) // intervals: n on a closed line, n − 1 on an open one
		if !p.closed {
			div = float64(n - 1)
		}
		zoneStake := 0
		for k := range n {
			s := length * float64(k) / div
			at := pointAt(p.pts, p.closed, s)
			g, ok := r.existingAt(at)
			if !ok {
				continue
			}
			sp := StakePoint{Line: p.line, Zone: p.zone, Piece: p.index, ChainageM: s, Local: at, ExistingM: g}
			w := r.Survey.Frame.ToWorld(at)
			sp.EastingM, sp.NorthingM = w.X, w.Y
			switch p.line {
			case Toe:
				sp.FinishedM = g
				if g >= r.Design.RimM {
					sp.Line = Daylight
				}
			default:
				d, ok := r.finishedAt(at)
				if !ok {
					continue
				}
				sp.FinishedM = d
			}
			sp.CutM = sp.ExistingM - sp.FinishedM
			switch p.line {
			case WaterEdge:
				count[WaterEdge]++
				sp.ID = fmt.Sprintf("W%d", count[WaterEdge])
				sp.Note = WaterEdge.String()
				if len(shore) > 1 {
					sp.Note += fmt.Sprintf(", loop %d", p.index+1)
				}
			case FloorEdge:
				zoneStake++
				sp.ID = fmt.Sprintf("Z%d-%d", p.zoneNo, zoneStake)
				sp.Note = "floor edge of " + p.zone
			default:
				count[Toe]++
				sp.ID = fmt.Sprintf("T%d", count[Toe])
				sp.Note = sp.Line.String()
			}
			out = append(out, sp)
		}
	}
	return out, nil
}

// stakeCount returns the number of stakes on a line of the given length.
func stakeCount(length, spacing float64, closed bool) int {
	if !(length > 0) {
		return 1
	}
	// The relative slack keeps a line of exactly k spacings (up to
	// round-off in its length) at k intervals.
	n := int(math.Ceil(length/spacing - 1e-9))
	n = max(n, 1)
	if !closed {
		n++
	}
	return n
}

// existingAt returns the existing ground at p: the TIN, else the lattice.
func (r *Result) existingAt(p geom.Vec2) (float64, bool) {
	if z, ok := r.Terrain.Elevation(p.X, p.Y); ok {
		return z, true
	}
	z, ok := r.Design.Lattice.Interpolate(r.Design.G, p)
	return z, ok && !math.IsNaN(z)
}

// finishedAt returns the finished grade at p: the exact bowl where it is
// at or below the rim (D = E there), else the lattice's D.
func (r *Result) finishedAt(p geom.Vec2) (float64, bool) {
	d := r.Design
	if e := d.BowlAt(p); e <= d.RimM {
		return e, true
	}
	z, ok := d.FinishedAt(p.X, p.Y)
	return z, ok && !math.IsNaN(z)
}

// WorkEdge returns the outer edge of the work: the lines where the
// finished grade meets the existing ground, daylight of the cut walls and
// toe of the fill berms, traced on the design lattice as the boundary of
// the nodes where D ≠ G (the level 0 of −|D − G|, whose contour runs
// through the last nodes where D = G). Each line is within one cell
// diagonal (√2·CellM) outside the true line. Closed lines are wound
// counter-clockwise, start at their westernmost point and do not repeat
// it; pieces shorter than eight cells are dropped. Lines come longest
// first. A result without a design has no edge.
func (r *Result) WorkEdge() []takeoff.Line {
	if r == nil || r.Design == nil {
		return nil
	}
	d := r.Design
	z := make([]float64, len(d.D))
	for k := range z {
		z[k] = -math.Abs(d.D[k] - d.G[k]) // NaN stays NaN: the cell is left out
	}
	m := d.Lattice.Mesh(z, nil)
	var out []takeoff.Line
	for _, l := range contours.TraceLevel(m, 0) {
		pts := l.Pts
		if l.Closed && len(pts) > 1 && pts[0] == pts[len(pts)-1] {
			pts = pts[:len(pts)-1]
		}
		if pathLength(pts, l.Closed) < minEdgeCells*d.Lattice.H {
			continue
		}
		if l.Closed {
			pts = startWest(pts)
		} else {
			pts = slices.Clone(pts)
		}
		out = append(out, takeoff.Line{Pts: pts, Closed: l.Closed})
	}
	slices.SortStableFunc(out, func(a, b takeoff.Line) int {
		return cmp.Compare(pathLength(b.Pts, b.Closed), pathLength(a.Pts, a.Closed))
	})
	return out
}

// startWest returns a copy of ring wound counter-clockwise and started at
// its westernmost vertex (least x, then least y).
func startWest(ring []geom.Vec2) []geom.Vec2 {
	r := slices.Clone(geom.Ring(ring))
	if r.Area() < 0 {
		slices.Reverse(r)
	}
	k := 0
	for i, p := range r {
		if p.X < r[k].X || p.X == r[k].X && p.Y < r[k].Y {
			k = i
		}
	}
	return append(r[k:], r[:k]...)
}

// pathLength returns the plan length of pts, closing the loop when closed.
func pathLength(pts []geom.Vec2, closed bool) float64 {
	var s geom.Sum
	for i := 1; i < len(pts); i++ {
		s.Add(pts[i].Distance(pts[i-1]))
	}
	if closed && len(pts) > 1 {
		s.Add(pts[0].Distance(pts[len(pts)-1]))
	}
	return s.Value()
}

// pointAt returns the point at chainage s along pts (closing the loop when
// closed); s is clamped to the path.
func pointAt(pts []geom.Vec2, closed bool, s float64) geom.Vec2 {
	if len(pts) == 0 {
		return geom.Vec2{}
	}
	n := len(pts)
	segs := n - 1
	if closed {
		segs = n
	}
	acc := 0.0
	for i := range segs {
		a, b := pts[i], pts[(i+1)%n]
		l := a.Distance(b)
		if s <= acc+l && l > 0 {
			return a.Lerp(b, (s-acc)/l)
		}
		acc += l
	}
	if closed {
		return pts[0]
	}
	return pts[n-1]
}
