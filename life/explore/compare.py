"""Side-by-side comparison of candidate designs: one row per design, and an HTML page with the table,
bar charts, and the designs' force–deflection lines and strain envelopes overlaid.

Each design keeps its own duty, or every design is run with one common duty read from a file whose
``[duty]`` table has the keys of a design file's ``[duty]`` (``with_common_duty``).
"""
from __future__ import annotations

import html
import tomllib
from collections.abc import Sequence
from dataclasses import dataclass
from pathlib import Path

import matplotlib
import numpy as np
import pandas as pd

from flexcycle.design import BUNDLED_PREFIX, Design, parse_design, read_document
from flexcycle.display import SI, Display, format_number, from_where
from flexcycle.errors import InputError
from flexcycle.estimate import CAUTION, LifeResult
from flexcycle.report.data import force_deflection, span_envelope
from flexcycle.report.style import PALETTE, STYLE, arrange, figure_with_axes, to_svg
from flexcycle.requirement import verdict_of

OWN_DUTY = "each design with its own duty"


def duty_note(duty_file: Path | None) -> str:
    """How the designs were loaded: the words the page and the terminal print."""
    return OWN_DUTY if duty_file is None else f"common duty from {Path(duty_file).name}"


def with_common_duty(design_file: Path, duty_file: Path) -> Design:
    """The design of ``design_file`` with its [duty] replaced by the [duty] table of ``duty_file``.

    The profile path of the common duty is relative to ``duty_file``; errors in the duty name ``duty_file``.
    """
    design_file, duty_file = Path(design_file), Path(duty_file)
    design_doc = read_document(design_file)
    if not duty_file.is_file():
        raise InputError(f"duty_file {duty_file}: no such file", parameter="duty_file")
    try:
        doc = tomllib.loads(duty_file.read_text(encoding="utf-8"))
    except (tomllib.TOMLDecodeError, UnicodeDecodeError) as exc:
        raise InputError(f"duty_file {duty_file.name}: not a valid UTF-8 TOML file ({exc})",
                         parameter="duty_file") from None
    extra = sorted(set(doc) - {"duty"})
    if "duty" not in doc or not isinstance(doc["duty"], dict) or extra:
        raise InputError(f"duty_file {duty_file.name}: must hold one [duty] table (the keys of a design file's "
                         f"[duty]) and nothing else" + (f"; found {', '.join(extra)}" if extra else ""),
                         parameter="duty_file")
    duty = dict(doc["duty"])
    profile = duty.get("profile")
    if isinstance(profile, str) and not profile.startswith(BUNDLED_PREFIX):
        duty["profile"] = str((duty_file.parent / profile).resolve())
    design_doc["duty"] = duty  # the design's own duty is not used, so neither read nor counted
    return parse_design(design_doc, design_file.name, design_file.parent, design_file, duty_name=duty_file.name)

COLUMNS = [
    "title", "file", "life_blocks", "life_cycles", "life_days", "mass_kg", "stiffness_n_per_m", "peak_energy_j",
    "cycle_energy_j", "specific_energy_j_per_kg", "energy_efficiency", "peak_strain", "static_reserve",
    "critical_mode", "critical_ply", "critical_x_m", "warnings",
    "required_life_blocks", "meets_requirement", "life_margin",
]


def comparison_table(results: Sequence[LifeResult]) -> pd.DataFrame:
    """One row per design with the figures a reviewer compares (docs/design.md, comparison.csv contract), SI."""
    rows = []
    for r in results:
        s = r.summary()
        verdict = verdict_of(r)
        rows.append({
            "title": s["title"],
            "file": r.design.path.name if r.design.path else "",
            "life_blocks": s["life_blocks"],
            "life_cycles": s["life_cycles"],
            "life_days": s["life_days"],
            "mass_kg": s["mass_kg"],
            "stiffness_n_per_m": s["stiffness_n_per_m"],
            "peak_energy_j": s["peak_energy_j"],
            "cycle_energy_j": s["cycle_energy_j"],
            "specific_energy_j_per_kg": s["specific_energy_j_per_kg"],
            "energy_efficiency": s["energy_efficiency"],
            "peak_strain": s["peak_strain"],
            "static_reserve": s["static_reserve"],
            "critical_mode": s["critical"]["mode"],
            "critical_ply": s["critical"]["ply"],
            "critical_x_m": s["critical"]["x_m"],
            "warnings": len(s["warnings"]),
            "required_life_blocks": None if verdict is None else verdict.required_life_blocks,
            "meets_requirement": None if verdict is None else verdict.meets_requirement,
            "life_margin": None if verdict is None else verdict.life_margin,
        })
    return pd.DataFrame(rows, columns=COLUMNS)


