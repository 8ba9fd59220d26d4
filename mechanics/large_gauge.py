"""A strain gauge under large deflection: the drive force → gauge strain map from the elastica.

Under ``theory = "large-deflection"`` the bending moment at a section is no longer the force times a fixed arm:
the end load's arm to the section is the deformed horizontal distance, M(s) = M₀ − P·x(s) (see
``flexcycle.mechanics.elastica``), and it shortens as the end pulls in. The gauge's strain stays linear in its
section's moment (small strains, the laminate's section law: εx = −M/b·(ε⁰x + z·κx) per unit moment, Kaw,
Mechanics of Composite Materials, 2nd ed., Eq. 4.16; `flexcycle.mechanics.gauge.gauge_section`), so the
force → gauge strain map is the elastica's moment at the gauge's station, tabulated against the end load
(``flexcycle.mechanics.drive_table.tabulate``: linear interpolation within 0.1 % of the station's largest moment)
times the strain per unit moment. The map must be strictly monotone to be inverted on the cycles' extremes
(`flexcycle.mechanics.gauge.GaugeMap`); a moment that turns back as the force grows is refused.

This module imports the elastica's solvers (scipy.integrate, scipy.optimize): it is imported only when a
strain-driven design under large deflection is loaded.
"""
from __future__ import annotations

import numpy as np

from .beam import Beam, segments
from .drive_table import tabulate
from .elastica import prepare, solve
from .errors import InputError
from .gauge import Gauge, GaugeMap, gauge_section

REACH_STEPS = 40  # growths of the trial end load (×1.5 each) before the gauge strain is said to be out of reach
HEADROOM = 1.25  # the first trial end load: this much above the small-deflection force of the largest strain


def large_gauge_map(beam: Beam, gauge: Gauge, lowest: float, highest: float) -> GaugeMap:
    """The end load → gauge strain map of the elastica, covering the strains ``lowest`` … ``highest``.

    beam : Beam — a cantilever or a guided beam (the supports the elastica solves)
    gauge : Gauge — where the strain is read
    lowest, highest : float — the duty's extreme gauge strains [-]

    Notes
    -----
    The end load that reaches the largest strain is found by growing a trial load from HEADROOM times the
    small-deflection force (the cantilever's moment per force at a section falls as the end pulls in, so more
    force is needed than the straight line says) by ×1.5 until the strain at the gauge passes it; the elastica
    is then tabulated from zero to that load (mirrored for loads of the other sign when the strains need them)
    at the gauge's station only.
    """
    section = gauge_section(beam, gauge)
    slope = section.strain_per_force
    forces_linear = np.array([lowest, highest]) / slope  # the small-deflection forces of the strain extremes
    wanted = max(abs(lowest), abs(highest))
    model = prepare(beam, segments(beam))
    stations, piece_of = np.array([gauge.x]), np.array([section.piece])
    top = HEADROOM * float(np.abs(forces_linear).max())
    for _ in range(REACH_STEPS):
        reached = abs(float(solve(model, np.array([top]), stations, piece_of).moment[0, 0]) * section.strain_per_moment)
        if reached >= wanted:
            break
        top *= 1.5
    else:
        raise InputError(f"gauge: a strain of {wanted * 1e6:.4g} µε at x = {gauge.x * 1e3:g} mm is not reached under "
                         "large deflection by any end load the elastica solves; check the strains and the gauge's place")
    lowest_force = -top if forces_linear.min() < 0 else 0.0
    highest_force = top if forces_linear.max() > 0 else 0.0
    table = tabulate(model, "force", lowest_force, highest_force, stations, piece_of)
    strain = table.shapes.moment[:, 0] * section.strain_per_moment
    step = np.diff(strain) * np.sign(slope)
    if not np.all(step > 0):
        j = int(np.argmax(step <= 0))
        raise InputError(f"gauge: the strain at x = {gauge.x * 1e3:g} mm stops growing with the end load near "
                         f"{table.drive[j]:.4g} N under large deflection, so a strain there does not name one load; "
                         "place the gauge nearer the root or drive by force")
    return GaugeMap(table.drive, strain)
