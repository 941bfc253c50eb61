package takeoff

import (
	"fmt"
	"strings"

	"github.com/dugout-estimating/dugout/internal/units"
)

// Severity grades a caution. Its zero value is Info.
type Severity int

// Severities, least first.
const (
	Info Severity = iota
	Warning
	Danger
)

// String returns "info", "warning" or "danger".
func (s Severity) String() string {
	switch s {
	case Warning:
		return "warning"
	case Danger:
		return "danger"
	}
	return "info"
}

// MarshalText writes the severity as its name in JSON.
func (s Severity) MarshalText() ([]byte, error) { return []byte(s.String()), nil }

// Caution is one safety or code item printed with an estimate: a short
// stable key, a severity, a message for the builder and the rule it rests
// on.
type Caution struct {
	Key      string   `json:"key"`
	Severity Severity `json:"severity"`
	Message  string   `json:"message"`
	Rule     string   `json:"rule"`
}

// SoilType is the OSHA soil classification of 29 CFR 1926 Subpart P,
// Appendix A. Its zero value is unclassified soil, which the standard
// treats as Type C.
type SoilType int

// Soil types.
const (
	SoilUnclassified SoilType = iota
	SoilStableRock
	SoilTypeA
	SoilTypeB
	SoilTypeC
)

// String returns "unclassified", "stable rock", "Type A", "Type B" or
// "Type C".
func (s SoilType) String() string {
	switch s {
	case SoilStableRock:
		return "stable rock"
	case SoilTypeA:
		return "Type A"
	case SoilTypeB:
		return "Type B"
	case SoilTypeC:
		return "Type C"
	}
	return "unclassified"
}

// ParseSoilType parses "rock" (or "stable rock"), "A", "B", "C" (or
// "type a" ...), and "" or "unclassified".
func ParseSoilType(s string) (SoilType, error) {
	k := strings.TrimPrefix(presetKey(s), "type")
	switch k {
	case "", "unclassified", "unknown":
		return SoilUnclassified, nil
	case "rock", "stablerock":
		return SoilStableRock, nil
	case "a":
		return SoilTypeA, nil
	case "b":
		return SoilTypeB, nil
	case "c":
		return SoilTypeC, nil
	}
	return SoilUnclassified, fmt.Errorf("%w: soil type %q (want rock, A, B, C or unclassified)", ErrOption, s)
}

// MaxSlopeHV returns the maximum allowable slope for excavations less than
// 20 ft deep, as horizontal per vertical, from 29 CFR 1926 Subpart P,
// Appendix B, Table B-1: stable rock vertical (0), Type A ¾:1, Type B 1:1,
// Type C 1½:1 (check-values.md §4, [partial]: quoted in several secondary
// sources). Unclassified soil gets the Type C slope, as 29 CFR
// 1926.652(b)(1)(i) requires when no classification is made
// (check-values.md §4, [confirmed]). The short-term ½:1 allowance for
// shallow Type A cuts is not used.
func (s SoilType) MaxSlopeHV() float64 {
	switch s {
	case SoilStableRock:
		return 0
	case SoilTypeA:
		return 0.75
	case SoilTypeB:
		return 1
	}
	return 1.5
}

// Depth thresholds of the cautions.
const (
	// protectiveDepthM: 29 CFR 1926.652(a)(1) requires protection from
	// cave-ins in excavations 5 ft (1.52 m) deep or more, unless entirely in
	// stable rock (check-values.md §4 [confirmed]).
	protectiveDepthM = 5 * units.Foot
	// engineerDepthM: Appendix B applies to excavations up to 20 ft deep;
	// deeper sloping must be designed by a registered professional engineer
	// (check-values.md §4 [partial]).
	engineerDepthM = 20 * units.Foot
	// barrierDepthM: local codes may require a barrier around ornamental
	// ponds from 18–24 in of water (check-values.md §4, [memory]); the
	// caution starts at 18 in.
	barrierDepthM = 18 * units.Inch
)

// CautionInput is what the cautions look at.
type CautionInput struct {
	// MaxCutDepthM is the deepest excavation below existing ground.
	MaxCutDepthM float64
	// MaxWaterDepthM is the deepest water.
	MaxWaterDepthM float64
	Zones          []Zone
	Soil           SoilType
	// HeavyStone reports whether stone or boulders are placed.
	HeavyStone bool
}

