package analysis

import (
	"fmt"
	"math"

	"lagwright/calc"
	"lagwright/catalog"
)

// FittingLengths are the equivalent insulated lengths of one fitting of each kind at
// this line, metres of run; nil takes the built-in table at the line's size. Stored
// lines get them from the project's tables.
type FittingLengths struct {
	Elbows      *float64 `json:"elbows,omitempty"`
	Tees        *float64 `json:"tees,omitempty"`
	Valves      *float64 `json:"valves,omitempty"`
	FlangePairs *float64 `json:"flange_pairs,omitempty"`
	Caps        *float64 `json:"caps,omitempty"`
	Strainers   *float64 `json:"strainers,omitempty"`
	Reducers    *float64 `json:"reducers,omitempty"`
}

func (f *FittingLengths) at(kind string) **float64 {
	switch kind {
	case "elbows":
		return &f.Elbows
	case "tees":
		return &f.Tees
	case "valves":
		return &f.Valves
	case "flange_pairs":
		return &f.FlangePairs
	case "caps":
		return &f.Caps
	case "strainers":
		return &f.Strainers
	case "reducers":
		return &f.Reducers
	}
	return nil
}

// FittingFinish is how each fitting kind is finished: "insulated" (as the line, the
// default), "cover" (a removable cover) or "bare".
type FittingFinish struct {
	Elbows      string `json:"elbows,omitempty"`
	Tees        string `json:"tees,omitempty"`
	Valves      string `json:"valves,omitempty"`
	FlangePairs string `json:"flange_pairs,omitempty"`
	Caps        string `json:"caps,omitempty"`
	Strainers   string `json:"strainers,omitempty"`
	Reducers    string `json:"reducers,omitempty"`
}

// Of gives the finish of a kind ("" reads as insulated).
func (f FittingFinish) Of(kind string) string {
	if p := f.Field(kind); p != nil && *p != "" {
		return *p
	}
	return FinishInsulated
}

// Set sets the finish of a kind.
func (f *FittingFinish) Set(kind, finish string) {
	if p := f.Field(kind); p != nil {
		*p = finish
	}
}

// Field is the finish field of a kind, for forms and import columns that fill it
// (nil for an unknown kind).
func (f *FittingFinish) Field(kind string) *string {
	switch kind {
	case "elbows":
		return &f.Elbows
	case "tees":
		return &f.Tees
	case "valves":
		return &f.Valves
	case "flange_pairs":
		return &f.FlangePairs
	case "caps":
		return &f.Caps
	case "strainers":
		return &f.Strainers
	case "reducers":
		return &f.Reducers
	}
	return nil
}

// Fitting finishes.
const (
	FinishInsulated = "insulated"
	FinishCover     = "cover"
	FinishBare      = "bare"
)

// FittingCover is the build-up of removable covers: one layer of the line's outer
// material at ThicknessMM (nil: the line's own build-up) under Jacket (""; the line's).
type FittingCover struct {
	ThicknessMM *float64 `json:"thickness_mm,omitempty"`
	Jacket      string   `json:"jacket,omitempty"`
}

// Supports are the run's pipe supports.
type Supports struct {
	SpacingM *float64 `json:"spacing_m,omitempty"` // default: the table by size
	Kind     string   `json:"kind,omitempty"`      // "insert" | "clamp"; default insert on cold lines, clamp otherwise
	WPerK    *float64 `json:"w_per_k,omitempty"`   // point heat-transfer value of one support, W/K; default from its basis
}

// Support kinds.
const (
	SupportInsert = "insert"
	SupportClamp  = "clamp"
)

// FittingOut is one fitting kind on the line and its heat.
type FittingOut struct {
	Kind         string   `json:"kind"`
	Count        int      `json:"count"`
	Finish       string   `json:"finish"`
	EquivLengthM float64  `json:"equiv_length_m"`         // each: metres of run
	BareAreaM2   *float64 `json:"bare_area_m2,omitempty"` // each: bare fittings
	HeatW        *float64 `json:"heat_w"`                 // all of them; null without length_m or with the override
}

// SupportsOut is the run's supports and their heat.
type SupportsOut struct {
	Count                    int      `json:"count"`
	SpacingM                 float64  `json:"spacing_m"`
	Kind                     string   `json:"kind"`
	WPerK                    *float64 `json:"w_per_k"`     // each; null where heat is not modelled (warm lines)
	HeatEachW                *float64 `json:"heat_each_w"` // each
	HeatW                    *float64 `json:"heat_w"`      // all of them
	ClampSurfaceTempC        *float64 `json:"clamp_surface_temp_c"`
	ClampCondensationMarginK *float64 `json:"clamp_condensation_margin_k"`
}

// fittingKind is one resolved fitting kind of the line.
type fittingKind struct {
	kind      string
	count     int
	finish    string
	lengthM   float64 // each
	bareAreaM float64 // each, m²
}

