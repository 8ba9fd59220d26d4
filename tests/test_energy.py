"""Stored energy: U = ½CF², the energy of a cycle, storage figures."""
from __future__ import annotations

import numpy as np
import pytest
from hypothesis import given
from hypothesis import strategies as st

from flexcycle.mechanics.beam import Beam, Ply, respond
from flexcycle.mechanics.energy import cycle_energy, force_per_drive, storage_figures, stored_energy
from flexcycle.mechanics.errors import InputError

C = 2e-3  # compliance [m/N]: 500 N/m


def test_stored_energy_is_half_force_times_deflection():
    """Clapeyron: U = ½·F·δ = ½·C·F² (Timoshenko & Goodier, 3rd ed., sec. 88): 10 N on 500 N/m → δ = 20 mm, U = 0.1 J."""
    assert stored_energy(C, np.array([10.0]))[0] == pytest.approx(0.5 * 10 * 0.02, rel=1e-15)


@pytest.mark.parametrize(
    "lo, hi, expected",
    [
        (-10.0, 20.0, 0.5 * C * 400),  # crosses zero: from U = 0 to U(20 N)
        (5.0, 20.0, 0.5 * C * (400 - 25)),  # one-sided: from U(5 N) to U(20 N)
        (-20.0, -5.0, 0.5 * C * (400 - 25)),  # one-sided compression: the same by symmetry of U in F
        (-20.0, 10.0, 0.5 * C * 400),  # crosses zero, the larger |F| on the negative side
        (3.0, 3.0, 0.0),  # no cycle, no energy
    ],
)
def test_cycle_energy_from_lowest_to_highest_energy(lo, hi, expected):
    """docs/design.md: the energy taken in and given back from the lowest-energy point the cycle passes to its highest."""
    assert cycle_energy(C, np.array([lo]), np.array([hi]))[0] == pytest.approx(expected, rel=1e-12, abs=1e-18)


@given(lo=st.floats(-1e3, 1e3), width=st.floats(0, 2e3))
def test_cycle_energy_bounds(lo, width):
    """Invariant: 0 ≤ cycle energy ≤ the energy at the cycle's larger |drive|, and a sign flip changes nothing."""
    hi = lo + width
    e = cycle_energy(C, np.array([lo]), np.array([hi]))[0]
    top = stored_energy(C, np.array([max(abs(lo), abs(hi))]))[0]
    assert -1e-12 * top <= e <= top * (1 + 1e-12)
    assert cycle_energy(C, np.array([-hi]), np.array([-lo]))[0] == pytest.approx(e, rel=1e-12, abs=1e-15)


def test_force_per_drive():
    assert force_per_drive(C, "force") == 1.0
    assert force_per_drive(C, "deflection") == pytest.approx(500.0, rel=1e-15)  # F = k·δ
    with pytest.raises(InputError, match="drive"):
        force_per_drive(C, "torque")


def test_storage_figures_of_a_uniform_cantilever(isotropic):
    """Uniform end-loaded cantilever: U/((σmax²/2E)·V) = 1/9 (docs/references.md, stored energy; derived from the beam
    formulas). Shear adds U_s/U_b = 3EI/(κ G A L²) = E h²/(4 κ G L²) = 2.6·(1/200)²/(4·5/6) ≈ 2.0e-5 at L/h = 200,
    E/G = 2.6 (ν = 0.3): tolerance rel 1e-4. Specific energy U/m with m = ρ·b·h·L."""
    mat = isotropic(70e9, 0.3, density=2700.0, name="iso-energy")
    L, b, h = 0.4, 0.02, 0.002
    resp = respond(Beam("cantilever", L, b, b, (Ply(mat, 0.0, h),)))
    F = 5.0
    fig = storage_figures(resp, F)
    sigma = 6 * F * L / (b * h**2)  # Roark, 7th ed., Table 8.1 case 1a with σ = 6M/(bh²)
    assert fig.peak_strain_x == pytest.approx(sigma / 70e9, rel=1e-9)
    assert fig.efficiency == pytest.approx(1 / 9, rel=1e-4)
    assert fig.energy == pytest.approx(0.5 * resp.compliance * F**2, rel=1e-15)
    assert fig.specific_energy == pytest.approx(fig.energy / (2700.0 * b * h * L), rel=1e-12)
