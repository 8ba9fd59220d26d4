"""The design-review report's HTML sections, in reading order: identification, inputs, method and
assumptions, results, sizing, warnings, cautions, review and sign-off; with the small HTML and number
helpers they share. Every string that comes from the user (title, material names, file names, warnings that
quote them) goes through ``escape_html``; the figures come in already drawn, as inline SVG by name.
"""
from __future__ import annotations

import hashlib
import html
from collections.abc import Mapping, Sequence
from importlib import metadata
from pathlib import Path

import numpy as np
import pandas as pd

from flexcycle.caution import CAUTION
from flexcycle.display import SI, Display, format_number, from_where, per_day
from flexcycle.estimate import LifeResult
from flexcycle.fatigue.scatter import survival_z
from flexcycle.report.data import drop_positions
from flexcycle.report.figures import drive_display, layup_exaggeration
from flexcycle.report.texts import CAUTIONS, LARGE_DEFLECTION_LIMIT, LIMITS, METHODS, RULE_NAMES, THEORY_TEXT
from flexcycle.requirement import verdict_of, verdict_text

# ---------------------------------------------------------------------------------------------
# Small helpers


def escape_html(value) -> str:
    """``str(value)`` with the HTML markup characters escaped (&, <, >, quotes)."""
    return html.escape(str(value))


def figure_html(svg: str, number: str, caption: str) -> str:
    """A numbered <figure> holding an inline SVG element and its caption."""
    return (f'<figure id="fig-{number}">{svg}<figcaption><b>Figure {number}.</b> {escape_html(caption)}'
            "</figcaption></figure>")


def table_html(rows, header=None, cls: str = "") -> str:
    """An HTML table of the rows (each a sequence of cells), with an optional header row and CSS class."""
    out = [f'<table class="{cls}">' if cls else "<table>"]
    if header:
        out.append("<tr>" + "".join(f"<th>{escape_html(h)}</th>" for h in header) + "</tr>")
    for row in rows:
        out.append("<tr>" + "".join(f"<td>{escape_html(c)}</td>" for c in row) + "</tr>")
    out.append("</table>")
    return "\n".join(out)


def quantity(value: float | None, unit: str = "", scale: float = 1.0, digits: int = 4) -> str:
    """The report's one number format: ``value × scale`` to ``digits`` significant digits, then the unit;
    None (no bound) is "unbounded"."""
    if value is None:
        return "unbounded"
    return f"{value * scale:.{digits}g} {unit}".strip()


def life_text(value: float | None, unit: str) -> str:
    """A life in ``unit`` (cycles, blocks, days) in words where it has no number: unbounded, or zero."""
    if value is None:
        return "unbounded (no damaging cycle)"
    if value == 0:
        return f"0 {unit} (fails at first loading)"
    return quantity(value, unit, digits=3)


def file_sha256(path: Path | None) -> str:
    """The SHA-256 of the file's bytes in hex, or a dash when there is no file or it cannot be read."""
    if path is None:
        return "—"
    try:
        return hashlib.sha256(Path(path).read_bytes()).hexdigest()
    except OSError:
        return "— (file not readable when the report was written)"


def tool_version() -> str:
    """flexcycle's installed version."""
    try:
        return metadata.version("flexcycle")
    except metadata.PackageNotFoundError:
        return "unknown (not installed)"


def stack_rows(plies, display: Display = SI) -> list[tuple]:
    """One row per run of identical consecutive plies: numbers (count), material, angle, thickness, drop."""
    runs: list[list] = []  # [first, last, cells]
    for k, p in enumerate(plies, start=1):
        cells = (p.material.name, f"{p.angle:g}", display.pair(p.thickness, "thickness"),
                 "—" if p.ends_at is None else display.pair(p.ends_at, "position"))
        if runs and runs[-1][2] == cells:
            runs[-1][1] = k
        else:
            runs.append([k, k, cells])
    return [(f"{a}" if a == b else f"{a}–{b} ({b - a + 1})",) + cells for a, b, cells in runs]


# ---------------------------------------------------------------------------------------------
# Sections

