"""The design-review report: one self-contained HTML file (inline SVG figures, no external files)."""
from __future__ import annotations

import html
import io
from datetime import datetime, timezone

import matplotlib

matplotlib.use("Agg")
import matplotlib.pyplot as plt  # noqa: E402
import numpy as np  # noqa: E402
import pandas as pd  # noqa: E402

from life.estimate import CAUTION, LifeResult  # noqa: E402

METHODS = [
    ("Laminate", "classical laminate theory: Q, Q̄, ABD (Kaw, Mechanics of Composite Materials, 2nd ed., Eqs. 2.93, "
     "2.103, 4.28; Jones, 2nd ed., ch. 2 and 4); narrow beam: bending stiffness per width 1/d11 of the full ABD "
     "inverse; plate: cylindrical bending, w = w(x) (εy⁰ = κy = κxy = 0)"),
    ("Beam", "moments and deflections of Roark's Formulas for Stress and Strain, 7th ed., Table 8.1; load-point "
     "compliance by the unit-load method with Timoshenko shear deformation (shear stiffness from the energy of "
     "the equilibrium τxz with the plies' G13/G23: the 5/6 correction for a homogeneous section), integrated "
     "exactly over taper and ply drops"),
    ("Interlaminar shear", "τxz from equilibrium of the ply stresses, ∂τxz/∂z = −∂σx/∂x (Whitney 1987, ch. 6)"),
    ("Static strength", "first-ply failure by maximum stress, by Tsai-Wu with F12* = −1/2 (Tsai & Hahn 1980) and by "
     "maximum fibre strain; interlaminar shear against the interlaminar strength"),
    ("Counting", "reversals and rainflow per ASTM E1049-85 §5.4.4 (the rainflow package); the residue as half "
     "cycles, or, with residue = \"repeat\", the block closed on its largest reversal as one of a repeating duty"),
    ("Fatigue", "S-N or strain-life curves (power or log-linear), mean stress by Goodman, Gerber or a piecewise-linear "
     "constant-life diagram, Palmgren–Miner damage sum"),
    ("Energy", "U = ½·C·F² (Clapeyron); the energy of a cycle from its lowest-energy point to its highest"),
]

LIMITS = [
    "linear elastic, small deflection: trust the figures while the deflection stays below about 10 % of the span",
    "a beam's laminate is re-formed at every ply drop; stress concentrations at the drop itself are not modelled",
    "interlaminar shear assumes a locally prismatic section; free-edge stresses are not modelled",
    "Miner's rule ignores the order of loading; composites often fail below D = 1 under variable amplitude",
    "material values marked 'recalled' are typical values given from memory: replace them with tested data",
]


def _svg(fig) -> str:
    buf = io.StringIO()
    fig.savefig(buf, format="svg", bbox_inches="tight")
    plt.close(fig)
    text = buf.getvalue()
    return text[text.index("<svg"):]


def _table(rows, header=None) -> str:
    out = ["<table>"]
    if header:
        out.append("<tr>" + "".join(f"<th>{html.escape(str(h))}</th>" for h in header) + "</tr>")
    for row in rows:
        out.append("<tr>" + "".join(f"<td>{html.escape(str(c))}</td>" for c in row) + "</tr>")
    out.append("</table>")
    return "\n".join(out)


def _fmt(value, digits=4, scale=1.0, unit=""):
    if value is None:
        return "unbounded"
    return f"{value * scale:.{digits}g} {unit}".strip()


def _stack_rows(plies) -> list[tuple]:
    """One row per run of identical consecutive plies: numbers (count), material, angle, thickness, drop."""
    runs: list[list] = []  # [first, last, cells]
    for k, p in enumerate(plies, start=1):
        cells = (p.material.name, f"{p.angle:g}", f"{p.thickness * 1e3:.3f}",
                 "—" if p.ends_at is None else f"{p.ends_at * 1e3:g}")
        if runs and runs[-1][2] == cells:
            runs[-1][1] = k
        else:
            runs.append([k, k, cells])
    return [(f"{a}" if a == b else f"{a}–{b} ({b - a + 1})",) + cells for a, b, cells in runs]


def _span_figure(result: LifeResult, locations: pd.DataFrame) -> str:
    resp = result.response
    peak = max(abs(v) for v in result.design.duty.extremes) * result.force_per_drive
    eps = np.abs(resp.strain_12[..., 0]).max(axis=(1, 2)) * peak
    fig, (a1, a2) = plt.subplots(2, 1, figsize=(7.5, 5.2), sharex=True)
    a1.plot(resp.x * 1e3, eps * 100, marker=".", color="#1f5f8b")
    a1.set_ylabel("peak |ε1| [%]")
    a1.set_title("along the span, at the largest drive")
    a1.grid(alpha=0.3)
    for mode, group in locations.groupby("mode"):
        per = group.groupby("x_m")["damage_per_block"].max()
        if (per > 0).any():
            a2.semilogy(per.index * 1e3, per.where(per > 0), marker=".", label=mode)
    a2.set_xlabel("distance from the root x [mm]")
    a2.set_ylabel("damage per block")
    if a2.get_legend_handles_labels()[0]:
        a2.legend(fontsize=8)
    a2.grid(alpha=0.3, which="both")
    return _svg(fig)


