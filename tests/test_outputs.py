"""Output files of a run, life/outputs.py (docs/design.md, outputs contract).

One small design is estimated once for the module: a 100 mm × 20 mm cantilever of three 0° e-glass/epoxy
plies of 2 mm (h = 6 mm), few stations, a deflection block table with a positive mean, so the compression
face (Xc < Xt) at the root is the unique worst place. Hand check of its fibre strain (rectangular section,
docs/references.md: ε = 3δh/(2L²), shear deflection ignored): δ = 9 mm gives 3 × 0.009 × 0.006/(2 × 0.1²) =
0.81 %, well into the fibre curve, so fibre damage rules. A second design counts the ASTM E1049-85
example history.
"""
from __future__ import annotations

import builtins
import html
import os
import re
import stat
from pathlib import Path

import numpy as np
import pandas as pd
import pytest

from flexcycle.design import load_design
from flexcycle.errors import InputError
from flexcycle.estimate import CAUTION, estimate
from flexcycle.outputs import location_table, render, write_files

LOCATION_COLUMNS = ["station", "x_m", "ply", "material", "angle_deg", "face", "z_m", "mode", "basis", "amplitude",
                    "mean", "damage_per_block", "life_blocks"]
OUTPUT_FILES = {"summary.json", "cycles.csv", "locations.csv", "stations.csv", "report.html"}


def design_text(duty: str) -> str:
    return f"""\
title = "three-ply test cantilever"
[beam]
support = "cantilever"
span = "100 mm"
width = "20 mm"
stations = 4

[[ply]]
material = "e-glass-epoxy"
angle = 0
thickness = "2 mm"
count = 3

[duty]
{duty}
"""


BLOCKS = 'drive = "deflection"\ncycles = [ { min = "2 mm", max = "9 mm", count = 1000 }, ' \
         '{ min = "0 mm", max = "4 mm", count = 250.5 } ]\n'

# ASTM E1049-85 (2011), §5.4.4 rainflow example history and its count, range (count):
# 3 (0.5), 4 (1.5), 6 (0.5), 8 (1.0), 9 (0.5) — docs/references.md. Used here as a deflection in mm.
ASTM_E1049_HISTORY = [-2, 1, -3, 5, -1, 3, -4, 4, -2]
ASTM_E1049_RANGES = {3.0: 0.5, 4.0: 1.5, 6.0: 0.5, 8.0: 1.0, 9.0: 0.5}


@pytest.fixture(scope="module")
def result(tmp_path_factory):
    path = tmp_path_factory.mktemp("design") / "three-ply.toml"
    path.write_text(design_text(BLOCKS), encoding="utf-8")
    return estimate(load_design(path))


@pytest.fixture(scope="module")
def files(result):
    return render(result)


@pytest.fixture()
def written(files, tmp_path):
    out = tmp_path / "run"
    write_files(files, out)
    return out


def snapshot(folder: Path) -> dict[str, bytes]:
    """Every file under ``folder`` with its bytes, hidden ones included."""
    return {str(p.relative_to(folder)): p.read_bytes() for p in sorted(folder.rglob("*")) if p.is_file()}


# ---------------------------------------------------------------------------------------------
# write_files


def test_write_files_creates_the_folder(files, tmp_path):
    out = tmp_path / "a" / "b" / "out"  # none of it exists yet
    paths = write_files(files, out)
    assert out.is_dir()
    assert {p.name for p in paths} == OUTPUT_FILES
    assert {p.name for p in out.iterdir()} == OUTPUT_FILES  # no temporary files left behind
    for p in paths:
        assert p.read_text(encoding="utf-8") == files[p.name]


def test_write_files_refuses_an_out_that_is_a_file(files, tmp_path):
    target = tmp_path / "taken"
    target.write_bytes(b"a file\n")
    with pytest.raises(InputError, match="exists and is not a folder"):
        write_files(files, target)
    assert target.read_bytes() == b"a file\n"


