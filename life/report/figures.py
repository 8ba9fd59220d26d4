"""The design-review report's figures, each a function of the estimate that returns a matplotlib Figure.

Read top to bottom: layup, force–deflection, deformed shapes, strain envelope, through-thickness, duty, fatigue curve, damage,
then the registry ``FIGURE_MAKERS`` (name → maker of (result, cycles, locations)) in the report's order. Each
figure is drawn in the shared style (``flexcycle.report.style``) with fixed margins; turning it into SVG is the
page's business (``flexcycle.report.page``).
"""
from __future__ import annotations

from collections.abc import Callable

import matplotlib
import numpy as np
import pandas as pd
from matplotlib.collections import LineCollection
from matplotlib.colors import LogNorm
from matplotlib.figure import Figure
from matplotlib.patches import Rectangle

from flexcycle.display import SI, Display, from_where
from flexcycle.estimate import LifeResult
from flexcycle.fatigue.damage import FACES, FIRST_LOAD_FAILURE, cycle_lives
from flexcycle.fatigue.meanstress import (
    gerber_amplitude_at_zero_mean,
    gerber_amplitude_on_ray,
    goodman_amplitude_at_zero_mean,
    goodman_amplitude_on_ray,
    mean_ratio,
)
from flexcycle.fatigue.scatter import survival_z
from flexcycle.report.data import (
    critical_index,
    cycles_of_table,
    drop_positions,
    force_deflection,
    peak_force,
    span_envelope,
)
from flexcycle.report.style import CRITICAL_COLOUR, DROP_COLOUR, PALETTE, STYLE, arrange, figure_with_axes
from flexcycle.spectra.streaming import minmax_envelope


def _mark_drops(ax, result: LifeResult, label: bool = True, display: Display = SI) -> None:
    """Dashed vertical lines at the ply drops (x in the display's length unit); the first labelled "ply drop"
    when ``label``."""
    for k, x in enumerate(drop_positions(result)):
        ax.axvline(x * display.scale("position"), color=DROP_COLOUR, lw=0.9, ls=(0, (4, 3)), label="ply drop" if (label and k == 0) else None)


LAYUP_SIZE = (7.5, 4.6)  # inch; the stack's axes take about 80 % of the width and 2.1 inch of the height


def layup_exaggeration(result: LifeResult) -> float:
    """How many times the layup figure stretches the thickness against the length (1: drawn to scale) [-]."""
    beam = result.design.beam
    height = float(np.max(result.response.thickness))
    axes_width, axes_height = 0.8 * LAYUP_SIZE[0], 2.1  # inch, as laid out by figure_layup
    return (axes_height / height) / (axes_width / beam.length)


def figure_layup(result: LifeResult, display: Display = SI) -> Figure:
    """Side view of the stack along the span (each ply to its drop, the plies above a drop closing over it)
    and the planform (width taper)."""
    beam, response = result.design.beam, result.response
    scale = display.scale("position")
    unit = display.unit("position")
    L = beam.length * scale
    materials = list(dict.fromkeys(p.material.name for p in beam.plies))
    colour = {name: PALETTE[i % len(PALETTE)] for i, name in enumerate(materials)}
    with matplotlib.rc_context(STYLE):
        fig, (a1, a2) = figure_with_axes(LAYUP_SIZE, 2, 1, sharex=True, gridspec_kw={"height_ratios": [3, 1.4]})
        top = 0.0
        for seg in np.unique(response.segment):  # each stretch between drops: its plies stacked without gaps
            rows = np.flatnonzero(response.segment == seg)
            x0, x1 = response.x[rows].min() * scale, response.x[rows].max() * scale
            k = rows[0]
            present = np.flatnonzero(response.present[k])
            base = response.z[k, present[0], 0]
            for j in present:
                p = beam.plies[j]
                z0, z1 = (response.z[k, j] - base) * scale
                shade = 0.95 if p.angle % 180 == 0 else 0.55
                a1.add_patch(Rectangle((x0, z0), x1 - x0, z1 - z0, facecolor=colour[p.material.name], alpha=shade,
                                       edgecolor="white", lw=0.6))
                top = max(top, z1)
        for x in drop_positions(result):
            a1.axvline(x * scale, color="k", lw=1.0)
        a1.set_xlim(-0.02 * L, 1.02 * L)
        a1.set_ylim(-0.05 * top, 1.05 * top)
        a1.set_ylabel(f"height from the tension face [{unit}]")
        factor = layup_exaggeration(result)
        how = f"thickness exaggerated ×{factor:.3g}" if factor > 1.5 else "drawn to scale"
        a1.set_title(f"stack along the span ({how}); pale = off-axis ply")
        for name in materials:
            a1.add_patch(Rectangle((0, 0), 0, 0, facecolor=colour[name], label=name))
        a1.text(0.99, 0.02, "tension face under positive drive ↓", transform=a1.transAxes, ha="right", va="bottom",
                fontsize=7.5, color="#555")
        a1.legend(loc="lower right", bbox_to_anchor=(1.0, 1.06), ncol=min(3, len(materials)))
        x = np.linspace(0, beam.length, 50)
        half = beam.width(x) * scale / 2
        a2.fill_between(x * scale, -half, half, color=PALETTE[2], alpha=0.35, lw=0)
        a2.plot(x * scale, half, color=PALETTE[2]), a2.plot(x * scale, -half, color=PALETTE[2])
        a2.set_ylabel(f"width [{unit}]")
        a2.set_xlabel(f"distance {from_where(beam.support)} x [{unit}]")
        a2.set_title("planform", fontsize=9)
        _mark_drops(a2, result, label=False, display=display)
        return arrange(fig, top=0.6, hspace=0.35)


