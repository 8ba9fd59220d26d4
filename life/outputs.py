"""Output files of a run (DESIGN.md, outputs contract): summary.json, cycles.csv, locations.csv, report.html.

Every file is rendered in memory first, then written beside its final name and moved into place, so a
failing run leaves the output folder as it was.
"""
from __future__ import annotations

import io
import json
import os
import tempfile
from pathlib import Path
from typing import Mapping

import numpy as np
import pandas as pd

from life.damage import FACES
from life.errors import InputError
from life.estimate import LifeResult
from life.report import report_html
from life.sizing import SizingResult
from mechanics.energy import cycle_energy
from spectra.counting import Cycles, merge_identical

MAX_CYCLE_ROWS = 20_000  # beyond this many distinct cycles, cycles.csv holds them binned (said in the report)
BIN_RESOLUTION = 1e-4  # bin width as a fraction of the largest |drive| when binning


def cycle_table(result: LifeResult) -> tuple[pd.DataFrame, str]:
    """Counted drive cycles, identical ones merged; binned at scale. Returns the table and a note on its form.

    At most MAX_CYCLE_ROWS rows: with more distinct cycles, min and max are rounded to a grid of width
    BIN_RESOLUTION × the largest |drive|, the width doubled until the binned cycles fit (the note says so and
    gives the width; the counts are kept). The note also says how the damage treated the cycles.
    """
    cycles: Cycles = merge_identical(result.design.duty.cycles)
    note = f"{cycles.lo.size} distinct cycles, identical cycles merged"
    if cycles.lo.size > MAX_CYCLE_ROWS:
        distinct = cycles.lo.size
        peak = float(max(np.abs(cycles.lo).max(), np.abs(cycles.hi).max()))
        width = BIN_RESOLUTION * peak
        while True:
            binned = merge_identical(Cycles(np.round(cycles.lo / width) * width, np.round(cycles.hi / width) * width,
                                            cycles.count))
            if binned.lo.size <= MAX_CYCLE_ROWS:
                break
            width *= 2.0
        cycles = binned
        note = (
            f"{cycles.lo.size} binned cycles: min and max rounded to {width:.3g} (SI), "
            f"{width / peak:.2g} of the largest drive, as the duty has {distinct} distinct cycles "
            f"(more than {MAX_CYCLE_ROWS}); the damage uses the cycles as counted"
        )
    aggregation = getattr(result.damage, "aggregation", "each cycle")
    if aggregation == "identical cycles merged":
        note += "; damage: identical cycles merged (exact)"
    elif aggregation == "bracketed":
        note += ("; damage: bracketed between the cycles widened and narrowed to a grid of the drive, and exact "
                 "at the critical location and every location that could be as damaged (locations.csv gives the "
                 "upper bound elsewhere)")
    fpd = result.force_per_drive
    energy = cycle_energy(result.response.compliance, cycles.lo * fpd, cycles.hi * fpd)
    table = pd.DataFrame({"min": cycles.lo, "max": cycles.hi, "count": cycles.count, "energy_j": energy})
    return table, note


def location_table(result: LifeResult) -> pd.DataFrame:
    """Damage per block at every location (station, ply, face, mode)."""
    locs, dmg, resp = result.locations, result.damage, result.response
    plies = result.design.beam.plies
    basis = np.array(
        ["none" if m < 0 else locs.models[m].curves[0].basis for m in locs.model], dtype=object
    )
    with np.errstate(divide="ignore"):
        life = np.where(dmg.damage > 0, result.design.miner_limit / np.where(dmg.damage > 0, dmg.damage, 1.0), np.nan)
    table = pd.DataFrame(
        {
            "station": locs.station,
            "x_m": resp.x[locs.station],
            "ply": locs.ply + 1,
            "material": [plies[i].material.name for i in locs.ply],
            "angle_deg": [plies[i].angle for i in locs.ply],
            "face": [FACES[i] for i in locs.face],
            "z_m": locs.z,
            "mode": locs.mode,
            "basis": basis,
            "amplitude": dmg.amplitude,
            "mean": dmg.mean,
            "damage_per_block": dmg.damage,
            "life_blocks": life,
        }
    )
    return table.sort_values(["station", "ply", "face", "mode"], kind="stable").reset_index(drop=True)


