"""The ``flexcycle`` command, life/cli/app.py (docs/design.md, outputs contract and exit codes).

The bundled example and one wrong design run through the installed console script (a subprocess, as a
user runs it); everything else runs in-process through ``flexcycle.cli.app.main`` with ``sys.argv`` patched, which
is the same entry point without the ~1.5 s start-up of a new interpreter.

Designs here are small cantilevers of a UD laminate, for which the rectangular-section formulas hold at
the root (docs/references.md, Roark 7th ed. / rectangular section): σ = 6FL/(bh²), δ = 4FL³/(Ebh³), so the
fibre strain per tip deflection is ε = 3δh/(2L²) when shear deflection is ignored (with it the strain
per deflection is smaller, which keeps the bounds below on the safe side).
"""
from __future__ import annotations

import json
import math
import re
import subprocess
import sys
from pathlib import Path

import numpy as np
import pandas as pd
import pytest
import rainflow
from cli_runner import flexcycle, run_cli
from designs import user_glass

from flexcycle.cli import app as cli_module
from flexcycle.spectra import profiles as spectra_profiles
from flexcycle.spectra.profiles import bundled_profile

FLEXCYCLE = Path(sys.executable).parent / "flexcycle"  # the console script of this environment

CONTRACT_KEYS = {
    "title", "life_cycles", "life_blocks", "life_days", "damage_per_block", "critical", "stiffness_n_per_m",
    "mass_kg", "peak_strain", "peak_energy_j", "cycle_energy_j", "specific_energy_j_per_kg", "static_reserve",
    "warnings", "life_unbounded",
}  # docs/design.md, outputs contract, summary.json
CRITICAL_KEYS = {"x_m", "ply", "z_m", "mode"}
MODES = {"fibre-tension", "fibre-compression", "transverse", "shear", "interlaminar", "core-shear"}
BUNDLED_MATERIALS = {"e-glass-epoxy", "carbon-epoxy", "aramid-epoxy", "glass-epoxy-woven", "sugar-maple",
                     "structural-foam"}

# my-glass of docs/design.md's design-file example, plus (in some tests) a fatigue limit on its curve.
MY_GLASS = user_glass("my-glass")


def cantilever(duty: str, material: str = "e-glass-epoxy", extra: str = "", title: str = "test cantilever",
               span: str = "200 mm", thickness: str = "0.5 mm", count: int = 4) -> str:
    """A cantilever 20 mm wide of ``count`` 0° plies, by default 200 mm of 4 × 0.5 mm (h = 2 mm); few stations."""
    return f"""\
title = "{title}"
[beam]
support = "cantilever"
span = "{span}"
width = "20 mm"
stations = 4

[[ply]]
material = "{material}"
angle = 0
thickness = "{thickness}"
count = {count}

[duty]
{duty}
{extra}"""


def strict_json(text: str) -> dict:
    """json.loads that refuses NaN and ±Infinity (not JSON, RFC 8259)."""
    def refuse(name):
        raise ValueError(f"not strict JSON: {name}")
    return json.loads(text, parse_constant=refuse)


def snapshot(folder: Path) -> dict[str, bytes]:
    """Every file under ``folder`` with its bytes, hidden ones included."""
    return {str(p.relative_to(folder)): p.read_bytes() for p in sorted(folder.rglob("*")) if p.is_file()}


def ride_cycles_reference() -> list[tuple[float, float]]:
    """The `rainflow` package's count (ASTM E1049-85 reference implementation) of the bundled ride [mm]."""
    column = pd.read_csv(bundled_profile("cargo-bike-ride"), comment="#", skipinitialspace=True)["deflection_mm"]
    return rainflow.count_cycles(column.to_numpy(dtype=float))


# ---------------------------------------------------------------------------------------------
# The bundled example through the console script


@pytest.fixture(scope="module")
def example_run(tmp_path_factory):
    """`flexcycle run --out DIR` with no design: the bundled example, run once for the tests below."""
    out = tmp_path_factory.mktemp("example") / "out"
    proc = subprocess.run([str(FLEXCYCLE), "run", "--out", str(out)], capture_output=True, text=True, timeout=120)
    return proc, out


def test_example_run_exits_0_and_writes_the_four_files(example_run):
    proc, out = example_run
    assert proc.returncode == 0, proc.stderr
    assert proc.stderr == ""
    for name in ("summary.json", "cycles.csv", "locations.csv", "report.html"):
        assert (out / name).is_file(), name


def test_the_console_script_leaves_everything_written(example_run):
    """`flexcycle.cli.app.entry`: the terminal output is there to its last line (flushed), and every file is
    whole (the report ends with its closing tag); no staging folder is left behind."""
    proc, out = example_run
    assert proc.stdout.rstrip().endswith(f"to {out}")
    assert (out / "report.html").read_text(encoding="utf-8").rstrip().endswith("</html>")
    assert not list(out.parent.glob(".flexcycle-staging-*"))


def test_no_command_shows_the_help_and_no_empty_message():
    proc = subprocess.run([str(FLEXCYCLE)], capture_output=True, text=True, timeout=60)
    assert proc.returncode == 2
    assert "Usage" in proc.stdout and "run" in proc.stdout
    assert proc.stderr.strip() == ""


def test_example_summary_has_every_contract_key_finite_strict_json(example_run):
    """Every key of docs/design.md's summary.json contract; numbers finite (strict JSON has no NaN/Infinity)."""
    _, out = example_run
    s = strict_json((out / "summary.json").read_text(encoding="utf-8"))
    assert CONTRACT_KEYS <= set(s)
    assert CRITICAL_KEYS <= set(s["critical"])
    assert isinstance(s["title"], str) and s["title"]
    for key in CONTRACT_KEYS - {"title", "critical", "warnings", "life_unbounded"}:
        value = s[key]
        assert isinstance(value, (int, float)) and not isinstance(value, bool), key
        assert math.isfinite(value), key
    for key in ("x_m", "z_m"):
        assert isinstance(s["critical"][key], float) and math.isfinite(s["critical"][key])
    # the example's stack: 1 + 6 + 2 + 6 + 1 plies (life/examples/cargo-bike-rear-spring.toml)
    assert isinstance(s["critical"]["ply"], int) and 1 <= s["critical"]["ply"] <= 16
    assert s["critical"]["mode"] in MODES
    assert 0.0 <= s["critical"]["x_m"] <= 0.300  # within the 300 mm span
    assert s["life_unbounded"] is False
    assert isinstance(s["warnings"], list) and all(isinstance(w, str) for w in s["warnings"])


