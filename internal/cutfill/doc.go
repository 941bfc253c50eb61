// Package cutfill turns earthwork volumes into what a contractor pays for,
// and measures pay quantities by comparing two surfaces.
//
// # Units and frame
//
// Everything is SI: volumes in cubic metres, areas in square metres, lengths
// in metres, in the local working frame of package geom. Conversion to cubic
// yards and feet happens in the report, with the exact factors of package
// units.
//
// # Volume states
//
// Soil occupies three volumes (US Army FM 5-434, Earthmoving Operations,
// 2000, chapter 1): bank (in place, undisturbed), loose (dug and heaped in a
// truck or a stockpile) and compacted (placed and rolled in a fill). A cut
// measured between the existing ground and the design is a bank volume; a
// fill measured the same way is a compacted volume.
//
//   - loose = bank × swell factor, with swell factor = 1 + swell%/100
//     (FHWA Project Development and Design Manual, ch. 9 §9.4.C.4);
//   - compacted = bank × compaction factor (FM 5-434 Table 1-2, "bank to
//     compacted"), so the bank volume a fill needs is compacted / compaction
//     factor.
//
// Shrink is defined here as shrink = 1 − compacted/bank = 1 − compaction
// factor, the form the FM 5-434 conversion factors give (loam: 0.90 → 10 %
// shrink). FHWA PDDM §9.4.C.4 defines a shrink factor 1/(1 + s) instead,
// which differs; it is not used. [Result.ShrinkConvention] repeats this so
// that printed output names it.
//
// # Accounting
//
// [Compute] reuses cut as fill up to what the fill needs (min(cut, fill
// need), both in bank measure), hauls the rest off, and imports the
// shortfall when the fill needs more than the cut gives. Haul-off and import
// are converted to loose measure with the soil's swell factor; truckloads
// are the loose haul-off divided by the truck's struck or heaped capacity,
// rounded up.
//
// Topsoil stripping (area × depth over the disturbed area) is reported
// apart, in bank and loose measure: it is stockpiled and re-spread, not
// hauled. The cut volume from the design is measured from the existing
// ground surface, so it already contains the topsoil that lies over the cut
// area; Compute does not subtract it, because the stripped area also covers
// the berm and work area around the cut and the inputs do not say how much of
// it lies over the cut. The topsoil figures are therefore a handling
// quantity (strip, stockpile, re-spread), not an addition to the cut, and
// the haul-off errs on the high side by at most the topsoil over the cut.
//
// # Surface comparison
//
// [Compare] overlays two triangulated surfaces of the same site, for example
// the ground before digging and the as-built survey, and integrates their
// difference exactly over the common area: cut = ∫(before − after)⁺ and
// fill = ∫(after − before)⁺.
package cutfill
