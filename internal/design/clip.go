package design

import (
	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/grid"
)

// uv is a point in cell coordinates: (0, 0) is the cell's first node and
// (1, 1) the opposite one.
type uv struct{ u, v float64 }

// split is a lattice cell crossed by one vertical wall. The wall makes E
// jump, which no interpolant of node values can carry, so each of the
// cell's two triangles is integrated in two parts: T ∩ Z with the values
// the nodes would have inside the zone, and the rest with the values they
// would have outside, as ∫_T out − ∫_{T∩Z} out + ∫_{T∩Z} in.
type split struct {
	cell int   // ci + cj·NX
	zone int32 // the vertical zone
	// part[t] is triangle t of the cell clipped to the zone's floor polygon
	// (Sutherland–Hodgman; several pieces may be joined by zero-width
	// bridges, which leave every integral unchanged).
	part [2][]uv
	// eOut is e at the cell's nodes (00, 10, 01, 11) with the zone left
	// out; eIn = min(eOut, −depth).
	eOut, eIn [4]float64
}

// triangle t's corners in cell coordinates: (00, 10, 11) and (00, 11, 01).
var triCorners = [2][3]uv{{{0, 0}, {1, 0}, {1, 1}}, {{0, 0}, {1, 1}, {0, 1}}}

func (fd *field) newSplit(cell, zone int) split {
	l := fd.lat
	ci, cj := cell%l.NX, cell/l.NX
	z := &fd.zs.z[zone]
	sp := split{cell: cell, zone: int32(zone), part: fd.clipCell(cell, z.floor)}
	nodes := [4]int{l.Index(ci, cj), l.Index(ci+1, cj), l.Index(ci, cj+1), l.Index(ci+1, cj+1)}
	for m, k := range nodes {
		p := l.Node(k%l.NX, k/l.NX)
		e, _, _ := fd.zs.rel(p, zone)
		sp.eOut[m] = e
		sp.eIn[m] = min(e, -z.depth)
	}
	return sp
}

// clipHalf keeps the part of poly left of the directed line ab
// (Sutherland–Hodgman, one edge of a convex window). It allocates.
func clipHalf(poly []uv, a, b uv) []uv {
	side := func(p uv) float64 { return (b.u-a.u)*(p.v-a.v) - (b.v-a.v)*(p.u-a.u) }
	var out []uv
	n := len(poly)
	for i := range poly {
		p, q := poly[i], poly[(i+1)%n]
		sp, sq := side(p), side(q)
		if sp >= 0 {
			out = append(out, p)
		}
		if (sp >= 0) != (sq >= 0) {
			t := sp / (sp - sq)
			out = append(out, uv{p.u + t*(q.u-p.u), p.v + t*(q.v-p.v)})
		}
	}
	return out
}

// triValue returns the linear interpolant on triangle t of corner values
// f (nodes 00, 10, 01, 11) at p.
func triValue(t int, f *[4]float64, p uv) float64 {
	if t == 0 {
		return f[0] + p.u*(f[1]-f[0]) + p.v*(f[3]-f[1])
	}
	return f[0] + p.v*(f[2]-f[0]) + p.u*(f[3]-f[2])
}

// triParts returns grid.Parts for triangle t of a cell of area cellArea
// with node values f.
func triParts(t int, cellArea float64, f *[4]float64) (pos, neg, posA, negA float64) {
	if t == 0 {
		return grid.Parts(cellArea/2, f[0], f[1], f[3])
	}
	return grid.Parts(cellArea/2, f[0], f[3], f[2])
}

// polyParts integrates the positive and negative parts of the linear
// interpolant of f on triangle t over the polygon part (cell coordinates),
// and the areas where it is positive and negative, for a cell of area
// cellArea. The polygon is clipped at f = 0 (f is linear, so the clip is
// exact) and each piece is fanned from its first vertex; fans of a
// polygon with zero-width bridges still integrate correctly, since the
// bridges' triangles cancel.
func polyParts(t int, cellArea float64, f *[4]float64, part []uv, buf *clipBuf) (pos, neg, posA, negA float64) {
	if len(part) < 3 {
		return 0, 0, 0, 0
	}
	buf.p = buf.p[:0]
	buf.f = buf.f[:0]
	lo, hi := 0.0, 0.0
	for i, p := range part {
		v := triValue(t, f, p)
		buf.p = append(buf.p, p)
		buf.f = append(buf.f, v)
		if i == 0 || v < lo {
			lo = v
		}
		if i == 0 || v > hi {
			hi = v
		}
	}
	if hi > 0 {
		pos, posA = fanPositive(buf, 1, cellArea)
	}
	if lo < 0 {
		neg, negA = fanPositive(buf, -1, cellArea)
	}
	return
}

// clipBuf is scratch for [polyParts].
type clipBuf struct {
	p, q []uv
	f, g []float64
}

// fanPositive integrates max(0, sign·f) over the polygon in buf.
func fanPositive(buf *clipBuf, sign float64, cellArea float64) (integral, area float64) {
	buf.q, buf.g = buf.q[:0], buf.g[:0]
	n := len(buf.p)
	for i := range n {
		p, q := buf.p[i], buf.p[(i+1)%n]
		fp, fq := sign*buf.f[i], sign*buf.f[(i+1)%n]
		if fp >= 0 {
			buf.q = append(buf.q, p)
			buf.g = append(buf.g, fp)
		}
		if (fp >= 0) != (fq >= 0) {
			s := fp / (fp - fq)
			buf.q = append(buf.q, uv{p.u + s*(q.u-p.u), p.v + s*(q.v-p.v)})
			buf.g = append(buf.g, 0)
		}
	}
	var si, sa geom.Sum
	q, g := buf.q, buf.g
	for k := 1; k+1 < len(q); k++ {
		a := ((q[k].u-q[0].u)*(q[k+1].v-q[0].v) - (q[k].v-q[0].v)*(q[k+1].u-q[0].u)) / 2
		sa.Add(a)
		si.Add(a * (g[0] + g[k] + g[k+1]) / 3)
	}
	return si.Value() * cellArea, sa.Value() * cellArea
}
