"""Plain-text views, life/terminal.py: the run summary and the rainflow cycle table.

The summary is checked on the hand-calculated cantilever of tests/test_estimate.py (figures below), at
three loads: one that gives a finite life, one below a fatigue limit (unbounded) and one past the static
strength (zero life). The cycle table is checked on the rainflow example of ASTM E1049-85 (reapproved
2011), section 5.4.4 (docs/references.md).
"""
from __future__ import annotations

import re
import sys
from collections import defaultdict
from pathlib import Path

import numpy as np
import pytest

from flexcycle.cli import app as cli
from flexcycle.cli.terminal import cycle_text, summary_text
from flexcycle.design import parse_design
from flexcycle.display import Display
from flexcycle.estimate import CAUTION, estimate
from flexcycle.spectra.merging import merge_identical
from flexcycle.spectra.rainflow import rainflow_cycles

GLASS = {
    "E1": "40 GPa", "E2": "10 GPa", "G12": "4 GPa", "nu12": 0.3, "density": "1900 kg/m^3",
    "Xt": "1000 MPa", "Xc": "600 MPa", "Yt": "40 MPa", "Yc": "140 MPa", "S12": "70 MPa",
    "fatigue": {"form": "power", "R": -1, "S1": "800 MPa", "m": 10},
}  # invented test material (docs/design.md's "my-glass"), G13 = G12 by default


def hand_design(force: str, blocks_per_day: float | None = 100.0, limit: str | None = None):
    """Cantilever L = 200 mm, b = 20 mm, ten 0° plies of 0.5 mm (h = 5 mm); 1000 cycles 0 → force per block."""
    fatigue = dict(GLASS["fatigue"], **({"limit": limit} if limit else {}))
    duty = {"drive": "force", "cycles": [{"min": "0 N", "max": force, "count": 1000}]}
    if blocks_per_day:
        duty["blocks_per_day"] = blocks_per_day
    doc = {
        "title": "hand check cantilever",
        "beam": {"support": "cantilever", "span": "200 mm", "width": "20 mm", "stations": 6},
        "material": {"hand-glass": dict(GLASS, fatigue=fatigue)},
        "ply": [{"material": "hand-glass", "angle": 0, "thickness": "0.5 mm", "count": 10}],
        "duty": duty,
    }
    return parse_design(doc, "hand.toml", Path("."))


def table_rows_of(text: str) -> dict[str, str]:
    """The summary table's rows, label -> value (two columns separated by two or more spaces)."""
    rows = {}
    for line in text.splitlines():
        parts = re.split(r"\s{2,}", line.strip(), maxsplit=1)
        if len(parts) == 2:
            rows[parts[0]] = parts[1]
    return rows


def number_before(pattern: str, text: str) -> float:
    """The number printed just before ``pattern`` (a regex) at its first match."""
    found = re.search(r"(?<![\w.])([-+]?\d[\d.]*(?:e[-+]?\d+)?)\s*" + pattern, text, re.MULTILINE)
    assert found, f"no number before {pattern!r} in:\n{text}"
    return float(found.group(1))


@pytest.fixture(scope="module")
def finite():
    return summary_text(estimate(hand_design("50 N")))


