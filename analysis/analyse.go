package analysis

import (
	"errors"
	"fmt"
	"math"
	"slices"
	"strings"

	"lagwright/calc"
	"lagwright/catalog"
	"lagwright/field"
)

// Caution is shown with every result: the estimates stand on published methods, and
// the adopted codes and a licensed engineer govern.
const Caution = "Estimates by published methods (ASTM C680 / ISO 12241 approach). Actual performance depends on " +
	"workmanship, moisture, ageing and jacket condition. The adopted codes and a licensed engineer govern where the work is built."

// Run decodes one JSON request and analyses it. Bad input returns field.Errors.
func Run(data []byte, r Resolver) (*Output, error) {
	var in Input
	decodeErr := DecodeStrict(data, &in)
	var decoded field.Errors
	if decodeErr != nil {
		if !errors.As(decodeErr, &decoded) || (len(decoded) == 1 && decoded[0].Field == "") {
			return nil, decodeErr // not an object: nothing more to say
		}
	}
	// Validate what could be read too, so every bad field is named at once; a field that
	// could not be read is reported once, for its type.
	out, err := Analyse(in, r)
	var checked field.Errors
	if err != nil && !errors.As(err, &checked) {
		return nil, err
	}
	if len(decoded) == 0 && len(checked) == 0 {
		return out, nil
	}
	all := slices.Clone(decoded)
	for _, fe := range checked {
		if !slices.ContainsFunc(decoded, func(d field.Error) bool { return d.Field == fe.Field }) {
			all = append(all, fe)
		}
	}
	slices.SortStableFunc(all, func(a, b field.Error) int { return strings.Compare(a.Field, b.Field) })
	return nil, all
}

// Analyse validates the input, solves the line at its design conditions, judges every
// criterion at its own conditions and prices the thicknesses.
func Analyse(in Input, r Resolver) (*Output, error) {
	l, err := resolve(in, r)
	if err != nil {
		return nil, err
	}
	a := analyser{l: l, out: new(Output)} // on this stack: only the answer is kept
	return a.run()
}

// analyser carries one analysis and a cache of solves, so criteria sharing conditions
// and thicknesses never solve twice.
type analyser struct {
	l *line
	// Solves of this analysis by key: the first len(memo) in memo, searched linearly
	// (a line needs about ten), any more in cache (made when needed).
	memo  [10]memoEntry
	nMemo int
	cache map[solveKey]calc.Result
	nums  []float64 // backing of num
	out   *Output   // the answer being built (set by Analyse; needed by run, not by solve or econBasis)
	// codeResistance is the build's and the code's thermal resistance per metre
	// (m·K/W) when a multi-layer build is judged against the energy code by resistance.
	codeResistance *[2]float64
	plan           [8]float64 // backing of layerPlan
}

type memoEntry struct {
	key solveKey
	res calc.Result
}

type solveKey struct {
	air   calc.Air
	fluid float64
	tMM   float64 // sized-layer thickness; -1 = as specified, -2 = bare
}

const (
	asSpecified = -1.0
	bareSurface = -2.0
)

// system returns the system with the sized (outermost) layer at tMM. tMM 0 removes the
// sized layer; with no layer left the surface is bare (bare emittance, correlations).
func (a *analyser) system(tMM float64) calc.System {
	l := a.l
	switch {
	case tMM == asSpecified:
		return l.base
	case tMM == bareSurface:
		return l.bare
	case tMM == asFound:
		return *l.existing
	}
	n := len(l.base.Layers)
	if tMM == 0 {
		if n <= 1 {
			return l.bare
		}
		s := l.base
		s.Layers = l.base.Layers[:n-1]
		return s
	}
	// calc.Solve keeps nothing of the system it is given, so one layer buffer serves
	// every sized system of the analysis. A thickness above the largest single layer is
	// installed (and solved) as the layers of layerPlan, each at its own mean temperature.
	s := l.base
	l.sized = append(l.sized[:0], l.base.Layers[:n-1]...)
	for _, t := range a.layerPlan(tMM) {
		ly := l.base.Layers[n-1]
		ly.Thickness = t / 1000 * l.installed[n-1]
		l.sized = append(l.sized, ly)
	}
	s.Layers = l.sized
	return s
}

