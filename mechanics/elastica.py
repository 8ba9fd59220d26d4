"""Large deflection: the inextensible elastica of a cantilever or guided beam under an end load of fixed direction.

The beam's axis keeps its length (inextensible) and its strains stay small, so each section keeps the
laminate's linear moment–curvature relation of the small-deflection model — κ = M/EI(s) with EI = b(s)/c(s),
c the bending compliance per width of the local laminate (narrow beam 1/d11 or plate), b the width — while
its rotation θ may be large. EI changes with the width taper and jumps at ply drops: the equations are
integrated segment by segment between the beam's discontinuities.

Loads (the axis runs along x from the clamp at s = 0; the end load P acts along y, perpendicular to the
undeformed beam, and keeps its direction):

- cantilever: the end is free; M(L) = 0;
- guided: the end keeps θ(L) = 0 and slides freely along x; an unknown end moment makes it so.

In both, the moment about the section at s is M(s) = M₀ − P·x(s), M₀ the root moment (unknown), and the
shear force normal to the deformed section is V(s) = P·cos θ(s). Transverse shear flexibility enters as in
the small-deflection model (Reissner's finite-strain beam, restricted to an inextensible axis: the shear
strain γ = V/(b·S), S the section's shear stiffness per width, tilts the axis from the section normal):

    θ' = M/EI,   x' = cos θ − γ·sin θ,   y' = sin θ + γ·cos θ,   γ = P·cos θ/(b·S)

(Reissner, "On one-dimensional finite-strain beam theory", ZAMP 23 (1972) 795–804; without shear the
classical elastica of Bisshopp & Drucker, Q. Appl. Math. 3 (1945) 272–275). At small loads it reduces to
the linear Timoshenko beam of ``flexcycle.mechanics.beam``.

The root moment is found by shooting: the equations are integrated from the clamp with ``scipy.integrate.
solve_ivp`` (many load levels at once, with the sensitivity of the end condition to M₀) and the end
condition solved with ``scipy.optimize.root``. The stored energy ∫M²/(2EI) ds + ∫V²/(2bS) ds is
integrated alongside; it equals the work ∫P dδ along the load path (Clapeyron; the inextensibility
constraint does no work), which the tests check.

The solutions tabulated against the drive over a duty (adaptive refinement, monotonicity checks) are
``flexcycle.mechanics.drive_table``.

Range: small strains (the linear section law); the end load keeps its direction (a dead load: no follower
load, no contact); a force may be as large as the part's strength allows, a deflection drive must stay
below what the end can reach (the span, approached only as P → ∞).
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass, replace

import numpy as np
from scipy.integrate import solve_ivp
from scipy.optimize.elementwise import find_root

from .beam import Beam, BeamResponse, Segment, section_fields, segments
from .errors import InputError
from .theory import LARGE_SUPPORTS, THEORIES, refuse_unsolved  # noqa: F401 — THEORIES re-exported

RTOL = 1e-9  # solve_ivp's relative tolerance: the shapes to ~1e-8, far inside the 0.1 % the tables keep
ATOL = 1e-12  # absolute tolerance on the dimensionless states (angles [rad], positions per span)
SHOOTING_TOLERANCES = {"xatol": 1e-11, "xrtol": 1e-10}  # the unknown (an angle [rad] or a ratio [-]) to ~1e-10
UNIQUE_LOAD = 10.0  # load index P·L²/EI below which the shooting bounds hold one root (see ``_unknowns``)
MAX_LOAD = 1000.0  # load index P·L²/EI beyond which the elastica is not solved (no real part gets there)




@dataclass(frozen=True)
class Piece:
    """A stretch of constant laminate, in the dimensionless arc length s̃ = s/L.

    s0, s1 : float — its ends [-]
    flexural_compliance : float — bending compliance per width c [1/(N·m)] (EI = b/c)
    shear_stiffness : float — transverse shear stiffness per width S [N/m] (GA = b·S)
    """

    s0: float
    s1: float
    flexural_compliance: float
    shear_stiffness: float


@dataclass(frozen=True)
class Elastica:
    """A beam made ready for the elastica: its pieces and reference stiffness.

    beam : Beam
    pieces : tuple[Piece, ...] — root to end
    bending_ref : float — EI at the root, EI_ref = b_root/c_root [N·m²]; loads scale as P̃ = P·L²/EI_ref
    """

    beam: Beam
    pieces: tuple[Piece, ...]
    bending_ref: float

    @property
    def length(self) -> float:
        """Arc length from the clamp to the load point [m]."""
        return self.beam.length

    def load_scale(self) -> float:
        """EI_ref/L², the force that makes P̃ = 1 [N]."""
        return self.bending_ref / self.length**2


def prepare(beam: Beam, segs: Sequence[Segment]) -> Elastica:
    """The beam's pieces for the elastica; refuses supports it does not solve.

    segs : the beam's segments (``flexcycle.mechanics.beam.segments``)
    """
    refuse_unsolved(beam.support)
    L = beam.length
    pieces = tuple(Piece(s.x0 / L, s.x1 / L, s.bending.flexural_compliance, s.shear_stiffness) for s in segs)
    return Elastica(beam, pieces, beam.width_root / pieces[0].flexural_compliance)


@dataclass(frozen=True)
class Shapes:
    """Solutions of the elastica at J load levels, sampled at n stations.

    force : np.ndarray — end load P along y, shape (J,) [N]
    deflection : np.ndarray — load-point deflection along the load, y(L), shape (J,) [m]
    pull_in : np.ndarray — the load point's travel toward the clamp, L − x(L), shape (J,) [m]
    tip_rotation : np.ndarray — θ(L), shape (J,) [rad]
    energy : np.ndarray — strain energy, bending plus shear, shape (J,) [J]
    bending_energy : np.ndarray — its bending part ∫M²/(2EI) ds, shape (J,) [J]
    s : np.ndarray — station arc length from the clamp, shape (n,) [m]
    x, y : np.ndarray — deformed station positions, shape (J, n) [m]
    theta : np.ndarray — section rotation, shape (J, n) [rad]
    moment : np.ndarray — bending moment, first ply in tension when positive, shape (J, n) [N·m]
    shear : np.ndarray — shear force normal to the deformed section, P·cos θ, shape (J, n) [N]
    """

    force: np.ndarray
    deflection: np.ndarray
    pull_in: np.ndarray
    tip_rotation: np.ndarray
    energy: np.ndarray
    bending_energy: np.ndarray
    s: np.ndarray
    x: np.ndarray
    y: np.ndarray
    theta: np.ndarray
    moment: np.ndarray
    shear: np.ndarray


def _rates(model: Elastica, piece: Piece, load: np.ndarray, moment_at_origin: np.ndarray):
    """The right-hand side d/ds̃ of the dimensionless states for solve_ivp, all load levels at once.

    States (5, J): θ, ξ, η (position per span, from the integration's origin), Ũ (energy), Ũ_b (bending energy).

    Notes
    -----
    With s̃ = s/L, ξ = x/L, η = y/L, P̃ = P·L²/EI_ref, M̃ = M·L/EI_ref, e(s̃) = EI/EI_ref, φ(s̃) = EI_ref/(L²·b·S):
    M̃ = M̃ₒ − P̃·ξ (ξ measured from the origin where the moment is M̃ₒ); θ' = M̃/e; γ = P̃·φ·cos θ;
    ξ' = cos θ − γ·sin θ; η' = sin θ + γ·cos θ (Reissner 1972, with no axial strain);
    energy per EI_ref/L: Ũ' = M̃²/(2e) + φ·(P̃·cos θ)²/2.
    """
    beam = model.beam
    L = beam.length
    c_ratio = model.pieces[0].flexural_compliance / piece.flexural_compliance
    b_root, b_slope = beam.width_root, (beam.width_tip - beam.width_root)
    phi_factor = model.bending_ref / (L**2 * piece.shear_stiffness)

    def rates(s, flat):
        state = flat.reshape(5, -1)
        theta, xi = state[0], state[1]
        b = b_root + b_slope * s
        e = (b / b_root) * c_ratio
        phi = phi_factor / b
        moment = moment_at_origin - load * xi
        cos, sin = np.cos(theta), np.sin(theta)
        gamma = load * phi * cos
        bending = 0.5 * moment**2 / e
        return np.concatenate([moment / e, cos - gamma * sin, sin + gamma * cos,
                               bending + 0.5 * phi * (load * cos) ** 2, bending])

    return rates


def _integrate(model: Elastica, load: np.ndarray, start: np.ndarray, moment_at_origin: np.ndarray,
               from_tip: bool, stations: np.ndarray | None = None, piece_of: np.ndarray | None = None):
    """Integrate the states (5, J) from the clamp to the end, or from the end to the clamp.

    start : np.ndarray — the states at the origin, shape (5, J)
    stations : np.ndarray | None — dimensionless station positions s/L, shape (n,), and ``piece_of`` their pieces
    Returns the states at the far end (5, J) and, with stations, the states there (5, J, n).
    """
    J = load.size
    state = np.array(start, float).reshape(5, J)
    sampled = None if stations is None else np.zeros((5, J, stations.size))
    order = range(len(model.pieces) - 1, -1, -1) if from_tip else range(len(model.pieces))
    for k in order:
        piece = model.pieces[k]
        span = (piece.s1, piece.s0) if from_tip else (piece.s0, piece.s1)
        mine = np.zeros(0, int)
        if stations is not None:
            mine = np.flatnonzero(piece_of == k)
            mine = mine[np.argsort(stations[mine])[::-1]] if from_tip else mine[np.argsort(stations[mine])]
        # the stations of this piece, then its far end (the next piece's start)
        t_eval = None
        if mine.size:
            t_eval = np.clip(stations[mine], piece.s0, piece.s1)
            if t_eval[-1] != span[1]:
                t_eval = np.append(t_eval, span[1])
        sol = solve_ivp(_rates(model, piece, load, moment_at_origin), span, state.ravel(),
                        method="DOP853", rtol=RTOL, atol=ATOL, t_eval=t_eval)
        if not sol.success:
            raise InputError(f"the elastica could not be integrated ({sol.message}); the load is beyond the model")
        if mine.size:
            sampled[:, :, mine] = sol.y[:, :mine.size].reshape(5, J, -1)
        state = sol.y[:, -1].reshape(5, J)
    return state, sampled


def _tip_residual(model: Elastica, load: np.ndarray, tip_rotation: np.ndarray) -> np.ndarray:
    """Cantilever, shot from the free end (M = 0, θ = θ_L): the rotation left at the clamp, θ(0) [rad]."""
    start = np.zeros((5, load.size))
    start[0] = tip_rotation
    end, _ = _integrate(model, load, start, np.zeros_like(load), from_tip=True)
    return end[0]


def _guided_residual(model: Elastica, load: np.ndarray, ratio: np.ndarray) -> np.ndarray:
    """Guided beam, shot from the clamp with M̃₀ = ratio·P̃: the rotation at the guided end, θ(L) [rad]."""
    end, _ = _integrate(model, load, np.zeros((5, load.size)), ratio * load, from_tip=False)
    return end[0]


def _full_bracket(model: Elastica, load: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Bounds of the shooting unknown that hold for any load (see ``_shoot``)."""
    if model.beam.support == "cantilever":
        edge = np.sign(load) * np.pi / 2
        return np.minimum(0.0, edge), np.maximum(0.0, edge)
    return np.zeros_like(load), np.full_like(load, 1.05)


def _shoot(model: Elastica, load: np.ndarray, bracket: tuple[np.ndarray, np.ndarray] | None = None) -> np.ndarray:
    """The shooting unknown at every level: θ_L (cantilever) or M̃₀/P̃ (guided), load ≠ 0.

    bracket : optional narrower bounds of the unknown per level (from neighbouring solved levels); a level whose
        bounds do not hold the root is solved again within the full bounds

    Notes
    -----
    The levels are independent scalar problems, each bracketed, solved together by Chandrupatla's method
    (``scipy.optimize.elementwise.find_root``; each call integrates all levels at once).
    Cantilever: with θ_L = 0 the clamp rotation comes out negative; with θ_L = π/2·sign P the end section
    lies along the load, carries no moment and no normal shear, and the beam stays straight at that angle:
    the clamp rotation is π/2 — the root lies between.
    Guided: with M̃₀ = 0 the moment −P̃·ξ bends the end back (θ(L) ≤ 0); with M̃₀ = 1.05·P̃ the moment P̃·(1.05 −
    ξ) stays positive (ξ ≤ 1, the inextensible axis), θ(L) > 0.
    """
    if model.beam.support == "cantilever":
        def residual(t, p):
            return _tip_residual(model, p, t)
    else:
        def residual(r, p):
            return _guided_residual(model, p, r)

    full = _full_bracket(model, load)
    lo, hi = full if bracket is None else bracket
    result = find_root(residual, (lo, hi), args=(load,), tolerances=SHOOTING_TOLERANCES)
    unknown, success = result.x, result.success
    again = ~success
    if bracket is not None and again.any():
        retry = find_root(residual, (full[0][again], full[1][again]), args=(load[again],),
                          tolerances=SHOOTING_TOLERANCES)
        unknown[again], success[again] = retry.x, retry.success
    if not np.all(success):
        worst = float(np.max(np.abs(load[~success])))
        raise InputError(f"the elastica's end condition could not be met at an end load of {worst:.3g} EI/L² (the "
                         "shooting did not converge): the load lies beyond what this model solves")
    return unknown


def _unknown_of(model: Elastica, shapes: Shapes) -> np.ndarray:
    """The shooting unknown of solved levels: θ_L (cantilever) or M₀/(P·L) (guided; the small-load limit at P = 0)."""
    if model.beam.support == "cantilever":
        return shapes.tip_rotation
    root = int(np.argmin(shapes.s))
    with np.errstate(invalid="ignore", divide="ignore"):
        ratio = shapes.moment[:, root] / (shapes.force * model.length)
    return ratio


def _bracket_between(model: Elastica, shapes: Shapes, forces: np.ndarray):
    """Bounds of the unknown at loads inside the solved range, from the two solved levels around each, padded."""
    unknown = _unknown_of(model, shapes)
    j = np.clip(np.searchsorted(shapes.force, forces) - 1, 0, shapes.force.size - 2)
    a, b = unknown[j], unknown[j + 1]
    full_lo, full_hi = _full_bracket(model, forces / model.load_scale())
    bad = ~(np.isfinite(a) & np.isfinite(b))
    low, high = np.minimum(a, b), np.maximum(a, b)
    pad = 1e-3 * (high - low) + 1e-12
    low, high = np.maximum(low - pad, full_lo), np.minimum(high + pad, full_hi)
    return np.where(bad, full_lo, low), np.where(bad, full_hi, high)


def _flexibility(model: Elastica) -> float:
    """The largest EI_ref/EI along the beam [-]: P̃ times this is the load index of the most flexible section."""
    beam = model.beam
    least_width = min(beam.width_root, beam.width_tip) / beam.width_root
    c_root = model.pieces[0].flexural_compliance
    return max(p.flexural_compliance / c_root for p in model.pieces) / least_width


def _unknowns(model: Elastica, load: np.ndarray, near: Shapes | None) -> np.ndarray:
    """The shooting unknown at every load (0 at no load), by continuation where the load is heavy.

    Notes
    -----
    The residual has one root in the full bounds while the load index P·L²/EI stays below UNIQUE_LOAD anywhere
    (checked on a uniform cantilever: at 80 the shooting also finds looped, unstable shapes). Heavier levels
    are solved in batches, each up to twice the last solved load, bounded by the last solved unknown (θ_L rises
    and M₀/(P·L) falls with the load). The problem is odd in the load: |P| is solved, θ_L takes its sign.
    """
    unknown = np.zeros_like(load)
    size = np.abs(load)
    if size.max() * _flexibility(model) > MAX_LOAD:
        raise InputError(
            f"an end load of {size.max() * _flexibility(model):.3g} EI/L² (EI of the most flexible section) is beyond "
            f"what the elastica here solves ({MAX_LOAD:g}); no structural part strains so little under such a load — "
            "check the drive values and their unit"
        )
    odd = -1.0 if model.beam.support == "cantilever" else 1.0
    if near is not None and near.force.size > 1 and np.all(np.abs(load) * model.load_scale() <= near.force.max()):
        loaded = size > 0
        unknown[loaded] = _shoot(model, size[loaded], _bracket_between(model, near, size[loaded] * model.load_scale()))
        return np.where(load < 0, odd * unknown, unknown)
    order = np.argsort(size)
    order = order[size[order] > 0]
    safe = UNIQUE_LOAD / _flexibility(model)
    done = order[size[order] <= safe]
    if done.size:
        unknown[done] = _shoot(model, size[done])
    while done.size < order.size:
        last = done[-1] if done.size else None
        reach = 2.0 * (size[last] if last is not None else safe)
        batch = order[done.size:][size[order[done.size:]] <= reach]
        if not batch.size:
            batch = order[done.size:done.size + 1]
        low, high = _full_bracket(model, size[batch])
        if last is not None:  # beyond the last solved level: between its unknown and the bound it moves toward
            if model.beam.support == "cantilever":
                low = np.full_like(low, unknown[last])
            else:
                high = np.full_like(high, unknown[last])
        unknown[batch] = _shoot(model, size[batch], (low, high))
        done = order[:done.size + batch.size]
    return np.where(load < 0, odd * unknown, unknown)


def solve(model: Elastica, forces: np.ndarray, stations: np.ndarray, piece_of: np.ndarray,
          near: Shapes | None = None) -> Shapes:
    """The elastica at each end load, sampled at the stations.

    forces : np.ndarray — end loads P [N], any sign, shape (J,)
    stations : np.ndarray — arc length of each station from the clamp [m], shape (n,) (a discontinuity twice)
    piece_of : np.ndarray — the segment (piece) index of each station, shape (n,)
    near : Shapes | None — solved levels, ascending in force, whose range holds every force here: the shooting
        starts between the two levels around each force (the unknown is monotonic in the load)
    """
    forces = np.asarray(forces, float)
    L = model.length
    load = forces / model.load_scale()
    unknown = _unknowns(model, load, near)
    from_tip = model.beam.support == "cantilever"
    start = np.zeros((5, load.size))
    if from_tip:
        start[0] = unknown
        origin_moment = np.zeros_like(load)
    else:
        origin_moment = unknown * load
    far, at = _integrate(model, load, start, origin_moment, from_tip, np.asarray(stations, float) / L, piece_of)
    scale = model.bending_ref / L  # M = M̃·EI_ref/L, U = Ũ·EI_ref/L
    theta = at[0]
    if from_tip:  # positions measured from the tip: shift them to the clamp; energies integrated backward
        xi = at[1] - far[1][:, None]
        eta = at[2] - far[2][:, None]
        moment = -load[:, None] * at[1] * scale
        energy, bending = -far[3] * scale, -far[4] * scale
        tip = (-far[1], -far[2], start[0])
    else:
        xi, eta = at[1], at[2]
        moment = (origin_moment[:, None] - load[:, None] * at[1]) * scale
        energy, bending = far[3] * scale, far[4] * scale
        tip = (far[1], far[2], far[0])
    return Shapes(
        force=forces,
        deflection=tip[1] * L,
        pull_in=(1.0 - tip[0]) * L,
        tip_rotation=tip[2],
        energy=energy,
        bending_energy=bending,
        s=np.asarray(stations, float),
        x=xi * L,
        y=eta * L,
        theta=theta,
        moment=moment,
        shear=forces[:, None] * np.cos(theta),
    )



def per_section_load(response: BeamResponse) -> BeamResponse:
    """The response map per unit section load instead of per unit drive force.

    In-plane ply strains and stresses, εx and the curvature per unit bending moment M = 1 N·m at each station;
    τxz per unit shear force V = 1 N normal to the section. ``moment`` and ``shear`` become 1. Under large
    deflection each station's section loads come from the elastica and scale these (the section law is linear).

    Notes
    -----
    As in ``flexcycle.mechanics.beam.respond``: moment per width Mx = −M/b (the first ply in tension under a
    positive moment), shear per width V/b; ply fields from classical laminate theory (Kaw, 2nd ed., Eq. 4.16).
    """
    beam = response.beam
    # M = 1 N·m and V = 1 N at every station: moment per width Mx = −1/b, shear per width 1/b
    fields = section_fields(beam, segments(beam), response.segment, -1.0 / response.width, 1.0 / response.width)
    ones = np.ones_like(response.moment)
    return replace(response, moment=ones, shear=ones, strain_12=fields.strain_12, stress_12=fields.stress_12,
                   strain_x=fields.strain_x, tau_xz=fields.tau_xz, tau_xz_peak=fields.tau_xz_peak,
                   curvature=fields.curvature)