def same_duty(results: Sequence[LifeResult]) -> bool:
    """True when every design carries the same duty (drive, counted cycles and blocks per day): only then is a
    life in blocks of one design a life in blocks of another."""
    first = results[0].design.duty
    for r in results[1:]:
        duty = r.design.duty
        if (duty.drive != first.drive or duty.blocks_per_day != first.blocks_per_day
                or duty.cycles.lo.shape != first.cycles.lo.shape
                or not (np.array_equal(duty.cycles.lo, first.cycles.lo) and np.array_equal(duty.cycles.hi, first.cycles.hi)
                        and np.array_equal(duty.cycles.count, first.cycles.count))):
            return False
    return True


@dataclass(frozen=True)
class Ranking:
    """The order the designs are shown in, and why.

    order : list[int] — 0-based design indices, first shown first
    ranked : bool — True when ordered by life (a common duty), False when in the order given
    note : str — the sentence that says so
    """

    order: list[int]
    ranked: bool
    note: str


def ranking(table: pd.DataFrame, results: Sequence[LifeResult]) -> Ranking:
    """Rank by life in blocks (longest first, unbounded first, zero last) only when every design carries the
    same duty; otherwise keep the order given and say why."""
    if same_duty(results):
        key = table["life_blocks"].astype(float).fillna(np.inf)
        order = [int(i) for i in key.sort_values(ascending=False, kind="stable").index]
        return Ranking(order, True, "Ranked by life in blocks of the common duty, longest first.")
    return Ranking(list(range(len(results))), False,
                   "Not ranked: the designs carry different duties, and a block of one duty is not a block of "
                   "another, so their lives in blocks do not compare. Shown in the order given; run with "
                   "--duty FILE to compare them under one duty.")


def ranked(table: pd.DataFrame) -> pd.DataFrame:
    """The rows ordered by life in blocks, longest first: unbounded lives first, zero lives last."""
    key = table["life_blocks"].astype(float).fillna(np.inf)
    return table.assign(_key=key).sort_values("_key", ascending=False, kind="stable").drop(columns="_key")


def _life(value) -> str:
    if value is None or (isinstance(value, float) and value != value):
        return "unbounded"
    return format_number(float(value), 3)


def _verdict(row) -> str:
    if row.required_life_blocks is None or row.required_life_blocks != row.required_life_blocks:
        return "–"
    met = "met" if row.meets_requirement else "NOT met"
    margin = "" if row.life_margin is None or row.life_margin != row.life_margin else \
        f", margin {format_number(float(row.life_margin), 3)}"
    return f"{format_number(float(row.required_life_blocks), 3)}: {met}{margin}"


