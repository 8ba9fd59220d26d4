"""Static strength at the extremes of the duty: first-ply failure by maximum stress, Tsai-Wu and maximum
fibre strain, and interlaminar (or core) shear against its strength; the smallest reserve and where it is.

``Critical`` names a place in the part and the mode that fails there: the static check's governing place
here, and the estimate's first failure (``flexcycle.estimate``).
"""
from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass, replace

import numpy as np

from flexcycle.design import Design
from flexcycle.display import SI, from_where
from flexcycle.fatigue.damage import FACES
from flexcycle.mechanics.beam import BeamResponse
from flexcycle.mechanics.strength import (
    interlaminar_reserve,
    max_stress_reserve,
    strengths_of,
    tsai_wu_reserve,
)


@dataclass(frozen=True)
class Critical:
    """Where the part fails first.

    x_m : float — distance from the root [m]
    ply : int — the ply's number in the whole stack, 1-based from the tension face
    z_m : float — through-thickness position in the local laminate, from its mid-plane [m]
    mode : str — failure mode (fibre-tension, fibre-compression, transverse, shear, interlaminar, core-shear)
    face : str — bottom (toward ply 1), top, or interior
    station : int — station index
    """

    x_m: float
    ply: int
    z_m: float
    mode: str
    face: str
    station: int


@dataclass(frozen=True)
class StaticCheck:
    """First-ply-failure reserve at the extremes of the duty.

    reserve : float — smallest reserve factor (load multiplier to first failure) [-]
    criterion : str — which check gives it (max-stress, Tsai-Wu, interlaminar)
    drive : float — the duty extreme it occurs at [N or m]
    place : Critical — where, with the mode that governs there (for Tsai-Wu, the mode of the largest
        max-stress ratio at that point)
    by_criterion : dict[str, float] — the smallest reserve of each criterion
    """

    reserve: float
    criterion: str
    drive: float
    place: Critical
    by_criterion: dict

    @property
    def x_m(self) -> float:
        """Distance of the governing point from the root [m]."""
        return self.place.x_m

    @property
    def ply(self) -> int:
        """The governing ply, 1-based from the tension face."""
        return self.place.ply



def static_check(design: Design, response: BeamResponse, force_per_drive: float,
                 fields_at: Callable | None = None) -> tuple[StaticCheck, list[str]]:
    """Max-stress, Tsai-Wu, fibre max-strain and interlaminar reserves at both extremes of the duty.

    design : Design — the validated design (its plies, duty extremes and stress factor)
    response : BeamResponse — every location's stress and strain per unit drive force [Pa/N, 1/N]
    force_per_drive : float — drive force per unit of the duty's drive [N/m or N/N]
    fields_at : callable(drive) -> flexcycle.response_map.SectionFields, or None — large deflection: the ply
        fields at a drive (the response per unit force is then used for the places only)
    Returns the smallest reserve with where it is, and the notes for the warnings (a check left out, a
    reserve below 1).

    Every local stress is multiplied by the stress factor before the check, as for fatigue. The fibre
    max-strain check uses the ultimate strains eps1t, eps1c (Xt/E1, Xc/E1 unless the material says
    otherwise), the allowables of a strain-basis fibre curve.
    """
    plies = design.beam.plies
    strengths = strengths_of([p.material for p in plies]).expand(1)  # shape (p, 1): over (n, p, 2)
    # a ply without S13 is not checked for interlaminar shear (an infinite strength; the note says so)
    s13 = np.array([np.inf if p.material.S13 is None else p.material.S13 for p in plies])
    interlaminar_mode = np.array(["core-shear" if p.material.kind == "core" else "interlaminar" for p in plies])
    notes = []
    missing = sorted({p.material.name for p in plies if p.material.S13 is None})
    if missing:
        notes.append(f"no interlaminar strength S13 for {', '.join(missing)}: interlaminar shear not checked there")
    z_faces = np.concatenate([response.z, response.z_tau_peak[..., None]], axis=2)  # (n, p, 3): bottom, top, interior
    eps1t = np.array([p.material.eps1t for p in plies])[None, :, None]
    eps1c = np.array([p.material.eps1c for p in plies])[None, :, None]
    best = None
    by = {"max-stress": math.inf, "Tsai-Wu": math.inf, "max-strain": math.inf, "interlaminar": math.inf}
    for drive in design.duty.extremes:
        force = drive * force_per_drive * design.stress_factor
        if force == 0.0:
            continue
        if fields_at is None:
            stress = response.stress_12 * force  # (n, p, 2, 3)
            tau = np.concatenate([response.tau_xz, response.tau_xz_peak[..., None]], axis=2) * force  # (n, p, 3)
            eps1 = response.strain_12[..., 0] * force
        else:
            fields, factor = fields_at(drive), design.stress_factor
            stress = fields.stress_12 * factor
            tau = np.concatenate([fields.tau_xz, fields.tau_xz_peak[..., None]], axis=2) * factor
            eps1 = fields.strain_12[..., 0] * factor
        max_stress = max_stress_reserve(stress, strengths)
        with np.errstate(divide="ignore"):  # maximum strain along the fibres (Jones, 2nd ed., sec. 2.9.3)
            strain_reserve = np.where(eps1 > 0, eps1t / eps1, np.where(eps1 < 0, eps1c / -eps1, np.inf))
        per = {
            "max-stress": (max_stress.factor, max_stress.mode),
            "Tsai-Wu": (tsai_wu_reserve(stress, strengths), max_stress.mode),
            "max-strain": (strain_reserve, np.where(eps1 >= 0, "fibre-tension", "fibre-compression")),
            "interlaminar": (interlaminar_reserve(np.abs(tau), np.broadcast_to(s13[None, :, None], tau.shape)),
                             np.broadcast_to(interlaminar_mode[None, :, None], tau.shape)),
        }
        for name, (factor, mode) in per.items():
            factor = np.where(response.present[..., None], factor, np.inf)
            k = np.unravel_index(int(np.argmin(factor)), factor.shape)
            value = float(factor[k])
            by[name] = min(by[name], value)
            if best is None or value < best.reserve * (1 - 1e-9):  # a tie within round-off keeps the first
                place = Critical(float(response.x[k[0]]), int(k[1]) + 1, float(z_faces[k]), str(mode[k]),
                                 FACES[int(k[2])], int(k[0]))
                best = StaticCheck(value, name, drive, place, {})
    assert best is not None  # the loader rejects a duty that never loads the part
    check = replace(best, by_criterion=by)
    if check.reserve < 1.0:
        notes.append(
            f"static strength exceeded: reserve {check.reserve:.2f} ({check.criterion}, {check.place.mode}) at "
            f"x = {check.x_m * 1e3:.0f} mm {from_where(design.beam.support)}, ply {check.ply}, at the duty extreme "
            f"{SI.drive(check.drive, design.duty.drive)}: life is zero"
        )
    return check, notes
