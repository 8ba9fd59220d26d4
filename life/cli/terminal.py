"""Views for the terminal: the run summary and the comparison as rich tables (plain text at a fixed width, so\nthey read the same captured as on a TTY), a design, a cycle table, the material list."""
from __future__ import annotations

import io
from collections.abc import Mapping, Sequence
from typing import TYPE_CHECKING

import numpy as np
import pandas as pd
from rich import box
from rich.console import Console
from rich.markup import escape
from rich.table import Table

from flexcycle.caution import CAUTION
from flexcycle.design import Design
from flexcycle.display import SI, Display, display_for
from flexcycle.mechanics.materials import Material
from flexcycle.requirement import verdict_text
from flexcycle.spectra.cycles import Cycles
from flexcycle.views import headline_rows

if TYPE_CHECKING:  # flexcycle.sizing loads scipy.optimize, the estimate scipy's modal and spectral modules
    from flexcycle.estimate import LifeResult
    from flexcycle.fatigue.fit import FitResult
    from flexcycle.sizing import SizingAnswer


WIDTH = 100  # fixed console width: the same layout on a terminal, in a pipe and in tests
COMPARISON_WIDTH = 130  # the comparison's two tables: every column whole, inch-pound with SI beside


def _render(*renderables, width: int = WIDTH) -> str:
    """Rich renderables as plain text at ``width`` columns (no colour codes, whether or not stdout is a TTY)."""
    console = Console(file=io.StringIO(), width=width, color_system=None, force_terminal=False,
                      highlight=False, emoji=False)
    for r in renderables:
        console.print(r)
    return "\n".join(line.rstrip() for line in console.file.getvalue().rstrip("\n").splitlines())


def summary_table(result: LifeResult, display: Display = SI) -> Table:
    """The run's figures as a two-column table (quantity, value with its unit; inch-pound with SI beside when
    ``display`` is inch-pound): the headline rows of `flexcycle.views.headline_rows`."""
    table = Table(box=box.SIMPLE_HEAD, show_edge=False, pad_edge=False)
    table.add_column("quantity", no_wrap=True)
    table.add_column("value")
    for quantity, value in headline_rows(result, display):
        table.add_row(quantity, value)
    return table


def summary_text(result: LifeResult, example: bool = False, display: Display | None = None) -> str:
    """The run summary: the verdict against the required life (when the design gives one), a header, the
    table of figures, the warnings, and the caution as the last line.

    display : the units to show; None: the design file's [report] units, else SI
    """
    d = result.design
    display = display or display_for(None, d.units)
    lines = []
    verdict = verdict_text(result)
    if verdict is not None:
        lines.append(verdict)
    lines.append(f"flexcycle — {d.title}" + ("  [bundled example, invented demo data]" if example else ""))
    lines.append(f"  part  {d.beam.support}, span {display.both(d.beam.span, 'length')}, {len(d.beam.plies)} plies, "
                 f"section {d.beam.section}")
    lines.append(f"  duty  {d.duty.source}; {d.duty.cycles.n_total:g} cycles per block, {d.duty.drive} at the load point")
    lines.append("")
    lines.append(_render(summary_table(result, display)))
    if result.warnings:
        lines.append("")
        lines.append("warnings:")
        lines.extend(f"  - {display.text(w)}" for w in result.warnings)
    lines.append("")
    lines.append("caution: " + CAUTION)
    return "\n".join(lines)


def design_text(design: Design) -> str:
    """A short account of a validated design."""
    b = design.beam
    width = (f"{b.width_root * 1e3:g} mm" if b.width_root == b.width_tip
             else f"{b.width_root * 1e3:g} → {b.width_tip * 1e3:g} mm")
    lines = [f"{design.title}", f"  {b.support}, span {b.span * 1e3:g} mm, width {width}, section {b.section}"]
    for k, p in enumerate(b.plies, start=1):
        drop = f", ends at {p.ends_at * 1e3:g} mm" if p.ends_at is not None else ""
        lines.append(f"  ply {k:3d}  {p.material.name:20s} {p.angle:6.1f}°  {p.thickness * 1e3:.3f} mm{drop}")
    lines.append(f"  duty: {design.duty.source}, {design.duty.cycles.n_total:g} cycles per block")
    return "\n".join(lines)