// systemKey names the system of tMM by what it is, so that equal systems share one
// solve: no sized layer on a single-layer line is the bare surface, and a candidate
// equal to the thickness as specified is the line as specified.
func (a *analyser) systemKey(tMM float64) float64 {
	l := a.l
	n := len(l.base.Layers)
	switch {
	case tMM == asSpecified || tMM == bareSurface || tMM == asFound || n == 0:
		return tMM
	case tMM == 0 && n <= 1:
		return bareSurface
	case tMM > 0 && tMM/1000*l.installed[n-1] == l.base.Layers[n-1].Thickness && len(a.layerPlan(tMM)) == 1:
		return asSpecified
	}
	return tMM
}

func (a *analyser) solve(tMM, fluidC float64, air calc.Air) (calc.Result, error) {
	tMM = a.systemKey(tMM)
	k := solveKey{air: air, fluid: fluidC, tMM: tMM}
	for i := range a.nMemo {
		if m := &a.memo[i]; m.key.tMM == k.tMM && m.key == k { // thickness first: it differs most
			return m.res, nil
		}
	}
	if r, ok := a.cache[k]; ok {
		return r, nil
	}
	r, err := calc.Solve(a.system(tMM), fluidC, air)
	if err != nil {
		return r, fmt.Errorf("heat balance: %w", err)
	}
	switch {
	case a.nMemo < len(a.memo):
		a.memo[a.nMemo] = memoEntry{k, r}
		a.nMemo++
	default:
		if a.cache == nil {
			a.cache = map[solveKey]calc.Result{}
		}
		a.cache[k] = r
	}
	return r, nil
}

// num returns a pointer to v for the answer. The answer's optional numbers share small
// blocks instead of taking one allocation each.
func (a *analyser) num(v float64) *float64 {
	if len(a.nums) == cap(a.nums) {
		a.nums = make([]float64, 0, 48) // an answer has about forty
	}
	a.nums = append(a.nums, v)
	return &a.nums[len(a.nums)-1]
}

// numRound is num(round(*p, d)), nil for nil.
func (a *analyser) numRound(p *float64, d int) *float64 {
	if p == nil {
		return nil
	}
	return a.num(round(*p, d))
}

func (a *analyser) run() (*Output, error) {
	l := a.l
	o := a.out
	o.MethodVersion = calc.MethodVersion
	o.Geometry = l.in.Geometry
	o.OperatingTempC = round(l.opC, 3)
	if l.shape.IsPipe() {
		o.PipeODmm = a.num(round(l.base.PipeOD*1000, 2))
	}
	for i, ly := range l.base.Layers {
		o.InsulationMM += ly.Thickness * 1000 / l.installed[i]
	}
	o.InsulationMM = round(o.InsulationMM, 2)

	main, err := a.solve(asSpecified, l.opC, l.design.air)
	if err != nil {
		return nil, err
	}
	bare, err := a.solve(bareSurface, l.opC, l.design.air)
	if err != nil {
		return nil, err
	}
	a.shapeHeatBalance(main, bare)
	if err := a.dewPoint(); err != nil {
		return nil, err
	}
	if err := a.fittingsAndSupports(main, bare); err != nil {
		return nil, err
	}
	if err := a.asFoundHeat(bare); err != nil {
		return nil, err
	}
	if err := a.alongRun(main); err != nil {
		return nil, err
	}
	if err := a.freezeTimes(); err != nil {
		return nil, err
	}
	if err := a.size(); err != nil {
		return nil, err
	}
	if err := a.checks(); err != nil {
		return nil, err
	}
	a.cautions()
	o.ConditionsUsed = ConditionsUsed{Design: l.design.out(), Personnel: l.personnel.out(),
		Condensation: l.condensation.out(), Economics: l.econ.out()}
	if l.crit.freezeHours != nil || o.FreezeHoursTo0C != nil {
		f := l.freeze.out()
		f.InitialTempC = a.num(a.freezeInitial())
		o.ConditionsUsed.Freeze = &f
	}
	o.Assumptions = nonNil(l.assumptions)
	o.Warnings = nonNil(dedupe(l.warnings))
	return o, nil
}

