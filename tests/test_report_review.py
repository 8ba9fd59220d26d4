"""What a design review found wrong in the report, each with its check: units on every figure (SI and
inch-pound), the verdict, places measured from mid-span, the layup figure, the fatigue-curve duty line,
legends beside the curves, and the transverse shear of a sandwich core in the through-thickness figure.

Designs are invented test parts; the inch-pound factors are exact definitions (1 in = 25.4 mm,
1 lbf = 4.4482216152605 N).
"""
from __future__ import annotations

from pathlib import Path

import numpy as np
import pytest
from matplotlib.backends.backend_agg import FigureCanvasAgg
from matplotlib.collections import LineCollection
from matplotlib.patches import Rectangle

from flexcycle.design import parse_design
from flexcycle.display import Display
from flexcycle.estimate import estimate
from flexcycle.outputs import cycle_table, location_table
from flexcycle.report.figures import (
    figure_damage,
    figure_fatigue_curve,
    figure_layup,
    figure_strain_envelope,
    figure_through_thickness,
    layup_exaggeration,
)
from flexcycle.report.page import report_html
from flexcycle.report.style import PALETTE

GLASS = {
    "E1": "40 GPa", "E2": "10 GPa", "G12": "4 GPa", "nu12": 0.28, "density": "1900 kg/m^3",
    "Xt": "1000 MPa", "Xc": "600 MPa", "Yt": "40 MPa", "Yc": "140 MPa", "S12": "70 MPa",
    "fatigue": {"form": "power", "R": -1, "S1": "800 MPa", "m": 10},
}


def design(support="cantilever", span="200 mm", max_drive="5 mm", plies=None, fatigue=None, width="20 mm", **beam):
    doc = {
        "title": "review part",
        "beam": {"support": support, "span": span, "width": width, "stations": 8, **beam},
        "material": {"review-glass": GLASS},
        "ply": plies or [{"material": "review-glass", "angle": 0, "thickness": "0.5 mm", "count": 4}],
        "duty": {"drive": "deflection", "cycles": [{"min": "0 mm", "max": max_drive, "count": 1000}],
                 "blocks_per_day": 1},
    }
    if fatigue:
        doc["fatigue"] = fatigue
    return parse_design(doc, "part.toml", Path("."), Path("part.toml"))


def report(d, display=Display("si")):
    result = estimate(d)
    cycles, note = cycle_table(result)
    return result, report_html(result, cycles, note, location_table(result), display=display)


def test_report_in_inch_pound_with_si_beside():
    """span 200 mm = 7.874 in; width 20 mm = 0.7874 in; E1 40 GPa = 5.802 Msi (1 Msi = 6.894757 GPa)."""
    _, page = report(design(), Display("us"))
    assert "7.874 in (200 mm)" in page
    assert "5.802 Msi (40 GPa)" in page
    assert "lbf/in (" in page and "in·lbf (" in page
    assert "Inch-pound units, with SI in parentheses" in page


def test_verdict_first_in_the_report():
    _, page = report(design(fatigue={"required_life": "5 years"}))
    verdict = page.index('class="verdict')
    assert verdict < page.index('class="glance"')
    assert "required life of 5 years (1826 blocks)" in page  # 5 × 365.25 days × 1 block per day


def test_three_point_positions_from_mid_span_and_one_block_per_day():
    _, page = report(design(support="three-point"))
    assert "from mid-span" in page
    assert "from the root" not in page
    assert "at 1 block per day" in page and "1 blocks per day" not in page


def test_static_failure_warning_gives_the_extreme_with_its_unit():
    """A 50 mm span deflected 15 mm: root strain 3δh/(2L²) = 3·15·2/(2·50²) = 1.8 %, σ = 720 MPa > Xc = 600 MPa
    (Roark 7th ed., Table 8.1 case 1a): broken at the first load; the warning reads "15 mm", not "0.015 (SI)"."""
    result, page = report(design(span="50 mm", max_drive="15 mm"))
    warning = next(w for w in result.warnings if w.startswith("static strength exceeded"))
    assert "at the duty extreme 15 mm" in warning and "(SI)" not in warning
    assert "(SI)" not in page


def test_most_damaged_locations_in_mpa_with_the_unit_in_the_header():
    """The curve is on a stress basis: amplitudes in MPa with [MPa] in the header, never raw pascals."""
    result, page = report(design())
    table = page[page.index("Most damaged locations"):page.index("</section>", page.index("Most damaged locations"))]
    assert "amplitude [MPa]" in table and "mean [MPa]" in table
    assert "e+0" not in table.split("damage/block")[1].split("<td>")[6]  # the first row's amplitude is plain
    locations = location_table(result)
    top = locations.sort_values("damage_per_block", ascending=False).iloc[0]
    assert f"<td>{top.amplitude / 1e6:.4g}</td>" in table


