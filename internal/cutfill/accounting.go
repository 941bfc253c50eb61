package cutfill

import (
	"fmt"
	"math"

	"github.com/dugout-estimating/dugout/internal/units"
)

// Inputs are the quantities and settings of one earthwork account. Volumes
// are in cubic metres, areas in square metres, depths in metres. The zero
// value of Topsoil means the "topsoil" preset; the zero Truck means no
// truck (no loads are counted).
type Inputs struct {
	// CutBankM3 is the cut from the design, in bank measure.
	CutBankM3 float64
	// FillCompactedM3 is the fill from the design, in compacted (in-place)
	// measure.
	FillCompactedM3 float64
	// Soil is the soil dug and placed (the import is taken to be the same
	// soil).
	Soil Soil
	// Topsoil is the stripped topsoil's soil; only its Swell is used. The
	// zero value means the "topsoil" preset.
	Topsoil Soil
	// TopsoilDepthM and TopsoilAreaM2 give the stripping over the disturbed
	// area; the topsoil is stockpiled and re-spread, not hauled (see the
	// package documentation for how it relates to the cut).
	TopsoilDepthM, TopsoilAreaM2 float64
	// Truck is the haul truck; Heaped counts loads by its heaped rather than
	// its struck capacity.
	Truck  Truck
	Heaped bool
	// ReuseCut reports whether cut is reused as (berm) fill. The site file
	// defaults it to true; the zero value here is false.
	ReuseCut bool
	// PricePerLoad is the price of one haul-off load, in the job's currency;
	// 0 means not priced.
	PricePerLoad float64
}

// Result is an earthwork account. Volumes are in cubic metres: "Bank" is in
// place, "Loose" dug, "Compacted" placed.
type Result struct {
	// CutBankM3 and FillCompactedM3 echo the inputs.
	CutBankM3, FillCompactedM3 float64
	// FillBankNeedM3 is the bank volume the fill needs:
	// FillCompactedM3 / compaction factor.
	FillBankNeedM3 float64
	// NetBankM3 is CutBankM3 − FillBankNeedM3: positive for a surplus,
	// negative for a shortfall.
	NetBankM3 float64
	// ReusedBankM3 is the cut placed as fill: min(cut, fill need) when cut is
	// reused, else 0.
	ReusedBankM3 float64
	// HaulBankM3 and HaulLooseM3 are the cut hauled off (cut − reused), in
	// bank and loose measure.
	HaulBankM3, HaulLooseM3 float64
	// ImportBankM3 and ImportLooseM3 are the fill brought in (fill need −
	// reused), in bank and loose measure.
	ImportBankM3, ImportLooseM3 float64
	// TopsoilBankM3 and TopsoilLooseM3 are the stripped topsoil (area ×
	// depth) and its stockpile volume.
	TopsoilBankM3, TopsoilLooseM3 float64
	// Truckloads is ⌈HaulLooseM3 / TruckCapacityM3⌉ (0 without a truck);
	// TruckCapacityM3 is the struck or heaped capacity used.
	Truckloads      int
	TruckCapacityM3 float64
	// HaulCost is Truckloads × PricePerLoad.
	HaulCost float64
	// ShrinkConvention names the definition of shrink used (the constant
	// [ShrinkConvention]), so that printed output can state it.
	ShrinkConvention string
	// Notes are remarks for the estimator: import needed, no truck given,
	// unusual factors, how topsoil is treated.
	Notes []string
}

// loadRoundingTol is the relative slack allowed before a load is counted as
// an extra truck: loose volumes come from compensated sums and a
// multiplication or two, accurate to a few units in 1e-15, so a haul of
// exactly n loads may compute as n·(1 + 4e-16). A billionth of a load is far
// below anything a truck body can be filled to.
const loadRoundingTol = 1e-9

// SpreadOnSiteFraction is the part of a truckload below which a left-over
// haul-off is spread on site rather than trucked: 5 % of a 10 yd³ body is
// half a cubic yard, a few wheelbarrow loads (common practice, no source).
// A balanced job leaves such crumbs from the balance search alone.
const SpreadOnSiteFraction = 0.05

// balancedM3 is the left-over below which a job counts as balanced without
// remark: 0.01 m³ is a bucketful, below the resolution of any earthwork
// estimate.
const balancedM3 = 0.01

