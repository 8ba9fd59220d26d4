"""Beams: supports, stations, width taper, ply drops, stiffness, and the ply response per unit drive.

A part is a straight beam of span L with one laminate per segment between ply drops. Each support is
reduced to the part of the beam that runs from its *root* to its load point or support:

=============  ================================  ==================================================
support        stations run                       bending moment per unit drive force, m(x)
=============  ================================  ==================================================
cantilever     clamp (x = 0) → end load (x = L)   m = L − x
three-point    mid-span (x = 0) → support (L/2)   m = (L/2 − x)/2
four-point     mid-span (x = 0) → support (L/2)   m = a/2 inside the loads, (L/2 − x)/2 outside,
                                                  a = (L − s)/2, s = load spacing; drive = total force
guided         clamp (x = 0) → guided end (L)     m = (L − x) − m₀, the guided end not rotating
=============  ================================  ==================================================

m > 0 puts the first ply (the bottom, z = −h/2) in tension. Three- and four-point beams are symmetric:
their stations cover one half and integrals over the span are twice those over the half; a width taper
and ply drops run from mid-span outward. The free overhang beyond the supports is not modelled.

Formulas: moments and deflections of Roark's Formulas for Stress and Strain, 7th ed. (Young & Budynas),
Table 8.1 cases 1a (cantilever, end load), 1e (simply supported, centre load) and 1e superposed (two
symmetric loads), 2a (fixed-guided); the load-point compliance by the unit-load method (virtual work)
with Timoshenko shear deformation: C = ∫ m²/(b·Db) dx + ∫ v²/(b·S) dx, Db = bending stiffness per width,
S = transverse shear stiffness per width (energy-consistent with the equilibrium τxz: (5/6)·G·h for a
homogeneous section, Timoshenko's shear correction). Linear, small deflection (valid while the
deflection stays below about 10 % of the span: a warning says when it does not).
"""
from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass
from functools import cached_property

import numpy as np

from .errors import InputError
from .laminate import (
    SECTIONS,
    Laminate,
    Layer,
    ShearFlow,
    UnitBending,
    laminate,
    ply_field,
    shear_flow,
    shear_stiffness,
    unit_bending,
)
from .materials import Material

SUPPORTS = ("cantilever", "three-point", "four-point", "guided")
DEFAULT_STATIONS = 40
LARGE_DEFLECTION = 0.10  # deflection/span beyond which small-deflection theory is doubtful (common practice)
# Searle parameter β = b²/(R·h): narrow-beam (anticlastic) behaviour below about 1, cylindrical (plate)
# bending above about 20 (Searle 1908; Ashwell 1950, J. R. Aeronaut. Soc. — thresholds recalled).
DEEP_BEAM = 5.0  # span/depth below which beam theory (plane sections, shear correction) is doubtful (common practice)
SEARLE_BEAM_MAX = 1.0
SEARLE_PLATE_MIN = 20.0


@dataclass(frozen=True)
class Ply:
    """One ply of the design's stack (each repeat of ``count`` is its own ply).

    material : Material — the ply material
    angle : float — fibre angle to the beam axis [deg]
    thickness : float — ply thickness [m]
    ends_at : float | None — distance from the root where the ply stops (ply drop) [m]; None: full length
    """

    material: Material
    angle: float
    thickness: float
    ends_at: float | None = None