def test_summary_figures_by_hand(finite):
    """Hand calculation (as in tests/test_estimate.py; Roark 7th ed., Table 8.1 case 1a; σ = 6M/(bh²)):
    root σ = 6·50·0.2/(0.02·0.005²) = 120 MPa; the compression face governs with Goodman
    (σa0 = 60/(1 − 60/600) = 66.667 MPa): N = (800/66.667)^10 = 12^10 = 6.1917e10 cycles = 6.1917e7 blocks
    of 1000 = 6.1917e5 days at 100 blocks a day; critical: ply 10, root, fibre-compression.
    C = L³/(3EI) + L/(5/6·G13·b·h) = 3.2e-4 + 6.0e-7 m/N → k = 3.11915 N/mm; mass 1900·0.02·0.005·0.2 = 38 g;
    U(50 N) = ½·C·F² = 0.40075 J; static reserve 600/120 = 5 (max stress = Tsai-Wu for uniaxial σ1)."""
    text = finite
    # rel 5e-3: lives print to 3 significant digits
    assert number_before(r"cycles\s*$", text) == pytest.approx(12.0**10, rel=5e-3)
    assert number_before(r"blocks of the duty", text) == pytest.approx(12.0**10 / 1000, rel=5e-3)
    assert number_before(r"days", text) == pytest.approx(12.0**10 / 1000 / 100, rel=5e-3)
    assert "at 100 blocks per day" in text
    rows = table_rows_of(text)
    assert rows["critical mode"] == "fibre-compression"
    assert rows["critical ply"] == "ply 10 (hand-glass, 0°), top face"
    assert rows["critical place"].startswith("x = 0 mm from the root")
    C = 0.2**3 / (3 * 40e9 * 0.02 * 0.005**3 / 12) + 0.2 / (5 / 6 * 4e9 * 0.02 * 0.005)
    # rel 1e-3: stiffness, mass and energy print to 4 significant digits
    assert number_before(r"N/mm", text) == pytest.approx(1e-3 / C, rel=1e-3)
    assert number_before(r"g\s*$", text) == pytest.approx(38.0, rel=1e-3)
    assert number_before(r"J at peak", text) == pytest.approx(0.5 * C * 50**2, rel=1e-3)
    assert number_before(r"% along the fibres", text) == pytest.approx(100 * 120e6 / 40e9, rel=5e-3)
    assert number_before(r"\(max-stress|\(Tsai-Wu", text) == pytest.approx(5.0, rel=5e-3)


def test_summary_caution_is_the_last_line(finite):
    assert finite.splitlines()[-1] == "caution: " + CAUTION


def test_no_days_without_blocks_per_day():
    text = summary_text(estimate(hand_design("50 N", blocks_per_day=None)))
    assert "days" not in text and "blocks per day" not in text


def test_warnings_listed():
    """Every warning of the result is printed as its own item under 'warnings:'."""
    result = estimate(hand_design("50 N"))
    assert result.warnings  # hand-glass has no S13: the interlaminar check is skipped with a note
    text = summary_text(result)
    assert "\nwarnings:\n" in text
    for w in result.warnings:
        assert f"  - {w}" in text.splitlines()


def test_example_flag_labels_demo_data():
    result = estimate(hand_design("50 N"))
    assert "invented demo data" in summary_text(result, example=True).splitlines()[0]
    assert "invented demo data" not in summary_text(result)


def test_unbounded_life_reads_unbounded():
    """Fatigue limit 100 MPa amplitude; 0 → 5 N gives σa = σm = 6 MPa at the root (a tenth of 50 N's 60 MPa),
    Goodman σa0 = 6/(1 − 6/600) = 6.06 MPa, far below the limit: no cycle does damage."""
    result = estimate(hand_design("5 N", limit="100 MPa"))
    assert result.life_unbounded
    rows = table_rows_of(summary_text(result))
    life = [rows["life, cycles"], rows["life, blocks"], rows["life, days"]]
    assert all(v.startswith("unbounded") for v in life)  # cycles, blocks, days
    assert not any(re.search(r"\d\s*cycles", v) for v in life)


def test_zero_life_reads_fails_at_first_loading():
    """0 → 300 N: root σ = 6·300·0.2/(0.02·0.005²) = 720 MPa > Xc = 600 MPa: the first load breaks the part."""
    result = estimate(hand_design("300 N"))
    assert result.life_cycles == 0
    rows = table_rows_of(summary_text(result))
    assert rows["life, cycles"] == "0 cycles (fails at first loading)"
    assert rows["life, blocks"] == "0 blocks of the duty (fails at first loading)"
    assert rows["life, days"].startswith("0 days (fails at first loading)")


def test_summary_is_a_fixed_width_table(finite):
    """Captured (not a TTY), the table keeps its fixed width: no line past 100 columns, no colour codes."""
    table = finite[:finite.index("\nwarnings:")]
    assert all(len(line) <= 100 for line in table.splitlines())
    assert "\x1b[" not in finite
    assert re.search(r"^quantity\s+value$", finite, re.MULTILINE)