def test_example_summary_values_by_hand(example_run):
    """Hand checks on the bundled example (cargo-bike-rear-spring.toml, invented demo data).

    mass: width 60 → 36 mm over 300 mm, mean 48 mm, planform 0.3 × 0.048 = 0.0144 m²; the two dropped
    plies run to 210 mm where the width is 60 − 24·0.21/0.3 = 43.2 mm, mean 51.6 mm, planform 0.010836 m².
    Areal masses: 2 woven plies 0.25 mm × 1900 kg/m³ + 12 UD plies 0.8 mm × 1800 kg/m³ = 18.23 kg/m²;
    dropped plies 2 × 0.8 mm × 1800 = 2.88 kg/m² (densities: the library's, "recalled").
    m = 0.0144 × 18.23 + 0.010836 × 2.88 = 0.29371968 kg.
    The definitions of the contract: life_cycles = life_blocks × cycles per block, life_days = life_blocks
    / blocks_per_day (4 in the example), specific energy = peak_energy_j / mass_kg, damage per block =
    miner_limit (1) / life_blocks; cycles per block = the `rainflow` package's total count of the ride.
    """
    _, out = example_run
    s = strict_json((out / "summary.json").read_text(encoding="utf-8"))
    assert s["mass_kg"] == pytest.approx(0.29371968, rel=1e-9)  # rel 1e-9: exact geometry, float rounding
    per_block = sum(n for _, n in ride_cycles_reference())
    assert s["life_cycles"] == pytest.approx(s["life_blocks"] * per_block, rel=1e-12)
    assert s["life_days"] == pytest.approx(s["life_blocks"] / 4.0, rel=1e-12)
    assert s["specific_energy_j_per_kg"] == pytest.approx(s["peak_energy_j"] / s["mass_kg"], rel=1e-12)
    assert s["damage_per_block"] == pytest.approx(1.0 / s["life_blocks"], rel=1e-12)
    assert s["stiffness_n_per_m"] > 0 and s["peak_strain"] > 0 and s["static_reserve"] > 0
    assert 0 < s["cycle_energy_j"] <= s["peak_energy_j"] * (1 + 1e-12)  # a cycle cannot hold more than the peak


def test_example_cycles_csv(example_run):
    """cycles.csv: header min,max,count (SI); its counts add up to the `rainflow` package's total for the ride,
    and Σ (max − min)·count to its Σ range·count [mm → m]."""
    _, out = example_run
    text = (out / "cycles.csv").read_text(encoding="utf-8")
    assert text.splitlines()[0].split(",")[:3] == ["min", "max", "count"]
    table = pd.read_csv(out / "cycles.csv")
    reference = ride_cycles_reference()
    assert table["count"].sum() == pytest.approx(sum(n for _, n in reference), abs=1e-9)  # counts are k/2
    # rel 1e-8: cycles.csv writes 9 significant digits
    assert float(((table["max"] - table["min"]) * table["count"]).sum()) == pytest.approx(
        sum(r * n for r, n in reference) * 1e-3, rel=1e-8)


def test_example_terminal_summary(example_run):
    """The terminal shows life in cycles, blocks and days, the critical mode, stiffness, mass, energy, the
    static reserve and a caution line, with the values of summary.json (to the digits it prints)."""
    proc, out = example_run
    s = strict_json((out / "summary.json").read_text(encoding="utf-8"))
    text = proc.stdout

    def number(pattern: str) -> float:
        """The number in front of ``pattern`` (a regex) at its first match."""
        found = re.search(r"(?<![\w.])([-+]?\d[\d.]*(?:e[-+]?\d+)?)\s*" + pattern, text, re.MULTILINE)
        assert found, f"no number before {pattern!r} in the terminal output"
        return float(found.group(1))

    # rel 5e-3: the terminal prints lives to 3 significant digits
    assert re.search(r"^\s*life, cycles\s", text, re.MULTILINE)
    assert number(r"cycles\s*$") == pytest.approx(s["life_cycles"], rel=5e-3)
    assert number(r"blocks of the duty") == pytest.approx(s["life_blocks"], rel=5e-3)
    assert number(r"days") == pytest.approx(s["life_days"], rel=5e-3)
    assert s["critical"]["mode"] in text
    # rel 1e-3: stiffness, mass and energy to 4 significant digits
    assert number(r"N/mm") == pytest.approx(s["stiffness_n_per_m"] / 1e3, rel=1e-3)
    assert number(r"g\s*$") == pytest.approx(s["mass_kg"] * 1e3, rel=1e-3)
    assert number(r"J at peak") == pytest.approx(s["peak_energy_j"], rel=1e-3)
    assert "reserve" in text and f"{s['static_reserve']:.3g}" in text
    assert re.search(r"^caution: .*fatigue tests", text, re.MULTILINE)


# ---------------------------------------------------------------------------------------------
# Wrong input: exit 2, one message, nothing touched


WRONG = cantilever('drive = "deflection"\ncycles = [ { min = "0 mm", max = "5 mm", count = 10 } ]').replace(
    'thickness = "0.5 mm"', 'thickness = "0.5"')


def test_wrong_design_exits_2_with_one_message_and_leaves_out_untouched(tmp_path):
    """Through the console script: exit 2, one line on stderr naming the file and the key, no traceback;
    the existing --out folder and the file in it are byte-identical afterwards."""
    design = tmp_path / "wrong.toml"
    design.write_text(WRONG, encoding="utf-8")
    out = tmp_path / "out"
    out.mkdir()
    (out / "notes.txt").write_bytes(b"my notes\n")
    before = snapshot(out)
    proc = subprocess.run([str(FLEXCYCLE), "run", str(design), "--out", str(out)], capture_output=True, text=True,
                          timeout=120)
    assert proc.returncode == 2
    assert "Traceback" not in proc.stderr and "Traceback" not in proc.stdout
    lines = proc.stderr.strip().splitlines()
    assert len(lines) == 1, proc.stderr
    assert lines[0].startswith("flexcycle: wrong.toml [[ply]] #1 thickness")
    assert "no unit" in lines[0]
    assert snapshot(out) == before


def test_check_good_and_bad(tmp_path, monkeypatch, capsys):
    good = tmp_path / "good.toml"
    good.write_text(cantilever('drive = "deflection"\ncycles = [ { min = "0 mm", max = "5 mm", count = 10 } ]'))
    ran = flexcycle(["check", good], monkeypatch, capsys)
    assert ran.code == 0 and "valid" in ran.out and ran.err == ""
    bad = tmp_path / "bad.toml"
    bad.write_text(WRONG)
    ran = flexcycle(["check", bad], monkeypatch, capsys)
    assert ran.code == 2
    assert ran.err.startswith("flexcycle: bad.toml") and len(ran.err.strip().splitlines()) == 1
    assert "Traceback" not in ran.err


def test_missing_design_file_exits_2(tmp_path, monkeypatch, capsys):
    ran = flexcycle(["run", tmp_path / "none.toml", "--out", tmp_path / "out"], monkeypatch, capsys)
    assert ran.code == 2 and "none.toml" in ran.err
    assert not (tmp_path / "out").exists()  # nothing is created when the input is wrong


# ---------------------------------------------------------------------------------------------
# count and materials


