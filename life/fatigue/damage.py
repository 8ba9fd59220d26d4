"""Damage at every location: cycle extremes mapped to local stresses, cycles to failure, Miner sums.

A location is one (station, ply, face, mode). Mechanics is linear, so each location's local quantity
(σ1 or ε1 for the fibre direction, σ2 or ε2 transverse, τ12 or γ12 in-plane shear, τxz interlaminar)
is ``response × drive``. The drive is counted once; each counted cycle (min, max) is mapped to every
location by its extremes — on the compression side the sign flips, so the local minimum comes from the
drive maximum (docs/design.md, data flow).

Palmgren–Miner: D = Σ nᵢ/Nᵢ per block of the duty, failure when D reaches the Miner limit
(Miner 1945, J. Appl. Mech. 12; the limit 1, or 0.1–0.5 in design practice: common practice).
"""
from __future__ import annotations

from collections.abc import Mapping, Sequence
from dataclasses import dataclass

import numpy as np

from flexcycle.fatigue.curves import curve_from_mapping
from flexcycle.fatigue.meanstress import FatigueModel, fatigue_model
from flexcycle.mechanics.beam import BeamResponse
from flexcycle.mechanics.materials import Material
from flexcycle.spectra.cycles import Cycles
from flexcycle.spectra.merging import merge_identical

# Fatigue modes, the Material.fatigue table that holds each one's curves, and the ply-axis component.
MODE_TABLES = {
    "fibre": "fatigue",
    "transverse": "transverse_fatigue",
    "shear": "shear_fatigue",
    "interlaminar": "interlaminar_fatigue",
}
FACES = ("bottom", "top", "interior")
FIRST_LOAD_FAILURE = 0.5  # cycles to failure given to a cycle beyond static strength: it fails on first loading
# A local stress below this fraction of the strength is round-off of a component that theory makes zero
# (σ2, τ12 of a 0° ply in a narrow beam come out near 1e-20 of σ1); it does no damage. Without this a
# log-linear curve, which runs out at N = 10^(1/b) however small the amplitude, would count it.
NEGLIGIBLE = 1e-9
CHUNK = 32_768  # local (location × cycle) pairs evaluated at once: 256 kB temporaries, which stay in cache
# (measured: 2.5x faster than 500 000 pairs at once, whose fresh 4 MB arrays page-fault at every call)
EXACT_PAIRS = 20_000_000  # location × cycle pairs evaluated one by one; beyond, cycles are aggregated
BRACKET_LEVELS = 256  # drive levels across the duty's span for the bracketing grid (aggregation at scale)
BRACKET_RULES = ("goodman", "gerber", "none")  # rules whose lives fall when a local cycle's interval grows


@dataclass(frozen=True)
class Locations:
    """Flat table of the locations that are checked, k entries.

    station : np.ndarray — station index, shape (k,)
    ply : np.ndarray — 0-based ply index in the design's whole stack, shape (k,)
    face : np.ndarray — index into FACES (bottom = smaller z, the tension side under positive drive), shape (k,)
    mode : np.ndarray — reported mode name per location (``fibre-tension``, ``fibre-compression``,
        ``transverse``, ``shear``, ``interlaminar``, ``core-shear``), shape (k,) str
    family : np.ndarray — the fatigue mode family (a key of MODE_TABLES), shape (k,) str
    z : np.ndarray — location through the thickness of the local laminate [m], shape (k,)
    response : np.ndarray — local quantity per unit drive force, in the basis of the location's model
        (stress [Pa/N] or strain [1/N]), shape (k,)
    model : np.ndarray — index into ``models`` (−1: no curve, checked statically only), shape (k,)
    models : tuple[FatigueModel, ...]
    """

    station: np.ndarray
    ply: np.ndarray
    face: np.ndarray
    mode: np.ndarray
    family: np.ndarray
    z: np.ndarray
    response: np.ndarray
    model: np.ndarray
    models: tuple[FatigueModel, ...]


