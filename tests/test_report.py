"""The design-review report, flexcycle.report (docs/design.md, outputs contract: report.html, one self-contained file).

Two designs: the bundled example (a deflection time history, 16 plies) and a small block-table
cantilever of one homogeneous 0° user material whose critical place is known by hand (below), driven
past 10 % of its span and wide enough to warn about the section model, so the report has warnings to show.
"""
from __future__ import annotations

import html
import re
from pathlib import Path

import pytest

from flexcycle.cli.app import example_design
from flexcycle.design import load_design, parse_design
from flexcycle.estimate import CAUTION, estimate
from flexcycle.outputs import cycle_table, location_table
from flexcycle.report.page import report_html

TITLE = "Test spring <A> & 'B'"  # markup characters: the report must escape them

# invented test material (docs/design.md's "my-glass"); no S13, so the interlaminar check is skipped with a note
GLASS = {
    "E1": "40 GPa", "E2": "10 GPa", "G12": "4 GPa", "nu12": 0.28, "density": "1900 kg/m^3",
    "Xt": "1000 MPa", "Xc": "600 MPa", "Yt": "40 MPa", "Yc": "140 MPa", "S12": "70 MPa",
    "fatigue": {"form": "power", "R": -1, "S1": "800 MPa", "m": 10},
}


def wide_cantilever():
    """L = 200 mm, b = 100 mm, four 0° plies of 0.5 mm (h = 2 mm), tip deflection 0 → 25 mm, 1000 per block.

    By hand (Roark 7th ed., Table 8.1 case 1a, rectangular section): 25 mm is 12.5 % of the span (> 10 %:
    the large-deflection warning); root strain 3δh/(2L²) = 3·0.025·0.002/(2·0.04) = 1.875e-3 (shear ignored,
    an upper bound), curvature ε/(h/2) = 1.875 1/m, Searle parameter b²κ/h = 0.01·1.875/0.002 = 9.4, between
    beam (≲ 1) and plate (≳ 20) behaviour: a warning. The cycle 0 → δmax puts the root's top face in
    compression, mean −σa: with Goodman and Xc = 600 MPa < Xt = 1000 MPa the compression face needs the larger
    equivalent amplitude (σa/(1 − σa/Xc) > σa/(1 − σa/Xt)), so the critical place is ply 4 (top), root,
    fibre-compression (docs/references.md, linear Goodman with unequal strengths).
    """
    doc = {
        "title": TITLE,
        "beam": {"support": "cantilever", "span": "200 mm", "width": "100 mm", "stations": 8},
        "material": {"report-glass": GLASS},
        "ply": [{"material": "report-glass", "angle": 0, "thickness": "0.5 mm", "count": 4}],
        "duty": {"drive": "deflection", "cycles": [{"min": "0 mm", "max": "25 mm", "count": 1000}]},
    }
    return parse_design(doc, "wide.toml", Path("."), Path("wide.toml"))


def render_report(design):
    result = estimate(design)
    cycles, note = cycle_table(result)
    return result, report_html(result, cycles, note, location_table(result))


@pytest.fixture(scope="module")
def wide():
    return render_report(wide_cantilever())


@pytest.fixture(scope="module")
def example():
    return render_report(load_design(example_design()))


@pytest.fixture(params=["wide", "example"])
def case(request, wide, example):
    return {"wide": wide, "example": example}[request.param]


def test_self_contained(case):
    """Nothing is fetched: no src/href/url other than a fragment inside the page or an inline data: image (a
    rasterized artist inside an SVG), no <link>, no <script>, no @import (matplotlib's inline SVG refers to its
    own markers and clip paths by '#id' only)."""
    _, page = case
    assert page.startswith("<!DOCTYPE html>") and page.rstrip().endswith("</html>")
    refs = re.findall(r"""(?:src|href)\s*=\s*["']([^"']*)["']""", page, re.IGNORECASE)
    local = [r for r in refs if r.startswith("#") or r.startswith("data:image/png;base64,")]
    assert local == refs, [r[:40] for r in refs if r not in local]
    assert all(u.startswith("#") for u in re.findall(r"url\(\s*([^)]*)\)", page))
    assert not re.search(r"<link\b|<script\b|<img\b|<iframe\b|@import", page, re.IGNORECASE)
    # web addresses appear only in the SVG's <metadata> (matplotlib's RDF identifiers) and as XML namespace
    # names, neither of which a browser loads; nowhere else
    outside = re.sub(r"<metadata>.*?</metadata>", "", page, flags=re.DOTALL)
    named = re.findall(r"""([\w:-]+)\s*=\s*["']https?://""", outside)
    assert set(named) <= {"xmlns", "xmlns:xlink"}, named
    assert len(named) == len(re.findall(r"https?://", outside))
    assert "file://" not in page