def figure_force_deflection(result: LifeResult, display: Display = SI) -> Figure:
    """(a) Force against load-point deflection over the duty's range, the energy at the peak drive shaded; under
    large deflection the elastica's curve with the small-deflection line beside it."""
    fd = force_deflection(result)
    lo, hi = result.design.duty.extremes
    large = result.theory == "large-deflection"
    peak = peak_force(result)
    mapping = result.drive_response
    with matplotlib.rc_context(STYLE):
        fig, ax = figure_with_axes((6.2, 3.6))
        length, force = display.scale("deflection"), display.scale("force")
        label = (f"elastica; secant {display.both(result.summary()['secant_stiffness_n_per_m'], 'stiffness')} at the peak"
                 if large else f"k = {display.both(result.response.stiffness, 'stiffness')}")
        ax.plot(fd.deflection * length, fd.force * force, color=PALETTE[0], label=label)
        if large:
            line = force_deflection(result, linear=True)
            ax.plot(line.deflection * length, line.force * force, color=PALETTE[4], ls="--", lw=1.0,
                    label=f"linear theory, k = {display.both(result.response.stiffness, 'stiffness')}")
        # the stored energy ∫F dδ: the area under the curve from zero to the peak drive
        to_peak = (fd.force * np.sign(peak) >= 0) & (np.abs(fd.force) <= abs(peak) * (1 + 1e-12))
        ax.fill_between(fd.deflection[to_peak] * length, 0, fd.force[to_peak] * force, color=PALETTE[3], alpha=0.35,
                        label=f"stored at the peak drive: U = {display.both(result.storage.energy, 'energy')}")
        for d in sorted({lo, hi}):
            if mapping is not None:
                ax.plot(mapping.deflection(d)[0] * length, mapping.force(d)[0] * force, "o", color=PALETTE[1], ms=5)
            else:
                force_per_drive, C = result.force_per_drive, result.response.compliance
                ax.plot(d * force_per_drive * C * length, d * force_per_drive * force, "o", color=PALETTE[1], ms=5)
        ax.plot([], [], "o", color=PALETTE[1], ms=5, label="duty extremes")
        ax.axhline(0, color="#999", lw=0.6), ax.axvline(0, color="#999", lw=0.6)
        ax.set_xlabel(f"load-point deflection δ [{display.unit('deflection')}]")
        ax.set_ylabel(f"load-point force F [{display.unit('force')}]")
        ax.set_title("force–deflection over the duty (" + ("large deflection, the elastica)" if large
                                                           else "linear theory)"))
        ax.legend(loc="upper left", bbox_to_anchor=(1.01, 1.0))
        return arrange(fig, right=2.4)


