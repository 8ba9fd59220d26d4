"""``flexcycle fit`` (DESIGN.md, the fit command contract): files, the round trip into a design file, bad input.

Coupon sets are generated on a power curve (S1 = 800 MPa, m = 10) with log-normal scatter, so no file of any
test programme is needed. The round trip checks the contract that curve.toml pastes into a design file as it
is: the life read from the pasted table equals the life from the fitted numbers (fit.json) typed by hand.
"""
from __future__ import annotations

import json
import tomllib
from pathlib import Path

import numpy as np
import pytest
from cli_runner import run_cli

from flexcycle.design import load_design
from flexcycle.estimate import estimate

DEMO = Path(__file__).resolve().parents[1] / "life" / "examples" / "demo-coupons.csv"
FIT_KEYS = {"form", "R", "S1", "sd_log10N", "n_failures", "n_runouts", "method", "design"}  # DESIGN.md, fit.json
DESIGN_KEYS = {"survival", "confidence", "k", "S1"}

MATERIAL = """\
[material.test-glass]
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
"""


def design_text(fatigue: str, survival: float = 0.5) -> str:
    """A 0° cantilever of test-glass under a block table (the fibre curve ``fatigue`` pasted at the end)."""
    return f"""\
title = "round trip"
[beam]
support = "cantilever"
span = "200 mm"
width = "20 mm"
stations = 4

[[ply]]
material = "test-glass"
angle = 0
thickness = "0.5 mm"
count = 4

[duty]
drive = "force"
cycles = [ {{ min = "-30 N", max = "30 N", count = 1000 }}, {{ min = "0 N", max = "45 N", count = 200 }} ]

[fatigue]
mean_stress = "goodman"
survival = {survival}

{MATERIAL}
{fatigue}
"""


def write_coupons(path: Path, seed: int = 4, runouts: bool = False, header: str = "stress_mpa,cycles,runout") -> Path:
    rng = np.random.default_rng(seed)
    a = np.repeat([500.0, 420.0, 360.0, 300.0], 3)
    N = 10.0 ** (10.0 * np.log10(800.0 / a) + rng.normal(0.0, 0.25, a.size))
    stop = np.quantile(N, 0.8) if runouts else np.inf
    rows = [f"{x:g},{min(n, stop):.6g},{int(n > stop)}" for x, n in zip(a, N)]
    path.write_text("# generated test coupons\n" + header + "\n" + "\n".join(rows) + "\n", encoding="utf-8")
    return path


def fit_args(data: Path, out: Path, *more: str) -> list:
    return ["fit", data, "--amplitude", "stress_mpa", "--unit", "MPa", "--cycles", "cycles", "--R", "-1",
            "--out", out, *more]


def test_fit_writes_the_contract_files(tmp_path):
    data = write_coupons(tmp_path / "c.csv", runouts=True)
    ran = run_cli(fit_args(data, tmp_path / "out", "--runout", "runout"))
    assert ran.code == 0, ran.err
    doc = json.loads((tmp_path / "out" / "fit.json").read_text())
    assert FIT_KEYS <= set(doc) and "m" in doc and DESIGN_KEYS <= set(doc["design"]) and "m" in doc["design"]
    assert doc["method"].startswith("maximum likelihood") and doc["n_runouts"] == 3 and doc["n_failures"] == 9
    assert doc["design"]["S1"] < doc["S1"]  # the design curve lies below the median one (same m)
    tomllib.loads((tmp_path / "out" / "curve.toml").read_text())  # valid TOML
    page = (tmp_path / "out" / "fit.html").read_text()
    assert page.startswith("<!DOCTYPE html>") and page.count("<svg") == 2 and "http" not in page.split("<body>")[0]
    assert "maximum likelihood" in ran.out and "R = -1" in ran.out


def test_round_trip_fit_curve_toml_design_life(tmp_path):
    """fit → curve.toml pasted into a design → life equals the life with fit.json's numbers typed by hand
    (1e-8 relative: curve.toml writes 10 significant digits, which moves N by at most m·5e-10 = 5e-9)."""
    data = write_coupons(tmp_path / "c.csv")
    ran = run_cli(fit_args(data, tmp_path / "out", "--material", "test-glass"))
    assert ran.code == 0, ran.err
    doc = json.loads((tmp_path / "out" / "fit.json").read_text())
    pasted = (tmp_path / "out" / "curve.toml").read_text()
    typed = f"""\
[material.test-glass.fatigue]
form = "power"
R = -1
S1 = "{doc['S1']!r} Pa"
m = {doc['m']!r}
sd_log10N = {doc['sd_log10N']!r}
"""
    for survival in (0.5, 0.9):
        (tmp_path / "pasted.toml").write_text(design_text(pasted, survival))
        (tmp_path / "typed.toml").write_text(design_text(typed, survival))
        life_pasted = estimate(load_design(tmp_path / "pasted.toml")).life_blocks
        life_typed = estimate(load_design(tmp_path / "typed.toml")).life_blocks
        assert life_pasted == pytest.approx(life_typed, rel=1e-8)
    # and the design curve, uncommented in place of the median table, reads as a design file too
    design_table = "\n".join(line[2:] for line in pasted.split("# The design curve")[1].splitlines()
                             if line.startswith("# ["))
    assert design_table.startswith("[material.test-glass.fatigue]")


