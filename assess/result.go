package assess

// Result is the outcome of one assessment, marshalled as the JSON that the
// CLI prints and the API returns. Units: mm, °C, min, MPa, kN·m (per metre
// width for slabs), curvature 1/m. The JSON is deterministic: every
// collection is a slice in a fixed order or a map with sorted keys.
type Result struct {
	MethodVersion string `json:"method_version"`
	InputSHA256   string `json:"input_sha256"`
	// Scenario says where the peak temperatures came from: "undamaged" (no
	// fire, no evidence), "fire" (forward from the fire), "fire+evidence"
	// (forward from the fire, checked against the evidence), "evidence"
	// (fitted from the evidence).
	Scenario string        `json:"scenario"`
	Member   MemberSummary `json:"member"`
	Fire     *FireSummary  `json:"fire"`
	// FireCurve samples the gas temperature the section was solved for, [min, °C].
	FireCurve [][2]float64  `json:"fire_curve"`
	Field     *FieldPlot    `json:"field"`
	Rebar     []RebarResult `json:"rebar"`
	// Isotherms gives, per exposed face, the depth (mm from the face along the
	// inward normal at mid-face) of the 300, 500 and 600 °C peak isotherms;
	// null where the face never reached that temperature.
	Isotherms map[string]map[string]*float64 `json:"isotherms"`
	Profiles  []Profile                      `json:"profiles"`
	Fit       *FitResult                     `json:"fit,omitempty"`
	Concrete  ConcreteSummary                `json:"concrete"`
	Capacity  Capacity                       `json:"capacity"`
	// MomentCurvature holds the characteristic moment–curvature curves.
	MomentCurvature MomentCurvatureSet `json:"moment_curvature"`
	Design          DesignBasis        `json:"design"`
	Damage          Damage             `json:"damage"`
	// Action is the recommended action code: "no-action", "clean-and-redecorate",
	// "reinstate-cover", "structural-repair", "major-repair", "strengthen", "replace-or-strengthen".
	Action     string   `json:"action"`
	ActionText string   `json:"action_text"`
	Cautions   []string `json:"cautions"`
	Method     []Method `json:"method"`
	Warnings   []string `json:"warnings"`
}

// MemberSummary repeats the member's identity and derived geometry.
type MemberSummary struct {
	Label   string  `json:"label"`
	Kind    string  `json:"kind"`
	Shape   string  `json:"shape"` // "rectangle", "T-beam", "slab strip"
	WidthMM float64 `json:"width_mm"`
	DepthMM float64 `json:"depth_mm"`
	// FlangeWidthMM and FlangeDepthMM describe a T-beam's flange (omitted otherwise).
	FlangeWidthMM float64  `json:"flange_width_mm,omitempty"`
	FlangeDepthMM float64  `json:"flange_depth_mm,omitempty"`
	PerMetre      bool     `json:"per_metre"` // moments are per metre width (slabs)
	Exposed       []string `json:"exposed"`
	Fibres        int      `json:"fibres"` // concrete fibres (thermal cells) + bars
}

// FireSummary describes the exposure used for the peak field.
type FireSummary struct {
	Name          string  `json:"name"`
	Source        string  `json:"source"` // "input" or "fitted"
	HeatingEndMin float64 `json:"heating_end_min"`
	EndMin        float64 `json:"end_min"` // end of the thermal run
	PeakGasC      float64 `json:"peak_gas_c"`
}

// FieldPlot is the peak temperature field for plotting. Cell (i, j) has
// index j*nx+i, i along x from the left, j along y from the bottom; its
// centre is at ((i+0.5)·cell_mm, (j+0.5)·cell_mm). peak_c is null outside the
// section and for removed (spalled) cells. For a slab nx = 1.
type FieldPlot struct {
	Nx      int        `json:"nx"`
	Ny      int        `json:"ny"`
	CellMM  float64    `json:"cell_mm"`
	WidthMM float64    `json:"width_mm"`
	DepthMM float64    `json:"depth_mm"`
	PeakC   []*float64 `json:"peak_c"`
}

