"""Side-by-side comparison, life/explore/compare.py (docs/design.md, outputs contract: comparison.csv and comparison.html).

The candidates are cantilevers of one homogeneous unidirectional 0° material (a user material, so its
G13 is stated), loaded at the tip by a force block table. For them the rectangular-section formulas hold
(Roark's Formulas for Stress and Strain, 7th ed., Table 8.1 case 1a; docs/references.md, rectangular section):
σ = 6FL/(bh²), δ = 4FL³/(Ebh³), plus the Timoshenko shear deflection FL/(κ·G13·b·h) with κ = 5/6.
"""
from __future__ import annotations

import html
import math
import re

import pandas as pd
import pytest
from cli_runner import flexcycle
from designs import user_glass

from flexcycle.design import load_design
from flexcycle.display import Display
from flexcycle.estimate import CAUTION, estimate
from flexcycle.explore.compare import (
    COLUMNS,
    bar_figure,
    comparison_html,
    comparison_table,
    display_rows,
    ranking,
    same_duty,
)

# docs/design.md, outputs contract: comparison.csv has at least these columns
CONTRACT = ["title", "life_blocks", "life_cycles", "mass_kg", "stiffness_n_per_m", "peak_energy_j",
            "specific_energy_j_per_kg", "critical_mode"]

# invented test material (the "my-glass" of docs/design.md's design-file example, with G13 stated)
E1, G13, RHO = 40e9, 4e9, 1900.0  # Pa, Pa, kg/m³
L, B, T_PLY = 0.200, 0.020, 0.5e-3  # span, width, ply thickness [m]

MATERIAL = user_glass("test-glass", extra='G13 = "4 GPa"')


def candidate(title: str, count: int, force: str = "20 N", extra_curve: str = "") -> str:
    """A 200 mm × 20 mm cantilever of ``count`` 0° plies of 0.5 mm; 1000 cycles 0 → ``force`` per block."""
    return f"""\
title = "{title}"
[beam]
support = "cantilever"
span = "200 mm"
width = "20 mm"
stations = 6

[[ply]]
material = "test-glass"
angle = 0
thickness = "0.5 mm"
count = {count}

[duty]
drive = "force"
cycles = [ {{ min = "0 N", max = "{force}", count = 1000 }} ]

{MATERIAL.replace('m = 10', 'm = 10' + extra_curve)}"""


@pytest.fixture(scope="module")
def files(tmp_path_factory):
    """Three candidate files: thin (4 plies, h = 2 mm), thick (8 plies, h = 4 mm), and one whose cycles lie
    below a fatigue limit (unbounded life)."""
    folder = tmp_path_factory.mktemp("candidates")
    texts = {
        "thin.toml": candidate("thin <4 plies> & co", 4),
        "thick.toml": candidate("thick, 8 plies", 8),
        "safe.toml": candidate("below the limit", 8, force="2 N", extra_curve='\nlimit = "100 MPa"'),
    }
    for name, text in texts.items():
        (folder / name).write_text(text, encoding="utf-8")
    return {name.removesuffix(".toml"): folder / name for name in texts}


@pytest.fixture(scope="module")
def results(files):
    return {name: estimate(load_design(path)) for name, path in files.items()}


def test_rows_are_the_designs_in_order_with_the_contract_columns(results):
    order = ["thin", "thick", "safe"]
    table = comparison_table([results[n] for n in order])
    assert set(CONTRACT) <= set(table.columns)
    assert list(table.columns) == COLUMNS
    assert len(table) == 3
    assert list(table["title"]) == [results[n].design.title for n in order]
    assert list(table["file"]) == [f"{n}.toml" for n in order]