func (a *analyser) shapeHeatBalance(main, bare calc.Result) {
	l, o := a.l, a.out
	if !l.shape.IsFlat() {
		o.HeatFlowWPerM = a.num(round(main.HeatFlowPerM, 4))
		o.BareHeatFlow = a.num(round(bare.HeatFlowPerM, 4))
		o.OuterAreaM2PerM = a.num(round(main.OuterAreaPerM, 5))
		if l.lengthM > 0 {
			o.EquivalentLengthM = a.num(round(l.equivLengthM, 3))
			o.HeatFlowW = a.num(round(main.HeatFlowPerM*l.equivLengthM, 2))
		}
	} else if l.areaM2 > 0 {
		o.HeatFlowW = a.num(round(main.HeatFlux*l.areaM2, 2))
	}
	if main.OuterDiameter > 0 {
		o.OuterDiameterMM = a.num(round(main.OuterDiameter*1000, 2))
	}
	o.HeatFluxWm2 = round(main.HeatFlux, 4)
	o.BareHeatFluxWm2 = round(bare.HeatFlux, 4)
	o.BareSurfaceC = round(bare.SurfaceC, 3)
	o.SurfaceTempC = round(main.SurfaceC, 3)
	o.PipeSurfaceC = round(main.PipeSurfaceC, 3)
	o.SurfaceCoeff = SurfaceCoeff{Convection: round(main.HConv, 4), Radiation: round(main.HRad, 4)}
	o.InterfaceTempsC = make([]float64, 0, len(main.Layers))
	o.Layers = make([]LayerOut, 0, len(main.Layers))
	for i, ls := range main.Layers {
		o.InterfaceTempsC = append(o.InterfaceTempsC, round(ls.InnerC, 3))
		o.Layers = append(o.Layers, LayerOut{Material: l.layerMaterials[i], ThicknessMM: round(l.base.Layers[i].Thickness*1000, 2),
			NominalThicknessMM: round(l.base.Layers[i].Thickness*1000/l.installed[i], 2),
			KUsed:              round(ls.K, 6), MeanTempC: round(ls.MeanC, 3), InnerTempC: round(ls.InnerC, 3), OuterTempC: round(ls.OuterC, 3)})
	}
	for _, f := range main.Faces {
		o.Faces = append(o.Faces, FaceOut{Face: f.Name, SurfaceTempC: round(f.SurfaceC, 3),
			HeatFlowWPerM: round(f.HeatFlowPerM, 4), HeatFluxWm2: round(f.HeatFlux, 4)})
	}
	if len(l.base.Layers) > 0 && bare.HeatFlux != 0 && math.Signbit(bare.HeatFlux) == math.Signbit(main.HeatFlux) {
		o.EfficiencyPct = a.num(round(100*(1-main.HeatFlowPerM/bare.HeatFlowPerM), 3))
		if *o.EfficiencyPct < 0 {
			l.warn("the insulation as specified increases the heat flow over the bare surface (below the critical radius)")
		}
	}
	l.warnings = append(l.warnings, main.Warnings...)
	a.pipeMaterialCautions()
}

