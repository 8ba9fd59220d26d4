"""The life estimate: design → response map → counted cycles → damage → LifeResult.

The one orchestrator of flexcycle (docs/design.md, data flow). Mechanics gives every location's local stress or
strain as a function of the drive (``flexcycle.response_map``: a straight line under linear theory, the
elastica's tabulated map under large deflection); the duty's cycles are counted once;
``flexcycle.fatigue.damage`` maps each cycle's extremes to every location; Miner's sum per block gives the
life; the same map gives stiffness, static reserve and energy.
"""
from __future__ import annotations

import math
from dataclasses import dataclass, replace
from functools import cached_property

import numpy as np

from flexcycle.caution import CAUTION
from flexcycle.design import Design, parse_design
from flexcycle.errors import InputError
from flexcycle.fatigue.curves import DATA_CYCLES_MAX
from flexcycle.fatigue.damage import (
    FACES,
    DamageResult,
    LifeShares,
    Locations,
    build_models,
    life_shares,
    miner_damage,
    worst_damage,
)
from flexcycle.fatigue.meanstress import model_warnings
from flexcycle.fatigue.scatter import MEDIAN, materials_at_survival
from flexcycle.fatigue.static import Critical, StaticCheck, static_check
from flexcycle.mechanics.beam import BeamResponse, core_warnings, range_warnings, respond
from flexcycle.mechanics.energy import StorageFigures, storage_figures
from flexcycle.mechanics.modal import Mode, first_mode
from flexcycle.mechanics.theory import LARGE_SUPPORTS
from flexcycle.requirement import verdict_of
from flexcycle.resonance import resonance_warnings
from flexcycle.response_map import ResponseMap, mapped_locations, response_map
from flexcycle.views import ResultViews

IMPLAUSIBLE_STRAIN = 0.2  # a fibre strain no structural composite or wood reaches (common practice): an input slip
PAST_LINEAR = "passes 10 % of the span"  # the phrase of the linear range warning (flexcycle.mechanics.beam)



