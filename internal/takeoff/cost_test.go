package takeoff

import (
	"errors"
	"math"
	"testing"

	"github.com/dugout-estimating/dugout/internal/units"
)

func TestCost(t *testing.T) {
	q := CostQuantities{CutM3: 10 * units.CubicYard, Truckloads: 2, LinerAreaM2: 100 * units.SquareFoot,
		UnderlaymentAreaM2: 20, StoneKg: 3 * units.ShortTon, GravelKg: 500, CrewHours: 6}
	p := PriceList{Currency: "USD", PerCubicYardDug: 40, PerTruckload: 90, PerSquareFootLiner: 1.1,
		PerSquareMetreUnderlayment: 2, PerTonStone: 150, PerTonneGravel: 60, PerCrewHour: 85,
		Fixed: []FixedItem{{"pump and filter", 650}}}
	ct, err := Cost(q, p)
	if err != nil {
		t.Fatal(err)
	}
	// By hand: 400 + 180 + 110 + 40 + 450 + 30 + 510 + 650 = 2370.
	if len(ct.Lines) != 8 || math.Abs(ct.Total-2370) > 1e-9 || ct.Currency != "USD" {
		t.Errorf("cost %+v, want 8 lines totalling 2370", ct)
	}
	if ct.Lines[0].Item != "excavation" || ct.Lines[0].Unit != "yd³" || math.Abs(ct.Lines[0].Quantity-10) > 1e-12 {
		t.Errorf("first line %+v", ct.Lines[0])
	}
	if _, err := Cost(q, PriceList{PerCubicYardDug: 1, PerCubicMetreDug: 1}); !errors.Is(err, ErrOption) {
		t.Errorf("both units: err = %v, want ErrOption", err)
	}
	if _, err := Cost(q, PriceList{PerCrewHour: -1}); !errors.Is(err, ErrOption) {
		t.Errorf("negative price: err = %v, want ErrOption", err)
	}
	if ct, err := Cost(q, PriceList{}); err != nil || len(ct.Lines) != 0 || ct.Total != 0 {
		t.Errorf("empty price list: %+v, %v", ct, err)
	}
}