def test_count_matches_the_rainflow_package(monkeypatch, capsys):
    """`flexcycle count` on a bundled CSV: its table's counts add up to the `rainflow` package's count_cycles
    total on the same column (reference implementation of ASTM E1049-85 §5.4.4), and Σ range·count agrees
    (rel 1e-4: the table prints ranges to 5 significant digits)."""
    path = bundled_profile("feeder-flexure")
    ran = flexcycle(["count", path, "--column", "deflection_mm", "--unit", "mm", "--top", "0"], monkeypatch, capsys)
    assert ran.code == 0, ran.err
    lines = ran.out.splitlines()
    start = next(k for k, line in enumerate(lines) if line.split()[:2] == ["range", "mean"]) + 1
    rows = np.array([[float(v) for v in line.split()] for line in lines[start:] if line.strip()])
    rng, count = rows[:, 0], rows[:, 4]
    column = pd.read_csv(path, comment="#", skipinitialspace=True)["deflection_mm"].to_numpy(dtype=float)
    reference = rainflow.count_cycles(column)
    assert count.sum() == pytest.approx(sum(n for _, n in reference), abs=1e-9)  # counts are k/2, exact
    assert float((rng * count).sum()) == pytest.approx(sum(r * n for r, n in reference), rel=1e-4)
    assert np.all(rows[:, 3] - rows[:, 2] >= 0)  # max >= min on every row


def test_count_with_a_missing_column_exits_2(monkeypatch, capsys):
    ran = flexcycle(["count", bundled_profile("feeder-flexure"), "--column", "nope", "--unit", "mm"],
                   monkeypatch, capsys)
    assert ran.code == 2 and "'nope'" in ran.err and "deflection_mm" in ran.err


@pytest.mark.parametrize("text, words", [
    ("0.1\n0.2\n0.5\n", ["line 1", "'0.1' is data, not a header", "must name the columns"]),
    ("# logged\nd\n3\n3\n3\n", ["column 'd' is constant", "3 mm in all 3 samples", "no cycle to count"]),
])
def test_count_refuses_a_headerless_or_constant_history(text, words, tmp_path, monkeypatch, capsys):
    """`flexcycle count` says what the design loader says about the same files: exit 2, the file, the line or
    column, and what would be right."""
    path = tmp_path / "h.csv"
    path.write_text(text, encoding="utf-8")
    ran = flexcycle(["count", path, "--column", "d", "--unit", "mm"], monkeypatch, capsys)
    assert ran.code == 2 and ran.err.startswith("flexcycle: count: profile file") and "h.csv" in ran.err
    assert all(w in ran.err for w in words), ran.err
    assert "Traceback" not in ran.err and len(ran.err.strip().splitlines()) == 1


def test_materials_lists_the_six_bundled(monkeypatch, capsys):
    ran = flexcycle(["materials"], monkeypatch, capsys)
    assert ran.code == 0
    listed = {line.split()[0] for line in ran.out.splitlines() if line.strip()}
    assert BUNDLED_MATERIALS <= listed
    assert len(BUNDLED_MATERIALS & listed) == 6


def test_materials_shows_e_glass_with_its_source(monkeypatch, capsys):
    """E-glass/epoxy E1 = 38.6 GPa, Tsai & Hahn 1980 (docs/references.md; also Kaw Table 2.1)."""
    ran = flexcycle(["materials", "e-glass-epoxy"], monkeypatch, capsys)
    assert ran.code == 0
    assert re.search(r"^\s*E1\s+38\.6 GPa\s+.*Tsai & Hahn", ran.out, re.MULTILINE), ran.out


def test_unknown_material_exits_2(monkeypatch, capsys):
    ran = flexcycle(["materials", "e-glass-epoxi"], monkeypatch, capsys)
    assert ran.code == 2
    assert "'e-glass-epoxi'" in ran.err and "e-glass-epoxy" in ran.err
    assert "Traceback" not in ran.err


# ---------------------------------------------------------------------------------------------
# Physics through the command


def run_design(tmp_path: Path, name: str, text: str, monkeypatch, capsys) -> dict:
    design = tmp_path / f"{name}.toml"
    design.write_text(text, encoding="utf-8")
    ran = flexcycle(["run", design, "--out", tmp_path / name], monkeypatch, capsys)
    assert ran.code == 0, ran.err
    return strict_json((tmp_path / name / "summary.json").read_text(encoding="utf-8"))


def test_deflection_and_force_drives_agree(tmp_path, monkeypatch, capsys):
    """Linearity: a force duty equal to stiffness × the deflection duty gives the same life, damage, peak
    strain and energies (rel 1e-9: the two paths differ only by float rounding of F = k·δ). The stiffness
    is read from the deflection run's summary. Without blocks_per_day life_days is null (contract).

    A 100 mm cantilever of 4 × 1.5 mm (h = 6 mm), so that fibre fatigue sets the life: ε = 3δh/(2L²) =
    9e-4 per mm of tip deflection, the −4 → 8 mm row runs −0.36 % → 0.72 %, amplitude 0.54 %, and on
    the compression face Goodman gives 0.54/(1 − 0.18/1.58) = 0.61 % at R = −1, N = (2.75/0.61)^10 ≈ 3e6
    (Burton et al. p. 387, m = 10): D ≈ 6e-5 per block, far above anything else.
    """
    table = [(-4.0, 8.0, 200), (1.0, 4.0, 5000)]  # mm, mm, count
    beam = {"span": "100 mm", "thickness": "1.5 mm", "count": 4}
    rows = ", ".join(f'{{ min = "{lo} mm", max = "{hi} mm", count = {n} }}' for lo, hi, n in table)
    by_deflection = run_design(tmp_path, "deflection", cantilever(f'drive = "deflection"\ncycles = [ {rows} ]',
                                                                  **beam), monkeypatch, capsys)
    k = by_deflection["stiffness_n_per_m"]
    rows = ", ".join(f'{{ min = "{lo * 1e-3 * k!r} N", max = "{hi * 1e-3 * k!r} N", count = {n} }}'
                     for lo, hi, n in table)
    by_force = run_design(tmp_path, "force", cantilever(f'drive = "force"\ncycles = [ {rows} ]', **beam),
                          monkeypatch, capsys)
    assert by_deflection["life_cycles"] is not None and by_deflection["life_days"] is None
    assert by_deflection["critical"]["mode"] == "fibre-compression"  # the hand estimate's place
    assert 1e-5 < by_deflection["damage_per_block"] < 1e-3  # hand value 6e-5 within the shear-deflection margin
    for key in ("life_cycles", "life_blocks", "damage_per_block", "peak_strain", "peak_energy_j", "cycle_energy_j",
                "specific_energy_j_per_kg", "static_reserve", "stiffness_n_per_m", "mass_kg"):
        assert by_force[key] == pytest.approx(by_deflection[key], rel=1e-9), key
    assert by_force["critical"] == by_deflection["critical"]


def test_life_unbounded_below_the_fatigue_limit(tmp_path, monkeypatch, capsys):
    """my-glass with a fatigue limit of 100 MPa amplitude at R = −1; a fully reversed ±2 mm tip deflection.
    Hand bound: ε ≤ 3δh/(2L²) = 3 × 0.002 × 0.002/(2 × 0.2²) = 1.5e-4, σ1 ≤ E1 ε = 40 GPa × 1.5e-4 = 6 MPa,
    mean 0, far below the limit. The fibre curve is the only one the material has, so no cycle does damage:
    life values null, damage_per_block 0, life_unbounded true, and a warning says so."""
    material = MY_GLASS.replace("m = 10\n", 'm = 10\nlimit = "100 MPa"\n')
    s = run_design(tmp_path, "unbounded", cantilever('drive = "deflection"\ncycles = [ { min = "-2 mm", max = "2 mm", '
                                                      'count = 1000 } ]\nblocks_per_day = 10\n',
                                                      material="my-glass", extra=material), monkeypatch, capsys)
    assert s["life_cycles"] is None and s["life_blocks"] is None and s["life_days"] is None
    assert s["damage_per_block"] == 0
    assert s["life_unbounded"] is True
    assert any("unbounded" in w for w in s["warnings"])
    assert s["peak_strain"] <= 1.5e-4 * (1 + 1e-9)  # the pure-bending bound above


