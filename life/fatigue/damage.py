"""Damage at every location: cycle extremes mapped to local stresses, cycles to failure, Miner sums.

A location is one (station, ply, face, mode). Under linear mechanics each location's local quantity
(σ1 or ε1 for the fibre direction, σ2 or ε2 transverse, τ12 or γ12 in-plane shear, τxz interlaminar)
is ``response × drive``. Under large deflection (the elastica) it is a monotonic, tabulated function of the
drive (``DriveMap``): the section's moment and normal shear force grow less than in proportion with it.
Either way the drive is counted once; each counted cycle (min, max) is mapped to every location by its
extremes — on the compression side the sign flips, so the local minimum comes from the drive maximum
(docs/design.md, data flow); a monotonic map sends the drive's extremes to the local extremes.

Palmgren–Miner: D = Σ nᵢ/Nᵢ per block of the duty, failure when D reaches the Miner limit
(Miner 1945, J. Appl. Mech. 12; the limit 1, or 0.1–0.5 in design practice: common practice).
"""
from __future__ import annotations

import weakref
from collections.abc import Mapping, Sequence
from dataclasses import dataclass
from functools import cached_property

import numpy as np

from flexcycle.fatigue.curves import curve_from_mapping
from flexcycle.fatigue.intervals import Intervals
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
WIDEN_BLOCK = 1 << 18  # cycles widened at once (``_widened``): 2 MB temporaries, which stay in cache
REFINE_PAIRS = 2_000_000  # beyond this many location × cycle pairs left to evaluate exactly, bound them again
REFINE = 8  # ... on a grid this many times finer
TOP_PAIRS = 200_000  # the worst pass: beyond this many top × cycle pairs the tops are bounded first (bracketed)
TOP_LEVELS = 64  # ... on a grid of this many drive levels (coarse: only the tops whose bound reaches D* count)


