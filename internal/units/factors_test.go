package units

import (
	"math"
	"math/big"
	"testing"
)

// rat parses an exact decimal.
func rat(s string) *big.Rat {
	r, ok := new(big.Rat).SetString(s)
	if !ok {
		panic(s)
	}
	return r
}

// TestFactorsExact checks every factor against its exact definition, computed
// in rational arithmetic and rounded once to float64.
func TestFactorsExact(t *testing.T) {
	ft := rat("0.3048")                        // 85 FR 62698 (2020): 1 ft = 0.3048 m exactly
	usft := new(big.Rat).SetFrac64(1200, 3937) // 85 FR 62698: US survey foot = 1200/3937 m
	in := rat("0.0254")                        // NBS Circ. 572 Addendum (1960): 1 in = 25.4 mm
	yd := rat("0.9144")                        // same, 1 yd = 0.9144 m
	lb := rat("0.45359237")                    // NIST SP 811 App. B: 1 lb = 0.45359237 kg exactly
	mul := func(a ...*big.Rat) *big.Rat {
		r := big.NewRat(1, 1)
		for _, x := range a {
			r.Mul(r, x)
		}
		return r
	}
	tests := []struct {
		name string
		got  float64
		want *big.Rat
	}{
		{"Foot", Foot, ft},
		{"USSurveyFoot", USSurveyFoot, usft},
		{"Inch", Inch, in},
		{"Yard", Yard, yd},
		{"SquareFoot", SquareFoot, mul(ft, ft)},
		{"CubicFoot", CubicFoot, mul(ft, ft, ft)},                   // check-values §1 [derived] 0.028316846592
		{"CubicYard", CubicYard, mul(yd, yd, yd)},                   // check-values §1 [derived] 0.764554857984
		{"USGallon", USGallon, mul(big.NewRat(231, 1), in, in, in)}, // NIST HB 44 App. C: 231 in³ exactly
		{"Pound", Pound, lb},
		{"ShortTon", ShortTon, mul(big.NewRat(2000, 1), lb)}, // 907.18474 kg [derived]
		{"PoundPerCubicFoot", PoundPerCubicFoot, new(big.Rat).Quo(lb, mul(ft, ft, ft))},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			want, _ := tc.want.Float64()
			// A product of exact constants in float64 may be off by an ulp or two.
			if math.Abs(tc.got-want) > 4*ulp(want) {
				t.Errorf("%s = %.17g, want %.17g", tc.name, tc.got, want)
			}
		})
	}
}

// TestPublishedValues pins the printed decimal values of check-values.md §1.
func TestPublishedValues(t *testing.T) {
	tests := []struct {
		name      string
		got, want float64
	}{
		{"m³ per yd³", CubicYard, 0.764554857984},                     // [derived] 0.9144³
		{"m³ per ft³", CubicFoot, 0.028316846592},                     // [derived] 0.3048³
		{"L per US gal", USGallon / Litre, 3.785411784},               // [derived] 231 × 0.0254³
		{"US gal per ft³", CubicFoot / USGallon, 1728.0 / 231.0},      // [derived] 7.4805194...
		{"US gal per m³", 1 / USGallon, 264.1720523581484},            // [derived]
		{"kg/m³ per lb/ft³", PoundPerCubicFoot, 16.01846337396},       // [derived] 1 lb/ft³
		{"kg per short ton", ShortTon, 907.18474},                     // [derived]
		{"tonne per short ton", Tonne / ShortTon, 1.1023113109243878}, // [derived]
		{"usft/ft", USSurveyFoot / Foot, 1.000002000004},              // [derived] 2 ppm
	}
	for _, tc := range tests {
		if math.Abs(tc.got-tc.want) > 1e-12*math.Abs(tc.want) {
			t.Errorf("%s = %.17g, want %.17g", tc.name, tc.got, tc.want)
		}
	}
}

func ulp(x float64) float64 { return math.Nextafter(math.Abs(x), math.Inf(1)) - math.Abs(x) }