@dataclass(frozen=True)
class Beam:
    """A beam-like part.

    support : str — one of ``SUPPORTS``
    span : float — cantilever/guided: clamp to load point; three/four-point: between supports [m]
    width_root : float — width at the root (clamp, or mid-span) [m]
    width_tip : float — width at the load point (or support) end; equal to width_root for no taper [m]
    plies : tuple[Ply, ...] — from the tension face (under positive drive) to the other face
    load_spacing : float | None — four-point only: distance between the two load points [m]
    section : str — ``"beam"`` (narrow beam) or ``"plate"`` (cylindrical bending)
    stations : int — about this many stations per span (discontinuities add their own)
    """

    support: str
    span: float
    width_root: float
    width_tip: float
    plies: tuple[Ply, ...]
    load_spacing: float | None = None
    section: str = "beam"
    stations: int = DEFAULT_STATIONS

    @property
    def length(self) -> float:
        """Length of the root-to-end stretch the stations cover [m]."""
        return self.span / 2.0 if self.support in ("three-point", "four-point") else self.span

    @property
    def halves(self) -> int:
        """How many copies of the root-to-end stretch make up the part (2 for symmetric supports)."""
        return 2 if self.support in ("three-point", "four-point") else 1

    def width(self, x: np.ndarray) -> np.ndarray:
        """Width at distance x from the root, linear taper [m]."""
        return self.width_root + (self.width_tip - self.width_root) * np.asarray(x, float) / self.length

    @cached_property
    def _segments(self) -> tuple[Segment, ...]:
        """The segments, built once per beam (``segments``): the loader's check, the response and the modes share
        them; a changed beam (``dataclasses.replace``) is a new object and builds its own."""
        return _build_segments(self)


def validate(beam: Beam) -> None:
    """Reject what the model cannot represent, with the key and what would be right."""
    if beam.support not in SUPPORTS:
        raise InputError(f"[beam] support: must be one of {', '.join(SUPPORTS)}, got {beam.support!r}")
    if beam.section not in SECTIONS:
        raise InputError(f"[beam] section: must be one of {', '.join(SECTIONS)}, got {beam.section!r}")
    if not beam.span > 0:
        raise InputError(f"[beam] span: must be > 0 [m], got {beam.span:g} m")
    if not (beam.width_root > 0 and beam.width_tip > 0):
        raise InputError(
            f"[beam] width: must be > 0 at root and tip [m], got root {beam.width_root:g} m, tip {beam.width_tip:g} m"
        )
    if beam.support == "four-point":
        s = beam.load_spacing
        if s is None:
            raise InputError("[beam] load_spacing: four-point needs the distance between its two load points "
                             f"(missing), 0 < load_spacing < span ({beam.span * 1e3:g} mm)")
        if not 0 < s < beam.span:
            raise InputError(
                f"[beam] load_spacing: four-point needs 0 < load_spacing < span ({beam.span:g} m), got {s:g} m"
            )
    elif beam.load_spacing is not None:
        raise InputError(f"[beam] load_spacing: only for support = \"four-point\", not {beam.support!r}")
    if beam.stations < 2:
        raise InputError(f"stations: need at least 2, got {beam.stations}")
    if not beam.plies:
        raise InputError("[[ply]]: the stack needs at least one ply")
    for k, p in enumerate(beam.plies, start=1):
        if not p.thickness > 0:
            raise InputError(f"[[ply]] {k}: thickness must be > 0 [m], got {p.thickness:g} m")
        if p.ends_at is not None and not p.ends_at > 0:
            raise InputError(f"[[ply]] {k}: ends_at must be > 0 [m] from the root, got {p.ends_at:g} m")


@dataclass(frozen=True)
class Segment:
    """A stretch of constant laminate between discontinuities.

    x0, x1 : float — its ends, from the root [m]
    active : tuple[int, ...] — 0-based indices (into Beam.plies) of the plies present
    lam : Laminate — the laminate re-formed from those plies (own mid-plane)
    bending : UnitBending — response to a unit moment per width
    shear_stiffness : float — transverse shear stiffness per width [N/m]
    shear : ShearFlow — τxz per unit shear force per width
    """

    x0: float
    x1: float
    active: tuple[int, ...]
    lam: Laminate
    bending: UnitBending
    shear_stiffness: float
    shear: ShearFlow