def section_identification(result: LifeResult, stamp: str, display: Display = SI) -> str:
    d = result.design
    profile = d.duty.profile_path
    rows = [
        ("title", d.title),
        ("date", stamp),
        ("tool", f"flexcycle {tool_version()}"),
        ("design file", d.path.name if d.path else "— (built in memory)"),
        ("design file SHA-256", file_sha256(d.path)),
        ("duty profile", profile.name if profile else "block table in the design file"),
        ("profile SHA-256", (d.duty.profile_sha256 or file_sha256(profile)) if profile else "— (no separate file)"),
    ]
    c, s = result.critical, result.summary()
    ply = d.beam.plies[c.ply - 1]
    reserve = "not checked" if s["static_reserve"] is None else f"{s['static_reserve']:.3g}"
    glance = (f"Life {life_text(s['life_cycles'], 'cycles')} = {life_text(s['life_blocks'], 'blocks of the duty')}"
              + (f" = {life_text(s['life_days'], 'days')}" if d.duty.blocks_per_day else "")
              + f"; first failure: {c.mode}, ply {c.ply} ({ply.material.name}, {ply.angle:g}°), {c.face} face, "
              f"x = {display.both(c.x_m, 'position')} {from_where(d.beam.support)}; static reserve {reserve}; "
              f"{len(result.warnings)} warning{'s' if len(result.warnings) != 1 else ''}.")
    verdict, line = verdict_of(result), verdict_text(result)
    verdict_html = "" if verdict is None else (
        f'<div class="verdict {"meets" if verdict.meets_requirement else "short"}"><b>Verdict.</b> '
        f"{escape_html(line)}</div>\n")
    return f"""<section id="identification">
<h1>Design review: {escape_html(d.title)}</h1>
<p class="sub">Fatigue-life and stored-energy estimate of a flexing composite beam, written by flexcycle.
{"Inch-pound units, with SI in parentheses; the data files stay SI." if display.us else ""}</p>
{verdict_html}<div class="glance"><b>Answer at a glance.</b> {escape_html(glance)}</div>
<h2>1. Identification</h2>
{table_html(rows, cls="kv")}
</section>"""


def _material_value(key: str, value, display: Display = SI) -> str:
    if value is None:
        return "—"
    if key == "density":
        return display.both(value, "density")
    if key == "thickness":
        return display.both(value, "thickness")
    if key in ("nu12",):
        return f"{value:g}"
    if key.startswith("eps"):
        return f"{value * 100:.3g} %"
    if key.startswith(("E", "G")):
        return display.both(value, "modulus")
    return display.both(value, "stress")


def _materials(result: LifeResult, display: Display = SI) -> str:
    out = []
    for m in result.design.materials.values():
        rows = [(key, _material_value(key, getattr(m, key, None), display), src) for key, src in m.sources.items()]
        out.append(f"<h4>{escape_html(m.name)} <span class=\"kind\">({escape_html(m.kind)})</span></h4><p>{escape_html(m.description)}</p>")
        out.append(table_html(rows, header=("value", "", "source"), cls="small"))
    return "\n".join(out)