// resolveFittings validates fittings, finishes, cover and supports, and sets the
// equivalent length of the run.
func resolveFittings(l *line, r Resolver, c *errs) {
	in := l.in
	given := in.Fittings != nil || in.FittingFinish != nil || in.FittingLengthsM != nil || in.FittingCover != nil
	if l.shape.IsFlat() {
		if given {
			c.add("fittings", "applies to pipes and ducts")
		}
		if in.Supports != nil {
			c.add("supports", "applies to pipes")
		}
		return
	}
	if in.Supports != nil && !l.shape.IsPipe() {
		c.add("supports", "applies to pipes")
	}
	var counts Fittings
	if in.Fittings != nil {
		counts = *in.Fittings
	}
	var finish FittingFinish
	if in.FittingFinish != nil {
		finish = *in.FittingFinish
	}
	var lengths FittingLengths
	if in.FittingLengthsM != nil {
		lengths = *in.FittingLengthsM
	}
	nominal := l.fittingNominalIn()
	for _, kind := range catalog.FittingKinds {
		n := counts.Count(kind)
		if n < 0 || n > 10000 {
			c.add("fittings."+kind, "must be between 0 and 10000")
		}
		f := finish.Of(kind)
		switch f {
		case FinishInsulated, FinishCover, FinishBare:
		default:
			c.add("fitting_finish."+kind, `must be "insulated", "cover" or "bare"`)
		}
		lp := *lengths.at(kind)
		rangeCheck(c, "fitting_lengths_m."+kind, lp, 0, 50, "m")
		if n <= 0 {
			continue
		}
		each, _ := catalog.FittingEquivLengthM(kind, nominal)
		if lp != nil {
			each = *lp
		}
		fk := fittingKind{kind: kind, count: n, finish: f, lengthM: each}
		if f == FinishBare {
			fk.bareAreaM = l.bareFittingArea(kind, nominal, each)
		}
		l.fittings = append(l.fittings, fk)
		if f == FinishCover {
			l.anyCover = true
		}
	}
	if counts.Any() && in.LengthM == nil {
		c.add("fittings", "needs length_m")
	}
	if in.FittingCover != nil {
		positiveCheck(c, "fitting_cover.thickness_mm", in.FittingCover.ThicknessMM, maxThicknessMM, "mm")
		if in.FittingCover.Jacket != "" {
			j, ok := r.Jacket(in.FittingCover.Jacket)
			if !ok {
				c.add("fitting_cover.jacket", "unknown jacket %q", in.FittingCover.Jacket)
			} else {
				l.coverJacket = &j
			}
		}
		if in.FittingCover.ThicknessMM != nil && len(in.Layers) == 0 {
			c.add("fitting_cover.thickness_mm", "a cover takes the line's outer material: give the line's layers")
		}
	}
	if l.anyCover && len(in.Layers) == 0 && (in.FittingCover == nil || in.FittingCover.ThicknessMM == nil) {
		c.add("fitting_finish", "a removable cover on a bare line needs the line's layers and fitting_cover.thickness_mm")
	}
	if len(l.fittings) > 0 && in.FittingsEquivLengthM == nil {
		src := "the built-in table"
		if in.FittingLengthsM != nil {
			src = "the project's fitting table"
		}
		l.assume("fitting allowances by size from %s at nominal %s in; %s", src, fmtRound(nominal, 3), catalog.FittingLengthBasis)
	}
	if in.FittingsEquivLengthM != nil && len(l.fittings) > 0 {
		l.assume("fittings_equiv_length_m given: it replaces the table's equivalent length of the insulated fittings")
	}
	if in.LengthM != nil {
		l.equivLengthM = l.lengthM
		if in.FittingsEquivLengthM != nil {
			l.equivLengthM += *in.FittingsEquivLengthM
		} else {
			for _, f := range l.fittings {
				if f.finish == FinishInsulated {
					l.equivLengthM += float64(f.count) * f.lengthM
				}
			}
		}
	}
	resolveSupports(l, nominal, c)
}

// fittingNominalIn is the nominal size the fitting tables are read at: the pipe's, the
// largest steel size at or below a plain OD, or for a duct the round size of the same
// perimeter (our choice), never below ½.
func (l *line) fittingNominalIn() float64 {
	n := l.nominalIn
	if l.shape == calc.Duct {
		n = 2 * (l.base.DuctWidth + l.base.DuctHeight) / math.Pi * 1000 / catalog.MMPerInch
	}
	return math.Max(n, 0.5)
}

