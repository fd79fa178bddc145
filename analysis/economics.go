package analysis

import (
	"fmt"
	"slices"

	"lagwright/calc"
)

// Economics defaults (our choices, stated in the assumptions whenever used).
const (
	defaultEfficiency = 0.8  // heating plant seasonal efficiency, common practice
	defaultCOP        = 3.0  // cooling plant seasonal COP, common practice
	defaultHours      = 8760 // continuous service
	defaultDiscount   = 0.05
	defaultEscalation = 0.02
	defaultLife       = 20
)

// econBasis resolves the economics block into a calc.EconBasis.
func (a *analyser) econBasis() calc.EconBasis {
	l := a.l
	e := l.in.Economics
	heating := l.opC > l.econ.air.TempC
	b := calc.EconBasis{
		PricePerKWh:    *e.EnergyPricePerKWh,
		HoursPerYear:   orDefault(e.HoursPerYear, defaultHours),
		DiscountRate:   orDefault(e.DiscountRate, defaultDiscount),
		EscalationRate: orDefault(e.EscalationRate, defaultEscalation),
		CO2PerKWh:      orDefault(e.CO2KgPerKWh, 0),
		LifeYears:      defaultLife,
	}
	if e.LifeYears != nil {
		b.LifeYears = *e.LifeYears
	}
	switch {
	case e.Efficiency != nil:
		b.Conversion = *e.Efficiency
	case e.COP != nil:
		b.Conversion = *e.COP
	case heating:
		b.Conversion = defaultEfficiency
		l.assume("economics: heating plant efficiency %.2f (default)", defaultEfficiency)
	default:
		b.Conversion = defaultCOP
		l.assume("economics: cooling plant COP %.1f (default)", defaultCOP)
	}
	if e.HoursPerYear == nil {
		l.assume("economics: %d operating hours a year (default)", defaultHours)
	}
	if e.DiscountRate == nil || e.EscalationRate == nil || e.LifeYears == nil {
		l.assume("economics: discount %.1f %%, energy escalation %.1f %%, life %d years (defaults where not given)",
			100*b.DiscountRate, 100*b.EscalationRate, b.LifeYears)
	}
	if e.CO2KgPerKWh == nil {
		l.assume("economics: no CO2 factor given, CO2 reported as 0")
	}
	switch {
	case l.shape.IsFlat() && l.areaM2 > 0:
		b.LengthM = l.areaM2
	case l.shape.IsFlat():
		b.LengthM = 1
		l.assume("economics per m² of surface (no area_m2 given)")
	case l.lengthM > 0:
		b.LengthM = l.equivLengthM
	default:
		b.LengthM = 1
		l.assume("economics per metre of run (no length_m given)")
	}
	return b
}

func (a *analyser) economicsBare() error {
	if a.l.in.Economics != nil {
		a.l.warn("economics need an insulation layer to price: add the material and a thickness")
	}
	return nil
}

// economics prices each candidate thickness at the economics conditions and finds the
// economic thickness (least life-cycle cost, bare included) when installed costs are known.
func (a *analyser) economics(cands []float64) error {
	l, o := a.l, &a.out
	e := l.in.Economics
	if e == nil {
		if l.crit.economic {
			l.warn("economic thickness: give economics (energy price and installed costs)")
			o.Sizing.Unmet = append(o.Sizing.Unmet, "economic")
		}
		return nil
	}
	basis := a.econBasis()
	costs := slices.Clone(e.InstalledCostPerM)
	slices.SortFunc(costs, func(x, y CostPoint) int {
		switch {
		case x.ThicknessMM < y.ThicknessMM:
			return -1
		case x.ThicknessMM > y.ThicknessMM:
			return 1
		}
		return 0
	})
	thick := cands
	if len(costs) > 0 {
		thick = nil
		for _, c := range costs {
			thick = append(thick, c.ThicknessMM)
		}
	} else {
		l.assume("economics: no installed costs given, so no payback, life-cycle cost or economic thickness")
	}
	set := l.econ.air
	bare, err := a.solve(bareSurface, l.opC, set)
	if err != nil {
		return err
	}
	ec := make([]calc.EconCandidate, len(thick))
	surf := make([]float64, len(thick))
	for i, t := range thick {
		r, err := a.solve(t, l.opC, set)
		if err != nil {
			return err
		}
		q := r.HeatFlowPerM
		if l.shape.IsFlat() {
			q = r.HeatFlux
		}
		ec[i] = calc.EconCandidate{ThicknessMM: t, HeatFlowPerM: q}
		if len(costs) > 0 {
			ec[i].InstalledCostPerM = costs[i].Cost
		}
		surf[i] = r.SurfaceC
	}
	qBare := bare.HeatFlowPerM
	if l.shape.IsFlat() {
		qBare = bare.HeatFlux
	}
	rows, best, err := calc.Economics(basis, qBare, ec)
	if err != nil {
		return fmt.Errorf("economics: %w", err)
	}
	for i, r := range rows {
		row := EconomicsRow{ThicknessMM: r.ThicknessMM, HeatFlowWPerM: round(r.HeatFlowPerM, 4), SurfaceTempC: round(surf[i], 3),
			AnnualKWh: round(r.AnnualKWh, 3), AnnualCost: round(r.AnnualCost, 3), CO2Kg: round(r.CO2Kg, 3)}
		if len(costs) > 0 {
			row.InstalledCost = ptr(round(r.InstalledCost, 2))
			row.NPV = ptr(round(r.NPV, 2))
			row.LifeCycleCost = ptr(round(r.LifeCycleCost, 2))
			row.SimplePaybackYears = roundPtr(r.SimplePaybackYears, 3)
			row.IncrementalPaybackYears = roundPtr(r.IncrementalPaybackYears, 3)
		}
		o.Economics = append(o.Economics, row)
	}
	if len(costs) == 0 || best < 0 {
		if l.crit.economic {
			o.Sizing.Unmet = append(o.Sizing.Unmet, "economic")
			l.warn("economic thickness: give installed_cost_per_m for the candidate thicknesses")
		}
		return nil
	}
	bareKWh := abs(qBare) * basis.LengthM * basis.HoursPerYear / 1000 / basis.Conversion
	bareLCC := bareKWh * basis.PricePerKWh * calc.UPVStar(basis.DiscountRate, basis.EscalationRate, basis.LifeYears)
	if bareLCC <= rows[best].LifeCycleCost {
		o.Sizing.EconomicMM = ptr(0.0)
		l.warn("economic thickness: no priced thickness pays for itself over the life at these prices")
	} else {
		o.Sizing.EconomicMM = ptr(rows[best].ThicknessMM)
	}
	return nil
}

func abs(v float64) float64 {
	if v < 0 {
		return -v
	}
	return v
}

func roundPtr(p *float64, d int) *float64 {
	if p == nil {
		return nil
	}
	return ptr(round(*p, d))
}
