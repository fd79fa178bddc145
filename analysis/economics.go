package analysis

import (
	"fmt"
	"slices"

	"lagwright/calc"
)

// Economics defaults (our choices, stated in the assumptions whenever used).
const (
	defaultEfficiency = 0.8   // heating plant seasonal efficiency, common practice
	defaultCOP        = 3.0   // cooling plant seasonal COP, common practice
	defaultHours      = 8760  // continuous service
	defaultCurrency   = "USD" // ISO 4217; set economics.currency
	defaultDiscount   = 0.05
	defaultEscalation = 0.02
	defaultLife       = 20
)

// The two energy bases (EnergyBasis.Basis).
const (
	BasisHeating = "heating"
	BasisCooling = "cooling"
)

// Priced reports whether the economics can price any line: a heating or a cooling price.
func (e *Economics) Priced() bool {
	return e != nil && ((e.Heating != nil && e.Heating.PricePerKWh != nil) || (e.Cooling != nil && e.Cooling.PricePerKWh != nil))
}

// CurrencyCode is the ISO 4217 code of the money figures (USD when none is given).
func (e *Economics) CurrencyCode() string {
	if e == nil || e.Currency == "" {
		return defaultCurrency
	}
	return e.Currency
}

// lineBasis is the one basis a line is priced on: heat lost by a hot line (saturated
// steam, or above the economics ambient) is bought on the heating basis, heat gained by
// a cold line is removed on the cooling basis. The other basis is never used.
func (a *analyser) lineBasis() string {
	l := a.l
	if l.in.SteamGaugePressureKPa != nil || l.opC > l.econ.air.TempC {
		return BasisHeating
	}
	return BasisCooling
}

// econBasis resolves the line's energy basis into a calc.EconBasis and the answer's
// energy_basis. ok is false when the line's basis has no price: the line is not priced
// (a warning says so) rather than priced on the other basis.
func (a *analyser) econBasis() (b calc.EconBasis, eb EnergyBasis, ok bool) {
	l := a.l
	e := l.in.Economics
	eb = EnergyBasis{Basis: a.lineBasis(), Currency: e.CurrencyCode()}
	var price, conv, hours, co2 *float64
	var convName, bought string
	var convDefault float64
	if eb.Basis == BasisHeating {
		convName, convDefault, bought = "efficiency", defaultEfficiency, "kWh of fuel or heat bought"
		if h := e.Heating; h != nil {
			price, conv, hours, co2 = h.PricePerKWh, h.Efficiency, h.HoursPerYear, h.CO2KgPerKWh
		}
	} else {
		convName, convDefault, bought = "COP", defaultCOP, "kWh of electricity"
		if k := e.Cooling; k != nil {
			price, conv, hours, co2 = k.PricePerKWh, k.COP, k.HoursPerYear, k.CO2KgPerKWh
		}
	}
	if price == nil {
		other := BasisCooling
		if eb.Basis == BasisCooling {
			other = BasisHeating
		}
		l.warn("economics: this %s line is priced on the %s basis, which has no price: give economics.%s.price_per_kwh (the %s basis is never used for it)",
			map[string]string{BasisHeating: "hot", BasisCooling: "cold"}[eb.Basis], eb.Basis, eb.Basis, other)
		return b, eb, false
	}
	b = calc.EconBasis{
		PricePerKWh:    *price,
		Conversion:     orDefault(conv, convDefault),
		HoursPerYear:   orDefault(hours, defaultHours),
		CO2PerKWh:      orDefault(co2, 0),
		DiscountRate:   orDefault(e.DiscountRate, defaultDiscount),
		EscalationRate: orDefault(e.EscalationRate, defaultEscalation),
		LifeYears:      defaultLife,
	}
	if e.LifeYears != nil {
		b.LifeYears = *e.LifeYears
	}
	eb.PricePerKWh, eb.HoursPerYear, eb.CO2KgPerKWh = b.PricePerKWh, b.HoursPerYear, b.CO2PerKWh
	if eb.Basis == BasisHeating {
		eb.Efficiency = ptr(b.Conversion)
	} else {
		eb.COP = ptr(b.Conversion)
	}
	dflt := func(p *float64) string {
		if p == nil {
			return " (default)"
		}
		return ""
	}
	co2Text := fmtF(b.CO2PerKWh, 3) + " kg CO2 per " + bought + dflt(co2)
	if co2 == nil {
		co2Text = "no CO2 factor given, CO2 reported as 0"
	}
	l.assumeText("economics on the " + eb.Basis + " basis: " + fmtF(b.PricePerKWh, 4) + " " + eb.Currency + " per " + bought +
		", " + convName + " " + fmtF(b.Conversion, 2) + dflt(conv) + ", " + fmtF(b.HoursPerYear, 0) + " h a year" + dflt(hours) + ", " + co2Text)
	if e.Currency == "" {
		l.assumeText("economics: money in " + defaultCurrency + " (default currency: set economics.currency, an ISO 4217 code)")
	}
	if e.DiscountRate == nil || e.EscalationRate == nil || e.LifeYears == nil {
		var buf [128]byte
		l.assumeText(words{buf[:0]}.s("economics: discount ").f(100*b.DiscountRate, 1).s(" %, energy escalation ").
			f(100*b.EscalationRate, 1).s(" %, life ").i(b.LifeYears).s(" years (defaults where not given)").String())
	}
	switch {
	case l.shape.IsFlat() && l.areaM2 > 0:
		b.LengthM = l.areaM2
		l.assume("economics per m² of surface: installed costs per m², over area_m2")
	case l.shape.IsFlat():
		b.LengthM = 1
		l.assume("economics per m² of surface (no area_m2 given): installed costs per m²")
	case l.lengthM > 0:
		b.LengthM = l.equivLengthM
	default:
		b.LengthM = 1
		l.assume("economics per metre of run (no length_m given)")
	}
	return b, eb, true
}

