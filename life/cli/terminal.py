"""Views for the terminal: the run summary and the comparison as rich tables (plain text at a fixed width, so\nthey read the same captured as on a TTY), a design, a cycle table, the material list."""
from __future__ import annotations

import io
from collections.abc import Mapping
from typing import TYPE_CHECKING

import numpy as np
import pandas as pd
from rich import box
from rich.console import Console
from rich.table import Table

from flexcycle.design import Design
from flexcycle.estimate import CAUTION, LifeResult
from flexcycle.mechanics.materials import Material
from flexcycle.spectra.cycles import Cycles

if TYPE_CHECKING:  # flexcycle.sizing loads scipy.optimize: only when a sizing answer is printed
    from flexcycle.sizing import SizingAnswer


WIDTH = 100  # fixed console width: the same layout on a terminal, in a pipe and in tests


def _render(*renderables) -> str:
    """Rich renderables as plain text at WIDTH columns (no colour codes, whether or not stdout is a TTY)."""
    console = Console(file=io.StringIO(), width=WIDTH, color_system=None, force_terminal=False,
                      highlight=False, emoji=False)
    for r in renderables:
        console.print(r)
    return "\n".join(line.rstrip() for line in console.file.getvalue().rstrip("\n").splitlines())


def _life(value: float | None, unit: str) -> str:
    if value is None:
        return "unbounded (no damaging cycle)"
    if value == 0:
        return f"0 {unit} (fails at first loading)"
    return f"{value:.3g} {unit}"


def summary_table(result: LifeResult) -> Table:
    """The run's figures as a two-column table (quantity, value with its unit)."""
    d, c, s = result.design, result.critical, result.summary()
    ply = d.beam.plies[c.ply - 1]
    t = Table(box=box.SIMPLE_HEAD, show_edge=False, pad_edge=False)
    t.add_column("quantity", no_wrap=True)
    t.add_column("value")
    t.add_row("life, cycles", _life(result.life_cycles, "cycles"))
    t.add_row("life, blocks", _life(result.life_blocks, "blocks of the duty"))
    if d.duty.blocks_per_day:
        t.add_row("life, days", _life(result.life_days, "days") + f" at {d.duty.blocks_per_day:g} blocks per day")
    t.add_row("damage", f"{result.damage_per_block:.3g} per block (Miner limit {d.miner_limit:g})")
    t.add_row("rule", f"mean stress {d.mean_stress}, stress factor {d.stress_factor:g}")
    t.add_row("critical mode", c.mode)
    t.add_row("critical ply", f"ply {c.ply} ({ply.material.name}, {ply.angle:g}°), {c.face} face")
    t.add_row("critical place", f"x = {c.x_m * 1e3:.1f} mm from the root, z = {c.z_m * 1e3:+.2f} mm")
    t.add_row("stiffness", f"{s['stiffness_n_per_m'] / 1e3:.4g} N/mm at the load point")
    t.add_row("mass", f"{s['mass_kg'] * 1e3:.4g} g")
    t.add_row("peak strain", f"{s['peak_strain'] * 100:.3g} % along the fibres")
    t.add_row("peak energy", f"{s['peak_energy_j']:.4g} J at peak drive")
    t.add_row("cycle energy", f"{s['cycle_energy_j']:.4g} J in the largest cycle")
    t.add_row("specific energy", f"{s['specific_energy_j_per_kg']:.4g} J/kg, storage efficiency {s['energy_efficiency']:.3f}")
    t.add_row("static reserve", f"{s['static_reserve']:.3g} ({result.static.criterion}) at x = "
                                f"{result.static.x_m * 1e3:.0f} mm, ply {result.static.ply}")
    return t


def summary_text(result: LifeResult, example: bool = False) -> str:
    """The run summary: a header, the table of figures, the warnings, and the caution as the last line."""
    d = result.design
    lines = [f"flexcycle — {d.title}" + ("  [bundled example, invented demo data]" if example else "")]
    lines.append(f"  part  {d.beam.support}, span {d.beam.span * 1e3:.0f} mm, {len(d.beam.plies)} plies, "
                 f"section {d.beam.section}")
    lines.append(f"  duty  {d.duty.source}; {d.duty.cycles.n_total:g} cycles per block, {d.duty.drive} at the load point")
    lines.append("")
    lines.append(_render(summary_table(result)))
    if result.warnings:
        lines.append("")
        lines.append("warnings:")
        lines.extend(f"  - {w}" for w in result.warnings)
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


def comparison_text(table: pd.DataFrame, duty: str = "each design with its own duty") -> str:
    """The comparison as a table, one row per design in the order given, and the duty it used."""
    def fmt(v, scale=1.0):
        return "unbounded" if v is None or v != v else f"{v * scale:.4g}"

    t = Table(box=box.SIMPLE_HEAD, show_edge=False, pad_edge=False)
    for name, justify in [("design", "left"), ("life blocks", "right"), ("life cycles", "right"), ("mass g", "right"),
                          ("k N/mm", "right"), ("U peak J", "right"), ("J/kg", "right"), ("critical", "left")]:
        # numbers and the mode are never broken; the title wraps at its spaces
        t.add_column(name, justify=justify, overflow="fold", no_wrap=name != "design", ratio=1 if name == "design" else None)
    for r in table.astype(object).where(table.notna(), None).itertuples(index=False):
        t.add_row(r.title, fmt(r.life_blocks), fmt(r.life_cycles), fmt(r.mass_kg, 1e3), fmt(r.stiffness_n_per_m, 1e-3),
                  fmt(r.peak_energy_j), fmt(r.specific_energy_j_per_kg), str(r.critical_mode))
    return f"duty: {duty}\n" + _render(t)


def sizing_text(answer: SizingAnswer) -> str:
    """The sizing answer: the steps, then a before/after table, then the sizing warnings."""
    from flexcycle.sizing import sizing_rows

    lines = [f"sizing for a life of {answer.target_blocks:g} blocks of the duty"]
    lines += [f"  {st.what}: {st.note}" for st in answer.sized.steps]
    if answer.drops is not None:
        lines.append("  alternative (sized-drops.toml):")
        lines += [f"    {st.what}: {st.note}" for st in answer.drops.steps]
    rows = sizing_rows(answer)
    w = max(len(q) for q, _, _ in rows)
    wb = max(len("before"), *(len(b) for _, b, _ in rows))
    lines.append("")
    lines.append(f"  {'quantity':{w}s}  {'before':>{wb}s}  after")
    lines.extend(f"  {q:{w}s}  {b:>{wb}s}  {a}" for q, b, a in rows)
    if answer.warnings:
        lines.append("")
        lines.append("warnings:")
        lines.extend(f"  - {x}" for x in answer.warnings)
    lines.append(f"\n  {answer.evaluations} estimates in the thickness/width searches")
    return "\n".join(lines)