def test_cli_run_prints_the_values_of_summary_json(tmp_path, monkeypatch, capsys):
    """`flexcycle run DESIGN`: the printed life, stiffness, mass and energy are summary.json's to the digits shown
    (3 significant for lives, 4 for the rest)."""
    import json

    from cli_runner import flexcycle

    design = tmp_path / "hand.toml"
    design.write_text("""\
title = "hand check cantilever"
[beam]
support = "cantilever"
span = "200 mm"
width = "20 mm"
stations = 6
[[ply]]
material = "e-glass-epoxy"
angle = 0
thickness = "0.5 mm"
count = 10
[duty]
drive = "force"
cycles = [ { min = "0 N", max = "50 N", count = 1000 } ]
blocks_per_day = 100
""", encoding="utf-8")
    code, out, err = flexcycle(["run", design, "--out", tmp_path / "out"], monkeypatch, capsys)
    assert code == 0, err
    s = json.loads((tmp_path / "out" / "summary.json").read_text(encoding="utf-8"))
    rows = table_rows_of(out)
    assert float(rows["life, cycles"].split()[0]) == float(f"{s['life_cycles']:.3g}")
    assert float(rows["life, blocks"].split()[0]) == float(f"{s['life_blocks']:.3g}")
    assert float(rows["life, days"].split()[0]) == float(f"{s['life_days']:.3g}")
    assert float(rows["stiffness"].split()[0]) == float(f"{s['stiffness_n_per_m'] / 1e3:.4g}")
    assert float(rows["mass"].split()[0]) == float(f"{s['mass_kg'] * 1e3:.4g}")
    assert float(rows["peak energy"].split()[0]) == float(f"{s['peak_energy_j']:.4g}")
    assert rows["critical mode"] == s["critical"]["mode"]
    assert out.rstrip().splitlines()[-1].startswith("wrote summary.json")


# ---------------------------------------------------------------------------------------------
# ASTM E1049-85, section 5.4.4: the rainflow example

ASTM_E1049_HISTORY = [-2, 1, -3, 5, -1, 3, -4, 4, -2]  # load units of the standard
ASTM_E1049_COUNTS = {3: 0.5, 4: 1.5, 6: 0.5, 8: 1.0, 9: 0.5}  # range: cycles (half cycles count 0.5)


def table_rows(text: str) -> list[tuple[float, float, float, float, float]]:
    """(range, mean, min, max, count) of every data row of a cycle table."""
    rows = []
    for line in text.splitlines()[2:]:
        parts = line.split()
        if len(parts) == 5:
            rows.append(tuple(float(p) for p in parts))
    return rows


def check_astm_table(text: str) -> None:
    """Totals per range equal the standard's; each row's range = max − min and mean = (max + min)/2."""
    rows = table_rows(text)
    totals = defaultdict(float)
    for rng, mean, lo, hi, n in rows:
        assert rng == pytest.approx(hi - lo, abs=1e-9) and mean == pytest.approx((hi + lo) / 2, abs=1e-9)
        totals[round(rng, 9)] += n
    assert dict(totals) == ASTM_E1049_COUNTS
    ranges = [r[0] for r in rows]
    assert ranges == sorted(ranges, reverse=True)  # largest ranges first
    assert "9 samples" in text.splitlines()[0]
    assert "ASTM E1049-85" in text.splitlines()[0]


def test_cycle_text_astm_e1049_example():
    """The history in mm, counted in SI (m), printed back in mm: the standard's table."""
    history = np.array(ASTM_E1049_HISTORY, float) * 1e-3
    cycles = merge_identical(rainflow_cycles(history))
    text = cycle_text(cycles, "mm", 1e-3, top=0, samples=history.size)
    check_astm_table(text)
    assert f"{sum(ASTM_E1049_COUNTS.values()):g} cycles" in text.splitlines()[0]  # 4 cycles in all
    assert "[mm]" in text.splitlines()[1]


def test_cycle_text_top_rows():
    history = np.array(ASTM_E1049_HISTORY, float)
    cycles = merge_identical(rainflow_cycles(history))
    text = cycle_text(cycles, "N", 1.0, top=2, samples=history.size)
    assert [r[0] for r in table_rows(text)] == [9.0, 8.0]  # the two largest ranges of the standard
    assert f"… {cycles.lo.size - 2} more (--top 0 shows all)" in text


