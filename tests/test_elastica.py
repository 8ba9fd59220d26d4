"""The elastica (flexcycle.mechanics.elastica): invariants and its agreement with the linear beam.

Sources:
- Clapeyron / Castigliano: the work of the end load along its path equals the strain energy, ∫P dδ = U with
  U = ∫M²/(2EI) ds + ∫V²/(2·b·S) ds; differentiated, dU/dδ = P at every load (an identity any solution must
  meet; the inextensibility constraint does no work). Checked on random tapers and ply drops (hypothesis).
- Small loads: the elastica tends to the linear Timoshenko beam of flexcycle.mechanics.beam (Roark, 7th ed.,
  Table 8.1 with the shear deflection by the unit-load method): stiffness, section moments and shear forces
  agree; the tolerance 0.1 % is the promise made to users, the agreement found is far closer (the geometric
  non-linearity is of order (P·L²/EI)², 1e-8 at the loads used).
"""
from dataclasses import replace

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from flexcycle.mechanics.beam import Beam, Ply, respond, segments
from flexcycle.mechanics.drive_table import TABLE_TOLERANCE, tabulate
from flexcycle.mechanics.elastica import (
    MAX_LOAD,
    per_section_load,
    prepare,
    refuse_unsolved,
    solve,
)
from flexcycle.mechanics.errors import InputError
from flexcycle.mechanics.materials import library

LIB = library()
GLASS, CARBON = LIB["e-glass-epoxy"], LIB["carbon-epoxy"]
PROMISE = 1e-3  # both theories agree within 0.1 % at small loads (the model's stated range)


def hybrid_beam(support: str, taper: float = 0.6, drop: float | None = 0.2) -> Beam:
    """Glass 0° / carbon ±30° / glass 0°, tapered, two inner carbon plies dropped: an off-axis hybrid laminate."""
    plies = (Ply(GLASS, 0.0, 0.5e-3), Ply(CARBON, 30.0, 0.3e-3), Ply(CARBON, -30.0, 0.3e-3, drop),
             Ply(CARBON, 30.0, 0.3e-3, drop), Ply(CARBON, -30.0, 0.3e-3), Ply(GLASS, 0.0, 0.5e-3))
    return Beam(support, 0.25, 0.04, 0.04 * taper, plies)


def uniform_beam(support: str) -> Beam:
    return Beam(support, 0.3, 0.03, 0.03, tuple(Ply(GLASS, 0.0, 1e-3) for _ in range(4)))


def shapes_at(beam: Beam, index: np.ndarray):
    """Solutions at load indices P·L²/EI_root, sampled at the linear map's stations."""
    resp = respond(beam)
    model = prepare(beam, segments(beam))
    return resp, solve(model, np.asarray(index, float) * model.load_scale(), resp.x, resp.segment)


@pytest.mark.parametrize("beam", [uniform_beam("cantilever"), uniform_beam("guided"), hybrid_beam("cantilever"),
                                  hybrid_beam("guided")], ids=["uniform-cantilever", "uniform-guided",
                                                                "hybrid-cantilever", "hybrid-guided"])
def test_small_loads_agree_with_the_linear_beam(beam):
    resp, shapes = shapes_at(beam, [1e-4])
    P = shapes.force[0]
    assert P / shapes.deflection[0] == pytest.approx(resp.stiffness, rel=PROMISE)
    root_moment = abs(resp.moment[0]) * P
    assert shapes.moment[0] == pytest.approx(resp.moment * P, abs=PROMISE * root_moment)
    assert shapes.shear[0] == pytest.approx(resp.shear * P, rel=PROMISE)
    # and the strains: the response per unit moment times the elastica's moment against the linear map
    unit = per_section_load(resp)
    strain = unit.strain_12 * shapes.moment[0][:, None, None, None]
    assert strain == pytest.approx(resp.strain_12 * P, abs=PROMISE * np.abs(resp.strain_12 * P).max())


def test_small_load_agreement_is_much_closer_than_promised():
    """The two theories differ by the geometric non-linearity, O(α²): 1e-8 at α = 1e-4; 1e-6 allows round-off."""
    resp, shapes = shapes_at(hybrid_beam("cantilever"), [1e-4])
    assert shapes.force[0] / shapes.deflection[0] == pytest.approx(resp.stiffness, rel=1e-6)


def test_per_section_load_times_the_linear_moment_is_the_linear_map():
    resp = respond(hybrid_beam("guided"))
    unit = per_section_load(resp)
    assert unit.stress_12 * resp.moment[:, None, None, None] == pytest.approx(resp.stress_12, rel=1e-12, abs=1e-9)
    assert unit.tau_xz * resp.shear[:, None, None] == pytest.approx(resp.tau_xz, rel=1e-12, abs=1e-9)


@settings(max_examples=12, deadline=None)
@given(
    support=st.sampled_from(["cantilever", "guided"]),
    taper=st.floats(0.25, 1.5),
    drop=st.one_of(st.none(), st.floats(0.1, 0.9)),
    index=st.floats(0.2, 5.0),
)
def test_energy_equals_the_work_of_the_end_load(support, taper, drop, index):
    """dU/dδ = P (Castigliano) by a central difference at ±0.1 % of the load: the difference's own error is
    O(1e-6); the solver's, 1e-8 of U over a 2e-3 share of it: 5e-6. Tolerance 1e-4."""
    beam = hybrid_beam(support, taper, None if drop is None else drop * 0.25)
    model = prepare(beam, segments(beam))
    P = index * model.load_scale()
    shapes = solve(model, np.array([0.999 * P, P, 1.001 * P]), np.array([0.0, beam.span]),
                   np.array([0, len(model.pieces) - 1]))
    slope = (shapes.energy[2] - shapes.energy[0]) / (shapes.deflection[2] - shapes.deflection[0])
    assert slope == pytest.approx(P, rel=1e-4)
    assert shapes.energy[1] > shapes.bending_energy[1] > 0  # shear energy adds to bending energy