def figure_deformed_shapes(result: LifeResult, display: Display = SI) -> Figure:
    """(a′) The deformed part drawn to scale (equal axes) at several drive levels up to the largest of the duty.

    Under large deflection the elastica's shapes (the end moves along the load and toward the clamp); under linear
    theory the small-deflection line y(x) = ∫∫M/EI dx² scaled to the load-point deflection (no pull-in)."""
    lo, hi = result.design.duty.extremes
    top = hi if abs(hi) >= abs(lo) else lo
    levels = top * np.array([0.25, 0.5, 0.75, 1.0])
    beam = result.design.beam
    mapping = result.drive_response
    length = display.scale("deflection")
    unit, scale = drive_display(result.design.duty.drive, display)
    with matplotlib.rc_context(STYLE):
        fig, ax = figure_with_axes((7.0, 4.2))
        ax.plot([0, beam.length * length], [0, 0], color="#999", lw=1.0, ls=":", label="unloaded")
        if mapping is not None and mapping.large:
            shapes = mapping.shapes(levels)
            for k, d in enumerate(levels):
                ax.plot(shapes.x[k] * length, shapes.y[k] * length, color=PALETTE[k % len(PALETTE)], lw=1.6,
                        label=f"drive {d * scale:.3g} {unit}: F = {display.value(mapping.force(d)[0], 'force')}")
            title = "deformed shapes to scale (the elastica)"
        else:
            response = result.response
            x = response.x
            rotation = np.concatenate([[0.0], np.cumsum(0.5 * (response.curvature[1:] + response.curvature[:-1])
                                                        * np.diff(x))])
            # κx per unit force is negative for a positive moment (Mx = −m/b): the deflection along the load is −∫∫κ
            shape = -np.concatenate([[0.0], np.cumsum(0.5 * (rotation[1:] + rotation[:-1]) * np.diff(x))])
            per_force = response.compliance / shape[-1] if shape[-1] else 1.0  # scaled to the load-point deflection
            for k, d in enumerate(levels):
                f = d * result.force_per_drive
                ax.plot(x * length, shape * per_force * f * length, color=PALETTE[k % len(PALETTE)], lw=1.6,
                        label=f"F = {display.value(f, 'force')}")
            title = "deflected line to scale (linear theory: no pull-in)"
        ax.set_aspect("equal", adjustable="datalim")
        ax.set_xlabel(f"along the unloaded beam x [{display.unit('deflection')}]")
        ax.set_ylabel(f"along the load y [{display.unit('deflection')}]")
        ax.set_title(title)
        ax.legend(loc="best")
        return arrange(fig)


def figure_strain_envelope(result: LifeResult, display: Display = SI) -> Figure:
    """(b) Fibre strain ε1 along the span at both outer faces, over the whole duty; drops and critical marked."""
    envelope = span_envelope(result)
    c = result.critical
    x = envelope.x * display.scale("position")
    with matplotlib.rc_context(STYLE):
        fig, ax = figure_with_axes((7.5, 3.6))
        ax.fill_between(x, envelope.bottom[:, 0] * 100, envelope.bottom[:, 1] * 100, color=PALETTE[0], alpha=0.35, lw=0)
        ax.plot(x, envelope.bottom[:, 1] * 100, color=PALETTE[0], lw=1.2, label="bottom face (ply 1 side)")
        ax.plot(x, envelope.bottom[:, 0] * 100, color=PALETTE[0], lw=1.2)
        ax.fill_between(x, envelope.top[:, 0] * 100, envelope.top[:, 1] * 100, color=PALETTE[2], alpha=0.30, lw=0)
        ax.plot(x, envelope.top[:, 0] * 100, color=PALETTE[2], lw=1.2, ls="--", label="top face")
        ax.plot(x, envelope.top[:, 1] * 100, color=PALETTE[2], lw=1.2, ls="--")
        ax.axhline(0, color="#999", lw=0.6)
        _mark_drops(ax, result, display=display)
        ax.axvline(c.x_m * display.scale("position"), color=CRITICAL_COLOUR, lw=1.4,
                   label=f"critical: {c.mode},\nply {c.ply}, {c.face} face")
        ax.set_xlabel(f"distance {from_where(result.design.beam.support)} x [{display.unit('position')}]")
        ax.set_ylabel("fibre strain ε1 [%]")
        ax.set_title("fibre-strain envelope along the span over the duty (band: min to max)")
        ax.legend(loc="upper left", bbox_to_anchor=(1.01, 1.0))  # beside the axes: never over a curve
        return arrange(fig, right=2.0)


