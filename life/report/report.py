"""The design-review report: one self-contained HTML file (DESIGN.md, outputs contract: report.html).

Read top to bottom, the report is: identification, inputs, method and assumptions, results (and, when a
sizing run gives them, the sizing rows), warnings, cautions, review and sign-off. Each section and each
figure is one function below, in that order. Figures are inline SVG (text kept as text; dense artists
rasterized into the SVG); nothing is fetched from outside the file. Every string that comes from the user
(title, material names, file names, warnings that quote them) goes through ``html.escape``.
"""
from __future__ import annotations

import hashlib
import html
import io
import math
from collections.abc import Callable, Mapping, Sequence
from dataclasses import dataclass
from datetime import UTC, datetime
from importlib import metadata
from pathlib import Path

import matplotlib
import numpy as np
import pandas as pd
from cycler import cycler
from matplotlib.collections import LineCollection
from matplotlib.colors import LogNorm
from matplotlib.figure import Figure
from matplotlib.patches import Rectangle
from matplotlib.ticker import FuncFormatter, LogLocator, NullLocator

from flexcycle.estimate import CAUTION, LifeResult
from flexcycle.fatigue.damage import FACES, FIRST_LOAD_FAILURE, cycle_lives
from flexcycle.fatigue.meanstress import (
    gerber_amplitude_at_zero_mean,
    gerber_amplitude_on_ray,
    goodman_amplitude_at_zero_mean,
    goodman_amplitude_on_ray,
    mean_ratio,
)
from flexcycle.spectra.counting import Cycles
from flexcycle.spectra.streaming import minmax_envelope

