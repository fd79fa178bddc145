// Package demo holds Lagwright's demo project: an invented scenario of our own (the
// cellar and brewhouse expansion of a fictional brewery) with about forty-five pipe and
// duct runs across the usual services. It is pure data plus functions that build the
// store rows, so the `lagwright demo` command, the projects page and tests share it.
//
// Two lines are wrong on purpose, to show the line list's status flags: STM-207 is a
// medium-pressure steam line with far too little insulation (too hot to touch), and
// CHW-309 is a chilled-water line in a humid wash bay with thin insulation (it condenses).
// HHW-109, STM-202 and CHW-301 carry an invented as-found survey (wet, bare, damaged) for
// the Audit view.
package demo

import (
	"context"
	"encoding/json"
	"fmt"

	"lagwright/analysis"
	"lagwright/store"
)

// Name is the demo project's name (our invention; no real firm or place).
const Name = "Kettlewick Brewing: cellar and brewhouse expansion (demo)"

// Line is one run of the demo line list.
type Line struct {
	Tag, Service, Location, Exposure, Notes string
	Fittings                                analysis.Fittings
	Input                                   analysis.Input
}

func f(v float64) *float64 { return &v }

func i(v int) *int { return &v }

// inch is inches to mm (exact).
func inch(v float64) float64 { return v * 25.4 }

// ft is feet to m (exact).
func ft(v float64) float64 { return v * 0.3048 }

// psig is gauge psi to kPa.
func psig(v float64) float64 { return v * 6.894757293168361 }

// Settings are the demo project's conditions: a temperate plant room, a humid summer
// outdoors with a hard winter, ASHRAE 90.1 minimums, natural-gas heating and electric chillers.
func Settings() analysis.ProjectSettings {
	s := analysis.DefaultSettings()
	s.Indoor = analysis.Location{AmbientTempC: 24, RelativeHumidityPct: f(55), Conditions: &analysis.Conditions{
		Personnel: &analysis.ConditionSet{AmbientTempC: f(32)},
	}}
	s.Outdoor = analysis.Location{AmbientTempC: 33, WindMS: 3.4, RelativeHumidityPct: f(65), Conditions: &analysis.Conditions{
		Freeze:    &analysis.ConditionSet{AmbientTempC: f(-18), WindMS: f(6.7)},
		Economics: &analysis.ConditionSet{AmbientTempC: f(11), WindMS: f(3.4)},
	}}
	s.Criteria.EnergyCode = "ashrae-90.1-2016"
	// Invented prices: natural gas for the boilers, grid electricity for the chillers.
	s.Economics = &analysis.Economics{Currency: "USD",
		Heating:      &analysis.HeatingBasis{PricePerKWh: f(0.035), Efficiency: f(0.82), HoursPerYear: f(6000), CO2KgPerKWh: f(0.18)},
		Cooling:      &analysis.CoolingBasis{PricePerKWh: f(0.13), COP: f(3.0), HoursPerYear: f(6000), CO2KgPerKWh: f(0.35)},
		DiscountRate: f(0.05), EscalationRate: f(0.025), LifeYears: i(20)}
	return s
}

// layer is one insulation layer by material slug and thickness in inches.
func layer(slug string, inches float64) analysis.LayerInput {
	return analysis.LayerInput{Material: slug, ThicknessMM: f(inch(inches))}
}

const (
	fiber    = "mineral_fiber_pipe_c547_t1"
	calsil   = "calcium_silicate_c533_t1"
	elasto   = "elastomeric_c534_gr1"
	cellglas = "cellular_glass_c552_t2"
	polyiso  = "polyiso_c591"
	wrap     = "glass_blanket_c553"
)

// pipe is a horizontal steel or copper pipe run.
func pipe(size string, lengthFt float64, layers ...analysis.LayerInput) analysis.Input {
	return analysis.Input{Geometry: "pipe", PipeSize: size, LengthM: f(ft(lengthFt)), Layers: layers}
}

func water(in analysis.Input, tempF float64, jacket string) analysis.Input {
	in.OperatingTempC = f((tempF - 32) * 5 / 9)
	in.Jacket = jacket
	return in
}