def test_life_zero_beyond_static_strength(tmp_path, monkeypatch, capsys):
    """A 100 N tip force on my-glass: σ = 6FL/(bh²) = 6 × 100 × 0.2/(0.02 × 0.002²) = 1500 MPa at the root,
    past Xt = 1000 MPa on the tension face and Xc = 600 MPa on the compression face. The first load fails
    the part: life 0, with a warning; the max-stress reserve is Xc/σ = 600/1500 = 0.4 (rel 1e-9: statics
    of a rectangular UD section, exact; no transverse or shear stress in 0° plies of a narrow beam)."""
    s = run_design(tmp_path, "overload", cantilever('drive = "force"\ncycles = [ { min = "0 N", max = "100 N", '
                                                     'count = 10 } ]\n', material="my-glass", extra=MY_GLASS),
                   monkeypatch, capsys)
    assert s["life_cycles"] == 0 and s["life_blocks"] == 0
    assert s["life_unbounded"] is False
    assert any("static strength" in w for w in s["warnings"])
    assert s["static_reserve_by_criterion"]["max-stress"] == pytest.approx(0.4, rel=1e-9)
    assert s["static_reserve"] <= 0.4 * (1 + 1e-9)  # the smallest reserve of all criteria


def test_a_stress_that_is_zero_by_theory_does_no_damage(tmp_path, monkeypatch, capsys):
    """Three 0° e-glass/epoxy plies of 0.6 mm (h = 1.8 mm), 200 mm cantilever, tip deflection 2 → 10 mm × 1000
    and 0 → 4 mm × 250.5 per block. In 0° plies of a narrow beam σ2 = τ12 = 0 (D = Q h³/12 for a UD stack,
    so the ply stress is Q·D⁻¹·M·z = (12Mz/h³, 0, 0); Kaw 2nd ed. ch. 4): round-off in them must do no damage
    (a log-linear curve would give it N = 10^(1/b) for any amplitude above zero). Fibre damage, by hand at the
    compression face of the root (the larger row):
    ε = 3δh/(2L²): 6.75e-4 at 10 mm, 1.35e-4 at 2 mm, amplitude 2.7e-4, mean 4.05e-4; Goodman with
    eps1c = Xc/E1 = 610/38600 = 1.580 % (Tsai & Hahn 1980): ε_a0 = 2.7e-4/(1 − 4.05e-4/0.0158) = 2.771e-4;
    Burton et al. p. 387, S1 = 2.75 %, m = 10: N = (0.0275/2.771e-4)^10 = 9.3e19, D ≈ 1000/9.3e19 = 1.1e-17
    per block (bound 1e-15: a factor 100 for shear deflection and the second row); it governs, and the life
    is read far past test data, which a warning says."""
    s = run_design(tmp_path, "low-strain", cantilever(
        'drive = "deflection"\ncycles = [ { min = "2 mm", max = "10 mm", count = 1000 }, '
        '{ min = "0 mm", max = "4 mm", count = 250.5 } ]\n', thickness="0.6 mm", count=3), monkeypatch, capsys)
    locs = pd.read_csv(tmp_path / "low-strain" / "locations.csv")
    assert (locs.loc[locs["mode"].isin(["transverse", "shear"]), "damage_per_block"] == 0).all()
    fibre = locs.loc[locs["mode"].str.startswith("fibre"), "damage_per_block"]
    assert 0 < fibre.max() < 1e-15
    assert s["critical"]["mode"].startswith("fibre"), s["critical"]
    assert s["damage_per_block"] < 1e-15
    assert any("extrapolated" in w for w in s["warnings"])


@pytest.mark.parametrize("args, says", [
    (["count", "RIDE", "--column", "deflection_mm", "--unit", ""], "--unit"),
    (["count", "RIDE", "--column", "deflection_mm", "--unit", "mm", "--top", "-1"], "--top"),
    (["count", "RIDE", "--column", "deflection_mm", "--unit", "degC"], "offset unit"),
    (["materials", "e-glass-epoxi"], "did you mean 'e-glass-epoxy'"),
    (["compare", "ONE"], "two or more"),
])
def test_wrong_arguments_exit_2_with_a_message(args, says, monkeypatch, capsys):
    """Arguments the commands cannot use are input errors: exit 2, one message, no traceback."""
    ride = spectra_profiles.bundled_profile("cargo-bike-ride")
    one = cli_module.example_design()
    args = [str(ride) if a == "RIDE" else str(one) if a == "ONE" else a for a in args]
    ran = flexcycle(args, monkeypatch, capsys)
    assert ran.code == 2, ran
    assert says in ran.err and "Traceback" not in ran.err


# ---------------------------------------------------------------------------------------------
# Bad input, class by class: exit 2, one message on stderr starting with the file's name, holding
# the key (row or line), what was wrong and what would be right; never a traceback.

GOOD_DUTY = 'drive = "deflection"\ncycles = [ { min = "0 mm", max = "5 mm", count = 10 } ]'
GOOD = cantilever(GOOD_DUTY)
PROFILE = cantilever('drive = "deflection"\nprofile = "ride.csv"\ncolumn = "d"\nunit = "mm"')
RIDE = "t,d\n0,1\n1,5\n2,2\n3,6\n"


def edit(text: str, old: str, new: str) -> str:
    """Replace ``old`` (which must be there, so that no case silently tests the unchanged design)."""
    assert old in text, f"test setup: {old!r} not in the design text"
    return text.replace(old, new, 1)


