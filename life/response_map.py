"""The drive → response map of an estimate: linear (small deflection) or large deflection (the elastica).

Mechanics gives every location's local stress or strain as a function of the drive at the load point
(docs/design.md, data flow). Under ``theory = "linear"`` it is the response per unit force times the drive force,
a straight line; under ``theory = "large-deflection"`` the elastica is tabulated against the drive
(``flexcycle.mechanics.drive_table.tabulate``) and each station's bending moment and normal shear force scale
the section's linear response per unit section load (``per_section_load``). Both give the load-point force,
deflection and stored energy at any drive, the ply fields at any drive (static checks), and the locations
the damage path maps each counted cycle through.
"""
from __future__ import annotations

from dataclasses import dataclass, replace

import numpy as np

from flexcycle.design import Design
from flexcycle.errors import InputError
from flexcycle.fatigue.damage import DriveMap, Locations, ModelSet, locations
from flexcycle.mechanics import errors as mechanics_errors
from flexcycle.mechanics.beam import BeamResponse, segments
from flexcycle.mechanics.drive_table import DriveTable, tabulate
from flexcycle.mechanics.elastica import Shapes, per_section_load, prepare
from flexcycle.mechanics.energy import cycle_energy, force_per_drive, stored_energy


@dataclass(frozen=True)
class SectionFields:
    """Ply fields of the whole beam at one drive (no stress factor).

    stress_12 : np.ndarray — [σ1, σ2, τ12], shape (n, p, 2, 3) [Pa]
    strain_12 : np.ndarray — [ε1, ε2, γ12], shape (n, p, 2, 3) [-]
    strain_x : np.ndarray — εx along the beam axis, shape (n, p, 2) [-]
    tau_xz : np.ndarray — interlaminar shear at the ply faces, shape (n, p, 2) [Pa]
    tau_xz_peak : np.ndarray — largest |τxz| inside each ply, shape (n, p) [Pa]
    curvature : np.ndarray — κx, shape (n,) [1/m]
    """

    stress_12: np.ndarray
    strain_12: np.ndarray
    strain_x: np.ndarray
    tau_xz: np.ndarray
    tau_xz_peak: np.ndarray
    curvature: np.ndarray


@dataclass(frozen=True)
class ResponseMap:
    """The part's response to its drive.

    theory : str — ``"linear"`` or ``"large-deflection"``
    drive : str — ``"force"`` or ``"deflection"``
    beam : BeamResponse — the linear response per unit drive force (stations, plies, mass, compliance)
    force_per_drive : float — small-deflection drive force per unit drive [N per drive unit]
    table : DriveTable | None — large deflection: the elastica against the drive
    unit : BeamResponse | None — large deflection: the response per unit section load (moment, shear force)
    """

    theory: str
    drive: str
    beam: BeamResponse
    force_per_drive: float
    table: DriveTable | None = None
    unit: BeamResponse | None = None

    @property
    def large(self) -> bool:
        """True under large-deflection theory."""
        return self.table is not None

    def force(self, drive: np.ndarray) -> np.ndarray:
        """Load-point force at the drives [N]."""
        drive = np.atleast_1d(np.asarray(drive, float))
        return self.table.force(drive) if self.large else drive * self.force_per_drive

    def deflection(self, drive: np.ndarray) -> np.ndarray:
        """Load-point deflection along the load at the drives [m]."""
        drive = np.atleast_1d(np.asarray(drive, float))
        if self.large:
            return self.table.deflection(drive)
        return drive * self.force_per_drive * self.beam.compliance

    def energy(self, drive: np.ndarray) -> np.ndarray:
        """Stored elastic energy U = ∫F dδ at the drives [J] (linear: ½·C·F²)."""
        drive = np.atleast_1d(np.asarray(drive, float))
        if self.large:
            return self.table.energy(drive)
        return stored_energy(self.beam.compliance, drive * self.force_per_drive)

    def bending_energy(self, drive: float) -> float:
        """The bending part ∫M²/(2EI) ds of the stored energy at one drive [J]."""
        if self.large:
            return float(self.table.interpolate(self.table.shapes.bending_energy, np.array([drive]))[0])
        return float(stored_energy(self.beam.bending_compliance, drive * self.force_per_drive))

    def cycle_energies(self, lo: np.ndarray, hi: np.ndarray) -> np.ndarray:
        """Energy taken in and given back over each drive cycle lo → hi [J]: from the lowest-energy point the
        cycle passes to its highest (U is smallest, zero, at zero drive and grows with |drive| either way)."""
        lo, hi = np.asarray(lo, float), np.asarray(hi, float)
        if not self.large:
            return cycle_energy(self.beam.compliance, lo * self.force_per_drive, hi * self.force_per_drive)
        u_lo, u_hi = self.energy(lo), self.energy(hi)
        low = np.where((lo <= 0.0) & (hi >= 0.0), 0.0, np.minimum(u_lo, u_hi))
        return np.maximum(u_lo, u_hi) - low

    def cycle_energy(self, lo: float, hi: float) -> float:
        """``cycle_energies`` of one cycle [J]."""
        return float(self.cycle_energies(np.array([lo]), np.array([hi]))[0])

    def section_loads(self, drive: float) -> tuple[np.ndarray, np.ndarray]:
        """Bending moment [N·m] and shear force normal to the section [N] at every station, at one drive."""
        if self.large:
            d = np.array([drive])
            return (self.table.interpolate(self.table.shapes.moment, d)[0],
                    self.table.interpolate(self.table.shapes.shear, d)[0])
        force = drive * self.force_per_drive
        return self.beam.moment * force, self.beam.shear * force

    def fields(self, drive: float) -> SectionFields:
        """The ply fields at one drive [Pa, -]."""
        if not self.large:
            force = drive * self.force_per_drive
            r = self.beam
            return SectionFields(r.stress_12 * force, r.strain_12 * force, r.strain_x * force, r.tau_xz * force,
                                 r.tau_xz_peak * force, r.curvature * force)
        moment, shear = self.section_loads(drive)
        u = self.unit
        return SectionFields(u.stress_12 * moment[:, None, None, None], u.strain_12 * moment[:, None, None, None],
                             u.strain_x * moment[:, None, None], u.tau_xz * shear[:, None, None],
                             u.tau_xz_peak * shear[:, None], u.curvature * moment)

    def tip_rotation(self, drive: float) -> float:
        """Rotation of the load-point section at the drive [rad] (linear theory: 0, not computed)."""
        if not self.large:
            return 0.0
        return float(self.table.interpolate(self.table.shapes.tip_rotation, np.array([drive]))[0])

    def pull_in(self, drive: float) -> float:
        """The load point's travel toward the clamp at the drive [m] (linear theory: 0)."""
        if not self.large:
            return 0.0
        return float(self.table.interpolate(self.table.shapes.pull_in, np.array([drive]))[0])

    def shapes(self, drives: np.ndarray) -> Shapes | None:
        """The deformed shapes at the drives (interpolated between the table's levels); None under linear theory."""
        if not self.large:
            return None
        d = np.atleast_1d(np.asarray(drives, float))
        s = self.table.shapes
        fields = {name: (s.s if name == "s" else self.table.interpolate(getattr(s, name), d))
                  for name in Shapes.__dataclass_fields__}
        return Shapes(**fields)