def _breakpoints(beam: Beam) -> list[float]:
    L = beam.length
    cuts = {0.0, L}
    for p in beam.plies:
        if p.ends_at is not None and p.ends_at < L:
            cuts.add(float(p.ends_at))
    if beam.support == "four-point":
        cuts.add(beam.load_spacing / 2.0)
    return sorted(cuts)


def segments(beam: Beam) -> tuple[Segment, ...]:
    """The beam's constant-laminate segments from root to end, each laminate built once (kept on the beam)."""
    return beam._segments


def _build_segments(beam: Beam) -> tuple[Segment, ...]:
    cuts = _breakpoints(beam)
    cache: dict[tuple[int, ...], tuple] = {}
    out = []
    for x0, x1 in zip(cuts[:-1], cuts[1:]):
        mid = 0.5 * (x0 + x1)
        active = tuple(i for i, p in enumerate(beam.plies) if p.ends_at is None or p.ends_at > mid)
        if not active:
            raise InputError(
                f"[[ply]] ends_at: no ply is left beyond x = {x0 * 1e3:g} mm from the root; at least one ply must run "
                f"the full length ({beam.length * 1e3:g} mm)"
            )
        if active not in cache:
            lam = laminate([Layer(beam.plies[i].material, beam.plies[i].angle, beam.plies[i].thickness) for i in active])
            bend = unit_bending(lam, beam.section)
            if not bend.flexural_compliance > 0:
                raise InputError("the laminate has no bending stiffness (its compliance d11 is not positive)")
            flow = shear_flow(lam, bend)
            cache[active] = (lam, bend, shear_stiffness(lam, bend, flow), flow)
        out.append(Segment(x0, x1, active, *cache[active]))
    return tuple(out)


def moment_shear(beam: Beam, x: np.ndarray, m0: float = 0.0) -> tuple[np.ndarray, np.ndarray]:
    """Bending moment m(x) [N·m per N] and shear force v(x) = −dm/dx [N per N] per unit drive force.

    x : np.ndarray — distance from the root [m] (for the shear force, a point inside a segment)
    m0 : float — guided support only: the moment the guide puts at the free end [N·m per N]

    Notes
    -----
    Roark, 7th ed., Table 8.1: cantilever end load M = F(L − x); simply supported centre load M = F(L/2 − x)/2
    from mid-span; two loads F/2 at a = (L − s)/2 from the supports: M = F·a/2 between them; fixed-guided:
    M = F(L − x) − M₀ with M₀ from zero rotation at the guide (M₀ = FL/2 for a uniform beam).
    """
    x = np.asarray(x, float)
    L = beam.span
    if beam.support == "cantilever":
        return L - x, np.ones_like(x)
    if beam.support == "three-point":
        return (L / 2 - x) / 2, np.full_like(x, 0.5)
    if beam.support == "four-point":
        a = (L - beam.load_spacing) / 2
        inside = x < beam.load_spacing / 2
        return np.where(inside, a / 2, (L / 2 - x) / 2), np.where(inside, 0.0, 0.5)
    return (L - x) - m0, np.ones_like(x)


GAUSS_NODES = 20  # Gauss–Legendre nodes per piece of a segment (see `_integral`)
_NODES, _WEIGHTS = np.polynomial.legendre.leggauss(GAUSS_NODES)  # on [−1, 1]


def _pieces(beam: Beam, x0: float, x1: float) -> list[tuple[float, float]]:
    """[x0, x1] cut into pieces each no longer than its distance to the zero of the width line.

    The width b(x) = b_root + (b_tip − b_root)·x/length is linear and positive on the beam; it reaches zero
    at one point outside it (none without a taper). Pieces grow geometrically away from that point (each twice
    the last at most), so even a tip of 10⁻³ of the root takes about ten pieces.
    """
    slope = (beam.width_tip - beam.width_root) / beam.length
    if slope == 0.0:
        return [(x0, x1)]
    zero = -beam.width_root / slope  # beyond the tip (narrowing taper) or behind the root (widening)
    least = (x1 - x0) * 2.0**-40  # a zero that rounds onto the end of the beam: at most some 40 pieces
    pieces = []
    if zero > x0 + 0.5 * (x1 - x0):
        b = x1
        while b > x0:
            a = max(x0, b - max(zero - b, least))
            pieces.append((a, b))
            b = a
        return pieces[::-1]
    a = x0
    while a < x1:
        b = min(x1, a + max(a - zero, least))
        pieces.append((a, b))
        a = b
    return pieces


