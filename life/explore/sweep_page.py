"""sweep.html: one self-contained page — the Pareto front (life against mass, coloured by specific energy),
the effect of each varied key, the ten best designs each with its summary and design file, and the command
that reproduces any row. No links: every figure is inline SVG."""
from __future__ import annotations

import html
import shlex
from dataclasses import dataclass
from typing import TYPE_CHECKING

import matplotlib
import numpy as np
import pandas as pd
from matplotlib.figure import Figure

from flexcycle.caution import CAUTION
from flexcycle.explore.pareto import as_numbers
from flexcycle.explore.space import candidate_text
from flexcycle.report.style import PALETTE, STYLE, arrange, figure_with_axes, to_svg

if TYPE_CHECKING:
    from flexcycle.explore.sweep import Prepared

BEST = 10  # designs shown in full
EFFECT_BINS = 8  # a key with more distinct values than this is shown in bins of equal counts


def _numbers(table: pd.DataFrame, key: str) -> np.ndarray:
    return as_numbers([None if v == "" else v for v in table[key]])


def front_figure(table: pd.DataFrame) -> Figure:
    """Life in blocks (log) against mass, every valid candidate coloured by its specific energy; the front
    joined and ringed; candidates that miss a requirement in grey."""
    valid = (table["message"] == "").to_numpy()
    ok = (table["meets_requirements"] == "true").to_numpy()
    front = (table["pareto"] == "true").to_numpy()
    mass = _numbers(table, "mass_kg") * 1e3
    life = _numbers(table, "life_blocks")
    energy = _numbers(table, "specific_energy_j_per_kg")
    finite = life[valid & np.isfinite(life) & (life > 0)]
    ceiling = finite.max() * 3 if finite.size else 1.0
    shown = np.where(np.isinf(life), ceiling, np.maximum(life, finite.min() / 3 if finite.size else 1e-3))
    with matplotlib.rc_context(STYLE):
        fig, ax = figure_with_axes((7.5, 4.2))
        miss = valid & ~ok
        ax.scatter(mass[miss], shown[miss], s=10, color="#bbbbbb", label="misses a requirement", zorder=1)
        points = ax.scatter(mass[ok], shown[ok], s=14, c=energy[ok], cmap="viridis", zorder=2,
                            label="meets the requirements")
        order = np.argsort(mass[front])
        ax.plot(mass[front][order], shown[front][order], color=PALETTE[1], lw=1.2, zorder=3)
        ax.scatter(mass[front], shown[front], s=46, facecolors="none", edgecolors=PALETTE[1], lw=1.2, zorder=4,
                   label="Pareto front")
        if ok.any():
            fig.colorbar(points, ax=ax, label="specific energy [J/kg]")
        ax.set_yscale("log")
        ax.set_xlabel("mass [g]")
        ax.set_ylabel("life [blocks of the duty]")
        ax.set_title("life against mass")
        ax.legend(loc="lower right", fontsize=7)
        return arrange(fig, right=1.1)


def _levels(values: pd.Series) -> tuple[list[str], np.ndarray]:
    """The distinct values of a key (binned when many) and each candidate's level index."""
    distinct = list(dict.fromkeys(values))
    try:
        magnitude = np.array([float(str(v).split()[0]) for v in values])
    except ValueError:
        magnitude = None
    if magnitude is not None:
        distinct = sorted(distinct, key=lambda v: float(str(v).split()[0]))
        if len(distinct) > EFFECT_BINS:
            edges = np.unique(np.quantile(magnitude, np.linspace(0, 1, EFFECT_BINS + 1)))
            index = np.clip(np.searchsorted(edges, magnitude, side="right") - 1, 0, len(edges) - 2)
            unit = " ".join(str(values.iloc[0]).split()[1:])
            labels = [f"{edges[k]:.3g}–{edges[k + 1]:.3g} {unit}".strip() for k in range(len(edges) - 1)]
            return labels, index
    position = {v: k for k, v in enumerate(distinct)}
    return [str(v) for v in distinct], np.array([position[v] for v in values])


@dataclass(frozen=True)
class Effect:
    """One varied key's effect: its levels (values, or bins of values) and, over the valid candidates at each
    level, the median, smallest and largest of a figure (NaN where no valid candidate has that level)."""

    key: str
    labels: list[str]
    median: np.ndarray
    low: np.ndarray
    high: np.ndarray


