package assess

// Input types: they mirror the JSON of an assessment request exactly. Field
// names carry their unit; lengths are mm, stresses MPa, temperatures °C, times
// min, moments kN·m (per metre width for slabs), forces kN.

// Member kinds.
const (
	KindBeam = "beam"
	KindSlab = "slab"
)

// Steel classes of reinforcement and tendons.
const (
	SteelHotRolled        = "hot-rolled"
	SteelQuenchedTempered = "quenched-tempered"
	SteelColdWorked       = "cold-worked"
	SteelPrestressing     = "prestressing"
)

// Fire curve names accepted in Fire.Curve.
const (
	CurveISO834      = "iso834"
	CurveASTME119    = "astm-e119"
	CurveHydrocarbon = "hydrocarbon"
	CurveParametric  = "parametric"
	CurveTabulated   = "tabulated"
)

// Residual material model names (Options.ConcreteModel, Options.SteelModel).
const (
	ConcreteEN1994AnnexC = "en1994-annex-c"
	ConcreteChang2006    = "chang-2006"
	SteelResidualByClass = "residual-by-class"
	SteelHotStrength     = "hot-strength"
)

// Fit families (Options.Fit.Family).
const (
	// FitStandard is family A: the ISO 834 standard fire for t minutes, then
	// cooled at the EN 1991-1-2 Annex A rate; t is fitted in 10–360 min.
	FitStandard = "standard"
	// FitParametric is family B: the EN 1991-1-2 Annex A parametric fire with
	// the given opening factor and b; the fire-load density is fitted in 50–1000 MJ/m².
	FitParametric = "parametric"
)

// Input is one assessment request: the member, what is known of the fire
// and/or the site evidence, the demand and the options. Fire and Evidence
// may both be nil (the member is then assessed undamaged).
type Input struct {
	Member   Member    `json:"member"`
	Fire     *Fire     `json:"fire,omitempty"`
	Evidence *Evidence `json:"evidence,omitempty"`
	Demand   Demand    `json:"demand"`
	Options  Options   `json:"options"`
}

// Member is the cross-section of a beam (rectangular or T with the flange on
// top) or a one-way slab strip, with its concrete, reinforcement and the faces
// the fire reached.
type Member struct {
	Kind  string `json:"kind"`  // "beam" | "slab"
	Label string `json:"label"` // free text, at most 200 characters
	// WidthMM is the web width of a beam, or the analysed width of a slab
	// (default 1000 mm; slab results are reported per metre width).
	WidthMM float64 `json:"width_mm"`
	// DepthMM is the overall depth, flange included.
	DepthMM float64 `json:"depth_mm"`
	// FlangeWidthMM and FlangeDepthMM describe a T-beam's top flange (both 0 = rectangle).
	FlangeWidthMM float64  `json:"flange_width_mm"`
	FlangeDepthMM float64  `json:"flange_depth_mm"`
	Concrete      Concrete `json:"concrete"`
	// Layers place bars evenly along a face; Bars place them one by one. Both may be given.
	Layers []Layer `json:"layers,omitempty"`
	// LinkDiaMM is the diameter of the links (stirrups) of a beam; covers are
	// then to the link surface, so bars sit LinkDiaMM further in (0 = no links).
	LinkDiaMM float64 `json:"link_dia_mm"`
	Bars      []Bar   `json:"bars,omitempty"`
	// Exposed lists the faces the fire reached: "bottom", "left", "right",
	// "top" (a slab: "bottom" and/or "top"). Missing or null: beam
	// bottom+left+right, slab bottom; an empty list: no face was exposed.
	Exposed []string `json:"exposed"`
}

// Concrete is the member's concrete.
type Concrete struct {
	FckMPa       float64  `json:"fck_mpa"`                // characteristic cylinder strength, 12–90 MPa
	Aggregate    string   `json:"aggregate"`              // "siliceous" (default) | "calcareous" | "lightweight"
	MoisturePct  *float64 `json:"moisture_pct,omitempty"` // free moisture, % by weight, 0–4 (absent = 1.5, the EN 1992-1-2 Annex A value)
	Conductivity string   `json:"conductivity,omitempty"` // EN 1992-1-2 §3.3.3 limit: "lower" (default) | "upper"
}

// Layer is a row of bars along the bottom or top face. Beams give Count
// bars spread evenly between the side covers; slabs give SpacingMM.
type Layer struct {
	Face      string  `json:"face"`     // "bottom" | "top"
	CoverMM   float64 `json:"cover_mm"` // to the bar surface (plus link_dia_mm where links are given), also the side cover
	Count     int     `json:"count,omitempty"`
	SpacingMM float64 `json:"spacing_mm,omitempty"`
	DiaMM     float64 `json:"dia_mm"`
	Steel     string  `json:"steel"`   // default "hot-rolled"
	FykMPa    float64 `json:"fyk_mpa"` // characteristic yield (0.1 % proof for prestressing)
	// PrestressMPa is the effective prestress after losses (prestressing steel only, 0 = passive).
	PrestressMPa float64 `json:"prestress_mpa,omitempty"`
	// AreaMM2 is the nominal cross-section area of one bar, wire or strand, mm²
	// (0 = π·dia_mm²/4, a solid bar or wire; a seven-wire strand's nominal area
	// is about 0.75 of the circle of its nominal diameter, EN 10138-3).
	AreaMM2 float64 `json:"area_mm2,omitempty"`
}

