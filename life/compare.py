"""Side-by-side comparison of candidate designs: one row per design, and an HTML page with the table."""
from __future__ import annotations

import html
from typing import Sequence

import pandas as pd

from life.estimate import CAUTION, LifeResult

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


def comparison_html(table: pd.DataFrame, results: Sequence[LifeResult]) -> str:
    """A self-contained page: the comparison table, each design's warnings, and the caution."""
    head = "".join(f"<th>{html.escape(c)}</th>" for c in table.columns)
    body = "".join(
        "<tr>" + "".join(f"<td>{_cell(v)}</td>" for v in row) + "</tr>"
        for row in table.astype(object).where(table.notna(), None).itertuples(index=False)
    )
    notes = "".join(
        f"<h3>{html.escape(r.design.title)}</h3><ul>"
        + ("".join(f"<li>{html.escape(w)}</li>" for w in r.warnings) or "<li>no warnings</li>") + "</ul>"
        for r in results
    )
    return f"""<!DOCTYPE html>
<html lang="en"><head><meta charset="utf-8"><title>bendlife comparison</title>
<style>body {{ font-family: system-ui, sans-serif; margin: 2em; color: #222 }}
table {{ border-collapse: collapse }} td, th {{ border: 1px solid #ddd; padding: 3px 8px }} th {{ background: #f2f2f2 }}
.caution {{ background: #fff4e0; border-left: 5px solid #d98b00; padding: 0.6em 1em; max-width: 60em }}</style>
</head><body><h1>Candidate designs side by side</h1>
<div class="caution"><b>Caution.</b> {html.escape(CAUTION)}</div>
<p>SI units: life in blocks of each design's own duty and in cycles; mass kg; stiffness N/m; energy J;
specific energy J/kg; strain as a ratio; x in m from the root.</p>
<table><tr>{head}</tr>{body}</table>
<h2>Warnings</h2>{notes}
</body></html>
"""