def test_energy_is_the_integral_of_force_over_deflection():
    """∫P dδ along the tabulated path (Simpson's rule on 41 levels, scipy) against the strain energy at its end."""
    from scipy.integrate import simpson

    beam = hybrid_beam("cantilever")
    model = prepare(beam, segments(beam))
    shapes = solve(model, np.linspace(0.0, 3.0, 41) * model.load_scale(), np.array([0.0, beam.span]),
                   np.array([0, len(model.pieces) - 1]))
    assert simpson(shapes.force, x=shapes.deflection) == pytest.approx(shapes.energy[-1], rel=1e-5)  # Simpson O(h⁴)


@pytest.mark.parametrize("kind, lowest, highest", [("deflection", -0.04, 0.12), ("force", 0.3, 3.0)])
def test_tables_interpolate_within_the_tolerance(kind, lowest, highest):
    """At drives between the levels the section loads interpolated from the table match a fresh solution within
    the tolerance (0.1 % of each station's largest value), and the table covers the duty's extremes exactly."""
    beam = hybrid_beam("cantilever")
    resp = respond(beam)
    model = prepare(beam, segments(beam))
    if kind == "force":  # given as load indices P·L²/EI_root
        lowest, highest = lowest * model.load_scale(), highest * model.load_scale()
    table = tabulate(model, kind, lowest, highest, resp.x, resp.segment)
    match = 1e-7 * beam.span if kind == "deflection" else 1e-9 * highest  # a deflection's level: to 1e-7 of L
    assert table.drive[0] <= lowest + match and table.drive[-1] == pytest.approx(highest, abs=match)
    assert np.abs(table.drive - lowest).min() <= match  # each extreme is a solved level
    assert np.all(np.diff(table.drive) > 0)
    rng = np.random.default_rng(1)
    probe = rng.uniform(lowest, highest, 7)
    forces = table.force(probe)
    exact = solve(model, forces, resp.x, resp.segment)
    drive = exact.force if kind == "force" else exact.deflection
    interpolated = table.interpolate(table.shapes.moment, drive)
    scale = np.abs(table.shapes.moment).max(axis=0)
    assert np.all(np.abs(interpolated - exact.moment) <= TABLE_TOLERANCE * scale + 1e-12)


def test_negative_drives_mirror_the_positive_ones():
    beam = hybrid_beam("guided")
    resp = respond(beam)
    model = prepare(beam, segments(beam))
    table = tabulate(model, "deflection", -0.05, 0.05, resp.x, resp.segment)
    assert table.force(np.array([-0.03]))[0] == pytest.approx(-table.force(np.array([0.03]))[0], rel=1e-12)
    assert table.energy(np.array([-0.03]))[0] == pytest.approx(table.energy(np.array([0.03]))[0], rel=1e-12)


def test_a_deflection_beyond_reach_is_refused():
    beam = uniform_beam("cantilever")
    resp = respond(beam)
    model = prepare(beam, segments(beam))
    with pytest.raises(InputError, match="beyond what the part can reach"):
        tabulate(model, "deflection", 0.0, 0.31, resp.x, resp.segment)


def test_a_section_load_turning_back_is_refused():
    """Past about P·L²/EI = 5 the moment away from the clamp falls again as the outer part turns into the load's
    direction (the shapes of Bisshopp & Drucker's table): the map from drive to local stress is then not
    monotonic and the cycle extremes cannot be mapped through it."""
    beam = uniform_beam("cantilever")
    resp = respond(beam)
    model = prepare(beam, segments(beam))
    with pytest.raises(InputError, match="turns back"):
        tabulate(model, "deflection", 0.0, 0.8 * beam.span, resp.x, resp.segment)


def test_absurd_loads_are_refused():
    beam = uniform_beam("cantilever")
    model = prepare(beam, segments(beam))
    with pytest.raises(InputError, match="beyond what the elastica"):
        solve(model, np.array([2 * MAX_LOAD * model.load_scale()]), np.array([0.0, beam.span]), np.array([0, 0]))


def test_heavy_loads_keep_the_stable_branch():
    """At P·L²/EI = 80 the equations also hold looped (unstable) shapes; continuation keeps the stable one,
    whose end turns almost into the load (θ_L → 90°) and whose root moment keeps growing with the load."""
    beam = uniform_beam("cantilever")
    model = prepare(replace(beam), segments(beam))
    shapes = solve(model, np.array([20.0, 40.0, 80.0]) * model.load_scale(), np.array([0.0, beam.span]),
                   np.array([0, 0]))
    assert np.all(np.diff(shapes.moment[:, 0]) > 0)
    assert np.degrees(shapes.tip_rotation[-1]) > 89.5


@pytest.mark.parametrize("support", ["three-point", "four-point"])
def test_three_and_four_point_are_not_solved(support):
    with pytest.raises(InputError, match="not solved under large deflection"):
        refuse_unsolved(support)
