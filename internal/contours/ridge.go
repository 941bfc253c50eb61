package contours

import "github.com/dugout-estimating/dugout/internal/geom"

// lineSet holds the cleaned point sequences of one level: line i is
// pts[ends[i]:ends[i+1]], a ring (without its closing point) when closed[i].
type lineSet struct {
	pts    []point
	ends   []int
	closed []bool
}

func (s *lineSet) reset() {
	s.pts, s.ends, s.closed = s.pts[:0], append(s.ends[:0], 0), s.closed[:0]
}

// add appends a cleaned sequence; nil (a line that collapsed) is skipped.
func (s *lineSet) add(seq []point, closed bool) {
	if seq == nil {
		return
	}
	s.pts = append(s.pts, seq...)
	s.ends = append(s.ends, len(s.pts))
	s.closed = append(s.closed, closed)
}

// ridges reports whether any segment joins two mesh vertices, the only kind
// of segment that can be traced twice. Under the rule z >= level, an edge
// whose two ends lie exactly on the level while the third corners of both
// of its triangles are below (a ridge just touching the level) is the
// boundary of a region of zero width, and each triangle traces it once, in
// opposite directions. This check costs one pass over the points; the
// cancellation runs only when it finds something.
func (s *lineSet) ridges() bool {
	n := 0
	for i := range s.closed {
		seq := s.pts[s.ends[i]:s.ends[i+1]]
		for j := range seq {
			k := j + 1
			if k == len(seq) {
				if !s.closed[i] {
					break
				}
				k = 0
			}
			if seq[j].h < 0 && seq[k].h < 0 {
				n++
			}
		}
	}
	return n >= 2
}

type segKey struct{ a, b geom.Vec2 }

// cancelRidges removes every pair of opposite segments (A to B and B to A,
// both between mesh vertices) from the lines of s and reconnects the
// pieces where they were cut: the line that arrived at A by the cancelled
// A-B continues with what left A after B-A, and likewise at B. That is a
// retraction through the zero-width region, the same reduction that [clean]
// applies to a detour within one line (A B A), now across lines and around
// loops: a ridge tail hanging off a ring goes, a ridge crossing the mesh
// goes with both of its lines, and a line that ran out along a ridge, round
// a hill and back splits into the ring round the hill. The results are
// cleaned again and written to out, which is returned.
func (s *lineSet) cancelRidges(out *lineSet) *lineSet {
	n := len(s.pts)
	next := make([]int32, n)
	prev := make([]int32, n)
	for i := range s.closed {
		a, b := s.ends[i], s.ends[i+1]
		for u := a; u < b; u++ {
			next[u], prev[u] = int32(u+1), int32(u-1)
		}
		if s.closed[i] {
			next[b-1], prev[a] = int32(a), int32(b-1)
		} else {
			next[b-1], prev[a] = -1, -1
		}
	}
	seg := map[segKey]int32{}
	for u := range n {
		if w := next[u]; w >= 0 && s.pts[u].h < 0 && s.pts[w].h < 0 {
			seg[segKey{s.pts[u].p, s.pts[w].p}] = int32(u)
		}
	}
	removed := make([]bool, n)
	for u := range n {
		w := next[u]
		if removed[u] || w < 0 || s.pts[u].h >= 0 || s.pts[w].h >= 0 {
			continue
		}
		a, b := s.pts[u].p, s.pts[w].p
		v, ok := seg[segKey{b, a}]
		if !ok || removed[v] || v == int32(u) {
			continue
		}
		// Node u starts A→B, node v starts B→A; drop both, so that the
		// node before u runs on into the A that follows v, and the node
		// before v into the B that follows u. Every other segment keeps its
		// start node, so the segments found above stay valid.
		a1, b1, b2, a2 := int32(u), w, v, next[v]
		p, r := prev[a1], prev[b2]
		removed[a1], removed[b2] = true, true
		if p >= 0 {
			next[p] = a2
		}
		prev[a2] = p
		if r >= 0 {
			next[r] = b1
		}
		prev[b1] = r
	}
	out.reset()
	seen := make([]bool, n)
	var seq []point
	follow := func(u int32, closed bool) {
		seq = seq[:0]
		for k := 0; k <= n && u >= 0 && !seen[u]; k++ {
			seen[u] = true
			seq = append(seq, s.pts[u])
			u = next[u]
		}
		if closed && len(seq) > 0 {
			seq = append(seq, seq[0])
		}
		out.add(clean(seq, closed), closed)
	}
	for u := range n {
		if !removed[u] && !seen[u] && prev[u] < 0 {
			follow(int32(u), false)
		}
	}
	for u := range n {
		if !removed[u] && !seen[u] {
			follow(int32(u), true)
		}
	}
	return out
}