def display_rows(table: pd.DataFrame, results: Sequence[LifeResult], display: Display = SI) -> dict[str, tuple]:
    """The comparison as two tables of display strings (header, rows), in the order of ``ranking``: "life"
    (life, verdict, reserve, critical place, warnings) and "figures" (mass, stiffness, energy, strain)."""
    rank = ranking(table, results)
    rows = table.astype(object).where(table.notna(), None)
    with_requirement = rows["required_life_blocks"].notna().any()
    life_head = ["design", "title", "life [blocks]", "life [cycles]", "life [days]"]
    life_head += ["required [blocks]: verdict"] if with_requirement else []
    life_head += ["static reserve", "critical", display.header("x", "position"), "x from", "warnings"]
    figure_head = ["design", "title", display.header("mass", "mass"), display.header("stiffness", "stiffness"),
                   display.header("peak energy", "energy"), display.header("cycle energy", "energy"),
                   display.header("specific energy", "specific_energy"), "efficiency", "peak strain [%]"]
    life, figures = [], []
    for i in rank.order:
        row, r = rows.iloc[i], results[i]
        number = f"{rank.order.index(i) + 1}. #{i + 1}" if rank.ranked else f"#{i + 1}"
        cells = [number, row.title, _life(row.life_blocks), _life(row.life_cycles),
                 "–" if row.life_days is None and not r.design.duty.blocks_per_day else _life(row.life_days)]
        cells += [_verdict(row)] if with_requirement else []
        cells += ["–" if row.static_reserve is None else format_number(float(row.static_reserve), 3),
                  f"{row.critical_mode}, ply {row.critical_ply}",
                  display.pair(row.critical_x_m, "position"),
                  from_where(r.design.beam.support).removeprefix("from ").removeprefix("the "),
                  str(row.warnings)]
        life.append(tuple(cells))
        figures.append((number, row.title, display.pair(row.mass_kg, "mass"), display.pair(row.stiffness_n_per_m, "stiffness"),
                        display.pair(row.peak_energy_j, "energy"), display.pair(row.cycle_energy_j, "energy"),
                        display.pair(row.specific_energy_j_per_kg, "specific_energy"),
                        format_number(float(row.energy_efficiency), 3), format_number(float(row.peak_strain) * 100, 3)))
    return {"life": (life_head, life), "figures": (figure_head, figures), "note": rank.note}


def _labels(results: Sequence[LifeResult]) -> list[str]:
    return [f"#{i}: {r.design.title[:28]}" for i, r in enumerate(results, start=1)]


def bar_figure(table: pd.DataFrame, results: Sequence[LifeResult], display: Display = SI) -> str:
    """Life (log scale), specific energy, mass and stiffness of each design, in the order of the table
    (``ranking``) and in the table's units."""
    order = ranking(table, results).order
    labels = [f"#{i + 1}" for i in order]
    picked = table.iloc[order]
    life = picked["life_blocks"].astype(float).to_numpy()
    with matplotlib.rc_context(STYLE):
        fig, axes = figure_with_axes((9.5, 3.0), 1, 4)
        shown = np.where(np.isnan(life), np.nan, np.maximum(life, 1e-3))
        axes[0].bar(labels, np.nan_to_num(shown, nan=0.0), color=PALETTE[0])
        axes[0].set_yscale("log")
        for i, v in enumerate(life):
            if np.isnan(v):
                axes[0].annotate("unbounded", (i, 1), rotation=90, ha="center", va="bottom", fontsize=7, xycoords=("data", "axes fraction"))
        axes[0].set_title("life [blocks]")
        bars = [("specific energy", "specific_energy", "specific_energy_j_per_kg", PALETTE[3]),
                ("mass", "mass", "mass_kg", PALETTE[2]), ("stiffness", "stiffness", "stiffness_n_per_m", PALETTE[1])]
        for ax, (label, kind, column, colour) in zip(axes[1:], bars):
            ax.bar(labels, picked[column].astype(float) * display.scale(kind), color=colour)
            ax.set_title(f"{label} [{display.unit(kind)}]")
        for ax in axes:
            ax.set_xlabel("design")
            ax.grid(axis="x", visible=False)
        return to_svg(arrange(fig, wspace=0.45), "bars")