BAD_INPUT = [
    # class, design text, ride.csv beside it, fragments of the message
    ("missing unit", edit(GOOD, 'span = "200 mm"', 'span = "200"'), RIDE,
     ["[beam] span", "'200' has no unit", "a length needs one", '"0.8 mm"']),
    ("bare number for a length", edit(GOOD, 'span = "200 mm"', "span = 200"), RIDE,
     ["[beam] span", "no unit", '"0.8 mm"']),
    ("garbled unit", edit(GOOD, 'span = "200 mm"', 'span = "200 mn"'), RIDE,
     ["[beam] span", "'200 mn'", "'mn' is not defined", '"0.8 mm"']),
    ("wrong dimension: a width in kg", edit(GOOD, 'width = "20 mm"', 'width = "50 kg"'), RIDE,
     ["[beam] width", "'50 kg' is not a length", "kg measures mass", "write a length", '"0.8 mm"']),
    ("zero span", edit(GOOD, 'span = "200 mm"', 'span = "0 mm"'), RIDE, ["[beam] span", "must be > 0"]),
    ("negative width", edit(GOOD, 'width = "20 mm"', 'width = "-20 mm"'), RIDE, ["[beam] width", "must be > 0"]),
    ("zero thickness", edit(GOOD, 'thickness = "0.5 mm"', 'thickness = "0 mm"'), RIDE,
     ["[[ply]] #1 thickness", "must be > 0", "'0 mm'"]),
    ("zero count", edit(GOOD, "count = 4", "count = 0"), RIDE, ["[[ply]] #1 count", "whole number >= 1", "got 0"]),
    ("Poisson ratio past sqrt(E1/E2)", GOOD + MY_GLASS.replace("nu12 = 0.28", "nu12 = 2.5"), RIDE,
     ["[material.my-glass] nu12", "|nu12| = 2.5", "sqrt(E1/E2) = 2", "E1 = 40 GPa, E2 = 10 GPa", "typically 0.2-0.35"]),
    ("negative modulus", GOOD + MY_GLASS.replace('E2 = "10 GPa"', 'E2 = "-10 GPa"'), RIDE,
     ["[material.my-glass] E2", "a modulus must be > 0"]),
    ("unknown support", edit(GOOD, '"cantilever"', '"cantilevr"'), RIDE,
     ["[beam] support", "'cantilevr'", "did you mean 'cantilever'?", "'four-point'"]),
    ("unknown section", edit(GOOD, "stations = 4", 'stations = 4\nsection = "plat"'), RIDE,
     ["[beam] section", "'plat'", "did you mean 'plate'?", "'beam'"]),
    ("unknown drive", edit(GOOD, '"deflection"', '"deflexion"'), RIDE,
     ["[duty] drive", "'deflexion'", "did you mean 'deflection'?", "'force'"]),
    ("unknown material", edit(GOOD, '"e-glass-epoxy"', '"e-glas-epoxy"'), RIDE,
     ["[[ply]] #1 material", "'e-glas-epoxy'", "did you mean 'e-glass-epoxy'?"]),
    ("unknown mean-stress rule", GOOD + '[fatigue]\nmean_stress = "gerbr"\n', RIDE,
     ["[fatigue] mean_stress", "'gerbr'", "did you mean 'gerber'?", "'goodman'"]),
    ("unknown curve form", edit(GOOD, '"e-glass-epoxy"', '"my-glass"') + MY_GLASS.replace('form = "power"',
                                                                                          'form = "powr"'), RIDE,
     ["[material.my-glass] fatigue.form", "'powr'", "did you mean 'power'?", "'log-linear'"]),
    ("unknown residue", PROFILE + 'residue = "halve"\n', RIDE,
     ["[duty] residue", "'halve'", "did you mean 'half'?", "'repeat'"]),
    ("unknown key: spna", edit(GOOD, "span =", "spna ="), RIDE, ["[beam]", "unknown key 'spna'", "did you mean 'span'?"]),
    ("unknown top-level key", "titel = 'x'\n" + GOOD, RIDE, ["unknown key 'titel'", "did you mean 'title'?"]),
    ("unknown [[ply]] key", edit(GOOD, "count = 4", "cuont = 4"), RIDE,
     ["[[ply]] #1", "unknown key 'cuont'", "did you mean 'count'?"]),
    ("unknown material key", GOOD + MY_GLASS.replace('E1 = "40 GPa"', 'E11 = "40 GPa"'), RIDE,
     ["[material.my-glass] E11", "unknown key", "did you mean 'E1'?"]),
    ("unknown fatigue-curve key", GOOD + MY_GLASS.replace('S1 = "800 MPa"', 'S_1 = "800 MPa"'), RIDE,
     ["[material.my-glass] fatigue.S_1", "unknown key", "did you mean 'S1'?"]),
    ("conflicting keys: profile and cycles", edit(GOOD, "drive =", 'profile = "ride.csv"\ndrive ='), RIDE,
     ["[duty]", "exactly one of 'profile'", "'cycles'"]),
    ("ply drop beyond the span", edit(GOOD, "count = 4", 'count = 4\nends_at = "300 mm"'), RIDE,
     ["[[ply]] #1 ends_at", "300 mm", "beyond the beam's 200 mm", "leave ends_at out"]),
    ("load_spacing not inside the span", edit(edit(GOOD, '"cantilever"', '"four-point"'), "stations = 4",
                                              'stations = 4\nload_spacing = "250 mm"'), RIDE,
     ["[beam] load_spacing", "0 < load_spacing < span", "got 0.25 m"]),
    ("TOML syntax error", edit(GOOD, 'span = "200 mm"', "span = 200 mm"), RIDE,
     [", line 4, column", "not valid TOML", 'span = "420 mm"']),
    ("material name of the wrong type", edit(GOOD, 'material = "e-glass-epoxy"', 'material = ["e-glass-epoxy"]'), RIDE,
     ["[[ply]] #1 material", "a material name as a string"]),
    # profiles
    ("profile: missing file", edit(PROFILE, "ride.csv", "nope.csv"), RIDE,
     ["[duty] profile", "nope.csv", "not found", "existing CSV file"]),
    ("profile: missing column", edit(PROFILE, 'column = "d"', 'column = "q"'), RIDE,
     ["[duty] profile", "no column 'q'", "the columns there are 't', 'd'"]),
    ("profile: empty file", PROFILE, "", ["[duty] profile", "ride.csv", "no header line", "name the columns"]),
    ("profile: header only", PROFILE, "t,d\n", ["[duty] profile", "column 'd' has 0 sample(s)", "at least 2"]),
    ("profile: one row", PROFILE, "t,d\n0,1\n", ["[duty] profile", "column 'd' has 1 sample(s)", "at least 2"]),
    ("profile: constant history", PROFILE, "t,d\n0,3\n1,3\n2,3\n",
     ["[duty] profile", "ride.csv, column 'd' is constant", "3 mm in all 3 samples", "no cycle to count"]),
    ("profile: non-numeric cell", PROFILE, "t,d\n0,1\n1,abc\n2,3\n",
     ["[duty] profile", "ride.csv", "line 3", "'abc', not a number"]),
    ("profile: NaN", PROFILE, "t,d\n0,1\n1,nan\n2,3\n", ["[duty] profile", "line 3", "'nan', not finite"]),
    ("profile: infinite", PROFILE, "t,d\n0,1\n1,2\n2,-inf\n", ["[duty] profile", "line 4", "'-inf', not finite"]),
    ("profile: no header", PROFILE, "0,1\n1,5\n2,2\n",
     ["[duty] profile", "ride.csv, line 1", "'0,1' is data, not a header", "must name the columns"]),
    ("profile: unit not of the drive", edit(PROFILE, 'unit = "mm"', 'unit = "N"'), RIDE,
     ["[duty] unit", "'N' measures force", "drive = 'deflection' needs a unit of length", '"mm"']),
    ("profile: unknown unit", edit(PROFILE, 'unit = "mm"', 'unit = "mn"'), RIDE,
     ["[duty] unit", "unknown unit 'mn'", "such as mm"]),
]