def _integral(fun, beam: Beam, segs: Sequence[Segment]) -> float:
    """Σ over segments of ∫ fun(x, seg) dx by Gauss–Legendre quadrature (nodes from numpy.polynomial.legendre).

    fun(x, seg) takes an array of x. Every integrand here is a polynomial of degree ≤ 2 in x (m², m, v², 1)
    over the linear width b(x): analytic but for the zero of b outside the beam. On a piece no longer than its
    distance to that zero, the pole lies at t ≥ 3 in the piece's [−1, 1] coordinate, outside the Bernstein
    ellipse of ρ = 4 (semi-axis 2.125), so the n-node rule errs by at most (64/15)·M·ρ^(−2n)/(ρ² − 1), M the
    integrand's largest modulus on that ellipse (Trefethen, "Is Gauss quadrature better than Clenshaw–Curtis?",
    SIAM Review 50 (2008), Theorem 4.5; the constant recalled from memory): with n = 20, ρ^(−40) ≈ 10⁻²⁴ of
    M — below round-off. Without a taper the integrands are polynomials, which 20 nodes integrate exactly
    (degree ≤ 39). The tests check tapered and stepped beams against closed forms by hand.
    """
    total = 0.0
    for seg in segs:
        for a, b in _pieces(beam, seg.x0, seg.x1):
            half = 0.5 * (b - a)
            total += half * float(np.dot(_WEIGHTS, fun(a + half * (_NODES + 1.0), seg)))
    return total


def guided_end_moment(beam: Beam, segs: Sequence[Segment]) -> float:
    """Moment at the guided end per unit drive force, from zero rotation there [N·m per N].

    Notes
    -----
    The slope at the guide is ∫ M/(EI) dx = 0 (bending rotation; shear strain does not rotate the section in
    Timoshenko theory), with M = (L − x) − M₀ and EI = b·Db: M₀ = ∫(L − x)/EI dx / ∫ 1/EI dx. Uniform beam:
    M₀ = L/2 (Roark, 7th ed., Table 8.1 case 2a).
    """
    L = beam.span

    def flex(x, seg):
        return seg.bending.flexural_compliance / beam.width(x)

    return _integral(lambda x, s: (L - x) * flex(x, s), beam, segs) / _integral(flex, beam, segs)