def figure_through_thickness(result: LifeResult, display: Display = SI) -> Figure:
    """(c) Ply-axis strain and stress through the thickness at the critical station, at the peak drive, with
    the transverse shear τxz (interlaminar, or a core's shear) beside the in-plane stresses."""
    response, c = result.response, result.critical
    peak = peak_force(result)
    k = c.station
    present = np.flatnonzero(response.present[k])
    fields, per = response, peak  # linear: the response per unit force times the peak force
    mapping = result.drive_response
    if mapping is not None and mapping.large:  # the elastica's fields at the peak drive
        lo, hi = result.design.duty.extremes
        fields, per = mapping.fields(hi if abs(hi) >= abs(lo) else lo), 1.0
    with matplotlib.rc_context(STYLE):
        fig, (a1, a2) = figure_with_axes((7.5, 4.6), 1, 2, sharey=True)
        zs = display.scale("position")
        stress = display.scale("stress")
        z = response.z[k, present] * zs  # (ply, face): each ply a straight segment between its faces
        for ax, field, factor in ((a1, fields.strain_12, per * 100), (a2, fields.stress_12, per * stress)):
            for comp, colour, width in ((0, PALETTE[0], 1.6), (1, PALETTE[3], 1.6), (2, PALETTE[4], 1.0)):
                values = field[k, present, :, comp] * factor
                ax.add_collection(LineCollection(np.stack([values, z], axis=-1), colors=colour, linewidths=width))
            ax.autoscale_view()
        # τxz through each ply: bottom face, interior peak (the neutral axis when inside), top face
        tau_z = np.stack([response.z[k, present, 0], response.z_tau_peak[k, present], response.z[k, present, 1]], axis=1) * zs
        tau = np.stack([fields.tau_xz[k, present, 0], fields.tau_xz_peak[k, present], fields.tau_xz[k, present, 1]],
                       axis=1) * per * stress
        order = np.argsort(tau_z, axis=1)
        tau_z, tau = np.take_along_axis(tau_z, order, 1), np.take_along_axis(tau, order, 1)
        a2.add_collection(LineCollection(np.stack([tau, tau_z], axis=-1), colors=PALETTE[5], linewidths=1.3,
                                         linestyles="--"))
        a2.autoscale_view()
        for ax in (a1, a2):
            left, right = ax.get_xlim()
            ax.hlines(np.unique(z.ravel()), left, right, colors="#c9c3b5", lw=0.5, zorder=1)
            ax.set_xlim(left, right)
            if c.station == k:
                lo_z, hi_z = response.z[k, c.ply - 1] * zs
                ax.axhspan(lo_z, hi_z, color=CRITICAL_COLOUR, alpha=0.12)
            ax.axvline(0, color="#999", lw=0.6)
            ax.grid(axis="y", visible=False)
        a1.plot([], [], color=PALETTE[0], label="ε1 / σ1 (fibre)")
        a1.plot([], [], color=PALETTE[3], label="ε2 / σ2 (transverse)")
        a1.plot([], [], color=PALETTE[4], lw=1.0, label="γ12 / τ12 (shear)")
        a1.plot([], [], color=PALETTE[5], lw=1.3, ls="--", label="τxz (interlaminar or core shear)")
        a1.fill_between([], [], color=CRITICAL_COLOUR, alpha=0.12, label=f"critical ply {c.ply}")
        fig.legend(*a1.get_legend_handles_labels(), loc="lower center", ncol=3, bbox_to_anchor=(0.5, 0.0))
        a1.set_xlabel("ply-axis strain [%]")
        a1.set_ylabel(f"z from the mid-plane [{display.unit('position')}] (thin lines: ply boundaries)")
        a2.set_xlabel(f"ply-axis stress [{display.unit('stress')}] (dashed: τxz)")
        a1.set_title(f"at x = {display.value(c.x_m, 'position')} {from_where(result.design.beam.support)}, "
                     f"peak drive force {display.value(peak, 'force')}")
        return arrange(fig, wspace=0.08, bottom=1.25)