@pytest.mark.parametrize("text, csv, fragments", [c[1:] for c in BAD_INPUT], ids=[c[0] for c in BAD_INPUT])
def test_bad_input_class_exits_2_with_a_clear_message(text, csv, fragments, tmp_path, monkeypatch, capsys):
    """`flexcycle check` on a design with one thing wrong: exit 2, one line on stderr starting with
    "flexcycle: bad.toml", holding every fragment; nothing on stdout, no traceback."""
    (tmp_path / "ride.csv").write_text(csv, encoding="utf-8")
    design = tmp_path / "bad.toml"
    design.write_text(text, encoding="utf-8")
    ran = flexcycle(["check", design], monkeypatch, capsys)
    assert ran.code == 2, ran
    assert "Traceback" not in ran.err and ran.out == ""
    assert len(ran.err.strip().splitlines()) == 1, ran.err
    assert ran.err.startswith("flexcycle: bad.toml"), ran.err
    for fragment in fragments:
        assert fragment in ran.err, f"{fragment!r} not in {ran.err!r}"


def test_the_designs_the_bad_cases_start_from_are_valid(tmp_path, monkeypatch, capsys):
    """Each bad case changes one thing of GOOD or PROFILE (with RIDE beside it), which pass `check`."""
    (tmp_path / "ride.csv").write_text(RIDE, encoding="utf-8")
    for name, text in (("good", GOOD), ("profile", PROFILE), ("glass", edit(GOOD, '"e-glass-epoxy"', '"my-glass"')
                                                                + MY_GLASS)):
        (tmp_path / f"{name}.toml").write_text(text, encoding="utf-8")
        ran = flexcycle(["check", tmp_path / f"{name}.toml"], monkeypatch, capsys)
        assert ran.code == 0, ran.err


# ---------------------------------------------------------------------------------------------
# Beyond the model, not wrong: warnings in summary.json


def test_deflection_over_a_tenth_of_the_span_is_a_warning(tmp_path, monkeypatch, capsys):
    """A 25 mm tip deflection of a 200 mm cantilever is 12.5 % of the span, past the 10 % of small-deflection
    theory (docs/design.md conventions): a warning, not an error. Fibre strain ε = 3δh/(2L²) = 3 × 0.025 × 0.002 /
    (2 × 0.2²) = 0.19 %, far below e-glass/epoxy's ultimate strains, so the run itself is sound."""
    s = run_design(tmp_path, "large", cantilever('drive = "deflection"\ncycles = [ { min = "0 mm", max = "25 mm", '
                                                  'count = 10 } ]\n'), monkeypatch, capsys)
    assert any("deflection 25.0 mm passes 10 % of the span (200 mm)" in w for w in s["warnings"]), s["warnings"]


def test_cycles_below_the_fatigue_limit_are_counted_in_a_warning(tmp_path, monkeypatch, capsys):
    """my-glass with a 100 MPa fatigue limit at R = −1, a 100 mm cantilever of 4 × 1.5 mm (h = 6 mm). By hand
    (rectangular section, shear deflection ignored): ε = 3δh/(2L²) = 9e-4 per mm of tip deflection, σ1 = E1 ε =
    36 MPa per mm. Row ±1 mm × 1000: amplitude 36 MPa, below the limit, ignored; row ±4 mm × 10: 144 MPa, above
    it (and below Xc = 600 MPa). So 1000 of the 1010 cycles per block are said to be ignored, and the life is
    finite."""
    material = MY_GLASS.replace("m = 10\n", 'm = 10\nlimit = "100 MPa"\n')
    duty = ('drive = "deflection"\ncycles = [ { min = "-1 mm", max = "1 mm", count = 1000 }, '
            '{ min = "-4 mm", max = "4 mm", count = 10 } ]\n')
    s = run_design(tmp_path, "limit", cantilever(duty, material="my-glass", extra=material, span="100 mm",
                                                 thickness="1.5 mm"), monkeypatch, capsys)
    assert s["life_unbounded"] is False and s["life_blocks"] > 0
    assert any("1000 of 1010 cycles per block are below the fatigue limit at the critical location and ignored" in w
               for w in s["warnings"]), s["warnings"]


def test_a_load_that_fails_a_ply_statically_names_the_ply_and_criterion(tmp_path, monkeypatch, capsys):
    """The 100 N tip force of test_life_zero_beyond_static_strength (σ = 1500 MPa at the root, past Xc = 600 MPa):
    life zero, and the warning names the reserve, the criterion, the mode, the place and the ply. Under a positive
    force the compression face is the top one (z > 0), ply 4 of the 4; the root is x = 0."""
    s = run_design(tmp_path, "overload", cantilever('drive = "force"\ncycles = [ { min = "0 N", max = "100 N", '
                                                     'count = 10 } ]\n', material="my-glass", extra=MY_GLASS),
                   monkeypatch, capsys)
    assert s["life_cycles"] == 0
    said = [w for w in s["warnings"] if w.startswith("static strength exceeded")]
    assert len(said) == 1, s["warnings"]
    assert re.search(r"reserve 0\.\d\d \((max-stress|Tsai-Wu|max-strain), fibre-compression\) at x = 0 mm from the root, ply 4\b",
                     said[0]), said[0]
    assert "life is zero" in said[0]


# The curve used beyond its data range: test_a_stress_that_is_zero_by_theory_does_no_damage above ("extrapolated").


# ---------------------------------------------------------------------------------------------
# Data safety and determinism


def digest(path: Path) -> str:
    import hashlib
    return hashlib.sha256(path.read_bytes()).hexdigest()


def test_a_failing_run_leaves_out_and_the_inputs_as_they_were(tmp_path, monkeypatch, capsys):
    """A design whose profile is read and found wrong (a constant history): --out keeps the user's file and the
    old summary.json byte for byte; nothing is staged beside it; the design and its profile are unchanged
    (hash before and after)."""
    (tmp_path / "ride.csv").write_text("t,d\n0,2\n1,2\n2,2\n", encoding="utf-8")
    design = tmp_path / "huge.toml"
    design.write_text(PROFILE, encoding="utf-8")
    out = tmp_path / "out"
    out.mkdir()
    (out / "notes.txt").write_bytes(b"mine\n")
    (out / "summary.json").write_bytes(b'{"old": true}\n')
    before, inputs = snapshot(out), {p: digest(p) for p in (design, tmp_path / "ride.csv")}
    ran = flexcycle(["run", design, "--out", out], monkeypatch, capsys)
    assert ran.code == 2 and ran.err.startswith("flexcycle: huge.toml [duty]") and "no cycle to count" in ran.err
    assert snapshot(out) == before
    assert sorted(p.name for p in tmp_path.iterdir()) == ["huge.toml", "out", "ride.csv"]
    assert {p: digest(p) for p in inputs} == inputs


def test_a_good_run_keeps_foreign_files_and_leaves_no_staging(tmp_path, monkeypatch, capsys):
    (tmp_path / "ride.csv").write_text(RIDE, encoding="utf-8")
    design = tmp_path / "good.toml"
    design.write_text(PROFILE, encoding="utf-8")
    inputs = {p: digest(p) for p in (design, tmp_path / "ride.csv")}
    out = tmp_path / "out"
    out.mkdir()
    (out / "notes.txt").write_bytes(b"mine\n")
    ran = flexcycle(["run", design, "--out", out], monkeypatch, capsys)
    assert ran.code == 0, ran.err
    assert (out / "notes.txt").read_bytes() == b"mine\n"
    assert {p.name for p in out.iterdir()} == {"notes.txt", "summary.json", "cycles.csv", "locations.csv",
                                               "stations.csv", "report.html"}
    assert sorted(p.name for p in tmp_path.iterdir()) == ["good.toml", "out", "ride.csv"]
    assert {p: digest(p) for p in inputs} == inputs