@pytest.mark.parametrize("name", ["thin", "thick", "safe"])
def test_contract_columns_equal_each_designs_own_summary(results, name):
    """Each row holds its design's summary.json figures (docs/design.md: the comparison is of the summaries)."""
    s = results[name].summary()
    row = comparison_table([results["thin"], results["thick"], results["safe"]]).set_index("file").loc[f"{name}.toml"]
    for key in ["mass_kg", "stiffness_n_per_m", "peak_energy_j", "specific_energy_j_per_kg"]:
        assert row[key] == s[key], key
    for key in ["life_blocks", "life_cycles"]:
        if s[key] is None:
            assert row[key] is None or math.isnan(row[key]), key
        else:
            assert row[key] == s[key], key
    assert row["title"] == s["title"]
    assert row["critical_mode"] == s["critical"]["mode"]
    assert row["critical_ply"] == s["critical"]["ply"]
    assert row["warnings"] == len(s["warnings"])


def test_thickness_doubled_closed_form(results):
    """Same cantilever and force, twice as thick (h = 2 → 4 mm), one homogeneous 0° material.

    Hand calculation (Roark 7th ed., Table 8.1 case 1a; rectangular section, docs/references.md):
    - bending compliance 4L³/(E1·b·h³): thin 4·0.008/(40e9·0.02·0.002³) = 5.000e-3 m/N; thick 6.250e-4 m/N (÷8)
    - shear compliance L/(κ·G13·b·h), κ = 5/6 (Timoshenko): thin 0.2/(5/6·4e9·0.02·0.002) = 1.5e-6 m/N;
      thick 7.5e-7 m/N (÷2). Shear share of the compliance: thin 0.030 %, thick 0.12 % — bending-dominated,
      so the stiffness ratio (5.0015e-3)/(6.2575e-4) = 7.9928 is 8 to within 0.1 %.
    - mass ρ·b·h·L: thin 1900·0.02·0.002·0.2 = 0.0152 kg; thick 0.0304 kg (×2)
    - root stress 6FL/(bh²) at F = 20 N: thin 6·20·0.2/(0.02·0.002²) = 300 MPa, thick 75 MPa (÷4);
      strain σ/E1 (a homogeneous 0° narrow beam: 1/d11 = E1·h³/12): 7.5e-3 and 1.875e-3.
    - energy at peak ½·C·F²: ratio = compliance ratio = 1/7.9928.
    """
    thin, thick = results["thin"].summary(), results["thick"].summary()

    def compliance(h):
        return 4 * L**3 / (E1 * B * h**3) + L / (5 / 6 * G13 * B * h)

    c_thin, c_thick = compliance(4 * T_PLY), compliance(8 * T_PLY)
    shear_share_thin = (L / (5 / 6 * G13 * B * 4 * T_PLY)) / c_thin
    assert shear_share_thin == pytest.approx(3.0e-4, rel=1e-3)  # the hand value above (4 digits)

    # rel 1e-9: closed forms of a homogeneous section, computed exactly by the code (no rounding)
    assert 1 / thin["stiffness_n_per_m"] == pytest.approx(c_thin, rel=1e-9)
    assert thick["stiffness_n_per_m"] / thin["stiffness_n_per_m"] == pytest.approx(c_thin / c_thick, rel=1e-9)
    # the pure-bending rule of thumb: ×8 within the shear share (0.1 % here)
    assert thick["stiffness_n_per_m"] / thin["stiffness_n_per_m"] == pytest.approx(8.0, rel=1e-3)
    assert thick["mass_kg"] / thin["mass_kg"] == pytest.approx(2.0, rel=1e-12)
    assert thin["mass_kg"] == pytest.approx(0.0152, rel=1e-12)
    assert thin["peak_strain"] == pytest.approx(300e6 / E1, rel=1e-9)
    assert thick["peak_strain"] / thin["peak_strain"] == pytest.approx(0.25, rel=1e-9)
    assert thick["peak_energy_j"] / thin["peak_energy_j"] == pytest.approx(c_thick / c_thin, rel=1e-9)
    # a quarter of the stress lives far longer under the same force
    assert thick["life_blocks"] > thin["life_blocks"]


def test_unbounded_reads_unbounded_in_the_page(results):
    """A design without damaging cycles has life null in its summary; the page writes 'unbounded'."""
    rs = [results["thin"], results["safe"]]
    assert results["safe"].summary()["life_blocks"] is None
    page = comparison_html(comparison_table(rs), rs)
    assert "unbounded" in page