def test_title_caution_and_critical(case):
    result, page = case
    assert html.escape(result.design.title) in page
    assert html.escape(CAUTION) in page
    c = result.critical
    assert f"{c.mode}, ply {c.ply} " in page


def test_title_is_escaped(wide):
    _, page = wide
    assert "<A>" not in page
    assert "Test spring &lt;A&gt; &amp; &#x27;B&#x27;" in page


def test_critical_by_hand(wide):
    """The hand result of wide_cantilever(): ply 4 at the root, fibre-compression, shown in the report."""
    result, page = wide
    assert (result.critical.ply, result.critical.mode, result.critical.x_m) == (4, "fibre-compression", 0.0)
    assert "fibre-compression, ply 4 (report-glass, 0°), top face, x = 0 mm from the root" in page


FIGURES = {  # figure number: what its axes say (the six result and input figures, plus the layup drawing)
    "1": ["stack along the span", "planform", "distance from the root x [mm]"],
    "2": ["rainflow matrix", "cycle range [", "cycle mean ["],
    "3": ["load-point deflection δ [mm]", "load-point force F [N]", "stored at the peak drive"],
    "4": ["to scale", "along the load y [mm]", "along the unloaded beam x [mm]"],
    "5": ["fibre strain ε1 [%]", "bottom face", "top face", "critical:"],
    "6": ["ply-axis strain [%]", "ply-axis stress [MPa]", "z from the mid-plane [mm]"],
    "7": ["critical location"],
    "8": ["damage per block", "damage by cycle range", "share of the damage [%]"],
}


def figures(page: str) -> dict[str, str]:
    """The <figure id="fig-N"> elements of the page by number."""
    return dict(re.findall(r'<figure id="fig-(\d+)">(.*?)</figure>', page, re.DOTALL))


def test_an_inline_svg_per_figure(case):
    """Eight figures, each one inline <svg> with its caption, axes labelled with units."""
    _, page = case
    found = figures(page)
    assert sorted(found) == sorted(FIGURES)
    for number, words in FIGURES.items():
        body = found[number]
        assert body.count("<svg") == 1 and "<figcaption><b>Figure " + number in body
        for w in words:
            assert html.escape(w) in body or w in body, (number, w)
    assert page.count("<svg") == 8 and page.count("</svg>") == 8
    assert "<?xml" not in page  # the SVG's XML prologue is cut: it is not allowed inside HTML


FIGURE_NUMBERS = {"layup": "1", "duty": "2", "force-deflection": "3", "deformed-shapes": "4", "strain-envelope": "5",
                  "through-thickness": "6", "fatigue-curve": "7", "damage": "8",
                  "spectrum": "2b"}  # 2b: a PSD duty only (tests/test_measured.py draws it)


def test_every_figure_maker_returns_a_matplotlib_figure(wide):
    """Each maker of the registry returns a matplotlib Figure (no SVG text) of the small hand case, with the
    words its report figure shows among the Figure's own texts; the registry holds the eight report figures."""
    from matplotlib.figure import Figure
    from matplotlib.text import Text

    from flexcycle.report.figures import FIGURE_APPLIES, FIGURE_MAKERS
    from flexcycle.report.figures import FIGURES as NAMES

    result, _ = wide
    cycles, _ = cycle_table(result)
    locations = location_table(result)
    assert NAMES == tuple(FIGURE_MAKERS) and sorted(NAMES) == sorted(FIGURE_NUMBERS)
    for name, make in FIGURE_MAKERS.items():
        if not FIGURE_APPLIES.get(name, lambda result: True)(result):
            continue
        figure = make(result, cycles, locations)
        assert isinstance(figure, Figure), name
        assert figure.axes, name
        texts = " ".join(t.get_text() for t in figure.findobj(Text))
        for words in FIGURES[FIGURE_NUMBERS[name]]:
            assert words in texts, (name, words)


def test_fatigue_figure_names_the_critical_curve(wide):
    """Figure 7 of the hand case: the one R = −1 power curve of report-glass (Goodman; S1 800 MPa, m = 10)."""
    _, page = wide
    body = figures(page)["7"]
    assert "power curve at R = -1" in body
    assert "amplitude at R = -1 [MPa]" in body  # a stress-basis curve, drawn in MPa


