package takeoff

import (
	"fmt"
	"math"

	"github.com/dugout-estimating/dugout/internal/units"
)

// PriceList is an optional price list in one currency. A zero price leaves
// its line out. Each quantity may be priced in US customary or metric units,
// not both.
type PriceList struct {
	Currency                   string
	PerCubicYardDug            float64 // per bank cubic yard excavated
	PerCubicMetreDug           float64 // per bank cubic metre excavated
	PerTruckload               float64
	PerSquareFootLiner         float64 // per square foot of liner bought
	PerSquareMetreLiner        float64
	PerSquareFootUnderlayment  float64
	PerSquareMetreUnderlayment float64
	PerTonStone                float64 // per short ton of edge stone and boulders
	PerTonneStone              float64
	PerTonGravel               float64 // per short ton of gravel
	PerTonneGravel             float64
	PerCrewHour                float64 // per hour of the stone crew's clock time
	Fixed                      []FixedItem
}

// FixedItem is a lump-sum line of the price list.
type FixedItem struct {
	Name   string  `json:"name"`
	Amount float64 `json:"amount"`
}

// CostLine is one line of the cost table.
type CostLine struct {
	Item      string  `json:"item"`
	Quantity  float64 `json:"quantity"`
	Unit      string  `json:"unit"`
	UnitPrice float64 `json:"unit_price"`
	Amount    float64 `json:"amount"`
}

// CostTable is the priced estimate.
type CostTable struct {
	Currency string     `json:"currency"`
	Lines    []CostLine `json:"lines"`
	Total    float64    `json:"total"`
}

// CostQuantities are the quantities a price list multiplies: earthwork as
// numbers from the cut/fill accounting, the rest from the takeoff.
type CostQuantities struct {
	CutM3              float64
	Truckloads         float64
	LinerAreaM2        float64 // stock bought
	UnderlaymentAreaM2 float64
	StoneKg            float64 // edge stone and boulders
	GravelKg           float64
	CrewHours          float64
}

// Cost prices the quantities. Lines come in a fixed order: excavation,
// trucking, liner, underlayment, stone, gravel, crew, then the fixed items.
// Errors: a negative or non-finite price, or one quantity priced in both
// unit systems.
func Cost(q CostQuantities, p PriceList) (CostTable, error) {
	t := CostTable{Currency: p.Currency}
	type rate struct {
		item           string
		us, si         float64
		usUnit, siUnit string
		usQty, siQty   float64
	}
	rates := []rate{
		{"excavation", p.PerCubicYardDug, p.PerCubicMetreDug, "yd³", "m³", q.CutM3 / units.CubicYard, q.CutM3},
		{"trucking", p.PerTruckload, 0, "load", "load", q.Truckloads, q.Truckloads},
		{"liner", p.PerSquareFootLiner, p.PerSquareMetreLiner, "ft²", "m²", q.LinerAreaM2 / units.SquareFoot, q.LinerAreaM2},
		{"underlayment", p.PerSquareFootUnderlayment, p.PerSquareMetreUnderlayment, "ft²", "m²",
			q.UnderlaymentAreaM2 / units.SquareFoot, q.UnderlaymentAreaM2},
		{"stone", p.PerTonStone, p.PerTonneStone, "short ton", "t", q.StoneKg / units.ShortTon, q.StoneKg / units.Tonne},
		{"gravel", p.PerTonGravel, p.PerTonneGravel, "short ton", "t", q.GravelKg / units.ShortTon, q.GravelKg / units.Tonne},
		{"crew", p.PerCrewHour, 0, "h", "h", q.CrewHours, q.CrewHours},
	}
	var total float64
	for _, r := range rates {
		for _, v := range []float64{r.us, r.si} {
			if !(v >= 0) || math.IsInf(v, 0) {
				return t, optionError("price of "+r.item, v, ">= 0")
			}
		}
		if r.us > 0 && r.si > 0 {
			return t, fmt.Errorf("%w: %s is priced both per %s and per %s: give one", ErrOption, r.item, r.usUnit, r.siUnit)
		}
		l := CostLine{Item: r.item}
		switch {
		case r.us > 0:
			l.Quantity, l.Unit, l.UnitPrice = r.usQty, r.usUnit, r.us
		case r.si > 0:
			l.Quantity, l.Unit, l.UnitPrice = r.siQty, r.siUnit, r.si
		default:
			continue
		}
		l.Amount = l.Quantity * l.UnitPrice
		total += l.Amount
		t.Lines = append(t.Lines, l)
	}
	for _, f := range p.Fixed {
		if !isFinite(f.Amount) {
			return t, optionError("fixed item "+f.Name, f.Amount, "a finite amount")
		}
		t.Lines = append(t.Lines, CostLine{Item: f.Name, Quantity: 1, Unit: "item", UnitPrice: f.Amount, Amount: f.Amount})
		total += f.Amount
	}
	t.Total = total
	return t, nil
}
