package calc

import (
	"fmt"
	"math"
)

// UPVStar is the modified uniform present-worth factor of NIST Handbook 135 (Life-Cycle
// Costing Manual for the Federal Energy Management Program):
//
//	UPV* = Σ_{t=1..n} ((1+e)/(1+d))^t
//
// the present worth of an annual amount, paid at the end of each of n years, that is A
// today and escalates at rate e, discounted at rate d. Summed term by term, so d = e
// gives n. Inputs it cannot use (years < 1, a rate ≤ −1, NaN or Inf) give 0; Economics
// validates them before calling it.
func UPVStar(discount, escalation float64, years int) float64 {
	if years < 1 || !(discount > -1) || !(escalation > -1) || math.IsInf(discount, 0) || math.IsInf(escalation, 0) {
		return 0
	}
	x := (1 + escalation) / (1 + discount)
	var sum, term float64 = 0, 1
	for range years {
		term *= x
		sum += term
	}
	return sum
}

// EconBasis is the basis of an economic comparison of insulation thicknesses.
type EconBasis struct {
	LengthM      float64 // run length (plus fittings' equivalent length), m
	HoursPerYear float64 // hours of operation per year
	// Conversion is the heating efficiency (≤ 1) or the cooling COP (> 1): the energy bought
	// is heat/Conversion.
	Conversion     float64
	PricePerKWh    float64 // price of the energy bought, per kWh
	CO2PerKWh      float64 // kg CO2 per kWh bought
	DiscountRate   float64 // d, per year (0.05 = 5 %)
	EscalationRate float64 // e, energy price escalation per year
	LifeYears      int     // study period, 1 … 100 years
}

// EconCandidate is one insulation thickness to compare.
type EconCandidate struct {
	ThicknessMM       float64
	HeatFlowPerM      float64 // W/m (sign ignored: cold lines gain heat)
	InstalledCostPerM float64 // installed cost per metre
}

// EconRow is the economics of one candidate thickness.
type EconRow struct {
	ThicknessMM, HeatFlowPerM float64
	AnnualKWh                 float64 // energy bought per year
	AnnualCost                float64 // AnnualKWh × price
	InstalledCost             float64 // cost per metre × length
	NPV                       float64 // first-year saving against bare × UPV* − installed cost
	LifeCycleCost             float64 // installed cost + annual cost × UPV*
	CO2Kg                     float64 // per year, on the energy bought
	// Paybacks in years; nil where there is no saving (no payback).
	SimplePaybackYears, IncrementalPaybackYears *float64
}

// MaxEconCandidates bounds the candidate list of Economics.
const MaxEconCandidates = 1000

// Validate checks an economic basis.
func (b EconBasis) Validate() error {
	for _, v := range []float64{b.LengthM, b.HoursPerYear, b.Conversion, b.PricePerKWh, b.CO2PerKWh, b.DiscountRate, b.EscalationRate} {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return fmt.Errorf("calc: economic basis %+v has a value that is not finite", b)
		}
	}
	switch {
	case b.LengthM <= 0:
		return fmt.Errorf("calc: length %g m must be greater than 0", b.LengthM)
	case b.HoursPerYear <= 0 || b.HoursPerYear > 8784:
		return fmt.Errorf("calc: hours per year %g must be greater than 0 and at most 8784", b.HoursPerYear)
	case b.Conversion <= 0:
		return fmt.Errorf("calc: efficiency or COP %g must be greater than 0", b.Conversion)
	case b.PricePerKWh < 0:
		return fmt.Errorf("calc: energy price %g must not be negative", b.PricePerKWh)
	case b.CO2PerKWh < 0:
		return fmt.Errorf("calc: CO2 factor %g kg/kWh must not be negative", b.CO2PerKWh)
	case b.LifeYears < 1 || b.LifeYears > 100:
		return fmt.Errorf("calc: life %d years must be 1 … 100", b.LifeYears)
	case b.DiscountRate <= -1 || b.EscalationRate <= -1:
		return fmt.Errorf("calc: discount rate %g and escalation rate %g must be greater than −1 (−100 %%)", b.DiscountRate, b.EscalationRate)
	}
	return nil
}

