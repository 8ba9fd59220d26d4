"""fit.html: the page of ``flexcycle fit`` — the coupons, the fitted curves and their statistics, one
self-contained HTML file in the report's figure style (inline SVG; nothing fetched from outside).

Figures: (a) amplitude against cycles — failures as dots, runouts as arrows pointing to longer lives,
the median curve, the confidence band of the median line and the design curve, one colour per R;
(b) the residuals of log10 N about each median line against the amplitude.
"""
from __future__ import annotations

from datetime import UTC, datetime

import matplotlib
import numpy as np
from matplotlib.figure import Figure

from flexcycle.caution import CAUTION
from flexcycle.fatigue.fit import LEAST_SQUARES, CurveFit, FitResult
from flexcycle.report.sections import escape_html, figure_html, table_html, tool_version
from flexcycle.report.style import PALETTE, STYLE, arrange, figure_with_axes, to_svg
from flexcycle.report.texts import CSS

RUNOUT_ARROW = 3.0  # a runout's arrow reaches this many times its cycles (it survived at least that far)


def _display(fit: CurveFit, unit: str, scale: float) -> tuple[float, str]:
    """Display factor (per SI unit) and unit of the amplitudes: the coupons' unit, or % for strain."""
    return (100.0, "%") if fit.basis == "strain" else (1.0 / scale, unit)


def figure_fit(result: FitResult) -> Figure:
    """(a) The coupons and the fitted curves, amplitude against cycles."""
    c = result.coupons
    with matplotlib.rc_context(STYLE):
        fig, ax = figure_with_axes((7.0, 4.6))
        for i, fit in enumerate(result.curves):
            colour = PALETTE[i % len(PALETTE)]
            k, unit = _display(fit, c.unit, c.scale)
            label = f"R = {fit.R:g}"
            failed = ~fit.runout
            ax.scatter(fit.cycles[failed], fit.amplitude[failed] * k, s=22, color=colour, zorder=3,
                       label=f"{label}: failures ({fit.n_failures})")
            for n, a in zip(fit.cycles[fit.runout], fit.amplitude[fit.runout]):
                ax.annotate("", xy=(n * RUNOUT_ARROW, a * k), xytext=(n, a * k),
                            arrowprops={"arrowstyle": "->", "color": colour, "lw": 1.2})
            if fit.n_runouts:
                ax.scatter(fit.cycles[fit.runout], fit.amplitude[fit.runout] * k, s=22, facecolors="white",
                           edgecolors=colour, zorder=3, label=f"{label}: runouts ({fit.n_runouts}), arrows")
            levels = np.linspace(fit.amplitude.min() * 0.85, fit.amplitude.max() * 1.1, 120)
            median = fit.A + fit.B * fit.x_of(levels)
            lower, upper = fit.median_band(levels)
            ax.plot(10.0 ** median, levels * k, color=colour, lw=1.8, label=f"{label}: median curve")
            ax.fill_betweenx(levels * k, 10.0 ** lower, 10.0 ** upper, color=colour, alpha=0.15, lw=0,
                             label=f"{label}: {fit.band_confidence:.0%} band of the median line")
            design = fit.design
            ax.plot(10.0 ** (design.A + fit.B * fit.x_of(levels)), levels * k, color=colour, lw=1.3, ls="--",
                    label=f"{label}: design curve ({design.survival:.0%}/{design.confidence:.0%})")
        ax.set_xscale("log")
        if result.curves[0].form == "power":
            ax.set_yscale("log")
        ax.set_xlabel("cycles N")
        k, unit = _display(result.curves[0], c.unit, c.scale)
        ax.set_ylabel(f"{'strain' if c.basis == 'strain' else 'stress'} amplitude [{unit}]")
        ax.set_title(f"coupons of {c.path.name} and the fitted {result.curves[0].form} curves")
        ax.legend(loc="lower left", fontsize=7)
        return arrange(fig)


def figure_residuals(result: FitResult) -> Figure:
    """(b) Residuals of log10 N about each median line (a runout's is a lower bound: an open marker)."""
    c = result.coupons
    with matplotlib.rc_context(STYLE):
        fig, ax = figure_with_axes((7.0, 2.8))
        for i, fit in enumerate(result.curves):
            colour = PALETTE[i % len(PALETTE)]
            k, unit = _display(fit, c.unit, c.scale)
            e = fit.residuals()
            failed = ~fit.runout
            ax.scatter(fit.amplitude[failed] * k, e[failed], s=18, color=colour, label=f"R = {fit.R:g}")
            if fit.n_runouts:
                ax.scatter(fit.amplitude[fit.runout] * k, e[fit.runout], s=18, facecolors="white", edgecolors=colour,
                           label=f"R = {fit.R:g} runouts (lower bounds)")
            for sign in (-1.0, 1.0):
                ax.axhline(sign * fit.sd, color=colour, lw=0.8, ls=":")
        ax.axhline(0.0, color="#6b6457", lw=0.8)
        k, unit = _display(result.curves[0], c.unit, c.scale)
        ax.set_xlabel(f"amplitude [{unit}]")
        ax.set_ylabel("log10 N − median [decades]")
        ax.set_title("residuals about the median lines (dotted: ± sd_log10N)")
        ax.legend(loc="upper right", fontsize=7)
        return arrange(fig)