def overlay_figure(results: Sequence[LifeResult], display: Display = SI) -> str:
    """Force–deflection lines over each duty and the largest |ε1| at the outer faces along the span."""
    length, force = display.scale("deflection"), display.scale("force")
    with matplotlib.rc_context(STYLE):
        fig, (a1, a2) = figure_with_axes((9.5, 3.6), 1, 2)
        for i, (r, label) in enumerate(zip(results, _labels(results))):
            colour = PALETTE[i % len(PALETTE)]
            fd = force_deflection(r)
            a1.plot(fd.deflection * length, fd.force * force, color=colour, label=label)
            env = span_envelope(r)
            peak = np.maximum(np.abs(env.bottom).max(axis=1), np.abs(env.top).max(axis=1))
            a2.plot(env.x * length, peak * 100, color=colour, label=label)
        a1.set_xlabel(f"load-point deflection δ [{display.unit('deflection')}]")
        a1.set_ylabel(f"load-point force F [{display.unit('force')}]")
        a1.set_title("force–deflection over each duty")
        supports = {r.design.beam.support for r in results}
        where = from_where(supports.pop()) if len(supports) == 1 else "from the root or mid-span"
        a2.set_xlabel(f"distance {where} x [{display.unit('position')}]")
        a2.set_ylabel("largest |ε1| at the faces [%]")
        a2.set_title("fibre-strain envelope along the span")
        a1.legend(loc="best", framealpha=0.85)
        return to_svg(arrange(fig, wspace=0.3), "overlay")


def _table_html(header: Sequence[str], rows: Sequence[Sequence[str]]) -> str:
    head = "".join(f"<th>{html.escape(h)}</th>" for h in header)
    body = "".join("<tr>" + "".join(f"<td>{html.escape(str(c))}</td>" for c in row) + "</tr>" for row in rows)
    return f"<table><tr>{head}</tr>{body}</table>"


def comparison_html(table: pd.DataFrame, results: Sequence[LifeResult], duty: str = OWN_DUTY,
                    display: Display = SI) -> str:
    """A self-contained page: the designs in two tables (life and strength; stiffness, mass and energy),
    ranked by life only under a common duty, bar charts in the same order and units, overlaid curves, each
    design's warnings, and the caution. ``duty`` says whether each design kept its own duty or one common
    duty was used."""
    shown = display_rows(table, results, display)
    notes = "".join(
        f"<h3>#{i}: {html.escape(r.design.title)}</h3><ul>"
        + ("".join(f"<li>{html.escape(display.text(w))}</li>" for w in r.warnings) or "<li>no warnings</li>") + "</ul>"
        for i, r in enumerate(results, start=1)
    )
    units = ("Inch-pound units, with SI in parentheses" if display.us else "SI units") + \
        "; comparison.csv holds every figure in SI."
    return f"""<!DOCTYPE html>
<html lang="en"><head><meta charset="utf-8"><title>flexcycle comparison</title>
<style>body {{ font-family: system-ui, sans-serif; margin: 2em; color: #222; max-width: 70em }}
table {{ border-collapse: collapse; font-size: 0.85em; margin-bottom: 1em }} td, th {{ border: 1px solid #ddd; padding: 3px 6px }}
th {{ background: #f1eee6; vertical-align: bottom }} td {{ overflow-wrap: anywhere }}
figure {{ margin: 1em 0; break-inside: avoid }} svg {{ max-width: 100%; height: auto }}
.duty {{ font-weight: bold; color: #0b6e6e }}
@media print {{ table {{ font-size: 0.7em }} }}
.caution {{ background: #fff4e0; border-left: 5px solid #d98b00; padding: 0.6em 1em; max-width: 60em }}</style>
</head><body><h1>Candidate designs side by side</h1>
<div class="caution"><b>Caution.</b> {html.escape(CAUTION)}</div>
<p class="duty">Duty: {html.escape(duty)}.</p>
<p>{html.escape(shown["note"])} {html.escape(units)} Designs are numbered #1, #2, … in the order given.</p>
<h2>Life and strength</h2>
{_table_html(*shown["life"])}
<h2>Stiffness, mass and energy</h2>
{_table_html(*shown["figures"])}
<figure>{bar_figure(table, results, display)}<figcaption>Life on a log scale, specific energy, mass and stiffness, in the
order and the units of the tables.</figcaption></figure>
<figure>{overlay_figure(results, display)}<figcaption>Force against load-point deflection over each design's duty, and the
largest fibre strain at the outer faces along the span over that duty.</figcaption></figure>
<h2>Warnings</h2>{notes}
</body></html>
"""
