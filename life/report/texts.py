"""The report's fixed texts: the models and their sources, their limits, the mean-stress rules' names, the
cautions, and the page's style sheet."""
from __future__ import annotations

METHODS = [
    ("Laminate", "classical laminate theory: Q, Q̄, ABD (Kaw, Mechanics of Composite Materials, 2nd ed., Eqs. 2.93, "
     "2.103, 4.28; Jones, 2nd ed., ch. 2 and 4); narrow beam: bending stiffness per width 1/d11 of the full ABD "
     "inverse; plate: cylindrical bending, w = w(x) (εy⁰ = κy = κxy = 0)"),
    ("Beam", "moments and deflections of Roark's Formulas for Stress and Strain, 7th ed., Table 8.1; load-point "
     "compliance by the unit-load method with Timoshenko shear deformation (shear stiffness from the energy of "
     "the equilibrium τxz with the plies' G13/G23: the 5/6 correction for a homogeneous section), integrated "
     "over taper and ply drops by Gauss–Legendre quadrature (error below round-off)"),
    ("Interlaminar shear", "τxz from equilibrium of the ply stresses, ∂τxz/∂z = −∂σx/∂x (Whitney 1987, ch. 6)"),
    ("Static strength", "first-ply failure by maximum stress, by Tsai-Wu with F12* = −1/2 (Tsai & Hahn 1980) and by "
     "maximum fibre strain; interlaminar shear against the interlaminar strength"),
    ("Counting", "reversals and rainflow per ASTM E1049-85 §5.4.4 (vectorised four-point rule, cycle for cycle equal to the rainflow package, which the tests use as the reference); the residue as half "
     "cycles, or, with residue = \"repeat\", the block closed on its largest reversal as one of a repeating duty"),
    ("Fatigue", "S-N or strain-life curves (power or log-linear), mean stress by Goodman, Gerber or a piecewise-linear "
     "constant-life diagram, Palmgren–Miner damage sum"),
    ("Energy", "U = ½·C·F² (Clapeyron); the energy of a cycle from its lowest-energy point to its highest"),
    ("Vibration spectra", "a PSD duty: spectral moments m_n = ∫fⁿG(f)df; rainflow ranges by Dirlik (1985; cycles at "
     "the peak rate √(m4/m2)) or narrow band (Bendat 1964, Rayleigh; at √(m2/m0)), binned on a geometric range "
     "grid (damage within 0.5 % for slopes 3…20); the static check at the expected largest peak of a block "
     "(Davenport 1964)"),
    ("Strain gauge", "a measured gauge strain becomes the load-point force through the inverse of the force → "
     "gauge strain map (ε = ε⁰ + zκ at the gauge's face, Kaw Eq. 4.16)"),
    ("Natural frequency", "first bending mode of the part alone (EI(x) and mass per length from the laminate, "
     "taper and drops) by Euler–Bernoulli Hermite elements, checked against Blevins' λ₁ for uniform beams"),
    ("Large deflection", "theory = \"large-deflection\": the inextensible elastica in arc length with small strains "
     "(each section keeps the laminate's linear moment–curvature law, EI varying with taper and ply drops), an end "
     "load of fixed direction perpendicular to the unloaded beam, shear flexibility as Reissner's beam "
     "(ZAMP 23, 1972); solved by Chebyshev collocation of its integral equations with Newton's method (Greengard "
     "1991) and tabulated against the drive until interpolated section loads are within 0.1 %; checked against "
     "Bisshopp & Drucker, Q. Appl. Math. 3 (1945); energy U = ∫F dδ"),
]

LIMITS = [
    "linear elastic, small deflection: trust the figures while the deflection stays below about 10 % of the span",
    "a beam's laminate is re-formed at every ply drop; stress concentrations at the drop itself are not modelled",
    "interlaminar shear assumes a locally prismatic section; free-edge stresses are not modelled",
    "Miner's rule ignores the order of loading; composites often fail below D = 1 under variable amplitude",
    "material values marked 'recalled' are typical values given from memory: replace them with tested data",
    "a vibration spectrum (PSD) duty: Dirlik's and the narrow-band range distributions assume a stationary Gaussian "
    "process; transients, clipped or skewed loads and changing conditions need a measured time history",
    "the analysis is quasi-static: the first bending frequency is that of the part alone (no carried mass, no "
    "fixture compliance); drive content above about a third of it is warned of, as the part's own vibration "
    "changes the stresses there",
]