// Compute runs the earthwork account for in. It returns an [*InputError]
// wrapping [ErrNegative], [ErrNotPositive], [ErrNonFinite] or
// [ErrHeapBelowStruck] for a negative or non-finite volume, area, depth or
// price, a factor or capacity that is not positive, or a truck whose heaped
// capacity is below its struck one.
func Compute(in Inputs) (Result, error) {
	if err := in.validate(); err != nil {
		return Result{}, err
	}
	top := in.Topsoil
	if top == (Soil{}) {
		top, _ = SoilPreset("topsoil")
	}
	r := Result{
		CutBankM3:        in.CutBankM3,
		FillCompactedM3:  in.FillCompactedM3,
		FillBankNeedM3:   in.FillCompactedM3 / in.Soil.Compaction,
		ShrinkConvention: ShrinkConvention,
	}
	r.NetBankM3 = r.CutBankM3 - r.FillBankNeedM3
	if in.ReuseCut {
		r.ReusedBankM3 = math.Min(r.CutBankM3, r.FillBankNeedM3)
	} else if r.CutBankM3 > 0 && r.FillBankNeedM3 > 0 {
		r.Notes = append(r.Notes, "cut is not reused as fill: all of it is hauled off and all fill is imported")
	}
	r.HaulBankM3 = r.CutBankM3 - r.ReusedBankM3
	r.ImportBankM3 = r.FillBankNeedM3 - r.ReusedBankM3
	r.HaulLooseM3 = r.HaulBankM3 * in.Soil.Swell
	r.ImportLooseM3 = r.ImportBankM3 * in.Soil.Swell
	if r.ImportLooseM3 >= balancedM3 {
		r.Notes = append(r.Notes, fmt.Sprintf(
			"fill needs more than the cut supplies: import %.2f m³ (%.1f yd³) bank, %.2f m³ (%.1f yd³) loose, of %s; import loads are not counted",
			r.ImportBankM3, r.ImportBankM3/units.CubicYard, r.ImportLooseM3, r.ImportLooseM3/units.CubicYard, soilName(in.Soil)))
	}

	r.TopsoilBankM3 = in.TopsoilAreaM2 * in.TopsoilDepthM
	r.TopsoilLooseM3 = r.TopsoilBankM3 * top.Swell
	if r.TopsoilBankM3 > 0 {
		r.Notes = append(r.Notes, "topsoil is stripped, stockpiled and re-spread, not hauled; "+
			"the cut is measured from existing ground and already holds the topsoil over the cut area")
	}

	r.TruckCapacityM3 = in.Truck.Capacity(in.Heaped)
	switch {
	case in.Truck.StruckM3 == 0 && in.Truck.HeapedM3 == 0:
		r.TruckCapacityM3 = 0
		if r.HaulLooseM3 > 0 {
			r.Notes = append(r.Notes, "no truck given: truckloads are not counted")
		}
	case r.HaulLooseM3 > 0 && r.HaulLooseM3 < SpreadOnSiteFraction*r.TruckCapacityM3:
		if r.HaulLooseM3 < balancedM3 {
			break // crumbs of the balance search: nothing to say
		}
		r.Notes = append(r.Notes, fmt.Sprintf(
			"the %.2f m³ (%.2f yd³) loose left over is under %.0f %% of a load: spread it on site, no truck counted",
			r.HaulLooseM3, r.HaulLooseM3/units.CubicYard, 100*SpreadOnSiteFraction))
	case r.HaulLooseM3 > 0:
		loads := r.HaulLooseM3 / r.TruckCapacityM3
		r.Truckloads = int(math.Ceil(loads * (1 - loadRoundingTol)))
	}
	r.HaulCost = float64(r.Truckloads) * in.PricePerLoad

	if in.Soil.Swell < 1 {
		r.Notes = append(r.Notes, fmt.Sprintf("swell factor %.3g is below 1: loose volume is smaller than bank volume", in.Soil.Swell))
	}
	if in.Soil.Compaction > 1 {
		r.Notes = append(r.Notes, fmt.Sprintf(
			"compaction factor %.3g is above 1: compacted fill occupies more than its bank volume (as blasted rock does)",
			in.Soil.Compaction))
	}
	return r, nil
}

func soilName(s Soil) string {
	if s.Name == "" {
		return "the same soil"
	}
	return s.Name
}

func (in Inputs) validate() error {
	type check struct {
		field    string
		v        float64
		unit     string
		positive bool // > 0 rather than >= 0
	}
	checks := []check{
		{"CutBankM3", in.CutBankM3, "m³", false},
		{"FillCompactedM3", in.FillCompactedM3, "m³", false},
		{"Soil.Swell", in.Soil.Swell, "", true},
		{"Soil.Compaction", in.Soil.Compaction, "", true},
		{"TopsoilDepthM", in.TopsoilDepthM, "m", false},
		{"TopsoilAreaM2", in.TopsoilAreaM2, "m²", false},
		{"Truck.StruckM3", in.Truck.StruckM3, "m³", false},
		{"Truck.HeapedM3", in.Truck.HeapedM3, "m³", false},
		{"PricePerLoad", in.PricePerLoad, "", false},
	}
	if in.Topsoil != (Soil{}) {
		checks = append(checks, check{"Topsoil.Swell", in.Topsoil.Swell, "", true})
	}
	for _, c := range checks {
		switch {
		case math.IsNaN(c.v) || math.IsInf(c.v, 0):
			return &InputError{Field: c.field, Value: c.v, Unit: c.unit, Err: ErrNonFinite}
		case c.positive && c.v <= 0:
			return &InputError{Field: c.field, Value: c.v, Unit: c.unit, Err: ErrNotPositive}
		case c.v < 0:
			return &InputError{Field: c.field, Value: c.v, Unit: c.unit, Err: ErrNegative}
		}
	}
	t := in.Truck
	if t.HeapedM3 != 0 && t.HeapedM3 < t.StruckM3 {
		return &InputError{Field: "Truck.HeapedM3", Value: t.HeapedM3, Unit: "m³", Err: ErrHeapBelowStruck}
	}
	if t.StruckM3 != 0 || t.HeapedM3 != 0 {
		field := "Truck.StruckM3"
		if in.Heaped {
			field = "Truck.HeapedM3"
		}
		if c := t.Capacity(in.Heaped); c <= 0 {
			return &InputError{Field: field, Value: c, Unit: "m³", Err: ErrNotPositive}
		}
	}
	return nil
}