def figure_duty(result: LifeResult, cycles: pd.DataFrame, display: Display = SI) -> Figure:
    """(d) The drive history (min/max envelope of at most 2000 bins) and the rainflow matrix (range × mean)."""
    duty = result.design.duty
    unit, scale = drive_display(duty.drive, display)
    ranges = (cycles["max"] - cycles["min"]).to_numpy() * scale
    mean = 0.5 * (cycles["max"] + cycles["min"]).to_numpy() * scale
    count = cycles["count"].to_numpy(float)
    with matplotlib.rc_context(STYLE):
        envelope = minmax_envelope(duty.signal) if duty.signal is not None else duty.envelope  # a long history: its streamed envelope
        if envelope is not None:
            samples = duty.signal.size if duty.signal is not None else duty.envelope.samples
            fig, (a0, ax) = figure_with_axes((7.5, 5.6), 2, 1, gridspec_kw={"height_ratios": [1, 1.5]})
            a0.fill_between(envelope.start, envelope.lo * scale, envelope.hi * scale, color=PALETTE[0], lw=0.4, step="post",
                            edgecolor=PALETTE[0], rasterized=True)  # thousands of vertices: drawn as one image
            a0.set_xlim(0, samples)
            a0.set_xlabel("sample number in one block")
            a0.set_ylabel(f"drive [{unit}]")
            how = "every sample" if envelope.start.size == samples else f"min/max of {envelope.start.size} bins"
            a0.set_title(f"drive history of one block ({samples} samples; {how})")
        else:
            fig, ax = figure_with_axes((7.5, 3.8))
        nb = 24
        r_edges = np.linspace(0.0, max(ranges.max(), 1e-12) * 1.0001, nb + 1)
        m_lo, m_hi = mean.min(), mean.max()
        pad = max(m_hi - m_lo, ranges.max(), 1e-12) * 0.02
        m_edges = np.linspace(m_lo - pad, m_hi + pad, nb + 1)
        H, _, _ = np.histogram2d(mean, ranges, bins=[m_edges, r_edges], weights=count)
        H = np.where(H > 0, H, np.nan)
        mesh = ax.pcolormesh(m_edges, r_edges, H.T, cmap="YlGnBu", norm=LogNorm(vmin=np.nanmin(H), vmax=np.nanmax(H)),
                             shading="flat", edgecolors="white", linewidth=0.3, rasterized=True)
        fig.colorbar(mesh, ax=ax, label="cycles per block")
        ax.set_xlabel(f"cycle mean [{unit}]")
        ax.set_ylabel(f"cycle range [{unit}]")
        ax.set_title(f"rainflow matrix: {float(count.sum()):.6g} cycles per block")
        ax.grid(False)
        return arrange(fig, right=0.4, hspace=0.45)


def _equivalent_amplitude(model, sa: np.ndarray, sm: np.ndarray) -> np.ndarray:
    """Each cycle's amplitude moved to the curve's R by the model's own rule (flexcycle.fatigue.meanstress functions)."""
    curve = model.curves[0]
    if model.rule == "goodman":
        return goodman_amplitude_on_ray(goodman_amplitude_at_zero_mean(sa, sm, model.Xt, model.Xc), curve.R, model.Xt, model.Xc)
    if model.rule == "gerber":
        return gerber_amplitude_on_ray(gerber_amplitude_at_zero_mean(sa, sm, model.Xt, model.Xc), curve.R, model.Xt, model.Xc)
    return sa


def _scatter_band(ax, curve, survival: float, ys: float) -> None:
    """The median curve's scatter band, log10 N ± 2·sd (about 95 % of lives under log-normal scatter), and the
    median curve itself where the curve drawn is one at another survival (flexcycle.fatigue.scatter)."""
    sd = curve.sd_log10N
    amplitudes = curve.amplitude(np.logspace(0, 12, 200))
    amplitudes = amplitudes[amplitudes > (curve.limit or 0.0)]
    median = curve.log_cycles(amplitudes) + survival_z(survival) * sd
    with np.errstate(over="ignore"):
        ax.fill_betweenx(amplitudes * ys, 10.0 ** (median - 2 * sd), 10.0 ** (median + 2 * sd), color=PALETTE[0],
                         alpha=0.12, lw=0, label=f"scatter band, median ± 2 sd (sd_log10N = {sd:.3g})")
        if survival != 0.5:
            ax.plot(10.0 ** median, amplitudes * ys, color=PALETTE[0], lw=1, ls="--", label="median curve")