def section_inputs(result: LifeResult, cycles: pd.DataFrame, cycle_note: str, svg: Mapping[str, str],
                   display: Display = SI) -> str:
    d = result.design
    beam, duty = d.beam, d.duty
    unit, scale = drive_display(duty.drive, display)
    root = "mid-span" if beam.support in ("three-point", "four-point") else "the root"
    width = (display.both(beam.width_root, "length") if beam.width_root == beam.width_tip
             else f"{display.both(beam.width_root, 'length')} at {root} → {display.both(beam.width_tip, 'length')}")
    part = [("support", beam.support), ("span", display.both(beam.span, "length")), ("width", width),
            ("section model", beam.section),
            (f"laminate thickness at {root}", display.both(sum(p.thickness for p in beam.plies), "length")),
            ("plies", str(len(beam.plies))), ("stations", str(result.response.x.size))]
    if beam.load_spacing:
        part.append(("load spacing", display.both(beam.load_spacing, "length")))
    drops = drop_positions(result)
    part.append(("ply drops", ", ".join(display.both(x, "position") for x in drops) + f" {from_where(beam.support)}"
                 if drops else "none"))
    lo, hi = duty.extremes
    duty_rows = [
        ("drive", f"{duty.drive} at the load point"),
        ("source", duty.source),
        ("cycles per block", f"{duty.cycles.n_total:g}"),
        ("drive range", f"{display.drive(lo, duty.drive)} … {display.drive(hi, duty.drive)}"),
        ("blocks per day", f"{duty.blocks_per_day:g}" if duty.blocks_per_day else "not given (no life in days)"),
        ("residue", duty.residue if duty.signal is not None else "— (block table)"),
        ("cycles.csv", cycle_note),
    ]
    duty_rows += _measured_rows(duty)
    top = cycles.assign(range=cycles["max"] - cycles["min"]).sort_values("range", ascending=False).head(10)
    cyc_rows = [(f"{r['min'] * scale:.4g}", f"{r['max'] * scale:.4g}", f"{r['range'] * scale:.4g}", f"{r['count']:g}",
                 display.pair(r["energy_j"], "energy")) for _, r in top.iterrows()]
    factor = layup_exaggeration(result)
    how = f"thickness is exaggerated ×{factor:.3g}" if factor > 1.5 else "thickness and length are drawn to scale"
    return f"""<section id="inputs">
<h2>2. Inputs</h2>
<h3>Beam and support</h3>
{table_html(part, cls="kv")}
<h3>Ply stack (from the tension face under positive drive)</h3>
{table_html(stack_rows(beam.plies, display), header=("plies (count)", "material", "angle [°]",
                                                    display.header("thickness", "thickness"),
                                                    display.header(f"ends at ({from_where(beam.support)})", "position")))}
{figure_html(svg["layup"], "1", f"The layup drawn along the span: each ply runs from {root} to its drop (black line), "
         f"the plies above closing over it; {how}. Below, the planform: the width along the span.")}
<h3>Materials and the source of every value</h3>
{_materials(result, display)}
<h3>Duty</h3>
{table_html(duty_rows, cls="kv")}
{figure_html(svg["duty"], "2", "The duty: one block of the drive history (decimated to a min/max envelope when long) "
         "and its rainflow matrix, cycles per block by range and mean (ASTM E1049-85 counting).")}
{_spectrum_figure(duty, svg)}
<h4>Largest counted cycles</h4>
{table_html(cyc_rows, header=(f"min [{unit}]", f"max [{unit}]", f"range [{unit}]", "count",
                              display.header("energy", "energy")), cls="small")}
</section>"""


def _measured_rows(duty) -> list[tuple[str, str]]:
    """Rows of the duty table for a PSD duty (moments, irregularity, method, rates) and a strain gauge."""
    rows = []
    if duty.gauge is not None:
        g = duty.gauge
        rows.append(("measured", f"strain at a gauge, x = {g.x * 1e3:g} mm, {g.face} face"
                     + (f", ply {g.ply}" if g.ply else "") + "; turned into load-point force"))
    if duty.spectral is not None:
        s = duty.spectral.spectral
        m = s.moments
        rows += [("spectral moments (SI)", f"m0 = {m.m0:.4g}, m1 = {m.m1:.4g}, m2 = {m.m2:.4g}, m4 = {m.m4:.4g}"),
                 ("irregularity factor γ", f"{m.irregularity:.4f} (1: narrow band)"),
                 ("range distribution", f"{s.method}; {s.rate:.4g} cycles per second, {s.duration:g} s per block"),
                 ("expected largest excursion", f"± {s.largest_peak:.4g} (SI) about the mean {s.mean:.4g} in one block "
                                                "(Davenport 1964)")]
    return rows


def _spectrum_figure(duty, svg: Mapping[str, str]) -> str:
    if duty.spectral is None or "spectrum" not in svg:
        return ""
    return figure_html(svg["spectrum"], "2b", "The duty's vibration spectrum (one-sided PSD, log-log) with a third of "
                       "the part's first bending frequency marked, and the distribution of cycle ranges it implies "
                       "(Dirlik 1985; narrow band: Rayleigh, Bendat 1964). Both assume a stationary Gaussian process.")


def _curve_text(curve, display: Display = SI) -> str:
    slope = f"m = {curve.m:g}" if curve.form == "power" else f"b = {curve.b:g} per decade"
    basis = "strain" if curve.basis == "strain" else "stress"
    s1 = f"{curve.S1 * 100:.3g} %" if basis == "strain" else display.both(curve.S1, "stress")
    extra = ""
    if curve.limit is not None:
        extra += ", limit " + (f"{curve.limit * 100:.3g} %" if basis == "strain" else display.both(curve.limit, "stress"))
    if curve.knee is not None:
        extra += f", knee {curve.knee:.3g} cycles"
    if curve.sd_log10N is not None:
        extra += f", sd_log10N = {curve.sd_log10N:.3g} decades"
    return f"{curve.form}, {basis} basis, R = {curve.R:g}, S1 = {s1}, {slope}{extra}; source: {curve.source}"


