package analysis

import (
	"fmt"
	"slices"
	"strconv"

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

// The assumptions that state the fixed defaults, worded once.
var (
	assumeDefaultEfficiency = "economics: heating plant efficiency " + fmtF(defaultEfficiency, 2) + " (default)"
	assumeDefaultCOP        = "economics: cooling plant COP " + fmtF(defaultCOP, 1) + " (default)"
	assumeDefaultHours      = "economics: " + strconv.Itoa(defaultHours) + " operating hours a year (default)"
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
		l.assumeText(assumeDefaultEfficiency)
	default:
		b.Conversion = defaultCOP
		l.assumeText(assumeDefaultCOP)
	}
	if e.HoursPerYear == nil {
		l.assumeText(assumeDefaultHours)
	}
	if e.DiscountRate == nil || e.EscalationRate == nil || e.LifeYears == nil {
		var buf [128]byte
		l.assumeText(words{buf[:0]}.s("economics: discount ").f(100*b.DiscountRate, 1).s(" %, energy escalation ").
			f(100*b.EscalationRate, 1).s(" %, life ").i(b.LifeYears).s(" years (defaults where not given)").String())
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
	l, o := a.l, a.out
	e := l.in.Economics
	if e == nil {
		if l.crit.economic {
			l.warn("economic thickness: give economics (energy price and installed costs)")
			o.Sizing.Unmet = append(o.Sizing.Unmet, "economic")
		}
		return nil
	}
	basis := a.econBasis()
	byThickness := func(x, y CostPoint) int {
		switch {
		case x.ThicknessMM < y.ThicknessMM:
			return -1
		case x.ThicknessMM > y.ThicknessMM:
			return 1
		}
		return 0
	}
	costs := e.InstalledCostPerM // only read; sorted in a copy when given out of order
	if !slices.IsSortedFunc(costs, byThickness) {
		costs = slices.Clone(costs)
		slices.SortFunc(costs, byThickness)
	}
	thick := cands
	switch {
	case len(costs) > 0:
		thick = make([]float64, 0, len(costs))
		for _, c := range costs {
			thick = append(thick, c.ThicknessMM)
		}
	case e.InstalledCostSource != costNoMatch:
		l.assume("economics: no installed costs given, so no payback, life-cycle cost or economic thickness")
	}
	a.assumeCostSource()
	set := l.econ.air
	bare, err := a.solve(bareSurface, l.opC, set)
	if err != nil {
		return err
	}
	var ecBuf [16]calc.EconCandidate // the common case, without allocations
	var surfBuf [16]float64
	ec, surf := ecBuf[:0], surfBuf[:0]
	if len(thick) > len(ecBuf) {
		ec, surf = make([]calc.EconCandidate, 0, len(thick)), make([]float64, 0, len(thick))
	}
	ec, surf = ec[:len(thick)], surf[:len(thick)]
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
	o.Economics = slices.Grow(o.Economics, len(rows))
	for i, r := range rows {
		row := EconomicsRow{ThicknessMM: r.ThicknessMM, HeatFlowWPerM: round(r.HeatFlowPerM, 4), SurfaceTempC: round(surf[i], 3),
			AnnualKWh: round(r.AnnualKWh, 3), AnnualCost: round(r.AnnualCost, 3), CO2Kg: round(r.CO2Kg, 3)}
		if len(costs) > 0 {
			row.InstalledCost = a.num(round(r.InstalledCost, 2))
			row.NPV = a.num(round(r.NPV, 2))
			row.LifeCycleCost = a.num(round(r.LifeCycleCost, 2))
			row.SimplePaybackYears = a.numRound(r.SimplePaybackYears, 3)
			row.IncrementalPaybackYears = a.numRound(r.IncrementalPaybackYears, 3)
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
		o.Sizing.EconomicMM = a.num(0.0)
		l.warn("economic thickness: no priced thickness pays for itself over the life at these prices")
	} else {
		o.Sizing.EconomicMM = a.num(rows[best].ThicknessMM)
	}
	return nil
}

// Where installed costs came from (Economics.InstalledCostSource).
const (
	costFromTable = "cost_table"
	costExample   = "example"
	costNoMatch   = "no_match"
)

// ExampleCostsAssumption is the assumption every result priced with the labelled
// example cost rows carries.
const ExampleCostsAssumption = "installed costs are the labelled example, not prices: replace them"

// checkCostPoints adds what resolveEconomics does not check itself: each priced thickness
// once (two prices for one thickness would make the curve ambiguous), and a known source.
func checkCostPoints(e *Economics, c *errs) {
	seen := map[float64]int{}
	for i, cp := range e.InstalledCostPerM {
		if j, ok := seen[cp.ThicknessMM]; ok {
			c.add(fmt.Sprintf("economics.installed_cost_per_m[%d].thickness_mm", i),
				"repeats the thickness of entry %d (one cost per thickness)", j)
			continue
		}
		seen[cp.ThicknessMM] = i
	}
	switch e.InstalledCostSource {
	case "", costFromTable, costExample, costNoMatch:
	default:
		c.add("economics.installed_cost_source", "must be %q, %q or %q (or omitted)", costFromTable, costExample, costNoMatch)
	}
}

// assumeCostSource states where the installed costs came from.
func (a *analyser) assumeCostSource() {
	l := a.l
	switch l.in.Economics.InstalledCostSource {
	case costExample:
		l.assume(ExampleCostsAssumption)
	case costFromTable:
		l.assume("installed costs from the project's cost table")
	case costNoMatch:
		mat, size := "", l.in.PipeSize
		if n := len(l.in.Layers); n > 0 {
			mat = l.in.Layers[n-1].Material
		}
		if mat == "" {
			mat = "the outer layer (no material slug)"
		}
		if size == "" {
			size = "without a nominal size"
		}
		l.assume("economics: no row of the project's cost table matches %s, %s, so no installed cost: no payback, life-cycle cost or economic thickness", mat, size)
	}
}

// EnergyYear is one line's energy bought, its cost and CO2 over a year at one
// thickness of the sized layer, at the economics conditions.
type EnergyYear struct {
	ThicknessMM   float64  `json:"thickness_mm"`
	AnnualKWh     float64  `json:"annual_kwh"`
	AnnualCost    float64  `json:"annual_cost"`
	CO2Kg         float64  `json:"co2_kg"`
	InstalledCost *float64 `json:"installed_cost"` // for the run; nil where no price is known
}

// LineEnergy is one line's yearly energy as specified and bare, for project totals.
type LineEnergy struct {
	Specified EnergyYear `json:"specified"`
	Bare      EnergyYear `json:"bare"`
}

// AnnualEnergy prices a line as specified and bare at its economics conditions (two
// heat balances, no sizing). It returns nil when the input has no economics block.
// The installed cost as specified is the cost point at the outer layer's thickness,
// when there is one.
func AnnualEnergy(in Input, r Resolver) (*LineEnergy, error) {
	if in.Economics == nil {
		return nil, nil
	}
	l, err := resolve(in, r)
	if err != nil {
		return nil, err
	}
	a := &analyser{l: l, cache: map[solveKey]calc.Result{}}
	basis := a.econBasis()
	q := func(r calc.Result) float64 {
		if l.shape.IsFlat() {
			return r.HeatFlux
		}
		return r.HeatFlowPerM
	}
	spec, err := a.solve(asSpecified, l.opC, l.econ.air)
	if err != nil {
		return nil, err
	}
	bare, err := a.solve(bareSurface, l.opC, l.econ.air)
	if err != nil {
		return nil, err
	}
	outerMM, cost := 0.0, (*float64)(nil)
	if n := len(in.Layers); n > 0 && in.Layers[n-1].ThicknessMM != nil {
		outerMM = *in.Layers[n-1].ThicknessMM
		for _, cp := range in.Economics.InstalledCostPerM {
			if abs(cp.ThicknessMM-outerMM) < 0.005 {
				cost = ptr(cp.Cost)
			}
		}
	}
	cand := calc.EconCandidate{ThicknessMM: outerMM, HeatFlowPerM: q(spec)}
	if cost != nil {
		cand.InstalledCostPerM = *cost
	}
	// The second candidate carries the bare heat flow: only its energy, cost and CO2 are used.
	rows, _, err := calc.Economics(basis, q(bare), []calc.EconCandidate{cand, {ThicknessMM: outerMM + 1, HeatFlowPerM: q(bare)}})
	if err != nil {
		return nil, fmt.Errorf("economics: %w", err)
	}
	year := func(r calc.EconRow, t float64) EnergyYear {
		return EnergyYear{ThicknessMM: t, AnnualKWh: round(r.AnnualKWh, 3), AnnualCost: round(r.AnnualCost, 3), CO2Kg: round(r.CO2Kg, 3)}
	}
	out := &LineEnergy{Specified: year(rows[0], outerMM), Bare: year(rows[1], 0)}
	if cost != nil {
		out.Specified.InstalledCost = ptr(round(rows[0].InstalledCost, 2))
	}
	out.Bare.InstalledCost = ptr(0.0)
	return out, nil
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
