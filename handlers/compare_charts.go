package handlers

import (
	"lagwright/units"
	"lagwright/web"
)

// shortCriterion names a criterion minimum on a chart marker.
var shortCriterion = map[string]string{
	"personnel protection": "personnel", "condensation": "condensation", "maximum heat flow": "max heat flow",
	"maximum temperature change": "max ΔT", "freeze protection": "freeze", "energy code": "energy code",
}

// compareCharts draws life-cycle cost, heat flow and surface temperature against
// thickness for each material, with the economic thickness and the criteria minimums
// of the line's own material marked.
func charts(sides []sideResult, sys units.System, qQty units.Quantity) []web.LineChartView {
	x := func(mm float64) float64 { return units.FromSI(units.Length, sys, mm) }
	xLabel := "thickness of the sized layer, " + units.Label(units.Length, sys)
	var markers []web.ChartMarker
	for i, sd := range sides {
		if e := sd.out.Sizing.EconomicMM; e != nil && *e > 0 {
			label := "economic"
			if i > 0 {
				label = "economic (2nd)"
			}
			markers = append(markers, web.ChartMarker{X: x(*e), Label: label, Strong: i == 0})
		}
	}
	for _, m := range criterionMins(sides[0].out.Sizing) {
		if m.mm != nil && *m.mm > 0 {
			markers = append(markers, web.ChartMarker{X: x(*m.mm), Label: "min " + shortCriterion[m.label]})
		}
	}
	lcc := web.LineChartView{ID: "chart-lcc", Title: "Life-cycle cost against thickness", XLabel: xLabel,
		YLabel: "life-cycle cost (present worth)", Markers: markers}
	heat := web.LineChartView{ID: "chart-heat", Title: "Heat flow against thickness", XLabel: xLabel,
		YLabel: "heat flow, " + units.Label(qQty, sys), Markers: markers}
	surf := web.LineChartView{ID: "chart-surface", Title: "Surface temperature against thickness", XLabel: xLabel,
		YLabel: "surface temperature, " + units.Label(units.Temp, sys), Markers: markers}
	for i, sd := range sides {
		var pl, ph, ps []web.ChartPoint
		for _, r := range sd.rows {
			if r.AsFound { // not a thickness of the curve
				continue
			}
			if r.LifeCycleCost != nil {
				pl = append(pl, web.ChartPoint{X: x(r.ThicknessMM), Y: *r.LifeCycleCost})
			}
			ph = append(ph, web.ChartPoint{X: x(r.ThicknessMM), Y: units.FromSI(qQty, sys, absHeat(r.HeatFlowWPerM))})
			ps = append(ps, web.ChartPoint{X: x(r.ThicknessMM), Y: units.FromSI(units.Temp, sys, r.SurfaceTempC)})
		}
		dashed := i > 0
		if len(pl) > 0 {
			lcc.Series = append(lcc.Series, web.ChartSeries{Name: sd.name, Dashed: dashed, Points: pl})
		}
		heat.Series = append(heat.Series, web.ChartSeries{Name: sd.name, Dashed: dashed, Points: ph})
		surf.Series = append(surf.Series, web.ChartSeries{Name: sd.name, Dashed: dashed, Points: ps})
	}
	var out []web.LineChartView
	if len(lcc.Series) > 0 {
		out = append(out, lcc)
	}
	return append(out, heat, surf)
}

// absHeat plots heat gains of cold lines as positive magnitudes.
func absHeat(q float64) float64 {
	if q < 0 {
		return -q
	}
	return q
}
