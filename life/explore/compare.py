"""Side-by-side comparison of candidate designs: one row per design, and an HTML page with the table,
bar charts, and the designs' force–deflection lines and strain envelopes overlaid.

Each design keeps its own duty, or every design is run with one common duty read from a file whose
``[duty]`` table has the keys of a design file's ``[duty]`` (``with_common_duty``).
"""
from __future__ import annotations

import html
import tomllib
from collections.abc import Sequence
from pathlib import Path

import matplotlib
import numpy as np
import pandas as pd

from flexcycle.design import BUNDLED_PREFIX, Design, parse_design, read_document
from flexcycle.errors import InputError
from flexcycle.estimate import CAUTION, LifeResult
from flexcycle.report.data import force_deflection, span_envelope
from flexcycle.report.style import PALETTE, STYLE, arrange, figure_with_axes, to_svg

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
        raise InputError(f"--duty {duty_file}: no such file")
    try:
        doc = tomllib.loads(duty_file.read_text(encoding="utf-8"))
    except (tomllib.TOMLDecodeError, UnicodeDecodeError) as exc:
        raise InputError(f"--duty {duty_file.name}: not a valid UTF-8 TOML file ({exc})") from None
    extra = sorted(set(doc) - {"duty"})
    if "duty" not in doc or not isinstance(doc["duty"], dict) or extra:
        raise InputError(f"--duty {duty_file.name}: must hold one [duty] table (the keys of a design file's "
                         f"[duty]) and nothing else" + (f"; found {', '.join(extra)}" if extra else ""))
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
]


def comparison_table(results: Sequence[LifeResult]) -> pd.DataFrame:
    """One row per design with the figures a reviewer compares (DESIGN.md, comparison.csv contract)."""
    rows = []
    for r in results:
        s = r.summary()
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
        })
    return pd.DataFrame(rows, columns=COLUMNS)


def _cell(value) -> str:
    if value is None or (isinstance(value, float) and value != value):
        return "unbounded"
    if isinstance(value, float):
        return f"{value:.4g}"
    return html.escape(str(value))


def ranked(table: pd.DataFrame) -> pd.DataFrame:
    """The rows ordered by life in blocks, longest first: unbounded lives first, zero lives last."""
    key = table["life_blocks"].astype(float).fillna(np.inf)
    return table.assign(_key=key).sort_values("_key", ascending=False, kind="stable").drop(columns="_key")


def _labels(results: Sequence[LifeResult]) -> list[str]:
    return [f"{i}: {r.design.title[:28]}" for i, r in enumerate(results, start=1)]


def bar_figure(table: pd.DataFrame, results: Sequence[LifeResult]) -> str:
    """Life (log scale), specific energy, mass and stiffness of each design, in the order given."""
    labels = [str(i) for i in range(1, len(results) + 1)]
    life = table["life_blocks"].astype(float).to_numpy()
    with matplotlib.rc_context(STYLE):
        fig, axes = figure_with_axes((9.5, 3.0), 1, 4)
        shown = np.where(np.isnan(life), np.nan, np.maximum(life, 1e-3))
        axes[0].bar(labels, np.nan_to_num(shown, nan=0.0), color=PALETTE[0])
        axes[0].set_yscale("log")
        for i, v in enumerate(life):
            if np.isnan(v):
                axes[0].annotate("unbounded", (i, 1), rotation=90, ha="center", va="bottom", fontsize=7, xycoords=("data", "axes fraction"))
        axes[0].set_title("life [blocks]")
        axes[1].bar(labels, table["specific_energy_j_per_kg"], color=PALETTE[3])
        axes[1].set_title("specific energy [J/kg]")
        axes[2].bar(labels, table["mass_kg"] * 1e3, color=PALETTE[2])
        axes[2].set_title("mass [g]")
        axes[3].bar(labels, table["stiffness_n_per_m"] / 1e3, color=PALETTE[1])
        axes[3].set_title("stiffness [N/mm]")
        for ax in axes:
            ax.set_xlabel("design")
            ax.grid(axis="x", visible=False)
        return to_svg(arrange(fig, wspace=0.45), "bars")


