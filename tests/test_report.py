"""The design-review report, life/report.py (DESIGN.md, outputs contract: report.html, one self-contained file).

Two designs: the bundled example (a deflection time history, 16 plies) and a small block-table
cantilever of one homogeneous 0° user material whose critical place is known by hand (below), driven
past 10 % of its span and wide enough to warn about the section model, so the report has warnings to show.
"""
from __future__ import annotations

import html
import re
from pathlib import Path

import pytest

from life.cli import example_design
from life.design import load_design, parse_design
from life.estimate import CAUTION, estimate
from life.outputs import cycle_table, location_table
from life.report import report_html

TITLE = "Test spring <A> & 'B'"  # markup characters: the report must escape them

# invented test material (DESIGN.md's "my-glass"); no S13, so the interlaminar check is skipped with a note
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
    fibre-compression (REFERENCES.md, linear Goodman with unequal strengths).
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
    """Nothing is fetched: no src/href/url other than a fragment inside the page, no <link>, no <script>,
    no @import (matplotlib's inline SVG refers to its own glyphs and clip paths by '#id' only)."""
    _, page = case
    assert page.startswith("<!DOCTYPE html>") and page.rstrip().endswith("</html>")
    refs = re.findall(r"""(?:src|href)\s*=\s*["']([^"']*)["']""", page, re.IGNORECASE)
    assert all(ref.startswith("#") for ref in refs), [r for r in refs if not r.startswith("#")]
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
    assert "fibre-compression, ply 4 (report-glass, 0°), top face, x = 0.0 mm" in page


def test_an_inline_svg_per_figure(case):
    """Three figures (duty, along the span, through the thickness), each an inline <svg> element."""
    _, page = case
    assert page.count("<svg") == 3 and page.count("</svg>") == 3
    assert "<?xml" not in page  # the SVG's XML prologue is cut: it is not allowed inside HTML


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


def test_duty_figure_of_a_long_history_draws_its_envelope():
    """A duty kept only as its min/max envelope (signal None, as for a long streamed history) is drawn as
    the envelope, said in the figure title; the report stays small (no point-by-point plot)."""
    import dataclasses

    import numpy as np

    from spectra.streaming import Envelope

    result = estimate(load_design(example_design()))
    duty = result.design.duty
    start = np.arange(0, 4_000_000, 2048)
    trace = Envelope(start=start, lo=np.full(start.size, 0.01), hi=np.full(start.size, 0.04), samples=4_000_000)
    design = dataclasses.replace(result.design, duty=dataclasses.replace(duty, signal=None, trace=trace))
    long = dataclasses.replace(result, design=design)
    cycles, note = cycle_table(long)
    text = report_html(long, cycles, note, location_table(long))
    assert "4000000 samples: min and max of every 2048" in text
    assert len(text) < 3_000_000