// bareFittingArea is the bare outer surface of one fitting, m² (ASTM C1129 approach:
// the bare fitting loses heat as its bare area at the bare pipe's flux). Flange pairs,
// valves and strainers take their area from class 150 flange and valve dimensions;
// other kinds are bare pipe over their equivalent length.
func (l *line) bareFittingArea(kind string, nominal, lengthM float64) float64 {
	od := l.base.PipeOD
	if l.shape == calc.Duct {
		return 2 * (l.base.DuctWidth + l.base.DuctHeight) * lengthM
	}
	d := catalog.FlangeAt(nominal)
	df, t := math.Max(d.FlangeODmm/1000, od), d.ThickMM/1000
	switch kind {
	case "flange_pairs":
		return calc.FlangePairBareArea(od, df, t)
	case "valves", "strainers":
		return calc.ValveBareArea(od, df, t, d.ValveFaceToFaceMM/1000)
	}
	return math.Pi * od * lengthM
}

func resolveSupports(l *line, nominal float64, c *errs) {
	in := l.in
	s := Supports{}
	if in.Supports != nil {
		s = *in.Supports
	}
	positiveCheck(c, "supports.spacing_m", s.SpacingM, 100, "m")
	if s.SpacingM != nil && *s.SpacingM < 0.3 {
		c.add("supports.spacing_m", "must be at least 0.3 m")
	}
	rangeCheck(c, "supports.w_per_k", s.WPerK, 0, 100, "W/K")
	switch s.Kind {
	case "", SupportInsert, SupportClamp:
	default:
		c.add("supports.kind", `must be "insert" or "clamp"`)
	}
	if !l.shape.IsPipe() || l.lengthM == 0 {
		return
	}
	sp := l.supportSpacingM(nominal, s.SpacingM)
	if s.SpacingM == nil {
		src := catalog.SupportSpacingSteel
		if l.pipe != nil && l.pipe.Kind == catalog.Copper {
			src = catalog.SupportSpacingCopper
		}
		l.assume("support spacing %s m at nominal %s in (built-in table: %s; editable per project)", fmtRound(sp, 2), fmtRound(nominal, 3), src)
	}
	l.supports = &s
	l.supportSpacing = sp
}

func (l *line) supportSpacingM(nominal float64, given *float64) float64 {
	if given != nil {
		return *given
	}
	return catalog.SupportSpacingM(nominal, l.pipe != nil && l.pipe.Kind == catalog.Copper)
}

// fittingsAndSupports prices every fitting kind and the supports in heat, and gives
// the run's total heat flow (heat_flow_w).
func (a *analyser) fittingsAndSupports(main, bare calc.Result) error {
	l, o := a.l, a.out
	if l.shape.IsFlat() {
		return nil
	}
	hasRun := l.lengthM > 0
	q := main.HeatFlowPerM
	var cover *calc.Result
	if l.anyCover {
		r, err := calc.Solve(l.coverSystem(), l.opC, l.design.air)
		if err != nil {
			return fmt.Errorf("removable covers: %w", err)
		}
		cover = &r
		l.assume("removable covers solved as insulation of the cover's thickness over the fitting's equivalent length (ASTM C1129 treats covers as homogeneous insulation)")
	}
	var extraW float64 // heat outside q × equivalent length: covers, bare fittings, supports
	bareNoted := false
	for _, f := range l.fittings {
		fo := FittingOut{Kind: f.kind, Count: f.count, Finish: f.finish, EquivLengthM: round(f.lengthM, 3)}
		var w float64
		switch f.finish {
		case FinishInsulated:
			w = q * float64(f.count) * f.lengthM
		case FinishCover:
			w = cover.HeatFlowPerM * float64(f.count) * f.lengthM
			extraW += w
		case FinishBare:
			fo.BareAreaM2 = a.num(round(f.bareAreaM, 4))
			w = bare.HeatFlux * float64(f.count) * f.bareAreaM
			extraW += w
			if !bareNoted {
				bareNoted = true
				l.assume("bare fittings lose heat as their bare surface at the bare pipe's heat flux (ASTM C1129 approach); flange and valve surfaces from %s; other kinds as bare pipe over their equivalent length", catalog.FlangeDimsSource)
			}
		}
		if hasRun && !(f.finish == FinishInsulated && l.in.FittingsEquivLengthM != nil) {
			fo.HeatW = a.num(round(w, 2))
		}
		o.Fittings = append(o.Fittings, fo)
	}
	if hasRun {
		o.FittingsHeatW = map[string]float64{}
		for _, f := range o.Fittings {
			if f.HeatW != nil {
				o.FittingsHeatW[f.Kind] = *f.HeatW
			}
		}
		if eq := l.in.FittingsEquivLengthM; eq != nil {
			o.FittingsHeatW["fittings_equiv_length"] = round(q**eq, 2)
		}
		o.StraightRunHeatW = a.num(round(q*l.lengthM, 2))
	}
	if l.supports != nil {
		w, err := a.supports(main, bare)
		if err != nil {
			return err
		}
		extraW += w
	}
	if hasRun {
		o.HeatFlowW = a.num(round(q*l.equivLengthM+extraW, 2))
		l.runHeatW = q*l.equivLengthM + extraW
	}
	return nil
}

