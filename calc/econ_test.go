package calc

import (
	"math"
	"math/rand/v2"
	"testing"
)

func TestUPVStar(t *testing.T) {
	// Closed form of NIST Handbook 135's UPV* for d ≠ e:
	// UPV* = ((1+e)/(d−e))·[1 − ((1+e)/(1+d))^n].
	closed := func(d, e float64, n int) float64 {
		return (1 + e) / (d - e) * (1 - math.Pow((1+e)/(1+d), float64(n)))
	}
	for _, c := range []struct {
		d, e float64
		n    int
	}{{0.03, 0, 20}, {0.05, 0.02, 25}, {0.08, 0.04, 10}, {0.03, 0.05, 30}, {0.07, -0.01, 15}, {0.1, 0.02, 1}} {
		got, want := UPVStar(c.d, c.e, c.n), closed(c.d, c.e, c.n)
		if math.Abs(got-want) > 1e-12*want {
			t.Errorf("UPVStar(%g, %g, %d) = %.12g, closed form %.12g", c.d, c.e, c.n, got, want)
		}
	}
	cases := []struct {
		d, e float64
		n    int
		want float64
		src  string
	}{
		// Uniform present-worth factor (P/A, 3 %, 20) = 14.877 (standard engineering
		// economics interest tables; e = 0 reduces UPV* to it).
		{0.03, 0, 20, 14.877, "P/A 3 % 20 years, interest tables"},
		{0.10, 0, 10, 6.1446, "P/A 10 % 10 years, interest tables"},
		{0.04, 0.04, 25, 25, "d = e gives n (NIST Handbook 135 definition)"},
		{0.05, 0.02, 0, 0, "no years"},
		{-1, 0, 10, 0, "invalid rate"},
	}
	for _, c := range cases {
		if got := UPVStar(c.d, c.e, c.n); math.Abs(got-c.want) > 5e-4 {
			t.Errorf("%s: UPVStar(%g, %g, %d) = %.5f, want %g", c.src, c.d, c.e, c.n, got, c.want)
		}
	}
}

func basisForTest() EconBasis {
	return EconBasis{LengthM: 100, HoursPerYear: 8760, Conversion: 0.8, PricePerKWh: 0.05, CO2PerKWh: 0.2,
		DiscountRate: 0.05, EscalationRate: 0.02, LifeYears: 20}
}

func TestEconomicsHandCalc(t *testing.T) {
	// Hand calculation: 100 m, 8760 h, efficiency 0.8, 0.05 per kWh, 0.2 kg CO2/kWh.
	// Bare 200 W/m → 200×100×8760/1000/0.8 = 219 000 kWh, 10 950 per year.
	// 25 mm: 40 W/m → 43 800 kWh, 2190 per year; installed 20/m → 2000;
	//   saving 8760 → simple payback 2000/8760 = 0.228311 years.
	// 50 mm: −30 W/m (sign ignored) → 32 850 kWh, 1642.5; installed 35/m → 3500;
	//   incremental payback (3500 − 2000)/(2190 − 1642.5) = 2.739726 years.
	b := basisForTest()
	cands := []EconCandidate{{25, 40, 20}, {50, -30, 35}}
	rows, eco, err := Economics(b, 200, cands)
	if err != nil {
		t.Fatal(err)
	}
	upv := UPVStar(0.05, 0.02, 20)
	want := []struct{ kwh, cost, inst, co2, simple, incr float64 }{
		{43800, 2190, 2000, 8760, 2000.0 / 8760, 2000.0 / 8760},
		{32850, 1642.5, 3500, 6570, 3500 / 9307.5, 1500 / 547.5},
	}
	for i, w := range want {
		r := rows[i]
		near := func(name string, got, want float64) {
			if math.Abs(got-want) > 1e-9*math.Max(1, math.Abs(want)) {
				t.Errorf("row %d %s = %.9g, want %.9g", i, name, got, want)
			}
		}
		near("AnnualKWh", r.AnnualKWh, w.kwh)
		near("AnnualCost", r.AnnualCost, w.cost)
		near("InstalledCost", r.InstalledCost, w.inst)
		near("CO2Kg", r.CO2Kg, w.co2)
		near("NPV", r.NPV, (10950-w.cost)*upv-w.inst)
		near("LifeCycleCost", r.LifeCycleCost, w.inst+w.cost*upv)
		if r.SimplePaybackYears == nil || r.IncrementalPaybackYears == nil {
			t.Fatalf("row %d: nil payback", i)
		}
		near("SimplePayback", *r.SimplePaybackYears, w.simple)
		near("IncrementalPayback", *r.IncrementalPaybackYears, w.incr)
		if r.ThicknessMM != cands[i].ThicknessMM || r.HeatFlowPerM != cands[i].HeatFlowPerM {
			t.Errorf("row %d echoes %g mm, %g W/m", i, r.ThicknessMM, r.HeatFlowPerM)
		}
	}
	if math.Abs(*rows[1].IncrementalPaybackYears-2.739726) > 1e-6 {
		t.Errorf("incremental payback %g, want 2.739726", *rows[1].IncrementalPaybackYears)
	}
	if eco != 1 {
		t.Errorf("economic index %d, want 1", eco)
	}
}

func TestEconomicsPaybackCommonPractice(t *testing.T) {
	// Cost 1000, saving 250 per year → 4 years (common practice). 1 m, 1000 h, price 1 per
	// kWh: bare 500 W → 500 per year; insulated 250 W → 250 per year.
	b := EconBasis{LengthM: 1, HoursPerYear: 1000, Conversion: 1, PricePerKWh: 1, LifeYears: 10}
	rows, _, err := Economics(b, 500, []EconCandidate{{25, 250, 1000}})
	if err != nil {
		t.Fatal(err)
	}
	if p := rows[0].SimplePaybackYears; p == nil || math.Abs(*p-4) > 1e-12 {
		t.Errorf("simple payback %v, want 4 years", p)
	}
}