METHODS = [
    ("Laminate", "classical laminate theory: Q, Q̄, ABD (Kaw, Mechanics of Composite Materials, 2nd ed., Eqs. 2.93, "
     "2.103, 4.28; Jones, 2nd ed., ch. 2 and 4); narrow beam: bending stiffness per width 1/d11 of the full ABD "
     "inverse; plate: cylindrical bending, w = w(x) (εy⁰ = κy = κxy = 0)"),
    ("Beam", "moments and deflections of Roark's Formulas for Stress and Strain, 7th ed., Table 8.1; load-point "
     "compliance by the unit-load method with Timoshenko shear deformation (shear stiffness from the energy of "
     "the equilibrium τxz with the plies' G13/G23: the 5/6 correction for a homogeneous section), integrated "
     "over taper and ply drops by Gauss–Legendre quadrature (error below round-off)"),
    ("Interlaminar shear", "τxz from equilibrium of the ply stresses, ∂τxz/∂z = −∂σx/∂x (Whitney 1987, ch. 6)"),
    ("Static strength", "first-ply failure by maximum stress, by Tsai-Wu with F12* = −1/2 (Tsai & Hahn 1980) and by "
     "maximum fibre strain; interlaminar shear against the interlaminar strength"),
    ("Counting", "reversals and rainflow per ASTM E1049-85 §5.4.4 (vectorised four-point rule, cycle for cycle equal to the rainflow package, which the tests use as the reference); the residue as half "
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

RULE_NAMES = {
    "goodman": "Goodman (linear constant-life lines to Xt and Xc)",
    "gerber": "Gerber (parabolic constant-life lines to Xt and Xc)",
    "none": "none (amplitude alone, at the curve's own R)",
    "cld": "constant-life diagram (piecewise linear through the curves at several R)",
}

CAUTIONS = [
    "A flexing part that breaks releases its stored energy at once: guard people and parts from the fragments "
    "and the recoil, and size the guard for the peak stored energy given above.",
    "This is an estimate, not certification.",
    "Confirm the life by fatigue tests of prototypes (e.g. ASTM D7774 flexural fatigue, ISO 13003 fatigue by "
    "cyclic loading) under the real duty.",
    "Apply environmental knock-downs (moisture, temperature, UV, chemicals, creep) to the material data before "
    "relying on the figures.",
    "Local codes and licensed engineering practice decide whether the part may be used.",
]

# Figures: a style of our own (teal, brick, slate, ochre), text kept as text in the SVG.
PALETTE = ["#0b6e6e", "#b5482f", "#4f6d7a", "#d39b3a", "#6a4c93", "#5a8a3c", "#8c6d5a", "#2f3e46"]
STYLE = {
    "font.size": 9,
    "font.family": "sans-serif",
    "axes.titlesize": 10,
    "axes.titleweight": "bold",
    "axes.titlelocation": "left",
    "axes.titley": 1.0,  # a fixed title place: matplotlib would otherwise measure the axes to lift it
    "axes.labelcolor": "#2b2a26",
    "axes.edgecolor": "#6b6457",
    "axes.spines.top": False,
    "axes.spines.right": False,
    "axes.grid": True,
    "axes.prop_cycle": cycler(color=PALETTE),
    "grid.color": "#ddd8cc",
    "grid.linewidth": 0.6,
    "legend.frameon": False,
    "legend.fontsize": 8,
    "lines.linewidth": 1.6,
    "figure.facecolor": "white",
    "svg.fonttype": "none",
}
DROP_COLOUR, CRITICAL_COLOUR = "#8a8577", "#b5482f"


# ---------------------------------------------------------------------------------------------
# Small helpers

def _e(value) -> str:
    return html.escape(str(value))


SUPERSCRIPT = str.maketrans("-0123456789", "⁻⁰¹²³⁴⁵⁶⁷⁸⁹")


def _power_of_ten(value: float, _position=None) -> str:
    """A log-axis label as plain text, 10⁻³: no TeX-like markup to parse (that alone took 0.5 s per report)."""
    if not (value > 0 and math.isfinite(value)):
        return ""
    exponent = math.log10(value)
    if abs(exponent - round(exponent)) > 1e-9:
        return ""
    return "10" + str(int(round(exponent))).translate(SUPERSCRIPT)


def _plain_log_labels(fig) -> None:
    """Every log-scaled axis of the figure (colour bars included) ticked and labelled at whole decades only, as
    plain text (minor ticks at 2…9 would be some 70 tick artists per axis, a third of a figure's drawing time)."""
    for ax in fig.axes:
        for axis in (ax.xaxis, ax.yaxis):
            if axis.get_scale() == "log":
                axis.set_major_locator(LogLocator(base=10.0, numticks=8))
                axis.set_major_formatter(FuncFormatter(_power_of_ten))
                axis.set_minor_locator(NullLocator())


def _subplots(figsize: tuple[float, float], nrows: int = 1, ncols: int = 1, **kw):
    """A figure and its axes, without pyplot (no figure manager, no GUI backend to load)."""
    fig = Figure(figsize=figsize)
    return fig, fig.subplots(nrows, ncols, **kw)


# Margins of every figure [inch]: fixed, wide enough for this report's labels (the widest tick labels, a
# colour bar's or a second axis's label on the right), so that no layout pass measures the text first (an
# automatic layout took half of the report's time).
MARGINS = {"left": 0.95, "right": 0.18, "bottom": 0.55, "top": 0.36}


def _svg(fig, name: str, hspace: float = 0.3, wspace: float = 0.2, **margins: float) -> str:
    """The figure as an inline <svg> element (no XML prologue, no date).

    margins : left, right, bottom, top in inches, over MARGINS; hspace, wspace : between axes, as fractions of
    the average axes height and width (matplotlib's subplot parameters)
    """
    width, height = fig.get_size_inches()
    edge = {**MARGINS, **margins}
    fig.subplots_adjust(left=edge["left"] / width, right=1 - edge["right"] / width, bottom=edge["bottom"] / height,
                        top=1 - edge["top"] / height, hspace=hspace, wspace=wspace)
    _plain_log_labels(fig)
    buf = io.StringIO()
    with matplotlib.rc_context({"svg.hashsalt": name}):  # distinct element ids per figure in one page
        fig.savefig(buf, format="svg", metadata={"Date": None})
    text = buf.getvalue()
    return text[text.index("<svg"):]


def _figure(svg: str, number: str, caption: str) -> str:
    return (f'<figure id="fig-{number}">{svg}<figcaption><b>Figure {number}.</b> {_e(caption)}'
            "</figcaption></figure>")


def _table(rows, header=None, cls: str = "") -> str:
    out = [f'<table class="{cls}">' if cls else "<table>"]
    if header:
        out.append("<tr>" + "".join(f"<th>{_e(h)}</th>" for h in header) + "</tr>")
    for row in rows:
        out.append("<tr>" + "".join(f"<td>{_e(c)}</td>" for c in row) + "</tr>")
    out.append("</table>")
    return "\n".join(out)


def _fmt(value, digits=4, scale=1.0, unit=""):
    if value is None:
        return "unbounded"
    return f"{value * scale:.{digits}g} {unit}".strip()


def _life(value, unit: str) -> str:
    if value is None:
        return "unbounded (no damaging cycle)"
    if value == 0:
        return f"0 {unit} (fails at first loading)"
    return f"{value:.3g} {unit}"


def _sha256(path: Path | None) -> str:
    if path is None:
        return "—"
    try:
        return hashlib.sha256(Path(path).read_bytes()).hexdigest()
    except OSError:
        return "— (file not readable when the report was written)"


def drive_unit(drive: str) -> tuple[str, float]:
    """Display unit of the drive and the factor from SI to it: deflection in mm, force in N."""
    return ("mm", 1e3) if drive == "deflection" else ("N", 1.0)


def _tool_version() -> str:
    try:
        return metadata.version("flexcycle")
    except metadata.PackageNotFoundError:
        return "unknown (not installed)"


def _drop_positions(result: LifeResult) -> list[float]:
    return sorted({p.ends_at for p in result.design.beam.plies if p.ends_at is not None})


def _mark_drops(ax, result: LifeResult, label: bool = True) -> None:
    for k, x in enumerate(_drop_positions(result)):
        ax.axvline(x * 1e3, color=DROP_COLOUR, lw=0.9, ls=(0, (4, 3)), label="ply drop" if (label and k == 0) else None)


def _peak_force(result: LifeResult) -> float:
    """Drive force at the duty extreme of largest magnitude, with its sign [N]."""
    lo, hi = result.design.duty.extremes
    return (hi if abs(hi) >= abs(lo) else lo) * result.force_per_drive


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


# ---------------------------------------------------------------------------------------------
# Data behind the figures (also used by the comparison page)

@dataclass(frozen=True)
class SpanEnvelope:
    """Fibre strain ε1 at the two outer faces along the span over the duty's drive range.

    x : np.ndarray — station distance from the root, shape (n,) [m]
    bottom : np.ndarray — (min, max) ε1 over the duty at the bottom face (ply 1 side), shape (n, 2) [-]
    top : np.ndarray — (min, max) ε1 over the duty at the top face, shape (n, 2) [-]
    """

    x: np.ndarray
    bottom: np.ndarray
    top: np.ndarray


def span_envelope(result: LifeResult) -> SpanEnvelope:
    """ε1 = (ε1 per unit force) × force at each duty extreme; linear, so the extremes bound the whole duty."""
    resp = result.response
    lo, hi = result.design.duty.extremes
    forces = np.array([lo, hi]) * result.force_per_drive
    n = resp.x.size
    first = np.argmax(resp.present, axis=1)
    last = resp.present.shape[1] - 1 - np.argmax(resp.present[:, ::-1], axis=1)
    per_n_bottom = resp.strain_12[np.arange(n), first, 0, 0]
    per_n_top = resp.strain_12[np.arange(n), last, 1, 0]
    bottom = np.sort(per_n_bottom[:, None] * forces[None, :], axis=1)
    top = np.sort(per_n_top[:, None] * forces[None, :], axis=1)
    return SpanEnvelope(resp.x, bottom, top)


@dataclass(frozen=True)
class ForceDeflection:
    """The load-point line over the duty's range, from zero drive to each extreme.

    deflection : np.ndarray — load-point deflection, shape (m,) [m]
    force : np.ndarray — drive force there, shape (m,) [N]
    """

    deflection: np.ndarray
    force: np.ndarray


def force_deflection(result: LifeResult, points: int = 50) -> ForceDeflection:
    """F = δ/C over the duty's range (linear theory; C the load-point compliance, bending + shear)."""
    lo, hi = result.design.duty.extremes
    f = np.linspace(min(lo, 0.0), max(hi, 0.0), points) * result.force_per_drive
    return ForceDeflection(f * result.response.compliance, f)


def critical_index(result: LifeResult) -> int:
    """Index into result.locations of the critical location (its station, ply, face and mode)."""
    locs, c = result.locations, result.critical
    match = np.flatnonzero(
        (locs.station == c.station) & (locs.ply == c.ply - 1) & (locs.mode == c.mode) & (locs.face == FACES.index(c.face))
    )
    if match.size == 0:  # the static check's place may be a mode without a fatigue location
        match = np.flatnonzero((locs.station == c.station) & (locs.ply == c.ply - 1))
    if match.size == 0:
        return int(np.argmax(result.damage.damage))
    best = np.lexsort((result.damage.utilisation[match], result.damage.damage[match]))[-1]  # damage, then utilisation
    return int(match[best])


def _table_cycles(cycles: pd.DataFrame) -> Cycles:
    return Cycles(cycles["min"].to_numpy(float), cycles["max"].to_numpy(float), cycles["count"].to_numpy(float))


# ---------------------------------------------------------------------------------------------
# Figures

def figure_layup(result: LifeResult) -> str:
    """Side view of the stack along the span (each ply to its drop) and the planform (width taper)."""
    beam = result.design.beam
    L = beam.length * 1e3
    materials = list(dict.fromkeys(p.material.name for p in beam.plies))
    colour = {name: PALETTE[i % len(PALETTE)] for i, name in enumerate(materials)}
    with matplotlib.rc_context(STYLE):
        fig, (a1, a2) = _subplots((7.5, 4.6), 2, 1, sharex=True, gridspec_kw={"height_ratios": [3, 1.4]})
        z = 0.0
        for _k, p in enumerate(beam.plies, start=1):
            end = L if p.ends_at is None else p.ends_at * 1e3
            shade = 0.95 if p.angle % 180 == 0 else 0.55
            a1.add_patch(Rectangle((0, z), end, p.thickness * 1e3, facecolor=colour[p.material.name], alpha=shade,
                                   edgecolor="white", lw=0.6))
            if p.ends_at is not None:
                a1.plot([end, end], [z, z + p.thickness * 1e3], color="k", lw=1.2)
            z += p.thickness * 1e3
        a1.set_xlim(-0.02 * L, 1.02 * L)
        a1.set_ylim(-0.05 * z, 1.05 * z)
        a1.set_ylabel("height from the tension face [mm]")
        a1.set_title("stack along the span (thickness exaggerated); pale = off-axis ply")
        for name in materials:
            a1.add_patch(Rectangle((0, 0), 0, 0, facecolor=colour[name], label=name))
        a1.text(0.99, 0.02, "tension face under positive drive ↓", transform=a1.transAxes, ha="right", va="bottom",
                fontsize=7.5, color="#555")
        a1.legend(loc="lower right", bbox_to_anchor=(1.0, 1.06), ncol=min(3, len(materials)))
        _mark_drops(a1, result, label=False)
        x = np.linspace(0, L, 50)
        half = beam.width(x / 1e3) * 1e3 / 2
        a2.fill_between(x, -half, half, color=PALETTE[2], alpha=0.35, lw=0)
        a2.plot(x, half, color=PALETTE[2]), a2.plot(x, -half, color=PALETTE[2])
        a2.set_ylabel("width [mm]")
        a2.set_xlabel("distance from the root x [mm]")
        a2.set_title("planform", fontsize=9)
        _mark_drops(a2, result, label=False)
        return _svg(fig, "layup", top=0.6, hspace=0.35)


def figure_force_deflection(result: LifeResult) -> str:
    """(a) Force against load-point deflection over the duty's range, the energy at the peak drive shaded."""
    fd = force_deflection(result)
    lo, hi = result.design.duty.extremes
    fpd, C = result.force_per_drive, result.response.compliance
    peak = _peak_force(result)
    with matplotlib.rc_context(STYLE):
        fig, ax = _subplots((6.2, 3.6))
        ax.plot(fd.deflection * 1e3, fd.force, color=PALETTE[0], label=f"k = {result.response.stiffness / 1e3:.4g} N/mm")
        f_fill = np.linspace(0.0, peak, 50)
        ax.fill_between(f_fill * C * 1e3, 0, f_fill, color=PALETTE[3], alpha=0.35,
                        label=f"stored at the peak drive: U = {result.storage.energy:.4g} J")
        for d in sorted({lo, hi}):
            ax.plot(d * fpd * C * 1e3, d * fpd, "o", color=PALETTE[1], ms=5)
        ax.plot([], [], "o", color=PALETTE[1], ms=5, label="duty extremes")
        ax.axhline(0, color="#999", lw=0.6), ax.axvline(0, color="#999", lw=0.6)
        ax.set_xlabel("load-point deflection δ [mm]")
        ax.set_ylabel("load-point force F [N]")
        ax.set_title("force–deflection over the duty (linear theory)")
        ax.legend(loc="upper left")
        return _svg(fig, "force-deflection")


def figure_strain_envelope(result: LifeResult) -> str:
    """(b) Fibre strain ε1 along the span at both outer faces, over the whole duty; drops and critical marked."""
    env = span_envelope(result)
    c = result.critical
    x = env.x * 1e3
    with matplotlib.rc_context(STYLE):
        fig, ax = _subplots((7.5, 3.6))
        ax.fill_between(x, env.bottom[:, 0] * 100, env.bottom[:, 1] * 100, color=PALETTE[0], alpha=0.35, lw=0)
        ax.plot(x, env.bottom[:, 1] * 100, color=PALETTE[0], lw=1.2, label="bottom face (ply 1 side)")
        ax.plot(x, env.bottom[:, 0] * 100, color=PALETTE[0], lw=1.2)
        ax.fill_between(x, env.top[:, 0] * 100, env.top[:, 1] * 100, color=PALETTE[2], alpha=0.30, lw=0)
        ax.plot(x, env.top[:, 0] * 100, color=PALETTE[2], lw=1.2, ls="--", label="top face")
        ax.plot(x, env.top[:, 1] * 100, color=PALETTE[2], lw=1.2, ls="--")
        ax.axhline(0, color="#999", lw=0.6)
        _mark_drops(ax, result)
        ax.axvline(c.x_m * 1e3, color=CRITICAL_COLOUR, lw=1.4, label=f"critical: {c.mode}, ply {c.ply}, {c.face} face")
        ax.set_xlabel("distance from the root x [mm]")
        ax.set_ylabel("fibre strain ε1 [%]")
        ax.set_title("fibre-strain envelope along the span over the duty (band: min to max)")
        ax.legend(loc="best")
        return _svg(fig, "strain-envelope")


def figure_through_thickness(result: LifeResult) -> str:
    """(c) Ply-axis strain and stress through the thickness at the critical station, at the peak drive."""
    resp, c = result.response, result.critical
    peak = _peak_force(result)
    k = c.station
    present = np.flatnonzero(resp.present[k])
    with matplotlib.rc_context(STYLE):
        fig, (a1, a2) = _subplots((7.5, 4.0), 1, 2, sharey=True)
        z = resp.z[k, present] * 1e3  # (ply, face): each ply a straight segment between its faces
        for ax, field, factor in ((a1, resp.strain_12, peak * 100), (a2, resp.stress_12, peak / 1e6)):
            for comp, colour, width in ((0, PALETTE[0], 1.6), (1, PALETTE[3], 1.6), (2, PALETTE[4], 1.0)):
                values = field[k, present, :, comp] * factor
                ax.add_collection(LineCollection(np.stack([values, z], axis=-1), colors=colour, linewidths=width))
            ax.autoscale_view()
        for ax in (a1, a2):
            left, right = ax.get_xlim()
            ax.hlines(np.unique(z.ravel()), left, right, colors="#c9c3b5", lw=0.5, zorder=1)
            ax.set_xlim(left, right)
            if c.station == k:
                lo_z, hi_z = resp.z[k, c.ply - 1] * 1e3
                ax.axhspan(lo_z, hi_z, color=CRITICAL_COLOUR, alpha=0.12)
            ax.axvline(0, color="#999", lw=0.6)
            ax.grid(axis="y", visible=False)
        a1.plot([], [], color=PALETTE[0], label="ε1 / σ1 (fibre)")
        a1.plot([], [], color=PALETTE[3], label="ε2 / σ2 (transverse)")
        a1.plot([], [], color=PALETTE[4], lw=1.0, label="γ12 / τ12 (shear)")
        a1.fill_between([], [], color=CRITICAL_COLOUR, alpha=0.12, label=f"critical ply {c.ply}")
        a1.legend(loc="best")
        a1.set_xlabel("ply-axis strain [%]")
        a1.set_ylabel("z from the mid-plane [mm] (thin lines: ply boundaries)")
        a2.set_xlabel("ply-axis stress [MPa]")
        a1.set_title(f"at x = {c.x_m * 1e3:.1f} mm, peak drive force {peak:.4g} N")
        return _svg(fig, "through-thickness", wspace=0.08)


def figure_duty(result: LifeResult, cycles: pd.DataFrame) -> str:
    """(d) The drive history (min/max envelope of at most 2000 bins) and the rainflow matrix (range × mean)."""
    duty = result.design.duty
    unit, scale = drive_unit(duty.drive)
    rng = (cycles["max"] - cycles["min"]).to_numpy() * scale
    mean = 0.5 * (cycles["max"] + cycles["min"]).to_numpy() * scale
    count = cycles["count"].to_numpy(float)
    with matplotlib.rc_context(STYLE):
        env = minmax_envelope(duty.signal) if duty.signal is not None else duty.trace  # a long history: its streamed envelope
        if env is not None:
            samples = duty.signal.size if duty.signal is not None else duty.trace.samples
            fig, (a0, ax) = _subplots((7.5, 5.6), 2, 1, gridspec_kw={"height_ratios": [1, 1.5]})
            a0.fill_between(env.start, env.lo * scale, env.hi * scale, color=PALETTE[0], lw=0.4, step="post",
                            edgecolor=PALETTE[0], rasterized=True)  # thousands of vertices: a PNG inside the SVG
            a0.set_xlim(0, samples)
            a0.set_xlabel("sample number in one block")
            a0.set_ylabel(f"drive [{unit}]")
            how = "every sample" if env.start.size == samples else f"min/max of {env.start.size} bins"
            a0.set_title(f"drive history of one block ({samples} samples; {how})")
        else:
            fig, ax = _subplots((7.5, 3.8))
        nb = 24
        r_edges = np.linspace(0.0, max(rng.max(), 1e-12) * 1.0001, nb + 1)
        m_lo, m_hi = mean.min(), mean.max()
        pad = max(m_hi - m_lo, rng.max(), 1e-12) * 0.02
        m_edges = np.linspace(m_lo - pad, m_hi + pad, nb + 1)
        H, _, _ = np.histogram2d(mean, rng, bins=[m_edges, r_edges], weights=count)
        H = np.where(H > 0, H, np.nan)
        mesh = ax.pcolormesh(m_edges, r_edges, H.T, cmap="YlGnBu", norm=LogNorm(vmin=np.nanmin(H), vmax=np.nanmax(H)),
                             shading="flat", edgecolors="white", linewidth=0.3, rasterized=True)
        fig.colorbar(mesh, ax=ax, label="cycles per block")
        ax.set_xlabel(f"cycle mean [{unit}]")
        ax.set_ylabel(f"cycle range [{unit}]")
        ax.set_title(f"rainflow matrix: {float(count.sum()):.6g} cycles per block")
        ax.grid(False)
        return _svg(fig, "duty", right=0.4, hspace=0.45)


def _equivalent_amplitude(model, sa: np.ndarray, sm: np.ndarray) -> np.ndarray:
    """Each cycle's amplitude moved to the curve's R by the model's own rule (flexcycle.fatigue.meanstress functions)."""
    curve = model.curves[0]
    if model.rule == "goodman":
        return goodman_amplitude_on_ray(goodman_amplitude_at_zero_mean(sa, sm, model.Xt, model.Xc), curve.R, model.Xt, model.Xc)
    if model.rule == "gerber":
        return gerber_amplitude_on_ray(gerber_amplitude_at_zero_mean(sa, sm, model.Xt, model.Xc), curve.R, model.Xt, model.Xc)
    return sa


def figure_fatigue_curve(result: LifeResult, cycles: pd.DataFrame) -> str:
    """(e) The critical location's fatigue curve (or constant-life diagram) with the duty's cycles there."""
    locs, d = result.locations, result.design
    k = critical_index(result)
    m = int(locs.model[k])
    with matplotlib.rc_context(STYLE):
        fig, ax = _subplots((7.0, 4.0))
        if m < 0:
            ax.text(0.5, 0.5, f"no fatigue curve for {locs.mode[k]} at the critical location:\nchecked statically only",
                    ha="center", va="center", transform=ax.transAxes)
            ax.set_axis_off()
            return _svg(fig, "fatigue-curve")
        model = locs.models[m]
        strain = model.curves[0].basis == "strain"
        ys, yunit = (100.0, "%") if strain else (1e-6, "MPa")
        cyc = _table_cycles(cycles)
        s = locs.response[k] * result.force_per_drive * d.stress_factor
        a, b = s * cyc.lo, s * cyc.hi
        lo, hi = np.minimum(a, b), np.maximum(a, b)
        sa, sm = 0.5 * (hi - lo), 0.5 * (hi + lo)
        N = cycle_lives(locs, k, cyc, result.force_per_drive, d.stress_factor)
        live = sa > 0
        where = f"{locs.mode[k]}, ply {locs.ply[k] + 1}, {FACES[locs.face[k]]} face, x = {result.response.x[locs.station[k]] * 1e3:.1f} mm"
        if model.rule == "cld":
            order = sorted(model.curves, key=lambda cv: mean_ratio(cv.R))
            for i, life in enumerate([1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9]):
                amps = [float(cv.amplitude(np.array(life))) for cv in order]
                xm = [-model.Xc] + [mean_ratio(cv.R) * a_ for cv, a_ in zip(order, amps)] + [model.Xt]
                ya = [0.0] + amps + [0.0]
                ax.plot(np.array(xm) * ys, np.array(ya) * ys, color=matplotlib.colormaps["copper"](i / 7), lw=1.1, label=f"N = {life:.0e}")
            sc = ax.scatter(sm[live] * ys, sa[live] * ys, c=cyc.count[live], cmap="YlGnBu", norm=LogNorm(),
                            s=14, edgecolors="#333", linewidths=0.3, zorder=3, rasterized=live.sum() > 500)
            fig.colorbar(sc, ax=ax, label="cycles per block")
            ax.set_xlabel(f"mean [{yunit}]")
            ax.set_ylabel(f"amplitude [{yunit}]")
            ax.set_title(f"constant-life diagram at the critical location ({where})")
            ax.legend(loc="upper right", ncol=2)
            return _svg(fig, "fatigue-curve", right=0.4)
        curve = model.curves[0]
        seq = _equivalent_amplitude(model, sa, sm)
        finite = np.isfinite(N) & (N > 0) & live
        n_max = max(1e9, float(N[finite].max()) * 10 if finite.any() else 1e9)
        grid = np.logspace(0, np.log10(n_max), 200)
        ax.plot(grid, curve.amplitude(grid) * ys, color=PALETTE[0], lw=2,
                label=f"{curve.form} curve at R = {curve.R:g}" + (f", limit {curve.limit * ys:.3g} {yunit}" if curve.limit else ""))
        order = np.argsort(-seq)
        cum = np.cumsum(cyc.count[order])
        ax.step(cum, seq[order] * ys, where="post", color=PALETTE[3], lw=1.3,
                label="duty: cycles per block at or above the amplitude")
        if finite.any():
            dmg = cyc.count[finite] / N[finite]
            ax.scatter(N[finite], seq[finite] * ys, s=10 + 60 * dmg / dmg.max(), color=PALETTE[1], alpha=0.8, zorder=3,
                       label="each counted cycle at its life (size: damage)", rasterized=finite.sum() > 500)
        safe = live & np.isinf(N)
        if safe.any():
            ax.scatter(np.full(safe.sum(), n_max), seq[safe] * ys, marker="|", color="#777", s=30,
                       label="cycles below the fatigue limit (no damage)", rasterized=safe.sum() > 500)
        broken = live & (N <= 0)
        if broken.any():
            ax.scatter(np.full(broken.sum(), FIRST_LOAD_FAILURE), seq[broken] * ys, marker="x", color=CRITICAL_COLOUR,
                       label="cycles past the static strength")
        ax.set_xscale("log")
        ax.set_xlim(0.4, n_max * 1.5)
        ax.set_ylim(bottom=0)
        ax.set_xlabel("cycles N (to failure for the curve; cumulative count for the duty)")
        ax.set_ylabel(f"amplitude at R = {curve.R:g} [{yunit}]")
        ax.set_title(f"fatigue curve at the critical location ({where})", fontsize=9)
        ax.legend(loc="upper right")
        return _svg(fig, "fatigue-curve")


def figure_damage(result: LifeResult, cycles: pd.DataFrame, locations: pd.DataFrame) -> str:
    """(f) Damage per block along the span (largest per mode at each station) and by drive range at the critical location."""
    d = result.design
    unit, scale = drive_unit(d.duty.drive)
    with matplotlib.rc_context(STYLE):
        fig, (a1, a2) = _subplots((7.5, 5.8), 2, 1)
        drawn = False
        for mode, group in locations.groupby("mode"):
            per = group.groupby("x_m")["damage_per_block"].max()
            if (per > 0).any():
                a1.semilogy(per.index * 1e3, per.where(per > 0), marker=".", ms=4, label=mode)
                drawn = True
        if drawn:
            top = max(float(locations["damage_per_block"].max()), d.miner_limit)
            a1.set_ylim(top * 1e-9, top * 5)  # nine decades: smaller damage is round-off of a zero component
        else:
            a1.text(0.5, 0.5, "no location takes fatigue damage", ha="center", va="center", transform=a1.transAxes)
        _mark_drops(a1, result)
        a1.axvline(result.critical.x_m * 1e3, color=CRITICAL_COLOUR, lw=1.2, label="critical station")
        a1.axhline(d.miner_limit, color="#555", lw=0.8, ls=":", label=f"Miner limit {d.miner_limit:g}")
        a1.set_xlabel("distance from the root x [mm]")
        a1.set_ylabel("damage per block")
        a1.set_title("damage along the span (largest of each mode)")
        a1.legend(loc="best", ncol=2)
        cyc = _table_cycles(cycles)
        k = critical_index(result)
        N = cycle_lives(result.locations, k, cyc, result.force_per_drive, d.stress_factor)
        dmg = np.where(N > 0, cyc.count / np.where(N > 0, N, 1.0), cyc.count / FIRST_LOAD_FAILURE)
        rng = (cyc.hi - cyc.lo) * scale
        edges = np.linspace(0.0, max(rng.max(), 1e-12) * 1.0001, 26)
        per_bin, _ = np.histogram(rng, bins=edges, weights=dmg)
        counts, _ = np.histogram(rng, bins=edges, weights=cyc.count)
        total = per_bin.sum()
        share = per_bin / total * 100 if total > 0 else per_bin
        a2.bar(edges[:-1], share, width=np.diff(edges), align="edge", color=PALETTE[1], alpha=0.85,
               edgecolor="white", label="share of the damage [%]")
        a2.set_xlabel(f"drive range of the cycle [{unit}]")
        a2.set_ylabel("share of the damage [%]")
        a3 = a2.twinx()
        a3.spines["right"].set_visible(True)
        a3.step(edges[:-1], np.where(counts > 0, counts, np.nan), where="post", color=PALETTE[2], lw=1.2)
        a3.set_yscale("log")
        a3.set_ylabel("cycles per block (line)", color=PALETTE[2])
        a3.grid(False)
        a2.set_title("damage by cycle range at the critical location")
        return _svg(fig, "damage", right=0.7, hspace=0.45)


# The report's figures in their order, each drawn from (result, cycles, locations).
FIGURE_MAKERS: dict[str, Callable[[LifeResult, pd.DataFrame, pd.DataFrame], str]] = {
    "layup": lambda result, cycles, locations: figure_layup(result),
    "duty": lambda result, cycles, locations: figure_duty(result, cycles),
    "force-deflection": lambda result, cycles, locations: figure_force_deflection(result),
    "strain-envelope": lambda result, cycles, locations: figure_strain_envelope(result),
    "through-thickness": lambda result, cycles, locations: figure_through_thickness(result),
    "fatigue-curve": lambda result, cycles, locations: figure_fatigue_curve(result, cycles),
    "damage": lambda result, cycles, locations: figure_damage(result, cycles, locations),
}
FIGURES = tuple(FIGURE_MAKERS)


def figures(result: LifeResult, cycles: pd.DataFrame, locations: pd.DataFrame,
            names: Sequence[str] = FIGURES) -> dict[str, str]:
    """The report's figures ``names`` (of FIGURES) as inline SVG, by name; cycles and locations as for report_html."""
    return {name: FIGURE_MAKERS[name](result, cycles, locations) for name in names}


# ---------------------------------------------------------------------------------------------
# Sections

def section_identification(result: LifeResult, stamp: str) -> str:
    d = result.design
    profile = d.duty.profile_path
    rows = [
        ("title", d.title),
        ("date", stamp),
        ("tool", f"flexcycle {_tool_version()}"),
        ("design file", d.path.name if d.path else "— (built in memory)"),
        ("design file SHA-256", _sha256(d.path)),
        ("duty profile", profile.name if profile else "block table in the design file"),
        ("profile SHA-256", (d.duty.profile_sha256 or _sha256(profile)) if profile else "— (no separate file)"),
    ]
    c, s = result.critical, result.summary()
    ply = d.beam.plies[c.ply - 1]
    glance = (f"Life {_life(s['life_cycles'], 'cycles')} = {_life(s['life_blocks'], 'blocks of the duty')}"
              + (f" = {_life(s['life_days'], 'days')}" if d.duty.blocks_per_day else "")
              + f"; first failure: {c.mode}, ply {c.ply} ({ply.material.name}, {ply.angle:g}°), {c.face} face, "
              f"x = {c.x_m * 1e3:.1f} mm; static reserve {s['static_reserve']:.3g}; "
              f"{len(result.warnings)} warning{'s' if len(result.warnings) != 1 else ''}.")
    return f"""<section id="identification">
<h1>Design review: {_e(d.title)}</h1>
<p class="sub">Fatigue-life and stored-energy estimate of a flexing composite beam, written by flexcycle.</p>
<div class="glance"><b>Answer at a glance.</b> {_e(glance)}</div>
<h2>1. Identification</h2>
{_table(rows, cls="kv")}
</section>"""


def _material_value(key: str, value) -> str:
    if value is None:
        return "—"
    if key == "density":
        return f"{value:g} kg/m³"
    if key == "thickness":
        return f"{value * 1e3:g} mm"
    if key in ("nu12",):
        return f"{value:g}"
    if key.startswith("eps"):
        return f"{value * 100:.3g} %"
    if key.startswith(("E", "G")):
        return f"{value / 1e9:.4g} GPa"
    return f"{value / 1e6:.4g} MPa"


def _materials(result: LifeResult) -> str:
    out = []
    for m in result.design.materials.values():
        rows = [(key, _material_value(key, getattr(m, key, None)), src) for key, src in m.sources.items()]
        out.append(f"<h4>{_e(m.name)} <span class=\"kind\">({_e(m.kind)})</span></h4><p>{_e(m.description)}</p>")
        out.append(_table(rows, header=("value", "", "source"), cls="small"))
    return "\n".join(out)


def section_inputs(result: LifeResult, cycles: pd.DataFrame, cycle_note: str, svg: Mapping[str, str]) -> str:
    d = result.design
    beam, duty = d.beam, d.duty
    unit, scale = drive_unit(duty.drive)
    width = (f"{beam.width_root * 1e3:g} mm" if beam.width_root == beam.width_tip
             else f"{beam.width_root * 1e3:g} mm at the root → {beam.width_tip * 1e3:g} mm")
    part = [("support", beam.support), ("span", f"{beam.span * 1e3:g} mm"), ("width", width),
            ("section model", beam.section), ("laminate thickness at the root", f"{sum(p.thickness for p in beam.plies) * 1e3:.3f} mm"),
            ("plies", str(len(beam.plies))), ("stations", str(result.response.x.size))]
    if beam.load_spacing:
        part.append(("load spacing", f"{beam.load_spacing * 1e3:g} mm"))
    drops = _drop_positions(result)
    part.append(("ply drops", ", ".join(f"{x * 1e3:g} mm" for x in drops) if drops else "none"))
    lo, hi = duty.extremes
    duty_rows = [
        ("drive", f"{duty.drive} at the load point"),
        ("source", duty.source),
        ("cycles per block", f"{duty.cycles.n_total:g}"),
        ("drive range", f"{lo * scale:.4g} … {hi * scale:.4g} {unit}"),
        ("blocks per day", f"{duty.blocks_per_day:g}" if duty.blocks_per_day else "not given (no life in days)"),
        ("residue", duty.residue if duty.signal is not None else "— (block table)"),
        ("cycles.csv", cycle_note),
    ]
    top = cycles.assign(range=cycles["max"] - cycles["min"]).sort_values("range", ascending=False).head(10)
    cyc_rows = [(f"{r['min'] * scale:.4g}", f"{r['max'] * scale:.4g}", f"{r['range'] * scale:.4g}", f"{r['count']:g}",
                 f"{r['energy_j']:.4g}") for _, r in top.iterrows()]
    return f"""<section id="inputs">
<h2>2. Inputs</h2>
<h3>Beam and support</h3>
{_table(part, cls="kv")}
<h3>Ply stack (from the tension face under positive drive)</h3>
{_table(_stack_rows(beam.plies), header=("plies (count)", "material", "angle [°]", "thickness [mm]", "ends at [mm]"))}
{_figure(svg["layup"], "1", "The layup drawn along the span: each ply runs from the root to its drop (black end line); "
         "thickness is exaggerated. Below, the planform: the width along the span.")}
<h3>Materials and the source of every value</h3>
{_materials(result)}
<h3>Duty</h3>
{_table(duty_rows, cls="kv")}
{_figure(svg["duty"], "2", "The duty: one block of the drive history (decimated to a min/max envelope when long) "
         "and its rainflow matrix, cycles per block by range and mean (ASTM E1049-85 counting).")}
<h4>Largest counted cycles</h4>
{_table(cyc_rows, header=(f"min [{unit}]", f"max [{unit}]", f"range [{unit}]", "count", "energy [J]"), cls="small")}
</section>"""


def _curve_text(curve) -> str:
    slope = f"m = {curve.m:g}" if curve.form == "power" else f"b = {curve.b:g} per decade"
    basis = "strain" if curve.basis == "strain" else "stress"
    s1 = f"{curve.S1 * 100:.3g} %" if basis == "strain" else f"{curve.S1 / 1e6:.4g} MPa"
    extra = ""
    if curve.limit is not None:
        extra += ", limit " + (f"{curve.limit * 100:.3g} %" if basis == "strain" else f"{curve.limit / 1e6:.4g} MPa")
    if curve.knee is not None:
        extra += f", knee {curve.knee:.3g} cycles"
    return f"{curve.form}, {basis} basis, R = {curve.R:g}, S1 = {s1}, {slope}{extra}; source: {curve.source}"


def section_method(result: LifeResult) -> str:
    d = result.design
    locs = result.locations
    curves = []
    seen = set()
    for m in sorted(set(int(v) for v in locs.model if v >= 0)):
        rows = np.flatnonzero(locs.model == m)
        j = rows[0]
        key = (d.beam.plies[locs.ply[j]].material.name, locs.family[j])
        if key in seen:
            continue
        seen.add(key)
        model = locs.models[m]
        for cv in model.curves:
            curves.append((key[0], key[1], model.rule, _curve_text(cv)))
    choices = [
        ("theory", "linear elastic, small deflection (ASTM D790 / D6272 consistent); every local stress is the drive "
                   "times a response per unit force, so the drive is counted once"),
        ("section model", "narrow beam (free anticlastic curvature, 1/d11)" if d.beam.section == "beam"
         else "plate (cylindrical bending)"),
        ("cycle counting", "rainflow, ASTM E1049-85; residue "
         + ("as half cycles" if d.duty.residue == "half" else "closed: the block as one of a repeating duty")),
        ("mean-stress rule", RULE_NAMES.get(d.mean_stress, d.mean_stress)),
        ("damage rule", f"Palmgren–Miner linear damage sum; failure at D = {d.miner_limit:g} (Miner limit)"),
        ("stress factor", f"{d.stress_factor:g} on every local stress and strain, fatigue and static"),
    ]
    return f"""<section id="method">
<h2>3. Method and assumptions</h2>
{_table(choices, cls="kv")}
<h3>Fatigue curves used</h3>
{_table(curves, header=("material", "direction", "rule", "curve")) if curves else "<p>No fatigue curve applies: every location is checked statically only.</p>"}
<h3>Models and their sources</h3>
{_table(METHODS, header=("step", "method"))}
<h3>Limits of the models</h3>
<ul>{''.join(f"<li>{_e(x)}</li>" for x in LIMITS)}</ul>
</section>"""


def section_results(result: LifeResult, cycles: pd.DataFrame, locations: pd.DataFrame, svg: Mapping[str, str]) -> str:
    d, s, c = result.design, result.summary(), result.critical
    ply = d.beam.plies[c.ply - 1]
    life = [
        ("life in cycles", _life(s["life_cycles"], "cycles")),
        ("life in blocks of the duty", _life(s["life_blocks"], "blocks")),
        ("life in days", _life(s["life_days"], "days") + f" at {d.duty.blocks_per_day:g} blocks per day"
         if d.duty.blocks_per_day else "— (no blocks_per_day given)"),
        ("damage per block", f"{s['damage_per_block']:.3g} (Miner limit {d.miner_limit:g})"),
        ("critical", f"{c.mode}, ply {c.ply} ({ply.material.name}, {ply.angle:g}°), {c.face} face, "
                     f"x = {c.x_m * 1e3:.1f} mm, z = {c.z_m * 1e3:+.2f} mm"),
    ]
    static = [(name, "not checked" if v is None or not np.isfinite(v) else f"{v:.3g}",
               "governs" if name == result.static.criterion else "") for name, v in result.static.by_criterion.items()]
    st = result.static
    figures = [
        ("stiffness at the load point", _fmt(s["stiffness_n_per_m"], 4, 1e-3, "N/mm")),
        ("mass", _fmt(s["mass_kg"], 4, 1e3, "g")),
        ("peak fibre strain |ε1|", _fmt(s["peak_strain"], 3, 100, "%")),
        ("energy at the peak drive", _fmt(s["peak_energy_j"], 4, 1, "J")),
        ("energy in the largest cycle", _fmt(s["cycle_energy_j"], 4, 1, "J")),
        ("specific energy", _fmt(s["specific_energy_j_per_kg"], 4, 1, "J/kg")),
        ("energy-storage efficiency", f"{s['energy_efficiency']:.3f}"),
    ]
    worst = locations.sort_values("damage_per_block", ascending=False).head(10)
    loc_rows = [(f"{r.x_m * 1e3:.1f}", r.ply, r.material, r.face, r["mode"], f"{r.amplitude:.4g}", f"{r['mean']:.4g}",
                 f"{r.damage_per_block:.3g}") for _, r in worst.iterrows()]
    return f"""<section id="results">
<h2>4. Results</h2>
<h3>Life and the critical place</h3>
{_table(life, cls="kv")}
<h3>Static reserves (first-ply failure at the worst duty extreme)</h3>
<p>Smallest reserve {st.reserve:.3g} by {_e(st.criterion)} at x = {st.x_m * 1e3:.1f} mm, ply {st.ply}
({_e(st.place.mode)}), at the drive extreme {st.drive:g} (SI).</p>
{_table(static, header=("criterion", "reserve factor", ""), cls="small")}
<h3>Stiffness, mass and energy</h3>
{_table(figures, cls="kv")}
{_figure(svg["force-deflection"], "3", "Force against load-point deflection over the duty's range; the shaded area is the "
         "elastic energy stored at the peak drive, released at once if the part breaks.")}
{_figure(svg["strain-envelope"], "4", "Fibre strain along the span at the two outer faces, from the smallest to the largest "
         "drive of the duty; dashed grey lines are ply drops, the red line is the critical station.")}
{_figure(svg["through-thickness"], "5", "Ply-axis strains and stresses through the thickness at the critical station at the "
         "peak drive; thin lines are ply boundaries, the shaded band is the critical ply.")}
{_figure(svg["fatigue-curve"], "6", "The fatigue curve (or constant-life diagram) of the critical location with the "
         "duty's cycles there, each moved to the curve's R by the mean-stress rule.")}
{_figure(svg["damage"], "7", "Miner damage per block along the span, and the share of the critical "
         "location's damage by drive range of the cycles.")}
<h3>Most damaged locations</h3>
<p>Amplitude and mean of the largest cycle, in the basis of the location's curve (Pa or strain).</p>
{_table(loc_rows, header=("x [mm]", "ply", "material", "face", "mode", "amplitude", "mean", "damage/block"), cls="small")}
</section>"""


def section_sizing(sizing: Sequence[tuple[str, str, str]] | None) -> str:
    """The rows of a sizing run (quantity, before, after), or nothing."""
    if not sizing:
        return ""
    return f"""<section id="sizing">
<h3>Sizing</h3>
{_table(sizing, header=("quantity", "before", "after"), cls="small")}
</section>"""


def section_warnings(result: LifeResult) -> str:
    warn = "".join(f"<li>{_e(w)}</li>" for w in result.warnings) or "<li>none</li>"
    return f'<section id="warnings"><h2>5. Warnings</h2><ul class="warn">{warn}</ul></section>'


def section_cautions(result: LifeResult) -> str:
    items = "".join(f"<li>{_e(x)}</li>" for x in CAUTIONS)
    return f"""<section id="cautions"><h2>6. Cautions</h2>
<div class="caution"><p><b>Caution.</b> {_e(CAUTION)}</p><ul>{items}</ul>
<p>Peak stored energy of this part: {result.storage.energy:.4g} J.</p></div></section>"""


def section_signoff() -> str:
    rows = "".join(f"<tr><th>{role}</th><td></td><td></td><td></td></tr>"
                   for role in ("prepared by", "reviewed by", "approved by"))
    checks = "".join(f"<li>☐ {_e(x)}</li>" for x in (
        "inputs checked against the drawing and the duty measurement",
        "material values marked recalled or default replaced by tested data",
        "warnings above read and resolved or accepted",
        "prototype fatigue test plan agreed",
    ))
    return f"""<section id="signoff"><h2>7. Review and sign-off</h2>
<ul class="checks">{checks}</ul>
<table class="sign"><tr><th></th><th>name</th><th>signature</th><th>date</th></tr>{rows}</table>
<p>Comments:</p><div class="comments"></div></section>"""


CSS = """
:root { --ink: #24231f; --muted: #6b6457; --rule: #d8d2c4; --accent: #0b6e6e; --warm: #fbf3e4; }
body { font-family: system-ui, -apple-system, "Segoe UI", sans-serif; max-width: 980px; margin: 2em auto;
       padding: 0 1.2em; color: var(--ink); line-height: 1.45; font-size: 15px }
h1 { font-size: 1.6em; margin-bottom: 0.1em; color: var(--accent) }
.sub { color: var(--muted); margin-top: 0 }
h2 { border-bottom: 2px solid var(--accent); margin-top: 2em; padding-bottom: 0.15em; font-size: 1.3em }
h3 { margin-top: 1.4em; font-size: 1.08em } h4 { margin: 1em 0 0.2em }
.kind { color: var(--muted); font-weight: normal }
table { border-collapse: collapse; margin: 0.5em 0 0.8em; font-size: 0.93em }
td, th { border: 1px solid var(--rule); padding: 3px 8px; text-align: left; vertical-align: top }
th { background: #f1eee6 } table.kv td:first-child { color: var(--muted); white-space: nowrap }
table.small { font-size: 0.85em } td { overflow-wrap: break-word }
.glance { background: #e8f2f1; border-left: 5px solid var(--accent); padding: 0.6em 1em; margin: 1em 0 }
.caution { background: var(--warm); border-left: 5px solid #c8861d; padding: 0.3em 1em }
.warn li { color: #7a3300 } .checks { list-style: none; padding-left: 0.5em }
figure { margin: 1.2em 0; break-inside: avoid; page-break-inside: avoid }
figure svg { max-width: 100%; height: auto; display: block }
figcaption { font-size: 0.9em; color: var(--muted); margin-top: 0.3em }
table.sign { width: 100% } table.sign td { height: 2.4em; width: 28% }
.comments { border: 1px solid var(--rule); height: 6em }
@media print {
  body { max-width: none; margin: 0; font-size: 10pt }
  h2 { break-after: avoid; page-break-after: avoid } h3, h4 { break-after: avoid; page-break-after: avoid }
  #results, #signoff { break-before: page; page-break-before: always }
  table, .caution, .glance { break-inside: avoid; page-break-inside: avoid }
  figure svg { max-height: 9.5in }
  @page { size: A4; margin: 15mm }
}
"""


def report_html(result: LifeResult, cycles: pd.DataFrame, cycle_note: str, locations: pd.DataFrame,
                sizing: Sequence[tuple[str, str, str]] | None = None, svg: Mapping[str, str] | None = None) -> str:
    """Render the design-review report.

    cycles : pd.DataFrame — the counted cycles as in cycles.csv (min, max, count, energy_j; SI)
    cycle_note : str — how cycles.csv holds them
    locations : pd.DataFrame — the locations table as in locations.csv
    sizing : optional rows (quantity, before, after), strings, shown right after the results
    svg : the figures already drawn (`figures`), by name; None draws them here
    """
    if svg is None:
        svg = figures(result, cycles, locations)
    stamp = datetime.now(UTC).strftime("%Y-%m-%d %H:%M UTC")
    body = "\n".join([
        section_identification(result, stamp),
        section_inputs(result, cycles, cycle_note, svg),
        section_method(result),
        section_results(result, cycles, locations, svg),
        section_sizing(sizing),
        section_warnings(result),
        section_cautions(result),
        section_signoff(),
    ])
    return f"""<!DOCTYPE html>
<html lang="en"><head><meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>flexcycle design review — {_e(result.design.title)}</title>
<style>{CSS}</style></head><body>
{body}
<p class="sub">flexcycle {_e(_tool_version())} · {stamp}</p>
</body></html>
"""
