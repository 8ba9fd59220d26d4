"""Large deflection: the inextensible elastica of a cantilever or guided beam under an end load of fixed direction.

The beam's axis keeps its length (inextensible) and its strains stay small, so each section keeps the
laminate's linear moment–curvature relation of the small-deflection model — κ = M/EI(s) with EI = b(s)/c(s),
c the bending compliance per width of the local laminate (narrow beam 1/d11 or plate), b the width — while
its rotation θ may be large. EI changes with the width taper and jumps at ply drops: the equations are
solved piece by piece between the beam's discontinuities.

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

The equations are solved in their integral form, θ(s) = ∫₀^s M/EI with M = M₀ − P·x and x, y the integrals
of x', y' (Greengard, SIAM J. Numer. Anal. 28 (1991) 1071–1080): θ is collocated at Chebyshev–Lobatto nodes on
each piece, the integrals are Chebyshev integration matrices (``flexcycle.mechanics.chebyshev``; Trefethen,
*Spectral Methods in MATLAB*, SIAM 2000), and the nodal rotations with the root moment M₀ are found by Newton's
method with the exact Jacobian, many load levels at once (one small dense linear system per level and step).
The error falls geometrically with the nodes (section loads and energy to ~1e-10 with the counts used); heavy
loads are reached by continuation in the load. The stored energy ∫M²/(2EI) ds + ∫V²/(2bS) ds is integrated by
the same rules (Clenshaw–Curtis); it equals the work ∫P dδ along the load path (Clapeyron; the inextensibility
constraint does no work), which the tests check.

The solutions tabulated against the drive over a duty (adaptive refinement, monotonicity checks) are
``flexcycle.mechanics.drive_table``.

Range: small strains (the linear section law); the end load keeps its direction (a dead load: no follower
load, no contact); a force may be as large as the part's strength allows, a deflection drive must stay
below what the end can reach (the span, approached only as P → ∞); the stable shape only (no section turned
past 90° from the clamp, else refused); load index P·L²/EI up to MAX_LOAD.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass, replace

import numpy as np

from .beam import Beam, BeamResponse, Segment, section_fields, segments
from .chebyshev import MAX_NODES, Rule, rule
from .errors import InputError
from .theory import LARGE_SUPPORTS, THEORIES, refuse_unsolved  # noqa: F401 — THEORIES re-exported

NEWTON_TOLERANCE = 1e-9  # a full Newton step below this [rad] (M̃₀: share of P̃) ends it; the error left is ~its square
MAX_NEWTON = 40  # Newton iterations before a level is declared unsolved
MAX_STEP = 0.5  # a Newton step turning a node by more than this [rad] is shortened to it (far from the root)
DIRECT_LOAD = 4.0  # load index P·L²/EI up to which Newton starts from the small-load shape (see ``_shapes_at_nodes``)
MAX_LOAD = 1000.0  # load index P·L²/EI beyond which the elastica is not solved (no real part gets there)
NODES_MIN = 10  # Chebyshev nodes per piece at small loads (with the next: section loads, energy to ~1e-10, checked)
NODES_PER_WAVE = 3  # more nodes per piece per unit of √(P·L²/EI)·(piece length/L)


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


@dataclass(frozen=True)
class _Grid:
    """Chebyshev–Lobatto nodes along the beam, piece by piece, and the matrices of the integral equations.

    s : np.ndarray — node positions s̃ = s/L, shape (N,) (a piece's end and the next one's start: two nodes)
    first : tuple[int, ...] — index of each piece's first node
    rules : tuple[Rule, ...] — each piece's Chebyshev rule
    integrate : np.ndarray — values at the nodes → ∫₀^s̃ f ds̃ at the nodes, shape (N, N); its last row is the
        quadrature over the whole beam
    stiffness : np.ndarray — e = EI/EI_ref at the nodes, shape (N,)
    shear_compliance : np.ndarray — φ = EI_ref/(L²·b·S) at the nodes, shape (N,)
    unit_rotation : np.ndarray — ∫₀^s̃ 1/e, the rotation a unit moment M̃ = 1 gives, shape (N,)
    bending : np.ndarray — f → ∫₀^s̃ (1/e)·∫₀^t f, the rotation from the moment of a distributed f, shape (N, N)
    """

    s: np.ndarray
    first: tuple[int, ...]
    rules: tuple[Rule, ...]
    integrate: np.ndarray
    stiffness: np.ndarray
    shear_compliance: np.ndarray
    unit_rotation: np.ndarray
    bending: np.ndarray


def _grid(model: Elastica, heaviest: float) -> _Grid:
    """The nodes for loads up to the load index ``heaviest`` (of the most flexible section): more nodes per piece
    as the shape's wavelength, of order 1/√(P·L²/EI) of the span (the pendulum analogy), shortens."""
    beam = model.beam
    c_root = model.pieces[0].flexural_compliance
    rules = tuple(rule(min(NODES_MIN + int(np.ceil(NODES_PER_WAVE * np.sqrt(heaviest) * (p.s1 - p.s0))), MAX_NODES))
                  for p in model.pieces)
    first = tuple(int(i) for i in np.cumsum([0] + [r.x.size for r in rules[:-1]]))
    N = sum(r.x.size for r in rules)
    s, integrate = np.zeros(N), np.zeros((N, N))
    compliance, shear = np.zeros(N), np.zeros(N)
    for p, r, i in zip(model.pieces, rules, first):
        half, mine = 0.5 * (p.s1 - p.s0), slice(i, i + r.x.size)
        s[mine] = p.s0 + half * (r.x + 1.0)
        integrate[mine, mine] = half * r.integrate
        integrate[i + r.x.size:, mine] = half * r.integrate[-1]  # the nodes beyond carry the whole piece's integral
        compliance[mine], shear[mine] = p.flexural_compliance, p.shear_stiffness
    width = beam.width_root + (beam.width_tip - beam.width_root) * s
    stiffness = (width / beam.width_root) * (c_root / compliance)
    shear_compliance = model.bending_ref / (model.length**2 * width * shear)
    return _Grid(s, first, rules, integrate, stiffness, shear_compliance, integrate @ (1.0 / stiffness),
                 integrate @ (integrate / stiffness[:, None]))