def station_table(result: LifeResult) -> pd.DataFrame:
    """The beam along the span: geometry, moment and shear per unit drive force, and the peak figures there.

    Columns: station, x_m, width_m, thickness_m, plies (present), moment_per_n [N·m/N], shear_per_n [N/N],
    curvature_per_n [1/(m·N)], peak_strain (largest |ε1| there at the largest drive), damage_per_block (largest
    of the station's locations).
    """
    resp, locs, dmg = result.response, result.locations, result.damage
    peak_force = max(abs(v) for v in result.design.duty.extremes) * result.force_per_drive
    worst = np.zeros(resp.x.size)
    np.maximum.at(worst, locs.station, dmg.damage)
    return pd.DataFrame(
        {
            "station": np.arange(resp.x.size),
            "x_m": resp.x,
            "width_m": resp.width,
            "thickness_m": resp.thickness,
            "plies": resp.present.sum(axis=1),
            "moment_per_n": resp.moment,
            "shear_per_n": resp.shear,
            "curvature_per_n": resp.curvature,
            "peak_strain": np.abs(resp.strain_12[..., 0]).max(axis=(1, 2)) * peak_force,
            "damage_per_block": worst,
        }
    )


def render(result: LifeResult) -> dict[str, str]:
    """All output files as text, keyed by file name."""
    cycles, note = cycle_table(result)
    summary = result.summary()
    summary["cycles_csv"] = note
    locations = location_table(result)
    files = {
        "summary.json": json.dumps(summary, indent=2, allow_nan=False) + "\n",
        "cycles.csv": cycles.to_csv(index=False, float_format="%.9g", lineterminator="\n"),
        "locations.csv": locations.to_csv(index=False, float_format="%.9g", lineterminator="\n"),
        "stations.csv": station_table(result).to_csv(index=False, float_format="%.9g", lineterminator="\n"),
    }
    files["report.html"] = report_html(result, cycles, note, locations)
    return files


def sizing_json(answer: SizingResult) -> str:
    """sizing.json: the scale found, the target, the sized design's summary and every evaluation."""
    doc = {
        "vary": answer.vary,
        "target_life_blocks": answer.target_blocks,
        "scale": answer.scale,
        "life_grows_with_scale": answer.grows,
        "note": answer.note,
        "evaluations": [{"scale": s, "life_blocks": None if not np.isfinite(v) else v} for s, v in answer.history],
        "sized": answer.result.summary(),
    }
    return json.dumps(doc, indent=2, allow_nan=False) + "\n"


def write_files(files: Mapping[str, str], out: Path) -> list[Path]:
    """Write rendered files into ``out`` (created if absent), each replaced whole or not at all."""
    out = Path(out)
    if out.exists() and not out.is_dir():
        raise InputError(f"--out {out}: exists and is not a folder")
    for name in files:  # a folder (or other non-file) in the way would fail only after others were replaced
        target = out / name
        if target.exists() and not target.is_file():
            raise InputError(f"--out {out}: {name} there is not a file; move it away or choose another --out folder")
    staged: list[tuple[str, Path]] = []
    try:
        out.mkdir(parents=True, exist_ok=True)
        for name, text in files.items():
            fd, tmp = tempfile.mkstemp(prefix=f".{name}.", dir=out)
            staged.append((tmp, out / name))
            with io.open(fd, "w", encoding="utf-8", newline="") as fh:
                fh.write(text)
        umask = os.umask(0)
        os.umask(umask)
        for tmp, _ in staged:
            os.chmod(tmp, 0o666 & ~umask)  # mkstemp makes private files; outputs get the usual permissions
    except OSError as exc:
        for tmp, _ in staged:
            Path(tmp).unlink(missing_ok=True)
        raise InputError(f"--out {out}: cannot write there ({exc.strerror})") from None
    for tmp, final in staged:
        os.replace(tmp, final)
    return [final for _, final in staged]
