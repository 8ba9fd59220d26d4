"""Lives at a survival probability through the whole estimate (``[fatigue] survival``, curve key ``sd_log10N``).

Log-normal scatter of sd decades about each median curve, the same at every amplitude, gives
N_p = N_median·10^(−z_p·sd) with z_p = Φ⁻¹(p), z_0.9 = 1.2816 (standard normal tables). Every cycle's life
is lowered by the same factor on a one-curve part, so Miner's sum grows by 10^(z_p·sd) and the life falls
by it exactly. A hybrid layup lowers each material's lives by its own sd: the life is the shorter of the
materials' lowered lives, whichever governed at the median.
"""
from __future__ import annotations

import json
import math

import numpy as np
import pytest
from cli_runner import run_cli
from scipy import stats

from flexcycle.design import load_design
from flexcycle.estimate import estimate

Z_09 = 1.2816  # standard normal tables, 4 decimals


def glass(name: str, S1: str, sd: float | None, m: float = 10.0, extra: str = "") -> str:
    scatter = "" if sd is None else f"sd_log10N = {sd}\n"
    return f"""\
[material.{name}]
E1 = "40 GPa"
E2 = "10 GPa"
G12 = "4 GPa"
nu12 = 0.28
density = "1900 kg/m^3"
Xt = "1000 MPa"
Xc = "700 MPa"
Yt = "40 MPa"
Yc = "140 MPa"
S12 = "70 MPa"
[material.{name}.fatigue]
form = "power"
R = -1
S1 = "{S1}"
m = {m}
{scatter}{extra}"""


def write(tmp_path, plies: str, materials: str, survival: float, name: str = "d.toml", rule: str = "goodman"):
    path = tmp_path / name
    path.write_text(f"""\
title = "survival"
[beam]
support = "cantilever"
span = "200 mm"
width = "20 mm"
stations = 4

{plies}
[duty]
drive = "force"
cycles = [ {{ min = "-20 N", max = "20 N", count = 1000 }}, {{ min = "0 N", max = "30 N", count = 300 }} ]

[fatigue]
mean_stress = "{rule}"
survival = {survival}

{materials}
""", encoding="utf-8")
    return load_design(path)


def plies(*names: str) -> str:
    return "\n".join(f'[[ply]]\nmaterial = "{n}"\nangle = 0\nthickness = "0.5 mm"\ncount = 2\n' for n in names)


def test_survival_0_9_lowers_the_life_by_ten_to_the_1_2816_sd(tmp_path):
    sd = 0.3
    median = estimate(write(tmp_path, plies("g", "g"), glass("g", "800 MPa", sd), 0.5, "m.toml"))
    b10 = estimate(write(tmp_path, plies("g", "g"), glass("g", "800 MPa", sd), 0.9, "b.toml"))
    assert b10.life_blocks_median == pytest.approx(median.life_blocks, rel=1e-12)  # the same sums, round-off
    exact = 10 ** (-stats.norm.ppf(0.9) * sd)
    assert b10.life_blocks / median.life_blocks == pytest.approx(exact, rel=1e-10)  # parameter algebra, round-off
    # z printed to 4 decimals (±5e-5) moves the ratio by up to 0.3·5e-5·ln 10 = 3.5e-5
    assert b10.life_blocks / median.life_blocks == pytest.approx(10 ** (-Z_09 * sd), rel=4e-5)
    s = b10.summary()
    assert s["survival"] == 0.9 and s["life_blocks_median"] == pytest.approx(median.life_blocks, rel=1e-12)
    assert median.summary()["life_blocks_median"] == median.summary()["life_blocks"]


def test_a_curve_without_scatter_stays_median_with_a_warning(tmp_path):
    median = estimate(write(tmp_path, plies("g", "g"), glass("g", "800 MPa", None), 0.5, "m.toml"))
    b10 = estimate(write(tmp_path, plies("g", "g"), glass("g", "800 MPa", None), 0.9, "b.toml"))
    assert b10.life_blocks == pytest.approx(median.life_blocks, rel=1e-12)
    assert any("no sd_log10N" in w and "median lives" in w for w in b10.warnings)
    assert not any("sd_log10N" in w for w in median.warnings)  # at 0.5 nothing is missing