def test_duty_history_only_for_a_time_history(wide, example):
    """A block table has no history to draw: only the rainflow matrix; the example's 18 000-sample ride is drawn
    as the min/max of 2000 bins, never point by point."""
    assert "drive history of one block" not in figures(wide[1])["2"]
    body = figures(example[1])["2"]
    assert "drive history of one block (18000 samples; min/max of 2000 bins)" in body


def test_sections_in_reading_order(case):
    """Identification, inputs, method, results, warnings, cautions, review and sign-off, in that order."""
    _, page = case
    ids = re.findall(r'<section id="([\w-]+)">', page)
    assert ids == ["identification", "inputs", "method", "results", "warnings", "cautions", "signoff"]


def test_method_names_and_cautions(case):
    """The method names (rainflow, the chosen rule, Miner) and every caution the issue asks for."""
    result, page = case
    assert "rainflow, ASTM E1049-85" in page
    assert "Goodman (linear constant-life lines to Xt and Xc)" in page  # both designs use the default rule
    assert "Palmgren–Miner linear damage sum; failure at D = 1 (Miner limit)" in page
    for words in ["releases its stored energy at once", "estimate, not certification", "ASTM D7774", "ISO 13003",
                  "environmental knock-downs", "licensed engineering practice decide"]:
        assert words in page, words
    assert f"Peak stored energy of this part: {result.storage.energy:.4g} J." in page


def test_identification_hashes_and_version(example):
    """SHA-256 of the design file and of the bundled profile, computed here with hashlib, and the tool version."""
    import hashlib
    from importlib import metadata

    from flexcycle.spectra.profiles import bundled_profile

    result, page = example
    assert hashlib.sha256(example_design().read_bytes()).hexdigest() in page
    assert result.design.duty.profile_path == bundled_profile("cargo-bike-ride")
    assert hashlib.sha256(bundled_profile("cargo-bike-ride").read_bytes()).hexdigest() in page
    assert f"flexcycle {metadata.version('flexcycle')}" in page


def test_block_table_has_no_profile(wide):
    result, page = wide
    assert result.design.duty.profile_path is None
    assert "block table in the design file" in page


def test_sizing_rows_follow_the_results_escaped(wide):
    """render(result, sizing=rows): a Sizing table right after the results, before the warnings, escaped."""
    from flexcycle.outputs import render

    result, _ = wide
    rows = [("thickness <scale>", "1", "0.8125"), ("life_blocks", "1.2e+03", "5e+04")]
    page = render(result, sizing=rows)["report.html"]
    results, sizing, warnings = (page.index(f'<section id="{s}">') for s in ("results", "sizing", "warnings"))
    assert results < sizing < warnings
    table = page[sizing:warnings]
    assert "<tr><th>quantity</th><th>before</th><th>after</th></tr>" in table
    assert "<tr><td>thickness &lt;scale&gt;</td><td>1</td><td>0.8125</td></tr>" in table
    assert "<tr><td>life_blocks</td><td>1.2e+03</td><td>5e+04</td></tr>" in table
    assert 'id="sizing"' not in render(result)["report.html"]  # no rows, no table


def test_every_warning_escaped(case):
    result, page = case
    assert result.warnings  # both designs carry warnings (see the module docstring)
    for w in result.warnings:
        assert f"<li>{html.escape(w)}</li>" in page


def test_wide_warnings_by_hand(wide):
    """The hand figures of wide_cantilever(): 25 mm past 10 % of the span, Searle parameter in between, no S13."""
    result, _ = wide
    text = " ".join(result.warnings)
    assert "passes 10 % of the span" in text
    assert "lies between beam" in text
    assert "S13" in text


def test_a_table_row_per_run_of_identical_plies(case):
    """The ply stack table: a header, then one row per run of identical consecutive plies ("3–8 (6)"), which,
    read back, numbers every ply of the whole stack 1… from the tension face with its material and thickness."""
    result, page = case
    plies = result.design.beam.plies
    section = page[page.index("<h3>Ply stack"):]
    table = section[section.index("<table>"):section.index("</table>")]
    rows = re.findall(r"<tr>(.*?)</tr>", table, re.DOTALL)
    expanded = []
    for row in rows[1:]:
        cells = re.findall(r"<td>(.*?)</td>", row)
        numbers = re.match(r"^(\d+)(?:–(\d+) \((\d+)\))?$", cells[0])
        first, last = int(numbers.group(1)), int(numbers.group(2) or numbers.group(1))
        if numbers.group(3):
            assert int(numbers.group(3)) == last - first + 1
        expanded += [(k, cells[1], float(cells[3])) for k in range(first, last + 1)]
    assert [k for k, _, _ in expanded] == list(range(1, len(plies) + 1))
    for (_, name, thickness), ply in zip(expanded, plies):
        assert name == html.escape(ply.material.name)
        assert thickness == pytest.approx(ply.thickness * 1e3, abs=5e-4)  # printed to 3 decimals [mm]
    assert len(rows) - 1 < len(plies) or len(plies) == 1  # runs are grouped