def _axis_rates(grid: _Grid, load: np.ndarray, theta: np.ndarray):
    """ξ' = cos θ − γ·sin θ and η' = sin θ + γ·cos θ with γ = P̃·φ·cos θ (Reissner 1972, no axial strain), and
    dξ'/dθ; load (J,), theta (J, N)."""
    P = load[:, None]
    cos, sin = np.cos(theta), np.sin(theta)
    gamma = P * grid.shear_compliance * cos
    return cos - gamma * sin, sin + gamma * cos, -sin - P * grid.shear_compliance * np.cos(2.0 * theta)


def _newton(grid: _Grid, cantilever: bool, load: np.ndarray, theta: np.ndarray, root_moment: np.ndarray):
    """Newton's method on the collocated integral equations, all levels at once; returns θ (J, N), M̃₀ (J,) and
    whether each level converged (J,).

    Notes
    -----
    Unknowns: θ at the nodes and the root moment M̃₀. Equations (the integral form of θ' = M̃/e with θ(0) = 0,
    M̃ = M̃₀ − P̃·ξ, ξ = ∫₀^s̃ ξ'):  θ − M̃₀·∫1/e + P̃·∫(1/e)∫ξ'(θ) = 0 at every node, and the end condition
    M̃(1) = M̃₀ − P̃·ξ(1) = 0 (cantilever) or θ(1) = 0 (guided). The Jacobian is exact (dξ'/dθ at each node); a
    step that would turn a node by more than MAX_STEP is shortened to it. Newton converges quadratically: it stops
    once a full step is below NEWTON_TOLERANCE, the error left being of the order of its square.
    """
    J, N = theta.shape
    P = load[:, None]
    whole = grid.integrate[-1]
    system = np.zeros((J, N + 1, N + 1))
    system[:, :N, N] = -grid.unit_rotation
    if cantilever:
        system[:, N, N] = 1.0
    else:
        system[:, N, N - 1] = 1.0
    residual = np.empty((J, N + 1))
    for _ in range(MAX_NEWTON):
        rate, _, slope = _axis_rates(grid, load, theta)
        residual[:, :N] = theta - root_moment[:, None] * grid.unit_rotation + P * (rate @ grid.bending.T)
        system[:, :N, :N] = grid.bending * (P * slope)[:, None, :]
        system[:, np.arange(N), np.arange(N)] += 1.0
        if cantilever:
            residual[:, N] = root_moment - load * (rate @ whole)
            system[:, N, :N] = -(P * slope) * whole
        else:
            residual[:, N] = theta[:, -1]
        step = np.linalg.solve(system, residual[..., None])[..., 0]
        largest = np.abs(step[:, :N]).max(axis=1)
        shrink = np.minimum(1.0, MAX_STEP / np.maximum(largest, 1e-300))
        theta = theta - shrink[:, None] * step[:, :N]
        root_moment = root_moment - shrink * step[:, N]
        converged = (largest <= NEWTON_TOLERANCE) & (np.abs(step[:, N]) <= NEWTON_TOLERANCE * np.maximum(load, 1.0))
        if converged.all():
            break
    return theta, root_moment, converged