// Economics returns the annual energy, cost, CO2, paybacks, NPV and life-cycle cost of each
// candidate (given in ascending thickness), and the index of the economic thickness: the
// least life-cycle cost, the thinner one on a tie; −1 when there are no candidates.
//
// Energy bought per year = |q'|·L·hours/1000/Conversion kWh. Present worth uses UPVStar
// (NIST Handbook 135). Simple payback = installed cost ÷ first-year saving against bare;
// incremental payback = extra installed cost ÷ extra saving against the previous (thinner)
// candidate, against bare for the first; no saving gives a nil payback, and a saving that
// costs nothing extra pays back at once (0 years).
func Economics(b EconBasis, bareHeatFlowPerM float64, cands []EconCandidate) (rows []EconRow, economic int, err error) {
	if err := b.Validate(); err != nil {
		return nil, -1, err
	}
	if math.IsNaN(bareHeatFlowPerM) || math.IsInf(bareHeatFlowPerM, 0) {
		return nil, -1, fmt.Errorf("calc: bare heat flow %g W/m is not finite", bareHeatFlowPerM)
	}
	if len(cands) > MaxEconCandidates {
		return nil, -1, fmt.Errorf("calc: %d candidate thicknesses, at most %d", len(cands), MaxEconCandidates)
	}
	for i, c := range cands {
		for _, v := range []float64{c.ThicknessMM, c.HeatFlowPerM, c.InstalledCostPerM} {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				return nil, -1, fmt.Errorf("calc: candidate %d (%g mm) has a value that is not finite", i, c.ThicknessMM)
			}
		}
		switch {
		case c.ThicknessMM < 0:
			return nil, -1, fmt.Errorf("calc: candidate %d thickness %g mm must not be negative", i, c.ThicknessMM)
		case c.InstalledCostPerM < 0:
			return nil, -1, fmt.Errorf("calc: candidate %d (%g mm) installed cost %g must not be negative", i, c.ThicknessMM, c.InstalledCostPerM)
		case i > 0 && c.ThicknessMM <= cands[i-1].ThicknessMM:
			return nil, -1, fmt.Errorf("calc: candidate thicknesses must ascend: %g mm after %g mm", c.ThicknessMM, cands[i-1].ThicknessMM)
		}
	}
	upv := UPVStar(b.DiscountRate, b.EscalationRate, b.LifeYears)
	kwh := func(q float64) float64 { return math.Abs(q) * b.LengthM * b.HoursPerYear / 1000 / b.Conversion }
	bareCost := kwh(bareHeatFlowPerM) * b.PricePerKWh
	years := make([]float64, 0, 2*len(cands)) // the paybacks' storage, one allocation
	payback := func(extraCost, saving float64) *float64 {
		if !(saving > 0) {
			return nil
		}
		years = append(years, math.Max(0, extraCost/saving)) // cheaper and saving: pays back at once
		return &years[len(years)-1]
	}
	rows = make([]EconRow, len(cands))
	economic = -1
	prevInstalled, prevCost := 0.0, bareCost
	for i, c := range cands {
		r := EconRow{ThicknessMM: c.ThicknessMM, HeatFlowPerM: c.HeatFlowPerM}
		r.AnnualKWh = kwh(c.HeatFlowPerM)
		r.AnnualCost = r.AnnualKWh * b.PricePerKWh
		r.InstalledCost = c.InstalledCostPerM * b.LengthM
		r.CO2Kg = r.AnnualKWh * b.CO2PerKWh
		saving := bareCost - r.AnnualCost
		r.NPV = saving*upv - r.InstalledCost
		r.LifeCycleCost = r.InstalledCost + r.AnnualCost*upv
		r.SimplePaybackYears = payback(r.InstalledCost, saving)
		r.IncrementalPaybackYears = payback(r.InstalledCost-prevInstalled, prevCost-r.AnnualCost)
		prevInstalled, prevCost = r.InstalledCost, r.AnnualCost
		if economic < 0 || r.LifeCycleCost < rows[economic].LifeCycleCost {
			economic = i
		}
		rows[i] = r
	}
	return rows, economic, nil
}
