"""A strain gauge under large deflection (mechanics/large_gauge.py, life/measured.py, the design loader).

Source: a strain-driven design equals the force-driven design whose force gives that strain at the gauge. The
forces are worked independently of the tabulated map: the elastica solved at single end loads
(`flexcycle.mechanics.elastica.solve`, itself checked against Bisshopp & Drucker's table in
tests/validation/test_bisshopp_drucker_cantilever.py) gives the gauge section's moment M, and the isotropic
strip's surface strain per moment is the closed form ε = 6M/(E·b·h²) (σ = 6M/(bh²), Roark's Formulas for Stress
and Strain, 7th ed., Table 8.1); scipy's brentq finds the load of a given strain. The cantilever is driven far:
its end moves about 30 % of the span, where the linear map's force is off by several per cent.

Tolerance: the map interpolates the gauge station's moment within 0.1 % of its largest (TABLE_TOLERANCE of the
elastica's table), so a strain is inverted to a force within 0.1 % × (secant / tangent slope of ε(F)), about
1.2 × here (the strain grows less than in proportion with the load): rel 2e-3 on forces. The strain-driven and the
force-driven estimates then differ by that force error at most: rel 2e-3 on the peak strain, and the life (the
S-N exponent m = 10, so 10 × 0.2 %) rel 2e-2.
"""
from __future__ import annotations

import functools
import tempfile
from pathlib import Path

import numpy as np
import pytest
from designs import ISOTROPIC
from scipy.optimize import brentq

from flexcycle.design import load_design
from flexcycle.errors import InputError
from flexcycle.estimate import estimate
from flexcycle.mechanics.beam import segments
from flexcycle.mechanics.elastica import prepare, solve
from flexcycle.mechanics.gauge import Gauge
from flexcycle.mechanics.large_gauge import large_gauge_map

E, B, H, L = 40e9, 0.030, 0.004, 0.200  # isotropic strip: 4 plies of 1 mm, EI = 6.4 N·m²
X_GAUGE = 0.020  # the gauge 20 mm from the clamp, tension face
BEAM = f"""
title = "large-deflection gauge check (demo)"
[beam]
support = "cantilever"
span = "{L * 1e3:g} mm"
width = "{B * 1e3:g} mm"
theory = "large-deflection"
[[ply]]
material = "iso"
thickness = "1 mm"
count = 4
"""
FAR = 144.0  # N: the linear deflection PL³/(3EI) = 60 mm, 30 % of the span (the elastica's is a little less)


def write(folder: Path, duty: str, theory: str = "large-deflection") -> Path:
    folder.mkdir(parents=True, exist_ok=True)
    path = folder / "design.toml"
    path.write_text(BEAM.replace('"large-deflection"', f'"{theory}"') + "\n[duty]\n" + duty + "\n" + ISOTROPIC,
                    encoding="utf-8")
    return path


@functools.cache
def strip_model():
    """The strip prepared for the elastica (loaded once from a force-driven design file)."""
    folder = Path(tempfile.mkdtemp())
    beam = load_design(write(folder, 'drive = "force"\ncycles = [ { min = "0 N", max = "1 N", count = 1 } ]')).beam
    return beam, prepare(beam, segments(beam))


def gauge_strain(force: float) -> float:
    """The elastica's moment at the gauge at one end load, times the closed-form surface strain per moment."""
    _, model = strip_model()
    moment = float(solve(model, np.array([force]), np.array([X_GAUGE]), np.array([0])).moment[0, 0])
    return 6.0 * moment / (E * B * H**2)


def force_of(strain: float) -> float:
    """The end load whose gauge strain is ``strain`` (brentq on the elastica, to 1e-12 of the load)."""
    return brentq(lambda f: gauge_strain(f) - strain, 1e-3, 10 * FAR, xtol=1e-12, rtol=1e-12)


