"""Output files of ``flexcycle fit``: fit.json (the fitted numbers, SI), curve.toml (a fatigue table to paste
into a design file) and fit.html (the data and curves, ``flexcycle.report.fit_page``).
"""
from __future__ import annotations

import json
import math

import tomlkit

from flexcycle.fatigue.damage import MODE_TABLES
from flexcycle.fatigue.fit import LEAST_SQUARES, CurveFit, FitResult

DIGITS = 10  # significant digits of curve.toml's numbers: the life read from it moves by under m·5e-10


def curve_record(fit: CurveFit) -> dict:
    """The fit.json object of one curve: the contract keys (form, R, S1 [SI], m or b, sd_log10N, n_failures,
    n_runouts, method, design {survival, confidence, k, S1, m or b}) and the statistics behind them."""
    slope = "m" if fit.form == "power" else "b"
    record = {
        "form": fit.form,
        "R": fit.R,
        "basis": fit.basis,
        "S1": fit.curve.S1,
        slope: getattr(fit.curve, slope),
        "sd_log10N": fit.sd,
        "n_failures": fit.n_failures,
        "n_runouts": fit.n_runouts,
        "method": fit.method,
        "design": {
            "survival": fit.design.survival,
            "confidence": fit.design.confidence,
            "k": fit.design.k,
            "S1": fit.design.curve.S1,
            slope: getattr(fit.design.curve, slope),
            "intercept_log10N": fit.design.A,
        },
        "intercept_log10N": fit.A,
        "slope_log10N": fit.B,
        "regression_variable": "log10 amplitude [SI]" if fit.form == "power" else "amplitude [SI]",
        "standard_error_intercept": math.sqrt(fit.covariance[0, 0]),
        "standard_error_slope": math.sqrt(fit.covariance[1, 1]),
        "sd_degrees_of_freedom": fit.dof if fit.method == LEAST_SQUARES else None,
        "r_squared": fit.r_squared,
        "log_likelihood": fit.log_likelihood,
        "lack_of_fit": None if fit.lack_of_fit is None else {
            "F": fit.lack_of_fit.F, "F_critical": fit.lack_of_fit.F_critical, "p_value": fit.lack_of_fit.p_value,
            "levels": fit.lack_of_fit.levels, "dof": list(fit.lack_of_fit.dof), "linear": fit.lack_of_fit.linear,
        },
        "amplitude_min": float(fit.amplitude.min()),
        "amplitude_max": float(fit.amplitude.max()),
        "cycles_min": float(fit.cycles.min()),
        "cycles_max": float(fit.cycles.max()),
    }
    return record


def fit_json(result: FitResult) -> str:
    """fit.json: one curve's record at the top level; with several R, ``curves`` (one record per R, ascending)
    and ``R_values`` instead, the shared keys (form, basis, n_failures, n_runouts, method) at the top."""
    c = result.coupons
    data = {
        "file": c.path.name,
        "sha256": c.sha256,
        "level_column": c.level_column,
        "level_kind": c.level_kind,
        "unit": c.unit,
        "cycles_column": c.cycles_column,
        "runout_column": c.runout_column,
    }
    records = [curve_record(fit) for fit in result.curves]
    if len(records) == 1:
        doc = {**records[0], "data": data}
    else:
        methods = sorted({r["method"] for r in records})
        doc = {"form": records[0]["form"], "basis": records[0]["basis"], "R_values": [r["R"] for r in records],
               "n_failures": sum(r["n_failures"] for r in records), "n_runouts": sum(r["n_runouts"] for r in records),
               "method": methods[0] if len(methods) == 1 else "; ".join(methods), "curves": records, "data": data}
    return json.dumps(doc, indent=2, allow_nan=False) + "\n"


def _amplitude_text(value: float, fit: CurveFit, unit: str, scale: float) -> str:
    """An amplitude as the design file writes it: in the coupons' unit (stress), as a percent (strain)."""
    if fit.basis == "strain":
        return f"{100.0 * value:.{DIGITS}g} %"
    return f"{value / scale:.{DIGITS}g} {unit}"


def _curve_lines(fit: CurveFit, curve, unit: str, scale: float, with_sd: bool) -> list[str]:
    slope = "m" if fit.form == "power" else "b"
    lines = [
        f"form = {tomlkit.item(fit.form).as_string()}",
        f"R = {fit.R:g}",
        f"S1 = {tomlkit.item(_amplitude_text(curve.S1, fit, unit, scale)).as_string()}",
        f"{slope} = {getattr(curve, slope):.{DIGITS}g}",
    ]
    if with_sd:
        lines.append(f"sd_log10N = {fit.sd:.{DIGITS}g}")
    lines.append(f"source = {tomlkit.item(curve.source).as_string()}")
    return lines


def curve_toml(result: FitResult, material: str = "fitted", mode: str = "fibre") -> str:
    """curve.toml: the median curve(s) with their scatter, as the fatigue table ``mode`` of ``[material.NAME]``,
    and the design curve(s) below, commented out.

    material : str — the material's name in the design file; mode : str — a key of MODE_TABLES
    """
    c = result.coupons
    table = MODE_TABLES[mode]
    unit = c.unit if c.basis == "stress" else "%"
    several = len(result.curves) > 1
    key = tomlkit.key(material).as_string()
    head = [
        f"# Fatigue curve{'s' if several else ''} fitted by flexcycle fit to {c.path.name} "
        f"(SHA-256 {c.sha256[:12]}…), {c.basis} basis.",
        "# Median curve with its scatter sd_log10N: [fatigue] survival = 0.9 in the design file then gives",
        "# lives that 90 % of parts reach. Paste this into the design file; [material.NAME] needs its static",
        "# keys too (E1, E2, G12, nu12, density, Xt, Xc, Yt, Yc, S12), or NAME a library material to override.",
    ]
    if several:
        head.append('# One curve per stress ratio: with [fatigue] mean_stress = "cld" they form a constant-life diagram.')
    lines = head + [""]

    def block(design: bool) -> list[str]:
        out = []
        if several:
            for fit in result.curves:
                out.append(f"[[material.{key}.{table}.curves]]")
                out += _curve_lines(fit, fit.design.curve if design else fit.curve, unit, c.scale, not design)
                out.append("")
        else:
            fit = result.curves[0]
            out.append(f"[material.{key}.{table}]")
            out += _curve_lines(fit, fit.design.curve if design else fit.curve, unit, c.scale, not design)
            out.append("")
        return out

    lines += block(design=False)
    first = result.curves[0].design
    lines += [
        f"# The design curve{'s' if several else ''} ({first.survival:.3g} survival with {first.confidence:.3g} "
        "confidence, the same slope,",
        "# log10 N lowered by k·sd): to use instead of the median table above (replace it), leaving",
        "# survival = 0.5 in the design's fatigue table, as the curve is already a lower bound.",
    ]
    lines += ["# " + line if line else "" for line in block(design=True)]
    return "\n".join(lines).rstrip("\n") + "\n"


def render_fit(result: FitResult, material: str = "fitted", mode: str = "fibre") -> dict[str, str]:
    """fit.json, curve.toml and fit.html as text, keyed by file name."""
    from flexcycle.report.fit_page import fit_html

    return {
        "fit.json": fit_json(result),
        "curve.toml": curve_toml(result, material, mode),
        "fit.html": fit_html(result),
    }