@dataclass(frozen=True)
class BeamResponse:
    """Every ply's response per unit drive force at every station, and the beam's global figures.

    Shapes: n = stations, p = plies of the design's whole stack, faces = 2 (0 bottom = smaller z, 1 top).

    x : np.ndarray — station distance from the root, shape (n,) [m]; a discontinuity appears twice
    segment : np.ndarray — index of the segment each station belongs to, shape (n,)
    width : np.ndarray — width at each station, shape (n,) [m]
    moment : np.ndarray — bending moment per unit drive force, shape (n,) [N·m per N]
    shear : np.ndarray — shear force per unit drive force, shape (n,) [N per N]
    present : np.ndarray — ply present at the station, shape (n, p) bool
    z : np.ndarray — ply face coordinates in the local laminate, shape (n, p, 2) [m]; 0 where absent
    strain_12 : np.ndarray — [ε1, ε2, γ12] per unit force, shape (n, p, 2, 3) [1/N]
    stress_12 : np.ndarray — [σ1, σ2, τ12] per unit force, shape (n, p, 2, 3) [Pa/N]
    strain_x : np.ndarray — axial strain εx per unit force, shape (n, p, 2) [1/N]
    tau_xz : np.ndarray — interlaminar shear at the ply faces per unit force, shape (n, p, 2) [Pa/N]
    tau_xz_peak : np.ndarray — largest |τxz| inside each ply per unit force, shape (n, p) [Pa/N]
    z_tau_peak : np.ndarray — where that peak is, shape (n, p) [m]
    curvature : np.ndarray — κx per unit force, shape (n,) [1/(m·N)]
    thickness : np.ndarray — laminate thickness at each station, shape (n,) [m]
    compliance : float — load-point deflection per unit drive force, bending + shear [m/N]
    bending_compliance : float — its bending part [m/N]
    mass : float — mass of the part between root(s) and end(s) [kg]
    guided_moment : float — guided support: the end moment per unit force [N·m per N], else 0
    reference_energy : float — ½·Σ E_x,k V_k per unit strain², for the energy-storage efficiency [J]
    """

    beam: Beam
    x: np.ndarray
    segment: np.ndarray
    width: np.ndarray
    moment: np.ndarray
    shear: np.ndarray
    present: np.ndarray
    z: np.ndarray
    strain_12: np.ndarray
    stress_12: np.ndarray
    strain_x: np.ndarray
    tau_xz: np.ndarray
    tau_xz_peak: np.ndarray
    z_tau_peak: np.ndarray
    curvature: np.ndarray
    thickness: np.ndarray
    compliance: float
    bending_compliance: float
    mass: float
    guided_moment: float
    reference_energy: float

    @property
    def stiffness(self) -> float:
        """Drive force per load-point deflection [N/m]."""
        return 1.0 / self.compliance


def _station_positions(beam: Beam, segs: Sequence[Segment]) -> tuple[np.ndarray, np.ndarray]:
    """About ``beam.stations`` stations over the length, both ends of every segment included."""
    L = beam.length
    xs, idx = [], []
    for k, seg in enumerate(segs):
        n = max(2, int(np.ceil(beam.stations * (seg.x1 - seg.x0) / L)) + 1)
        xs.append(np.linspace(seg.x0, seg.x1, n))
        idx.append(np.full(n, k))
    return np.concatenate(xs), np.concatenate(idx)


@dataclass(frozen=True)
class SectionFields:
    """Every ply's response at every station to given section loads per width (shapes as in BeamResponse).

    present, z, strain_12, stress_12, strain_x, tau_xz, tau_xz_peak, z_tau_peak, curvature, thickness: as the
    fields of the same names in `BeamResponse`, per the section loads given to `section_fields`.
    """

    present: np.ndarray
    z: np.ndarray
    strain_12: np.ndarray
    stress_12: np.ndarray
    strain_x: np.ndarray
    tau_xz: np.ndarray
    tau_xz_peak: np.ndarray
    z_tau_peak: np.ndarray
    curvature: np.ndarray
    thickness: np.ndarray