// Cautions returns the cautions for a job, in a fixed order. They never
// replace local codes or licensed professionals, and the last item says so.
func Cautions(in CautionInput) []Caution {
	var c []Caution
	c = append(c, Caution{Key: "utilities", Severity: Danger,
		Message: "locate buried utilities before digging: call 811 in the US (or the local one-call service) a few working days ahead and hand-dig near the marks",
		Rule:    "29 CFR 1926.651(b); 811 one-call (US)"})
	deep := in.MaxCutDepthM >= protectiveDepthM
	if deep {
		c = append(c, Caution{Key: "protective-system", Severity: Danger,
			Message: fmt.Sprintf("the excavation is %.2f m (%.1f ft) deep: anyone entering a cut 5 ft (1.5 m) deep or more needs a protective system (sloping, benching, shoring or a shield) unless it is entirely in stable rock",
				in.MaxCutDepthM, in.MaxCutDepthM/units.Foot),
			Rule: "29 CFR 1926.652(a)(1), or the local equivalent"})
	}
	if in.MaxCutDepthM > engineerDepthM {
		c = append(c, Caution{Key: "engineer-design", Severity: Danger,
			Message: "the excavation is deeper than 20 ft (6.1 m): its sloping or benching must be designed by a registered professional engineer",
			Rule:    "29 CFR 1926 Subpart P Appendix B, Table B-1 note (excavations over 20 ft)"})
	}
	maxHV := in.Soil.MaxSlopeHV()
	for _, z := range in.Zones {
		if z.WallSlope >= maxHV {
			continue
		}
		sev := Warning
		if deep {
			sev = Danger
		}
		soil := in.Soil.String()
		if in.Soil == SoilUnclassified {
			soil = "unclassified soil, treated as Type C"
		}
		c = append(c, Caution{Key: "wall-slope", Severity: sev,
			Message: fmt.Sprintf("zone %q has walls at %s:1 (H:V), steeper than the %s:1 allowed for %s; at 5 ft (1.5 m) or deeper flatten them or protect the cut",
				z.Name, fmtHV(z.WallSlope), fmtHV(maxHV), soil),
			Rule: "29 CFR 1926 Subpart P Appendix B Table B-1; 1926.652(b)(1)(i) for unclassified soil"})
	}
	c = append(c, Caution{Key: "spoil-setback", Severity: Warning,
		Message: "keep spoil piles and equipment at least 2 ft (0.6 m) back from the edge of the excavation",
		Rule:    "29 CFR 1926.651(j)(2)"})
	c = append(c, Caution{Key: "electrical", Severity: Danger,
		Message: "pumps, lights and outlets near the water need GFCI protection and a licensed electrician",
		Rule:    "NFPA 70 (NEC) Article 680 (and 682 for natural and artificial bodies of water), or the local wiring rules"})
	if in.HeavyStone {
		c = append(c, Caution{Key: "heavy-stone", Severity: Warning,
			Message: "set heavy stone and boulders with team lifts, bars and dollies or a machine; keep hands and feet clear of the drop",
			Rule:    "common practice (no specific rule cited)"})
	}
	if in.MaxWaterDepthM >= barrierDepthM {
		c = append(c, Caution{Key: "barrier", Severity: Warning,
			Message: fmt.Sprintf("the water is %.2f m (%.0f in) deep: many local codes require a barrier or fence around water deeper than 18–24 in; check the local ordinance",
				in.MaxWaterDepthM, in.MaxWaterDepthM/units.Inch),
			Rule: "local ordinance (e.g. pool-barrier rules of the ISPSC/IRC)"})
	}
	c = append(c, Caution{Key: "local-codes", Severity: Info,
		Message: "these cautions do not replace local codes, permits or licensed professionals: always defer to them",
		Rule:    "local codes"})
	return c
}

// fmtHV writes a slope ratio compactly: 0.75 -> "0.75", 1.5 -> "1.5".
func fmtHV(v float64) string { return fmt.Sprintf("%g", v) }