def test_write_files_leaves_the_folder_untouched_when_it_cannot_write(files, tmp_path):
    """An output name taken by a folder: an InputError naming it, and nothing in --out changes — neither
    the user's own summary.json nor anything left behind (docs/design.md: on any error nothing in DIR is touched)."""
    out = tmp_path / "out"
    (out / "report.html").mkdir(parents=True)
    (out / "report.html" / "inside.txt").write_bytes(b"keep\n")
    (out / "summary.json").write_bytes(b"{\"mine\": true}\n")
    before = snapshot(out)
    names_before = sorted(p.name for p in out.iterdir())
    with pytest.raises(InputError, match="report.html"):
        write_files(files, out)
    assert snapshot(out) == before
    assert sorted(p.name for p in out.iterdir()) == names_before


def test_output_files_get_the_usual_permissions(files, tmp_path):
    """Under the common umask 022 the files are rw-r--r-- (0644), as any file a program writes, not the
    private 0600 of a temporary file."""
    old = os.umask(0o022)
    try:
        paths = write_files(files, tmp_path / "out")
    finally:
        os.umask(old)
    for p in paths:
        assert stat.S_IMODE(p.stat().st_mode) == 0o644, p.name


def test_an_existing_folder_is_updated_in_place(files, tmp_path):
    """A second run into the same folder replaces the four files and keeps the user's other files."""
    out = tmp_path / "out"
    out.mkdir()
    (out / "notes.txt").write_bytes(b"mine\n")
    (out / "summary.json").write_bytes(b"old\n")
    write_files(files, out)
    assert (out / "notes.txt").read_bytes() == b"mine\n"
    assert (out / "summary.json").read_text(encoding="utf-8") == files["summary.json"]
    assert {p.name for p in out.iterdir()} == OUTPUT_FILES | {"notes.txt"}


# ---------------------------------------------------------------------------------------------
# cycles.csv


def test_cycles_csv_counts_sum_to_the_block_table(written):
    """The design's table: 1000 + 250.5 = 1250.5 cycles per block; rows min, max in SI (9 mm = 0.009 m)."""
    table = pd.read_csv(written / "cycles.csv")
    assert list(table.columns[:3]) == ["min", "max", "count"]
    assert table["count"].sum() == pytest.approx(1250.5, abs=1e-9)
    rows = sorted(zip(table["min"], table["max"], table["count"]))
    np.testing.assert_allclose(rows, [(0.0, 0.004, 250.5), (0.002, 0.009, 1000.0)], rtol=1e-9, atol=1e-15)


def test_cycles_csv_of_the_astm_e1049_history(tmp_path):
    """The ASTM E1049-85 §5.4.4 example history as a deflection profile [mm]: cycles.csv holds its count,
    ranges 3, 4, 6, 8, 9 with counts 0.5, 1.5, 0.5, 1.0, 0.5 (total 4), in m."""
    (tmp_path / "astm.csv").write_text("deflection\n" + "\n".join(map(str, ASTM_E1049_HISTORY)) + "\n")
    path = tmp_path / "astm.toml"
    path.write_text(design_text('drive = "deflection"\nprofile = "astm.csv"\ncolumn = "deflection"\nunit = "mm"\n'))
    out = tmp_path / "out"
    write_files(render(estimate(load_design(path))), out)
    table = pd.read_csv(out / "cycles.csv")
    assert table["count"].sum() == pytest.approx(4.0, abs=1e-12)
    by_range: dict[float, float] = {}
    for lo, hi, n in zip(table["min"], table["max"], table["count"]):
        key = round((hi - lo) * 1e3, 6)  # mm; 6 decimals absorb the m → mm rounding
        by_range[key] = by_range.get(key, 0.0) + n
    assert by_range == pytest.approx(ASTM_E1049_RANGES, abs=1e-12)


# ---------------------------------------------------------------------------------------------
# locations.csv and the critical location


def test_locations_csv_has_one_row_per_location(result, written):
    """Columns as the contract lists them; one row per (station, ply, face, mode), no duplicates.

    Hand count per station for three full-length plies: fibre, transverse and shear at both faces of each
    ply, 3 × 2 × 3 = 18; interlaminar shear at the ply faces except the laminate's two outer faces,
    3 × 2 − 2 = 4; and at the neutral axis, which for three equal plies lies inside ply 2 (z = 0 in
    −h/6 … h/6): 1. So 23 rows per station.
    """
    table = pd.read_csv(written / "locations.csv")
    assert list(table.columns) == LOCATION_COLUMNS
    stations = result.response.x.size
    assert len(table) == 23 * stations
    assert set(table["station"]) == set(range(stations))
    assert not table.duplicated(["station", "ply", "face", "mode"]).any()
    assert set(table["ply"]) == {1, 2, 3}
    assert set(table["material"]) == {"e-glass-epoxy"}
    assert (table["damage_per_block"] >= 0).all()