def section_fields(beam: Beam, segs: Sequence[Segment], seg_index: np.ndarray, Mx: np.ndarray,
                   Vx: np.ndarray) -> SectionFields:
    """Ply strains, stresses and interlaminar shear at each station under the moment and shear per width there.

    seg_index : np.ndarray — the segment of each station, shape (n,)
    Mx : np.ndarray — bending moment per width at each station, shape (n,) [N·m/m per unit load]
    Vx : np.ndarray — transverse shear force per width at each station, shape (n,) [N/m per unit load]

    Notes
    -----
    The section law is linear: each segment's unit ply field (classical laminate theory, Kaw, 2nd ed.,
    Eq. 4.16) scaled by Mx, and its equilibrium τxz (Whitney 1987, ch. 6) scaled by Vx.
    """
    n, p = seg_index.size, len(beam.plies)
    present = np.zeros((n, p), bool)
    z = np.zeros((n, p, 2))
    strain_12 = np.zeros((n, p, 2, 3))
    stress_12 = np.zeros((n, p, 2, 3))
    strain_x = np.zeros((n, p, 2))
    tau_xz = np.zeros((n, p, 2))
    tau_peak = np.zeros((n, p))
    z_peak = np.zeros((n, p))
    curvature = np.zeros(n)
    thickness = np.zeros(n)
    for k, seg in enumerate(segs):
        rows = np.flatnonzero(seg_index == k)
        cols = np.array(seg.active)
        field = ply_field(seg.lam, seg.bending.eps0, seg.bending.kappa)
        r, c = np.ix_(rows, cols)
        present[r, c] = True
        z[r, c] = field.z[None]
        strain_12[r, c] = Mx[rows, None, None, None] * field.strain_12[None]
        stress_12[r, c] = Mx[rows, None, None, None] * field.stress_12[None]
        strain_x[r, c] = Mx[rows, None, None] * field.strain_xy[None, :, :, 0]
        faces = np.stack([seg.shear.tau_interfaces[:-1], seg.shear.tau_interfaces[1:]], axis=1)
        tau_xz[r, c] = Vx[rows, None, None] * faces[None]
        tau_peak[r, c] = Vx[rows, None] * seg.shear.tau_peak[None]
        z_peak[r, c] = seg.shear.z_peak[None]
        curvature[rows] = Mx[rows] * seg.bending.kappa[0]
        thickness[rows] = seg.lam.thickness
    return SectionFields(present, z, strain_12, stress_12, strain_x, tau_xz, tau_peak, z_peak, curvature, thickness)


def respond(beam: Beam) -> BeamResponse:
    """Build the response map of a beam per unit drive force.

    Each distinct laminate is analysed once (classical laminate theory), then scaled by the local moment
    per width Mx = −m(x)/b(x) (negative: the first ply, at z = −h/2, in tension under positive drive) and by
    the local shear force per width.
    """
    validate(beam)
    segs = segments(beam)
    m0 = guided_end_moment(beam, segs) if beam.support == "guided" else 0.0

    def bend_integrand(x, seg):
        m, _ = moment_shear(beam, x, m0)
        return m**2 * seg.bending.flexural_compliance / beam.width(x)

    def shear_integrand(x, seg):
        _, v = moment_shear(beam, np.array([0.5 * (seg.x0 + seg.x1)]), m0)  # v is constant on a segment
        return float(v[0]) ** 2 / (beam.width(x) * seg.shear_stiffness)

    c_bend = beam.halves * _integral(bend_integrand, beam, segs)
    c_shear = beam.halves * _integral(shear_integrand, beam, segs)

    x, seg_index = _station_positions(beam, segs)
    b = beam.width(x)
    m, _ = moment_shear(beam, x, m0)
    mids = np.array([0.5 * (s.x0 + s.x1) for s in segs])
    v = moment_shear(beam, mids, m0)[1][seg_index]

    Mx = -m / b  # moment per width per unit drive force [N·m/m per N]
    Vx = v / b  # shear force per width per unit drive force [N/m per N]
    fields = section_fields(beam, segs, seg_index, Mx, Vx)

    # mass and the reference energy ½·E_x·V per unit strain²: b is linear, so ∫b dx = mean width × length;
    # E_x = 1/S̄11 with S̄ = Q̄⁻¹, the ply's modulus along the beam axis (Kaw, 2nd ed., sec. 2.4)
    mass = 0.0
    reference = 0.0
    for seg in segs:
        area = 0.5 * float(beam.width(seg.x0) + beam.width(seg.x1)) * (seg.x1 - seg.x0)
        axial = 1.0 / np.linalg.inv(seg.lam.Qbar)[:, 0, 0]
        for layer, E_x in zip(seg.lam.layers, axial):
            mass += layer.material.density * layer.thickness * area
            reference += 0.5 * E_x * layer.thickness * area
    mass *= beam.halves
    reference *= beam.halves

    return BeamResponse(
        beam=beam,
        x=x,
        segment=seg_index,
        width=b,
        moment=m,
        shear=v,
        present=fields.present,
        z=fields.z,
        strain_12=fields.strain_12,
        stress_12=fields.stress_12,
        strain_x=fields.strain_x,
        tau_xz=fields.tau_xz,
        tau_xz_peak=fields.tau_xz_peak,
        z_tau_peak=fields.z_tau_peak,
        curvature=fields.curvature,
        thickness=fields.thickness,
        compliance=c_bend + c_shear,
        bending_compliance=c_bend,
        mass=mass,
        guided_moment=m0,
        reference_energy=reference,
    )