def test_several_R_give_a_cld_curve_list(tmp_path):
    rng = np.random.default_rng(9)
    rows = ["level,cycles,R"]
    for R, S1 in ((-1, 800.0), (0.1, 600.0)):
        for a in (500.0, 420.0, 360.0, 300.0):
            rows += [f"{a * (S1 / 800):g},{10 ** (10 * np.log10(S1 / (a * S1 / 800)) + rng.normal(0, 0.2)):.6g},{R}"
                     for _ in range(2)]
    (tmp_path / "two.csv").write_text("\n".join(rows) + "\n")
    ran = run_cli(["fit", tmp_path / "two.csv", "--amplitude", "level", "--unit", "MPa", "--cycles", "cycles",
                   "--material", "test-glass", "--out", tmp_path / "out"])
    assert ran.code == 0, ran.err
    table = tomllib.loads((tmp_path / "out" / "curve.toml").read_text())["material"]["test-glass"]["fatigue"]
    assert [c["R"] for c in table["curves"]] == [-1, 0.1]
    doc = json.loads((tmp_path / "out" / "fit.json").read_text())
    assert doc["R_values"] == [-1.0, 0.1] and len(doc["curves"]) == 2
    pasted = (tmp_path / "out" / "curve.toml").read_text()
    (tmp_path / "d.toml").write_text(design_text(pasted).replace('mean_stress = "goodman"', 'mean_stress = "cld"'))
    assert estimate(load_design(tmp_path / "d.toml")).life_blocks > 0


def test_demo_coupons_run(tmp_path):
    ran = run_cli(["fit", DEMO, "--amplitude", "strain_amplitude_pct", "--unit", "%", "--cycles", "cycles",
                   "--runout", "runout", "--R", "-1", "--out", tmp_path / "out"])
    assert ran.code == 0, ran.err
    assert tomllib.loads((tmp_path / "out" / "curve.toml").read_text())["material"]["fitted"]["fatigue"]["S1"].endswith("%")


BAD = {
    # case: (csv body under the header "stress_mpa,cycles,runout", extra options, fragments of the message)
    "fewer than three failures": ("500,1000,0\n400,20000,0\n300,1e7,1\n", [], ["2 failures", "'runout'"]),
    "one level only": ("400,1000,0\n400,2000,0\n400,3000,0\n", [], ["one level", "'stress_mpa'"]),
    "non-positive level": ("500,1000,0\n-400,20000,0\n300,90000,0\n", [], ["row 2", "'stress_mpa'", "> 0"]),
    "non-positive cycles": ("500,1000,0\n400,0,0\n300,90000,0\n", [], ["row 2", "'cycles'", "> 0"]),
    "runout below every failure": ("500,1000,0\n450,300,1\n400,20000,0\n300,90000,0\n", [],
                                   ["row 2", "'runout'", "before every failure"]),
    "mixed units": ("500,1000,0\n58 ksi,20000,0\n300,90000,0\n", [], ["row 2", "'stress_mpa'", "one unit"]),
    "not a number": ("500,1000,0\n400,many,0\n300,90000,0\n", [], ["row 2", "'cycles'", "not a number"]),
    "runout flag": ("500,1000,0\n400,20000,maybe\n300,90000,0\n", [], ["row 2", "'runout'"]),
}


@pytest.mark.parametrize("case", BAD, ids=list(BAD))
def test_bad_coupons_exit_2_naming_file_column_and_row(case, tmp_path):
    body, more, fragments = BAD[case]
    data = tmp_path / "bad.csv"
    data.write_text("stress_mpa,cycles,runout\n" + body)
    out = tmp_path / "out"
    out.mkdir()
    (out / "fit.json").write_text("old")
    ran = run_cli(fit_args(data, out, "--runout", "runout", *more))
    assert ran.code == 2, ran
    assert ran.err.startswith("flexcycle: bad.csv") and ran.err.count("\n") == 1, ran.err
    for fragment in fragments:
        assert fragment in ran.err, (fragment, ran.err)
    assert (out / "fit.json").read_text() == "old" and sorted(p.name for p in out.iterdir()) == ["fit.json"]


def test_maximum_without_R_exits_2(tmp_path):
    data = write_coupons(tmp_path / "c.csv")
    ran = run_cli(["fit", data, "--maximum", "stress_mpa", "--unit", "MPa", "--cycles", "cycles", "--out", tmp_path / "o"])
    assert ran.code == 2 and "--maximum level needs R" in ran.err and "c.csv" in ran.err


def test_unknown_column_lists_the_columns(tmp_path):
    data = write_coupons(tmp_path / "c.csv")
    ran = run_cli(["fit", data, "--amplitude", "stress", "--unit", "MPa", "--cycles", "cycles", "--R", "-1",
                   "--out", tmp_path / "o"])
    assert ran.code == 2 and "no column 'stress'" in ran.err and "'stress_mpa', 'cycles', 'runout'" in ran.err


def test_a_unit_of_neither_basis_exits_2(tmp_path):
    data = write_coupons(tmp_path / "c.csv")
    ran = run_cli(["fit", data, "--amplitude", "stress_mpa", "--unit", "mm", "--cycles", "cycles", "--R", "-1",
                   "--out", tmp_path / "o"])
    assert ran.code == 2 and "neither a stress unit" in ran.err