// Bar is one bar placed by its centre, from the section's bottom-left corner.
type Bar struct {
	XMM          float64 `json:"x_mm"`
	YMM          float64 `json:"y_mm"`
	DiaMM        float64 `json:"dia_mm"`
	Steel        string  `json:"steel"`
	FykMPa       float64 `json:"fyk_mpa"`
	PrestressMPa float64 `json:"prestress_mpa,omitempty"`
	// AreaMM2 is the nominal cross-section area, mm² (0 = π·dia_mm²/4; see Layer.AreaMM2).
	AreaMM2 float64 `json:"area_mm2,omitempty"`
}

// Fire is the fire scenario: a nominal curve cut at DurationMin and cooled,
// a parametric fire, or a tabulated gas-temperature history.
type Fire struct {
	Curve string `json:"curve"`
	// DurationMin ends the heating of a nominal curve (required for iso834,
	// astm-e119, hydrocarbon; optional cut of a tabulated curve; not used with parametric).
	DurationMin float64 `json:"duration_min,omitempty"`
	// CoolingRateCPerMin is the linear cooling rate after DurationMin (0 = EN 1991-1-2 Annex A rate).
	CoolingRateCPerMin float64            `json:"cooling_rate_c_per_min,omitempty"`
	Parametric         *ParametricFire    `json:"parametric,omitempty"`
	Points             [][2]float64       `json:"points,omitempty"` // [min, °C]
	Spalling           []ProgressiveSpall `json:"spalling,omitempty"`
}

// ParametricFire holds the EN 1991-1-2 Annex A inputs.
type ParametricFire struct {
	OpeningFactorM05 float64 `json:"opening_factor_m05"` // O, m^0.5, 0.02–0.20
	BJM2S05K         float64 `json:"b_j_m2s05k"`         // b, J/m²s^0.5K, 100–2200
	FireLoadMJM2     float64 `json:"fire_load_mj_m2"`    // q_t,d per total enclosure area, 50–1000
	Growth           string  `json:"growth,omitempty"`   // "slow" | "medium" (default) | "fast"
}

// ProgressiveSpall removes concrete from a face during the fire.
type ProgressiveSpall struct {
	Face         string  `json:"face"`
	StartMin     float64 `json:"start_min"`
	RateMMPerMin float64 `json:"rate_mm_per_min"`
	MaxDepthMM   float64 `json:"max_depth_mm"`
}

// Evidence is what was measured on site after the fire.
type Evidence struct {
	ColourDepths []ColourDepth   `json:"colour_depths,omitempty"`
	Spalling     []MeasuredSpall `json:"spalling,omitempty"`
	// ExposedBars has one entry per member.layers entry, in order: true where
	// the assessor saw bars of that layer exposed on site (absent or empty: none
	// reported). The layer's bars then count as exposed for the damage class and
	// the bond caution even where no measured spalling reaches them.
	ExposedBars []bool `json:"exposed_bars,omitempty"`
	Notes       string `json:"notes,omitempty"`
}

// ColourDepth is a measured depth, from the (current) face, of the boundary
// of a colour zone taken as the isotherm IsothermC of the peak temperature.
type ColourDepth struct {
	Face      string  `json:"face"`
	IsothermC float64 `json:"isotherm_c"` // default 300 (pink onset)
	DepthMM   float64 `json:"depth_mm"`
	SdMM      float64 `json:"sd_mm"` // standard deviation of the reading, default 5
}

// MeasuredSpall is concrete found spalled after the fire, removed before the
// thermal run. FromMM/ToMM limit it to part of the face (measured along the
// face from the section's left for bottom/top, from its bottom for left/right;
// both 0 = the whole face).
type MeasuredSpall struct {
	Face    string  `json:"face"`
	DepthMM float64 `json:"depth_mm"`
	FromMM  float64 `json:"from_mm,omitempty"`
	ToMM    float64 `json:"to_mm,omitempty"`
}

// Demand is the action effect the member must carry after the fire
// (the user's design value), kN·m (per metre for slabs) and kN.
type Demand struct {
	SaggingKNm float64 `json:"sagging_knm"`
	HoggingKNm float64 `json:"hogging_knm"`
	AxialKN    float64 `json:"axial_kn"` // compression positive (per metre for slabs)
}

// Options are the analysis choices; zero values take the documented defaults.
type Options struct {
	CellMM        float64     `json:"cell_mm"`        // thermal cell = concrete fibre size, 1–25 mm (default 5)
	ConcreteModel string      `json:"concrete_model"` // "en1994-annex-c" (default) | "chang-2006"
	SteelModel    string      `json:"steel_model"`    // "residual-by-class" (default) | "hot-strength"
	GammaC        float64     `json:"gamma_c"`        // EN 1992-1-1 partial factor for concrete, 1.0–2.0 (default 1.5)
	GammaS        float64     `json:"gamma_s"`        // partial factor for steel, 1.0–1.5 (default 1.15)
	AlphaCC       float64     `json:"alpha_cc"`       // EN 1992-1-1 §3.1.6 α_cc, 0.8–1.0 (default 1.0)
	Fit           *FitOptions `json:"fit,omitempty"`
}

// FitOptions choose the family of fires the evidence is fitted with.
type FitOptions struct {
	Family           string  `json:"family"`                       // "standard" (default) | "parametric"
	OpeningFactorM05 float64 `json:"opening_factor_m05,omitempty"` // family parametric: O, 0.02–0.20
	BJM2S05K         float64 `json:"b_j_m2s05k,omitempty"`         // family parametric: b, 100–2200
	Growth           string  `json:"growth,omitempty"`             // family parametric: default "medium"
}
