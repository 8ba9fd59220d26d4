"""The first bending frequency, mechanics/modal.py, for parts that are not uniform.

Sources: (1) stepped and hybrid beams against the exact Euler–Bernoulli solution of each uniform stretch,
chained by transfer matrices: y = [w, θ, M, V], y' = A·y with w' = θ, θ' = M/EI, M' = V, V' = ω²·m'·w
(harmonic motion of EI·w'''' = −m'·ẅ; Pestel & Leckie, Matrix Methods in Elastomechanics, 1963), the
transfer matrix of a stretch expm(A·l) (scipy.linalg.expm), the lowest root of the end conditions' 2×2
determinant by scipy.optimize.brentq; (2) tapered beams: convergence with the number of elements (the
Hermite element converges as h⁴ in the frequency, Strang & Fix, An Analysis of the Finite Element Method,
1973, ch. 6), and Rayleigh's principle (a narrower tip takes mass from where the mode moves most: the
frequency rises; common practice); (3) EI and m' from the laminate: the hybrid stack's m' = b·Σρ·t by hand.
"""
from __future__ import annotations

import math

import numpy as np
import pytest
from scipy import linalg, optimize

from flexcycle.mechanics.beam import Beam, Ply, segments
from flexcycle.mechanics.errors import InputError
from flexcycle.mechanics.materials import library
from flexcycle.mechanics.modal import first_mode

GLASS = library()["e-glass-epoxy"]
CARBON = library()["carbon-epoxy"]


def exact_first_frequency(stretches: list[tuple[float, float, float]], ends: str) -> float:
    """Lowest natural frequency [Hz] of a chain of uniform stretches (length [m], EI [N·m²], m' [kg/m]) from
    the root. ends: "clamped-free", "clamped-sliding" or "pinned-pinned"."""
    def determinant(omega: float) -> float:
        T = np.eye(4)
        for length, EI, m in stretches:
            A = np.array([[0, 1, 0, 0], [0, 0, 1 / EI, 0], [0, 0, 0, 1], [omega**2 * m, 0, 0, 0]], float)
            T = linalg.expm(A * length) @ T
        start, end = {"clamped-free": ([2, 3], [2, 3]), "clamped-sliding": ([2, 3], [1, 3]),
                      "pinned-pinned": ([1, 3], [0, 2])}[ends]  # unknowns at the root; quantities zero at the end
        return float(np.linalg.det(T[np.ix_(end, start)]))

    grid = np.geomspace(1.0, 1e5, 400)  # ω [rad/s]: steps of 3 %, finer than the gap to the second mode
    values = [determinant(w) for w in grid]
    k = next(i for i in range(len(grid) - 1) if np.sign(values[i]) != np.sign(values[i + 1]))
    return optimize.brentq(determinant, grid[k], grid[k + 1], xtol=1e-12) / (2 * math.pi)


def section(beam: Beam, x: float) -> tuple[float, float]:
    """EI [N·m²] and m' [kg/m] at x (uniform width) from the laminate of the segment there."""
    seg = next(s for s in segments(beam) if s.x0 <= x < s.x1)
    b = float(beam.width(x))
    return seg.bending.bending_stiffness * b, seg.lam.areal_mass * b


@pytest.mark.parametrize("support, ends", [("cantilever", "clamped-free"), ("guided", "clamped-sliding")])
def test_stepped_hybrid_beam_against_exact_transfer_matrices(support, ends):
    """A glass/carbon stack whose two outer carbon plies drop at 40 % of the span: the element model agrees
    with the exact chained solution within 1e-5 (the elements' discretisation error at 64 elements)."""
    plies = (Ply(CARBON, 0, 0.25e-3, ends_at=0.08), *(Ply(GLASS, 0, 0.25e-3) for _ in range(8)),
             Ply(CARBON, 0, 0.25e-3, ends_at=0.08))
    beam = Beam(support, 0.2, 0.03, 0.03, plies)
    stretches = [(0.08, *section(beam, 0.04)), (0.12, *section(beam, 0.15))]
    assert stretches[0][1] > stretches[1][1]  # the drop is a real step
    assert first_mode(beam).frequency == pytest.approx(exact_first_frequency(stretches, ends), rel=1e-5)