def _rows(result: FitResult) -> list[tuple]:
    c = result.coupons
    rows = []
    for fit in result.curves:
        k, unit = _display(fit, c.unit, c.scale)
        slope = f"m = {fit.curve.m:.4g}" if fit.form == "power" else f"b = {fit.curve.b:.4g}"
        design_slope = f"m = {fit.design.curve.m:.4g}" if fit.form == "power" else f"b = {fit.design.curve.b:.4g}"
        linearity = "—"
        if fit.lack_of_fit is not None:
            t = fit.lack_of_fit
            linearity = (f"F = {t.F:.3g} vs F_crit = {t.F_critical:.3g} ({t.dof[0]}, {t.dof[1]} dof): "
                         + ("straight line not rejected" if t.linear else "straight line REJECTED"))
        rows.append((
            f"{fit.R:g}", fit.method, f"{fit.n_failures} / {fit.n_runouts}",
            f"S1 = {fit.curve.S1 * k:.4g} {unit}, {slope}", f"{fit.sd:.4g}",
            "—" if fit.r_squared is None else f"{fit.r_squared:.4f}", linearity,
            f"k = {fit.design.k:.4g}: S1 = {fit.design.curve.S1 * k:.4g} {unit}, {design_slope}",
        ))
    return rows


def fit_html(result: FitResult) -> str:
    """The fit page as one self-contained HTML document."""
    c = result.coupons
    stamp = datetime.now(UTC).strftime("%Y-%m-%d %H:%M UTC")
    first = result.curves[0]
    header = ("R", "method", "failures / runouts", "median curve", "sd_log10N", "R²", "test of the straight line",
              f"design curve ({first.design.survival:.3g} survival, {first.design.confidence:.3g} confidence)")
    level = (f"column {c.level_column!r} as the cycle's amplitude" if c.level_kind == "amplitude"
             else f"column {c.level_column!r} as the cycle's peak, amplitude = peak·|1 − R|/(2·max(1, |R|))")
    methods = {fit.method for fit in result.curves}
    notes = []
    if LEAST_SQUARES in methods:
        notes.append("Least squares (ASTM E739): log10 N on the level, sd with n − 2 degrees of freedom; the band "
                     "of the median line is E739's band for the whole line, √(2F(2, n − 2)) wide in standard errors.")
    if len(methods - {LEAST_SQUARES}):
        notes.append("Maximum likelihood: log10 N normal about the line, runouts right-censored (their likelihood "
                     "is 1 − Φ(z)); sd is the maximum-likelihood estimate; the band is the pointwise Wald band.")
    notes.append("Design curve: the median line's slope with log10 N lowered by k·sd, k the one-sided normal "
                 "tolerance factor t'_γ(n − 2; z_p·√n)/√n of the failures (NIST/SEMATECH e-Handbook, 7.2.6.3).")
    body = "\n".join([
        f"<h1>Fatigue curve fit — {escape_html(c.path.name)}</h1>",
        f'<p class="sub">{len(c.cycles)} coupons; {escape_html(level)} in {escape_html(c.unit)} '
        f"({c.basis} basis); cycles from column {escape_html(repr(c.cycles_column))}"
        + (f"; runouts from column {escape_html(repr(c.runout_column))}" if c.runout_column else "; no runout column")
        + f"; SHA-256 {c.sha256}</p>",
        "<h2>Fitted curves</h2>",
        table_html(_rows(result), header, cls="small"),
        "<ul>" + "".join(f"<li>{escape_html(n)}</li>" for n in notes) + "</ul>",
        figure_html(to_svg(figure_fit(result), "fit"), "1",
                    "Coupons (dots: failures; open circles with arrows: runouts, which survived at least that far), "
                    "median curves, the confidence band of the median line (shaded) and the design curves (dashed)."),
        figure_html(to_svg(figure_residuals(result), "residuals"), "2",
                    "Residuals of log10 N about the median lines; a pattern against the level says the form does not "
                    "fit (try the other --form)."),
        "<h2>Coupons</h2>",
        table_html([(int(c.row[i]), f"{c.R[i]:g}", f"{_display(first, c.unit, c.scale)[0] * c.amplitude[i]:.5g}",
                     f"{c.cycles[i]:.6g}", "runout" if c.runout[i] else "failed") for i in range(c.cycles.size)],
                   ("row", "R", f"amplitude [{_display(first, c.unit, c.scale)[1]}]", "cycles", ""), cls="small"),
        f'<p class="caution">{escape_html(CAUTION)} A curve fitted to coupons describes those coupons: the part\'s '
        "laminate, process, size and environment may differ.</p>",
    ])
    return f"""<!DOCTYPE html>
<html lang="en"><head><meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>flexcycle fit — {escape_html(c.path.name)}</title>
<style>{CSS}</style></head><body>
{body}
<p class="sub">flexcycle {escape_html(tool_version())} · {stamp}</p>
</body></html>
"""