def effects(table: pd.DataFrame, keys: tuple[str, ...], figure: np.ndarray) -> list[Effect]:
    """The effect of each key on ``figure`` (one number per row of the table; non-finite values left out)."""
    valid = (table["message"] == "").to_numpy() & np.isfinite(figure)
    out = []
    for key in keys:
        labels, index = _levels(table[key])
        median, low, high = (np.full(len(labels), np.nan) for _ in range(3))
        for level in range(len(labels)):
            values = figure[valid & (index == level)]
            if values.size:
                median[level], low[level], high[level] = np.median(values), values.min(), values.max()
        out.append(Effect(key, labels, median, low, high))
    return out


def effect_figure(table: pd.DataFrame, keys: tuple[str, ...]) -> Figure:
    """For each varied key, side by side on shared axes (one for life, one for mass, so that the keys' effects
    read against one scale): the median figure of the valid candidates at each of its values, with the range
    from the smallest to the largest (the other keys vary underneath)."""
    rows = [(effects(table, keys, _numbers(table, "life_blocks")), PALETTE[0], "life [blocks]"),
            (effects(table, keys, _numbers(table, "mass_kg") * 1e3), PALETTE[2], "mass [g]")]
    with matplotlib.rc_context(STYLE):
        fig, axes = figure_with_axes((max(3.0 * len(keys), 6.0), 4.6), 2, 1, sharex=True)
        ticks, labels, start = [], [], 0
        for row, (ax, (groups, colour, name)) in enumerate(zip(axes, rows)):
            start = 0
            for group in groups:
                x = start + np.arange(len(group.labels))
                ax.vlines(x, group.low, group.high, color=colour, alpha=0.4, lw=3)
                ax.plot(x, group.median, "o-", color=colour, ms=4)
                if start:
                    ax.axvline(start - 1, color="#cccccc", lw=0.8)
                if row == 0:
                    ax.text(x.mean(), 1.02, group.key, transform=ax.get_xaxis_transform(), ha="center",
                            va="bottom", fontsize=8)
                    ticks.extend(x)
                    labels.extend(group.labels)
                start += len(group.labels) + 1
            ax.set_ylabel(name)
        axes[0].set_yscale("log")
        axes[1].set_xticks(ticks, labels, rotation=30 if len(labels) > 2 * len(keys) else 0, fontsize=7,
                           ha="right" if len(labels) > 2 * len(keys) else "center")
        axes[1].set_xlim(-0.6, start - 1.4)
        return arrange(fig, hspace=0.25, bottom=0.8, top=0.5)


def best_rows(table: pd.DataFrame, prepared: Prepared) -> pd.DataFrame:
    """The BEST candidates that meet the requirements: the Pareto front first, each group ordered by the
    first objective (best first), then the second."""
    ok = table[table["meets_requirements"] == "true"]
    keys = [o for o in prepared.space.objectives]
    scores = [-_numbers(ok, o.key) * o.sign for o in keys]
    order = np.lexsort([*scores[::-1], (ok["pareto"] != "true").to_numpy()])
    return ok.iloc[order[:BEST]]


def _figure_text(value: str, scale: float = 1.0, unit: str = "", digits: int = 4) -> str:
    if value == "":
        return "unbounded" if not unit else "—"
    return f"{float(value) * scale:.{digits}g}{unit}"