def range_warnings(response: BeamResponse, peak_force: float) -> list[str]:
    """Warnings when the peak drive takes the beam past the linear, narrow-beam / plate model.

    peak_force : float — the largest |drive force| of the duty [N]

    Notes
    -----
    Beam theory: span/depth above about 5 (common practice). Small-deflection beam theory: deflection below
    about 10 % of the span (ASTM D790 corrects its flexural stress for larger deflections; recalled).
    Searle parameter β = b²/(R·h) at the peak curvature 1/R:
    narrow-beam (free anticlastic) behaviour for β ≲ 1, cylindrical bending for β ≳ 20 (Searle 1908;
    Ashwell 1950; recalled thresholds).
    """
    out = []
    beam = response.beam
    depth = float(response.thickness.max())
    if beam.span / depth < DEEP_BEAM:
        out.append(
            f"span/depth = {beam.span / depth:.2g} is below {DEEP_BEAM:g}: a deep beam, where plane sections, the shear "
            "correction and the beam stresses are doubtful (common practice); the figures are rough"
        )
    deflection = response.compliance * abs(peak_force)
    if deflection > LARGE_DEFLECTION * beam.span:
        out.append(
            f"the load-point deflection {deflection * 1e3:.1f} mm passes 10 % of the span ({beam.span * 1e3:.0f} mm): "
            "linear small-deflection theory no longer holds; stresses and stiffness are estimates only"
        )
    kappa = np.abs(response.curvature) * abs(peak_force)
    i = int(np.argmax(kappa))
    if kappa[i] > 0:
        searle = response.width[i] ** 2 * kappa[i] / response.thickness[i]
        if beam.section == "beam" and searle > SEARLE_PLATE_MIN:
            out.append(
                f"Searle parameter b²/(R·h) = {searle:.3g} at x = {response.x[i] * 1e3:.0f} mm: the section bends like a "
                'plate (cylindrical bending); consider section = "plate" (stiffer, by 1/(1 − ν12·ν21) for a UD ply)'
            )
        elif beam.section == "plate" and searle < SEARLE_BEAM_MAX:
            out.append(
                f"Searle parameter b²/(R·h) = {searle:.3g} at x = {response.x[i] * 1e3:.0f} mm: the section bends like a "
                'narrow beam (free anticlastic curvature); consider section = "beam"'
            )
        elif SEARLE_BEAM_MAX <= searle <= SEARLE_PLATE_MIN:
            out.append(
                f"Searle parameter b²/(R·h) = {searle:.3g} at x = {response.x[i] * 1e3:.0f} mm lies between beam (≲ 1) and "
                "plate (≳ 20) behaviour: the true bending stiffness lies between the two section models"
            )
    return out


def core_warnings(beam: Beam) -> list[str]:
    """A core in a part meant to flex raises stiffness with the square of the face separation and adds a
    face/core bond-line failure mode (common practice in sandwich design)."""
    cores = sorted({p.material.name for p in beam.plies if p.material.kind == "core"})
    if not cores:
        return []
    return [
        f"the stack has a core ({', '.join(cores)}): bending stiffness grows with the square of the face separation, "
        "so the faces strain more for a given deflection, and the face/core bond line is a further failure mode — "
        "a core is unwelcome in a part meant to flex; core shear is checked against its shear strength"
    ]
