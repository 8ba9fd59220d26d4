"""The data behind the report's figures (also used by the comparison page): the strain envelope along the
span, the force–deflection line, the critical location's index, and small facts of the design and duty."""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np
import pandas as pd

from flexcycle.estimate import LifeResult
from flexcycle.fatigue.damage import FACES
from flexcycle.spectra.cycles import Cycles


def drive_unit(drive: str) -> tuple[str, float]:
    """Display unit of the drive and the factor from SI to it: deflection in mm, force in N."""
    return ("mm", 1e3) if drive == "deflection" else ("N", 1.0)


def drop_positions(result: LifeResult) -> list[float]:
    """Where plies end, from the root, in increasing order [m]."""
    return sorted({p.ends_at for p in result.design.beam.plies if p.ends_at is not None})


def peak_force(result: LifeResult) -> float:
    """Drive force at the duty extreme of largest magnitude, with its sign [N] (under large deflection, the
    elastica's)."""
    lo, hi = result.design.duty.extremes
    if result.drive_response is not None:
        return float(result.drive_response.force(hi if abs(hi) >= abs(lo) else lo)[0])
    return (hi if abs(hi) >= abs(lo) else lo) * result.force_per_drive


def cycles_of_table(cycles: pd.DataFrame) -> Cycles:
    """The counted cycles of a cycles.csv table (min, max, count; SI) as Cycles."""
    return Cycles(cycles["min"].to_numpy(float), cycles["max"].to_numpy(float), cycles["count"].to_numpy(float))


@dataclass(frozen=True)
class SpanEnvelope:
    """Fibre strain ε1 at the two outer faces along the span over the duty's drive range.

    x : np.ndarray — station distance from the root, shape (n,) [m]
    bottom : np.ndarray — (min, max) ε1 over the duty at the bottom face (ply 1 side), shape (n, 2) [-]
    top : np.ndarray — (min, max) ε1 over the duty at the top face, shape (n, 2) [-]
    """

    x: np.ndarray
    bottom: np.ndarray
    top: np.ndarray


def span_envelope(result: LifeResult) -> SpanEnvelope:
    """ε1 at each duty extreme: (ε1 per unit force) × force under linear theory, the elastica's fields under large
    deflection; the map is monotonic in the drive, so the extremes bound the whole duty."""
    response = result.response
    lo, hi = result.design.duty.extremes
    n = response.x.size
    first = np.argmax(response.present, axis=1)
    last = response.present.shape[1] - 1 - np.argmax(response.present[:, ::-1], axis=1)
    mapping = result.drive_response
    if mapping is not None and mapping.large:
        fields = [mapping.fields(d).strain_12 for d in (lo, hi)]
        bottom = np.sort(np.stack([f[np.arange(n), first, 0, 0] for f in fields], axis=1), axis=1)
        top = np.sort(np.stack([f[np.arange(n), last, 1, 0] for f in fields], axis=1), axis=1)
        return SpanEnvelope(response.x, bottom, top)
    forces = np.array([lo, hi]) * result.force_per_drive
    per_n_bottom = response.strain_12[np.arange(n), first, 0, 0]
    per_n_top = response.strain_12[np.arange(n), last, 1, 0]
    bottom = np.sort(per_n_bottom[:, None] * forces[None, :], axis=1)
    top = np.sort(per_n_top[:, None] * forces[None, :], axis=1)
    return SpanEnvelope(response.x, bottom, top)


@dataclass(frozen=True)
class ForceDeflection:
    """The load-point line over the duty's range, from zero drive to each extreme.

    deflection : np.ndarray — load-point deflection, shape (m,) [m]
    force : np.ndarray — drive force there, shape (m,) [N]
    """

    deflection: np.ndarray
    force: np.ndarray


def force_deflection(result: LifeResult, points: int = 50, linear: bool = False) -> ForceDeflection:
    """The load-point curve over the duty's range: F = δ/C under linear theory (C the load-point compliance,
    bending + shear), the elastica's under large deflection; ``linear``: the small-deflection line regardless."""
    lo, hi = result.design.duty.extremes
    drive = np.linspace(min(lo, 0.0), max(hi, 0.0), points)
    mapping = result.drive_response
    if mapping is not None and mapping.large and not linear:
        return ForceDeflection(mapping.deflection(drive), mapping.force(drive))
    if mapping is not None and mapping.large:  # the small-deflection line over the same deflections
        deflection = mapping.deflection(drive)
        return ForceDeflection(deflection, deflection / result.response.compliance)
    f = drive * result.force_per_drive
    return ForceDeflection(f * result.response.compliance, f)


def critical_index(result: LifeResult) -> int:
    """Index into result.locations of the critical location (its station, ply, face and mode)."""
    locations, c = result.locations, result.critical
    match = np.flatnonzero(
        (locations.station == c.station) & (locations.ply == c.ply - 1) & (locations.mode == c.mode) & (locations.face == FACES.index(c.face))
    )
    if match.size == 0:  # the static check's place may be a mode without a fatigue location
        match = np.flatnonzero((locations.station == c.station) & (locations.ply == c.ply - 1))
    if match.size == 0:
        return int(np.argmax(result.damage.damage))
    best = np.lexsort((result.damage.utilisation[match], result.damage.damage[match]))[-1]  # damage, then utilisation
    return int(match[best])