def _limits(theory: str) -> list[str]:
    """The models' limits; under large deflection the small-deflection limit gives way to the elastica's."""
    if theory != "large-deflection":
        return LIMITS
    return [LARGE_DEFLECTION_LIMIT] + LIMITS[1:]


def section_method(result: LifeResult, display: Display = SI) -> str:
    d = result.design
    locations = result.locations
    curves = []
    seen = set()
    for m in sorted(set(int(v) for v in locations.model if v >= 0)):
        rows = np.flatnonzero(locations.model == m)
        j = rows[0]
        key = (d.beam.plies[locations.ply[j]].material.name, locations.family[j])
        if key in seen:
            continue
        seen.add(key)
        model = locations.models[m]
        for cv in model.curves:
            curves.append((key[0], key[1], model.rule, _curve_text(cv, display)))
    choices = [
        ("theory", THEORY_TEXT["large-deflection"] if d.theory == "large-deflection" else THEORY_TEXT["linear"]),
        ("section model", "narrow beam (free anticlastic curvature, 1/d11)" if d.beam.section == "beam"
         else "plate (cylindrical bending)"),
        ("cycle counting", "rainflow, ASTM E1049-85; residue "
         + ("as half cycles" if d.duty.residue == "half" else "closed: the block as one of a repeating duty")),
        ("mean-stress rule", RULE_NAMES.get(d.mean_stress, d.mean_stress)),
        ("damage rule", f"Palmgren–Miner linear damage sum; failure at D = {d.miner_limit:g} (Miner limit)"),
        ("stress factor", f"{d.stress_factor:g} on every local stress and strain, fatigue and static"),
        ("survival", "0.5: the curves as median curves" if d.survival == 0.5 else
         f"{d.survival:g}: every curve with a scatter sd_log10N lowered to N_p = N_median·10^(−z_p·sd), "
         f"z_p = {survival_z(d.survival):.4f}, curve by curve (the curves below are those at this survival); "
         "a curve without sd_log10N stays a median curve (a warning says so)"),
    ]
    return f"""<section id="method">
<h2>3. Method and assumptions</h2>
{table_html(choices, cls="kv")}
<h3>Design values of the materials</h3>
{_factor_table(d)}
<h3>Fatigue curves used</h3>
{table_html(curves, header=("material", "direction", "rule", "curve")) if curves else "<p>No fatigue curve applies: every location is checked statically only.</p>"}
<h3>Models and their sources</h3>
{table_html(METHODS, header=("step", "method"))}
<h3>Limits of the models</h3>
<ul>{''.join(f"<li>{escape_html(x)}</li>" for x in _limits(d.theory))}</ul>
</section>"""


def _location_cells(locations: pd.DataFrame) -> tuple[list[tuple], str]:
    """Amplitude and mean of the most damaged locations in MPa (stress-basis curves) or % (strain-basis),
    and the unit for the header: one unit when the rows share it, else each cell carries its own."""
    units = {"stress": ("MPa", 1e-6), "strain": ("%", 100.0), "none": ("MPa", 1e-6)}
    shared = set(locations["basis"]) if "basis" in locations else {"stress"}
    one = len({units[b][0] for b in shared}) == 1
    cells = []
    for _, r in locations.iterrows():
        unit, scale = units.get(r.get("basis", "stress"), ("MPa", 1e-6))
        tail = "" if one else f" {unit}"
        cells.append((f"{r.amplitude * scale:.4g}{tail}", f"{r['mean'] * scale:.4g}{tail}"))
    header = units[next(iter(shared))][0] if one and shared else "MPa or %"
    return cells, header


def _factor_table(design) -> str:
    """Every factor on each material's values and their products (flexcycle.fatigue.factors)."""
    rows = []
    for name, f in design.factors.items():
        causes = "; ".join(f"{cause}: " + ", ".join(f"{prop} {value:g}" for prop, value in table.items())
                           for cause, table in f.knockdowns.items()) or "none"
        rows.append((name, f"{f.static_strength_factor:g}", f"{f.fatigue_strength_factor:g}", causes,
                     f"{f.strength:.4g}", f"{f.fatigue_strength:.4g}", f"{f.stiffness:.4g}"))
    note = ("<p>Static strengths (and ultimate strains) × Π(strength knock-downs)/γ_s; fatigue-curve amplitudes × "
            "Π(fatigue knock-downs)/γ_f; moduli × Π(stiffness knock-downs); the load's stress factor "
            f"{design.stress_factor:g} comes on top. Values shown elsewhere in this report are design values.</p>")
    return note + table_html(rows, header=("material", "γ_s static", "γ_f fatigue", "environmental knock-downs",
                                           "× strengths", "× fatigue strength", "× stiffness"), cls="small")


