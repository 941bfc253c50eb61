package grid

import (
	"errors"
	"fmt"
	"math"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// MaxNodes is the largest node count [NewLattice] accepts: 2^24, about
// 16.8 million nodes. The design surface keeps about 40 bytes per node
// (existing ground, bowl, finished grade and working arrays), so the limit
// bounds its memory near 700 MB.
const MaxNodes = 1 << 24

// ErrLattice is returned (wrapped) for a box or cell size that cannot make
// a lattice.
var ErrLattice = errors.New("grid: invalid lattice")

// ErrTooLarge is wrapped by [*SizeError].
var ErrTooLarge = errors.New("grid: lattice too large")

// SizeError reports a lattice that would exceed [MaxNodes].
type SizeError struct {
	NX, NY int     // the node counts the box and cell would need
	H      float64 // the cell size asked for, m
	Limit  int     // the node limit
}

// Error returns the node counts, the cell and the limit.
func (e *SizeError) Error() string {
	return fmt.Sprintf("grid: a lattice of %d × %d nodes at %g m cells exceeds the limit of %d nodes",
		e.NX, e.NY, e.H, e.Limit)
}

// Unwrap returns [ErrTooLarge].
func (e *SizeError) Unwrap() error { return ErrTooLarge }

// Lattice is a regular square lattice: node (i, j), 0 ≤ i < NX, 0 ≤ j < NY,
// sits at (X0 + i·H, Y0 + j·H), in metres in the local frame. The zero
// Lattice has no nodes.
type Lattice struct {
	X0, Y0, H float64
	NX, NY    int
}

// NewLattice returns the lattice of cell size h (m) whose nodes cover b,
// with the corners snapped outward to whole multiples of h, so lattices of
// cell h and h/2 over the same box share every node of the coarser one. A
// box thinner than one cell still gets one cell. It fails for an empty or
// non-finite box, a cell size that is not a positive finite number, and
// with a [*SizeError] when the lattice would have more than [MaxNodes]
// nodes.
func NewLattice(b geom.Box, h float64) (Lattice, error) {
	if !(h > 0) || math.IsInf(h, 0) {
		return Lattice{}, fmt.Errorf("%w: cell size must be a positive number of metres, got %g", ErrLattice, h)
	}
	if b.IsEmpty() || !b.Min.IsFinite() || !b.Max.IsFinite() {
		return Lattice{}, fmt.Errorf("%w: box %v is empty or not finite", ErrLattice, b)
	}
	i0, i1 := math.Floor(b.Min.X/h), math.Ceil(b.Max.X/h)
	j0, j1 := math.Floor(b.Min.Y/h), math.Ceil(b.Max.Y/h)
	if i1 <= i0 {
		i1 = i0 + 1
	}
	if j1 <= j0 {
		j1 = j0 + 1
	}
	nx, ny := i1-i0+1, j1-j0+1
	if nx*ny > MaxNodes {
		return Lattice{}, &SizeError{NX: clampInt(nx), NY: clampInt(ny), H: h, Limit: MaxNodes}
	}
	return Lattice{X0: i0 * h, Y0: j0 * h, H: h, NX: int(nx), NY: int(ny)}, nil
}

func clampInt(f float64) int {
	if f > math.MaxInt32 {
		return math.MaxInt32
	}
	return int(f)
}

// Index returns the position of node (i, j) in a flat slice.
func (l Lattice) Index(i, j int) int { return j*l.NX + i }

// Node returns the position of node (i, j).
func (l Lattice) Node(i, j int) geom.Vec2 {
	return geom.Vec2{X: l.X0 + float64(i)*l.H, Y: l.Y0 + float64(j)*l.H}
}

// Len returns the number of nodes, NX·NY.
func (l Lattice) Len() int { return l.NX * l.NY }

// CellArea returns the plan area of one cell, H², in m².
func (l Lattice) CellArea() float64 { return l.H * l.H }

// Bounds returns the box spanned by the nodes (empty for the zero Lattice).
func (l Lattice) Bounds() geom.Box {
	if l.NX == 0 || l.NY == 0 {
		return geom.EmptyBox()
	}
	return geom.Box{Min: l.Node(0, 0), Max: l.Node(l.NX-1, l.NY-1)}
}

// Cell returns the cell holding p and p's position inside it as fractions
// u, v in [0, 1). Cells are half-open, [x_i, x_{i+1}) × [y_j, y_{j+1}),
// except that the last row and column also hold their far edge, so every
// point of [Lattice.Bounds] lands in exactly one cell. ok is false outside.
func (l Lattice) Cell(p geom.Vec2) (i, j int, u, v float64, ok bool) {
	if l.NX < 2 || l.NY < 2 {
		return 0, 0, 0, 0, false
	}
	fx := (p.X - l.X0) / l.H
	fy := (p.Y - l.Y0) / l.H
	if !(fx >= 0 && fy >= 0 && fx <= float64(l.NX-1) && fy <= float64(l.NY-1)) {
		return 0, 0, 0, 0, false
	}
	i, j = int(fx), int(fy)
	if i == l.NX-1 {
		i--
	}
	if j == l.NY-1 {
		j--
	}
	return i, j, fx - float64(i), fy - float64(j), true
}

// Interpolate returns the lattice function z at p: the linear interpolant
// on the triangle of its cell. ok is false outside the lattice or when a
// corner of that triangle is NaN.
func (l Lattice) Interpolate(z []float64, p geom.Vec2) (float64, bool) {
	i, j, u, v, ok := l.Cell(p)
	if !ok {
		return math.NaN(), false
	}
	k := l.Index(i, j)
	z00, z11 := z[k], z[k+l.NX+1]
	var r float64
	if u >= v { // first triangle (00, 10, 11)
		z10 := z[k+1]
		r = z00 + u*(z10-z00) + v*(z11-z10)
	} else { // second triangle (00, 11, 01)
		z01 := z[k+l.NX]
		r = z00 + v*(z01-z00) + u*(z11-z01)
	}
	if math.IsNaN(r) {
		return r, false
	}
	return r, true
}