def cycle_text(cycles: Cycles, unit: str, scale: float, top: int, samples: int, residue: str = "half") -> str:
    """Rainflow table in the user's unit, largest ranges first."""
    order = np.argsort(-(cycles.hi - cycles.lo), kind="stable")
    if top:
        order = order[:top]
    how = ("half cycles of the residue count ½" if residue == "half"
           else "counted as one block of a repeating duty: all full cycles")
    lines = [f"{samples} samples → {cycles.n_total:g} cycles ({how}) in "
             f"{cycles.lo.size} distinct (min, max) rows; ASTM E1049-85 rainflow",
             f"{'range':>12s} {'mean':>12s} {'min':>12s} {'max':>12s} {'count':>8s}   [{unit}]"]
    for i in order:
        lo, hi = cycles.lo[i] / scale, cycles.hi[i] / scale
        lines.append(f"{hi - lo:12.5g} {(hi + lo) / 2:12.5g} {lo:12.5g} {hi:12.5g} {cycles.count[i]:8g}")
    if top and cycles.lo.size > top:
        lines.append(f"… {cycles.lo.size - top} more (--top 0 shows all)")
    return "\n".join(lines)


def materials_text(lib: Mapping[str, Material]) -> str:
    """One line per bundled material."""
    lines = [f"{'name':20s} {'kind':5s} {'E1 GPa':>7s} {'Xt MPa':>7s} {'rho':>6s}  description"]
    for name in sorted(lib):
        m = lib[name]
        lines.append(f"{name:20s} {m.kind:5s} {m.E1 / 1e9:7.1f} {m.Xt / 1e6:7.0f} {m.density:6.0f}  {m.description}")
    lines.append("\n`flexcycle materials NAME` shows every value with its source.")
    return "\n".join(lines)


def comparison_text(table: pd.DataFrame, duty: str = "each design with its own duty",
                    results: Sequence[LifeResult] | None = None, display: Display = SI) -> str:
    """The comparison: the duty, whether and why the designs are ranked, the two tables of
    ``flexcycle.explore.compare.display_rows`` (life, verdict, static reserve, critical place, warnings; mass,
    stiffness, energy), then each design's warnings. Without ``results`` (the table alone) one short table."""
    if results is None:
        return _comparison_table_only(table, duty)
    from flexcycle.explore.compare import display_rows

    shown = display_rows(table, results, display)
    parts = [f"duty: {duty}", shown["note"], ""]
    parts += [f"  #{i} {r.design.title}" for i, r in enumerate(results, start=1)]
    for key in ("life", "figures"):
        header, rows = shown[key]
        keep = [k for k, name in enumerate(header) if name != "title"]  # the titles are listed above
        t = Table(box=box.SIMPLE_HEAD, show_edge=False, pad_edge=False)
        for k in keep:  # a header wraps at its spaces; a number or a mode is never broken
            name = escape(header[k]).replace(" \\[", "\n\\[").replace(" (", "\n(")  # units on their own lines
            t.add_column(name, min_width=max(len(str(row[k])) for row in rows), overflow="fold")
        for row in rows:
            t.add_row(*(escape(str(row[k])) for k in keep))
        parts += ["", _render(t, width=COMPARISON_WIDTH)]
    warned = [(i, r) for i, r in enumerate(results, start=1) if r.warnings]
    if warned:
        parts += ["", "warnings:"]
        for i, r in warned:
            parts.extend(f"  #{i} {display.text(w)}" for w in r.warnings)
    return "\n".join(parts)


def _comparison_table_only(table: pd.DataFrame, duty: str) -> str:
    def fmt(v, scale=1.0):
        return "unbounded" if v is None or v != v else f"{v * scale:.4g}"

    t = Table(box=box.SIMPLE_HEAD, show_edge=False, pad_edge=False)
    for name, justify in [("design", "left"), ("life blocks", "right"), ("life cycles", "right"), ("mass g", "right"),
                          ("k N/mm", "right"), ("reserve", "right"), ("critical", "left")]:
        t.add_column(name, justify=justify, overflow="fold", no_wrap=name != "design", ratio=1 if name == "design" else None)
    for r in table.astype(object).where(table.notna(), None).itertuples(index=False):
        t.add_row(r.title, fmt(r.life_blocks), fmt(r.life_cycles), fmt(r.mass_kg, 1e3), fmt(r.stiffness_n_per_m, 1e-3),
                  fmt(r.static_reserve), str(r.critical_mode))
    return f"duty: {duty}\n" + _render(t)