def figure_fatigue_curve(result: LifeResult, cycles: pd.DataFrame, display: Display = SI) -> Figure:
    """(e) The critical location's fatigue curve (or constant-life diagram) with the duty's cycles there."""
    locations, d = result.locations, result.design
    k = critical_index(result)
    m = int(locations.model[k])
    with matplotlib.rc_context(STYLE):
        fig, ax = figure_with_axes((7.0, 4.0))
        if m < 0:
            ax.text(0.5, 0.5, f"no fatigue curve for {locations.mode[k]} at the critical location:\nchecked statically only",
                    ha="center", va="center", transform=ax.transAxes)
            ax.set_axis_off()
            return arrange(fig)
        model = locations.models[m]
        strain = model.curves[0].basis == "strain"
        ys, yunit = (100.0, "%") if strain else (display.scale("stress"), display.unit("stress"))
        counted = cycles_of_table(cycles)
        a = locations.local(np.array([k]), counted.lo, result.force_per_drive, d.stress_factor)[0]
        b = locations.local(np.array([k]), counted.hi, result.force_per_drive, d.stress_factor)[0]
        lo, hi = np.minimum(a, b), np.maximum(a, b)
        sa, sm = 0.5 * (hi - lo), 0.5 * (hi + lo)
        N = cycle_lives(locations, k, counted, result.force_per_drive, d.stress_factor)
        live = sa > 0
        where = (f"{locations.mode[k]}, ply {locations.ply[k] + 1}, {FACES[locations.face[k]]} face, "
                 f"x = {display.value(result.response.x[locations.station[k]], 'position')}")
        if model.rule == "cld":
            order = sorted(model.curves, key=lambda cv: mean_ratio(cv.R))
            for i, life in enumerate([1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9]):
                amps = [float(cv.amplitude(np.array(life))) for cv in order]
                xm = [-model.Xc] + [mean_ratio(cv.R) * a_ for cv, a_ in zip(order, amps)] + [model.Xt]
                ya = [0.0] + amps + [0.0]
                ax.plot(np.array(xm) * ys, np.array(ya) * ys, color=matplotlib.colormaps["copper"](i / 7), lw=1.1, label=f"N = {life:.0e}")
            sc = ax.scatter(sm[live] * ys, sa[live] * ys, c=counted.count[live], cmap="YlGnBu", norm=LogNorm(),
                            s=14, edgecolors="#333", linewidths=0.3, zorder=3, rasterized=live.sum() > 500)
            fig.colorbar(sc, ax=ax, label="cycles per block")
            ax.set_xlabel(f"mean [{yunit}]")
            ax.set_ylabel(f"amplitude [{yunit}]")
            ax.set_title(f"constant-life diagram at the critical location ({where})")
            ax.legend(loc="upper left", bbox_to_anchor=(1.25, 1.0))
            return arrange(fig, right=1.9)
        curve = model.curves[0]
        seq = _equivalent_amplitude(model, sa, sm)
        finite = np.isfinite(N) & (N > 0) & live
        n_max = max(1e9, float(N[finite].max()) * 10 if finite.any() else 1e9)
        grid = np.logspace(0, np.log10(n_max), 200)
        at = "" if d.survival == 0.5 else f" at survival {d.survival:g}"
        ax.plot(grid, curve.amplitude(grid) * ys, color=PALETTE[0], lw=2,
                label=f"{curve.form} curve at R = {curve.R:g}{at if curve.sd_log10N is not None else ''}"
                + (f", limit {curve.limit * ys:.3g} {yunit}" if curve.limit else ""))
        if curve.sd_log10N:
            _scatter_band(ax, curve, d.survival, ys)
        order = np.argsort(-seq[live])
        cumulative = np.cumsum(counted.count[live][order])
        levels = seq[live][order] * ys
        if levels.size:  # from N = 0.5: a constant-amplitude duty (one level) is a visible line, not a lone point
            ax.step(np.r_[0.5, cumulative], np.r_[levels, levels[-1:]], where="post", color=PALETTE[3], lw=1.3,
                    label="duty: cycles per block at or\nabove the amplitude")
        if finite.any():
            damage = counted.count[finite] / N[finite]
            ax.scatter(N[finite], seq[finite] * ys, s=10 + 60 * damage / damage.max(), color=PALETTE[1], alpha=0.8, zorder=3,
                       label="each counted cycle at its\nlife (size: damage)", rasterized=finite.sum() > 500)
        safe = live & np.isinf(N)
        if safe.any():
            ax.scatter(np.full(safe.sum(), n_max), seq[safe] * ys, marker="|", color="#777", s=30,
                       label="cycles below the fatigue\nlimit (no damage)", rasterized=safe.sum() > 500)
        broken = live & (N <= 0)
        if broken.any():
            ax.scatter(np.full(broken.sum(), FIRST_LOAD_FAILURE), seq[broken] * ys, marker="x", color=CRITICAL_COLOUR,
                       label="cycles past the static\nstrength")
        ax.set_xscale("log")
        ax.set_xlim(0.4, n_max * 1.5)
        ax.set_ylim(bottom=0)
        ax.set_xlabel("cycles N (to failure for the curve; cumulative count for the duty)")
        ax.set_ylabel(f"amplitude at R = {curve.R:g} [{yunit}]")
        ax.set_title(f"fatigue curve at the critical location ({where})", fontsize=9)
        ax.legend(loc="upper left", bbox_to_anchor=(1.01, 1.0), fontsize=7.5)  # beside the axes: never over a curve
        return arrange(fig, right=2.3)