func steam(in analysis.Input, p float64, jacket string) analysis.Input {
	in.Fluid = "steam"
	in.SteamGaugePressureKPa = f(psig(p))
	in.Jacket = jacket
	return in
}

func duct(wIn, hIn, lengthFt, tempF float64, jacket string, layers ...analysis.LayerInput) analysis.Input {
	return analysis.Input{Geometry: "duct", DuctWidthMM: f(inch(wIn)), DuctHeightMM: f(inch(hIn)), LengthM: f(ft(lengthFt)),
		OperatingTempC: f((tempF - 32) * 5 / 9), Fluid: "air", Layers: layers, Jacket: jacket}
}

func fit(e, t, v, fl, c int) analysis.Fittings {
	return analysis.Fittings{Elbows: e, Tees: t, Valves: v, FlangePairs: fl, Caps: c}
}

// Lines is the demo line list.
func Lines() []Line {
	ind, out := "indoor", "outdoor"
	exp, con := "exposed", "concealed"
	L := []Line{
		// Heating hot water, 180 °F supply / 150 °F return.
		{"HHW-101", "Heating hot water supply, boiler header", ind, exp, "", fit(6, 2, 4, 4, 0), water(pipe("NPS 4", 60, layer(fiber, 2)), 180, "all_service_jacket")},
		{"HHW-102", "Heating hot water return, boiler header", ind, exp, "", fit(6, 2, 4, 4, 0), water(pipe("NPS 4", 60, layer(fiber, 2)), 150, "all_service_jacket")},
		{"HHW-103", "HHW supply to brewhouse AHU-1", ind, con, "", fit(8, 2, 2, 2, 0), water(pipe("NPS 2-1/2", 140, layer(fiber, 2)), 180, "all_service_jacket")},
		{"HHW-104", "HHW return from brewhouse AHU-1", ind, con, "", fit(8, 2, 2, 2, 0), water(pipe("NPS 2-1/2", 140, layer(fiber, 2)), 150, "all_service_jacket")},
		{"HHW-105", "HHW supply to cellar unit heaters", ind, exp, "", fit(12, 6, 6, 0, 1), water(pipe("NPS 1-1/2", 220, layer(fiber, 2)), 180, "all_service_jacket")},
		{"HHW-106", "HHW return from cellar unit heaters", ind, exp, "", fit(12, 6, 6, 0, 1), water(pipe("NPS 1-1/2", 220, layer(fiber, 2)), 150, "all_service_jacket")},
		{"HHW-107", "HHW branch to office fan coils", ind, con, "", fit(10, 4, 4, 0, 0), water(pipe("NPS 1", 180, layer(fiber, 1.5)), 180, "all_service_jacket")},
		{"HHW-108", "HHW branch to office fan coils, return", ind, con, "", fit(10, 4, 4, 0, 0), water(pipe("NPS 1", 180, layer(fiber, 1.5)), 150, "all_service_jacket")},
		{"HHW-109", "HHW supply across the yard to the bottling shed", out, exp, "Rack-mounted, aluminium-jacketed.", fit(6, 0, 2, 2, 0), water(pipe("NPS 3", 240, layer(fiber, 2)), 180, "aluminium_weathered")},
		{"HHW-110", "HHW return from the bottling shed", out, exp, "", fit(6, 0, 2, 2, 0), water(pipe("NPS 3", 240, layer(fiber, 2)), 150, "aluminium_weathered")},
		// Steam and condensate.
		{"STM-201", "LP steam main, 15 psig, boiler to brewhouse", ind, exp, "", fit(6, 2, 3, 6, 0), steam(pipe("NPS 6", 120, layer(fiber, 3)), 15, "aluminium_new")},
		{"STM-202", "LP steam to mash tun jacket", ind, exp, "", fit(4, 1, 2, 2, 0), steam(pipe("NPS 3", 45, layer(fiber, 2.5)), 15, "aluminium_new")},
		{"STM-203", "LP steam to brew kettle jacket", ind, exp, "", fit(4, 1, 2, 2, 0), steam(pipe("NPS 4", 50, layer(fiber, 3)), 15, "aluminium_new")},
		{"STM-204", "MP steam main, 100 psig", ind, exp, "Calcium silicate inner layer.", fit(8, 2, 4, 8, 0), steam(pipe("NPS 4", 90, layer(calsil, 1.5), layer(fiber, 3)), 100, "aluminium_new")},
		{"STM-205", "MP steam to CIP heat exchanger", ind, exp, "", fit(6, 1, 3, 4, 0), steam(pipe("NPS 2", 70, layer(fiber, 4)), 100, "aluminium_new")},
		{"STM-206", "MP steam drip leg header", ind, exp, "", fit(4, 3, 3, 0, 2), steam(pipe("NPS 1", 40, layer(fiber, 3.5)), 100, "aluminium_new")},
		{"STM-207", "MP steam to the keg washer (existing, thin lagging)", ind, exp,
			"Existing run with half-inch lagging left from an earlier job: flagged too hot to touch.",
			fit(4, 1, 2, 2, 0), steam(pipe("NPS 2", 55, layer(fiber, 0.5)), 100, "aluminium_new")},
		{"CR-201", "Pumped condensate return to the boiler house", ind, exp, "", fit(8, 2, 4, 2, 0), water(pipe("NPS 2", 150, layer(fiber, 2)), 200, "all_service_jacket")},
		{"CR-202", "Condensate from brewhouse traps", ind, exp, "", fit(6, 4, 4, 0, 0), water(pipe("NPS 1-1/2", 80, layer(fiber, 2.5)), 205, "all_service_jacket")},
		{"CR-203", "Condensate from CIP heat exchanger", ind, exp, "", fit(4, 1, 2, 0, 0), water(pipe("NPS 1", 60, layer(fiber, 2)), 210, "all_service_jacket")},
		{"CR-204", "Vented condensate receiver overflow", ind, exp, "", fit(2, 0, 1, 0, 1), water(pipe("NPS 1-1/4", 20, layer(fiber, 1.5)), 200, "all_service_jacket")},
		// Chilled water, 44 °F supply / 56 °F return.
		{"CHW-301", "Chilled water supply, chiller header", ind, exp, "", fit(6, 2, 4, 4, 0), water(pipe("NPS 6", 70, layer(cellglas, 1.5)), 44, "pvc_jacket")},
		{"CHW-302", "Chilled water return, chiller header", ind, exp, "", fit(6, 2, 4, 4, 0), water(pipe("NPS 6", 70, layer(cellglas, 1.5)), 56, "pvc_jacket")},
		{"CHW-303", "CHW supply to brewhouse AHU-1", ind, con, "", fit(8, 2, 2, 2, 0), water(pipe("NPS 3", 150, layer(elasto, 1.5)), 44, "mastic")},
		{"CHW-304", "CHW return from brewhouse AHU-1", ind, con, "", fit(8, 2, 2, 2, 0), water(pipe("NPS 3", 150, layer(elasto, 1.5)), 56, "mastic")},
		{"CHW-305", "CHW supply to wort cooler", ind, exp, "", fit(6, 1, 3, 2, 0), water(pipe("NPS 2", 90, layer(elasto, 1.5)), 44, "pvc_jacket")},
		{"CHW-306", "CHW return from wort cooler", ind, exp, "", fit(6, 1, 3, 2, 0), water(pipe("NPS 2", 90, layer(elasto, 1.5)), 56, "pvc_jacket")},
		{"CHW-307", "CHW to office fan coils", ind, con, "", fit(10, 4, 4, 0, 0), water(pipe("NPS 1-1/4", 180, layer(elasto, 1)), 44, "mastic")},
		{"CHW-308", "CHW from office fan coils", ind, con, "", fit(10, 4, 4, 0, 0), water(pipe("NPS 1-1/4", 180, layer(elasto, 1)), 56, "mastic")},
		{"CHW-310", "CHW supply to the bottling shed, overhead rack", out, exp, "", fit(6, 0, 2, 2, 0), water(pipe("NPS 2-1/2", 240, layer(cellglas, 2)), 44, "aluminium_weathered")},
		// Glycol for fermenter jackets, 28 °F.
		{"GLY-351", "Glycol supply to fermenter jackets", ind, exp, "Propylene glycol 35 %.", fit(12, 8, 10, 0, 1), glycol(pipe("NPS 2", 160, layer(elasto, 1.5)), 28, 3.0)},
		{"GLY-352", "Glycol return from fermenter jackets", ind, exp, "", fit(12, 8, 10, 0, 1), glycol(pipe("NPS 2", 160, layer(elasto, 1.5)), 34, 3.0)},
		{"GLY-353", "Glycol to bright beer tanks", ind, exp, "", fit(8, 6, 6, 0, 1), glycol(pipe("NPS 1-1/2", 110, layer(elasto, 1.5)), 28, 1.6)},
		{"GLY-354", "Glycol from bright beer tanks", ind, exp, "", fit(8, 6, 6, 0, 1), glycol(pipe("NPS 1-1/2", 110, layer(elasto, 1.5)), 34, 1.6)},
		// Domestic water (copper tube).
		{"DHW-401", "Domestic hot water supply, 140 °F", ind, con, "", fit(14, 6, 4, 0, 0), water(pipe("CTS 1-1/2", 200, layer(fiber, 1.5)), 140, "all_service_jacket")},
		{"DHW-402", "Domestic hot water recirculation", ind, con, "", fit(14, 6, 4, 0, 0), water(pipe("CTS 3/4", 200, layer(fiber, 1)), 125, "all_service_jacket")},
		{"DHW-403", "Hot water to the CIP make-up tank, 160 °F", ind, exp, "", fit(6, 2, 3, 0, 0), water(pipe("CTS 1", 80, layer(fiber, 1.5)), 160, "all_service_jacket")},
		{"DCW-451", "Domestic cold water main", ind, con, "", fit(10, 6, 4, 0, 0), water(pipe("CTS 2", 180, layer(elasto, 1.5)), 55, "mastic")},
		{"DCW-452", "Cold water to brewhouse liquor tank", ind, exp, "", fit(6, 2, 3, 0, 0), water(pipe("CTS 1-1/2", 90, layer(elasto, 1.5)), 55, "pvc_jacket")},
		{"DCW-453", "Cold water to the yard hose bibbs", out, exp, "Drain down in winter; see freeze results.", fit(4, 2, 3, 0, 1),
			freeze(water(pipe("CTS 1", 120, layer(elasto, 1)), 50, "aluminium_weathered"), 8)},
		// Refrigerant suction, 20 °F.
		{"RS-501", "Refrigerant suction, cold room condensing unit", ind, exp, "", fit(8, 0, 2, 0, 0), refrigerant(pipe("CTS 1", 70, layer(elasto, 1.5)), 20)},
		{"RS-502", "Refrigerant suction, keg cooler", ind, exp, "", fit(6, 0, 2, 0, 0), refrigerant(pipe("CTS 3/4", 50, layer(elasto, 1)), 20)},
		// Supply-air ducts, 55 °F.
		{"SA-601", "Supply air, AHU-1 main", ind, con, "", fit(0, 0, 0, 0, 0), duct(48, 24, 90, 55, "fsk", layer(wrap, 2))},
		{"SA-602", "Supply air, brewhouse branch", ind, con, "", fit(0, 0, 0, 0, 0), duct(30, 16, 110, 55, "fsk", layer(wrap, 2))},
		{"SA-603", "Supply air, cellar branch", ind, con, "", fit(0, 0, 0, 0, 0), duct(24, 12, 80, 55, "fsk", layer(wrap, 2))},
		{"SA-604", "Supply air on the roof to the bottling shed", out, exp, "Rigid board with weathered aluminium cladding.", fit(0, 0, 0, 0, 0),
			duct(36, 20, 60, 55, "aluminium_weathered", analysis.LayerInput{Material: polyiso, ThicknessMM: f(inch(2))})},
	}
	// The condensing line: chilled water through the humid keg wash bay with thin lagging.
	wash := water(pipe("NPS 1-1/2", 45, layer(elasto, 0.375)), 44, "pvc_jacket")
	wash.AmbientTempC, wash.RelativeHumidityPct = f(29), f(85)
	L = append(L, Line{"CHW-309", "CHW through the keg wash bay (humid)", ind, exp,
		"The wash bay runs at about 85 % RH: thin lagging here condenses.", fit(4, 1, 2, 0, 0), wash})
	// An invented walk-down survey of the old plant (for the Audit view): what was found
	// on three runs before the new insulation goes on.
	for i := range L {
		switch L[i].Tag {
		case "HHW-109": // the yard run: jacket split, insulation soaked
			L[i].Input.Existing = &analysis.Existing{Layers: []analysis.LayerInput{layer(fiber, 1.5)}, Condition: "wet",
				MissingFraction: f(0.15), BareFittings: []string{"valves", "flange_pairs"}}
		case "STM-202": // found bare after a repair, valves never lagged
			L[i].Input.Existing = &analysis.Existing{Layers: []analysis.LayerInput{}, BareFittings: []string{"valves"}}
		case "CHW-301": // the chiller header: crushed at the supports
			L[i].Input.Existing = &analysis.Existing{Layers: []analysis.LayerInput{layer(cellglas, 1)}, Condition: "damaged"}
		}
	}
	// Invented examples of fitting finishes and supports, each said so in the line's notes.
	for k := range L {
		l := &L[k]
		switch l.Tag {
		case "STM-201":
			l.Input.FittingFinish = &analysis.FittingFinish{Valves: analysis.FinishBare}
			l.Notes = "Invented example: the three isolation valves are left bare, to show their share of the loss."
		case "STM-204":
			l.Input.FittingFinish = &analysis.FittingFinish{Valves: analysis.FinishCover, FlangePairs: analysis.FinishCover}
			l.Input.FittingCover = &analysis.FittingCover{ThicknessMM: f(inch(2)), Jacket: "canvas"}
			l.Notes += " Invented example: valves and flanges under 2 in removable covers."
		case "CHW-305":
			l.Input.Supports = &analysis.Supports{Kind: analysis.SupportClamp}
			l.Notes = "Invented example: hung on bare clamps, to show the clamp condensation warning; specify inserts and shields."
		}
	}
	return L
}

