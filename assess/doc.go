// Package assess is Residuum's domain engine: the post-fire residual bending
// capacity of one reinforced-concrete beam (rectangular or T with the flange
// on top) or one-way slab strip.
//
// An Input (decoded and validated by Decode, or checked by Input.Validate)
// describes the member, the fire scenario and/or the site evidence, the
// demand and the options. Run carries it through the workflow of DESIGN.md §3:
//
//  1. the member becomes a thermal shape on square cells (package thermal);
//     concrete fibres are exactly those cells, bars are separate fibres at
//     their centres;
//  2. the peak temperature field comes forward from the fire (heating and
//     cooling), or is fitted to measured colour-change depths by choosing the
//     fire severity of a one-parameter family (see fit.go), with the range of
//     severities within one standard deviation carried to a capacity range;
//  3. every fibre takes residual (after-cooling) properties from its peak
//     temperature: concrete by aggregate (EN 1994-1-2 Annex C rule by default,
//     Chang et al. 2006 as the alternative), steel by bar class (residual
//     factors by class by default, the EN 1992-1-2 hot strength as a
//     conservative alternative); spalled fibres carry nothing;
//  4. moment–curvature analyses (package sectional) of the residual and the
//     undamaged section in sagging and hogging give characteristic
//     capacities, and the same analyses with f/γ the design resistances;
//  5. the judgement: residual/undamaged ratios, utilisation, a damage class
//     of the five-class TR68-lineage scheme with its reasons, a recommended
//     action and the cautions (never empty).
//
// The Result marshals to deterministic JSON (the CLI's and the API's output)
// and prints a one-screen summary with WriteText. Units throughout: mm, °C,
// min, MPa, kN·m (per metre width for slabs), kN.
//
// The published sources of every model are cited beside it and listed in the
// result's method field; VERIFICATION.md lists the checks against published
// references. Results are screening estimates for qualified engineers.
package assess