@dataclass(frozen=True)
class LifeResult(ResultViews):
    """Everything an estimate gives; ``summary()`` is the summary.json contract.

    Its tables (``station_table``, ``location_table``, ``cycle_table``: DataFrames), figures (``figure(name)``)
    and notebook display come from `flexcycle.views.ResultViews`, computed when first asked for.

    response : BeamResponse — the linear response per unit drive force (stations, plies, mass, stiffness)
    drive_response : ResponseMap | None — the drive → response map the estimate used (linear or large deflection)
    peak_force : float — load-point force at the duty's largest drive [N]
    peak_deflection : float — load-point deflection along the load there [m]
    tip_rotation : float | None — large deflection: rotation of the load-point section there [rad]
    pull_in : float | None — large deflection: the load point's travel toward the clamp there [m]
    """

    design: Design
    response: BeamResponse
    locations: Locations
    worst: DamageResult
    life_cycles: float | None
    life_blocks: float | None
    life_days: float | None
    damage_per_block: float
    life_unbounded: bool
    critical: Critical
    static: StaticCheck
    storage: StorageFigures
    peak_strain: float
    cycle_energy: float
    force_per_drive: float
    warnings: tuple[str, ...]
    first_mode: Mode | None = None  # the part's first bending mode (flexcycle.mechanics.modal)
    drive_response: ResponseMap | None = None
    peak_force: float = math.nan
    peak_deflection: float = math.nan
    tip_rotation: float | None = None
    pull_in: float | None = None
    survival: float = MEDIAN
    life_blocks_median: float | None = None

    @cached_property
    def damage(self) -> DamageResult:
        """Miner damage per block at every location (``flexcycle.fatigue.damage.miner_damage``), evaluated when
        first asked for: the estimate itself needs only ``worst`` (exact at the largest damage, bounds elsewhere),
        whose exact locations are not evaluated again."""
        if self.worst.exact is None or self.worst.exact.all():
            return self.worst
        return miner_damage(self.locations, self.design.duty.cycles, self.force_per_drive, self.design.stress_factor,
                            known=self.worst)

    @property
    def theory(self) -> str:
        """``"linear"`` or ``"large-deflection"``."""
        return self.design.theory

    def summary(self) -> dict:
        """The summary.json object (docs/design.md, outputs contract): SI numbers, strict JSON."""
        d, r = self.design, self.response
        c = self.critical
        secant = self.peak_force / self.peak_deflection if self.peak_deflection else r.stiffness
        return {
            "title": d.title,
            "theory": d.theory,
            "life_cycles": _finite(self.life_cycles),
            "life_blocks": _finite(self.life_blocks),
            "life_days": _finite(self.life_days),
            "life_unbounded": self.life_unbounded,
            "damage_per_block": _finite(self.damage_per_block),
            "critical": {"x_m": c.x_m, "ply": c.ply, "z_m": c.z_m, "mode": c.mode, "face": c.face},
            "stiffness_n_per_m": r.stiffness,
            "secant_stiffness_n_per_m": _finite(secant),
            "mass_kg": r.mass,
            "peak_strain": self.peak_strain,
            "peak_force_n": _finite(self.peak_force),
            "peak_deflection_m": _finite(self.peak_deflection),
            "tip_rotation_deg": None if self.tip_rotation is None else _finite(math.degrees(self.tip_rotation)),
            "pull_in_m": _finite(self.pull_in),
            "peak_energy_j": self.storage.energy,
            "cycle_energy_j": self.cycle_energy,
            "specific_energy_j_per_kg": self.storage.specific_energy,
            "energy_efficiency": self.storage.efficiency,
            "static_reserve": _finite(self.static.reserve),
            "static_criterion": self.static.criterion,
            "static_reserve_by_criterion": {k: _finite(v) for k, v in self.static.by_criterion.items()},
            "drive": d.duty.drive,
            "support": d.beam.support,
            "cycles_per_block": float(d.duty.cycles.n_total),
            "blocks_per_day": d.duty.blocks_per_day,
            "residue": d.duty.residue,
            "mean_stress": d.mean_stress,
            "miner_limit": d.miner_limit,
            "stress_factor": d.stress_factor,
            "survival": self.survival,
            "life_blocks_median": _finite(self.life_blocks_median),
            "static_strength_factor": _first_factor(d, "static_strength_factor"),
            "fatigue_strength_factor": _first_factor(d, "fatigue_strength_factor"),
            "material_factors": {name: {"static_strength": f.strength, "fatigue_strength": f.fatigue_strength,
                                        "stiffness": f.stiffness} for name, f in d.factors.items()},
            "warnings": list(self.warnings),
            "caution": CAUTION,
            **self._requirement(),
            "first_mode_hz": None if self.first_mode is None else _finite(self.first_mode.frequency),
            **_measured_summary(d),
        }

    def _requirement(self) -> dict:
        """required_life_blocks, meets_requirement, life_margin (null when unbounded) — only when the design
        gives [fatigue] required_life."""
        verdict = verdict_of(self)
        if verdict is None:
            return {}
        keys = verdict.summary()
        keys["life_margin"] = _finite(keys["life_margin"])
        return keys


def _measured_summary(design: Design) -> dict:
    """summary.json keys of a PSD duty (``spectrum``) and of a strain-gauge drive (``measured_drive``, ``gauge``)."""
    duty, out = design.duty, {}
    if duty.spectral is not None:
        s = duty.spectral.spectral
        m = s.moments
        out["spectrum"] = {"method": s.method, "m0": m.m0, "m1": m.m1, "m2": m.m2, "m4": m.m4,
                           "irregularity": m.irregularity, "cycle_rate_hz": s.rate, "duration_s": s.duration,
                           "mean": s.mean, "largest_peak": s.largest_peak}  # in the drive as measured, SI
    if duty.gauge is not None:
        g = duty.gauge
        out["measured_drive"] = duty.measured
        out["gauge"] = {"x_m": g.x, "face": g.face, "ply": g.ply}
    return out


def _finite(value: float | None) -> float | None:
    """Strict JSON has no NaN or Infinity: an unbounded figure is written as null."""
    if value is None or not math.isfinite(value):
        return None
    return float(value)