// checkEconomics checks an economics block (the line's, or the project's under
// "settings.") into field errors under pre ("economics."). A project may set only its
// currency (needPrice false); a line's economics need a price.
func checkEconomics(e *Economics, pre string, needPrice bool, c *errs) {
	onlyCurrency := e.DiscountRate == nil && e.EscalationRate == nil && e.LifeYears == nil && len(e.InstalledCostPerM) == 0
	if e.Heating == nil && e.Cooling == nil && (needPrice || !onlyCurrency) {
		c.add(pre+"heating.price_per_kwh", "give a heating or a cooling price per kWh (or leave the economics out)")
	}
	if h := e.Heating; h != nil {
		if h.PricePerKWh == nil {
			c.add(pre+"heating.price_per_kwh", "is required when any heating value is given")
		}
		rangeCheck(c, pre+"heating.price_per_kwh", h.PricePerKWh, 0, 100, "per kWh")
		if h.Efficiency != nil && (*h.Efficiency <= 0 || *h.Efficiency > 1) {
			c.add(pre+"heating.efficiency", "must be greater than 0 and at most 1")
		}
		rangeCheck(c, pre+"heating.hours_per_year", h.HoursPerYear, 1, 8784, "h")
		rangeCheck(c, pre+"heating.co2_kg_per_kwh", h.CO2KgPerKWh, 0, 5, "kg/kWh")
	}
	if k := e.Cooling; k != nil {
		if k.PricePerKWh == nil {
			c.add(pre+"cooling.price_per_kwh", "is required when any cooling value is given")
		}
		rangeCheck(c, pre+"cooling.price_per_kwh", k.PricePerKWh, 0, 100, "per kWh")
		rangeCheck(c, pre+"cooling.cop", k.COP, 1.01, 20, "")
		rangeCheck(c, pre+"cooling.hours_per_year", k.HoursPerYear, 1, 8784, "h")
		rangeCheck(c, pre+"cooling.co2_kg_per_kwh", k.CO2KgPerKWh, 0, 5, "kg/kWh")
	}
	if e.Currency != "" && !ValidCurrency(e.Currency) {
		c.add(pre+"currency", "must be a three-letter ISO 4217 code in capitals, such as USD, EUR or GBP")
	}
	rangeCheck(c, pre+"discount_rate", e.DiscountRate, -0.5, 1, "")
	rangeCheck(c, pre+"escalation_rate", e.EscalationRate, -0.5, 1, "")
	if e.LifeYears != nil && (*e.LifeYears < 1 || *e.LifeYears > 100) {
		c.add(pre+"life_years", "must be between 1 and 100 years")
	}
}