func TestEconomicsNoSaving(t *testing.T) {
	b := basisForTest()
	// Equal heat flows: no saving, no payback (and no division by zero).
	rows, eco, err := Economics(b, 50, []EconCandidate{{25, 50, 10}, {50, 50, 20}, {75, 60, 30}})
	if err != nil {
		t.Fatal(err)
	}
	for i, r := range rows {
		if r.SimplePaybackYears != nil || r.IncrementalPaybackYears != nil {
			t.Errorf("row %d: payback %v / %v, want nil", i, r.SimplePaybackYears, r.IncrementalPaybackYears)
		}
	}
	if eco != 0 {
		t.Errorf("economic %d, want 0 (cheapest)", eco)
	}
	// Price 0: nothing is saved.
	b.PricePerKWh = 0
	rows, _, err = Economics(b, 200, []EconCandidate{{25, 50, 10}})
	if err != nil || rows[0].SimplePaybackYears != nil {
		t.Errorf("price 0: %v, %v", rows[0].SimplePaybackYears, err)
	}
	// No candidates.
	if rows, eco, err := Economics(basisForTest(), 200, nil); err != nil || eco != -1 || len(rows) != 0 {
		t.Errorf("no candidates: %v, %d, %v", rows, eco, err)
	}
}

func TestEconomicsValidation(t *testing.T) {
	for name, mod := range map[string]func(*EconBasis){
		"conversion 0":   func(b *EconBasis) { b.Conversion = 0 },
		"negative price": func(b *EconBasis) { b.PricePerKWh = -0.01 },
		"life 0":         func(b *EconBasis) { b.LifeYears = 0 },
		"life 101":       func(b *EconBasis) { b.LifeYears = 101 },
		"discount −1":    func(b *EconBasis) { b.DiscountRate = -1 },
		"escalation −2":  func(b *EconBasis) { b.EscalationRate = -2 },
		"length 0":       func(b *EconBasis) { b.LengthM = 0 },
		"hours 0":        func(b *EconBasis) { b.HoursPerYear = 0 },
		"hours 9000":     func(b *EconBasis) { b.HoursPerYear = 9000 },
		"NaN CO2":        func(b *EconBasis) { b.CO2PerKWh = math.NaN() },
		"negative CO2":   func(b *EconBasis) { b.CO2PerKWh = -1 },
	} {
		b := basisForTest()
		mod(&b)
		if _, eco, err := Economics(b, 100, []EconCandidate{{25, 20, 10}}); err == nil || eco != -1 {
			t.Errorf("%s: want error", name)
		}
	}
	for name, cands := range map[string][]EconCandidate{
		"descending":    {{50, 20, 10}, {25, 30, 5}},
		"duplicate":     {{25, 20, 10}, {25, 20, 10}},
		"negative cost": {{25, 20, -1}},
		"NaN heat flow": {{25, math.NaN(), 1}},
	} {
		if _, _, err := Economics(basisForTest(), 100, cands); err == nil {
			t.Errorf("%s: want error", name)
		}
	}
	if _, _, err := Economics(basisForTest(), math.Inf(1), []EconCandidate{{25, 20, 10}}); err == nil {
		t.Error("Inf bare heat flow: want error")
	}
}

// randomCandidates makes convex data: heat flow falling and convex, installed cost rising
// and convex, with thickness.
func randomCandidates(r *rand.Rand) []EconCandidate {
	n := 2 + r.IntN(10)
	cands := make([]EconCandidate, n)
	q, dq := 50+r.Float64()*300, 10+r.Float64()*50
	c, dc := r.Float64()*20, 1+r.Float64()*10
	for i := range cands {
		cands[i] = EconCandidate{ThicknessMM: float64(13 * (i + 1)), HeatFlowPerM: q, InstalledCostPerM: c}
		dq *= 0.3 + 0.6*r.Float64()
		q = math.Max(q-dq, 1)
		c += dc
		dc *= 1 + r.Float64()
	}
	return cands
}

func TestEconomicsProperties(t *testing.T) {
	r := rand.New(rand.NewPCG(1, 2))
	for trial := range 500 {
		cands := randomCandidates(r)
		b := basisForTest()
		b.DiscountRate = r.Float64() * 0.1
		b.EscalationRate = r.Float64() * 0.05
		b.LifeYears = 1 + r.IntN(40)
		bare := cands[0].HeatFlowPerM * (1.5 + r.Float64()*3)
		prevThick := -1.0
		for _, price := range []float64{0.001, 0.01, 0.03, 0.1, 0.3, 1, 3} {
			b.PricePerKWh = price
			rows, eco, err := Economics(b, bare, cands)
			if err != nil {
				t.Fatal(err)
			}
			// The economic index is the argmin of the life-cycle cost.
			for i, row := range rows {
				if row.LifeCycleCost < rows[eco].LifeCycleCost {
					t.Fatalf("trial %d: row %d LCC %g below the economic row %d's %g", trial, i, row.LifeCycleCost, eco, rows[eco].LifeCycleCost)
				}
			}
			// A higher price never gives a thinner economic thickness.
			if th := rows[eco].ThicknessMM; th < prevThick {
				t.Fatalf("trial %d: price %g gives %g mm, thinner than %g mm at a lower price", trial, price, th, prevThick)
			} else {
				prevThick = th
			}
		}
	}
}