def test_out_that_is_a_file_exits_2(tmp_path, monkeypatch, capsys):
    design = tmp_path / "good.toml"
    design.write_text(GOOD, encoding="utf-8")
    (tmp_path / "taken").write_bytes(b"a file\n")
    ran = flexcycle(["run", design, "--out", tmp_path / "taken"], monkeypatch, capsys)
    assert ran.code == 2 and "exists and is not a folder" in ran.err and "Traceback" not in ran.err
    assert (tmp_path / "taken").read_bytes() == b"a file\n"


def test_same_input_same_summary_bytes_and_no_time_in_it(tmp_path, monkeypatch, capsys):
    """Two runs of one design give byte-identical summary.json, which holds no date or time of day."""
    design = tmp_path / "good.toml"
    design.write_text(GOOD, encoding="utf-8")
    for name in ("one", "two"):
        assert flexcycle(["run", design, "--out", tmp_path / name], monkeypatch, capsys).code == 0
    first = (tmp_path / "one" / "summary.json").read_bytes()
    assert first == (tmp_path / "two" / "summary.json").read_bytes()
    text = first.decode("utf-8")
    assert not re.search(r"\d{4}-\d{2}-\d{2}|\d{1,2}:\d{2}:\d{2}", text), "a date or time in summary.json"
    assert not {"date", "time", "timestamp", "created"} & set(strict_json(text))


# flexcycle size


SIZE_DUTY = 'drive = "{drive}"\ncycles = [ {{ min = "{lo}", max = "{hi}", count = 1000 }} ]'


def size_design(tmp_path: Path, drive: str = "deflection", lo: str = "0 mm", hi: str = "10 mm") -> Path:
    """A 200 mm cantilever of 10 × 0.5 mm e-glass/epoxy (h = 5 mm): at 10 mm deflection ε ≈ 3δh/(2L²) = 0.19 %."""
    path = tmp_path / "size.toml"
    path.write_text(cantilever(SIZE_DUTY.format(drive=drive, lo=lo, hi=hi), count=10), encoding="utf-8")
    return path


def test_size_writes_the_sized_files_and_a_table(tmp_path, monkeypatch, capsys):
    """--rate and --taper: sized.toml and sized-drops.toml are valid design files (flexcycle check reads them),
    sizing.json is strict JSON with the before/after table, report.html has the Sizing table."""
    out = tmp_path / "out"
    ran = flexcycle(["size", size_design(tmp_path), "--life", "1e7", "--rate", "5 N/mm", "--taper", "--out", out],
                   monkeypatch, capsys)
    assert ran.code == 0, ran.err
    assert {"sized.toml", "sized-drops.toml", "sizing.json", "report.html"} <= {p.name for p in out.iterdir()}
    doc = strict_json((out / "sizing.json").read_text(encoding="utf-8"))
    assert doc["sized"]["summary"]["life_blocks"] >= 1e7
    assert doc["sized"]["summary"]["stiffness_n_per_m"] == pytest.approx(5e3, rel=1e-3)  # the 0.1 %
    assert doc["table"][0]["quantity"] == "life [blocks]"
    assert "<h3>Sizing</h3>" in (out / "report.html").read_text(encoding="utf-8")
    assert "quantity" in ran.out and "storage efficiency" in ran.out
    for name in ("sized.toml", "sized-drops.toml"):
        assert flexcycle(["check", out / name], monkeypatch, capsys).code == 0


@pytest.mark.parametrize("drive, lo, hi, args, says", [
    ("force", "0 N", "20 N", ["--rate", "5 N/mm", "--taper"], "--taper with --rate under a force drive"),
    ("force", "0 N", "20 N", ["--rate", "5 N/mm", "--min-width", "30 mm", "--max-width", "20 mm"], "is above --max-width"),
    ("deflection", "0 mm", "10 mm", ["--rate", "5"], "has no unit"),
    ("deflection", "0 mm", "10 mm", ["--rate", "5 mm"], "not a stiffness"),
    ("force", "-2600 N", "2600 N", ["--vary", "width"], "static first-ply failure even at width × 10"),
    ("deflection", "0 mm", "10 mm", ["--vary", "width"], "do not depend on the width"),
    ("deflection", "0 mm", "10 mm", ["--vary", "length"], "--vary"),
])
def test_size_wrong_input_exits_2_with_the_reason(tmp_path, drive, lo, hi, args, says, monkeypatch, capsys):
    """±2600 N on h = 5 mm, b = 20 mm: σ = 6FL/(bh²) = 6240 MPa; at width × 10, 624 MPa, still past the
    e-glass/epoxy Xc = 610 MPa (Tsai & Hahn): no factor in 0.1–10 reaches any life."""
    out = tmp_path / "out"
    ran = flexcycle(["size", size_design(tmp_path, drive, lo, hi), "--life", "1e3", *args, "--out", out],
                   monkeypatch, capsys)
    assert ran.code == 2, ran
    assert says in ran.err and "Traceback" not in ran.err
    assert not out.exists()


# --- lean start ---------------------------------------------------------------------------------

WORKTREE = Path(__file__).resolve().parent.parent
HEAVY = ("matplotlib", "scipy.integrate", "scipy.optimize", "scipy.interpolate", "scipy.special", "flexcycle.report.style",
         "flexcycle.report.figures", "flexcycle.report.page", "flexcycle.outputs", "flexcycle.explore.compare")


def _modules_after(args: list[str]) -> set[str]:
    """The modules a fresh Python holds after ``flexcycle ARGS`` (run through flexcycle.cli.app.main from this tree)."""
    # the root conftest maps this clone's folders onto the import name (this tree, not an installed copy)
    code = ("import conftest, sys\nsys.argv = ['flexcycle', *sys.argv[1:]]\nfrom flexcycle.cli.app import main\n"
            "try:\n    main()\nexcept SystemExit:\n    pass\nprint('MODULES', ' '.join(sorted(sys.modules)))")
    proc = subprocess.run([sys.executable, "-c", code, *args], cwd=WORKTREE, capture_output=True, text=True, timeout=120)
    line = [ln for ln in proc.stdout.splitlines() if ln.startswith("MODULES")][-1]
    return set(line.split()[1:])


def test_help_imports_neither_matplotlib_scipy_nor_pandas():
    """Lean start: ``flexcycle --help`` loads none of the heavy libraries (the commands import them)."""
    loaded = _modules_after(["--help"])
    assert not {m for m in loaded if m.split(".")[0] in ("matplotlib", "scipy", "pandas", "pint")}
    assert not loaded & set(HEAVY)