// ValidCurrency reports whether code has the form of an ISO 4217 alphabetic code: three
// capital letters A–Z. (Whether the code is in the current list is left to the user.)
func ValidCurrency(code string) bool {
	if len(code) != 3 {
		return false
	}
	for i := range 3 {
		if code[i] < 'A' || code[i] > 'Z' {
			return false
		}
	}
	return true
}

func (a *analyser) economicsBare() error {
	if a.l.in.Economics != nil {
		a.l.warn("economics need an insulation layer to price: add the material and a thickness")
	}
	return nil
}

// economics prices the bare line, each candidate thickness and the line as specified at
// the economics conditions on the line's energy basis, and finds the economic thickness
// (least life-cycle cost, bare included) when installed costs are known.
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
	basis, eb, ok := a.econBasis()
	if !ok {
		if l.crit.economic {
			o.Sizing.Unmet = append(o.Sizing.Unmet, "economic")
		}
		return nil
	}
	o.EnergyBasis = &eb
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
	priced := len(costs) > 0
	thick := cands
	switch {
	case priced:
		thick = make([]float64, 0, len(costs))
		for _, c := range costs {
			thick = append(thick, c.ThicknessMM)
		}
	case e.InstalledCostSource != costNoMatch:
		l.assume("economics: no installed costs given, so no payback, life-cycle cost or economic thickness")
	}
	a.assumeCostSource()
	if l.shape.IsFlat() {
		l.assume("economics of a flat surface: energy and money per m² of surface times area_m2; installed costs per m²")
	}
	set := l.econ.air
	q := func(r calc.Result) float64 {
		if l.shape.IsFlat() {
			return r.HeatFlux
		}
		return r.HeatFlowPerM
	}
	bare, err := a.solve(bareSurface, l.opC, set)
	if err != nil {
		return err
	}
	qBare := q(bare)
	// The bare line leads the candidates (0 mm, no installed cost), so its row is priced
	// the same way and the least life-cycle cost may be bare.
	var ecBuf [17]calc.EconCandidate // the common case, without allocations
	var surfBuf [17]float64
	ec, surf := ecBuf[:0], surfBuf[:0]
	ec = append(ec, calc.EconCandidate{ThicknessMM: 0, HeatFlowPerM: qBare})
	surf = append(surf, bare.SurfaceC)
	for i, t := range thick {
		if t <= 0 {
			continue
		}
		r, err := a.solve(t, l.opC, set)
		if err != nil {
			return err
		}
		c := calc.EconCandidate{ThicknessMM: t, HeatFlowPerM: q(r)}
		if priced {
			c.InstalledCostPerM = costs[i].Cost
		}
		ec, surf = append(ec, c), append(surf, r.SurfaceC)
	}
	rows, best, err := calc.Economics(basis, qBare, ec)
	if err != nil {
		return fmt.Errorf("economics: %w", err)
	}
	o.Economics = slices.Grow(o.Economics, len(rows)+1)
	o.Economics = append(o.Economics, a.econRow(rows[0], rows[0], surf[0], priced))
	found, err := a.asFoundEconomics(basis, qBare, rows[0], bare)
	if err != nil {
		return err
	}
	if found != nil {
		o.Economics = append(o.Economics, *found)
	}
	for i, r := range rows[1:] {
		o.Economics = append(o.Economics, a.econRow(r, rows[0], surf[i+1], priced))
	}
	if err := a.asSpecifiedEconomics(basis, qBare, rows[0], costs); err != nil {
		return err
	}
	if !priced || best < 0 {
		if l.crit.economic {
			o.Sizing.Unmet = append(o.Sizing.Unmet, "economic")
			l.warn("economic thickness: give installed_cost_per_m for the candidate thicknesses")
		}
		return nil
	}
	last := len(rows) - 1
	switch {
	case best == 0:
		o.Sizing.EconomicMM = a.num(0.0)
		l.warn("economic thickness: no priced thickness pays for itself over the life at these prices")
	case last == 1:
		o.Sizing.EconomicMM = a.num(rows[best].ThicknessMM)
		l.warn("economic thickness: only one thickness is priced, so where the least life-cycle cost lies is not known: price thinner and thicker ones")
	case best == 1:
		o.Sizing.EconomicMM = a.num(rows[best].ThicknessMM)
		l.warn("economic thickness: the least life-cycle cost is at the thinnest priced thickness (%s mm): the minimum may lie outside the priced range, so price a thinner one", fmtF(rows[best].ThicknessMM, 1))
	case best == last:
		o.Sizing.EconomicMM = a.num(rows[best].ThicknessMM)
		l.warn("economic thickness: the least life-cycle cost is at the thickest priced thickness (%s mm): the minimum may lie outside the priced range, so price a thicker one", fmtF(rows[best].ThicknessMM, 1))
	default:
		o.Sizing.EconomicMM = a.num(rows[best].ThicknessMM)
	}
	return nil
}