def overlay_figure(results: Sequence[LifeResult]) -> str:
    """Force–deflection lines over each duty and the largest |ε1| at the outer faces along the span."""
    with matplotlib.rc_context(STYLE):
        fig, (a1, a2) = figure_with_axes((9.5, 3.6), 1, 2)
        for i, (r, label) in enumerate(zip(results, _labels(results))):
            colour = PALETTE[i % len(PALETTE)]
            fd = force_deflection(r)
            a1.plot(fd.deflection * 1e3, fd.force, color=colour, label=label)
            env = span_envelope(r)
            peak = np.maximum(np.abs(env.bottom).max(axis=1), np.abs(env.top).max(axis=1))
            a2.plot(env.x * 1e3, peak * 100, color=colour, label=label)
        a1.set_xlabel("load-point deflection δ [mm]")
        a1.set_ylabel("load-point force F [N]")
        a1.set_title("force–deflection over each duty")
        a2.set_xlabel("distance from the root x [mm]")
        a2.set_ylabel("largest |ε1| at the faces [%]")
        a2.set_title("fibre-strain envelope along the span")
        a1.legend(loc="upper left")
        return to_svg(arrange(fig, wspace=0.3), "overlay")


def comparison_html(table: pd.DataFrame, results: Sequence[LifeResult], duty: str = OWN_DUTY) -> str:
    """A self-contained page: the table ranked by life, bar charts, overlaid curves, each design's warnings,
    and the caution. ``duty`` says whether each design kept its own duty or one common duty was used."""
    order = ranked(table.assign(design=range(1, len(table) + 1)))
    order = order[["design"] + [c for c in table.columns]]
    # headers wrap at the spaces (the CSV keeps the underscored names); the wide table scrolls on a narrow screen
    head = "<th>rank</th>" + "".join(f"<th>{html.escape(c.replace('_', ' '))}</th>" for c in order.columns)
    body = "".join(
        f"<tr><td>{rank}</td>" + "".join(f"<td>{_cell(v)}</td>" for v in row) + "</tr>"
        for rank, row in enumerate(order.astype(object).where(order.notna(), None).itertuples(index=False), start=1)
    )
    notes = "".join(
        f"<h3>{i}: {html.escape(r.design.title)}</h3><ul>"
        + ("".join(f"<li>{html.escape(w)}</li>" for w in r.warnings) or "<li>no warnings</li>") + "</ul>"
        for i, r in enumerate(results, start=1)
    )
    return f"""<!DOCTYPE html>
<html lang="en"><head><meta charset="utf-8"><title>flexcycle comparison</title>
<style>body {{ font-family: system-ui, sans-serif; margin: 2em; color: #222 }}
table {{ border-collapse: collapse; font-size: 0.85em }} td, th {{ border: 1px solid #ddd; padding: 3px 6px }}
th {{ background: #f1eee6 }} figure {{ margin: 1em 0; break-inside: avoid }} svg {{ max-width: 100%; height: auto }}
.duty {{ font-weight: bold; color: #0b6e6e }} .wide {{ overflow-x: auto }} th {{ vertical-align: bottom }}
@media print {{ table {{ font-size: 0.7em }} }}
.caution {{ background: #fff4e0; border-left: 5px solid #d98b00; padding: 0.6em 1em; max-width: 60em }}</style>
</head><body><h1>Candidate designs side by side</h1>
<div class="caution"><b>Caution.</b> {html.escape(CAUTION)}</div>
<p class="duty">Duty: {html.escape(duty)}.</p>
<p>Ranked by life in blocks, longest first. SI units: life in blocks of the duty and in cycles; mass kg; stiffness N/m; energy J;
specific energy J/kg; strain as a ratio; x in m from the root.</p>
<div class="wide"><table><tr>{head}</tr>{body}</table></div>
<figure>{bar_figure(table, results)}<figcaption>Life on a log scale, specific energy, mass and stiffness; designs numbered
in the order given.</figcaption></figure>
<figure>{overlay_figure(results)}<figcaption>Force against load-point deflection over each design's duty, and the largest
fibre strain at the outer faces along the span over that duty.</figcaption></figure>
<h2>Warnings</h2>{notes}
</body></html>
"""