def _thickness_figure(result: LifeResult) -> str:
    resp, c = result.response, result.critical
    peak = max(abs(v) for v in result.design.duty.extremes) * result.force_per_drive
    k = c.station
    present = resp.present[k]
    fig, ax = plt.subplots(figsize=(5.5, 3.6))
    for j in np.flatnonzero(present):
        ax.plot(resp.strain_12[k, j, :, 0] * peak * 100, resp.z[k, j] * 1e3, color="#8b3a1f")
        ax.plot(resp.strain_12[k, j, :, 1] * peak * 100, resp.z[k, j] * 1e3, color="#3a8b1f", alpha=0.7)
    ax.plot([], [], color="#8b3a1f", label="ε1 (fibre)")
    ax.plot([], [], color="#3a8b1f", label="ε2 (transverse)")
    ax.axvline(0, color="k", lw=0.5)
    ax.set_xlabel("ply-axis strain at the largest drive [%]")
    ax.set_ylabel("z [mm]")
    ax.set_title(f"through the thickness at x = {c.x_m * 1e3:.1f} mm")
    ax.legend(fontsize=8)
    ax.grid(alpha=0.3)
    return _svg(fig)


PLOT_POINTS = 20_000  # a time history longer than this is drawn as its min/max envelope (light SVG)