def test_a_hybrid_takes_the_shorter_of_its_materials_lowered_lives(tmp_path):
    """Two glasses, a (sd 0.1) governing at the median, b (sd 0.8) a little stronger: at 99 % survival b's
    lives fall by 10^(−2.326·0.8) and a's by 10^(−2.326·0.1) only, so b governs; the life is the smaller of
    each material's median life lowered by its own factor (worked from the median damage per location)."""
    materials = glass("a", "800 MPa", 0.1) + "\n" + glass("b", "900 MPa", 0.8)
    stack = plies("a", "b")  # a on the tension face, b on the compression face
    median = estimate(write(tmp_path, stack, materials, 0.5, "m.toml"))
    p99 = estimate(write(tmp_path, stack, materials, 0.99, "p.toml"))
    names = np.array([ply.material.name for ply in median.design.beam.plies])[median.locations.ply]
    z = stats.norm.ppf(0.99)
    lives = {}
    for material, sd in (("a", 0.1), ("b", 0.8)):
        worst = median.damage.damage[names == material].max()
        lives[material] = 1.0 / worst * 10 ** (-z * sd)
    governing_median = names[int(np.argmax(median.damage.damage))]
    assert governing_median == "a" and min(lives, key=lives.get) == "b"  # the scatter changes which governs
    assert p99.life_blocks == pytest.approx(min(lives.values()), rel=1e-9)  # round-off of the curve algebra
    assert p99.design.beam.plies[p99.critical.ply - 1].material.name == "b"


def test_constant_life_diagram_with_one_scatter_moves_as_a_whole(tmp_path):
    """cld: every curve lowered by the same 10^(−z·sd), the diagram at N_p is the median one at N_p·10^(z·sd),
    so the life falls by that factor too (the bracketed root of the diagram to 1e-9 decades: 3e-9 relative)."""
    table = """\
[material.g]
E1 = "40 GPa"
E2 = "10 GPa"
G12 = "4 GPa"
nu12 = 0.28
density = "1900 kg/m^3"
Xt = "1000 MPa"
Xc = "700 MPa"
Yt = "40 MPa"
Yc = "140 MPa"
S12 = "70 MPa"
[[material.g.fatigue.curves]]
form = "power"
R = -1
S1 = "800 MPa"
m = 10
sd_log10N = 0.25
[[material.g.fatigue.curves]]
form = "power"
R = 0.1
S1 = "450 MPa"
m = 12
sd_log10N = 0.25
"""
    median = estimate(write(tmp_path, plies("g", "g"), table, 0.5, "m.toml", rule="cld"))
    b10 = estimate(write(tmp_path, plies("g", "g"), table, 0.9, "b.toml", rule="cld"))
    assert b10.life_blocks / median.life_blocks == pytest.approx(10 ** (-stats.norm.ppf(0.9) * 0.25), rel=1e-8)


def test_run_prints_both_lives_and_writes_the_summary_keys(tmp_path):
    write(tmp_path, plies("g", "g"), glass("g", "800 MPa", 0.3), 0.9)
    ran = run_cli(["run", tmp_path / "d.toml", "--out", tmp_path / "out"])
    assert ran.code == 0, ran.err
    assert "survival 0.9" in ran.out and "median" in ran.out
    s = json.loads((tmp_path / "out" / "summary.json").read_text())
    assert s["survival"] == 0.9 and s["life_blocks"] < s["life_blocks_median"]
    assert math.isclose(s["life_blocks"] / s["life_blocks_median"], 10 ** (-stats.norm.ppf(0.9) * 0.3), rel_tol=1e-9)
    page = (tmp_path / "out" / "report.html").read_text()
    assert "survival" in page and "median" in page


@pytest.mark.parametrize("value, fragment", [("-0.1", "must be >= 0"), ('"0.3"', "bare number")])
def test_a_bad_scatter_is_refused_with_its_key(tmp_path, value, fragment):
    from flexcycle.errors import InputError

    text = glass("g", "800 MPa", None, extra=f"sd_log10N = {value}\n")
    with pytest.raises(InputError) as caught:
        write(tmp_path, plies("g", "g"), text, 0.9)
    assert "fatigue.sd_log10N" in str(caught.value) and fragment in str(caught.value)