// econRow shapes one priced row, with its annual savings against the bare row. Money
// over the life (installed cost, paybacks, NPV, life-cycle cost) only where installed
// costs are known: without an investment there is no payback.
func (a *analyser) econRow(r, bare calc.EconRow, surfC float64, priced bool) EconomicsRow {
	row := EconomicsRow{ThicknessMM: r.ThicknessMM, HeatFlowWPerM: round(r.HeatFlowPerM, 4), SurfaceTempC: round(surfC, 3),
		AnnualKWh: round(r.AnnualKWh, 3), AnnualCost: round(r.AnnualCost, 3), CO2Kg: round(r.CO2Kg, 3),
		AnnualSavings: &Savings{KWh: round(bare.AnnualKWh-r.AnnualKWh, 3), Cost: round(bare.AnnualCost-r.AnnualCost, 3),
			CO2Kg: round(bare.CO2Kg-r.CO2Kg, 3)}}
	if priced {
		row.InstalledCost = a.num(round(r.InstalledCost, 2))
		row.NPV = a.num(round(r.NPV, 2))
		row.LifeCycleCost = a.num(round(r.LifeCycleCost, 2))
		row.SimplePaybackYears = a.numRound(r.SimplePaybackYears, 3)
		row.IncrementalPaybackYears = a.numRound(r.IncrementalPaybackYears, 3)
	}
	return row
}

// asSpecifiedEconomics prices the line as specified (its own build), the row project
// totals and the audit read: the installed cost is the cost point at the outer layer's
// thickness, when there is one.
func (a *analyser) asSpecifiedEconomics(basis calc.EconBasis, qBare float64, bare calc.EconRow, costs []CostPoint) error {
	l := a.l
	r, err := a.solve(asSpecified, l.opC, l.econ.air)
	if err != nil {
		return err
	}
	qs := r.HeatFlowPerM
	if l.shape.IsFlat() {
		qs = r.HeatFlux
	}
	outerMM, cost := 0.0, -1.0
	if n := len(l.in.Layers); n > 0 && l.in.Layers[n-1].ThicknessMM != nil {
		outerMM = *l.in.Layers[n-1].ThicknessMM
		for _, cp := range costs {
			if abs(cp.ThicknessMM-outerMM) < 0.005 {
				cost = cp.Cost
			}
		}
	}
	c := calc.EconCandidate{ThicknessMM: outerMM, HeatFlowPerM: qs, InstalledCostPerM: max(cost, 0)}
	rows, _, err := calc.Economics(basis, qBare, []calc.EconCandidate{c})
	if err != nil {
		return fmt.Errorf("economics as specified: %w", err)
	}
	row := a.econRow(rows[0], bare, r.SurfaceC, cost >= 0)
	a.out.EconomicsAsSpecified = &row
	if cost < 0 && len(costs) > 0 {
		l.warn("economics as specified: no installed cost at the specified thickness (%s mm), so no payback for the build as specified", fmtF(outerMM, 1))
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
		switch {
		case l.shape.IsFlat():
			size = `a flat surface (rows of size "flat", cost per m²)`
		case size == "":
			size = "without a nominal size"
		}
		l.assume("economics: no row of the project's cost table matches %s, %s, so no installed cost: no payback, life-cycle cost or economic thickness", mat, size)
	}
}

func abs(v float64) float64 {
	if v < 0 {
		return -v
	}
	return v
}
