// Package takeoff computes the order quantities of a pond job from its design
// surface: the liner and underlayment sheet, the shoreline, edge stone, shelf
// and floor gravel, crew time, water volume, pump duty, a priced cost table
// and the safety cautions printed with every estimate. Beside each measured
// quantity it reports the trade's rule of thumb, so that an estimator can see
// how far the quick figure is from the real geometry.
//
// Coordinate model: planar local frame in metres (x east, y north, z up), as
// in package geom. All inputs and results are SI (m, m², m³, kg, s or h where
// the name says so); US customary figures are given beside them under names
// that carry the unit (volume_gal, flow_gal_per_h). Stone tonnage is the one
// exception a stone yard needs: the JSON keys edge_tons, gravel_tons and
// total_tons are short tons of 2000 lb, and edge_tonnes, gravel_tonnes and
// total_tonnes give the same masses in metric tonnes.
//
// The takeoff reads the design; it never re-derives it. Its core functions
// take narrow inputs (a triangle mesh of the lined bowl, zone rings, levels,
// numbers and an optional analytic [Bowl]) so that they can be checked
// against closed-form cases. [FromDesign] adapts a design surface.
//
// Method notes (see DESIGN.md for the reasoning):
//   - The developed liner area is the sum of the 3-D areas of the bowl mesh's
//     triangles below the rim, each triangle clipped exactly at the rim level.
//   - The sheet is searched over angles: for a sheet laid at angle θ its length
//     is the longest developed (3-D) length of the cross-sections parallel to
//     θ, and its width the same at θ + 90°. A coarse scan and a golden-section
//     refinement run on a raster of the mesh; the final candidates are measured
//     on the analytic bowl when one is given, with the zone edges as
//     breakpoints, so that vertical walls come out exact.
//   - The stock is ordered for the angle whose sheet rounds up to the least
//     stock area (ties to the smaller sheet), which need not be the least
//     sheet's angle; both sheets and their angles are reported.
//   - Contour points of the water line and the rim are moved onto the analytic
//     bowl by bisection, which removes the one-cell smear of a vertical wall.
//
// Nothing here prints or logs: problems that do not stop the takeoff are
// returned as warnings in [Result].
package takeoff
