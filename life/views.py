"""What a LifeResult shows a Python caller: its tables as DataFrames, its figures as matplotlib Figures, and
its display in a notebook (``_repr_html_``), each computed when first asked for.

The tables are the run's files (``flexcycle.outputs``: stations.csv, locations.csv, cycles.csv) before they are
written; the figures are the report's (``flexcycle.report.figures.FIGURE_MAKERS``) before the report turns
them into SVG. `ResultViews` is mixed into ``flexcycle.estimate.LifeResult``; the modules it draws on sit above
the estimate and are imported inside the methods, so that the estimate imports neither pandas nor matplotlib.
"""
from __future__ import annotations

import html
from functools import cached_property
from typing import TYPE_CHECKING

from flexcycle.caution import CAUTION

if TYPE_CHECKING:
    import pandas as pd
    from matplotlib.figure import Figure

    from flexcycle.display import Display
    from flexcycle.estimate import LifeResult


class ResultViews:
    """Tables, figures and the notebook display of a LifeResult (mixed into it; cached on the instance)."""

    @cached_property
    def station_table(self) -> pd.DataFrame:
        """The beam along the span, one row per station: the content of stations.csv (SI)."""
        from flexcycle.outputs import station_table

        return station_table(self)

    @cached_property
    def location_table(self) -> pd.DataFrame:
        """Damage per block at every location (station, ply, face, mode): the content of locations.csv (SI)."""
        from flexcycle.outputs import location_table

        return location_table(self)

    @cached_property
    def _cycles_and_note(self) -> tuple[pd.DataFrame, str]:
        from flexcycle.outputs import cycle_table

        return cycle_table(self)

    @property
    def cycle_table(self) -> pd.DataFrame:
        """The counted drive cycles (min, max, count, energy_j; SI): the content of cycles.csv."""
        return self._cycles_and_note[0]

    @property
    def cycle_note(self) -> str:
        """How the cycle table holds the cycles (each distinct cycle, or binned at scale), as the report says."""
        return self._cycles_and_note[1]

    def figure(self, name: str) -> Figure:
        """The report's figure ``name`` (one of ``flexcycle.FIGURES``) as a new matplotlib Figure."""
        from flexcycle.errors import InputError, did_you_mean
        from flexcycle.report.figures import FIGURE_MAKERS

        if name not in FIGURE_MAKERS:
            raise InputError(f"name {name!r}: no such figure; {did_you_mean(name, FIGURE_MAKERS)}"
                             f"the figures are {', '.join(FIGURE_MAKERS)}", parameter="name")
        return FIGURE_MAKERS[name](self, self.cycle_table, self.location_table)

    def figures(self) -> dict[str, Figure]:
        """Every figure the report draws for this result, by name, in the report's order (new matplotlib
        Figures); a figure made for some duties only (``FIGURE_APPLIES``, e.g. the spectrum) when it applies."""
        from flexcycle.report.figures import FIGURE_APPLIES, FIGURES

        return {name: self.figure(name) for name in FIGURES
                if name not in FIGURE_APPLIES or FIGURE_APPLIES[name](self)}

    def _repr_html_(self) -> str:
        """The headline table for a notebook: title, the headline figures, the warnings' count, the caution."""
        rows = "".join(f"<tr><th style='text-align:left'>{html.escape(quantity)}</th>"
                       f"<td style='text-align:left'>{html.escape(value)}</td></tr>"
                       for quantity, value in headline_rows(self))
        warnings = len(self.warnings)
        said = "no warnings" if not warnings else f"{warnings} warning{'s' if warnings != 1 else ''} (result.warnings)"
        return (f"<div><strong>{html.escape(self.design.title)}</strong>"
                f"<table>{rows}<tr><th style='text-align:left'>warnings</th><td style='text-align:left'>"
                f"{said}</td></tr></table>"
                f"<p><em>caution: {html.escape(CAUTION)}</em></p></div>")


def life_text(value: float | None, unit: str) -> str:
    """A life in ``unit``: "unbounded …" for None (no damaging cycle), "0 … (fails at first loading)" for zero."""
    if value is None:
        return "unbounded (no damaging cycle)"
    if value == 0:
        return f"0 {unit} (fails at first loading)"
    return f"{value:.3g} {unit}"