def _strengths(material: Material, family: str, basis: str) -> tuple[float, float] | None:
    """Static strengths (tension, compression magnitudes) of a mode in the curve's basis."""
    m = material
    if family == "fibre":
        return (m.Xt, m.Xc) if basis == "stress" else (m.eps1t, m.eps1c)
    if family == "transverse":
        return (m.Yt, m.Yc) if basis == "stress" else (m.Yt / m.E2, m.Yc / m.E2)
    if family == "shear":
        return (m.S12, m.S12) if basis == "stress" else (m.S12 / m.G12, m.S12 / m.G12)
    if m.S13 is None:
        return None
    return (m.S13, m.S13) if basis == "stress" else (m.S13 / m.G13, m.S13 / m.G13)


@dataclass(frozen=True)
class ModelSet:
    """Fatigue models per (material name, mode family), and the notes made while building them."""

    models: tuple[FatigueModel, ...]
    index: Mapping[tuple[str, str], int]
    warnings: tuple[str, ...]


def build_models(materials: Sequence[Material], rule: str) -> ModelSet:
    """One fatigue model per material and mode that has a curve; a note for every mode that has none."""
    models: list[FatigueModel] = []
    index: dict[tuple[str, str], int] = {}
    notes: list[str] = []
    for mat in materials:
        for family, table in MODE_TABLES.items():
            if mat.kind == "core" and family != "interlaminar":
                continue  # a core carries shear; its in-plane stresses are checked statically
            raw = mat.fatigue.get(table, ())
            label = "core shear" if mat.kind == "core" else family
            if not raw:
                notes.append(f"{mat.name}: no {label} fatigue curve; {label} is checked statically only")
                continue
            where = f"material {mat.name} [{table}]"
            curves = [curve_from_mapping(c, where) for c in raw]
            strengths = _strengths(mat, family, curves[0].basis)
            if strengths is None:
                notes.append(f"{mat.name}: an interlaminar curve but no S13 strength; interlaminar checked by nothing")
                continue
            use_rule = rule
            if rule == "cld" and len(curves) < 2:
                use_rule = "goodman"
                notes.append(f"{mat.name}: one {label} curve cannot make a constant-life diagram; Goodman used for it")
            elif rule != "cld" and len(curves) > 1:
                pick = min(curves, key=lambda c: abs(c.R + 1.0))
                notes.append(
                    f"{mat.name}: {len(curves)} {label} curves given but mean_stress = {rule!r}; the curve at "
                    f"R = {pick.R:g} is used (mean_stress = \"cld\" uses them all)"
                )
                curves = [pick]
            index[(mat.name, family)] = len(models)
            models.append(fatigue_model(use_rule, curves, strengths[0], strengths[1], where))
    return ModelSet(tuple(models), index, tuple(notes))