// pipeMaterialCautions warns of the pipe-material risks that insulation brings.
func (a *analyser) pipeMaterialCautions() {
	l := a.l
	if !l.shape.IsPipe() || l.pipeMat.Slug == "" || len(l.base.Layers) == 0 {
		return
	}
	pm := l.pipeMat
	if pm.CUIMaxC > pm.CUIMinC && l.opC >= pm.CUIMinC && l.opC <= pm.CUIMaxC {
		l.warn("%s at %.0f °C lies in the usual range for corrosion under insulation (%.0f to %.0f °C): coat the pipe and keep the jacket sealed",
			pm.Name, l.opC, pm.CUIMinC, pm.CUIMaxC)
	}
	if pm.SCCMaxC > pm.SCCMinC && l.opC >= pm.SCCMinC && l.opC <= pm.SCCMaxC {
		l.warn("%s at %.0f °C: use insulation tested for leachable chlorides (ASTM C795) to avoid stress-corrosion cracking", pm.Name, l.opC)
	}
	if pm.MaxServiceC != 0 && l.opC > pm.MaxServiceC {
		l.warn("%s is above its usual service limit (%.0f °C) at %.0f °C", pm.Name, pm.MaxServiceC, l.opC)
	}
}

// dewPoint reports the dew (or frost) point and the margin of the coldest surface at
// the condensation conditions, whenever a humidity is known.
func (a *analyser) dewPoint() error {
	l, o := a.l, a.out
	set := l.condensation
	if !set.humid() {
		return nil
	}
	dp := *set.dew
	o.DewPointC = a.num(round(dp, 3))
	o.DewPointKind = "dew point"
	if calc.IsFrostPoint(dp) {
		o.DewPointKind = "frost point"
	}
	r, err := a.solve(asSpecified, l.opC, set.air)
	if err != nil {
		return err
	}
	o.CondensationMarginK = a.num(round(coldest(r)-dp, 3))
	if l.crit.condensation && coldest(r) < dp+l.crit.dewMarginK {
		a.condensationWarning(r, dp, "as specified")
	}
	return nil
}

// condensationWarning says that the surface of the line (as specified, or at the governing
// thickness) falls below the dew point plus margin, and why when the sky is the cause.
func (a *analyser) condensationWarning(r calc.Result, dp float64, which string) {
	l := a.l
	set := l.condensation
	kind := "dew point"
	if calc.IsFrostPoint(dp) {
		kind = "frost point"
	}
	l.warn("condensation: with the insulation %s the surface falls to %s °C, below the %s %s °C plus the %s K margin",
		which, fmtRound(coldest(r), 2), kind, fmtRound(dp, 2), fmtRound(l.crit.dewMarginK, 1))
	if l.opC >= set.air.TempC && set.air.SurroundingsC < set.air.TempC {
		l.warn("the surface is cooled below the air by radiation to surroundings at %s °C (a clear night sky): more insulation makes it colder; "+
			"a low-emittance jacket (bright metal) or shelter reduces it", fmtRound(set.air.SurroundingsC, 1))
	}
}

// coldest is the coldest outer-surface temperature (the coldest duct face).
func coldest(r calc.Result) float64 {
	t := r.SurfaceC
	for _, f := range r.Faces {
		t = math.Min(t, f.SurfaceC)
	}
	return t
}

// hottest is the hottest outer-surface temperature (the hottest duct face).
func hottest(r calc.Result) float64 {
	t := r.SurfaceC
	for _, f := range r.Faces {
		t = math.Max(t, f.SurfaceC)
	}
	return t
}

// runSegments is the number of segments the run is marched in.
const runSegments = 10

// alongRun gives the outlet temperature (with flow) or the condensate load (steam).
func (a *analyser) alongRun(main calc.Result) error {
	l, o := a.l, a.out
	if l.superheatK > 0 {
		return a.superheatedRun()
	}
	if l.steamAbsPa > 0 && l.fluid == "steam" {
		o.SteamSatTempC = a.num(round(l.opC, 3))
		hfg, err := calc.SteamLatentHeat(l.steamAbsPa)
		if err != nil {
			return fmt.Errorf("steam latent heat: %w", err)
		}
		if l.lengthM > 0 {
			o.CondensateKgPerH = a.num(round(calc.CondensateKgPerH(l.runHeatW, hfg), 4))
			l.assume("condensate from the run's heat loss with latent heat %.1f kJ/kg (IAPWS-IF97)", hfg/1000)
		} else {
			l.warn("give length_m for the run's condensate load")
		}
		return nil
	}
	if l.in.Flow == nil || l.lengthM == 0 {
		return nil
	}
	out, err := a.outlet(asSpecified)
	if err != nil {
		return err
	}
	o.OutletTempC = a.num(round(out, 4))
	o.TempChangeK = a.num(round(l.opC-out, 4))
	l.assume("temperature change marched in %d segments over the length plus fittings (%.1f m), at the design conditions", runSegments, l.equivLengthM)
	return nil
}

