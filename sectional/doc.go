// Package sectional computes moment–curvature curves, bending capacities and
// axial capacities of reinforced-concrete fibre sections.
//
// The package knows nothing about fire. A section is a list of fibres, each
// with its own uniaxial material law, so a heated section (every fibre with
// its residual strength) and an undamaged one go through the same code. A
// fibre whose material is nil has been removed (spalled or destroyed) and
// carries nothing.
//
// # Conventions and units
//
// Lengths are mm, areas mm², stresses MPa, forces kN, moments kN·m and
// curvatures 1/m (rad per metre). Fibre positions are measured from the
// section's bottom-left corner: x to the right, y upwards.
//
// Strain and stress are positive in tension and negative in compression. The
// axial force Options.AxialKN is positive in compression (the usual sign of
// a column load), so the fibres must balance
//
//	Σ σ(εi)·Ai = -N
//
// Moments are returned as positive magnitudes in the analysed direction:
// sagging (bottom in tension) or hogging (top in tension). They are taken
// about the horizontal axis through the geometric centroid yc of the gross
// Section.Outline, the same axis for a damaged section and its undamaged
// original; with N = 0 the moment is a couple and the axis does not matter.
//
// # Assumptions
//
// Plane sections remain plane and bars are perfectly bonded (EN 1992-1-1
// §6.1(2)), so with the lever di = yc - yi for sagging and yi - yc for
// hogging
//
//	εi = ε0 + κ·di,   M = Σ σ(εi)·Ai·di
//
// where ε0 is the reference strain at the centroid height. Concrete has no
// tensile strength: the concrete laws of this package give zero stress for
// ε ≥ 0 (EN 1992-1-1 §6.1(2) ignores it; EN 1992-1-2 §3.2.2.2 allows
// neglecting it). Bending is uniaxial about the horizontal axis; x only
// serves the bar-in-outline check.
//
// # Material laws
//
//   - ParabolaRectangle: EN 1992-1-1 §3.1.7(1); EC2ParabolaRectangle sets
//     εc2, εcu2 and n from Table 3.1, including fck > 50 MPa. The default for
//     design checks. Crushing at εcu2.
//   - FireConcrete: EN 1992-1-2 §3.2.2.1 (range I and a linear descending
//     branch to εcu1,θ), for hot or residual parameters. Crushing at εcu1,θ.
//   - BilinearSteel: elastic–plastic with optional linear hardening to Fu at
//     EpsU (EN 1992-1-1 §3.2.7), symmetric. Rupture at EpsU.
//   - FireSteel: EN 1992-1-2 §3.2.3 (linear, elliptic, plateau, linear
//     decay), symmetric. Rupture at εsu,θ.
//
// Other laws may implement Material (and optionally Validator and Yielder).
//
// # Moment–curvature analysis
//
// The curvature is raised from zero in steps of the curvature strain κ·H,
// where H is the depth of the Outline. Steps start at Options.Step/8 (after
// the origin and after first yield), double while the curve is smooth up to
// max(Step, 5 % of κ·H), and halve (to Step/64) where the moment departs
// from the straight extrapolation of the last two points by more than 2 % of
// the peak. So steps are fine near the origin and first yield and coarse on
// the post-yield plateau. (With no concrete tension there is no cracking
// step: the section behaves as cracked from the first curvature.)
//
// At each curvature the reference strain ε0 is found by bracketed root
// finding: from a guess (the extrapolated previous solution) the bracket is
// widened by doubling steps until the force residual changes sign (error if
// none within |ε0| ≤ 10), then Brent's method narrows it until
//
//	|Σ σ·A + N| ≤ 1e-8·(|N| + Σ A·f_peak)   or the bracket is below 1e-13 in strain
//
// where Σ A·f_peak (each fibre's area times its law's largest compressive
// stress) bounds the squash load from above. Iteration caps return errors;
// nothing stops silently.
//
// The analysis stops at the first of
//
//   - a concrete fibre past its compression limit strain (crushing),
//   - a bar past its limit strain (rupture),
//   - the moment falling below Options.DropFraction (default 80 %) of its
//     peak, which ends softening curves (EN 1992-1-2 concrete, whose stress
//     falls to zero at εcu1,θ),
//   - κ·H reaching Options.MaxCurvatureStrain (default 1.0).
//
// A crossed limit, and the first yield of tension steel (strain fy/Es, or
// the proportional limit fsp,θ/Es,θ of the EN 1992-1-2 law), are located by
// regula falsi (Illinois) in the curvature to a relative width of 1e-9.
// Limits are checked at fibre centres, so a coarse grid reaches the crushing
// state slightly late (about 0.05 % per mm of cell where the concrete
// governs; see the mesh test). The capacity is the peak moment up to and
// including the limit state; an interior peak is refined by golden-section
// search. Curve.Mode says how the analysis ended, in words from
// Mode.String: tension steel yields then concrete crushes; concrete crushes
// with the tension steel elastic; bar rupture; moment drop.
//
// # Axial capacity and interaction
//
// AxialCapacity is the largest axial force of a uniform strain before the
// first fibre's limit strain. For parabola–rectangle concrete and bilinear
// steel in compression this is
//
//	N = Σ fc·Ac + Σ σs(-εcu2)·As
//
// (bars not deducted from the concrete unless the caller removes those
// fibres). EN 1992-1-1 §6.1(5) limits the strain to εc2 in pure
// compression; AxialForce(s, -εc2) gives that value. Interaction returns
// Capacity at axial forces evenly spaced between the tension capacity and
// the squash load.
//
// # Performance
//
// Fibres with equal materials at equal heights merge into one group (exact
// for bending about the horizontal axis), so a uniform grid costs one law
// evaluation per row. Groups are held as a struct of arrays sorted by lever;
// the force loop stops at the neutral axis because concrete below it carries
// nothing, and sections whose concrete uses one law of this package get a
// loop with that law inlined. An equilibrium solution allocates nothing.
//
// # References
//
//   - EN 1992-1-1:2004 §3.1.7 and Table 3.1 (concrete), §3.2.7 (steel),
//     §6.1 (bending with or without axial force).
//   - EN 1992-1-2:2004 §3.2.2 (concrete) and §3.2.3 with Table 3.2a (steel)
//     at elevated temperature.
//   - ACI 318-19 §22.2 (equivalent rectangular block), used in the tests.
//   - R. P. Brent, Algorithms for Minimization without Derivatives (1973),
//     ch. 4 (root finding).
package sectional