def test_location_life_is_the_miner_limit_over_the_damage(written):
    """life_blocks of a row = miner_limit (1, the default) / damage_per_block; empty where no damage.
    rel 1e-8: both written with 9 significant digits."""
    table = pd.read_csv(written / "locations.csv")
    damaged = table["damage_per_block"] > 0
    assert damaged.any()
    np.testing.assert_allclose(table.loc[damaged, "life_blocks"], 1.0 / table.loc[damaged, "damage_per_block"],
                               rtol=1e-8)
    assert table.loc[~damaged, "life_blocks"].isna().all()


def test_critical_location_is_the_most_damaged_row(result, written):
    """summary.json's critical place is the locations.csv row of the largest damage_per_block, and its
    damage is damage_per_block of the summary. The duty's mean is positive and Xc < Xt (610 < 1062 MPa,
    Tsai & Hahn 1980), so that row is at the root on the compression face: ply 3, top, z = +h/2 = 3 mm."""
    import json

    summary = json.loads((written / "summary.json").read_text(encoding="utf-8"))
    table = pd.read_csv(written / "locations.csv")
    worst = table.loc[table["damage_per_block"].idxmax()]
    assert (table["damage_per_block"] == worst["damage_per_block"]).sum() == 1  # unique, so the test can tell
    c = summary["critical"]
    assert c["x_m"] == pytest.approx(worst["x_m"], rel=1e-8, abs=1e-12)  # 9 significant digits in the CSV
    assert c["ply"] == worst["ply"]
    assert c["z_m"] == pytest.approx(worst["z_m"], rel=1e-8)
    assert c["mode"] == worst["mode"]
    assert summary["damage_per_block"] == pytest.approx(worst["damage_per_block"], rel=1e-8)
    assert (c["x_m"], c["ply"], c["mode"]) == (0.0, 3, "fibre-compression")
    assert c["z_m"] == pytest.approx(3e-3, rel=1e-9)


def test_location_table_matches_the_result_rows(result):
    """The table holds every location of the result once (same count as LifeResult.locations)."""
    assert len(location_table(result)) == result.locations.response.size


# ---------------------------------------------------------------------------------------------
# report.html


def test_report_is_one_self_contained_file(written):
    """No reference to anything outside the file: no src/href to http(s) (nor any other src), no
    stylesheet link or script file; the caution text and inline SVG figures are in it."""
    text = (written / "report.html").read_text(encoding="utf-8")
    assert text.lstrip().lower().startswith("<!doctype html>")
    assert not re.search(r"""(?:src|href)\s*=\s*["']?\s*(?:https?:)?//""", text, re.IGNORECASE)
    assert not re.search(r"""\bsrc\s*=""", text, re.IGNORECASE)  # images are inline SVG, not files
    assert not re.search(r"<link\b", text, re.IGNORECASE)
    assert not re.search(r"<script\b[^>]*\bsrc", text, re.IGNORECASE)
    assert html.escape(CAUTION) in text
    assert text.count("<svg") >= 2
    assert text.rstrip().endswith("</html>")