def test_stepped_three_point_against_exact():
    """A three-point coupon thicker over its middle 80 mm (the stack runs from mid-span): pinned-pinned chain
    of three stretches, symmetric."""
    plies = (*(Ply(GLASS, 0, 0.25e-3) for _ in range(8)), Ply(GLASS, 0, 0.5e-3, ends_at=0.04))
    beam = Beam("three-point", 0.24, 0.02, 0.02, plies)
    thick, thin = section(beam, 0.02), section(beam, 0.10)
    stretches = [(0.08, *thin), (0.08, *thick), (0.08, *thin)]
    assert first_mode(beam).frequency == pytest.approx(exact_first_frequency(stretches, "pinned-pinned"), rel=1e-5)


def test_uniform_hybrid_mass_per_length_by_hand():
    """m' = b·Σρt: with the uniform Blevins formula the hybrid's frequency follows from EI and m' by hand."""
    plies = (Ply(CARBON, 0, 0.3e-3), Ply(GLASS, 0, 0.5e-3), Ply(GLASS, 0, 0.5e-3), Ply(CARBON, 0, 0.3e-3))
    beam = Beam("cantilever", 0.25, 0.04, 0.04, plies)
    m_per_length = 0.04 * (2 * CARBON.density * 0.3e-3 + 2 * GLASS.density * 0.5e-3)
    EI = section(beam, 0.1)[0]
    assert section(beam, 0.1)[1] == pytest.approx(m_per_length, rel=1e-12)
    blevins = 1.87510**2 / (2 * math.pi * 0.25**2) * math.sqrt(EI / m_per_length)  # Blevins, Table 8-1 (recalled)
    assert first_mode(beam).frequency == pytest.approx(blevins, rel=1e-4)


@pytest.mark.parametrize("support", ["cantilever", "guided", "three-point", "four-point"])
def test_tapered_beam_converges(support):
    """Width 40 → 10 mm with a ply drop: the frequency settles as elements are added; successive differences
    shrink (h⁴ convergence, 16× per doubling in the limit: at least 4× asked for here, as the coarsest meshes are
    not yet in the asymptotic range, until the round-off floor of about 1e-7 of f) and 32 vs 64 elements (the
    default) agree to 1e-6."""
    plies = (*(Ply(GLASS, 0, 0.25e-3) for _ in range(8)), Ply(GLASS, 0, 0.25e-3, ends_at=0.05))
    beam = Beam(support, 0.2, 0.04, 0.01, plies, load_spacing=0.06 if support == "four-point" else None)
    f = [first_mode(beam, n).frequency for n in (8, 16, 32, 64)]
    steps = np.abs(np.diff(f))
    assert np.all(steps[1:] <= steps[:-1] / 4 + 2e-7 * f[-1])
    assert steps[0] > 5e-7 * f[-1]  # the coarse mesh is not yet converged: the test can see a rate
    assert f[-2] == pytest.approx(f[-1], rel=1e-6)


def test_narrow_tip_raises_the_cantilever_frequency():
    """Rayleigh's principle (common practice): the same root width, a narrower tip: less mass where the mode
    moves, EI lost where it bends least: f rises; at equal width the two agree."""
    plies = tuple(Ply(GLASS, 0, 0.25e-3) for _ in range(8))
    uniform = first_mode(Beam("cantilever", 0.2, 0.04, 0.04, plies)).frequency
    tapered = first_mode(Beam("cantilever", 0.2, 0.04, 0.01, plies)).frequency
    assert tapered > 1.1 * uniform


def test_mode_shape_is_the_first_mode():
    """The first mode has no node inside the span and its largest deflection at the tip (cantilever)."""
    mode = first_mode(Beam("cantilever", 0.2, 0.03, 0.03, tuple(Ply(GLASS, 0, 0.25e-3) for _ in range(8))))
    assert mode.shape[-1] == pytest.approx(1.0)
    assert np.all(np.diff(mode.shape) >= 0)


def test_too_few_elements_refused():
    with pytest.raises(InputError, match="elements must be >= 2"):
        first_mode(Beam("cantilever", 0.2, 0.03, 0.03, (Ply(GLASS, 0, 1e-3),)), 1)
