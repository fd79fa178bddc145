// Package catalog is Lagwright's published reference data, compiled into the binary:
// steel pipe and copper tube sizes, pipe-wall materials, jackets and coatings, generic
// insulation material classes with their apparent conductivity against mean temperature,
// thickness series, and energy-code minimum pipe insulation tables.
//
// Every entry names its source in a Source field, as a reader cites it (docs/references.md):
// a value read in a published source cites that source; "common practice" marks trade
// conventions; "as recalled, check before use" marks values recalled but not checked against the
// named standard. Values from memory must be verified before they are relied on; every one
// of them is editable in the application (custom materials, surface emittance, …).
//
// Units are SI: mm, °C, W/(m·K). Values published in inch-pound units are converted
// exactly (1 in = 25.4 mm; °C = (°F − 32)·5/9; 1 Btu·in/(h·ft²·°F) = 0.144227888 W/(m·K)),
// and the original inch-pound value is kept beside each converted number in the source.
//
// Accessors return copies: callers may modify what they get without changing the catalog.
// The package imports only the standard library.
package catalog

// BtuInToWmK converts conductivity from Btu·in/(h·ft²·°F) to W/(m·K).
const BtuInToWmK = 0.144227888

// MMPerInch is the exact length of one inch in millimetres.
const MMPerInch = 25.4

// FToC converts a temperature in °F to °C.
func FToC(f float64) float64 { return (f - 32) * 5 / 9 }

// CToF converts a temperature in °C to °F.
func CToF(c float64) float64 { return c*9/5 + 32 }

// in2mm converts inches to millimetres.
func in2mm(in float64) float64 { return in * MMPerInch }

// Source labels used throughout the package.
const (
	labelMemory = "as recalled, check before use"
	labelCommon = "common practice"
)