def test_comparison_html_is_self_contained_with_titles_warnings_and_caution(results):
    rs = [results["thin"], results["thick"], results["safe"]]
    page = comparison_html(comparison_table(rs), rs)
    assert page.startswith("<!DOCTYPE html>")
    refs = re.findall(r"""(?:src|href)\s*=\s*["']([^"']*)["']""", page, re.IGNORECASE)
    assert all(r.startswith("#") for r in refs), refs  # nothing fetched from outside: inline SVG's own ids only
    assert not re.search(r"<link\b|<script\b|<img\b|@import|url\(\s*['\"]?http", page, re.IGNORECASE)
    assert html.escape(CAUTION) in page
    for r in rs:
        assert html.escape(r.design.title) in page
        for w in r.warnings:
            assert html.escape(w) in page
    assert "thin <4 plies>" not in page  # the title is escaped, not markup
    assert page.count("<tr>") == 2 * (1 + len(rs))  # two tables: header and one row per design each
    assert page.count("<svg") == 2  # bar charts; overlaid force–deflection and strain envelopes
    assert "Duty: each design with its own duty." in page


def test_page_ranks_by_life_under_a_common_duty(results):
    """thin and thick carry the same duty (1000 cycles 0 → 20 N): ranked by life, thick first (a quarter of the
    stress lives far longer; the hand calculation above)."""
    rs = [results["thin"], results["thick"]]
    page = comparison_html(comparison_table(rs), rs)
    rows = re.findall(r"<tr><td>([^<]*)</td><td>([^<]*)</td>", page)
    assert [design for design, _ in rows[:2]] == ["1. #2", "2. #1"]
    assert "Ranked by life in blocks of the common duty" in page


def test_designs_with_different_duties_are_not_ranked_by_life(results):
    """safe carries 0 → 2 N, the others 0 → 20 N: a block of one duty is not a block of the other, so the page
    keeps the order given and says why (its unbounded life would otherwise put it first)."""
    rs = [results["thin"], results["thick"], results["safe"]]
    table = comparison_table(rs)
    assert not same_duty(rs)
    rank = ranking(table, rs)
    assert rank.order == [0, 1, 2] and not rank.ranked
    page = comparison_html(table, rs)
    rows = re.findall(r"<tr><td>([^<]*)</td><td>([^<]*)</td>", page)
    assert [design for design, _ in rows[:3]] == ["#1", "#2", "#3"]
    assert "Not ranked: the designs carry different duties" in page


def test_bar_charts_follow_the_table_order_and_units(results):
    """The bars are drawn in the order of the table (ranked: #2 before #1) and in its units (N/mm, g)."""
    rs = [results["thin"], results["thick"]]
    svg = bar_figure(comparison_table(rs), rs)
    assert svg.index(">#2<") < svg.index(">#1<") if ">#2<" in svg else svg.index("#2") < svg.index("#1")
    assert "stiffness [N/mm]" in svg and "mass [g]" in svg
    us = bar_figure(comparison_table(rs), rs, Display("us"))
    assert "stiffness [lbf/in]" in us and "mass [lb]" in us


def test_headers_carry_units_not_key_names(results):
    rs = [results["thin"], results["thick"]]
    page = comparison_html(comparison_table(rs), rs)
    assert "n per m" not in page and "stiffness_n_per_m" not in page
    assert "stiffness [N/mm]" in page and "mass [g]" in page and "peak energy [J]" in page
    us = comparison_html(comparison_table(rs), rs, display=Display("us"))
    assert "stiffness [lbf/in] (N/mm)" in us and "mass [lb] (g)" in us
    # the thin beam's mass, 200 × 20 × 2 mm of 1900 kg/m³ = 15.2 g = 0.03351 lb (1 lb = 453.59237 g)
    assert "0.03351 (15.2)" in us


