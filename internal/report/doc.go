// Package report writes what leaves the tool: the HTML report, plan and
// section drawings (SVG), and the CSV, JSON and GeoJSON files of one job's
// results.
//
// Coordinate model: the packages below hand over geometry in the local
// working frame, in metres. Writers take a mapping to output coordinates
// (world coordinates in the user's units, or longitude and latitude) and a
// vertical scale, so that files are in the units the user reads. Output is
// deterministic: the same input gives the same bytes, with numbers written
// at fixed precision and keys in a fixed order.
package report
