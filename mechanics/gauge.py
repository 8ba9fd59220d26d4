"""Strain gauges: the axial strain a gauge on the part reads per unit drive force, and its inverse.

A duty measured by a strain gauge bonded on the part (or a sensor on a named ply) becomes the load-point
drive through the map drive force → gauge strain. Under linear theory that map is a straight line through
zero, ε_gauge = s·F with s the gauge strain per unit force; the inverse is F = ε_gauge/s. The map is kept as
a monotone function (`GaugeMap`): a map that is a tabulated monotone curve (large deflection) inverts by
interpolation the same way.

The gauge reads the axial strain εx (along the beam axis) at its place: ε(z) = ε⁰ + z·κ (Kaw, Mechanics of
Composite Materials, 2nd ed., Eq. 4.16) at the outer face on the named side, from the same laminate and
moment per width as the static analysis (`flexcycle.mechanics.beam`).
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .beam import Beam, guided_end_moment, moment_shear, segments
from .errors import InputError
from .laminate import ply_field

GAUGE_FACES = ("tension", "compression")  # the face in tension / compression under positive drive


@dataclass(frozen=True)
class Gauge:
    """Where a strain gauge sits.

    x : float — distance from the root (clamp; mid-span for three-/four-point), as the stations run [m]
    face : str — ``"tension"``: on the face in tension under positive drive (ply 1's side);
        ``"compression"``: on the opposite face
    ply : int | None — the ply (1-based in the whole stack) on whose outer face toward ``face`` the gauge
        sits; None: the outer surface of the part at x
    """

    x: float
    face: str
    ply: int | None = None


@dataclass(frozen=True)
class GaugeSection:
    """The section under a gauge and what its strain reads per unit load there.

    piece : int — index of the beam segment (`flexcycle.mechanics.beam.segments`) that holds the gauge
    strain_per_moment : float — axial strain at the gauge per unit bending moment of the section (positive
        moment: ply 1 in tension) [1/(N·m)]
    moment_per_force : float — the section's bending moment per unit drive force, small deflection [m]
    """

    piece: int
    strain_per_moment: float
    moment_per_force: float

    @property
    def strain_per_force(self) -> float:
        """Axial strain at the gauge per unit drive force, small deflection [1/N]."""
        return self.strain_per_moment * self.moment_per_force


def gauge_section(beam: Beam, gauge: Gauge) -> GaugeSection:
    """The gauge's section: its segment, strain per unit moment and moment per unit force (checked placement).

    Notes
    -----
    εx = Mx·(ε⁰x + z·κx) per unit Mx (Kaw, Eq. 4.16), Mx = −M/b(x) the moment per width (negative: ply 1, at
    z = −h/2, in tension under a positive moment); M per unit drive force m(x) from Roark's Formulas for Stress
    and Strain, 7th ed., Table 8.1 (see `flexcycle.mechanics.beam.moment_shear`). At a ply drop the laminate of
    the stretch toward the end is taken (the dropped ply has ended there).
    """
    if gauge.face not in GAUGE_FACES:
        raise InputError(f"gauge face: must be one of {', '.join(map(repr, GAUGE_FACES))}, got {gauge.face!r}")
    length = beam.length
    if not 0.0 <= gauge.x <= length:
        where = "mid-span" if beam.halves == 2 else "the clamp"
        raise InputError(f"gauge x: {gauge.x * 1e3:g} mm lies outside the part; the gauge must sit between "
                         f"{where} (0 mm) and {length * 1e3:g} mm from it")
    segs = segments(beam)
    piece = next((k for k, s in enumerate(segs) if s.x0 <= gauge.x < s.x1), len(segs) - 1)
    seg = segs[piece]
    if gauge.ply is not None:
        if not 1 <= gauge.ply <= len(beam.plies):
            raise InputError(f"gauge ply: the stack has plies 1 to {len(beam.plies)}, got {gauge.ply}")
        if gauge.ply - 1 not in seg.active:
            raise InputError(f"gauge ply: ply {gauge.ply} has ended before x = {gauge.x * 1e3:g} mm (ply drop); "
                             "name a ply present at the gauge, or leave ply out for the outer surface")
        row = seg.active.index(gauge.ply - 1)
    else:
        row = 0 if gauge.face == "tension" else len(seg.active) - 1
    side = 0 if gauge.face == "tension" else 1  # the ply's face of smaller z (toward ply 1), or the other
    m0 = guided_end_moment(beam, segs) if beam.support == "guided" else 0.0
    m, _ = moment_shear(beam, np.array([gauge.x]), m0)
    field = ply_field(seg.lam, seg.bending.eps0, seg.bending.kappa)
    per_moment = -float(field.strain_xy[row, side, 0]) / float(beam.width(gauge.x))
    peak = max(abs(float(v)) for v in moment_shear(beam, np.array([0.0, length]), m0)[0])
    if abs(float(m[0])) <= 1e-6 * peak:
        raise InputError(f"gauge x: the bending moment at {gauge.x * 1e3:g} mm is zero, so the gauge reads no strain "
                         "there; place it where the part bends (toward the root)")
    return GaugeSection(piece, per_moment, float(m[0]))


def gauge_strain_per_force(beam: Beam, gauge: Gauge) -> float:
    """Axial strain at the gauge per unit drive force [1/N] (linear theory; see `gauge_section`)."""
    return gauge_section(beam, gauge).strain_per_force


@dataclass(frozen=True, eq=False)
class GaugeMap:
    """A monotone map from drive force to gauge strain, tabulated (a straight line: two points).

    force : np.ndarray — drive forces, increasing [N]
    strain : np.ndarray — gauge strain at each, strictly monotone [-]
    """

    force: np.ndarray
    strain: np.ndarray

    def drive(self, strain: np.ndarray) -> np.ndarray:
        """The drive force that gives each gauge strain [N] (the inverse map; linear beyond the table)."""
        strain = np.asarray(strain, float)
        e, f = (self.strain, self.force) if self.strain[-1] > self.strain[0] else (self.strain[::-1], self.force[::-1])
        slope_lo = (f[1] - f[0]) / (e[1] - e[0])
        slope_hi = (f[-1] - f[-2]) / (e[-1] - e[-2])
        inside = np.interp(strain, e, f)
        return np.where(strain < e[0], f[0] + (strain - e[0]) * slope_lo,
                        np.where(strain > e[-1], f[-1] + (strain - e[-1]) * slope_hi, inside))

    @property
    def increasing(self) -> bool:
        """Whether the strain grows with the force (a gauge on the tension face)."""
        return bool(self.strain[-1] > self.strain[0])


def linear_gauge_map(beam: Beam, gauge: Gauge) -> GaugeMap:
    """The straight line ε = s·F through zero (linear theory), as a `GaugeMap`."""
    s = gauge_strain_per_force(beam, gauge)
    return GaugeMap(np.array([-1.0, 1.0]), np.array([-s, s]))