def sizing_text(answer: SizingAnswer, display: Display = SI) -> str:
    """The sizing answer: the steps, then a before/after table (in the display's units), then the sizing
    warnings."""
    from flexcycle.sizing import sizing_rows

    lines = [f"sizing for a life of {answer.target_blocks:g} blocks of the duty"]
    lines += [f"  {st.what}: {display.text(st.note)}" for st in answer.sized.steps]
    if answer.drops is not None:
        lines.append("  alternative (sized-drops.toml):")
        lines += [f"    {st.what}: {display.text(st.note)}" for st in answer.drops.steps]
    rows = sizing_rows(answer, display)
    w = max(len(q) for q, _, _ in rows)
    wb = max(len("before"), *(len(b) for _, b, _ in rows))
    lines.append("")
    lines.append(f"  {'quantity':{w}s}  {'before':>{wb}s}  after")
    lines.extend(f"  {q:{w}s}  {b:>{wb}s}  {a}" for q, b, a in rows)
    if answer.warnings:
        lines.append("")
        lines.append("warnings:")
        lines.extend(f"  - {display.text(x)}" for x in answer.warnings)
    lines.append(f"\n  {answer.evaluations} estimates in the thickness/width searches")
    return "\n".join(lines)


def fit_text(result: FitResult) -> str:
    """The fitted curves as a table (one column per R), then the test of the straight line where there is one."""
    c = result.coupons
    strain = c.basis == "strain"
    k, unit = (100.0, "%") if strain else (1.0 / c.scale, c.unit)
    t = Table(box=box.SIMPLE_HEAD, show_edge=False, pad_edge=False)
    t.add_column("quantity", no_wrap=True)
    for fit in result.curves:
        t.add_column(f"R = {fit.R:g}")

    def row(name: str, cell) -> None:
        t.add_row(name, *(cell(fit) for fit in result.curves))

    slope = "m" if result.curves[0].form == "power" else "b"
    row("method", lambda f: f.method)
    row("coupons", lambda f: f"{f.n_failures} failures, {f.n_runouts} runouts")
    row("form", lambda f: f.form + (" a = S1·N^(−1/m)" if f.form == "power" else " a = S1·(1 − b·log10 N)"))
    row("S1 (median)", lambda f: f"{f.curve.S1 * k:.5g} {unit}")
    row(f"{slope} (median)", lambda f: f"{getattr(f.curve, slope):.5g}")
    row("sd_log10N", lambda f: f"{f.sd:.4g} decades" + (f" ({f.dof} dof)" if f.r_squared is not None else " (ML)"))
    row("R²", lambda f: "—" if f.r_squared is None else f"{f.r_squared:.4f}")
    row("amplitudes", lambda f: f"{f.amplitude.min() * k:.4g} … {f.amplitude.max() * k:.4g} {unit}")
    row("design k", lambda f: f"{f.design.k:.4g} ({f.design.survival:.3g} survival, {f.design.confidence:.3g} confidence)")
    row("S1 (design)", lambda f: f"{f.design.curve.S1 * k:.5g} {unit}")
    row(f"{slope} (design)", lambda f: f"{getattr(f.design.curve, slope):.5g}")
    lines = [f"flexcycle fit — {c.path.name}: {c.cycles.size} coupons, {c.basis} basis, level column "
             f"{c.level_column!r} ({c.level_kind}) in {c.unit}", "", _render(t)]
    for fit in result.curves:
        test = fit.lack_of_fit
        if test is not None:
            verdict = "not rejected" if test.linear else "REJECTED: the data bend away from a straight line"
            lines.append(f"  R = {fit.R:g}: E739 test of the straight line, F = {test.F:.3g} against "
                         f"F_crit = {test.F_critical:.3g} ({test.dof[0]}, {test.dof[1]} dof, p = {test.p_value:.3g}): {verdict}")
    return "\n".join(lines)


def sweep_text(table, space) -> str:
    """The sweep in a few lines: counts, and the candidates on the Pareto front (up to ten, longest life first)."""
    valid = int((table["message"] == "").sum())
    ok = int((table["meets_requirements"] == "true").sum())
    front = table[table["pareto"] == "true"]
    lines = [f"flexcycle sweep — {space.path.name} over {', '.join(space.keys)} ({space.method})",
             f"  {len(table)} candidates, {valid} valid designs, {ok} meet the requirements, {len(front)} on the "
             "Pareto front"]
    if len(front):
        life = front["life_blocks"].replace("", "inf").astype(float)
        shown = front.assign(_life=life).sort_values("_life", ascending=False).head(10)
        lines.append("")
        lines.append("candidate  life [blocks]  mass [g]  " + "  ".join(space.keys))
        for _, row in shown.iterrows():
            life_text = "unbounded" if row["life_blocks"] == "" else f"{float(row['life_blocks']):.3g}"
            lines.append(f"{int(row['candidate']):>9}  {life_text:>13}  {float(row['mass_kg']) * 1e3:>8.1f}  "
                         + "  ".join(str(row[k]) for k in space.keys))
    return "\n".join(lines)
