package units

// Length factors, metres per unit.
const (
	// Metre is the SI unit of length.
	Metre = 1.0
	// Foot is the international foot, 0.3048 m exactly (yard and pound
	// agreement of 1959; 85 FR 62698, 2020).
	Foot = 0.3048
	// USSurveyFoot is 1200/3937 m exactly (85 FR 62698, 2020; deprecated
	// from 2023 but still used by legacy state-plane data).
	USSurveyFoot = 1200.0 / 3937.0
	// Inch is 0.0254 m exactly (1/12 foot).
	Inch = 0.0254
	// Yard is 0.9144 m exactly (3 feet).
	Yard = 0.9144
	// Centimetre is 0.01 m.
	Centimetre = 0.01
	// Millimetre is 0.001 m.
	Millimetre = 0.001
	// Mil is a thousandth of an inch, 2.54e-5 m exactly (liner thickness).
	Mil = 0.0000254
)

// Area factors, square metres per unit.
const (
	// SquareFoot is 0.3048² m² = 0.09290304 m² exactly.
	SquareFoot = Foot * Foot
	// SquareYard is 0.9144² m² = 0.83612736 m² exactly.
	SquareYard = Yard * Yard
)

// Volume factors, cubic metres per unit.
const (
	// CubicFoot is 0.3048³ m³ = 0.028316846592 m³ exactly.
	CubicFoot = Foot * Foot * Foot
	// CubicYard is 27 ft³ = 0.9144³ m³ = 0.764554857984 m³ exactly.
	CubicYard = Yard * Yard * Yard
	// Litre is 0.001 m³ exactly (SI Brochure, 9th ed., Table 8).
	Litre = 0.001
	// USGallon is 231 in³ exactly (NIST Handbook 44, App. C) =
	// 3.785411784e-3 m³.
	USGallon = 231 * Inch * Inch * Inch
	// CubicInch is 0.0254³ m³.
	CubicInch = Inch * Inch * Inch
)

// Mass factors, kilograms per unit.
const (
	// Pound is the avoirdupois pound, 0.45359237 kg exactly (NIST SP 811,
	// App. B.8; 1959 agreement).
	Pound = 0.45359237
	// ShortTon is 2000 lb = 907.18474 kg exactly.
	ShortTon = 2000 * Pound
	// Tonne is the metric ton, 1000 kg exactly.
	Tonne = 1000.0
)

// Density factors, kilograms per cubic metre per unit.
const (
	// PoundPerCubicFoot is 1 lb/ft³ = 16.01846337396... kg/m³.
	PoundPerCubicFoot = Pound / CubicFoot
)

// Flow factors, cubic metres per second per unit.
const (
	// GallonPerHour is one US gallon per hour.
	GallonPerHour = USGallon / 3600
	// GallonPerMinute is one US gallon per minute.
	GallonPerMinute = USGallon / 60
	// LitrePerMinute is one litre per minute.
	LitrePerMinute = Litre / 60
	// CubicMetrePerHour is one cubic metre per hour.
	CubicMetrePerHour = 1.0 / 3600
)