def locations(resp: BeamResponse, models: ModelSet, dominant_sign: float) -> Locations:
    """Every (station, ply, face, mode) of the response map, with its local response per unit drive force.

    dominant_sign : float — sign of the drive extreme of largest magnitude; names the fibre mode of a
        location tension or compression by the sign of its stress at that extreme
    """
    n, p = resp.present.shape
    st, pl, fc = np.meshgrid(np.arange(n), np.arange(p), np.arange(2), indexing="ij")
    face_mask = np.repeat(resp.present[:, :, None], 2, axis=2)
    parts = {k: [] for k in ("station", "ply", "face", "mode", "family", "z", "response", "model")}

    def add(mask, station, ply, face, mode, family, z, response, model):
        parts["station"].append(station[mask])
        parts["ply"].append(ply[mask])
        parts["face"].append(face[mask])
        parts["mode"].append(np.broadcast_to(np.asarray(mode, dtype=object), mask.shape)[mask])
        parts["family"].append(np.full(mask.sum(), family, object))
        parts["z"].append(z[mask])
        parts["response"].append(response[mask])
        parts["model"].append(model[mask])

    plies = resp.beam.plies
    is_core = np.array([ply.material.kind == "core" for ply in plies])
    components = {"fibre": 0, "transverse": 1, "shear": 2}
    # Strain basis: the fibre direction uses the ply strain ε1 (strain-life data are measured so; Burton et al.,
    # p. 387). Transverse and shear use σ2/E2 and τ12/G12, the strain their stress alone would cause, matching
    # the strain-basis strengths Yt/E2, S12/G12: ε2 of a 0° ply carries Poisson contraction with no stress.
    moduli = {
        "transverse": np.array([ply.material.E2 for ply in plies])[None, :, None],
        "shear": np.array([ply.material.G12 for ply in plies])[None, :, None],
    }
    for family, comp in components.items():
        model = np.full((n, p, 2), -1)
        basis_strain = np.zeros((n, p, 2), bool)
        for j, ply in enumerate(plies):
            k = models.index.get((ply.material.name, family), -1)
            model[:, j, :] = k
            if k >= 0 and models.models[k].curves[0].basis == "strain":
                basis_strain[:, j, :] = True
        strain = resp.strain_12[..., 0] if family == "fibre" else resp.stress_12[..., comp] / moduli[family]
        response = np.where(basis_strain, strain, resp.stress_12[..., comp])
        mask = face_mask & ~is_core[None, :, None]
        if family == "fibre":
            mode = np.where(response * dominant_sign >= 0, "fibre-tension", "fibre-compression")
        else:
            mode = family
        add(mask, st, pl, fc, mode, family, resp.z, response, model)

    # interlaminar shear at both faces of every ply and at its interior peak (the neutral axis, if inside)
    model = np.full((n, p), -1)
    for j, ply in enumerate(plies):
        model[:, j] = models.index.get((ply.material.name, "interlaminar"), -1)
    strain_basis = np.array(
        [model[0, j] >= 0 and models.models[model[0, j]].curves[0].basis == "strain" for j in range(p)]
    )
    # strain basis: γxz = τxz/G_xz with G_xz = G13 cos²θ + G23 sin²θ, the ply's shear modulus in the x–z plane
    # (as in flexcycle.mechanics.laminate.transverse_shear_stiffness; Jones, 2nd ed., sec. 2.6)
    theta = np.radians([ply.angle for ply in plies])
    g_xz = np.array([ply.material.G13 for ply in plies]) * np.cos(theta) ** 2 + \
        np.array([ply.material.G23 for ply in plies]) * np.sin(theta) ** 2
    tau_faces = np.where(strain_basis[None, :, None], resp.tau_xz / g_xz[None, :, None], resp.tau_xz)
    tau_peak = np.where(strain_basis[None, :], resp.tau_xz_peak / g_xz[None, :], resp.tau_xz_peak)
    ply_mode = np.where(is_core, "core-shear", "interlaminar").astype(object)
    # the laminate's outer faces carry no τxz: skip the bottom face of the lowest and the top of the highest ply
    first = np.argmax(resp.present, axis=1)
    last = p - 1 - np.argmax(resp.present[:, ::-1], axis=1)
    outer = np.zeros((n, p, 2), bool)
    outer[np.arange(n), first, 0] = True
    outer[np.arange(n), last, 1] = True
    add(face_mask & ~outer, st, pl, fc, np.broadcast_to(ply_mode[None, :, None], (n, p, 2)), "interlaminar",
        resp.z, tau_faces, np.repeat(model[:, :, None], 2, axis=2))
    interior = resp.present & (resp.z_tau_peak > resp.z[..., 0]) & (resp.z_tau_peak < resp.z[..., 1])
    add(interior, st[..., 0], pl[..., 0], np.full((n, p), 2), np.broadcast_to(ply_mode[None, :], (n, p)),
        "interlaminar", resp.z_tau_peak, tau_peak, model)

    cat = {k: np.concatenate(v) for k, v in parts.items()}
    return Locations(
        station=cat["station"].astype(int),
        ply=cat["ply"].astype(int),
        face=cat["face"].astype(int),
        mode=cat["mode"].astype(str),
        family=cat["family"].astype(str),
        z=cat["z"].astype(float),
        response=cat["response"].astype(float),
        model=cat["model"].astype(int),
        models=models.models,
    )