// superheatedRun gives the superheat, and with flow and length the steam's cooling along
// the run and the condensate after the point where it reaches saturation.
func (a *analyser) superheatedRun() error {
	l, o := a.l, a.out
	o.SteamSatTempC = a.num(round(l.steamSatC, 3))
	o.SteamSuperheatK = a.num(round(l.superheatK, 3))
	if l.in.Flow == nil || l.lengthM == 0 {
		l.warn("superheated steam: give flow.mass_flow_kg_s and length_m for its cooling along the run and any condensate")
		return nil
	}
	run, err := a.steamRun(asSpecified)
	if err != nil {
		return err
	}
	o.OutletTempC = a.num(round(run.OutletC, 4))
	o.TempChangeK = a.num(round(l.opC-run.OutletC, 4))
	o.CondensateKgPerH = a.num(round(run.CondensateKgPerH, 4))
	if run.SaturatedAtM >= 0 {
		o.SteamSaturatedAtM = a.num(round(run.SaturatedAtM, 2))
		l.warn("superheated steam reaches saturation %s m along the run (of %s m with fittings) and condenses after it: provide drainage (steam traps) downstream",
			fmtRound(run.SaturatedAtM, 1), fmtRound(l.equivLengthM, 1))
	}
	l.assume("superheated steam cooled along the length plus fittings (%.1f m) in %d segments by its enthalpy (IAPWS-IF97 region 2), "+
		"at the design conditions; condensate only after it reaches saturation", l.equivLengthM, steamSegments)
	return nil
}

// steamSegments is the number of segments a superheated-steam run is marched in.
const steamSegments = 20

func (a *analyser) steamRun(tMM float64) (calc.SteamRun, error) {
	l := a.l
	q := func(fluidC float64) (float64, error) {
		r, err := a.solve(tMM, fluidC, l.design.air)
		return r.HeatFlowPerM, err
	}
	run, err := calc.SuperheatedRun(l.steamAbsPa, l.opC, l.equivLengthM, *l.in.Flow.MassFlowKgS, q, steamSegments)
	if err != nil {
		return run, fmt.Errorf("superheated steam along the run: %w", err)
	}
	return run, nil
}

func (a *analyser) outlet(tMM float64) (float64, error) {
	l := a.l
	if l.superheatK > 0 {
		run, err := a.steamRun(tMM)
		return run.OutletC, err
	}
	q := func(fluidC float64) (float64, error) {
		r, err := a.solve(tMM, fluidC, l.design.air)
		return r.HeatFlowPerM, err
	}
	out, err := calc.OutletTemp(l.opC, l.design.air.TempC, l.equivLengthM, *l.in.Flow.MassFlowKgS, l.cpJkgK, q, runSegments)
	if err != nil {
		return 0, fmt.Errorf("temperature along the run: %w", err)
	}
	return out, nil
}

func (a *analyser) freezeInitial() float64 {
	if a.l.freeze.initial != nil {
		return *a.l.freeze.initial
	}
	return a.l.opC
}

// freezeApplies reports whether stagnant water in this line can freeze at the freeze
// conditions.
func (a *analyser) freezeApplies() bool {
	l := a.l
	return l.fluid == "water" && l.shape.IsPipe() && l.freeze.air.TempC < 0 && a.freezeInitial() > 0
}

