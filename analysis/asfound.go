package analysis

import (
	"fmt"
	"slices"

	"lagwright/calc"
	"lagwright/catalog"
)

// Existing is the line as an auditor found it: the build in place, its condition as a
// factor on k, the fraction of the run with the insulation missing, and the fitting
// kinds found bare. The line's own layers are then the proposed build.
type Existing struct {
	Layers []LayerInput `json:"layers"` // [] or absent: the run was found bare
	// Condition names a planning factor on k: "good" (1, the default), "wet", "damaged".
	Condition string `json:"condition,omitempty"`
	// KFactor multiplies the conductivity of every existing layer; it wins over Condition.
	KFactor         *float64 `json:"k_factor,omitempty"`
	MissingFraction *float64 `json:"missing_fraction,omitempty"` // 0 – 1 of the run found bare
	// BareFittings are the fitting kinds ("valves", "flange_pairs", …) found bare; the
	// others are as the line's fitting_finish says.
	BareFittings []string `json:"bare_fittings,omitempty"`
}

// Condition factors on k, with their basis, stated in the assumptions whenever used.
// They are our planning figures for a survey, not measurements: measure or replace wet
// insulation.
var conditionFactors = map[string]struct {
	factor float64
	basis  string
}{
	"good": {1, "insulation found dry and whole: k as new"},
	"wet": {2, "our planning figure, from memory, check before use: water conducts about 25 times better than still air " +
		"(about 0.6 against 0.025 W/m·K), and a few percent of moisture by volume commonly doubles the conductivity of " +
		"fibrous and open-cell insulation"},
	"damaged": {1.5, "our planning figure, from memory, check before use: crushed or compressed insulation with open " +
		"joints and torn jacket passes air and water; give the thickness as found, and this factor for the rest"},
}

// AsFoundOut is the heat flow of the line as found, beside the proposed build (the
// answer's heat_flow_…) and the bare line (bare_…), at the design conditions.
type AsFoundOut struct {
	HeatFlowWPerM   *float64 `json:"heat_flow_w_per_m"` // null for flats
	HeatFluxWm2     float64  `json:"heat_flux_w_m2"`    // per m² of the existing outer surface, missing part averaged in
	HeatFlowW       *float64 `json:"heat_flow_w"`       // the run with its fittings as found, where a length or area is given
	SurfaceTempC    float64  `json:"surface_temp_c"`    // of the insulated part as found (the bare surface where none)
	KFactor         float64  `json:"k_factor"`
	MissingFraction float64  `json:"missing_fraction"`
}

// asFound is the solve key of the existing build.
const asFound = -3.0

// resolveExisting checks the existing build and makes its system: the line's pipe and
// surface with the existing layers, their k multiplied by the condition factor.
func resolveExisting(l *line, r Resolver, c *errs) {
	e := l.in.Existing
	if e == nil {
		return
	}
	if len(e.Layers) > maxLayers {
		c.add("existing.layers", "must have at most %d layers", maxLayers)
		return
	}
	l.kFactor = 1
	switch cf, ok := conditionFactors[e.Condition]; {
	case e.Condition == "":
	case !ok:
		c.add("existing.condition", `must be "good", "wet" or "damaged" (or give k_factor)`)
	case e.KFactor == nil:
		l.kFactor = cf.factor
		if len(e.Layers) > 0 {
			l.assume("as found: %s insulation, k × %s (%s)", e.Condition, fmtNum(cf.factor), cf.basis)
		}
	}
	if e.KFactor != nil {
		rangeCheck(c, "existing.k_factor", e.KFactor, 1, 20, "")
		l.kFactor = *e.KFactor
		if len(e.Layers) > 0 {
			l.assume("as found: k × %s of the existing layers (factor given)", fmtNum(*e.KFactor))
		}
	}
	rangeCheck(c, "existing.missing_fraction", e.MissingFraction, 0, 1, "")
	l.missing = orDefault(e.MissingFraction, 0)
	for i, k := range e.BareFittings {
		if !slices.Contains(catalog.FittingKinds, k) {
			c.add(fmt.Sprintf("existing.bare_fittings[%d]", i), "unknown fitting kind %q (one of %v)", k, catalog.FittingKinds)
		}
	}
	ls := buildLayers(l, e.Layers, "existing.layers", r, c)
	sys := l.bare
	if len(ls.layers) > 0 {
		sys = l.base
		sys.Layers = ls.layers
		for i := range sys.Layers {
			k := slices.Clone(sys.Layers[i].K)
			for j := range k {
				k[j].K *= l.kFactor
			}
			sys.Layers[i].K = k
		}
	} else {
		l.assume("as found: the run is bare")
	}
	l.existing = &sys
	if l.missing > 0 {
		l.assume("as found: %s %% of the run has no insulation (bare, at the bare pipe's heat flow)", fmtNum(100*l.missing))
	}
}