def sweep_html(table: pd.DataFrame, prepared: Prepared, command: str = "") -> str:
    """The whole page (self-contained, no links)."""
    space = prepared.space
    valid = int((table["message"] == "").sum())
    ok = int((table["meets_requirements"] == "true").sum())
    front = int((table["pareto"] == "true").sum())
    objectives = ", ".join(f"{'largest' if o.sign > 0 else 'smallest'} {o.key}" for o in space.objectives)
    requirements = "; ".join(map(str, space.requirements)) or "none"
    best = best_rows(table, prepared)
    cards = []
    for rank, (_, row) in enumerate(best.iterrows(), start=1):
        number = int(row["candidate"])
        values = space.candidates[number - 1]
        text = candidate_text(space, values, space.path.parent, number)
        settings = ", ".join(f"{k} = {row[k]}" for k in space.keys)
        cards.append(
            f"<h3>{rank}. candidate {number}{' (on the Pareto front)' if row['pareto'] == 'true' else ''}</h3>"
            f"<p>{html.escape(settings)}</p><table>"
            f"<tr><th>life</th><td>{_figure_text(row['life_blocks'])} blocks, "
            f"{_figure_text(row['life_cycles'])} cycles</td></tr>"
            f"<tr><th>mass</th><td>{_figure_text(row['mass_kg'], 1e3, ' g')}</td></tr>"
            f"<tr><th>stiffness</th><td>{_figure_text(row['stiffness_n_per_m'], 1e-3, ' N/mm')}</td></tr>"
            f"<tr><th>peak energy</th><td>{_figure_text(row['peak_energy_j'], 1, ' J')}, "
            f"{_figure_text(row['specific_energy_j_per_kg'], 1, ' J/kg')}</td></tr>"
            f"<tr><th>static reserve</th><td>{_figure_text(row['static_reserve'], 1, '', 3)}</td></tr>"
            f"<tr><th>critical mode</th><td>{html.escape(row['critical_mode'])}</td></tr></table>"
            f"<details><summary>design file of candidate {number} (paths relative to the sweep file's folder)"
            f"</summary><pre>{html.escape(text)}</pre></details>")
    sweep_arg = shlex.quote(space.path.name)
    reproduce = (f"flexcycle sweep {sweep_arg} --candidate N --out candidate-N\n"
                 "flexcycle run candidate-N/candidate-N.toml --out candidate-N")
    invalid = table[table["message"] != ""]
    invalid_html = "".join(f"<li>candidate {int(r['candidate'])}: {html.escape(r['message'])}</li>"
                           for _, r in invalid.head(20).iterrows())
    if len(invalid) > 20:
        invalid_html += f"<li>… and {len(invalid) - 20} more (sweep.csv, column message)</li>"
    return f"""<!DOCTYPE html>
<html lang="en"><head><meta charset="utf-8"><title>flexcycle sweep: {html.escape(space.path.name)}</title>
<style>body {{ font-family: system-ui, sans-serif; margin: 2em; color: #222; max-width: 70em }}
table {{ border-collapse: collapse; font-size: 0.85em }} td, th {{ border: 1px solid #ddd; padding: 3px 6px; text-align: left }}
th {{ background: #f1eee6 }} figure {{ margin: 1em 0 }} svg {{ max-width: 100%; height: auto }}
pre {{ background: #f7f7f7; padding: 0.6em; overflow-x: auto; font-size: 0.8em }}
.caution {{ background: #fff4e0; border-left: 5px solid #d98b00; padding: 0.6em 1em }}</style>
</head><body><h1>Design-space sweep: {html.escape(space.path.name)}</h1>
<div class="caution"><b>Caution.</b> {html.escape(CAUTION)}</div>
<p>Base design {html.escape(space.design_path.name)} ({html.escape(prepared.base_summary['title'])});
{len(table)} candidates ({html.escape(space.method)}) over {html.escape(', '.join(space.keys))};
{valid} valid designs, {ok} meet the requirements ({html.escape(requirements)}), {front} on the Pareto front of
{html.escape(objectives)} (no other candidate meeting the requirements is strictly better in every objective).
One duty for all: {html.escape(prepared.duty.duty.source)}.</p>
<p>Command: <code>{html.escape(command or 'flexcycle sweep ' + space.path.name)}</code></p>
<h2>Pareto front</h2>
<figure>{to_svg(front_figure(table), "sweep-front")}<figcaption>Life in blocks of the duty (log scale) against mass; colour: specific energy
at the peak drive. Ringed and joined: the Pareto front. Unbounded lives are drawn at the top edge.</figcaption></figure>
<h2>Effect of each varied key</h2>
<figure>{to_svg(effect_figure(table, space.keys), "sweep-effect")}<figcaption>Median (dots) and range (bars) of life and mass over the valid
candidates at each value of a key, the other keys varying underneath.</figcaption></figure>
<h2>The {len(best)} best designs</h2>
<p>Those that meet the requirements: the Pareto front first, then by {html.escape(objectives)}.</p>
{''.join(cards) or '<p>No candidate meets the requirements.</p>'}
<h2>Reproducing any row</h2>
<p>Candidate N (the column <code>candidate</code> of sweep.csv) is written as a design file and run on its own by:</p>
<pre>{html.escape(reproduce)}</pre>
<p>Its figures equal the row's.</p>
<h2>Candidates that are not valid designs</h2><ul>{invalid_html or '<li>none</li>'}</ul>
</body></html>
"""
