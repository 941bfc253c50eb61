package cutfill

import (
	"fmt"
	"math"
	"strings"

	"github.com/dugout-estimating/dugout/internal/units"
)

// Truck is a haul truck's body capacity in cubic metres: StruckM3 is the
// volume level with the top of the body, HeapedM3 the struck volume plus the
// heap above it. The zero Truck means "no truck": [Compute] then counts no
// loads.
type Truck struct {
	Name     string
	StruckM3 float64
	HeapedM3 float64
}

// Capacity returns the capacity a load is counted by: HeapedM3 when heaped,
// else StruckM3.
func (t Truck) Capacity(heaped bool) float64 {
	if heaped {
		return t.HeapedM3
	}
	return t.StruckM3
}

// DefaultHeapSlope is the heap slope, horizontal per vertical, of the SAE
// rating rule for dumper bodies: the heap is bounded by planes sloping 2H:1V
// inward and upward from the body's top edges (SAE J1363 as summarised
// secondarily; check-values §2b [partial]).
const DefaultHeapSlope = 2.0

// TruckFromBody returns the capacity of a rectangular body lengthM × widthM
// × depthM (inside dimensions, metres) with a heap bounded by planes at
// heapSlope horizontal per vertical (2 for the 2:1 rule). The struck volume is
// L·W·D. The heap is a hip roof over the body: with L ≥ W (the two are
// swapped if needed) and m = 1/heapSlope its rise per run,
//
//	V_heap = m·W²·(3L − W)/12,
//
// which for L = W is the pyramid m·W³/6. An infinite heapSlope gives no
// heap. When a dimension is not a positive finite number or heapSlope is not
// positive (NaN included), both capacities are NaN, so that [Compute] rejects
// the truck rather than count no loads. Name is left empty.
func TruckFromBody(lengthM, widthM, depthM float64, heapSlope float64) Truck {
	ok := func(v float64) bool { return v > 0 && !math.IsInf(v, 0) }
	if !ok(lengthM) || !ok(widthM) || !ok(depthM) || !(heapSlope > 0) {
		return Truck{StruckM3: math.NaN(), HeapedM3: math.NaN()}
	}
	l, w := lengthM, widthM
	if w > l {
		l, w = w, l
	}
	struck := l * w * depthM
	m := 1 / heapSlope // 0 for an infinite slope
	heap := m * w * w * (3*l - w) / 12
	return Truck{StruckM3: struck, HeapedM3: struck + heap}
}

// truckBodies are the preset bodies, in feet: length, width, depth. The
// widths follow Nichols & Day, Moving the Earth §2.52 ("most such bodies are
// 7 feet wide inside"); lengths and depths are common practice, no source,
// chosen inside the usual struck ranges (single-axle about 5–8 yd³, tandem
// 10–14 yd³, tri-axle 14–18 yd³; check-values §2b [practice]). They are
// defaults: a site file can give its own body.
var truckBodies = [...]struct {
	name    string
	l, w, d float64 // ft
}{
	// 10 × 7 × 2.5 ft: struck 175 ft³ = 6.48 yd³, heaped (2:1) 8.22 yd³.
	{"single-axle", 10, 7, 2.5},
	// 14 × 7 × 3 ft: struck 294 ft³ = 10.89 yd³, heaped (2:1) 13.54 yd³.
	{"tandem", 14, 7, 3},
	// 16 × 7 × 3.75 ft: struck 420 ft³ = 15.56 yd³, heaped (2:1) 18.65 yd³.
	{"tri-axle", 16, 7, 3.75},
}

var truckAliases = map[string]string{
	"single":      "single-axle",
	"tandem axle": "tandem",
	"tri":         "tri-axle",
	"triaxle":     "tri-axle",
}

// TruckPresets returns the built-in trucks: single-axle, tandem and
// tri-axle, each with the 2:1 heap ([DefaultHeapSlope]).
func TruckPresets() []Truck {
	out := make([]Truck, len(truckBodies))
	for i := range truckBodies {
		out[i] = presetTruck(i)
	}
	return out
}

func presetTruck(i int) Truck {
	b := truckBodies[i]
	t := TruckFromBody(b.l*units.Foot, b.w*units.Foot, b.d*units.Foot, DefaultHeapSlope)
	t.Name = b.name
	return t
}

// TruckPreset returns the built-in truck called name ("single-axle",
// "tandem", "tri-axle"; case, '_' and spaces for '-' do not matter). An
// unknown name gives an error wrapping [ErrUnknownTruck].
func TruckPreset(name string) (Truck, error) {
	key := normaliseName(name)
	if a, ok := truckAliases[key]; ok {
		key = normaliseName(a)
	}
	for i, b := range truckBodies {
		if normaliseName(b.name) == key {
			return presetTruck(i), nil
		}
	}
	names := make([]string, len(truckBodies))
	for i, b := range truckBodies {
		names[i] = b.name
	}
	return Truck{}, fmt.Errorf("%w %q (want one of: %s)", ErrUnknownTruck, name, strings.Join(names, ", "))
}