def test_layup_scale_statement_and_no_void_at_a_drop():
    """A 200 mm spring 2 mm thick is drawn with its thickness stretched; a 12 mm coupon 6 mm thick fits the
    axes near to scale. After a drop the plies above close over it: the stack is as high as the plies that
    remain (1.5 mm), with no gap."""
    spring = estimate(design())
    assert layup_exaggeration(spring) > 10
    coupon = estimate(design(span="12 mm", plies=[{"material": "review-glass", "angle": 0, "thickness": "1 mm",
                                                   "count": 6}], max_drive="0.001 mm"))
    assert layup_exaggeration(coupon) < 1.5
    assert "drawn to scale" in figure_layup(coupon).axes[0].get_title("left")
    dropped = estimate(design(plies=[
        {"material": "review-glass", "angle": 0, "thickness": "0.5 mm", "count": 2},
        {"material": "review-glass", "angle": 0, "thickness": "0.5 mm", "ends_at": "100 mm"},
        {"material": "review-glass", "angle": 0, "thickness": "0.5 mm"},
    ]))
    fig = figure_layup(dropped)
    patches = [p for p in fig.axes[0].patches if isinstance(p, Rectangle) and p.get_width() > 0]
    beyond = [p for p in patches if p.get_x() >= 100 - 1e-9]
    assert len(beyond) == 3
    tops = sorted(p.get_y() + p.get_height() for p in beyond)
    assert tops == pytest.approx([0.5, 1.0, 1.5], rel=1e-9)  # contiguous from the tension face


def test_constant_amplitude_duty_line_is_drawn():
    """One counted cycle level: the duty's line in the fatigue-curve figure spans from N = 0.5 to its count."""
    result = estimate(design())
    cycles, _ = cycle_table(result)
    fig = figure_fatigue_curve(result, cycles)
    duty = [line for line in fig.axes[0].get_lines() if line.get_label().startswith("duty")]
    assert len(duty) == 1
    x = duty[0].get_xdata()
    assert len(x) >= 2 and min(x) == 0.5 and max(x) == pytest.approx(1000.0)


@pytest.mark.parametrize("maker", ["strain", "fatigue", "damage"])
def test_legends_stay_off_the_axes(maker):
    """Legends sit beside the axes: their drawn boxes do not overlap the plotting area."""
    result = estimate(design())
    cycles, _ = cycle_table(result)
    fig = {"strain": lambda: figure_strain_envelope(result),
           "fatigue": lambda: figure_fatigue_curve(result, cycles),
           "damage": lambda: figure_damage(result, cycles, location_table(result))}[maker]()
    renderer = FigureCanvasAgg(fig).get_renderer()
    ax = fig.axes[0]
    legend = ax.get_legend()
    assert legend is not None
    box, area = legend.get_window_extent(renderer), ax.get_window_extent(renderer)
    assert box.x0 >= area.x1 - 1  # one pixel of anti-aliasing


def test_sandwich_core_shear_drawn_through_the_thickness():
    """Glass skins on a foam core: τxz is drawn through the thickness, its peak the core's shear there.
    Force per unit drive × τxz per unit force at the critical station, as the response map gives it."""
    skins = {"material": "review-glass", "angle": 0, "thickness": "0.5 mm"}
    core = {"material": "structural-foam", "angle": 0, "thickness": "10 mm"}
    result = estimate(design(plies=[skins, core, skins], max_drive="2 mm", width="40 mm"))
    fig = figure_through_thickness(result)
    dashed = [c for c in fig.axes[1].collections if isinstance(c, LineCollection)
              and np.allclose(c.get_colors()[0][:3], np.array([int(PALETTE[5][i:i + 2], 16) for i in (1, 3, 5)]) / 255)]
    assert len(dashed) == 1
    drawn = max(np.abs(seg[:, 0]).max() for seg in dashed[0].get_segments())
    k = result.critical.station
    lo, hi = result.design.duty.extremes
    peak = (hi if abs(hi) >= abs(lo) else lo) * result.force_per_drive
    expected = np.abs(result.response.tau_xz_peak[k]).max() * abs(peak) / 1e6
    assert drawn == pytest.approx(expected, rel=1e-12)  # the same numbers, drawn