THEORY_TEXT = {
    "linear": "linear elastic, small deflection (ASTM D790 / D6272 consistent); every local stress is the drive times "
              "a response per unit force, so the drive is counted once",
    "large-deflection": "large deflection (the elastica): inextensible, small strains, the section law linear, the end "
                        "load keeps its direction (cantilever: free end; guided: the end slides along the beam axis "
                        "and does not rotate); every local stress is a tabulated, monotonic function of the drive, "
                        "so the drive is counted once and each cycle's extremes are mapped through it",
}

LARGE_DEFLECTION_LIMIT = ("large deflection: small strains and an inextensible axis; the end load is a dead load of "
                          "fixed direction (a linkage whose force turns with the part loads it differently); the "
                          "section's own shape change (anticlastic curvature at large curvature) is not modelled")

RULE_NAMES = {
    "goodman": "Goodman (linear constant-life lines to Xt and Xc)",
    "gerber": "Gerber (parabolic constant-life lines to Xt and Xc)",
    "none": "none (amplitude alone, at the curve's own R)",
    "cld": "constant-life diagram (piecewise linear through the curves at several R)",
}

CAUTIONS = [
    "A flexing part that breaks releases its stored energy at once: guard people and parts from the fragments "
    "and the recoil, and size the guard for the peak stored energy given above.",
    "This is an estimate, not certification.",
    "Confirm the life by fatigue tests of prototypes (e.g. ASTM D7774 flexural fatigue, ISO 13003 fatigue by "
    "cyclic loading) under the real duty.",
    "Apply environmental knock-downs (moisture, temperature, UV, chemicals, creep) to the material data before "
    "relying on the figures.",
    "Local codes and licensed engineering practice decide whether the part may be used.",
]

CSS = """
:root { --ink: #24231f; --muted: #6b6457; --rule: #d8d2c4; --accent: #0b6e6e; --warm: #fbf3e4; }
body { font-family: system-ui, -apple-system, "Segoe UI", sans-serif; max-width: 980px; margin: 2em auto;
       padding: 0 1.2em; color: var(--ink); line-height: 1.45; font-size: 15px }
h1 { font-size: 1.6em; margin-bottom: 0.1em; color: var(--accent) }
.sub { color: var(--muted); margin-top: 0 }
h2 { border-bottom: 2px solid var(--accent); margin-top: 2em; padding-bottom: 0.15em; font-size: 1.3em }
h3 { margin-top: 1.4em; font-size: 1.08em } h4 { margin: 1em 0 0.2em }
.kind { color: var(--muted); font-weight: normal }
table { border-collapse: collapse; margin: 0.5em 0 0.8em; font-size: 0.93em }
td, th { border: 1px solid var(--rule); padding: 3px 8px; text-align: left; vertical-align: top }
th { background: #f1eee6 } table.kv td:first-child { color: var(--muted); white-space: nowrap }
table.small { font-size: 0.85em } td { overflow-wrap: break-word }
.glance { background: #e8f2f1; border-left: 5px solid var(--accent); padding: 0.6em 1em; margin: 1em 0 }
.verdict { padding: 0.6em 1em; margin: 1em 0; font-size: 1.05em } .verdict.meets { background: #e6f2e0; border-left: 5px solid #4c8a2e }
.verdict.short { background: #fbe7e2; border-left: 5px solid #b5482f }
.caution { background: var(--warm); border-left: 5px solid #c8861d; padding: 0.3em 1em }
.warn li { color: #7a3300 } .checks { list-style: none; padding-left: 0.5em }
figure { margin: 1.2em 0; break-inside: avoid; page-break-inside: avoid }
figure svg { max-width: 100%; height: auto; display: block }
figcaption { font-size: 0.9em; color: var(--muted); margin-top: 0.3em }
table.sign { width: 100% } table.sign td { height: 2.4em; width: 28% }
.comments { border: 1px solid var(--rule); height: 6em }
@media print {
  body { max-width: none; margin: 0; font-size: 10pt }
  h2 { break-after: avoid; page-break-after: avoid } h3, h4 { break-after: avoid; page-break-after: avoid }
  #results, #signoff { break-before: page; page-break-before: always }
  table, .caution, .glance { break-inside: avoid; page-break-inside: avoid }
  figure svg { max-height: 9.5in }
  @page { size: A4; margin: 15mm }
}
"""