def _duty_figure(result: LifeResult, cycles: pd.DataFrame) -> str:
    duty = result.design.duty
    unit, scale = ("mm", 1e3) if duty.drive == "deflection" else ("N", 1.0)
    fig, ax = plt.subplots(figsize=(7.5, 2.8))
    trace = getattr(duty, "trace", None)
    if duty.signal is not None and duty.signal.size <= PLOT_POINTS:
        ax.plot(np.arange(duty.signal.size), duty.signal * scale, lw=0.5, color="#444")
        ax.set_xlabel("sample")
        ax.set_ylabel(f"drive [{unit}]")
        ax.set_title("time history of one block")
    elif trace is not None or duty.signal is not None:
        if trace is not None:
            start, lo, hi, samples = trace.start, trace.lo, trace.hi, trace.samples
        else:  # a long signal without its envelope: min and max per bin here
            samples = duty.signal.size
            start = np.arange(0, samples, -(-samples // (PLOT_POINTS // 10)))
            lo, hi = np.minimum.reduceat(duty.signal, start), np.maximum.reduceat(duty.signal, start)
        ax.fill_between(start, lo * scale, hi * scale, step="post", lw=0.5, color="#444")
        ax.set_xlabel("sample")
        ax.set_ylabel(f"drive [{unit}]")
        per = int(start[1] - start[0]) if start.size > 1 else samples
        ax.set_title(f"time history of one block, {samples} samples: min and max of every {per}")
    else:
        for lo, hi, n in cycles[["min", "max", "count"]].itertuples(index=False):
            ax.plot([lo * scale, hi * scale], [n, n], lw=3)
        ax.set_yscale("log")
        ax.set_xlabel(f"drive [{unit}]")
        ax.set_ylabel("count per block")
        ax.set_title("block table: each bar spans a cycle's min to max")
    ax.grid(alpha=0.3)
    return _svg(fig)


def report_html(result: LifeResult, cycles: pd.DataFrame, cycle_note: str, locations: pd.DataFrame) -> str:
    """Render the design-review report."""
    d, s, c = result.design, result.summary(), result.critical
    beam = d.beam
    unit, scale = ("mm", 1e3) if d.duty.drive == "deflection" else ("N", 1.0)
    ply = beam.plies[c.ply - 1]
    headline = [
        ("life", f"{_fmt(s['life_cycles'])} cycles · {_fmt(s['life_blocks'])} blocks"
                 + (f" · {_fmt(s['life_days'])} days" if d.duty.blocks_per_day else "")),
        ("damage per block", f"{s['damage_per_block']:.3g} (Miner limit {d.miner_limit:g})"),
        ("critical", f"{c.mode}, ply {c.ply} ({ply.material.name}, {ply.angle:g}°), {c.face} face, "
                     f"x = {c.x_m * 1e3:.1f} mm, z = {c.z_m * 1e3:+.2f} mm"),
        ("stiffness", _fmt(s["stiffness_n_per_m"], 4, 1e-3, "N/mm")),
        ("mass", _fmt(s["mass_kg"], 4, 1e3, "g")),
        ("peak fibre strain", _fmt(s["peak_strain"], 3, 100, "%")),
        ("energy at peak drive", _fmt(s["peak_energy_j"], 4, 1, "J")),
        ("energy in the largest cycle", _fmt(s["cycle_energy_j"], 4, 1, "J")),
        ("specific energy", _fmt(s["specific_energy_j_per_kg"], 4, 1, "J/kg")),
        ("energy-storage efficiency", f"{s['energy_efficiency']:.3f}"),
        ("static reserve", f"{s['static_reserve']:.3g} ({result.static.criterion}; "
                           + ", ".join(f"{k} {v:.3g}" for k, v in result.static.by_criterion.items() if v is not None)
                           + ")"),
    ]
    width = (f"{beam.width_root * 1e3:g} mm" if beam.width_root == beam.width_tip
             else f"{beam.width_root * 1e3:g} mm at the root → {beam.width_tip * 1e3:g} mm")
    part = [("support", beam.support), ("span", f"{beam.span * 1e3:g} mm"), ("width", width),
            ("section", beam.section), ("stations", str(result.response.x.size))]
    if beam.load_spacing:
        part.append(("load spacing", f"{beam.load_spacing * 1e3:g} mm"))
    stack = _stack_rows(beam.plies)
    top = cycles.assign(range=cycles["max"] - cycles["min"]).sort_values("range", ascending=False).head(15)
    cyc_rows = [(f"{r['min'] * scale:.4g}", f"{r['max'] * scale:.4g}", f"{r['count']:g}", f"{r['energy_j']:.4g}")
                for _, r in top.iterrows()]
    worst = locations.sort_values("damage_per_block", ascending=False).head(12)
    loc_rows = [(f"{r.x_m * 1e3:.1f}", r.ply, r.material, r.face, r["mode"], f"{r.amplitude:.4g}", f"{r['mean']:.4g}",
                 f"{r.damage_per_block:.3g}") for _, r in worst.iterrows()]
    mats = []
    for m in d.materials.values():
        mats.append(f"<h3>{html.escape(m.name)}</h3><p>{html.escape(m.description)}</p>")
        mats.append(_table(sorted(m.sources.items()), header=("value", "source")))
    warn = "".join(f"<li>{html.escape(w)}</li>" for w in result.warnings) or "<li>none</li>"
    stamp = datetime.now(timezone.utc).strftime("%Y-%m-%d %H:%M UTC")
    return f"""<!DOCTYPE html>
<html lang="en"><head><meta charset="utf-8">
<title>bendlife design review — {html.escape(d.title)}</title>
<style>
body {{ font-family: system-ui, sans-serif; max-width: 960px; margin: 2em auto; color: #222; line-height: 1.4 }}
h1 {{ font-size: 1.5em }} h2 {{ border-bottom: 1px solid #ccc; margin-top: 1.8em }}
table {{ border-collapse: collapse; margin: 0.6em 0 }} td, th {{ border: 1px solid #ddd; padding: 3px 8px; text-align: left }}
th {{ background: #f2f2f2 }} .caution {{ background: #fff4e0; border-left: 5px solid #d98b00; padding: 0.6em 1em }}
.warn li {{ color: #8a3b00 }} svg {{ max-width: 100%; height: auto }}
</style></head><body>
<h1>Design review: {html.escape(d.title)}</h1>
<p>bendlife estimate, {stamp}. Design file: {html.escape(str(d.path.name) if d.path else "—")}.</p>
<div class="caution"><b>Caution.</b> {html.escape(CAUTION)}</div>
<h2>Result</h2>
{_table(headline)}
<h2>Warnings</h2><ul class="warn">{warn}</ul>
<h2>Part</h2>
{_table(part)}
<h3>Ply stack (from the tension face under positive drive)</h3>
{_table(stack, header=("plies (count)", "material", "angle [°]", "thickness [mm]", "ends at [mm]"))}
<h2>Duty</h2>
<p>{html.escape(d.duty.source)}; {d.duty.cycles.n_total:g} cycles per block; drive: {d.duty.drive}.
cycles.csv: {html.escape(cycle_note)}.</p>
{_duty_figure(result, cycles)}
<h3>Largest counted cycles</h3>
{_table(cyc_rows, header=(f"min [{unit}]", f"max [{unit}]", "count", "energy [J]"))}
<h2>Along the span</h2>
{_span_figure(result, locations)}
<h2>Through the thickness at the critical station</h2>
{_thickness_figure(result)}
<h2>Most damaged locations</h2>
<p>Amplitude and mean of the largest cycle, in the basis of the location's curve (Pa or strain).</p>
{_table(loc_rows, header=("x [mm]", "ply", "material", "face", "mode", "amplitude", "mean", "damage/block"))}
<h2>Methods and sources</h2>
{_table(METHODS, header=("step", "method"))}
<h2>Limits of the models</h2>
<ul>{''.join(f"<li>{html.escape(x)}</li>" for x in LIMITS)}</ul>
<h2>Materials and the source of every value</h2>
{''.join(mats)}
</body></html>
"""