def test_stiffness_in_the_table_is_that_of_the_chart(results):
    """Table and chart both in N/mm: the thin beam's stiffness in the table is k/1000 of summary's N/m."""
    rs = [results["thin"], results["thick"]]
    shown = display_rows(comparison_table(rs), rs)
    header, rows = shown["figures"]
    column = header.index("stiffness [N/mm]")
    thin = next(row for row in rows if row[0].endswith("#1"))
    assert float(thin[column]) == pytest.approx(results["thin"].summary()["stiffness_n_per_m"] / 1e3, rel=1e-3)


@pytest.mark.parametrize("common", [False, True])
def test_cli_compare_rows_equal_run_summaries(files, tmp_path, monkeypatch, capsys, common):
    """Each row of comparison.csv equals summary.json of `flexcycle run` on that design (to the 9 digits the
    CSV keeps). With --duty, the design is run on a copy of its file whose [duty] is the common one."""
    import json

    duty = tmp_path / "common.toml"
    duty.write_text('[duty]\ndrive = "force"\ncycles = [ { min = "-5 N", max = "15 N", count = 300 } ]\n',
                    encoding="utf-8")
    names = ["thin", "thick"]
    args = ["compare", *(files[n] for n in names), "--out", tmp_path / "cmp"] + (["--duty", duty] if common else [])
    code, stdout, err = flexcycle(args, monkeypatch, capsys)
    assert code == 0, err
    expected_note = "common duty from common.toml" if common else "each design with its own duty"
    assert f"duty: {expected_note}" in stdout
    assert f"Duty: {expected_note}." in (tmp_path / "cmp" / "comparison.html").read_text(encoding="utf-8")
    table = pd.read_csv(tmp_path / "cmp" / "comparison.csv")
    for i, name in enumerate(names):
        design = files[name]
        if common:  # the same design with the common duty written into it by hand
            text = design.read_text(encoding="utf-8")
            design = tmp_path / f"{name}-common.toml"
            design.write_text(re.sub(r"\[duty\]\n.*?\n\n", "[duty]\ndrive = \"force\"\ncycles = [ { min = \"-5 N\", "
                                     "max = \"15 N\", count = 300 } ]\n\n", text, flags=re.DOTALL), encoding="utf-8")
        out = tmp_path / f"run-{name}"
        code, _, err = flexcycle(["run", design, "--out", out], monkeypatch, capsys)
        assert code == 0, err
        s = json.loads((out / "summary.json").read_text(encoding="utf-8"))
        if common:
            assert s["cycles_per_block"] == 300
        row = table.loc[i]
        assert row["title"] == s["title"]
        assert row["critical_mode"] == s["critical"]["mode"]
        for key in ["life_blocks", "life_cycles", "mass_kg", "stiffness_n_per_m", "peak_energy_j",
                    "specific_energy_j_per_kg"]:
            assert row[key] == pytest.approx(s[key], rel=1e-8), key  # CSV keeps 9 significant digits


def test_cli_compare_wrong_duty_file_names_it(files, tmp_path, monkeypatch, capsys):
    """A --duty file with a wrong key: exit 2, the message names the duty file and the key."""
    duty = tmp_path / "common.toml"
    duty.write_text('[duty]\ndrive = "force"\ncycles = [ { min = "0 N", max = "15", count = 300 } ]\n', encoding="utf-8")
    code, _, err = flexcycle(["compare", files["thin"], files["thick"], "--duty", duty, "--out", tmp_path / "c"],
                            monkeypatch, capsys)
    assert code == 2
    assert "common.toml" in err and "max" in err and "Traceback" not in err