// coverSystem is the removable covers' system: the line's build-up, or one layer of
// the line's outer material at the cover's thickness, under the cover's jacket.
func (l *line) coverSystem() calc.System {
	s := l.base
	if ct := l.in.FittingCover; ct != nil && ct.ThicknessMM != nil && len(l.base.Layers) > 0 {
		outer := l.base.Layers[len(l.base.Layers)-1]
		outer.Thickness = *ct.ThicknessMM / 1000
		s.Layers = []calc.Layer{outer}
	}
	if l.coverJacket != nil && (l.in.SurfaceEmittance == nil || l.in.FittingCover.Jacket != "") {
		s.Emittance = l.coverJacket.Emittance
	}
	return s
}

// supports fills the supports' answer and returns their heat, W (0 on warm lines: the
// issue's count-only rule, stated in the assumptions).
func (a *analyser) supports(main, bare calc.Result) (float64, error) {
	l, o := a.l, a.out
	s := l.supports
	cold := l.opC < l.design.air.TempC
	kind := s.Kind
	if kind == "" {
		kind = SupportClamp
		if cold {
			kind = SupportInsert
		}
		if cold {
			l.assume("supports: load-bearing insert with shield (default for a line below the ambient)")
		} else {
			l.assume("supports: clamp on the pipe (default for a line at or above the ambient)")
		}
	}
	n := int(math.Ceil(l.lengthM/l.supportSpacing - 1e-9))
	so := &SupportsOut{Count: n, SpacingM: round(l.supportSpacing, 3), Kind: kind}
	o.Supports = so
	l.assume("one support per span: %d over %s m at %s m spacing", n, fmtRound(l.lengthM, 2), fmtRound(l.supportSpacing, 2))
	if !cold {
		l.assume("supports on a line at or above the ambient are counted for the bid; their heat is not modelled")
		return 0, nil
	}
	dT := l.opC - l.design.air.TempC // negative: heat is gained
	nominal := l.fittingNominalIn()
	var chi float64 // W/K per support
	switch {
	case s.WPerK != nil:
		chi = *s.WPerK
		l.assume("support heat-transfer value %s W/K each, given", fmtNum(chi))
	case kind == SupportClamp:
		h := bare.HConv + bare.HRad
		d := catalog.SupportRodDiameterMM(nominal) / 1000
		chi = calc.InfiniteFinConductance(h, math.Pi*d, catalog.SupportRodKWmK, math.Pi*d*d/4)
		l.assume("bare clamp: the hanger rod (%s mm steel, MSS SP-58 size from memory) as an infinite fin at the pipe temperature with the bare surface coefficient %s W/m²·K (fin equation, Incropera & DeWitt ch. 3)",
			fmtRound(d*1000, 1), fmtRound(h, 2))
	case len(l.base.Layers) > 0:
		sys := l.base
		total := 0.0
		for _, ly := range l.base.Layers {
			total += ly.Thickness
		}
		sys.Layers = []calc.Layer{{Name: "support insert", Thickness: total, K: calc.KCurve{{MeanC: 24, K: catalog.InsertKWmK}}}}
		ins, err := calc.Solve(sys, l.opC, l.design.air)
		if err != nil {
			return 0, fmt.Errorf("support insert: %w", err)
		}
		lenM := catalog.SupportInsertLengthM(nominal)
		if dT != 0 {
			chi = math.Max(0, (ins.HeatFlowPerM-main.HeatFlowPerM)*lenM/dT)
		}
		l.assume("support insert: %s m of high-density insert (k %s W/m·K, from memory) in place of the insulation; the extra heat over that length is the support's", fmtRound(lenM, 3), fmtNum(catalog.InsertKWmK))
	}
	each := chi * dT
	so.WPerK = a.num(round(chi, 5))
	so.HeatEachW = a.num(round(each, 3))
	so.HeatW = a.num(round(each*float64(n), 2))
	// A bare clamp sits at about the pipe temperature (conservative).
	so.ClampSurfaceTempC = a.num(round(l.opC, 3))
	if a.out.DewPointC != nil {
		m := l.opC - *a.out.DewPointC
		so.ClampCondensationMarginK = a.num(round(m, 3))
		if kind == SupportClamp && m < l.crit.dewMarginK {
			l.warn("bare support clamps at about %s °C sit below the %s (%s °C): they will sweat or frost and wet the insulation — use load-bearing inserts with shields and seal the vapour retarder over them",
				fmtRound(l.opC, 1), a.out.DewPointKind, fmtRound(*a.out.DewPointC, 1))
		}
	}
	return each * float64(n), nil
}

func catalogFittingKinds() []string { return catalog.FittingKinds }