def figure_damage(result: LifeResult, cycles: pd.DataFrame, locations: pd.DataFrame, display: Display = SI) -> Figure:
    """(f) Damage per block along the span (largest per mode at each station) and by drive range at the critical location."""
    d = result.design
    unit, scale = drive_display(d.duty.drive, display)
    xs = display.scale("position")
    with matplotlib.rc_context(STYLE):
        fig, (a1, a2) = figure_with_axes((7.5, 5.8), 2, 1)
        drawn = False
        for mode, group in locations.groupby("mode"):
            per = group.groupby("x_m")["damage_per_block"].max()
            if (per > 0).any():
                a1.semilogy(per.index * xs, per.where(per > 0), marker=".", ms=4, label=mode)
                drawn = True
        if drawn:
            top = max(float(locations["damage_per_block"].max()), d.miner_limit)
            a1.set_ylim(top * 1e-9, top * 5)  # nine decades: smaller damage is round-off of a zero component
        else:
            a1.text(0.5, 0.5, "no location takes fatigue damage", ha="center", va="center", transform=a1.transAxes)
        _mark_drops(a1, result, display=display)
        a1.axvline(result.critical.x_m * xs, color=CRITICAL_COLOUR, lw=1.2, label="critical station")
        a1.axhline(d.miner_limit, color="#555", lw=0.8, ls=":", label=f"Miner limit {d.miner_limit:g}")
        a1.set_xlabel(f"distance {from_where(d.beam.support)} x [{display.unit('position')}]")
        a1.set_ylabel("damage per block")
        a1.set_title("damage along the span (largest of each mode)")
        a1.legend(loc="upper left", bbox_to_anchor=(1.01, 1.0))  # beside the axes: never over a curve
        counted = cycles_of_table(cycles)
        k = critical_index(result)
        N = cycle_lives(result.locations, k, counted, result.force_per_drive, d.stress_factor)
        damage = np.where(N > 0, counted.count / np.where(N > 0, N, 1.0), counted.count / FIRST_LOAD_FAILURE)
        ranges = (counted.hi - counted.lo) * scale
        edges = np.linspace(0.0, max(ranges.max(), 1e-12) * 1.0001, 26)
        per_bin, _ = np.histogram(ranges, bins=edges, weights=damage)
        counts, _ = np.histogram(ranges, bins=edges, weights=counted.count)
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
        return arrange(fig, right=1.9, hspace=0.45)