def section_results(result: LifeResult, cycles: pd.DataFrame, locations: pd.DataFrame, svg: Mapping[str, str],
                    display: Display = SI) -> str:
    d, s, c = result.design, result.summary(), result.critical
    ply = d.beam.plies[c.ply - 1]
    where = from_where(d.beam.support)
    life = [
        ("life in cycles", life_text(s["life_cycles"], "cycles")),
        ("life in blocks of the duty", life_text(s["life_blocks"], "blocks")
         + (f" at survival {d.survival:g}" if d.survival != 0.5 else "")),
        *([("life in blocks, median", life_text(s["life_blocks_median"], "blocks") + " at survival 0.5")]
          if d.survival != 0.5 else []),
        ("life in days", life_text(s["life_days"], "days") + f" at {per_day(d.duty.blocks_per_day)}"
         if d.duty.blocks_per_day else "— (no blocks_per_day given)"),
        ("damage per block", f"{s['damage_per_block']:.3g} (Miner limit {d.miner_limit:g})"),
        ("critical", f"{c.mode}, ply {c.ply} ({ply.material.name}, {ply.angle:g}°), {c.face} face, "
                     f"x = {display.both(c.x_m, 'position')} {where}, z = {display.both(c.z_m, 'position', signed=True)}"),
    ]
    verdict = verdict_of(result)
    if verdict is not None:
        life.insert(0, ("required life", f"{format_number(verdict.required_life_blocks)} blocks"
                        + (f" ({d.required_life_text})" if d.required_life_text else "")
                        + (": met" if verdict.meets_requirement else ": NOT met")
                        + ("" if verdict.life_margin is None else
                           f", margin {format_number(verdict.life_margin, 3)} (life / required)")))
    static = [(name, "not checked" if v is None or not np.isfinite(v) else f"{v:.3g}",
               "governs" if name == result.static.criterion else "") for name, v in result.static.by_criterion.items()]
    st = result.static
    figures = [
        ("theory", "large deflection (the elastica)" if s["theory"] == "large-deflection" else "linear, small deflection"),
        ("stiffness at the load point", display.both(s["stiffness_n_per_m"], "stiffness")
         + (" (small loads)" if s["theory"] == "large-deflection" else "")),
        ("secant stiffness at the peak drive", display.both(s["secant_stiffness_n_per_m"], "stiffness")),
        ("force and deflection at the peak drive", f"{display.both(s['peak_force_n'], 'force')}, "
                                                   f"{display.both(s['peak_deflection_m'], 'deflection')}"),
        ("mass", display.both(s["mass_kg"], "mass")),
        ("peak fibre strain |ε1|", quantity(s["peak_strain"], "%", scale=100, digits=3)),
        ("energy at the peak drive", display.both(s["peak_energy_j"], "energy")),
        ("energy in the largest cycle", display.both(s["cycle_energy_j"], "energy")),
        ("specific energy", display.both(s["specific_energy_j_per_kg"], "specific_energy")),
        ("energy-storage efficiency", f"{s['energy_efficiency']:.3f}"),
        ("first bending frequency", quantity(s.get("first_mode_hz"), "Hz") + " (the part alone, Euler–Bernoulli)"),
    ]
    if s["tip_rotation_deg"] is not None:
        figures.insert(4, ("end rotation and pull-in at the peak drive",
                           f"{s['tip_rotation_deg']:.3g}°, {display.both(s['pull_in_m'], 'deflection')} toward the clamp"))
    worst = locations.sort_values("damage_per_block", ascending=False).head(10)
    cells, local_unit = _location_cells(worst)
    loc_rows = [(display.pair(r.x_m, "position"), r.ply, r.material, r.face, r["mode"], amplitude, mean,
                 f"{r.damage_per_block:.3g}") for (_, r), (amplitude, mean) in zip(worst.iterrows(), cells)]
    return f"""<section id="results">
<h2>4. Results</h2>
<h3>Life and the critical place</h3>
{table_html(life, cls="kv")}
<h3>Static reserves (first-ply failure at the worst duty extreme)</h3>
<p>Smallest reserve {st.reserve:.3g} by {escape_html(st.criterion)} at x = {escape_html(display.both(st.x_m, "position"))}
{where}, ply {st.ply} ({escape_html(st.place.mode)}), at the drive extreme {escape_html(display.drive(st.drive, d.duty.drive))}.</p>
{table_html(static, header=("criterion", "reserve factor", ""), cls="small")}
<h3>Stiffness, mass and energy</h3>
{table_html(figures, cls="kv")}
{figure_html(svg["force-deflection"], "3", "Force against load-point deflection over the duty's range; the shaded area is the "
         "elastic energy stored at the peak drive, released at once if the part breaks"
         + ("; the dashed line is the small-deflection (linear) answer." if d.theory == "large-deflection" else "."))}
{figure_html(svg["deformed-shapes"], "4", "The part drawn to scale at a quarter, half, three quarters and all of the "
         "largest drive of the duty" + (" (the elastica: the end turns and moves toward the clamp)."
                                        if d.theory == "large-deflection" else " (linear theory: no pull-in)."))}
{figure_html(svg["strain-envelope"], "5", "Fibre strain along the span at the two outer faces, from the smallest to the largest "
         "drive of the duty; dashed grey lines are ply drops, the red line is the critical station.")}
{figure_html(svg["through-thickness"], "6", "Ply-axis strains and stresses through the thickness at the critical station at the "
         "peak drive; thin lines are ply boundaries, the shaded band is the critical ply; the dashed line is the transverse "
         "shear τxz (interlaminar, or a sandwich core's shear).")}
{figure_html(svg["fatigue-curve"], "7", "The fatigue curve (or constant-life diagram) of the critical location with the "
         "duty's cycles there, each moved to the curve's R by the mean-stress rule.")}
{figure_html(svg["damage"], "8", "Miner damage per block along the span, and the share of the critical "
         "location's damage by drive range of the cycles.")}
<h3>Most damaged locations</h3>
<p>Amplitude and mean of the largest cycle, in the basis of the location's curve: MPa for a stress-basis
curve, % for a strain-basis one (locations.csv keeps them in Pa or as a ratio).</p>
{table_html(loc_rows, header=(display.header(f"x ({where})", "position"), "ply", "material", "face", "mode",
                              f"amplitude [{local_unit}]", f"mean [{local_unit}]", "damage/block"), cls="small")}
</section>"""