func glycol(in analysis.Input, tempF, kgs float64) analysis.Input {
	in = water(in, tempF, "pvc_jacket")
	in.Fluid = "glycol"
	in.Flow = &analysis.Flow{MassFlowKgS: f(kgs), CpJkgK: f(3800)}
	return in
}

func refrigerant(in analysis.Input, tempF float64) analysis.Input {
	in = water(in, tempF, "")
	in.Fluid = "refrigerant"
	in.PipeMaterial = "copper"
	in.SurfaceEmittance = f(0.9) // elastomeric with its own skin, no jacket
	return in
}

func freeze(in analysis.Input, hours float64) analysis.Input {
	in.Criteria = &analysis.Criteria{FreezeHours: f(hours)}
	return in
}

// Project is the demo project row (settings as JSON, SI).
func Project() store.Project {
	js, _ := json.Marshal(Settings())
	return store.Project{Name: Name, Client: "Kettlewick Brewing Co-operative (fictional)", Site: "Millrace Yard, Unit 4 (fictional)",
		Units: "us", Settings: js}
}

// StoreLines builds the lines' rows (without results: the first view computes them) and
// the material slugs each uses.
func StoreLines(projectID int64) ([]store.Line, store.LineMaterials) {
	src := Lines()
	rows := make([]store.Line, len(src))
	mats := make(store.LineMaterials, len(src))
	for k, l := range src {
		inJS, _ := json.Marshal(l.Input)
		fitJS, _ := json.Marshal(l.Fittings)
		rows[k] = store.Line{ProjectID: projectID, Tag: l.Tag, Service: l.Service, Location: l.Location, Exposure: l.Exposure,
			Notes: l.Notes, Input: inJS, Fittings: fitJS}
		mats[k], _ = l.Input.Slugs()
	}
	return rows, mats
}

// Create saves the demo project and its lines, and returns the project.
func Create(ctx context.Context, st *store.Store) (store.Project, error) {
	p, err := st.CreateProject(ctx, Project())
	if err != nil {
		return p, fmt.Errorf("demo: %w", err)
	}
	rows, mats := StoreLines(p.ID)
	if _, err := st.CreateLines(ctx, p.ID, rows, mats); err != nil {
		return p, fmt.Errorf("demo: %w", err)
	}
	return p, nil
}
