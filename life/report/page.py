"""The design-review report: one self-contained HTML file (docs/design.md, outputs contract: report.html).

Read top to bottom, the report is: identification, inputs, method and assumptions, results (and, when a
sizing run gives them, the sizing rows), warnings, cautions, review and sign-off (``flexcycle.report.sections``).
Its figures (``flexcycle.report.figures``) are inline SVG (text kept as text; dense artists rasterized into
the SVG); nothing is fetched from outside the file.
"""
from __future__ import annotations

from collections.abc import Mapping, Sequence
from datetime import UTC, datetime

import pandas as pd

from flexcycle.display import SI, Display
from flexcycle.estimate import LifeResult
from flexcycle.report.figures import FIGURE_APPLIES, FIGURE_MAKERS, FIGURES
from flexcycle.report.sections import (
    escape_html,
    section_cautions,
    section_identification,
    section_inputs,
    section_method,
    section_results,
    section_signoff,
    section_sizing,
    section_warnings,
    tool_version,
)
from flexcycle.report.style import to_svg
from flexcycle.report.texts import CSS


def figure_svgs(result: LifeResult, cycles: pd.DataFrame, locations: pd.DataFrame,
                names: Sequence[str] = FIGURES, display: Display = SI) -> dict[str, str]:
    """The report's figures ``names`` (of FIGURES) as inline SVG, by name; cycles and locations as for report_html.
    A figure of FIGURE_APPLIES is drawn only for the duties it applies to."""
    return {name: to_svg(FIGURE_MAKERS[name](result, cycles, locations, display), name) for name in names
            if FIGURE_APPLIES.get(name, lambda result: True)(result)}


def report_html(result: LifeResult, cycles: pd.DataFrame, cycle_note: str, locations: pd.DataFrame,
                sizing: Sequence[tuple[str, str, str]] | None = None, svg: Mapping[str, str] | None = None,
                display: Display = SI) -> str:
    """Render the design-review report.

    cycles : pd.DataFrame — the counted cycles as in cycles.csv (min, max, count, energy_j; SI)
    cycle_note : str — how cycles.csv holds them
    locations : pd.DataFrame — the locations table as in locations.csv
    sizing : optional rows (quantity, before, after), strings, shown right after the results
    svg : the figures already drawn (`figure_svgs`), by name; None draws them here
    display : the units every figure is shown in (inch-pound with SI beside, or SI); the files stay SI
    """
    if svg is None:
        svg = figure_svgs(result, cycles, locations, display=display)
    stamp = datetime.now(UTC).strftime("%Y-%m-%d %H:%M UTC")
    body = "\n".join([
        section_identification(result, stamp, display),
        section_inputs(result, cycles, cycle_note, svg, display),
        section_method(result, display),
        section_results(result, cycles, locations, svg, display),
        section_sizing(sizing),
        section_warnings(result, display),
        section_cautions(result),
        section_signoff(),
    ])
    return f"""<!DOCTYPE html>
<html lang="en"><head><meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>flexcycle design review — {escape_html(result.design.title)}</title>
<style>{CSS}</style></head><body>
{body}
<p class="sub">flexcycle {escape_html(tool_version())} · {stamp}</p>
</body></html>
"""