def test_cli_compare_writes_csv_and_html(files, results, tmp_path, monkeypatch, capsys):
    """`flexcycle compare A B --out DIR`: exit 0, comparison.csv with a row per design in the given order
    and each design's summary figures, comparison.html beside it."""
    out = tmp_path / "cmp"
    code, stdout, err = flexcycle(["compare", files["thin"], files["thick"], "--out", out], monkeypatch, capsys)
    assert code == 0, err
    assert (out / "comparison.html").is_file()
    table = pd.read_csv(out / "comparison.csv")
    assert set(CONTRACT) <= set(table.columns)
    assert list(table["title"]) == ["thin <4 plies> & co", "thick, 8 plies"]
    for (_, row), name in zip(table.iterrows(), ["thin", "thick"]):
        s = results[name].summary()
        for key in ["life_blocks", "life_cycles", "mass_kg", "stiffness_n_per_m", "peak_energy_j",
                    "specific_energy_j_per_kg"]:
            assert row[key] == pytest.approx(s[key], rel=1e-8), key  # rel 1e-8: the CSV has 9 digits
        assert row["critical_mode"] == s["critical"]["mode"]
    assert "caution" in stdout
    assert "thin <4 plies>" in stdout and "thick, 8 plies" in stdout
    assert "static reserve" in stdout
    for i, name in enumerate(["thin", "thick"], start=1):
        for w in results[name].warnings:
            assert f"#{i} {w}" in " ".join(stdout.split()) or f"#{i} {w[:40]}" in " ".join(stdout.split())


def test_cli_compare_unbounded_is_an_empty_cell(files, tmp_path, monkeypatch, capsys):
    """Strict figures: an unbounded life is an empty CSV cell (no 'inf' or 'nan' text), the page says 'unbounded'."""
    out = tmp_path / "cmp"
    code, stdout, err = flexcycle(["compare", files["thick"], files["safe"], "--out", out], monkeypatch, capsys)
    assert code == 0, err
    text = (out / "comparison.csv").read_text(encoding="utf-8")
    assert "inf" not in text.lower() and "nan" not in text.lower()
    table = pd.read_csv(out / "comparison.csv")
    assert math.isnan(table.loc[1, "life_blocks"]) and math.isnan(table.loc[1, "life_cycles"])
    assert "unbounded" in (out / "comparison.html").read_text(encoding="utf-8")
    assert "unbounded" in stdout


def test_cli_compare_wrong_design_exits_2_and_writes_nothing(files, tmp_path, monkeypatch, capsys):
    """One wrong candidate: exit 2, one message naming its file, no comparison written (docs/design.md exit codes)."""
    wrong = tmp_path / "wrong.toml"
    wrong.write_text(candidate("wrong", 4).replace('span = "200 mm"', 'span = "200"'), encoding="utf-8")
    out = tmp_path / "cmp"
    code, _, err = flexcycle(["compare", files["thin"], wrong, "--out", out], monkeypatch, capsys)
    assert code == 2
    assert "wrong.toml" in err and "span" in err and "Traceback" not in err
    assert not (out / "comparison.csv").exists()


def test_page_tables_fit_a_page_width(results):
    """The page holds two tables of at most ten columns (the one wide table of seventeen was cut off on a
    1200 px screen) and keeps the page within 70 em."""
    rs = [results["thin"], results["thick"], results["safe"]]
    page = comparison_html(comparison_table(rs), rs)
    heads = re.findall(r"<table><tr>(.*?)</tr>", page)
    assert len(heads) == 2
    assert all(head.count("<th>") <= 10 for head in heads)
    assert "max-width: 70em" in page and "overflow-x" not in page


def test_warnings_on_the_page_and_in_the_terminal_follow_the_units(tmp_path):
    """60 N on the thin beam breaks it at the root: the warning quotes the force, "60 N", shown under inch-pound
    as 60 / 4.4482216152605 = 13.49 lbf (NIST SP 811), the SI figure beside; in SI the warning is as written."""
    from flexcycle.cli.terminal import comparison_text

    path = tmp_path / "broken.toml"
    path.write_text(candidate("broken", 4, force="60 N"), encoding="utf-8")
    rs = [estimate(load_design(path))]
    assert any("at the duty extreme 60 N" in w for w in rs[0].warnings)
    table = comparison_table(rs)
    assert "13.5 lbf (60 N)" in comparison_html(table, rs, display=Display("us"))
    assert "13.5 lbf (60 N)" in comparison_text(table, results=rs, display=Display("us"))
    si = comparison_text(table, results=rs)
    assert "at the duty extreme 60 N" in si and "lbf" not in si
