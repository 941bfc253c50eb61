package cutfill

import (
	"fmt"
	"strings"
)

// Soil holds the volume conversion factors of one soil. Swell is the bank to
// loose factor (loose = bank × Swell, e.g. 1.25 for 25 % swell) and
// Compaction the bank to compacted factor (compacted = bank × Compaction,
// e.g. 0.90); Source says where the figures come from.
type Soil struct {
	Name       string
	Swell      float64
	Compaction float64
	Source     string
}

// SwellPercent returns the swell in percent, 100·(Swell − 1) (FHWA PDDM
// ch. 9 §9.4.C.4: swell factor = 1 + swell%/100).
func (s Soil) SwellPercent() float64 { return 100 * (s.Swell - 1) }

// Shrink returns the shrink as a fraction in the convention of this package,
// 1 − compacted/bank = 1 − Compaction (0.10 for loam). It is negative for a
// soil that occupies more room compacted than in the bank (blasted rock).
func (s Soil) Shrink() float64 { return 1 - s.Compaction }

// LoadFactor returns bank/loose = 1/Swell, the fraction of a loose load that
// is bank measure (0.80 for 25 % swell; FM 5-434 §1-6 and following).
func (s Soil) LoadFactor() float64 { return 1 / s.Swell }

// ShrinkConvention is the definition of shrink used by [Soil.Shrink] and named
// in every [Result].
const ShrinkConvention = "shrink = 1 − compacted/bank = 1 − compaction factor " +
	"(US Army FM 5-434 Table 1-2 conversion factors); fill needs compacted/compaction " +
	"factor in bank measure. FHWA PDDM §9.4.C.4's shrink factor 1/(1 + s) differs and is not used"

// Source texts of the presets. The FM 5-434 table is quoted from memory
// (unconfirmed) except the sand row, which agrees with a secondary quotation
// of a Navy Engineering Aid table.
const (
	fm5434       = "US Army FM 5-434 Earthmoving Operations (2000), Table 1-2"
	sourceSand   = fm5434 + ", sand; agrees with a Navy Engineering Aid table seen only as a secondary quotation"
	sourceLoam   = fm5434 + ", loam (common earth); from memory, unconfirmed"
	sourceClay   = fm5434 + ", clay; from memory, unconfirmed"
	sourceRock   = fm5434 + ", rock (blasted); from memory, unconfirmed"
	sourceTop    = "loam values of " + fm5434 + " (common practice, no published figure for topsoil); organic topsoil often swells more"
	sourceGravel = "swell 1.12 for dry clean gravel from memory (no handbook table found); compaction assumed equal to sand's 0.95 (no source)"
)

// soilPresets lists the built-in soils, in the order [SoilPresets] returns
// them. Factors are bank→loose and bank→compacted.
var soilPresets = [...]Soil{
	// Topsoil: loam values (common practice, no source; check-values §2a
	// [practice]).
	{Name: "topsoil", Swell: 1.25, Compaction: 0.90, Source: sourceTop},
	// Sand: FM 5-434 Table 1-2, B→L 1.11, B→C 0.95 (check-values §2a
	// [partial]: only a secondary quotation was seen).
	{Name: "sand", Swell: 1.11, Compaction: 0.95, Source: sourceSand},
	// Clay: FM 5-434 Table 1-2, B→L 1.43, B→C 0.90 (check-values §2a
	// [memory]).
	{Name: "clay", Swell: 1.43, Compaction: 0.90, Source: sourceClay},
	// Loam ("common earth"): FM 5-434 Table 1-2, B→L 1.25, B→C 0.90
	// (check-values §2a [memory]).
	{Name: "common earth", Swell: 1.25, Compaction: 0.90, Source: sourceLoam},
	// Gravel: B→L 1.12 (check-values §2a [memory], no handbook table);
	// compaction 0.95 is an assumption (sand's figure), no source.
	{Name: "gravel", Swell: 1.12, Compaction: 0.95, Source: sourceGravel},
	// Rock (blasted): FM 5-434 Table 1-2, B→L 1.50, B→C 1.30 (check-values
	// §2a [memory]); blasted rock compacts to more than its bank volume.
	{Name: "rock", Swell: 1.50, Compaction: 1.30, Source: sourceRock},
}

// soilAliases maps other spellings (after normalisation) to preset names.
var soilAliases = map[string]string{
	"loam":         "common earth",
	"earth":        "common earth",
	"common":       "common earth",
	"blasted rock": "rock",
	"rock blasted": "rock",
}

// SoilPresets returns the built-in soils: topsoil, sand, clay, common earth
// (loam), gravel and rock. The slice is a fresh copy.
func SoilPresets() []Soil {
	out := make([]Soil, len(soilPresets))
	copy(out, soilPresets[:])
	return out
}

// SoilPreset returns the built-in soil called name. Case, surrounding space,
// and '-' or '_' for a space do not matter; "loam" and "earth" are accepted
// for common earth and "blasted rock" for rock. An unknown name gives an
// error wrapping [ErrUnknownSoil] that lists the known ones.
func SoilPreset(name string) (Soil, error) {
	key := normaliseName(name)
	if a, ok := soilAliases[key]; ok {
		key = a
	}
	for _, s := range soilPresets {
		if s.Name == key {
			return s, nil
		}
	}
	names := make([]string, len(soilPresets))
	for i, s := range soilPresets {
		names[i] = s.Name
	}
	return Soil{}, fmt.Errorf("%w %q (want one of: %s)", ErrUnknownSoil, name, strings.Join(names, ", "))
}

// normaliseName lower-cases s, turns '-' and '_' into spaces and collapses
// runs of space.
func normaliseName(s string) string {
	s = strings.ToLower(s)
	s = strings.NewReplacer("-", " ", "_", " ").Replace(s)
	return strings.Join(strings.Fields(s), " ")
}