def test_check_imports_no_matplotlib_and_no_scipy_submodule():
    """``flexcycle check`` loads no matplotlib and none of scipy's numerical submodules. (pint, which
    parses the units, imports scipy's top-level package only, to learn that it is there.)"""
    loaded = _modules_after(["check", str(cli_module.example_design())])
    assert not {m for m in loaded if m.split(".")[0] == "matplotlib"}
    assert not loaded & set(HEAVY)
    assert not {m for m in loaded if m.startswith("scipy.") and m.split(".")[1] in ("integrate", "optimize", "linalg",
                                                                                    "interpolate", "special", "stats")}


def test_progress_bar_only_for_long_files_on_a_terminal(monkeypatch):
    """The run's progress callback draws nothing for a file under PROGRESS_BYTES, nor when stderr is
    not a terminal (as under pytest); it accepts the library's (bytes read, total) calls."""
    with cli_module._progress() as progress:
        progress(10, 100)
        progress(cli_module.PROGRESS_BYTES, 2 * cli_module.PROGRESS_BYTES)
    monkeypatch.setattr(sys.stderr, "isatty", lambda: True, raising=False)
    with cli_module._progress() as progress:
        progress(10, 100)  # short file: still no bar
        assert progress.__self__.bar is None


def test_compare_help_shows_the_duty_table_name():
    """Rich markup would eat "[duty]" from the option's help; it must be printed as written."""
    ran = run_cli(["compare", "--help"])
    assert ran.code == 0
    assert "[duty]" in " ".join(ran.out.split())


def test_run_on_a_directory_says_it_is_one(tmp_path):
    ran = run_cli(["run", str(tmp_path), "--out", str(tmp_path / "out")])
    assert ran.code == 2 and "is a directory" in ran.err


def test_units_us_on_run_shows_inch_pound_and_keeps_the_files_si(tmp_path):
    """--units us: the terminal and the report show inches and pounds (SI beside); summary.json stays SI and
    equals the run without it."""
    si, us = tmp_path / "si", tmp_path / "us"
    plain = run_cli(["run", "--out", si])
    ran = run_cli(["run", "--out", us, "--units", "us"])
    assert ran.code == 0 and plain.code == 0, ran.err
    assert "lbf/in (" in ran.out and " lb (" in ran.out and "span 11.81 in (300 mm)" in ran.out
    assert "lbf/in" in (us / "report.html").read_text(encoding="utf-8")
    assert json.loads((us / "summary.json").read_text()) == json.loads((si / "summary.json").read_text())
    assert (us / "stations.csv").read_text() == (si / "stations.csv").read_text()


def test_units_from_the_design_file_and_a_wrong_units_option(tmp_path):
    text = cantilever('drive = "force"\ncycles = [ { min = "0 N", max = "20 N", count = 1000 } ]') + '\n[report]\nunits = "us"\n'
    path = tmp_path / "d.toml"
    path.write_text(text, encoding="utf-8")
    ran = run_cli(["run", path, "--out", tmp_path / "o"])
    assert ran.code == 0, ran.err
    assert "7.874 in (200 mm)" in ran.out
    wrong = run_cli(["run", path, "--out", tmp_path / "o2", "--units", "imperial"])
    assert wrong.code == 2 and "--units" in wrong.err


def test_required_life_in_summary_json(tmp_path):
    """required_life = 5 years at 4 blocks a day = 7305 blocks; the verdict keys in summary.json and the
    verdict line first in the terminal."""
    text = EXAMPLE_TEXT().replace('miner_limit = 1.0', 'miner_limit = 1.0\nrequired_life = "5 years"')
    path = tmp_path / "spring.toml"
    path.write_text(text, encoding="utf-8")
    ran = run_cli(["run", path, "--out", tmp_path / "o"])
    assert ran.code == 0, ran.err
    s = json.loads((tmp_path / "o" / "summary.json").read_text())
    assert s["required_life_blocks"] == pytest.approx(5 * 365.25 * 4, rel=1e-12)  # Julian year, exact
    assert s["life_margin"] == pytest.approx(s["life_blocks"] / s["required_life_blocks"], rel=1e-12)
    assert s["meets_requirement"] == (s["life_blocks"] >= s["required_life_blocks"])
    assert ran.out.splitlines()[0].startswith(("MEETS", "FALLS SHORT"))


def EXAMPLE_TEXT() -> str:  # noqa: N802 — the bundled example's text, with its bundled profile
    return cli_module.example_design().read_text(encoding="utf-8")


def test_size_in_inch_pound_keeps_sizing_json_si(tmp_path):
    """--units us: the sizing table in the terminal shows lbf/in and lb with SI beside; sizing.json stays SI."""
    out = tmp_path / "out"
    ran = run_cli(["size", size_design(tmp_path), "--life", "1e7", "--rate", "5 N/mm", "--out", out, "--units", "us"])
    assert ran.code == 0, ran.err
    assert "28.55 lbf/in (5 N/mm)" in ran.out  # 5 N/mm = 5000/175.126835 lbf/in (exact definitions)
    assert " lb (" in ran.out
    note = next(line for line in ran.out.splitlines() if "width for the spring rate" in line)
    assert re.search(r"gives [\d.]+ lbf/in \([\d.]+ N/mm\)", note)  # the sizing note in inch-pound, SI beside
    doc = strict_json((out / "sizing.json").read_text(encoding="utf-8"))
    assert "N/mm" in json.dumps(doc["table"]) and "lbf" not in json.dumps(doc["table"])


def test_units_us_shows_the_warnings_in_inch_pound_and_keeps_summary_json_si(tmp_path):
    """A 60 N force on the 200 mm cantilever of 4 × 0.5 mm glass breaks it statically at the root and bends it
    past 10 % of the span: the warnings quote a length (span 200 mm, x = 0 mm) and a force (60 N). Under
    --units us the terminal and the report show them "US (SI)" — 200 / 25.4 = 7.874 in, 60 / 4.4482216152605
    = 13.49 lbf (NIST SP 811: 1 in = 25.4 mm, 1 lbf = 4.4482216152605 N) — and summary.json keeps them SI."""
    path = tmp_path / "d.toml"
    path.write_text(cantilever('drive = "force"\ncycles = [ { min = "0 N", max = "60 N", count = 1000 } ]'),
                    encoding="utf-8")
    ran = run_cli(["run", path, "--out", tmp_path / "o", "--units", "us"])
    assert ran.code == 0, ran.err
    warned = ran.out.split("warnings:")[1].split("caution:")[0]
    assert "of the span (7.87 in (200 mm))" in warned  # three figures, as the SI text was written
    assert "at the duty extreme 13.5 lbf (60 N)" in warned
    assert "x = 0 in (0 mm) from the root" in warned
    report = (tmp_path / "o" / "report.html").read_text(encoding="utf-8")
    section = report.split('<section id="warnings">')[1].split("</section>")[0]
    assert "13.5 lbf (60 N)" in section and "7.87 in (200 mm)" in section
    warnings = json.loads((tmp_path / "o" / "summary.json").read_text())["warnings"]
    assert any("at the duty extreme 60 N: life is zero" in w for w in warnings)
    assert any("of the span (200 mm)" in w for w in warnings)
    assert not any(" in (" in w or "lbf" in w for w in warnings)