def test_example_stack_has_sixteen_plies(example):
    """The bundled example lists 1 + 6 + 2 + 6 + 1 plies (life/examples/cargo-bike-rear-spring.toml)."""
    result, page = example
    assert len(result.design.beam.plies) == 16


def test_minmax_envelope_keeps_every_extreme():
    """The decimated duty: at most 2000 bins, each bin's (min, max) exactly those of its samples (numpy by
    brute force here), so the history's own extremes survive."""
    import numpy as np
    from hypothesis import given, settings
    from hypothesis import strategies as st

    from flexcycle.spectra.streaming import ENVELOPE_BINS, minmax_envelope

    @settings(max_examples=60, deadline=None)
    @given(st.lists(st.floats(-1e3, 1e3), min_size=1, max_size=6000))
    def check(values):
        x = np.array(values)
        env = minmax_envelope(x)
        assert env.start.size == min(ENVELOPE_BINS, x.size)
        ends = list(env.start[1:]) + [x.size]
        for a, b, lo, hi in zip(env.start, ends, env.lo, env.hi):
            assert lo == x[a:b].min() and hi == x[a:b].max()
        assert env.lo.min() == x.min() and env.hi.max() == x.max()

    check()


CHROMIUM = next((p for p in ("chromium", "chromium-browser") if __import__("shutil").which(p)), None)


@pytest.mark.skipif(CHROMIUM is None, reason="no chromium binary found (.ci/run installs the Debian package "
                                              "'chromium' where it can)")
def test_opens_in_a_real_browser(example, tmp_path):
    """Headless Chromium loads the file and renders a screenshot that is not blank: the pixels vary and hold
    many distinct colours (text, figure fills, the caution box)."""
    import subprocess

    import numpy as np
    from matplotlib.image import imread

    _, page = example
    report = tmp_path / "report.html"
    report.write_text(page, encoding="utf-8")
    shot = tmp_path / "shot.png"
    subprocess.run([CHROMIUM, "--headless", "--no-sandbox", "--disable-gpu", f"--screenshot={shot}",
                    "--window-size=1000,2000", f"file://{report}"],
                   check=True, capture_output=True, timeout=120)
    pixels = imread(shot)[..., :3]
    assert pixels.shape[:2] == (2000, 1000)
    assert pixels.std() > 0.05  # blank white would be 0 (pixels in 0…1)
    colours = np.unique((pixels.reshape(-1, 3) * 255).round().astype(int), axis=0)
    assert len(colours) > 50  # a blank or single-box page has a handful


def test_duty_figure_of_a_long_history_draws_its_envelope():
    """A duty kept only as its min/max envelope (signal None, as for a long streamed history) is drawn as
    the envelope, said in the figure title; the report stays small (no point-by-point plot)."""
    import dataclasses

    import numpy as np

    from flexcycle.spectra.streaming import Envelope

    result = estimate(load_design(example_design()))
    duty = result.design.duty
    start = np.arange(0, 4_000_000, 2048)
    trace = Envelope(start=start, lo=np.full(start.size, 0.01), hi=np.full(start.size, 0.04), samples=4_000_000)
    design = dataclasses.replace(result.design, duty=dataclasses.replace(duty, signal=None, envelope=trace))
    long = dataclasses.replace(result, design=design)
    cycles, note = cycle_table(long)
    text = report_html(long, cycles, note, location_table(long))
    assert "4000000 samples; min/max of 1954 bins" in text  # 4e6 / 2048 rounded up
    assert len(text) < 3_000_000


def test_log_axis_labels_are_plain_powers_of_ten():
    """Log-axis ticks are labelled 10⁻³ … as plain text; off-decade, zero, negative and infinite values get
    no label (an infinite count per block once crashed the report: found by the fuzz test)."""
    import math

    from flexcycle.report.style import power_of_ten

    assert [power_of_ten(v) for v in (1e-3, 1.0, 10.0, 1e12)] == ["10⁻³", "10⁰", "10¹", "10¹²"]
    assert [power_of_ten(v) for v in (2e-3, 0.0, -10.0, math.inf, math.nan)] == ["", "", "", "", ""]