// asFoundMix is the heat flow per metre and per m² as found: the existing build over
// the run, the bare line over its missing fraction.
func (a *analyser) asFoundMix(found, bare calc.Result) (perM, flux float64) {
	m := a.l.missing
	return (1-m)*found.HeatFlowPerM + m*bare.HeatFlowPerM, (1-m)*found.HeatFlux + m*bare.HeatFlux
}

// asFoundHeat gives the answer's as_found: the line as found at the design conditions,
// its run with fittings (found-bare kinds at the bare fitting's heat, ASTM C1129
// approach as for the proposed build; covers and supports as the line says).
func (a *analyser) asFoundHeat(bare calc.Result) error {
	l, o := a.l, a.out
	if l.existing == nil {
		return nil
	}
	found, err := a.solve(asFound, l.opC, l.design.air)
	if err != nil {
		return fmt.Errorf("as found: %w", err)
	}
	q, flux := a.asFoundMix(found, bare)
	af := &AsFoundOut{HeatFluxWm2: round(flux, 4), SurfaceTempC: round(found.SurfaceC, 3), KFactor: l.kFactor, MissingFraction: l.missing}
	switch {
	case l.shape.IsFlat():
		if l.areaM2 > 0 {
			af.HeatFlowW = a.num(round(flux*l.areaM2, 2))
		}
	default:
		af.HeatFlowWPerM = a.num(round(q, 4))
		if l.lengthM > 0 {
			af.HeatFlowW = a.num(round(a.asFoundRunW(q, bare), 2))
		}
	}
	o.AsFound = af
	return nil
}

// asFoundRunW is the run's heat as found, W: the straight run and each fitting kind.
func (a *analyser) asFoundRunW(q float64, bare calc.Result) float64 {
	l, o := a.l, a.out
	w := q * l.lengthM
	if eq := l.in.FittingsEquivLengthM; eq != nil {
		w += q * *eq
	}
	nominal := l.fittingNominalIn()
	bareNoted := false
	for i, f := range l.fittings {
		foundBare := f.finish == FinishBare || slices.Contains(l.in.Existing.BareFittings, f.kind)
		switch {
		case foundBare:
			area := f.bareAreaM
			if f.finish != FinishBare {
				area = l.bareFittingArea(f.kind, nominal, f.lengthM)
			}
			w += bare.HeatFlux * float64(f.count) * area
			if !bareNoted && f.finish != FinishBare {
				bareNoted = true
				l.assume("as found: bare fittings lose heat as their bare surface at the bare pipe's heat flux (ASTM C1129 approach); flange and valve surfaces from %s", catalog.FlangeDimsSource)
			}
		case f.finish == FinishInsulated:
			if l.in.FittingsEquivLengthM == nil {
				w += q * float64(f.count) * f.lengthM
			}
		default: // a removable cover, as the line says
			if i < len(o.Fittings) && o.Fittings[i].HeatW != nil {
				w += *o.Fittings[i].HeatW
			}
		}
	}
	if s := o.Supports; s != nil && s.HeatW != nil {
		w += *s.HeatW
	}
	return w
}

// asFoundEconomics prices the line as found on its basis, for the economics table's
// as-found row: no installed cost or payback (it is there already), savings against bare.
func (a *analyser) asFoundEconomics(basis calc.EconBasis, qBare float64, bareRow calc.EconRow, bare calc.Result) (*EconomicsRow, error) {
	l := a.l
	if l.existing == nil {
		return nil, nil
	}
	found, err := a.solve(asFound, l.opC, l.econ.air)
	if err != nil {
		return nil, fmt.Errorf("as found: %w", err)
	}
	q, flux := a.asFoundMix(found, bare)
	if l.shape.IsFlat() {
		q = flux
	}
	rows, _, err := calc.Economics(basis, qBare, []calc.EconCandidate{{ThicknessMM: 0, HeatFlowPerM: q}})
	if err != nil {
		return nil, fmt.Errorf("economics as found: %w", err)
	}
	row := a.econRow(rows[0], bareRow, found.SurfaceC, false)
	row.AsFound = true
	row.ThicknessMM = 0
	for _, ly := range l.in.Existing.Layers {
		row.ThicknessMM += orDefault(ly.ThicknessMM, 0)
	}
	return &row, nil
}
