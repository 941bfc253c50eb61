package design

import (
	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/grid"
)

// LevelMode says how the water-surface elevation is chosen.
type LevelMode int

const (
	// LevelFixed uses Params.WaterLevelM (the zero value).
	LevelFixed LevelMode = iota
	// LevelAuto sets the rim at the lowest existing ground along the rim
	// line, so no berm is needed: W = min over the rim line of G − freeboard.
	LevelAuto
	// LevelBalance finds the W at which the cut reused as fill,
	// cut × FillPerCut, equals the fill.
	LevelBalance
)

// String returns "fixed", "auto" or "balance".
func (m LevelMode) String() string {
	switch m {
	case LevelAuto:
		return "auto"
	case LevelBalance:
		return "balance"
	case LevelFixed:
		return "fixed"
	}
	return "unknown"
}

// Terrain is the existing ground the design is laid on, in the local frame
// (m). The TIN package provides it.
type Terrain interface {
	// Elevation returns the ground at (x, y); ok is false off the surface.
	Elevation(x, y float64) (z float64, ok bool)
	// SampleLattice writes the ground at nodes (x0 + i·h, y0 + j·h),
	// 0 ≤ i < nx, 0 ≤ j < ny, into out[j·nx + i], NaN off the surface.
	SampleLattice(x0, y0, h float64, nx, ny int, out []float64)
	// Bounds returns the plan box of the surface.
	Bounds() geom.Box
}

// Defaults used when a Params field is zero.
const (
	// DefaultBermSlope is the outer berm slope, 3H:1V: common practice for
	// embankments that are mown and walked on (no source).
	DefaultBermSlope = 3.0
)

// Limits on Params.
const (
	// MaxFreeboardM is the largest freeboard accepted.
	MaxFreeboardM = 3.0
	// MaxBermCrestM is the widest berm crest accepted.
	MaxBermCrestM = 50.0
	// MaxFillPerCut bounds FillPerCut (compacted m³ made by one bank m³):
	// real soils give about 0.7 to 1.3.
	MaxFillPerCut = 3.0
	// MinCellM is the finest lattice cell the automatic choice tries.
	MinCellM = 0.001
)

// Params describes a pond design on existing ground. Lengths are metres,
// slopes horizontal per vertical.
type Params struct {
	Zones []Zone
	// Level chooses the water level; WaterLevelM is used with LevelFixed.
	Level       LevelMode
	WaterLevelM float64
	// FreeboardM is the rim's height above the water, f (rim R = W + f).
	FreeboardM float64
	// BermCrestM is the width c of the level berm crest at the rim
	// elevation, where the rim stands above existing ground.
	BermCrestM float64
	// BermSlope is the outer berm slope b (0 means DefaultBermSlope).
	BermSlope float64
	// CellM is the lattice cell. 0 chooses it: the cell is halved until
	// halving changes cut and fill by less than 0.1 %.
	CellM float64
	// FillPerCut is the compacted fill one bank m³ of cut makes, for
	// LevelBalance.
	FillPerCut float64
}

// ZoneVolume is the earthwork booked to one zone: each lattice triangle's
// cut and fill are shared equally among its corners' zones (the zone whose
// bowl is lowest there, or where only vertical walls reach, the nearest),
// so the split is good to about a cell along the lines where zones meet,
// and the zones add up to the totals.
type ZoneVolume struct {
	Name          string
	CutM3, FillM3 float64
	// FloorAreaM2 is the plan area of the zone's flat floor: its outline
	// less the parts where a deeper zone's bowl lies lower.
	FloorAreaM2 float64
}

// Surface is a design laid on existing ground: the surfaces on a lattice
// over the work area and the quantities computed from them.
type Surface struct {
	// Params are the parameters used, with defaults filled in.
	Params Params
	// Lattice is the lattice over the work area.
	Lattice grid.Lattice
	// G, E and D are existing ground, the bowl and the finished grade at
	// the lattice nodes (m). G is NaN off the surveyed surface; E is +Inf
	// where only vertical-walled zones reach and none holds the node; D is
	// NaN where it would need unsurveyed ground (never inside the work
	// area of a built surface).
	G, E, D []float64
	// WaterLevelM and RimM are W and R = W + freeboard; Level is the mode
	// that chose W.
	WaterLevelM, RimM float64
	Level             LevelMode
	// CutM3 = ∬ (G − D)⁺ and FillM3 = ∬ (D − G)⁺, compacted in place.
	CutM3, FillM3 float64
	ByZone        []ZoneVolume
	// Water: the region where E ≤ W; its volume ∬ (W − E), plan area,
	// greatest depth and mean depth (volume / area).
	WaterVolumeM3, WaterAreaM2, MaxDepthM, MeanDepthM float64
	// Plan areas where D ≠ G, D < G and D > G.
	DisturbedAreaM2, CutAreaM2, FillAreaM2 float64
	// CellM is the lattice cell used; RefineChange is the relative change
	// of cut and fill between the lattice of cell 2·CellM and this one
	// (each measured against itself, or against 1 % of cut + fill when
	// smaller). The error left is about a third of it (the error is of
	// second order in the cell). It is NaN when not even one halving fit
	// within grid.MaxNodes (a warning says so).
	CellM, RefineChange float64
	Warnings            []string

	fd   *field
	zs   *zoneSet
	berm berm
	bowl *lazyBowl // the index of BowlAt
}
