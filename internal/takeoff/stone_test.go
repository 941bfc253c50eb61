package takeoff

import (
	"errors"
	"math"
	"testing"

	"github.com/dugout-estimating/dugout/internal/units"
)

func TestRockPresets_InConfirmedRange(t *testing.T) {
	// Each preset's density lies in the confirmed range of the UBC-GIF
	// "Geophysics for Practicing Geoscientists" density tables
	// (check-values.md §3 [confirmed]); coquina in the ASTM C568 Type I
	// low-density limestone bracket, 1760–2160 kg/m³ ([partial]).
	want := map[string][2]float64{
		"granite": {2500, 2810}, "basalt": {2700, 3300}, "sandstone": {1610, 2760},
		"limestone": {1930, 2900}, "coquina": {1760, 2160},
	}
	for name, rng := range want {
		r, err := RockByName(name)
		if err != nil {
			t.Fatal(err)
		}
		if r.DensityKgM3 < rng[0] || r.DensityKgM3 > rng[1] || r.RangeLoKgM3 != rng[0] || r.RangeHiKgM3 != rng[1] {
			t.Errorf("%s: density %g, range %g–%g, want within %g–%g", name, r.DensityKgM3, r.RangeLoKgM3, r.RangeHiKgM3, rng[0], rng[1])
		}
	}
	if r, err := RockByName("Porous Limestone"); err != nil || r.Name != "coquina" {
		t.Errorf("alias: %+v, %v", r, err)
	}
	if _, err := RockByName("marble"); !errors.Is(err, ErrPreset) {
		t.Errorf("unknown rock: err = %v, want ErrPreset", err)
	}
}

func TestEdgeStone_HandComputed(t *testing.T) {
	// 20 m of shoreline, 0.3 m face, 0.4 m deep: 2.4 m³ of stone; mass =
	// volume × density, short tons = kg / 907.18474 (2000 lb of 0.45359237
	// kg, exact), computed by hand for each preset density.
	sh := ShorelineResult{LengthM: 20, LoopDetail: []Loop{{Closed: true, LengthM: 20}}}
	for _, tc := range []struct {
		rock      string
		kg, short float64
	}{
		{"granite", 6336, 6336 / 907.18474},
		{"basalt", 7176, 7176 / 907.18474},
		{"sandstone", 5640, 5640 / 907.18474},
		{"limestone", 6120, 6120 / 907.18474},
		{"coquina", 4560, 4560 / 907.18474},
	} {
		r, err := EdgeStone(sh, EdgeStoneOptions{Rock: tc.rock, FaceHeightM: 0.3, ThicknessM: 0.4})
		if err != nil {
			t.Fatal(err)
		}
		if !closeRel(r.VolumeM3, 2.4, 1e-12, 0) || !closeRel(r.Stone.Kg, tc.kg, 1e-12, 0) || !closeRel(r.Stone.ShortTons, tc.short, 1e-12, 0) ||
			!closeRel(r.Stone.Tonnes, tc.kg/1000, 1e-12, 0) {
			t.Errorf("%s: %+v, want %g kg = %g short tons", tc.rock, r, tc.kg, tc.short)
		}
	}
}

func TestEdgeStone_CheckValues(t *testing.T) {
	// check-values.md §7 [derived]: 1 yd³ of solid granite at 2.64 t/m³ is
	// 2.018 t = 2.225 short tons; as a pile with 35 % voids, 1.312 t.
	yd := math.Cbrt(units.CubicYard)
	sh := ShorelineResult{LengthM: yd}
	r, err := EdgeStone(sh, EdgeStoneOptions{Rock: "granite", FaceHeightM: yd, ThicknessM: yd})
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(r.Stone.Tonnes-2.018) > 0.0005 || math.Abs(r.Stone.ShortTons-2.225) > 0.0005 {
		t.Errorf("1 yd³ granite = %.4f t = %.4f short tons, want 2.018 and 2.225", r.Stone.Tonnes, r.Stone.ShortTons)
	}
	r, err = EdgeStone(sh, EdgeStoneOptions{Rock: "granite", FaceHeightM: yd, ThicknessM: yd, VoidFraction: 0.35})
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(r.Stone.Tonnes-1.312) > 0.0005 {
		t.Errorf("1 yd³ granite pile with 35 %% voids = %.4f t, want 1.312", r.Stone.Tonnes)
	}
}