def _solved(load: np.ndarray, theta: np.ndarray, root_moment: np.ndarray, converged: np.ndarray):
    """θ and M̃₀ of levels that all converged; else the refusal, naming the heaviest level that did not."""
    if not converged.all():
        worst = float(np.max(load[~converged]))
        raise InputError(f"the elastica's end condition could not be met at an end load of {worst:.3g} EI/L² "
                         "(Newton's method did not converge): the load lies beyond what this model solves")
    return theta, root_moment


def _linear_shape(grid: _Grid, cantilever: bool, load: np.ndarray):
    """The small-load shape as a first guess: ξ = s̃, so θ = M̃₀·∫1/e − P̃·∫(1/e)·s̃ (Euler–Bernoulli), with
    M̃₀ = P̃ (cantilever: M̃(1) = 0) or from θ(1) = 0 (guided); returns θ (J, N), M̃₀ (J,)."""
    lever = grid.bending @ np.ones(grid.s.size)  # ∫(1/e)·s̃
    root = load * (1.0 if cantilever else lever[-1] / grid.unit_rotation[-1])
    return root[:, None] * grid.unit_rotation - load[:, None] * lever, root


def _from_near(model: Elastica, grid: _Grid, load: np.ndarray, near: Shapes):
    """A first guess from solved levels around each load (linear between them in the load, in s̃ between stations)."""
    forces = load * model.load_scale()
    j = np.clip(np.searchsorted(near.force, forces) - 1, 0, near.force.size - 2)
    t = ((forces - near.force[j]) / (near.force[j + 1] - near.force[j]))[:, None]
    theta_at = near.theta[j] * (1.0 - t) + near.theta[j + 1] * t
    order = np.argsort(near.s, kind="stable")
    s = near.s[order] / model.length
    theta = np.stack([np.interp(grid.s, s, row[order]) for row in theta_at])
    root = int(order[0])
    moment = near.moment[j, root] * (1.0 - t[:, 0]) + near.moment[j + 1, root] * t[:, 0]
    return theta, moment / (model.bending_ref / model.length)


def _flexibility(model: Elastica) -> float:
    """The largest EI_ref/EI along the beam [-]: P̃ times this is the load index of the most flexible section."""
    beam = model.beam
    least_width = min(beam.width_root, beam.width_tip) / beam.width_root
    c_root = model.pieces[0].flexural_compliance
    return max(p.flexural_compliance / c_root for p in model.pieces) / least_width


def _shapes_at_nodes(model: Elastica, grid: _Grid, size: np.ndarray, near: Shapes | None):
    """θ (J, N) and M̃₀ (J,) at the load magnitudes ``size`` ≥ 0 (dimensionless).

    Notes
    -----
    Newton's method converges to the stable shape from the small-load shape while the load index P·L²/EI stays
    below DIRECT_LOAD anywhere (checked on a uniform cantilever: it does up to 6 and not from 8, where the guess
    is too far and the iteration wanders; the equations also hold looped, unstable shapes). Heavier levels are
    reached by continuation: in batches, each up to twice the last solved load, starting from its shape. Solved levels
    (``near``) around every load give a closer guess instead (a level that does not converge from it to a shape
    turned less than 90° everywhere is solved as if they were not given).
    """
    cantilever = model.beam.support == "cantilever"
    if near is not None and near.force.size > 1 and np.all(size * model.load_scale() <= near.force.max()):
        theta, root, converged = _newton(grid, cantilever, size, *_from_near(model, grid, size, near))
        again = ~converged | (np.abs(theta).max(axis=1) >= 0.5 * np.pi)  # or on a looped shape (see ``solve``)
        if again.any():
            theta[again], root[again] = _shapes_at_nodes(model, grid, size[again], None)
        return theta, root
    theta, root = np.zeros((size.size, grid.s.size)), np.zeros(size.size)
    safe = DIRECT_LOAD / _flexibility(model)
    direct = size <= safe
    if direct.any():
        theta[direct], root[direct] = _solved(size[direct], *_newton(grid, cantilever, size[direct],
                                                                     *_linear_shape(grid, cantilever, size[direct])))
    heavy = np.flatnonzero(~direct)
    heavy = heavy[np.argsort(size[heavy])]
    if not heavy.size:
        return theta, root
    last = int(np.argmax(np.where(direct, size, -1.0)))
    if direct[last] and size[last] >= 0.5 * safe:
        last_load, last_theta, last_root = size[last], theta[last], root[last]
    else:  # a level at the safe load to start from
        start = np.array([safe])
        last_theta, last_root = _solved(start, *_newton(grid, cantilever, start, *_linear_shape(grid, cantilever,
                                                                                                start)))
        last_load, last_theta, last_root = safe, last_theta[0], last_root[0]
    while heavy.size:
        batch = heavy[size[heavy] <= 2.0 * last_load]
        loads = size[batch] if batch.size else np.array([2.0 * last_load])  # a step on the way
        guess_theta = np.repeat(last_theta[None], loads.size, axis=0)
        t, r = _solved(loads, *_newton(grid, cantilever, loads, guess_theta, last_root * loads / last_load))
        theta[batch], root[batch] = t[:batch.size], r[:batch.size]
        last_load, last_theta, last_root = loads[-1], t[-1], r[-1]
        heavy = heavy[batch.size:]
    return theta, root