@dataclass(frozen=True)
class DriveMap:
    """Every location's local quantity as a function of the drive (large deflection), through the section loads.

    A location's local quantity is its response per unit section load times that load (the section law stays
    linear): the bending moment at its station for the in-plane modes, the shear force normal to the section for
    the interlaminar one. The section loads are tabulated against the drive, linear between levels.

    drive : np.ndarray — drive levels, ascending, shape (J,) [N or m]
    loads : np.ndarray — the section loads ("channels": each station's moment [N·m] and shear force [N]) at each
        level, shape (c, J); monotonic in the drive (``flexcycle.mechanics.drive_table.tabulate`` checks them)
    channel : np.ndarray — the channel of each location, shape (k,)
    unit : np.ndarray — each location's local quantity per unit load of its channel, shape (k,) [Pa or - per N·m or N]
    """

    drive: np.ndarray
    loads: np.ndarray
    channel: np.ndarray
    unit: np.ndarray

    def loads_at(self, drive: np.ndarray, channels: np.ndarray | None = None) -> np.ndarray:
        """The section loads at the drives, shape (c, len(drive)) — or of the given ``channels`` only, shape
        (len(channels), len(drive)) — linear between levels."""
        d = np.asarray(drive, float)
        j = self._intervals.find(d)  # np.clip(np.searchsorted(self.drive, d, "right") - 1, 0, J - 2), faster
        t = (d - self.drive[j]) / self._intervals.width[j]
        loads = self.loads if channels is None else self.loads[channels]
        return loads[:, j] * (1.0 - t) + loads[:, j + 1] * t

    @cached_property
    def _intervals(self) -> Intervals:
        return Intervals(self.drive)

    def at(self, rows: np.ndarray, drive: np.ndarray) -> np.ndarray:
        """Local quantity of the locations ``rows`` at the drives, shape (len(rows), len(drive)) [Pa or -]."""
        used, channel = np.unique(self.channel[rows], return_inverse=True)  # only the channels these rows read
        return self.unit[rows, None] * self.loads_at(drive, used)[channel.reshape(-1)]


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
    drive_map : DriveMap | None — large deflection: the local quantities against the drive, which then govern
        (``response`` stays the small-deflection slope); None under linear theory
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
    drive_map: DriveMap | None = None

    def local(self, rows: np.ndarray, drive: np.ndarray, force_per_drive: float, stress_factor: float) -> np.ndarray:
        """Local quantity of the locations ``rows`` at the drives, shape (len(rows), len(drive)) [Pa or -].

        force_per_drive : float — linear theory: drive force per unit drive [N per drive unit]; unused with a map
        stress_factor : float — partial factor on every local stress or strain [-]
        """
        rows = np.asarray(rows)
        drive = np.asarray(drive, float)
        if self.drive_map is None:
            return (self.response[rows] * force_per_drive * stress_factor)[:, None] * drive[None, :]
        return self.drive_map.at(rows, drive) * stress_factor


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

    dominant_sign : float | np.ndarray — sign of the drive extreme of largest magnitude; names the fibre mode of
        a location tension or compression by the sign of its stress at that extreme (an array of shape (n, 1, 1):
        per station, for a response per unit section load whose sign at that extreme varies along the span)
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
    exact : np.ndarray | None — None when ``damage`` is exact everywhere; where it was evaluated exactly (at scale, see
        ``miner_damage``; the tops of ``worst_damage``)
        shape (k,) bool: elsewhere ``damage`` is an upper bound of the damage per block
    aggregation : str — how the cycles were evaluated: "each cycle", "identical cycles merged" or "bracketed"
    damage_past : np.ndarray | None — where evaluated exactly (``worst_damage`` with ``past``): the part of the
        damage from cycles whose lives lie past that many cycles, shape (k,) [-]
    below_limit : np.ndarray | None — there, the cycles per block below the fatigue limit, shape (k,) [-]
    """

    damage: np.ndarray
    static_failure: np.ndarray
    amplitude: np.ndarray
    mean: np.ndarray
    utilisation: np.ndarray
    exact: np.ndarray | None = None
    aggregation: str = "each cycle"
    damage_past: np.ndarray | None = None
    below_limit: np.ndarray | None = None

    def largest(self) -> int:
        """Index of the largest damage evaluated exactly (of equals, the lowest index)."""
        if self.exact is None:
            return int(np.argmax(self.damage))
        return int(np.argmax(np.where(self.exact, self.damage, -np.inf)))


def miner_damage(locations: Locations, cycles: Cycles, force_per_drive: float, stress_factor: float,
                 known: DamageResult | None = None) -> DamageResult:
    """Damage per block at every location for the counted drive cycles.

    force_per_drive : float — drive force per unit drive (1, or the stiffness for a deflection drive) [N per drive unit];
        unused when the locations carry a large-deflection ``drive_map``
    stress_factor : float — partial factor on every local stress or strain [-]
    known : DamageResult | None — ``worst_damage`` of the same locations, cycles and factors (an estimate's
        ``worst``): at scale its exact locations are not evaluated again, and its largest damage is the D* below

    Notes
    -----
    Local extremes of a cycle (dlo, dhi): q(dlo) and q(dhi), sorted (a falling map flips them), with q the
    location's local quantity as a function of the drive — r·d under linear theory, r = response × force per
    drive × stress factor; the tabulated, monotonic map under large deflection. N from the location's fatigue
    model; D = Σ count/N (Palmgren–Miner). Every location and cycle is evaluated in numpy, in blocks of CHUNK
    pairs; no Python loop runs over cycles.

    At scale (more than EXACT_PAIRS location × cycle pairs) the damage is bounded from above first (rules in
    BRACKET_RULES): every cycle is widened to the grid of BRACKET_LEVELS drive levels across the duty's span
    (min rounded down, max up) and the widened cycles merged on the grid (a count per pair of levels). Under
    these rules a local cycle whose interval contains another's has no more cycles to failure (the tests check
    it on every rule and library material), and the map from drive to local stress is monotonic, so at every
    location D <= D(widened). The location of the largest upper bound is then evaluated exactly, cycle by
    cycle; its damage D* is at most the largest damage of all (with ``known``, D* is that largest damage itself,
    and no location is evaluated twice), so every location whose upper bound reaches
    D* — the critical one among them — and every location where a widened cycle passes the static strength
    is evaluated exactly too, cycle by cycle (bounded once more on a grid REFINE times finer first when they
    would take more than REFINE_PAIRS location × cycle pairs): the life, the critical location and the static-failure flags are exact. The others report the
    upper bound (conservative); ``exact`` says which. A "cld" rule is not bracketed (its diagram may fold
    back): identical cycles are merged and every location evaluated.

    Locations with the same model and the same map have the same damage: each is evaluated once.
    """
    local_map = _LocalMap(locations, force_per_drive, stress_factor)
    amp, mean, utilisation, rows = _extremes(local_map, cycles)
    damage, failed, exact, aggregation, _ = _evaluate(local_map, rows, cycles, known=known)
    return DamageResult(damage, failed, amp, mean, utilisation, exact, aggregation)


def worst_damage(locations: Locations, cycles: Cycles, force_per_drive: float, stress_factor: float,
                 past: float | None = None) -> DamageResult:
    """The largest damage per block, exact, with an upper bound of the damage everywhere else (arguments as
    ``miner_damage``); what the life needs, without evaluating every location.

    past : float | None — also give, where evaluated exactly, the damage from lives past this many cycles and
        the cycles below the fatigue limit (``DamageResult.damage_past``, ``below_limit``), from the same pass

    Notes
    -----
    Scaling a local cycle by s >= 1 (its amplitude and its mean alike, the stress ratio kept) never raises the
    cycles to failure under any rule of ``flexcycle.fatigue.meanstress`` (on a ray of constant R the life falls
    with the amplitude; the tests check it on every rule, library material and random constant-life diagrams).
    A location's local quantity is its scale times a function of the drive that it shares with others: the
    drive itself under linear theory (scale: the response per unit drive), its channel's section load under
    large deflection (scale: the response per unit load). So among locations of one model, one such function
    and one sign of the scale, the damage grows with |scale|: the location of largest |scale| — the group's
    top — has the group's largest damage, and bounds every other's from above. Only the tops are evaluated,
    as ``miner_damage`` evaluates its locations (beyond TOP_PAIRS top × cycle pairs bracketed on a grid of
    TOP_LEVELS drive levels: many tops under large deflection, whose groups are one station's section load
    each, or millions of cycles); the largest of them is the largest
    damage of all, at the location of the lowest index among equals, as ``miner_damage`` finds it. A top
    whose cycles pass the static strength sends the whole evaluation to ``miner_damage``: the static-failure
    flags are then exact everywhere. ``exact`` marks the locations evaluated exactly.
    """
    local_map = _LocalMap(locations, force_per_drive, stress_factor)
    amp, mean, utilisation, rows = _extremes(local_map, cycles)
    scale, group = local_map.scales(rows)
    # the top of each group: largest |scale|, then the lowest index (rows ascending)
    order = np.lexsort((rows, -np.abs(scale), group))
    first = np.r_[True, group[order][1:] != group[order][:-1]]
    tops = rows[order[first]]
    top_of = np.empty(rows.size, int)
    top_of[order] = np.cumsum(first) - 1  # each row's group, numbered as the tops
    damage, failed, exact, aggregation, shares = _evaluate(local_map, np.sort(tops), cycles, TOP_LEVELS, TOP_PAIRS,
                                                           past)
    if failed.any():
        return miner_damage(locations, cycles, force_per_drive, stress_factor)
    evaluated = np.zeros(damage.size, bool)
    evaluated[tops] = True if exact is None else exact[tops]
    bound = damage[tops][top_of]
    damage[rows] = np.where(evaluated[rows], damage[rows], bound)
    past_share, below = (None, None) if shares is None else shares
    return DamageResult(damage, failed, amp, mean, utilisation, evaluated, aggregation, past_share, below)


class _LocalMap:
    """The locations' local quantities as functions of the drive, and what makes two of them equal.

    keys : np.ndarray — what makes two locations' local histories equal: the local quantity per unit drive
        (k,), or the channel and the quantity per unit section load (k, 2)
    prepare(drives, rows) — once per chunk of cycles: the drives (linear) or the section loads of the rows'
        channels there (large deflection)
    values(rows, prepared) — the local quantity of the locations ``rows`` there, shape (len(rows), len(drives))
    """

    def __init__(self, locations: Locations, force_per_drive: float, stress_factor: float):
        self.locations = locations
        self.force_per_drive = force_per_drive
        self.stress_factor = stress_factor
        drive_map = locations.drive_map
        if drive_map is None:
            self.keys = locations.response * force_per_drive * stress_factor
        else:
            self.keys = np.stack([drive_map.channel, drive_map.unit * stress_factor], axis=1)

    def local(self, rows: np.ndarray, drive: np.ndarray) -> np.ndarray:
        return self.locations.local(rows, drive, self.force_per_drive, self.stress_factor)

    def prepare(self, drive: np.ndarray, rows: np.ndarray):
        """What ``values`` reads for the locations ``rows`` at the drives: the drives themselves (linear), or the
        section loads of the rows' channels there and those channels (large deflection)."""
        drive_map = self.locations.drive_map
        if drive_map is None:
            return drive
        used = np.unique(drive_map.channel[rows])
        return drive_map.loads_at(drive, used), used

    def values(self, rows: np.ndarray, prepared) -> np.ndarray:
        drive_map = self.locations.drive_map
        if drive_map is None:
            return self.keys[rows, None] * prepared[None, :]
        loads, used = prepared
        return (drive_map.unit[rows] * self.stress_factor)[:, None] * loads[np.searchsorted(used, drive_map.channel[rows])]

    def scales(self, rows: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        """Each location's scale, and its group: the same model, the same shared function, the same sign."""
        locations = self.locations
        if locations.drive_map is None:
            scale, shared = self.keys[rows], np.zeros(rows.size, int)
        else:
            scale, shared = self.keys[rows, 1], locations.drive_map.channel[rows]
        # one integer per (model, shared function, sign)
        code = (locations.model[rows] * (int(shared.max(initial=0)) + 1) + shared) * 2 + (scale > 0)
        return scale, np.unique(code, return_inverse=True)[1].reshape(-1)


def _extremes(local_map: _LocalMap, cycles: Cycles) -> tuple[np.ndarray, np.ndarray, np.ndarray, np.ndarray]:
    """The largest local amplitude and its mean, the utilisation at every location, and the locations that need
    a damage sum: those with a curve and a local quantity that is not round-off (NEGLIGIBLE)."""
    locations = local_map.locations
    k = locations.response.size
    amp, mean, peak, utilisation = np.zeros(k), np.zeros(k), np.zeros(k), np.zeros(k)
    every = np.arange(k)
    dlo, dhi = cycles.lo, cycles.hi
    nc = dlo.size
    if nc:  # the largest local amplitude is that of the largest drive range (a monotonic map)
        big = _first_widest(cycles)
        at_lo, at_hi = local_map.local(every, dlo[[big]])[:, 0], local_map.local(every, dhi[[big]])[:, 0]
        amp = np.abs(at_hi - at_lo) / 2.0
        mean = (at_hi + at_lo) / 2.0 + 0.0  # + 0.0: no "-0" in the outputs
        ends = local_map.local(every, np.array([dlo.min(), dhi.max(), min(dlo.min(), 0.0), max(dhi.max(), 0.0)]))
        peak = np.abs(ends).max(axis=1)
    rows = np.zeros(k, bool)
    for m, model in enumerate(locations.models):
        mine = locations.model == m
        if nc:
            extremes = ends[mine][:, :2]
            utilisation[mine] = np.maximum(extremes.max(axis=1) / model.Xt, -extremes.min(axis=1) / model.Xc)
        rows |= mine & ~(peak < NEGLIGIBLE * min(model.Xt, model.Xc))
    return amp, mean, utilisation, np.flatnonzero(rows)


def _first_widest(cycles: Cycles) -> int:
    """Index of the first cycle of largest range, block by block (no temporary the size of the cycles)."""
    best, at = -np.inf, 0
    for start in range(0, cycles.lo.size, WIDEN_BLOCK):
        span = cycles.hi[start:start + WIDEN_BLOCK] - cycles.lo[start:start + WIDEN_BLOCK]
        k = int(np.argmax(span))
        if span[k] > best:
            best, at = float(span[k]), start + k
    return at


def _evaluate(local_map: _LocalMap, rows: np.ndarray, cycles: Cycles, levels: int = BRACKET_LEVELS,
              exact_pairs: int | None = None, past: float | None = None, known: DamageResult | None = None):
    """Damage, static-failure flags, the exact mask (None: exact everywhere), the aggregation and the shares
    (``_damage``'s third value, at the locations evaluated exactly) at ``rows``: every cycle; or beyond
    ``exact_pairs`` (default EXACT_PAIRS) location × cycle pairs, bracketed on a grid of ``levels`` drive levels
    (the Notes of ``miner_damage``), or identical cycles merged where the bracket does not hold ("cld").
    ``known`` (without ``past``): when bracketed, the damage and flags of its exact locations are taken as they
    are, and the largest of them is D*."""
    locations = local_map.locations
    nc = cycles.lo.size
    limit = EXACT_PAIRS if exact_pairs is None else exact_pairs
    if nc == 0 or rows.size * nc <= limit:
        damage, failed, shares = _damage(local_map, rows, cycles, past)
        return damage, failed, None, "each cycle", shares
    bracket = cycles.hi.max() > cycles.lo.min() and all(
        locations.models[m].rule in BRACKET_RULES for m in np.unique(locations.model[rows]))
    if not bracket:
        damage, failed, shares = _damage(local_map, rows, merge_identical(cycles), past)
        return damage, failed, None, "identical cycles merged", shares
    upper, failed_wide, _ = _damage(local_map, rows, _widened(cycles, levels))
    if known is not None and past is None and known.exact is not None and known.exact[rows].any():
        top = rows[known.exact[rows]]  # evaluated exactly already, the largest damage of all among them
        damage_top, failed_top, shares_top = known.damage, known.static_failure, None
    else:
        top = rows[[int(np.argmax(upper[rows]))]]
        # the exact passes go through the cycles as counted, in chunks: a long history's cycles come merged already
        # where merging paid (flexcycle.spectra.chunked.HeldCycles), and merging distinct ones would only cost
        damage_top, failed_top, shares_top = _damage(local_map, top, cycles, past)
    reached = damage_top[top].max()  # D* <= the largest damage of all
    done = np.zeros(upper.size, bool)
    done[top] = True  # the locations evaluated exactly already
    exact = rows[(upper[rows] >= reached) | failed_wide[rows] | done[rows]]
    rest = exact[~done[exact]]
    if rest.size * nc > REFINE_PAIRS:  # many cycles to go through again: first bound those rows more tightly
        finer, failed_finer, _ = _damage(local_map, rest, _widened(cycles, REFINE * levels))
        upper[rest] = np.minimum(upper[rest], finer[rest])
        exact = exact[(upper[exact] >= reached) | failed_finer[exact] | done[exact]]
        rest = exact[~done[exact]]
    damage_exact, failed, shares = _damage(local_map, rest, cycles, past)
    damage_exact[top], failed[top] = damage_top[top], failed_top[top]
    if shares is not None:
        shares[0][top], shares[1][top] = shares_top[0][top], shares_top[1][top]
    upper[exact] = damage_exact[exact]
    evaluated = np.zeros(upper.size, bool)
    evaluated[exact] = True
    return upper, failed, evaluated, "bracketed", shares


def _widened(cycles: Cycles, levels: int = BRACKET_LEVELS) -> Cycles:
    """The cycles widened to a grid of ``levels`` drive levels (min down, max up), merged on the grid.

    The grid runs from the smallest to the largest drive of the cycles; a widened cycle contains the cycle.
    Merging on the grid is a count per pair of grid indices (``numpy.bincount``): linear in the cycles, no sort.
    Many cycles (SHARED_WIDENING or more) are widened once, to the FINEST grid, and kept with the cycles; a
    coarser grid of ``levels`` (a power of two up to FINEST) is then that table coarsened — level I of it is
    level I·f of the finest (f = FINEST / levels), the same number, so ⌊i/f⌋ and ⌈i/f⌉ still contain the cycle.
    """
    base, top = float(cycles.lo.min()), float(cycles.hi.max())
    if cycles.lo.size < SHARED_WIDENING or FINEST % levels:
        i_lo, i_hi, count = _grid_cells(cycles, base, top, levels)
        f = 1
    else:
        if cycles not in _FINEST_CELLS:
            _FINEST_CELLS[cycles] = _grid_cells(cycles, base, top, FINEST)
        fine_lo, fine_hi, fine_count = _FINEST_CELLS[cycles]
        f = FINEST // levels
        side = levels + 2
        count = np.bincount((fine_lo // f) * side + -(-fine_hi // f), weights=fine_count, minlength=side * side)
        cells = np.flatnonzero(count)
        i_lo, i_hi, count = (cells // side) * f, (cells % side) * f, count[cells]
    step = (top - base) / (levels * f)  # the grid the indices count in
    return Cycles(np.minimum(base + i_lo * step, top), np.minimum(base + i_hi * step, top), count)


SHARED_WIDENING = 200_000  # cycles from which the finest widening is kept for the coarser grids
FINEST = 512  # levels of the finest kept widening (every grid used is a power of two up to it; 2 MB of counts)
_FINEST_CELLS: weakref.WeakKeyDictionary = weakref.WeakKeyDictionary()  # Cycles → their finest widening


def _grid_cells(cycles: Cycles, base: float, top: float, levels: int) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Each cycle widened to the grid of ``levels`` levels from ``base`` to ``top``: the distinct pairs of grid
    indices (at or below the minimum, at or above the maximum) and their summed counts."""
    step = (top - base) / levels
    grid = lambda i: np.minimum(base + i * step, top)  # noqa: E731 — level i of the grid [drive unit]
    side = levels + 2  # indices 0 … levels + 1 (round-off may put the top one level past ``levels``)
    count = np.zeros(side * side)
    for start in range(0, cycles.lo.size, WIDEN_BLOCK):  # blocks: temporaries of a few MB at any size
        lo, hi = cycles.lo[start:start + WIDEN_BLOCK], cycles.hi[start:start + WIDEN_BLOCK]
        # the level at or below lo and at or above hi (checked against the drive itself: no round-off inside)
        i_lo = np.floor((lo - base) / step)
        i_lo -= grid(i_lo) > lo
        i_hi = np.ceil((hi - base) / step)
        i_hi += grid(i_hi) < hi
        code = i_lo.astype(np.int64) * side + i_hi.astype(np.int64)
        count += np.bincount(code, weights=cycles.count[start:start + WIDEN_BLOCK], minlength=side * side)
    cells = np.flatnonzero(count)
    return cells // side, cells % side, count[cells]


def _damage(local_map: _LocalMap, rows: np.ndarray, cycles: Cycles, past: float | None = None):
    """Miner damage and static-failure flags at the locations ``rows`` (others 0 and False), cycle by cycle.

    past : float | None — also sum, per location, the damage of cycles whose lives lie past this many cycles
        and the cycles below the fatigue limit (an infinite life, a range above zero): returned as a third
        value (two arrays), or None
    """
    locations, keys = local_map.locations, local_map.keys
    prepare, values = local_map.prepare, local_map.values
    k = locations.response.size
    damage = np.zeros(k)
    failed = np.zeros(k, bool)
    shares = None if past is None else (np.zeros(k), np.zeros(k))
    dlo, dhi, count = cycles.lo, cycles.hi, cycles.count
    nc = dlo.size
    if nc == 0 or rows.size == 0:
        return damage, failed, shares
    groups = []
    for m, model in enumerate(locations.models):
        mine = rows[locations.model[rows] == m]
        if not mine.size:
            continue
        # equal map, equal damage: one location of each
        _, first, back = np.unique(keys[mine], axis=0, return_index=True, return_inverse=True)
        groups.append((model, mine, mine[first], back.reshape(-1)))
    sums = [np.zeros((3, unique.size)) for _, _, unique, _ in groups]  # damage, damage past, below the limit
    flags = [np.zeros(unique.size, bool) for _, _, unique, _ in groups]
    cycles_at_once = min(nc, CHUNK)
    for c0 in range(0, nc, cycles_at_once):
        c = slice(c0, c0 + cycles_at_once)
        at_lo, at_hi = prepare(dlo[c], rows), prepare(dhi[c], rows)
        for (model, _, unique, _), d, f in zip(groups, sums, flags):
            rows_at_once = max(1, CHUNK // nc)
            for r0 in range(0, unique.size, rows_at_once):
                some = unique[r0 : r0 + rows_at_once]
                a, b = values(some, at_lo), values(some, at_hi)
                N = model.cycles_to_failure(np.minimum(a, b), np.maximum(a, b))
                zero = N <= 0
                f[r0 : r0 + rows_at_once] |= zero.any(axis=1)
                each = count[None, c] / np.where(zero, FIRST_LOAD_FAILURE, N)
                d[0, r0 : r0 + rows_at_once] += each.sum(axis=1)
                if past is not None:
                    d[1, r0 : r0 + rows_at_once] += np.where(N > past, each, 0.0).sum(axis=1)
                    d[2, r0 : r0 + rows_at_once] += np.where(np.isinf(N) & (a != b), count[None, c], 0.0).sum(axis=1)
    for (_, mine, _, back), d, f in zip(groups, sums, flags):
        damage[mine] = d[0, back]
        failed[mine] = f[back]
        if shares is not None:
            shares[0][mine], shares[1][mine] = d[1, back], d[2, back]
    return damage, failed, shares


def cycle_lives(locations: Locations, k: int, cycles: Cycles, force_per_drive: float, stress_factor: float
                ) -> np.ndarray:
    """Cycles to failure of every counted cycle at location ``k`` (inf without a curve) [-].

    force_per_drive : float — as in ``miner_damage`` (unused with a large-deflection map)
    """
    m = int(locations.model[k])
    if m < 0:
        return np.full(cycles.lo.size, np.inf)
    a = locations.local(np.array([k]), cycles.lo, force_per_drive, stress_factor)[0]
    b = locations.local(np.array([k]), cycles.hi, force_per_drive, stress_factor)[0]
    return locations.models[m].cycles_to_failure(np.minimum(a, b), np.maximum(a, b))


@dataclass(frozen=True)
class LifeShares:
    """What the cycles do at one location, summed over the duty (``life_shares``).

    damage : float — Miner damage per block (cycles past the static strength at N = FIRST_LOAD_FAILURE) [-]
    damage_past : float — the part of it from cycles whose lives lie past the given number of cycles [-]
    below_limit : float — cycles per block below the fatigue limit there (infinite life, a range above zero) [-]
    """

    damage: float
    damage_past: float
    below_limit: float


def life_shares(locations: Locations, k: int, cycles: Cycles, force_per_drive: float, stress_factor: float,
                past: float) -> LifeShares:
    """The damage at location ``k``, the part from lives past ``past`` cycles and the cycles below the fatigue
    limit, summed over the cycles block by block (WIDEN_BLOCK at a time: the temporaries of a few MB whatever
    the number of cycles, where ``cycle_lives`` holds a life per cycle)."""
    damage = damage_past = below = 0.0
    for start in range(0, cycles.lo.size, WIDEN_BLOCK):
        part = slice(start, start + WIDEN_BLOCK)
        block = Cycles(cycles.lo[part], cycles.hi[part], cycles.count[part])
        N = cycle_lives(locations, k, block, force_per_drive, stress_factor)
        finite = np.isfinite(N) & (N > 0)
        d = np.where(finite, block.count / np.where(finite, N, 1.0), 0.0)
        damage += float(d.sum())
        damage_past += float(d[N > past].sum())
        below += float(block.count[np.isinf(N) & (block.hi > block.lo)].sum())
    return LifeShares(damage, damage_past, below)