@dataclass(frozen=True)
class DamageResult:
    """Miner damage per block of the duty at every location.

    damage : np.ndarray — D per block, shape (k,); a cycle beyond static strength counts as failing at its
        first loading (N = ½, so D stays finite; the estimate reports a zero life for it); 0 for locations
        without a curve or below the fatigue limit
    static_failure : np.ndarray — a cycle of the duty exceeds the static strength there, shape (k,) bool
    amplitude : np.ndarray — largest local amplitude over the duty, shape (k,) [Pa or -]
    mean : np.ndarray — local mean of that cycle, shape (k,) [Pa or -]
    utilisation : np.ndarray — largest local value over the duty as a fraction of the model's static strength,
        max(hi/Xt, −lo/Xc), shape (k,) [-]; 0 for locations without a fatigue model
    exact : np.ndarray | None — None when ``damage`` is exact everywhere; at scale (see ``miner_damage``) where
        it was evaluated exactly, shape (k,) bool: elsewhere ``damage`` is an upper bound of the damage per block
    aggregation : str — how the cycles were evaluated: "each cycle", "identical cycles merged" or "bracketed"
    """

    damage: np.ndarray
    static_failure: np.ndarray
    amplitude: np.ndarray
    mean: np.ndarray
    utilisation: np.ndarray
    exact: np.ndarray | None = None
    aggregation: str = "each cycle"


def miner_damage(locs: Locations, cycles: Cycles, force_per_drive: float, stress_factor: float) -> DamageResult:
    """Damage per block at every location for the counted drive cycles.

    force_per_drive : float — drive force per unit drive (1, or the stiffness for a deflection drive) [N per drive unit]
    stress_factor : float — partial factor on every local stress or strain [-]

    Notes
    -----
    Local extremes of a cycle (dlo, dhi): r·dlo and r·dhi, sorted (r < 0 flips them), r = response × force per
    drive × stress factor; N from the location's fatigue model; D = Σ count/N (Palmgren–Miner). Every location
    and cycle is evaluated in numpy, in blocks of CHUNK pairs; no Python loop runs over cycles.

    At scale (more than EXACT_PAIRS location × cycle pairs) the cycles are aggregated, exactly first:
    identical extremes are merged (counts summed), which changes no damage beyond round-off. If that is still
    too many, the damage is bounded from above (rules in BRACKET_RULES; "cld" stays exact): every cycle is
    widened to the grid of BRACKET_LEVELS drive levels across the duty's span (min rounded down, max up) and
    the widened cycles merged on the grid. Under these rules a local cycle whose interval contains another's
    has no more cycles to failure (the tests check it on every rule and library material), and the map from
    drive to local stress is linear, so at every location D <= D(widened). The location of the largest upper
    bound is then evaluated exactly, cycle by cycle; its damage D* is at most the largest damage of all, so
    every location whose upper bound reaches D* — the critical one among them — and every location where a
    widened cycle passes the static strength is evaluated exactly too: the life, the critical location and
    the static-failure flags are exact. The others report the upper bound (conservative); ``exact`` says which.

    Locations with the same model and the same response have the same damage: each is evaluated once.
    """
    k = locs.response.size
    amp = np.zeros(k)
    mean = np.zeros(k)
    scale = locs.response * force_per_drive * stress_factor
    dlo, dhi = cycles.lo, cycles.hi
    nc = dlo.size
    # the largest local amplitude is that of the largest drive range (linearity)
    if nc:
        big = int(np.argmax(dhi - dlo))
        amp = np.abs(scale) * (dhi[big] - dlo[big]) / 2.0
        mean = scale * (dhi[big] + dlo[big]) / 2.0 + 0.0  # + 0.0: no "-0" in the outputs
    peak_drive = max(float(np.abs(dlo).max()), float(np.abs(dhi).max())) if nc else 0.0
    utilisation = np.zeros(k)
    rows = np.zeros(k, bool)  # locations with a curve and a stress that is not round-off
    for m, model in enumerate(locs.models):
        mine = locs.model == m
        if nc:
            ends = scale[mine, None] * np.array([dlo.min(), dhi.max()])[None, :]
            utilisation[mine] = np.maximum(ends.max(axis=1) / model.Xt, -ends.min(axis=1) / model.Xc)
        rows |= mine & ~(np.abs(scale) * peak_drive < NEGLIGIBLE * min(model.Xt, model.Xc))
    rows = np.flatnonzero(rows)
    aggregation = "each cycle"
    if rows.size * nc > EXACT_PAIRS:
        cycles = merge_identical(cycles)
        aggregation = "identical cycles merged"
    bracket = rows.size * cycles.lo.size > EXACT_PAIRS and cycles.hi.max() > cycles.lo.min() and all(locs.models[m].rule in BRACKET_RULES
                                                               for m in np.unique(locs.model[rows]))
    if not bracket:
        damage, failed = _damage(locs, rows, scale, cycles)
        return DamageResult(damage, failed, amp, mean, utilisation, None, aggregation)
    upper, failed_wide = _damage(locs, rows, scale, _widened(cycles))
    top = rows[[int(np.argmax(upper[rows]))]]
    damage_top, failed_top = _damage(locs, top, scale, cycles)
    reached = damage_top[top[0]]  # D* <= the largest damage of all
    exact = rows[(upper[rows] >= reached) | failed_wide[rows]]
    rest = exact[exact != top[0]]  # the top location is evaluated already
    damage_exact, failed = _damage(locs, rest, scale, cycles)
    damage_exact[top], failed[top] = damage_top[top], failed_top[top]
    upper[exact] = damage_exact[exact]
    evaluated = np.zeros(k, bool)
    evaluated[exact] = True
    return DamageResult(upper, failed, amp, mean, utilisation, evaluated, "bracketed")