def estimate(design: Design, compare_theories: bool = True) -> LifeResult:
    """Run the whole estimate for a validated design.

    compare_theories : bool — a linear estimate whose deflection passes the linear range also runs the elastica
        and adds to its warning how far the two answers differ; False leaves that out (a sweep's rows carry the
        figures only, and the elastica would cost each candidate more than the estimate itself)
    """
    beam = design.beam
    response = respond(beam)
    mapping = response_map(design, response)
    force_per_drive = mapping.force_per_drive
    cycles = design.duty.cycles
    lo, hi = design.duty.extremes
    dominant_drive = hi if abs(hi) >= abs(lo) else lo
    peak_drive = max(abs(lo), abs(hi))
    peak_force = peak_drive * force_per_drive

    if mapping.large:
        peak_strain = max(float(np.abs(mapping.fields(d).strain_12[..., 0]).max()) for d in (lo, hi))
    else:
        peak_strain = float(np.abs(response.strain_12[..., 0]).max()) * peak_force
    if not peak_strain <= IMPLAUSIBLE_STRAIN:
        name = design.path.name if design.path else "the design"
        raise InputError(
            f"{name} [duty]: the largest drive ({peak_drive:g} {'m' if design.duty.drive == 'deflection' else 'N'}) "
            f"strains the fibres by {peak_strain:.3g}, "
            f"far past any structural material and any linear theory (> {IMPLAUSIBLE_STRAIN:g}); check the drive "
            "values and their unit"
        )

    # the curves at the design's survival probability, each moved by its own scatter (flexcycle.fatigue.scatter)
    at_survival = materials_at_survival(design.materials.values(), design.survival)
    models = build_models(list(at_survival.materials), design.mean_stress)
    locations = mapped_locations(mapping, models, dominant_drive)
    damage = worst_damage(locations, cycles, force_per_drive, design.stress_factor, DATA_CYCLES_MAX)
    static, static_notes = static_check(design, response, force_per_drive,
                                        mapping.fields if mapping.large else None)

    warnings = (list(design.notes) + _range_notes(design, mapping, dominant_drive, peak_strain) + core_warnings(beam)
                + list(models.warnings) + list(at_survival.notes) + static_notes)
    for (material, family), m in models.index.items():
        warnings += model_warnings(models.models[m], f"{material} {family} curve")
    d_block = float(damage.damage.max()) if damage.damage.size else 0.0
    fatigue_failure = bool(damage.static_failure.any())
    failed = static.reserve < 1.0 or fatigue_failure
    unbounded = not failed and d_block == 0.0
    if failed:
        life_blocks = life_cycles = 0.0
        life_days = 0.0 if design.duty.blocks_per_day else None
    elif unbounded:
        life_blocks = life_cycles = life_days = None
        warnings.append("no counted cycle does fatigue damage (all below the fatigue limits): life unbounded")
    else:
        life_blocks = design.miner_limit / d_block
        life_cycles = life_blocks * float(cycles.n_total)
        life_days = life_blocks / design.duty.blocks_per_day if design.duty.blocks_per_day else None

    if static.reserve < 1.0:
        critical = static.place  # the first load fails the part there
    else:
        if fatigue_failure:  # the fatigue data put a cycle past the strength: the most utilised such location
            k = int(np.argmax(np.where(damage.static_failure, damage.utilisation, -np.inf)))
            warnings.append(
                f"a cycle of the duty exceeds the static strength ({locations.mode[k]}, ply {locations.ply[k] + 1}, "
                f"x = {response.x[locations.station[k]] * 1e3:.0f} mm): life is zero"
            )
        elif unbounded:  # the most utilised fatigue-checked location
            k = int(np.argmax(np.where(locations.model >= 0, damage.utilisation, -np.inf)))
        else:
            k = damage.largest()
        if damage.damage_past is not None and damage.exact[k]:  # from the pass that found the life
            shares = LifeShares(float(damage.damage[k]), float(damage.damage_past[k]), float(damage.below_limit[k]))
        else:
            shares = life_shares(locations, k, cycles, force_per_drive, design.stress_factor, DATA_CYCLES_MAX)
        if not (fatigue_failure or unbounded):
            warnings += _extrapolation_notes(shares)
        warnings += _below_limit_notes(locations, k, shares, cycles)
        critical = Critical(
            x_m=float(response.x[locations.station[k]]),
            ply=int(locations.ply[k]) + 1,
            z_m=float(locations.z[k]),
            mode=str(locations.mode[k]),
            face=FACES[int(locations.face[k])],
            station=int(locations.station[k]),
        )
    life_blocks_median = life_blocks
    if design.survival != MEDIAN:
        life_blocks_median = _median_life_blocks(design, mapping, dominant_drive, force_per_drive, failed)
    storage = _storage(mapping, dominant_drive, peak_force)
    if design.duty.peaks is not None:  # a PSD duty: the largest cycle expected in a block, from peak to peak
        big_lo, big_hi = lo, hi
    else:
        big = _largest_cycle(cycles)
        big_lo, big_hi = cycles.lo[big], cycles.hi[big]
    e_cycle = mapping.cycle_energy(float(big_lo), float(big_hi))
    mode = first_mode(beam)
    warnings += resonance_warnings(design.duty, mode.frequency)
    result = LifeResult(
        design=design,
        response=response,
        locations=locations,
        worst=damage,
        life_cycles=life_cycles,
        life_blocks=life_blocks,
        life_days=life_days,
        damage_per_block=d_block,
        life_unbounded=unbounded,
        critical=critical,
        static=static,
        storage=storage,
        peak_strain=peak_strain,
        cycle_energy=e_cycle,
        force_per_drive=force_per_drive,
        warnings=tuple(dict.fromkeys(warnings)),
        first_mode=mode,
        drive_response=mapping,
        peak_force=float(mapping.force(dominant_drive)[0]),
        peak_deflection=float(mapping.deflection(dominant_drive)[0]),
        tip_rotation=mapping.tip_rotation(dominant_drive) if mapping.large else None,
        pull_in=mapping.pull_in(dominant_drive) if mapping.large else None,
        survival=design.survival,
        life_blocks_median=life_blocks_median,
    )
    if compare_theories and not mapping.large and any(PAST_LINEAR in w for w in result.warnings) \
            and beam.support in LARGE_SUPPORTS:
        result = replace(result, warnings=_with_comparison(result))
    return result


