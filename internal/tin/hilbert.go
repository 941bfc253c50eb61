package tin

// hilbertOrder is the side of the Hilbert curve's grid, 2^16 cells per axis:
// fine enough that distinct survey points almost never share a cell (4e9
// cells), coarse enough that a key fits in 32 bits.
const hilbertOrder = 1 << 16

// hilbertKey returns the index of cell (x, y), 0 <= x, y < hilbertOrder,
// along the Hilbert curve. It walks the curve's four-state automaton (the
// orientation of the current sub-square; A. R. Butz, "Alternative algorithm
// for Hilbert's space-filling curve", IEEE Trans. Computers C-20, 1971)
// four bits of x and y at a time through a table built from the one-bit
// rule by hilbertTables.
func hilbertKey(x, y uint32) uint32 {
	var d uint32
	state := uint32(0)
	for shift := 12; shift >= 0; shift -= 4 {
		q := (x>>uint(shift))&0xf<<4 | (y>>uint(shift))&0xf
		e := hilbertLUT[state<<8|q]
		d = d<<8 | uint32(e&0xff)
		state = uint32(e >> 8)
	}
	return d
}

// hilbertLUT maps (state, 4 bits of x, 4 bits of y) to (8 bits of the
// index, next state), packed as digit | state<<8.
var hilbertLUT = hilbertTables()

// hilbertStep is the one-bit rule: in orientation state s, the quadrant
// (rx, ry) has index digit and leads to state next. States 0–3 are the
// identity, the transpose, the anti-transpose and the rotation by 180° of
// the base orientation, matching the classic xy2d rotation (swap x and y
// when ry == 0; also reflect when rx == 1).
func hilbertStep(s, rx, ry uint32) (digit, nextState uint32) {
	// Undo the current orientation to get the base quadrant.
	bx, by := rx, ry
	switch s {
	case 1:
		bx, by = ry, rx
	case 2:
		bx, by = 1-ry, 1-rx
	case 3:
		bx, by = 1-rx, 1-ry
	}
	digit = (3 * bx) ^ by
	// Orientation of the sub-square: compose the current one with the
	// base rule's transform for this quadrant.
	var t uint32 // 0 identity, 1 transpose, 2 anti-transpose
	if by == 0 {
		t = 1
		if bx == 1 {
			t = 2
		}
	}
	return digit, composeOrient[s][t]
}

// composeOrient[s][t] is the state for "apply t inside orientation s". The
// four orientations form the Klein four-group {identity, transpose,
// anti-transpose, half-turn}: composition is XOR of their codes.
var composeOrient = [4][3]uint32{
	{0, 1, 2},
	{1, 0, 3},
	{2, 3, 0},
	{3, 2, 1},
}

func hilbertTables() [4 << 8]uint16 {
	var lut [4 << 8]uint16
	for s := range uint32(4) {
		for q := range uint32(256) {
			x, y := q>>4, q&0xf
			st := s
			var d uint32
			for bit := 3; bit >= 0; bit-- {
				dg, ns := hilbertStep(st, (x>>uint(bit))&1, (y>>uint(bit))&1)
				d = d<<2 | dg
				st = ns
			}
			lut[s<<8|q] = uint16(d | st<<8)
		}
	}
	return lut
}

// radixSortHigh sorts keys by their upper 32 bits, stably, with an LSD radix
// sort of four 8-bit digits. buf must have the same length as keys; the
// result is in keys.
func radixSortHigh(keys, buf []uint64) {
	src, dst := keys, buf
	for shift := uint(32); shift < 64; shift += 8 {
		var count [257]int
		for _, k := range src {
			count[(k>>shift)&0xff+1]++
		}
		for i := 1; i < 257; i++ {
			count[i] += count[i-1]
		}
		for _, k := range src {
			d := (k >> shift) & 0xff
			dst[count[d]] = k
			count[d]++
		}
		src, dst = dst, src
	}
	// Four passes: the result is back in keys.
}