def section_sizing(sizing: Sequence[tuple[str, str, str]] | None) -> str:
    """The rows of a sizing run (quantity, before, after), or nothing."""
    if not sizing:
        return ""
    return f"""<section id="sizing">
<h3>Sizing</h3>
{table_html(sizing, header=("quantity", "before", "after"), cls="small")}
</section>"""


def section_warnings(result: LifeResult, display: Display = SI) -> str:
    warn = "".join(f"<li>{escape_html(display.text(w))}</li>" for w in result.warnings) or "<li>none</li>"
    return f'<section id="warnings"><h2>5. Warnings</h2><ul class="warn">{warn}</ul></section>'


def section_cautions(result: LifeResult, display: Display = SI) -> str:
    items = "".join(f"<li>{escape_html(x)}</li>" for x in CAUTIONS)
    return f"""<section id="cautions"><h2>6. Cautions</h2>
<div class="caution"><p><b>Caution.</b> {escape_html(CAUTION)}</p><ul>{items}</ul>
<p>Peak stored energy of this part: {escape_html(display.both(result.storage.energy, "energy"))}.</p></div></section>"""


def section_signoff() -> str:
    rows = "".join(f"<tr><th>{role}</th><td></td><td></td><td></td></tr>"
                   for role in ("prepared by", "reviewed by", "approved by"))
    checks = "".join(f"<li>☐ {escape_html(x)}</li>" for x in (
        "inputs checked against the drawing and the duty measurement",
        "material values marked recalled or default replaced by tested data",
        "warnings above read and resolved or accepted",
        "prototype fatigue test plan agreed",
    ))
    return f"""<section id="signoff"><h2>7. Review and sign-off</h2>
<ul class="checks">{checks}</ul>
<table class="sign"><tr><th></th><th>name</th><th>signature</th><th>date</th></tr>{rows}</table>
<p>Comments:</p><div class="comments"></div></section>"""