func (a *analyser) freezeTimes() error {
	l, o := a.l, a.out
	if !a.freezeApplies() {
		if l.crit.freezeHours != nil {
			l.assume("freeze protection: the freeze conditions are not below 0 °C (or the water starts at or below 0 °C), so nothing to size")
		}
		return nil
	}
	h0, hf, err := a.freezeHours(asSpecified)
	if err != nil {
		return err
	}
	o.FreezeHoursTo0C = a.num(round(h0, 3))
	o.FreezeHoursToFreeze = a.num(round(hf, 3))
	if l.crit.freezeModel == "full" {
		l.assume("freeze times for stagnant water, freeze_model \"full\": ASHRAE Fundamentals ch. 23 cooling form with the wall's heat capacity, "+
			"the wall and any inner film given, and the outer film; ISO 12241 §6.2 form for freezing %.0f %% of the water", 100*l.crit.freezeFraction)
	} else {
		l.assume("freeze times for stagnant water, freeze_model \"handbook\" (default): ASHRAE Fundamentals ch. 23 basis, insulation resistance only — "+
			"pipe wall, its heat capacity and the inner and outer films neglected (conservative); ISO 12241 §6.2 form for freezing %.0f %% of the water; "+
			"freeze_model \"full\" counts them", 100*l.crit.freezeFraction)
	}
	return nil
}

// handbookBasis reports whether freeze times and tracing take the handbook's basis
// (insulation resistance only) for the sized layer at tMM: the default, where there is
// insulation to take it from.
func (a *analyser) handbookBasis(tMM float64) bool {
	return a.l.crit.freezeModel == "handbook" && len(a.system(tMM).Layers) > 0
}

// insulationResistance is R_T of the handbook basis for the sized layer at tMM, with the
// layers' conductivities from the solve r.
func (a *analyser) insulationResistance(tMM float64, r calc.Result) (float64, error) {
	sys := a.system(tMM)
	rt, err := calc.HandbookResistancePerM(sys.PipeOD, sys.Layers, r.Layers)
	if err != nil {
		return 0, fmt.Errorf("insulation resistance: %w", err)
	}
	return rt, nil
}

// freezeHours gives hours to 0 °C and to the frozen fraction with the sized layer at tMM.
func (a *analyser) freezeHours(tMM float64) (float64, float64, error) {
	l := a.l
	sys := l.base // the pipe: the same for every thickness
	ti := a.freezeInitial()
	air := l.freeze.air
	mid := ti / 2
	rMid, err := a.solve(tMM, mid, air)
	if err != nil {
		return 0, 0, err
	}
	r0, err := a.solve(tMM, 0, air)
	if err != nil {
		return 0, 0, err
	}
	di := sys.PipeOD - 2*sys.PipeWall
	area := math.Pi * di * di / 4
	wallArea := math.Pi * (sys.PipeOD*sys.PipeOD - di*di) / 4
	in := calc.FreezeInput{
		WaterCapPerM:  calc.WaterDensity * calc.WaterCp * area,
		WallCapPerM:   wallArea * l.pipeMat.Density * l.pipeMat.SpecificHeat,
		WaterMassPerM: calc.WaterDensity * area,
		RCoolPerM:     (mid - air.TempC) / rMid.HeatFlowPerM,
		RFreezePerM:   (0 - air.TempC) / r0.HeatFlowPerM,
		InitialC:      ti,
		AirC:          air.TempC,
		Fraction:      l.crit.freezeFraction,
	}
	if a.handbookBasis(tMM) {
		in.WallCapPerM = 0
		if in.RCoolPerM, err = a.insulationResistance(tMM, rMid); err != nil {
			return 0, 0, err
		}
		if in.RFreezePerM, err = a.insulationResistance(tMM, r0); err != nil {
			return 0, 0, err
		}
	}
	h0, hf, err := calc.FreezeTimes(in)
	if err != nil {
		if errors.Is(err, calc.ErrNoFreeze) {
			return math.Inf(1), math.Inf(1), nil
		}
		return 0, 0, fmt.Errorf("freeze time: %w", err)
	}
	return h0, hf, nil
}