def headline_rows(result: LifeResult, display: Display | None = None) -> list[tuple[str, str]]:
    """The run's headline figures as (quantity, value with its unit) rows, the same in the terminal and in a
    notebook: the verdict against a required life, life, damage, rule, critical mode, ply and place, theory,
    stiffness (and the secant one under large deflection), peak drive (with the end's rotation and pull-in under
    large deflection), mass, strain, energies, static reserve.

    display : the units shown (inch-pound with SI beside, or SI); None: SI
    """
    from flexcycle.display import SI, format_number, from_where, per_day
    from flexcycle.requirement import verdict_of

    display = display or SI
    design, critical, summary = result.design, result.critical, result.summary()
    ply = design.beam.plies[critical.ply - 1]
    where = from_where(design.beam.support)
    rows = []
    verdict = verdict_of(result)
    if verdict is not None:
        rows.append(("required life", f"{format_number(verdict.required_life_blocks)} blocks"
                     + (f" ({design.required_life_text})" if design.required_life_text else "")
                     + (", met" if verdict.meets_requirement else ", NOT met")
                     + ("" if verdict.life_margin is None else f", margin {format_number(verdict.life_margin, 3)}")))
    rows.append(("life, cycles", life_text(result.life_cycles, "cycles")))
    rows.append(("life, blocks", life_text(result.life_blocks, "blocks of the duty")
                 + (f" at survival {design.survival:g}" if design.survival != 0.5 else "")))
    if design.survival != 0.5:
        rows.append(("life, median", life_text(result.life_blocks_median, "blocks of the duty") + " at survival 0.5"))
    if design.duty.blocks_per_day:
        rows.append(("life, days", life_text(result.life_days, "days") + f" at {per_day(design.duty.blocks_per_day)}"))
    reserve = "not checked" if summary["static_reserve"] is None else f"{summary['static_reserve']:.3g}"
    rows += [
        ("damage", f"{result.damage_per_block:.3g} per block (Miner limit {design.miner_limit:g})"),
        ("rule", f"mean stress {design.mean_stress}, stress factor {design.stress_factor:g}"),
        *[("design values", f"{name}: strengths × {f.strength:.4g}, fatigue × {f.fatigue_strength:.4g}, "
                            f"stiffness × {f.stiffness:.4g}") for name, f in design.factors.items() if not f.neutral],
        ("critical mode", critical.mode),
        ("critical ply", f"ply {critical.ply} ({ply.material.name}, {ply.angle:g}°), {critical.face} face"),
        ("critical place", f"x = {display.both(critical.x_m, 'position')} {where}, "
                           f"z = {display.both(critical.z_m, 'position', signed=True)}"),
        ("theory", "large deflection (the elastica)" if summary["theory"] == "large-deflection"
         else "linear, small deflection"),
        ("stiffness", f"{display.both(summary['stiffness_n_per_m'], 'stiffness')} at the load point"
         + ("" if summary["theory"] == "linear" else
            f" (small loads); secant {display.both(summary['secant_stiffness_n_per_m'], 'stiffness')} "
            "at the peak drive")),
        ("peak drive", f"{display.both(summary['peak_force_n'], 'force')}, "
                       f"{display.both(summary['peak_deflection_m'], 'deflection')} at the load point"
         + ("" if summary["tip_rotation_deg"] is None else
            f"; end turned {summary['tip_rotation_deg']:.3g}°, "
            f"pulled in {display.both(summary['pull_in_m'], 'deflection')}")),
        ("mass", display.both(summary["mass_kg"], "mass")),
        ("peak strain", f"{summary['peak_strain'] * 100:.3g} % along the fibres"),
        ("peak energy", f"{display.both(summary['peak_energy_j'], 'energy')} at peak drive"),
        ("cycle energy", f"{display.both(summary['cycle_energy_j'], 'energy')} in the largest cycle"),
        ("specific energy", f"{display.both(summary['specific_energy_j_per_kg'], 'specific_energy')}, "
                            f"storage efficiency {summary['energy_efficiency']:.3f}"),
        ("static reserve", f"{reserve} ({result.static.criterion}) at x = "
                           f"{display.both(result.static.x_m, 'position')} {where}, ply {result.static.ply}"),
    ]
    if summary.get("first_mode_hz") is not None:
        rows.insert(-1, ("first frequency", f"{summary['first_mode_hz']:.4g} Hz, first bending mode of the part alone"))
    return rows