def test_cli_count_prints_the_astm_table(tmp_path, monkeypatch, capsys):
    """`flexcycle count FILE --column load --unit lbf --top 0`, in-process through flexcycle.cli.app.main: the same table."""
    csv = tmp_path / "astm.csv"
    csv.write_text("# ASTM E1049-85 section 5.4.4 example history\nload\n"
                   + "\n".join(str(v) for v in ASTM_E1049_HISTORY) + "\n", encoding="utf-8")
    monkeypatch.setattr(sys, "argv", ["flexcycle", "count", str(csv), "--column", "load", "--unit", "lbf", "--top", "0"])
    saved = np.geterr()
    try:
        with pytest.raises(SystemExit) as info:
            cli.main()
            sys.exit(0)
    finally:
        np.seterr(**saved)
    assert info.value.code in (0, None)
    check_astm_table(capsys.readouterr().out)


def test_sizing_text_is_a_before_after_table(tmp_path):
    """The sizing view lists the steps, then one line per row of sizing_rows with its before and after."""
    from flexcycle.cli.terminal import sizing_text
    from flexcycle.sizing import plan, sizing_rows
    doc = {"title": "t", "beam": {"support": "cantilever", "span": "200 mm", "width": "20 mm", "stations": 4},
           "material": {"g": GLASS}, "ply": [{"material": "g", "angle": 0, "thickness": "0.5 mm", "count": 10}],
           "duty": {"drive": "force", "cycles": [{"min": "-50 N", "max": "50 N", "count": 1000}]},
           "fatigue": {"mean_stress": "none"}}
    answer = plan(parse_design(doc, "t.toml", tmp_path), 1e6)
    text = sizing_text(answer)
    assert "thickness for the life: the thinnest design" in text
    for quantity, before, after in sizing_rows(answer):
        assert re.search(rf"{re.escape(quantity)}\s+{re.escape(before)}\s+{re.escape(after)}", text), quantity


def test_one_block_per_day_is_singular():
    text = summary_text(estimate(hand_design("50 N", blocks_per_day=1)))
    assert "at 1 block per day" in text and "1 blocks" not in text


def test_three_point_places_are_measured_from_mid_span():
    """A three-point beam's stations run from mid-span (x = 0) to a support: never "from the root"."""
    doc = parse_design({**hand_design("50 N").document,
                        "beam": {"support": "three-point", "span": "200 mm", "width": "20 mm", "stations": 6}},
                       "hand.toml", Path("."))
    text = summary_text(estimate(doc))
    rows = table_rows_of(text)
    assert "from mid-span" in rows["critical place"] and "from the root" not in text


def test_inch_pound_summary_with_si_beside():
    """--units us: 200 mm = 7.874 in; mass 38 g = 0.08378 lb (1 lb = 453.59237 g, exact); the stiffness
    k = 3.11915 N/mm = 17.81 lbf/in (1 lbf/in = 0.175126835 N/mm, exact definitions)."""
    text = summary_text(estimate(hand_design("50 N")), display=Display("us"))
    rows = table_rows_of(text)
    assert "span 7.874 in (200 mm)" in text
    assert rows["mass"] == "0.08378 lb (38 g)"
    assert rows["stiffness"].startswith("17.81 lbf/in (3.119 N/mm)")
    assert "in·lbf" in rows["peak energy"]


def test_verdict_line_at_the_top():
    """required_life = 1e7 blocks against a life of 12^10/1000 = 6.1917e7 blocks: met, margin 6.19."""
    design = hand_design("50 N")
    doc = dict(design.document, fatigue={"required_life": 1e7})
    result = estimate(parse_design(doc, "hand.toml", Path(".")))
    text = summary_text(result)
    first = text.splitlines()[0]
    assert first.startswith("MEETS the required life of 1e7") or first.startswith("MEETS the required life of 1.000e+07")
    assert "margin 6.19" in first
    short = estimate(parse_design(dict(design.document, fatigue={"required_life": 1e8}), "hand.toml", Path(".")))
    assert summary_text(short).splitlines()[0].startswith("FALLS SHORT of the required life")
