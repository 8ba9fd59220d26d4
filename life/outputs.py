"""Output files of a run (docs/design.md, outputs contract): summary.json, cycles.csv, locations.csv, report.html.

Every file is rendered in memory first, then written into a temporary folder beside the output folder and
moved into place at the end, so a failing run leaves the output folder as it was.
"""
from __future__ import annotations

import json
import os
import shutil
import tempfile
from collections.abc import Mapping, Sequence
from pathlib import Path
from typing import TYPE_CHECKING

import numpy as np
import pandas as pd

from flexcycle.display import SI, Display
from flexcycle.errors import InputError
from flexcycle.estimate import LifeResult
from flexcycle.fatigue.damage import FACES
from flexcycle.mechanics.energy import cycle_energy
from flexcycle.report.figures import FIGURES
from flexcycle.report.page import figure_svgs, report_html
from flexcycle.spectra.merging import table_of

if TYPE_CHECKING:  # flexcycle.sizing loads scipy.optimize (0.3 s): only `flexcycle size` needs it
    from flexcycle.sizing import SizingAnswer

MAX_CYCLE_ROWS = 20_000  # beyond this many distinct cycles, cycles.csv holds them binned (said in the report)
BIN_RESOLUTION = 1e-4  # bin width as a fraction of the largest |drive| when binning


def cycle_table(result: LifeResult) -> tuple[pd.DataFrame, str]:
    """Counted drive cycles, identical ones merged; binned at scale. Returns the table and a note on its form.

    At most MAX_CYCLE_ROWS rows: with more distinct cycles, min and max are binned on a grid of width
    BIN_RESOLUTION × the largest |drive|, the width doubled until the binned cycles fit, each extreme written at
    the centre of its bin (``flexcycle.spectra.merging.table_of``; the note says so and gives the width; the
    counts are kept). The note also says how the damage treated the cycles.
    """
    counted = result.design.duty.cycles
    cycles, width = table_of(counted, MAX_CYCLE_ROWS, BIN_RESOLUTION)
    note = f"{cycles.lo.size} distinct cycles, identical cycles merged"
    if width is not None:
        peak = float(max(-counted.lo.min(), counted.hi.max(), counted.lo.max(), -counted.hi.min()))  # max |drive|
        note = (
            f"{cycles.lo.size} binned cycles: min and max each at the centre of its bin of {width:.3g} (SI), "
            f"{width / peak:.2g} of the largest drive, as the duty has more than {MAX_CYCLE_ROWS} distinct "
            "cycles; the damage uses the cycles as counted"
        )
    aggregation = getattr(result.damage, "aggregation", "each cycle")
    if aggregation == "identical cycles merged":
        note += "; damage: identical cycles merged (exact)"
    elif aggregation == "bracketed":
        note += ("; damage: bounded above by the cycles widened to a grid of the drive, and exact at the critical "
                 "location and every location that could be as damaged (locations.csv gives the upper bound "
                 "elsewhere)")
    if result.drive_response is not None:  # linear or large deflection, as the estimate used
        energy = result.drive_response.cycle_energies(cycles.lo, cycles.hi)
    else:
        force_per_drive = result.force_per_drive
        energy = cycle_energy(result.response.compliance, cycles.lo * force_per_drive, cycles.hi * force_per_drive)
    table = pd.DataFrame({"min": cycles.lo, "max": cycles.hi, "count": cycles.count, "energy_j": energy})
    return table, note


def location_table(result: LifeResult) -> pd.DataFrame:
    """Damage per block at every location (station, ply, face, mode)."""
    locations, damage, response = result.locations, result.damage, result.response
    plies = result.design.beam.plies
    basis = np.array(
        ["none" if m < 0 else locations.models[m].curves[0].basis for m in locations.model], dtype=object
    )
    with np.errstate(divide="ignore"):
        life = np.where(damage.damage > 0, result.design.miner_limit / np.where(damage.damage > 0, damage.damage, 1.0), np.nan)
    table = pd.DataFrame(
        {
            "station": locations.station,
            "x_m": response.x[locations.station],
            "ply": locations.ply + 1,
            "material": [plies[i].material.name for i in locations.ply],
            "angle_deg": [plies[i].angle for i in locations.ply],
            "face": [FACES[i] for i in locations.face],
            "z_m": locations.z,
            "mode": locations.mode,
            "basis": basis,
            "amplitude": damage.amplitude,
            "mean": damage.mean,
            "damage_per_block": damage.damage,
            "life_blocks": life,
        }
    )
    return table.sort_values(["station", "ply", "face", "mode"], kind="stable").reset_index(drop=True)


