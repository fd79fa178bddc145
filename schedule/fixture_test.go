package schedule

import (
	"encoding/json"
	"errors"
	"testing"
	"time"

	"lagwright/analysis"
	"lagwright/field"
	"lagwright/units"
)

// fixedDate is the date every fixture schedule carries, so golden files are stable.
var fixedDate = time.Date(2026, 3, 14, 9, 30, 0, 0, time.UTC)

// fixtureLine is a line of the test project as the line list would hold it.
type fixtureLine struct {
	tag, service, location, exposure, notes string
	input                                   string // the line's own calc JSON (SI)
	fittings                                analysis.Fittings
}

// fixtureLines: an invented plant room and its roof for a clinic — heating hot water,
// chilled water, steam, domestic cold water outdoors, a supply duct, a tank top, and a
// line whose input is incomplete.
var fixtureLines = []fixtureLine{
	{"HHW-101", "Heating hot water supply", "indoor", "exposed", "",
		`{"geometry":"pipe","pipe_size":"NPS 4","operating_temp_c":82,"length_m":45,
		  "layers":[{"material":"mineral_fiber_pipe_c547_t1","thickness_mm":50.8}],"jacket":"all_service_jacket"}`,
		analysis.Fittings{Elbows: 6, Tees: 2, Valves: 2}},
	{"HHW-102", "Heating hot water return", "indoor", "concealed", "above ceiling",
		`{"geometry":"pipe","pipe_size":"NPS 3","operating_temp_c":71,"length_m":45,
		  "layers":[{"material":"mineral_fiber_pipe_c547_t1","thickness_mm":38.1}],"jacket":"all_service_jacket"}`,
		analysis.Fittings{Elbows: 6, Tees: 2}},
	{"CHW-201", "Chilled water supply", "indoor", "exposed", "",
		`{"geometry":"pipe","pipe_size":"NPS 6","operating_temp_c":6.7,"length_m":60,
		  "layers":[{"material":"elastomeric_c534_gr1","thickness_mm":38.1}],"jacket":"pvc_jacket"}`,
		analysis.Fittings{Elbows: 8, Valves: 3, FlangePairs: 4}},
	{"CHW-202", "Chilled water to the roof unit", "outdoor", "exposed", "",
		`{"geometry":"pipe","pipe_size":"NPS 2","operating_temp_c":6.7,"length_m":30,
		  "layers":[{"material":"cellular_glass_c552_t1","thickness_mm":50.8}],"jacket":"aluminium_weathered"}`,
		analysis.Fittings{Elbows: 4, Valves: 1}},
	{"STM-301", "Steam 150 psig to the sterilisers", "indoor", "exposed", "",
		`{"geometry":"pipe","pipe_size":"NPS 2","steam_gauge_pressure_kpa":1034,"length_m":30.48,
		  "layers":[{"material":"calcium_silicate_c533_t1","thickness_mm":50.8},{"material":"calcium_silicate_c533_t1","thickness_mm":50.8}],
		  "jacket":"aluminium_new","fitting_finish":{"valves":"bare","flange_pairs":"cover"},"fitting_cover":{"thickness_mm":50.8}}`,
		analysis.Fittings{Elbows: 3, Valves: 2, FlangePairs: 2}},
	{"DCW-401", "Domestic cold water on the roof", "outdoor", "exposed", "drain down in winter shutdown",
		`{"geometry":"pipe","pipe_size":"CTS 1","operating_temp_c":10,"length_m":20,
		  "conditions":{"freeze":{"ambient_temp_c":-15,"wind_m_s":5}},"criteria":{"freeze_hours":8},
		  "layers":[{"material":"elastomeric_c534_gr1","thickness_mm":25.4}],"jacket":"mastic"}`,
		analysis.Fittings{Elbows: 2, Caps: 1}},
	{"SA-501", "Supply air main", "indoor", "concealed", "",
		`{"geometry":"duct","duct_width_mm":800,"duct_height_mm":400,"operating_temp_c":13,"length_m":25,
		  "layers":[{"material":"glass_blanket_c553","thickness_mm":50.8}],"jacket":"fsk"}`,
		analysis.Fittings{}},
	{"TK-601", "Hot water storage tank top", "indoor", "exposed", "",
		`{"geometry":"flat","orientation":"horizontal","facing":"up","area_m2":6,"operating_temp_c":60,
		  "layers":[{"material":"mineral_fiber_board_c612","thickness_mm":50.8}],"jacket":"painted_metal"}`,
		analysis.Fittings{}},
	{"HHW-103", "Heating hot water to the AHU", "indoor", "exposed", "thickness to be confirmed",
		`{"geometry":"pipe","pipe_size":"NPS 2","operating_temp_c":82,"length_m":12,
		  "layers":[{"material":"mineral_fiber_pipe_c547_t1","thickness_mm":-5}],"jacket":"all_service_jacket"}`,
		analysis.Fittings{Elbows: 2}},
}

func fixtureSettings() analysis.ProjectSettings {
	set := analysis.DefaultSettings()
	set.Indoor = analysis.Location{AmbientTempC: 24, RelativeHumidityPct: ptr(55.0)}
	set.Outdoor = analysis.Location{AmbientTempC: 32, WindMS: 3, RelativeHumidityPct: ptr(65.0)}
	set.Criteria.EnergyCode = "ashrae-90.1-2016"
	return set
}

// fixture builds the test project's schedule lines, analysed with the catalog.
func fixture(t testing.TB, sys units.System) (Project, []Line) {
	t.Helper()
	set := fixtureSettings()
	p := Project{ID: 7, Name: "Harbourside Clinic — plant room", Client: "Harbourside Health Trust", Site: "Level B1 and roof", Units: sys, Settings: set}
	lines := make([]Line, len(fixtureLines))
	for i, fl := range fixtureLines {
		var own analysis.Input
		if err := json.Unmarshal([]byte(fl.input), &own); err != nil {
			t.Fatalf("%s: %v", fl.tag, err)
		}
		eff := set.Effective(fl.location, own, fl.fittings)
		l := Line{ID: int64(100 + i), Tag: fl.tag, Service: fl.service, Location: fl.location, Exposure: fl.exposure,
			Notes: fl.notes, Input: eff, Fittings: fl.fittings}
		out, err := analysis.Analyse(eff, analysis.CatalogResolver{})
		var fe field.Errors
		switch {
		case errors.As(err, &fe):
			for _, e := range fe {
				l.Errors = append(l.Errors, e.Field+": "+e.Message)
			}
		case err != nil:
			t.Fatalf("%s: %v", fl.tag, err)
		default:
			l.Output = out
		}
		lines[i] = l
	}
	return p, lines
}

func fixtureSchedule(t testing.TB, sys units.System) Schedule {
	p, lines := fixture(t, sys)
	return Build(p, lines, analysis.CatalogResolver{}, 2, fixedDate)
}