func TestEdgeStone_StretchesAndBoulders(t *testing.T) {
	sh := ShorelineResult{LengthM: 30, LoopDetail: []Loop{{Closed: true, LengthM: 25}, {Closed: true, LengthM: 5, Island: true}}}
	o := EdgeStoneOptions{DensityKgM3: 2000, FaceHeightM: 0.5, ThicknessM: 0.5, BoulderPercent: 10, BoulderKg: 300,
		Stretches: []Stretch{{0, 0, 4}, {0, 24, 1}, {1, 0, 5}}}
	r, err := EdgeStone(sh, o)
	if err != nil {
		t.Fatal(err)
	}
	// 4 + 2 + 5 = 11 m × 0.25 m² × 2000 kg/m³ = 5500 kg; boulders 550 + 300.
	if r.LengthM != 11 || !closeRel(r.Stone.Kg, 5500, 1e-12, 0) || !closeRel(r.Boulders.Kg, 850, 1e-12, 0) {
		t.Errorf("%+v: want 11 m, 5500 kg, 850 kg boulders", r)
	}
	o.Stretches = []Stretch{{0, 0, 4}, {5, 0, 1}}
	if _, err := EdgeStone(sh, o); !errors.Is(err, ErrStretch) {
		t.Errorf("stretch on loop 5: err = %v, want ErrStretch", err)
	}
}

func TestEdgeStone_BadInput(t *testing.T) {
	sh := ShorelineResult{LengthM: 10}
	good := EdgeStoneOptions{FaceHeightM: 0.3, ThicknessM: 0.3}
	for _, tc := range []struct {
		name string
		mod  func(*EdgeStoneOptions)
		want error
	}{
		{"zero thickness", func(o *EdgeStoneOptions) { o.ThicknessM = 0 }, ErrOption},
		{"negative thickness", func(o *EdgeStoneOptions) { o.ThicknessM = -0.2 }, ErrOption},
		{"zero face", func(o *EdgeStoneOptions) { o.FaceHeightM = 0 }, ErrOption},
		{"negative density", func(o *EdgeStoneOptions) { o.DensityKgM3 = -2600 }, ErrOption},
		{"NaN density", func(o *EdgeStoneOptions) { o.DensityKgM3 = math.NaN() }, ErrOption},
		{"all voids", func(o *EdgeStoneOptions) { o.VoidFraction = 1 }, ErrOption},
		{"negative allowance", func(o *EdgeStoneOptions) { o.BoulderPercent = -5 }, ErrOption},
		{"unknown rock", func(o *EdgeStoneOptions) { o.Rock = "obsidian" }, ErrPreset},
	} {
		o := good
		tc.mod(&o)
		_, err := EdgeStone(sh, o)
		var ve *ValueError
		if !errors.Is(err, tc.want) || (tc.want == ErrOption && !errors.As(err, &ve)) {
			t.Errorf("%s: err = %v, want %v", tc.name, err, tc.want)
		}
	}
}

func TestParseBoulderAllowance(t *testing.T) {
	for _, tc := range []struct {
		in      string
		pct, kg float64
	}{
		{"", 0, 0}, {"10%", 10, 0}, {" 12.5 % ", 12.5, 0},
		{"2 tons", 0, 2 * 907.18474}, {"2ton", 0, 2 * 907.18474}, {"1.5t", 0, 1500}, {"1.5 tonnes", 0, 1500},
		{"800kg", 0, 800}, {"500 lb", 0, 500 * 0.45359237},
	} {
		pct, kg, err := ParseBoulderAllowance(tc.in)
		if err != nil || pct != tc.pct || !closeRel(kg, tc.kg, 1e-12, 0) {
			t.Errorf("ParseBoulderAllowance(%q) = %g %%, %g kg, %v; want %g %%, %g kg", tc.in, pct, kg, err, tc.pct, tc.kg)
		}
	}
	for _, in := range []string{"ten", "-5%", "5", "NaN%", "inf t", "2 bags", "%", "0x10kg"} {
		if _, _, err := ParseBoulderAllowance(in); !errors.Is(err, ErrOption) {
			t.Errorf("ParseBoulderAllowance(%q): err = %v, want ErrOption", in, err)
		}
	}
}