def test_strain_drive_equals_the_force_drive_far_from_linear(tmp_path):
    top = gauge_strain(FAR)
    low = top / 3
    f_low, f_top = force_of(low), FAR
    linear_top = 6.0 * FAR * (L - X_GAUGE) / (E * B * H**2)  # the straight line's strain (Roark 1a, M = F(L − x))
    assert top / linear_top - 1 < -0.02  # far from linear: the arm has shortened by more than 2 %
    strain_design = load_design(write(tmp_path / "strain", 'drive = "strain"\ngauge = { x = "20 mm", face = "tension" }\n'
                                      f'cycles = [ {{ min = "{low * 1e6!r} ue", max = "{top * 1e6!r} ue", count = 1000 }} ]'))
    lo, hi = strain_design.duty.cycles.lo[0], strain_design.duty.cycles.hi[0]
    assert lo == pytest.approx(f_low, rel=2e-3) and hi == pytest.approx(f_top, rel=2e-3)  # 0.1 % table, see above
    force_design = load_design(write(tmp_path / "force", 'drive = "force"\n'
                                     f'cycles = [ {{ min = "{f_low!r} N", max = "{f_top!r} N", count = 1000 }} ]'))
    strain, force = estimate(strain_design).summary(), estimate(force_design).summary()
    assert strain["peak_strain"] == pytest.approx(force["peak_strain"], rel=2e-3)
    assert strain["life_cycles"] == pytest.approx(force["life_cycles"], rel=2e-2)
    assert strain["tip_rotation_deg"] == pytest.approx(force["tip_rotation_deg"], rel=2e-3)
    # the linear map would have asked for the straight line's force: well outside the tolerance here
    linear = load_design(write(tmp_path / "linear", 'drive = "strain"\ngauge = { x = "20 mm", face = "tension" }\n'
                               f'cycles = [ {{ min = "{low * 1e6!r} ue", max = "{top * 1e6!r} ue", count = 1000 }} ]',
                               theory="linear"))
    assert abs(linear.duty.cycles.hi[0] / f_top - 1) > 10 * 2e-3


def test_compression_face_and_negative_strains(tmp_path):
    """A gauge on the compression face reads −ε of the tension face (the isotropic stack is symmetric); the map
    is odd in the load, so negative strains there are positive forces, the same ones."""
    top = gauge_strain(FAR)
    tension = load_design(write(tmp_path / "t", 'drive = "strain"\ngauge = { x = "20 mm", face = "tension" }\n'
                                f'cycles = [ {{ min = "0 ue", max = "{top * 1e6!r} ue", count = 10 }} ]'))
    compression = load_design(write(tmp_path / "c", 'drive = "strain"\ngauge = { x = "20 mm", face = "compression" }\n'
                                    f'cycles = [ {{ min = "{-top * 1e6!r} ue", max = "0 ue", count = 10 }} ]'))
    assert compression.duty.cycles.hi[0] == pytest.approx(tension.duty.cycles.hi[0], rel=1e-9)
    assert tension.duty.cycles.hi[0] == pytest.approx(FAR, rel=2e-3)


def test_map_is_monotone_and_covers_the_strains(tmp_path):
    beam, _ = strip_model()
    top = gauge_strain(FAR)
    mapping = large_gauge_map(beam, Gauge(X_GAUGE, "tension"), -top, top)
    assert np.all(np.diff(mapping.strain) > 0) and mapping.strain[0] <= -top and mapping.strain[-1] >= top
    assert float(mapping.drive(np.array([top]))[0]) == pytest.approx(FAR, rel=2e-3)


def test_unreachable_strain_is_an_input_error(tmp_path):
    """A strain far beyond what any solved load gives (the elastica's load limit) is refused with one message."""
    with pytest.raises(InputError, match="gauge"):
        load_design(write(tmp_path, 'drive = "strain"\ngauge = { x = "20 mm", face = "tension" }\n'
                          'cycles = [ { min = "0 ue", max = "900000 ue", count = 1 } ]'))


def test_the_linear_warning_compares_with_the_elastica_of_the_gauge(tmp_path):
    """A strain-driven design under linear theory past 10 % of the span: the warning's large-deflection figure is
    that of the strain-driven large-deflection design (its strains through the elastica's map), not of the linear
    map's forces under the elastica (about 5 % lower forces here, so a lower peak strain; the 4 digits shown differ)."""
    top = gauge_strain(FAR)
    duty = ('drive = "strain"\ngauge = { x = "20 mm", face = "tension" }\n'
            f'cycles = [ {{ min = "0 ue", max = "{top * 1e6!r} ue", count = 1000 }} ]')
    linear = estimate(load_design(write(tmp_path / "linear", duty, theory="linear")))
    large = estimate(load_design(write(tmp_path / "large", duty)))
    warning = next(w for w in linear.warnings if "passes 10 % of the span" in w)
    assert f"the peak strain is {large.peak_strain:.4g}" in warning