def _widened(cycles: Cycles) -> Cycles:
    """The cycles widened to a grid of BRACKET_LEVELS drive levels (min down, max up), merged on the grid.

    The grid runs from the smallest to the largest drive of the cycles; a widened cycle contains the cycle.
    """
    base, top = float(cycles.lo.min()), float(cycles.hi.max())
    step = (top - base) / BRACKET_LEVELS
    grid = lambda i: np.minimum(base + i * step, top)  # noqa: E731 — level i of the grid [drive unit]
    # the level at or below lo and at or above hi (checked against the drive itself: no round-off inside)
    i_lo = np.floor((cycles.lo - base) / step)
    i_lo -= grid(i_lo) > cycles.lo
    i_hi = np.ceil((cycles.hi - base) / step)
    i_hi += grid(i_hi) < cycles.hi
    return merge_identical(Cycles(np.minimum(grid(i_lo), cycles.lo), np.maximum(grid(i_hi), cycles.hi), cycles.count))


def _damage(locs: Locations, rows: np.ndarray, scale: np.ndarray, cycles: Cycles) -> tuple[np.ndarray, np.ndarray]:
    """Miner damage and static-failure flags at the locations ``rows`` (others 0 and False), cycle by cycle."""
    k = locs.response.size
    damage = np.zeros(k)
    failed = np.zeros(k, bool)
    dlo, dhi, count = cycles.lo, cycles.hi, cycles.count
    nc = dlo.size
    if nc == 0 or rows.size == 0:
        return damage, failed
    for m, model in enumerate(locs.models):
        mine = rows[locs.model[rows] == m]
        if not mine.size:
            continue
        unique, back = np.unique(scale[mine], return_inverse=True)  # equal response, equal damage
        d = np.zeros(unique.size)
        f = np.zeros(unique.size, bool)
        rows_at_once, cycles_at_once = max(1, CHUNK // nc), min(nc, CHUNK)
        for r0 in range(0, unique.size, rows_at_once):
            s = unique[r0 : r0 + rows_at_once, None]
            for c0 in range(0, nc, cycles_at_once):
                c = slice(c0, c0 + cycles_at_once)
                a, b = s * dlo[None, c], s * dhi[None, c]
                N = model.cycles_to_failure(np.minimum(a, b), np.maximum(a, b))
                zero = N <= 0
                f[r0 : r0 + rows_at_once] |= zero.any(axis=1)
                d[r0 : r0 + rows_at_once] += (count[None, c] / np.where(zero, FIRST_LOAD_FAILURE, N)).sum(axis=1)
        damage[mine] = d[back]
        failed[mine] = f[back]
    return damage, failed


def cycle_lives(locs: Locations, k: int, cycles: Cycles, force_per_drive: float, stress_factor: float) -> np.ndarray:
    """Cycles to failure of every counted cycle at location ``k`` (inf without a curve) [-]."""
    m = int(locs.model[k])
    if m < 0:
        return np.full(cycles.lo.size, np.inf)
    s = locs.response[k] * force_per_drive * stress_factor
    a, b = s * cycles.lo, s * cycles.hi
    return locs.models[m].cycles_to_failure(np.minimum(a, b), np.maximum(a, b))