def drive_display(drive: str, display: Display) -> tuple[str, float]:
    """The unit and the scale of a drive (deflection or force) in the display's units."""
    kind = "deflection" if drive == "deflection" else "force"
    return display.unit(kind), display.scale(kind)


def figure_spectrum(result: LifeResult, display: Display = SI) -> Figure:
    """(d2) A PSD duty: the spectrum (log-log) with a third of the first bending frequency, and the range
    distribution of both methods (the one used drawn heavy); a strain in µε, a force or deflection in the
    display's units."""
    from flexcycle.spectra.spectral import range_density

    duty = result.design.duty
    spec, spectral = duty.spectral.spectrum, duty.spectral.spectral
    unit, scale = ("µε", 1e6) if duty.measured == "strain" else drive_display(duty.drive, display)
    m = spectral.moments
    with matplotlib.rc_context(STYLE):
        fig, (a0, a1) = figure_with_axes((7.5, 5.8), 2, 1, gridspec_kw={"height_ratios": [1, 1]})
        shown = (spec.frequency > 0) & (spec.density > 0)
        a0.loglog(spec.frequency[shown], spec.density[shown] * scale**2, color=PALETTE[0], lw=1.2)
        top = float(spec.density.max()) * scale**2
        a0.set_ylim(top * 1e-6, top * 3)  # six decades: the tails of a fitted shape would squeeze the rest
        if result.first_mode is not None:
            third = result.first_mode.frequency / 3
            a0.axvline(third, color=CRITICAL_COLOUR, lw=1.0, ls="--",
                       label=f"a third of the first bending frequency, {third:.4g} Hz")
            a0.legend(loc="lower left")
        a0.set_xlabel("frequency [Hz]")
        a0.set_ylabel(f"PSD [{unit}²/Hz]")
        a0.set_title(f"one-sided PSD: rms {m.rms * scale:.4g} {unit}, irregularity γ = {m.irregularity:.3f}")
        S = np.linspace(0.0, 2.0 * spectral.largest_peak * 1.25, 400)
        for k, method in enumerate(("dirlik", "narrow-band")):
            used = method == spectral.method
            a1.semilogy(S * scale, range_density(S, m, method) / scale, color=PALETTE[k], lw=2.0 if used else 1.0,
                        ls="-" if used else ":", label=f"{method}{' (used)' if used else ''}")
        peak_density = float(range_density(S, m, spectral.method).max()) / scale
        a1.set_ylim(peak_density * 1e-8, peak_density * 3)  # the tail, where the damage is, in view
        a1.set_xlabel(f"cycle range [{unit}]")
        a1.set_ylabel(f"probability density [1/{unit}]")
        a1.set_title(f"range distribution: {spectral.rate * spectral.duration:.6g} cycles per block "
                     f"({spectral.rate:.4g} per second)")
        a1.legend(loc="upper right")
        return arrange(fig, hspace=0.5)


FIGURE_APPLIES: dict[str, Callable[[LifeResult], bool]] = {  # figures drawn only for some duties
    "spectrum": lambda result: result.design.duty.spectral is not None,
}

# The report's figures in their order, each drawn from (result, cycles, locations) in the display's units.
FIGURE_MAKERS: dict[str, Callable[..., Figure]] = {
    "layup": lambda result, cycles, locations, display=SI: figure_layup(result, display),
    "duty": lambda result, cycles, locations, display=SI: figure_duty(result, cycles, display),
    "spectrum": lambda result, cycles, locations, display=SI: figure_spectrum(result, display),
    "force-deflection": lambda result, cycles, locations, display=SI: figure_force_deflection(result, display),
    "deformed-shapes": lambda result, cycles, locations, display=SI: figure_deformed_shapes(result, display),
    "strain-envelope": lambda result, cycles, locations, display=SI: figure_strain_envelope(result, display),
    "through-thickness": lambda result, cycles, locations, display=SI: figure_through_thickness(result, display),
    "fatigue-curve": lambda result, cycles, locations, display=SI: figure_fatigue_curve(result, cycles, display),
    "damage": lambda result, cycles, locations, display=SI: figure_damage(result, cycles, locations, display),
}
FIGURES = tuple(FIGURE_MAKERS)