// RebarResult is one steel fibre: a bar of a beam, or a slab layer's bars
// over the analysed width.
type RebarResult struct {
	Label          string  `json:"label"`
	XMM            float64 `json:"x_mm"`
	YMM            float64 `json:"y_mm"`
	DiaMM          float64 `json:"dia_mm"`
	AreaMM2        float64 `json:"area_mm2"`
	BarsPerMetre   float64 `json:"bars_per_m,omitempty"`
	Face           string  `json:"face"`
	CoverMM        float64 `json:"cover_mm"` // to the bar surface from its nearest face
	Steel          string  `json:"steel"`
	FykMPa         float64 `json:"fyk_mpa"`
	PeakC          float64 `json:"peak_c"`
	PeakTimeMin    float64 `json:"peak_time_min"`
	EndOfHeatingC  float64 `json:"end_of_heating_c"`
	ThresholdC     float64 `json:"threshold_c"` // permanent-loss threshold of the class
	AboveThreshold bool    `json:"above_threshold"`
	ResidualFactor float64 `json:"residual_factor"` // f_y,res / f_yk
	ResidualFyMPa  float64 `json:"residual_fy_mpa"`
	// ExposedBySpalling: the spalled surface reached the bar (bond lost).
	ExposedBySpalling bool `json:"exposed_by_spalling"`
	// ExposedOnSite: the assessor saw bars of this bar's layer exposed
	// (evidence.exposed_bars); omitted when false.
	ExposedOnSite bool `json:"exposed_on_site,omitempty"`
	// History is the bar-centre temperature, [min, °C].
	History [][2]float64 `json:"history"`
}

// Profile is the peak temperature against depth from one exposed face, along
// the inward normal at mid-face, [mm, °C].
type Profile struct {
	Face   string       `json:"face"`
	Points [][2]float64 `json:"points"`
}

// FitResult reports the fire severity fitted to the colour-change depths
// (scenario "evidence"), or how well a given fire agrees with them
// (scenario "fire+evidence", where the fit is also run for comparison).
type FitResult struct {
	Family string `json:"family"` // "standard" or "parametric"
	// Parameter is the fitted quantity: "duration_min" (family standard) or
	// "fire_load_mj_m2" (family parametric).
	Parameter    string   `json:"parameter"`
	DurationMin  *float64 `json:"duration_min,omitempty"`
	FireLoadMJM2 *float64 `json:"fire_load_mj_m2,omitempty"`
	// Range is the interval of the parameter consistent with the evidence
	// within one standard deviation (Δχ² ≤ 1), [low, high].
	Range   [2]float64 `json:"range"`
	Bounds  [2]float64 `json:"bounds"` // the parameter's allowed search range
	Matched bool       `json:"matched"`
	Message string     `json:"message"`
	ChiSq   float64    `json:"chi_sq"`
	// MisfitMM is computed − measured depth per observation at the best fit.
	MisfitMM     []float64     `json:"misfit_mm"`
	Observations []Observation `json:"observations"`
	// Agreement, for a given fire: "consistent", "marginal" or "inconsistent"
	// (|misfit| ≤ 1, ≤ 2, > 2 standard deviations for every observation).
	Agreement string `json:"agreement,omitempty"`
	// ScenarioValue is the given fire's value of the parameter, where it has one.
	ScenarioValue *float64 `json:"scenario_value,omitempty"`
	// Trials counts the thermal solutions of the member's own section;
	// StripSolutions the cheap 1-D solutions through the observed faces.
	Trials         int `json:"trials"`
	StripSolutions int `json:"strip_solutions"`
}

// Observation is one colour-change depth with its computed counterpart.
type Observation struct {
	Face       string  `json:"face"`
	IsothermC  float64 `json:"isotherm_c"`
	MeasuredMM float64 `json:"measured_mm"`
	SdMM       float64 `json:"sd_mm"`
	// ComputedMM is the computed depth of the isotherm (at the best fit, or
	// for the given fire); null if the face never reached the isotherm.
	ComputedMM *float64 `json:"computed_mm"`
	MisfitMM   float64  `json:"misfit_mm"`
	// ScenarioMM is the depth computed for the given fire (scenario "fire+evidence").
	ScenarioMM       *float64 `json:"scenario_mm,omitempty"`
	ScenarioMisfitMM *float64 `json:"scenario_misfit_mm,omitempty"`
}