def _storage(mapping: ResponseMap, dominant_drive: float, peak_force: float) -> StorageFigures:
    """Energy, specific energy, peak axial strain and storage efficiency at the duty's largest drive.

    Under large deflection U = ∫F dδ from the elastica, the efficiency its bending energy ∫M²/(2EI) ds over the
    reference ½·Σ E_x·ε_max²·V (as ``flexcycle.mechanics.energy.storage_figures`` for the linear beam).
    """
    if not mapping.large:
        return storage_figures(mapping.beam, peak_force)
    energy = float(mapping.energy(dominant_drive)[0])
    eps_max = float(np.abs(mapping.fields(dominant_drive).strain_x).max())
    reference = mapping.beam.reference_energy * eps_max**2
    bending = mapping.bending_energy(dominant_drive)
    return StorageFigures(energy=energy, specific_energy=energy / mapping.beam.mass, peak_strain_x=eps_max,
                          efficiency=float(bending / reference) if 0 < reference < np.inf else 0.0)


def _range_notes(design: Design, mapping: ResponseMap, dominant_drive: float, peak_strain: float) -> list[str]:
    """The beam model's range warnings at the largest drive (flexcycle.mechanics.beam.range_warnings).

    Under large deflection the deflection is no longer a limit of the model, and the curvature for the Searle
    parameter is the elastica's; a note says what the elastica assumed.
    """
    if not mapping.large:
        return list(range_warnings(mapping.beam, max(abs(v) for v in design.duty.extremes) * mapping.force_per_drive))
    moment, _ = mapping.section_loads(dominant_drive)
    at_peak = replace(mapping.unit, curvature=mapping.unit.curvature * moment, compliance=0.0)
    notes = list(range_warnings(at_peak, 1.0)) + list(mapping.table.notes)
    rotation = abs(mapping.tip_rotation(dominant_drive))
    if rotation > math.radians(60):
        notes.append(f"the load-point section turns by {math.degrees(rotation):.0f}° at the largest drive: the end load "
                     "is taken to keep its direction (a dead load); a linkage whose force turns with the part "
                     "loads it differently")
    return notes


def _under_large_deflection(design: Design) -> Design:
    """The design under theory = "large-deflection"; a strain-gauge duty read again, its strains then turned into
    force through the elastica's map (flexcycle.measured) rather than the straight line's."""
    if design.duty.measured != "strain" or design.path is None:
        return replace(design, theory="large-deflection")
    document = {**design.document, "beam": {**design.document["beam"], "theory": "large-deflection"}}
    return parse_design(document, design.path.name, design.path.parent, design.path)


