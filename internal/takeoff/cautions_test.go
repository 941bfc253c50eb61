package takeoff

import (
	"errors"
	"math"
	"testing"
)

func TestSoilType_TableB1(t *testing.T) {
	// 29 CFR 1926 Subpart P, Appendix B, Table B-1, maximum allowable slopes
	// (H:V) for excavations under 20 ft: stable rock vertical, Type A ¾:1
	// (53°), Type B 1:1 (45°), Type C 1½:1 (34°) (check-values.md §4,
	// [partial]); unclassified soil as Type C (29 CFR 1926.652(b)(1)(i),
	// [confirmed]). Angles from horizontal, atan(V/H), check-values.md §4
	// [derived]: 53.130°, 45.000°, 33.690°.
	for _, tc := range []struct {
		soil     SoilType
		hv, deg  float64
		parseArg string
	}{
		{SoilStableRock, 0, 90, "rock"},
		{SoilTypeA, 0.75, 53.130, "A"},
		{SoilTypeB, 1, 45.000, "type b"},
		{SoilTypeC, 1.5, 33.690, "Type C"},
		{SoilUnclassified, 1.5, 33.690, ""},
	} {
		if got := tc.soil.MaxSlopeHV(); got != tc.hv {
			t.Errorf("%v: max slope %g:1, want %g:1", tc.soil, got, tc.hv)
		}
		if deg := math.Atan2(1, tc.hv) * 180 / math.Pi; math.Abs(deg-tc.deg) > 0.0005 {
			t.Errorf("%v: %.3f° from horizontal, want %.3f°", tc.soil, deg, tc.deg)
		}
		if s, err := ParseSoilType(tc.parseArg); err != nil || s != tc.soil {
			t.Errorf("ParseSoilType(%q) = %v, %v, want %v", tc.parseArg, s, err, tc.soil)
		}
	}
	if _, err := ParseSoilType("peat"); !errors.Is(err, ErrOption) {
		t.Errorf("ParseSoilType(peat): err = %v", err)
	}
}

func FuzzParseSoilType(f *testing.F) {
	for _, s := range []string{"", "rock", "A", "type b", "C", "x"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		st, err := ParseSoilType(s)
		if err != nil {
			return
		}
		if st < SoilUnclassified || st > SoilTypeC || st.MaxSlopeHV() < 0 {
			t.Errorf("ParseSoilType(%q) = %v", s, st)
		}
	})
}

func TestCautions(t *testing.T) {
	keys := func(cs []Caution) map[string]Caution {
		m := map[string]Caution{}
		for _, c := range cs {
			m[c.Key] = c
			if c.Message == "" || c.Rule == "" {
				t.Errorf("caution %q without message or rule", c.Key)
			}
		}
		return m
	}
	shallow := keys(Cautions(CautionInput{MaxCutDepthM: 1.0, MaxWaterDepthM: 0.3, Zones: []Zone{{Name: "a", WallSlope: 2}}}))
	for _, k := range []string{"utilities", "spoil-setback", "electrical", "local-codes"} {
		if _, ok := shallow[k]; !ok {
			t.Errorf("shallow pond: no %q caution", k)
		}
	}
	for _, k := range []string{"protective-system", "wall-slope", "barrier", "heavy-stone", "engineer-design"} {
		if _, ok := shallow[k]; ok {
			t.Errorf("shallow pond: unexpected %q caution", k)
		}
	}
	// 5 ft is the threshold of 1926.652(a)(1): 1.524 m and deeper.
	deep := keys(Cautions(CautionInput{MaxCutDepthM: 1.524, MaxWaterDepthM: 1.2, Zones: []Zone{{Name: "deep", WallSlope: 1}},
		Soil: SoilTypeC, HeavyStone: true}))
	for _, k := range []string{"protective-system", "wall-slope", "barrier", "heavy-stone"} {
		if _, ok := deep[k]; !ok {
			t.Errorf("deep pond: no %q caution", k)
		}
	}
	if deep["wall-slope"].Severity != Danger || deep["protective-system"].Severity != Danger {
		t.Errorf("deep pond severities %v", deep)
	}
	// A 1:1 wall is fine in Type B soil and too steep in unclassified soil.
	b := keys(Cautions(CautionInput{MaxCutDepthM: 1, Zones: []Zone{{WallSlope: 1}}, Soil: SoilTypeB}))
	if _, ok := b["wall-slope"]; ok {
		t.Error("1:1 wall in Type B soil flagged")
	}
	if got := keys(Cautions(CautionInput{MaxCutDepthM: 7})); got["engineer-design"].Key == "" {
		t.Error("7 m cut: no engineer-design caution")
	}
}

func TestSeverity_String(t *testing.T) {
	for s, want := range map[Severity]string{Info: "info", Warning: "warning", Danger: "danger"} {
		if b, _ := s.MarshalText(); s.String() != want || string(b) != want {
			t.Errorf("%d: %q", s, s.String())
		}
	}
}