// ConcreteSummary gives the residual concrete over the section.
type ConcreteSummary struct {
	FckMPa            float64 `json:"fck_mpa"`
	Aggregate         string  `json:"aggregate"`
	Model             string  `json:"model"`
	RemovedAreaPct    float64 `json:"removed_area_pct"`    // spalled
	Above300AreaPct   float64 `json:"above_300_area_pct"`  // of the remaining section
	Above500AreaPct   float64 `json:"above_500_area_pct"`  // of the remaining section
	MeanResidualRatio float64 `json:"mean_residual_ratio"` // area-weighted f_c,res/f_ck of the original section (removed = 0)
	MaxPeakC          float64 `json:"max_peak_c"`
}

// Capacity holds both directions.
type Capacity struct {
	Sagging Direction `json:"sagging"`
	Hogging Direction `json:"hogging"`
}

// Direction is the bending capacity in one direction, kN·m (per metre for slabs).
type Direction struct {
	UndamagedKNm float64 `json:"undamaged_knm"` // characteristic, undamaged section
	ResidualKNm  float64 `json:"residual_knm"`  // characteristic, residual section
	Ratio        float64 `json:"ratio"`         // residual / undamaged (0 if undamaged is 0)
	// ResidualRangeKNm carries the fitted severity range through (evidence
	// fits); otherwise [residual, residual].
	ResidualRangeKNm   [2]float64 `json:"residual_range_knm"`
	UndamagedDesignKNm float64    `json:"undamaged_design_knm"` // with f/γ (Design)
	ResidualDesignKNm  float64    `json:"residual_design_knm"`
	DemandKNm          float64    `json:"demand_knm"`
	// Utilisation is demand / residual design resistance (null if the design
	// resistance is zero and the demand is not; 0 without demand).
	Utilisation          *float64 `json:"utilisation"`
	UndamagedUtilisation *float64 `json:"undamaged_utilisation"`
	ModeUndamaged        string   `json:"mode_undamaged"`
	ModeResidual         string   `json:"mode_residual"`
	KappaAtPeakPerM      float64  `json:"kappa_at_peak_per_m"` // residual curve
}

// MomentCurvatureSet holds [κ 1/m, M kN·m] points per direction.
type MomentCurvatureSet struct {
	Sagging CurvePair `json:"sagging"`
	Hogging CurvePair `json:"hogging"`
}

// CurvePair is the undamaged and residual characteristic curve.
type CurvePair struct {
	Undamaged [][2]float64 `json:"undamaged"`
	Residual  [][2]float64 `json:"residual"`
}

// DesignBasis states the partial factors of the design resistances.
type DesignBasis struct {
	GammaC  float64 `json:"gamma_c"`
	GammaS  float64 `json:"gamma_s"`
	AlphaCC float64 `json:"alpha_cc"`
	Basis   string  `json:"basis"`
}

// Damage is the damage class and the reasons that placed the member there.
type Damage struct {
	Class   int      `json:"class"` // 0–4
	Label   string   `json:"label"`
	Scheme  string   `json:"scheme"`
	Reasons []Reason `json:"reasons"`
}

// Reason is one indicator of the damage class.
type Reason struct {
	Indicator string `json:"indicator"` // "spalling", "exposed-bars", "bar-temperature", "colour-depth", "capacity-ratio", "utilisation", "fire"
	Class     int    `json:"class"`     // the class this indicator alone implies
	Detail    string `json:"detail"`
	Source    string `json:"source"`
}

// Method names one model used, with its version or edition and source.
type Method struct {
	Step    string `json:"step"`
	Name    string `json:"name"`
	Version string `json:"version"`
	Source  string `json:"source"`
}