func FuzzParseBoulderAllowance(f *testing.F) {
	for _, s := range []string{"", "10%", "2 tons", "1.5t", "800kg", "500 lb", "x", "1e3 tonnes"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		pct, kg, err := ParseBoulderAllowance(s)
		if err != nil {
			return
		}
		if pct < 0 || kg < 0 || math.IsNaN(pct) || math.IsNaN(kg) || math.IsInf(pct, 0) || math.IsInf(kg, 0) || (pct != 0 && kg != 0) {
			t.Errorf("ParseBoulderAllowance(%q) = %g %%, %g kg", s, pct, kg)
		}
	})
}

func TestGravel(t *testing.T) {
	// Area × thickness × loose bulk density, by hand: shelf 6 m² floor and
	// 4 m² walls, 5 cm of river rock at 1600 kg/m³ → 0.5 m³, 800 kg.
	zones := []ZoneArea{{Name: "shelf", FloorAreaM2: 6, WallAreaM2: 4}, {Name: "deep", FloorAreaM2: 3, WallAreaM2: -1}}
	rows, err := Gravel(zones, []GravelOptions{{Zone: "shelf", ThicknessM: 0.05, Walls: true}, {Zone: "deep", Material: "pea gravel", ThicknessM: 0.1}})
	if err != nil {
		t.Fatal(err)
	}
	if len(rows) != 2 || !closeRel(rows[0].VolumeM3, 0.5, 1e-12, 0) || !closeRel(rows[0].Mass.Kg, 800, 1e-12, 0) ||
		!closeRel(rows[1].Mass.Kg, 0.3*1550, 1e-12, 0) {
		t.Errorf("rows %+v", rows)
	}
	all, err := Gravel(zones, []GravelOptions{{ThicknessM: 0.05}})
	if err != nil || len(all) != 2 {
		t.Errorf("every zone: %+v, %v", all, err)
	}
	for _, tc := range []struct {
		name string
		g    GravelOptions
		want error
	}{
		{"zero thickness", GravelOptions{ThicknessM: 0}, ErrOption},
		{"negative density", GravelOptions{ThicknessM: 0.05, BulkDensityKgM3: -1}, ErrOption},
		{"no such zone", GravelOptions{Zone: "bog", ThicknessM: 0.05}, ErrOption},
		{"walls unknown", GravelOptions{Zone: "deep", ThicknessM: 0.05, Walls: true}, ErrOption},
		{"unknown material", GravelOptions{Material: "sand", ThicknessM: 0.05}, ErrPreset},
	} {
		if _, err := Gravel(zones, []GravelOptions{tc.g}); !errors.Is(err, tc.want) {
			t.Errorf("%s: err = %v, want %v", tc.name, err, tc.want)
		}
	}
}

func TestCrewTime(t *testing.T) {
	// One short ton per worker-hour (the trade's rule of thumb): 12 short
	// tons by a crew of 3 take 4 hours, half a day of 8 h; 3 short tons of
	// boulders at 1.5 per machine-hour add 2 h.
	r, err := CrewTime(12, 3, 1, 3, 1.5, 8)
	if err != nil {
		t.Fatal(err)
	}
	if r.WorkerHours != 12 || r.HandHours != 4 || r.MachineHours != 2 || r.Hours != 6 || r.Days != 0.75 {
		t.Errorf("CrewTime = %+v, want 12 worker-h, 4 + 2 h, 0.75 days", r)
	}
	for _, tc := range []struct {
		name                 string
		crew                 int
		rate, machine, hours float64
	}{
		{"zero crew", 0, 1, 2, 8}, {"negative crew", -2, 1, 2, 8}, {"zero rate", 2, 0, 2, 8},
		{"zero machine rate", 2, 1, 0, 8}, {"zero day", 2, 1, 2, 0}, {"day over 24 h", 2, 1, 2, 25},
	} {
		if _, err := CrewTime(5, 1, tc.rate, tc.crew, tc.machine, tc.hours); !errors.Is(err, ErrOption) {
			t.Errorf("%s: err = %v, want ErrOption", tc.name, err)
		}
	}
}

func TestAggregatePresets(t *testing.T) {
	// Loose bulk densities of 1.5–1.7 t/m³ (from memory / common practice).
	for _, a := range aggregatePresets {
		if a.BulkDensityKgM3 < 1500 || a.BulkDensityKgM3 > 1700 {
			t.Errorf("%s: %g kg/m³ outside 1500–1700", a.Name, a.BulkDensityKgM3)
		}
	}
	if a, err := AggregateByName("River-Rock"); err != nil || a.Name != "river rock" {
		t.Errorf("AggregateByName: %+v, %v", a, err)
	}
}
