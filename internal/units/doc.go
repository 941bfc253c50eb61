// Package units holds exact conversion factors between SI units and the US
// customary units contractors use (feet, US survey feet, inches, yards, cubic
// yards, US gallons, pounds, short tons), and parses lengths written with a
// unit, such as "2ft", "30in" or "0.75 m".
//
// Every factor converts one of the named unit into SI (metres, square metres,
// cubic metres, kilograms). Internally the project computes in SI only;
// conversion happens at input and output. Sources are the exact definitions
// in NIST Special Publication 811 (2008), Appendix B, and NIST Handbook 44,
// Appendix C, and the Federal Register notice of 5 October 2020 (85 FR 62698)
// for the international and US survey foot.
package units