def _with_comparison(result: LifeResult) -> tuple[str, ...]:
    """The linear range warning with how much the large-deflection answer differs (peak strain and life)."""
    design = result.design
    try:
        other = estimate(_under_large_deflection(design))
    except InputError as exc:
        addition = f'; theory = "large-deflection" could not solve this duty ({exc})'
    else:
        change = other.peak_strain / result.peak_strain - 1.0
        if other.life_blocks and result.life_blocks:
            life = (f"the life {other.life_blocks:.4g} blocks ({other.life_blocks / result.life_blocks:.3g} times "
                    "this one)")
        else:
            life = f"the life {other.life_blocks} blocks"
        addition = (f'; under theory = "large-deflection" (the elastica) the peak strain is {other.peak_strain:.4g} '
                    f"({change:+.1%}) and {life}: set [beam] theory = \"large-deflection\"")
    return tuple(w + addition if PAST_LINEAR in w else w for w in result.warnings)


def _median_life_blocks(design: Design, mapping: ResponseMap, dominant_drive: float, force_per_drive: float,
                        failed: bool) -> float | None:
    """The life at survival 0.5 [blocks of the duty]: Miner's sum again with the median curves (None: unbounded)."""
    if failed:
        return 0.0
    models = build_models(list(design.materials.values()), design.mean_stress)
    damage = worst_damage(mapped_locations(mapping, models, dominant_drive), design.duty.cycles, force_per_drive,
                          design.stress_factor)
    if damage.static_failure.any():
        return 0.0
    worst = float(damage.damage.max()) if damage.damage.size else 0.0
    return design.miner_limit / worst if worst > 0.0 else None


def _first_factor(design: Design, key: str) -> float:
    """A design-level partial factor (the same on every material): the first material's, or 1."""
    return next((getattr(f, key) for f in design.factors.values()), 1.0)


def _largest_cycle(cycles) -> int:
    """Index of the cycle of largest range, of equal ranges the one of largest max, of those the last.

    The same index as ``np.lexsort((hi, hi - lo))[-1]``, in linear time (no sort of millions of cycles), block by
    block (no temporary the size of the cycles).
    """
    best, at = (-np.inf, -np.inf), 0
    for start in range(0, cycles.lo.size, LARGEST_BLOCK):
        hi = cycles.hi[start:start + LARGEST_BLOCK]
        span = hi - cycles.lo[start:start + LARGEST_BLOCK]
        widest = np.flatnonzero(span == span.max())
        top = hi[widest]
        k = int(widest[np.flatnonzero(top == top.max())[-1]])
        if (float(span[k]), float(hi[k])) >= best:  # a later equal one wins
            best, at = (float(span[k]), float(hi[k])), start + k
    return at


LARGEST_BLOCK = 1 << 18  # cycles looked at once by ``_largest_cycle`` (2 MB temporaries: they stay in cache)


EXTRAPOLATED_SHARE = 0.1  # warn when more than this share of the critical damage is read past the data


def _extrapolation_notes(shares: LifeShares) -> list[str]:
    """A warning when much of the critical location's damage comes from lives beyond typical test data."""
    if shares.damage <= 0:
        return []
    share = shares.damage_past / shares.damage
    if share <= EXTRAPOLATED_SHARE:
        return []
    return [
        f"{share:.0%} of the damage at the critical location comes from cycles whose lives lie past "
        f"{DATA_CYCLES_MAX:.0e} cycles: the fatigue curve is extrapolated beyond the usual range of test data "
        "(common practice: composite fatigue tests seldom run past 1e7–1e8 cycles)"
    ]


def _below_limit_notes(locations: Locations, k: int, shares: LifeShares, cycles) -> list[str]:
    """A warning naming how many cycles per block the fatigue limit leaves out at the critical location."""
    m = int(locations.model[k])
    if m < 0 or not any(c.limit for c in locations.models[m].curves) or shares.below_limit == 0.0:
        return []
    return [f"{shares.below_limit:g} of {float(cycles.n_total):g} cycles per block are below the fatigue limit at "
            "the critical location and ignored (no damage counted for them)"]