def _interpolation(model: Elastica, grid: _Grid, stations: np.ndarray, piece_of: np.ndarray) -> np.ndarray:
    """The matrix from node values to station values, each station from its own piece's polynomial, shape (n, N)."""
    out = np.zeros((stations.size, grid.s.size))
    for k, (p, r, i) in enumerate(zip(model.pieces, grid.rules, grid.first)):
        mine = np.flatnonzero(piece_of == k)
        t = np.clip(2.0 * (stations[mine] - p.s0) / (p.s1 - p.s0) - 1.0, -1.0, 1.0)
        out[mine, i:i + r.x.size] = r.interpolation(t)
    return out


def solve(model: Elastica, forces: np.ndarray, stations: np.ndarray, piece_of: np.ndarray,
          near: Shapes | None = None) -> Shapes:
    """The elastica at each end load, sampled at the stations.

    forces : np.ndarray — end loads P [N], any sign, shape (J,)
    stations : np.ndarray — arc length of each station from the clamp [m], shape (n,) (a discontinuity twice)
    piece_of : np.ndarray — the segment (piece) index of each station, shape (n,)
    near : Shapes | None — solved levels, ascending in force, whose range holds every force here: Newton's method
        starts from the shapes interpolated between them

    Notes
    -----
    The problem is odd in the load (the section law is symmetric): |P| is solved and θ, M̃₀ take its sign.
    Positions ξ = ∫ξ', η = ∫η' and the energy per EI_ref/L, Ũ = ∫M̃²/(2e) + φ·(P̃·cos θ)²/2, are integrated by
    the same Chebyshev rules (spectral accuracy).
    """
    forces = np.asarray(forces, float)
    L = model.length
    load = forces / model.load_scale()
    size = np.abs(load)
    heaviest = float(size.max(initial=0.0)) * _flexibility(model)
    if heaviest > MAX_LOAD:
        raise InputError(
            f"an end load of {heaviest:.3g} EI/L² (EI of the most flexible section) is beyond what the elastica here "
            f"solves ({MAX_LOAD:g}); no structural part strains so little under such a load — check the drive "
            "values and their unit"
        )
    grid = _grid(model, heaviest)
    theta, root = _shapes_at_nodes(model, grid, size, near)
    if np.abs(theta).max(initial=0.0) >= 0.5 * np.pi:
        raise InputError("the elastica's solution turned a section past 90° from the clamp: not the stable shape "
                         "under an end load of fixed direction; the load lies beyond what this model solves")
    sign = np.where(load < 0, -1.0, 1.0)
    theta, root = theta * sign[:, None], root * sign
    rate, lift, _ = _axis_rates(grid, load, theta)
    xi, eta = rate @ grid.integrate.T, lift @ grid.integrate.T
    moment = root[:, None] - load[:, None] * xi
    bending = 0.5 * moment**2 / grid.stiffness
    shear = 0.5 * grid.shear_compliance * (load[:, None] * np.cos(theta)) ** 2
    at = _interpolation(model, grid, np.asarray(stations, float) / L, np.asarray(piece_of)).T
    scale = model.bending_ref / L  # M = M̃·EI_ref/L, U = Ũ·EI_ref/L
    theta_at = theta @ at
    return Shapes(
        force=forces,
        deflection=eta[:, -1] * L,
        pull_in=(1.0 - xi[:, -1]) * L,
        tip_rotation=theta[:, -1],
        energy=(bending + shear) @ grid.integrate[-1] * scale,
        bending_energy=bending @ grid.integrate[-1] * scale,
        s=np.asarray(stations, float),
        x=xi @ at * L,
        y=eta @ at * L,
        theta=theta_at,
        moment=moment @ at * scale,
        shear=forces[:, None] * np.cos(theta_at),
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