def station_table(result: LifeResult) -> pd.DataFrame:
    """The beam along the span: geometry, moment and shear per unit drive force, and the peak figures there.

    Columns: station, x_m, width_m, thickness_m, plies (present), moment_per_n [N·m/N], shear_per_n [N/N],
    curvature_per_n [1/(m·N)] (linear theory, per unit force), peak_strain (largest |ε1| there at the largest
    drive; under large deflection from the elastica), damage_per_block (largest of the station's locations).
    """
    response, locations, damage = result.response, result.locations, result.damage
    peak_force = max(abs(v) for v in result.design.duty.extremes) * result.force_per_drive
    peak_strain = np.abs(response.strain_12[..., 0]).max(axis=(1, 2)) * peak_force
    mapping = result.drive_response
    if mapping is not None and mapping.large:
        peak_strain = np.max([np.abs(mapping.fields(d).strain_12[..., 0]).max(axis=(1, 2))
                              for d in result.design.duty.extremes], axis=0)
    worst = np.zeros(response.x.size)
    np.maximum.at(worst, locations.station, damage.damage)
    return pd.DataFrame(
        {
            "station": np.arange(response.x.size),
            "x_m": response.x,
            "width_m": response.width,
            "thickness_m": response.thickness,
            "plies": response.present.sum(axis=1),
            "moment_per_n": response.moment,
            "shear_per_n": response.shear,
            "curvature_per_n": response.curvature,
            "peak_strain": peak_strain,
            "damage_per_block": worst,
        }
    )


def render(result: LifeResult, sizing: Sequence[tuple[str, str, str]] | None = None,
           display: Display = SI) -> dict[str, str]:
    """All output files as text, keyed by file name.

    sizing : optional rows (quantity, before, after) of a sizing run, shown in the report after the results
    display : the units the report shows (SI, or inch-pound with SI beside); summary.json and the CSV files
        stay SI
    """
    # the result's own tables (computed once, the same a Python caller reads); summary.json is result.summary()
    cycles, note, locations = result.cycle_table, result.cycle_note, result.location_table
    files = {
        "summary.json": json.dumps(result.summary(), indent=2, allow_nan=False) + "\n",
        "cycles.csv": cycles.to_csv(index=False, float_format="%.9g", lineterminator="\n"),
        "locations.csv": locations.to_csv(index=False, float_format="%.9g", lineterminator="\n"),
        "stations.csv": result.station_table.to_csv(index=False, float_format="%.9g", lineterminator="\n"),
    }
    svg = figure_svgs(result, cycles, locations, FIGURES, display)
    files["report.html"] = report_html(result, cycles, note, locations, sizing, svg=svg, display=display)
    return {name: files[name] for name in ("summary.json", "cycles.csv", "locations.csv", "stations.csv", "report.html")}


def sizing_json(answer: SizingAnswer) -> str:
    """sizing.json: the target, every step with its factor, the before/after table and both summaries."""
    from flexcycle.sizing import sizing_rows

    def proposal(p) -> dict:
        return {"file": p.name, "steps": [{"what": st.what, "factor": st.factor, "note": st.note} for st in p.steps],
                "summary": p.result.summary()}

    doc = {
        "target_life_blocks": answer.target_blocks,
        "rate_n_per_m": answer.rate,
        "width_to_thickness": answer.width_to_thickness,
        "evaluations": answer.evaluations,
        "warnings": list(answer.warnings),
        "table": [{"quantity": q, "before": b, "after": a} for q, b, a in sizing_rows(answer)],
        "before": answer.before.summary(),
        "sized": proposal(answer.sized),
        "drops": None if answer.drops is None else proposal(answer.drops),
        "sized_sha256": answer.sha256,
        "width_to_depth": None if answer.lateral is None else answer.lateral.width_to_depth,
        "lateral_buckling_load_n": None if answer.lateral is None else answer.lateral.critical_load,
    }
    return json.dumps(doc, indent=2, allow_nan=False) + "\n"


STAGING_PREFIX = ".flexcycle-staging-"  # the temporary folder beside the output folder that a run writes into first


def write_files(files: Mapping[str, str], out: Path) -> list[Path]:
    """Write rendered files into ``out`` (created if absent), each replaced whole or not at all.

    Every file is written into a temporary folder created beside ``out`` (same file system), and only when
    all are written are they moved into ``out`` one by one (``os.replace``, atomic per file); the staging
    folder is then removed. A failure before the moves leaves ``out`` as it was. Files in ``out`` that
    flexcycle does not write are never touched.

    Raises InputError — ``out`` is a file, an output name there is taken by a folder, or the folder
    cannot be written.
    """
    out = Path(out)
    if out.exists() and not out.is_dir():
        raise InputError(f"out {out}: exists and is not a folder; give a folder (it is created if absent)",
                         parameter="out")
    for name in files:  # a folder (or other non-file) in the way would fail only after others were replaced
        target = out / name
        if target.exists() and not target.is_file():
            raise InputError(f"out {out}: {name} there is not a file; move it away or choose another output folder",
                             parameter="out")
    parent = out.absolute().parent
    try:
        parent.mkdir(parents=True, exist_ok=True)
        staging = Path(tempfile.mkdtemp(prefix=STAGING_PREFIX, dir=parent))
    except OSError as exc:
        raise InputError(f"out {out}: cannot write beside it in {parent} ({exc.strerror}); choose a folder "
                         "you may write to", parameter="out") from None
    try:
        umask = os.umask(0)
        os.umask(umask)
        for name, text in files.items():
            with open(staging / name, "w", encoding="utf-8", newline="") as fh:
                fh.write(text)
            os.chmod(staging / name, 0o666 & ~umask)
        out.mkdir(exist_ok=True)
        written = []
        for name in files:
            os.replace(staging / name, out / name)
            written.append(out / name)
    except OSError as exc:
        raise InputError(f"out {out}: cannot write there ({exc.strerror}); choose a folder you may write to",
                         parameter="out") from None
    finally:
        shutil.rmtree(staging, ignore_errors=True)
    return written
