// Package thermal computes transient temperature fields in fire-exposed
// reinforced-concrete slabs (1-D through the depth) and beams (2-D, rectangle
// or T with the flange on top), through heating AND cooling, and keeps the
// peak temperature of every cell for the post-fire residual assessment.
//
// # Units and conventions
//
// Lengths mm, temperatures °C, times min at the API (s inside the solver),
// conductivity W/mK, heat capacity J/m³K, convection W/m²K. Coordinates: x from
// the section's left edge (for a T-beam the left end of the flange), y from its
// bottom. Cell (i, j) has index j·Nx + i and its centre at ((i+0.5)·CellMM,
// (j+0.5)·CellMM). Every run starts at 20 °C. Bad input returns an error that
// names the field and the accepted range; nothing panics on user input.
//
// # Fire exposure
//
//   - ISO834: θ_g = 20 + 345·log₁₀(8t + 1), α_c = 25 (ISO 834-1; EN 1991-1-2:2002 §3.2.1).
//   - ASTME119: ASTM E119 Table X1.1 points, linear between them, α_c = 25.
//   - Hydrocarbon: θ_g = 1080·(1 − 0.325·e^(−0.167t) − 0.675·e^(−2.5t)) + 20, α_c = 50 (§3.2.3).
//   - NewParametric: EN 1991-1-2 Annex A, heating (A.1) with t* = Γ·t (Γ_lim, k for
//     fuel control), cooling (A.11), α_c = 35; validity O 0.02–0.20, b 100–2200,
//     q_t,d 50–1000, t_lim 25/20/15 min.
//   - NewCooled: a curve cut at t_h, then linear cooling at the Annex A rate for
//     t*_max = t_h/60 (Γ = 1), or a given rate.
//   - NewTabulated: [min, °C] points, α_c = 25 unless NewTabulatedConvection.
//   - EquivalentTime: EN 1991-1-2 Annex F.
//
// # Boundary conditions (EN 1991-1-2 §3.1)
//
// Fire-exposed faces receive
//
//	q = α_c(θ_g − θ_s) + ε_m·ε_f·σ[(θ_g + 273)⁴ − (θ_s + 273)⁴],  ε_m = 0.7, ε_f = 1
//
// (EN 1992-1-2 §2.2). Unexposed faces: α_c = 4 W/m²K plus radiation (ε_m = 0.7)
// to 20 °C, or 9 W/m²K lumped (Options.LumpedUnexposed). T-flange ends and the
// sides of a slab are adiabatic. The surface temperature θ_s is not a cell
// value: each boundary side solves q = (2λ/Δ)(θ_s − θ_c) for θ_s by Newton's
// method (warm-started, ≤ 3 iterations), so the half-cell conduction resistance
// is in series with the surface coefficient and coarse cells stay accurate.
//
// # Concrete properties (EN 1992-1-2:2004 §3.3; EN 1994-1-2:2005 §3.3.2)
//
// Conductivity lower (default) or upper limit; specific heat with the moisture
// peak c_p,peak = 900/1470/2020 J/kgK at u = 0/1.5/3 %, constant on 100–115 °C
// and linear to 1000 J/kgK at 200 °C, linear in u between the published values
// and extrapolated linearly (the 1.5–3 % slope) for 3 % < u ≤ 4 %; density
// falling as §3.3.2(3). Lightweight concrete uses EN 1994-1-2 §3.3.2
// (λ = 1 − θ/1600, c = 840 J/kgK, constant density; no moisture peak).
// Properties enter the solver as tables: λ(θ) at 1 °C, the enthalpy
//
//	H(θ) = ∫₀^θ ρ(θ')·c_p(θ') dθ'   (J/m³, Simpson on each 1 °C bin)
//
// and its inverse θ(H) on a uniform H grid of a quarter of the smallest
// ρc per step (θ and λ stored together per row, one lookup per cell).
//
// # Solver
//
// Cell-centred finite volumes on square cells (1–25 mm, ≤ 200 000 cells), with
// a mask for the T outline and for spalled cells. The unknown is the enthalpy,
// so the latent heat of the moisture peak is conserved whatever the step and
// nothing is stepped over. Two time integrators share the grid, properties,
// boundaries and bookkeeping:
//
// Explicit (beams, and slabs with cells of about 3 mm and more): forward Euler
//
//	H_i ← H_i + Δt/Δ²·[Σ_faces λ_f(θ_j − θ_i) + Σ_boundary Δ·q],  θ_i = θ(H_i),
//
// with λ_f the mean of the two cells' λ, and the largest step the scheme allows,
//
//	Δt = 0.95·min(ρc)·Δ² / max_i(Σ_faces λ_max + Σ_boundary 1/(1/(2λ_max) + 1/(h_max·Δ))),
//
// (h_max includes linearised radiation at 1700 °C), capped at 15 s. The
// coefficients stay positive, so the scheme is stable and monotone for every
// cell size 1–25 mm. Per step: three flat loops, no allocation.
//
// Implicit line solver (a slab whose explicit step would be under 5 s, i.e.
// cells under about 3 mm): backward Euler in enthalpy, one chord-Newton
// linearisation per step (H(θ) linearised at the start of the step, the
// surface flow linearised through its θ_s), one tridiagonal (Thomas) solve,
// then a conservative close H ← Hⁿ + Δt/Δ²·(flows at the solution), θ = θ(H).
// Δt = 20 s, 40 s from 30 min after the end of heating.
//
// Why this split. The explicit scheme is cheap per step, conservative to
// rounding and needs no iteration through the c_p peak; the tests show second
// order in space: with Δt ∝ Δ² the maximum error against the erfc solutions
// falls 4.0× per halving of the cell (observed order 2.00 for 4 → 2 → 1 mm,
// fixed-temperature and convective surfaces; 0.019 °C and 0.007 °C at 1 mm).
// A symmetric beam (left and right alike) is solved on its half with the
// centre line adiabatic; the 300 × 600 mm beam at 5 mm cells through full
// cooling then costs ≈ 80 ms. The explicit limit Δt ∝ Δ² makes fine 1-D
// meshes expensive (35 000 steps, ≈ 26 ms, for a 200 mm slab at 1 mm cells),
// hence the line solver there (≈ 900 steps, ≈ 5 ms). It is first order in time
// (observed 0.99; 0.6 °C at 20 s on the convective erfc problem) and its peak
// fields agree with the explicit scheme within 0.5 °C on EN slabs with the
// u = 3 % moisture peak. Both close the energy balance to ≈ 1e-7.
//
// # Run length
//
// With Options.EndMin = 0 the run stops, checked every 15 min, once the gas is
// within 1 °C of ambient after the end of heating and no cell's peak rose by
// 0.1 °C over the last 15 min; never beyond 72 h. A curve that never returns
// to ambient needs an EndMin.
//
// # Spalling
//
// Measured spalling (Shape.Spalled) removes, before the run, the cells whose
// centres lie within DepthMM of the original surface (optionally only along
// FromMM–ToMM of the face). Progressive spalling removes layer k (counted from
// the original surface) when d(t) = min(MaxDepthMM, rate·(t − StartMin)) reaches
// its centre (k + 0.5)·CellMM; the remaining temperatures are kept, the removed
// enthalpy is booked, and the face's boundary condition moves to the new
// surface, including the sides of a partial pocket. A probe whose cells have
// all gone takes the gas temperature.
//
// # Results
//
// Field.Peak and PeakTimeMin over the whole run, EndOfHeating, Final, probe
// histories (bilinear between active cell centres), PeakAt and IsothermDepth
// (through the peak surface temperature and the cell-centre peaks along the
// inward normal).
//
// # References
//
// EN 1991-1-2:2002 §3.1, §3.2, Annexes A, E, F; EN 1992-1-2:2004 §2.2, §3.3,
// Annex A, Table 5.8; EN 1994-1-2:2005 §3.3.2; ISO 834-1:1999; ASTM E119
// Table X1.1; Carslaw & Jaeger, Conduction of Heat in Solids (1959) §2.4–2.7,
// §3.4; Wickström, Fire Technology 22(2) (1986).
package thermal