func (a *analyser) cautions() {
	l, o := a.l, a.out
	o.Cautions = append(make([]string, 0, 5), Caution) // room for every caution below
	if l.opC > l.crit.maxSurfaceC {
		o.Cautions = append(o.Cautions, "Personnel protection: a surface at the limit can still burn on long contact; "+
			"public and healthcare areas often need lower limits, and guards are an alternative.")
		if l.crit.public {
			o.Cautions = append(o.Cautions, "Areas used by the public or patients: children, the elderly and people who cannot "+
				"withdraw are burned at lower temperatures and after shorter contact; the limit given here must come from the "+
				"local code or the facility's safety assessment, and guarding is often the better answer.")
		}
	}
	if l.opC < l.condensation.air.TempC {
		o.Cautions = append(o.Cautions, "Condensation control assumes a continuous, sealed vapour retarder; wet insulation loses "+
			"its resistance and can hide corrosion.")
	}
	if l.opC < l.condensation.air.TempC {
		l.warn("below-ambient line: it needs a continuous vapour retarder sealed at every lap and joint, with vapour stops at fittings and at intervals")
	}
	a.vapourRetarder()
	if o.FreezeHoursTo0C != nil {
		o.Cautions = append(o.Cautions, "Insulation delays but does not prevent freezing of still water; "+
			"drain, keep flowing or heat-trace lines that may stand in freezing weather.")
	}
}

func nonNil(s []string) []string {
	if s == nil {
		return []string{}
	}
	return s
}

func dedupe(s []string) []string {
	out := s[:0:0]
	for _, v := range s {
		if !slices.Contains(out, v) { // a few strings: no map needed
			out = append(out, v)
		}
	}
	return out
}

// round rounds to the given number of decimals, for a readable answer.
func round(v float64, decimals int) float64 {
	p := math.Pow10(decimals) // exact powers of ten, as math.Pow(10, decimals) gives
	r := math.Round(v*p) / p
	if r == 0 {
		return 0 // no "-0"
	}
	return r
}

// vapourRetarder reports the build's vapour retarder and, on a below-ambient line, judges
// its permeance against the limit for the service temperature.
func (a *analyser) vapourRetarder() {
	l, o := a.l, a.out
	rt := l.retarder
	cold := l.opC < l.condensation.air.TempC
	if len(l.base.Layers) == 0 || (!cold && l.in.VapourRetarder == "") {
		return
	}
	out := &RetarderOut{Source: rt.source, Name: rt.name}
	o.VapourRetarder = out
	if rt.perm > 0 {
		out.PermeancePerm = a.num(round(rt.perm, 4))
		out.PermeanceMetric = a.num(round(rt.perm*catalog.PermToMetric, 3))
	}
	if !cold {
		l.assume("vapour retarder not judged: the line is not below the condensation ambient")
		return
	}
	limit, basis := catalog.RetarderLimit(l.opC)
	if p := l.in.Criteria; p != nil && p.MaxRetarderPermeancePerm != nil {
		limit, basis = *p.MaxRetarderPermeancePerm, "given (criteria.max_retarder_permeance_perm)"
	}
	out.LimitPerm = a.num(limit)
	out.Basis = basis
	switch {
	case rt.source == "none":
		out.Pass = ptr(false)
		l.warn("this build has no vapour retarder: a below-ambient line needs one — a closed-cell insulation that retards vapour by itself, " +
			"or a film, facing or mastic (vapour_retarder) under the cover")
	case rt.perm == 0:
		l.warn("vapour retarder %s: permeance unknown — check it against the limit, %s", rt.name, basis)
	default:
		pass := rt.perm <= limit+1e-12
		out.Pass = &pass
		l.assume("vapour retarder %s: %s perm (%s ng/s·m²·Pa; %s) against the limit, %s", rt.name, fmtRound(rt.perm, 4),
			fmtRound(rt.perm*catalog.PermToMetric, 2), rt.basis, basis)
		if !pass {
			l.warn("vapour retarder %s: %s perm exceeds the %s perm limit: add a lower-permeance retarder (film, facing or mastic) over it, "+
				"or justify the build by the maker's guidance", rt.name, fmtRound(rt.perm, 4), fmtNum(limit))
		}
	}
}
