package las

import (
	"math"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// cellKey indexes a thinning cell.
type cellKey struct{ i, j int64 }

// cellAcc is one occupied cell: its lowest point so far, or the sums of
// the stored integer coordinates for the mean. Integer sums are exact: an
// int64 holds the sum of 2³² int32 values, far more points than one cell of
// any real file receives.
type cellAcc struct {
	x, y, z int64
	n       int64
}

// thinner keeps one point per cell; memory is one map entry and one
// accumulator per occupied cell.
type thinner struct {
	mode       ThinMode
	cell       float64
	minX, minY float64
	zUp        bool // the z scale is positive, so a smaller stored z is lower
	index      map[cellKey]int
	cells      []cellAcc // in order of first occupation
}

func newThinner(h Header, opt Options) *thinner {
	if opt.ThinCell == 0 {
		return nil
	}
	t := &thinner{mode: opt.Thin, cell: opt.ThinCell, minX: h.Min[0], minY: h.Min[1], zUp: h.Scale[2] > 0,
		index: map[cellKey]int{}}
	// A header with non-finite bounds (already warned about) anchors the
	// grid at the offset instead, so that cells stay distinct.
	if !isFinite(t.minX) || !isFinite(t.minY) {
		t.minX, t.minY = h.Offset[0], h.Offset[1]
	}
	return t
}

// cellIndex returns floor((v − lo)/cell), clamped to ±2⁶² so that a point
// far outside the header bounds still gets a key.
func (t *thinner) cellIndex(v, lo float64) int64 {
	f := math.Floor((v - lo) / t.cell)
	const lim = 1 << 62
	return int64(math.Max(-lim, math.Min(lim, f)))
}

func (t *thinner) add(p rawPoint, v geom.Vec3) {
	k := cellKey{t.cellIndex(v.X, t.minX), t.cellIndex(v.Y, t.minY)}
	i, ok := t.index[k]
	if !ok {
		t.index[k] = len(t.cells)
		t.cells = append(t.cells, cellAcc{int64(p.x), int64(p.y), int64(p.z), 1})
		return
	}
	c := &t.cells[i]
	switch t.mode {
	case ThinLowest:
		// Compare the stored integers (exact); the first point wins ties.
		if lower := int64(p.z) < c.z; lower == t.zUp && int64(p.z) != c.z {
			c.x, c.y, c.z = int64(p.x), int64(p.y), int64(p.z)
		}
	case ThinMean:
		c.x += int64(p.x)
		c.y += int64(p.y)
		c.z += int64(p.z)
		c.n++
	}
}

func (t *thinner) points(h Header) []geom.Vec3 {
	out := make([]geom.Vec3, len(t.cells))
	for i, c := range t.cells {
		n := float64(c.n)
		out[i] = geom.Vec3{
			X: float64(c.x)/n*h.Scale[0] + h.Offset[0],
			Y: float64(c.y)/n*h.Scale[1] + h.Offset[1],
			Z: float64(c.z)/n*h.Scale[2] + h.Offset[2],
		}
	}
	return out
}