def test_stations_csv_follows_the_beam_formulas(result, written):
    """stations.csv along the 100 mm cantilever: moment per unit end force m = L − x and shear 1 (Roark, 7th ed.,
    Table 8.1 case 1a); curvature per force = −m/(E·I) per unit width through the narrow-beam 1/d11 (= E1·h³/12 for
    a UD stack), so κ·E1·b·h³/12 = −(L − x); the root's peak strain is summary.json's peak_strain."""
    table = pd.read_csv(written / "stations.csv")
    assert len(table) == result.response.x.size
    L = result.design.beam.span
    np.testing.assert_allclose(table["moment_per_n"], L - table["x_m"], atol=1e-15)  # exact up to round-off [m]
    np.testing.assert_allclose(table["shear_per_n"], 1.0)
    b, h = table["width_m"], table["thickness_m"]
    E1 = result.design.beam.plies[0].material.E1
    np.testing.assert_allclose(table["curvature_per_n"] * E1 * b * h**3 / 12, -(L - table["x_m"]), rtol=1e-9,
                               atol=1e-15)  # the CSV keeps 9 digits
    assert table["peak_strain"].max() == pytest.approx(result.summary()["peak_strain"], rel=1e-8)
    assert table["damage_per_block"].max() == pytest.approx(result.summary()["damage_per_block"], rel=1e-8)
    assert (table["plies"] == 3).all()


# ---------------------------------------------------------------------------------------------
# write_files: staging beside the output folder (data safety)


def test_outputs_are_staged_beside_out_on_the_same_file_system(files, tmp_path, monkeypatch):
    """The staging folder is created in --out's parent, and is gone after the run."""
    from flexcycle import outputs

    made = []
    real = outputs.tempfile.mkdtemp

    def spy(*args, **kwargs):
        made.append(Path(real(*args, **kwargs)))
        return str(made[-1])

    monkeypatch.setattr(outputs.tempfile, "mkdtemp", spy)
    out = tmp_path / "out"
    write_files(files, out)
    assert len(made) == 1 and made[0].parent == tmp_path and made[0].name.startswith(outputs.STAGING_PREFIX)
    assert not made[0].exists()
    assert sorted(p.name for p in tmp_path.iterdir()) == ["out"]


def test_a_write_failing_midway_leaves_out_as_it_was_and_no_staging(files, tmp_path, monkeypatch):
    """The third file cannot be written (a full disk, simulated): an InputError, --out byte-identical (the user's
    file and an old summary.json), and no staging folder left beside it."""
    from flexcycle import outputs

    out = tmp_path / "out"
    out.mkdir()
    (out / "notes.txt").write_bytes(b"mine\n")
    (out / "summary.json").write_bytes(b"old\n")
    before = snapshot(out)
    real_open, opened = builtins.open, []

    def failing_open(path, *args, **kwargs):
        opened.append(path)
        if len(opened) == 3:
            raise OSError(28, "No space left on device")
        return real_open(path, *args, **kwargs)

    monkeypatch.setattr(outputs, "open", failing_open, raising=False)  # the module's own name for open
    with pytest.raises(InputError, match="cannot write there .No space left on device"):
        write_files(files, out)
    assert snapshot(out) == before
    assert sorted(p.name for p in tmp_path.iterdir()) == ["out"]


def test_a_parent_that_cannot_be_written_is_a_clear_error(files, tmp_path, monkeypatch):
    """No staging folder can be made beside --out (permission denied, simulated: tests may run as root):
    an InputError that names --out and says to choose a writable folder; nothing is created."""
    from flexcycle import outputs

    def denied(*args, **kwargs):
        raise PermissionError(13, "Permission denied")

    monkeypatch.setattr(outputs.tempfile, "mkdtemp", denied)
    with pytest.raises(InputError, match=r"^out .*out: cannot write beside it .*Permission denied.*you may write to"):
        write_files(files, tmp_path / "out")
    assert list(tmp_path.iterdir()) == []


def test_cycles_csv_at_scale_holds_at_most_max_rows_and_says_binned(monkeypatch):
    """Outputs at scale (docs/design.md: an aggregated form at scale, said in the report): with MAX_CYCLE_ROWS
    lowered to 100, the bundled example's cycle table has at most 100 rows, keeps the total count (exact:
    multiples of 0.5 summed), and its note names the binning width."""
    from flexcycle import outputs
    from flexcycle.cli.app import example_design

    result = estimate(load_design(example_design()))
    monkeypatch.setattr(outputs, "MAX_CYCLE_ROWS", 100)
    table, note = outputs.cycle_table(result)
    assert len(table) <= 100
    assert float(table["count"].sum()) == result.design.duty.cycles.n_total
    assert "binned cycles" in note and "at the centre of its bin of" in note
    assert (table["max"] >= table["min"]).all()
