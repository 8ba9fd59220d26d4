"""Shared test materials, built from a library entry with ``dataclasses.replace``.

- ``isotropic(E, nu)``: an isotropic ply, E1 = E2 = E, G12 = G13 = G23 = E/(2(1 + ν)) (isotropic
  elasticity; Timoshenko & Goodier, Theory of Elasticity, 3rd ed., sec. 6), so closed-form beam formulas
  (Roark, ASTM D790/D6272) apply to it exactly.
- ``kaw_ply``: the carbon/epoxy ply of Kaw, Mechanics of Composite Materials, 2nd ed., Ch. 2 examples,
  E1 = 181 GPa, E2 = 10.3 GPa, ν12 = 0.28, G12 = 7.17 GPa (docs/references.md).

The factories are session-scoped so hypothesis tests may use them.
"""
from __future__ import annotations

import dataclasses

import pytest
from hypothesis import settings

from flexcycle.mechanics.materials import Material, library

# No timing in tests: the machine is shared and a case may wait its turn for a processor. Speed is measured by
# the scripts in benchmarks/. (A test's own @settings still sets its number of examples.)
settings.register_profile("no-deadline", deadline=None)
settings.load_profile("no-deadline")


def make_isotropic(E: float, nu: float = 0.3, density: float = 1800.0, name: str = "test-isotropic") -> Material:
    """An isotropic ply material: E [Pa], ν [-], density [kg/m³]; G = E/(2(1 + ν))."""
    G = E / (2.0 * (1.0 + nu))
    return dataclasses.replace(
        library()["e-glass-epoxy"],
        name=name, kind="ply", description="isotropic test material",
        E1=E, E2=E, G12=G, G13=G, G23=G, nu12=nu, density=density,
    )


@pytest.fixture(scope="session")
def isotropic():
    """Factory: isotropic(E [Pa], nu [-] = 0.3, density [kg/m³] = 1800, name) -> Material."""
    return make_isotropic


@pytest.fixture(scope="session")
def kaw_ply() -> Material:
    """Kaw, 2nd ed., Ch. 2: E1 181 GPa, E2 10.3 GPa, ν12 0.28, G12 7.17 GPa (strengths Tsai & Hahn 1980)."""
    return dataclasses.replace(
        library()["carbon-epoxy"], name="kaw-carbon-epoxy", E1=181e9, E2=10.3e9, nu12=0.28, G12=7.17e9
    )