def response_map(design: Design, response: BeamResponse) -> ResponseMap:
    """The design's response map; under large deflection the elastica tabulated over the duty's extremes.

    response : BeamResponse — ``flexcycle.mechanics.beam.respond(design.beam)``
    """
    drive = design.duty.drive
    per_drive = force_per_drive(response.compliance, drive)
    if design.theory != "large-deflection":
        return ResponseMap("linear", drive, response, per_drive)
    lo, hi = design.duty.extremes
    name = design.path.name if design.path else "the design"
    try:
        model = prepare(design.beam, segments(design.beam))
        table = tabulate(model, drive, min(lo, 0.0), max(hi, 0.0), response.x, response.segment, stiffness=response.stiffness)
    except mechanics_errors.InputError as exc:
        raise InputError(f"{name}: {exc}") from None
    return ResponseMap("large-deflection", drive, response, per_drive, table, per_section_load(response))


def mapped_locations(response: ResponseMap, models: ModelSet, dominant_drive: float) -> Locations:
    """The locations with their local quantity as a function of the drive.

    dominant_drive : float — the duty extreme of largest magnitude [N or m]; names each fibre location tension
        or compression by the sign of its stress there

    Linear: response per unit force (``Locations.response``), the map a straight line. Large deflection: the same
    locations, each with its local quantity tabulated against the drive (``DriveMap``): the response per unit
    bending moment times the station's moment (in-plane modes) or per unit shear force times its normal shear
    force (interlaminar), at every level of the elastica's table; ``response`` keeps the small-deflection slope.
    """
    dominant_sign = 1.0 if dominant_drive >= 0 else -1.0
    linear = locations(response.beam, models, dominant_sign)
    if not response.large:
        return linear
    moment, shear = response.section_loads(dominant_drive)
    sign = np.where(moment < 0, -1.0, 1.0)[:, None, None]  # the sign of each station's moment at that extreme
    unit = locations(response.unit, models, sign)
    table = response.table
    n = response.beam.x.size
    # channels: each station's moment (0 … n−1), then its normal shear force (n … 2n−1)
    loads = np.concatenate([table.shapes.moment.T, table.shapes.shear.T])
    channel = unit.station + np.where(unit.family == "interlaminar", n, 0)
    return replace(linear, mode=unit.mode, drive_map=DriveMap(table.drive, loads, channel, unit.response))
