"""Duties as they are measured: a vibration spectrum (PSD) of the drive, and a strain gauge's readings as the drive.

The design file's [duty] may give, instead of a time history or a block table, a one-sided PSD of the drive
(``psd = "vib.csv"``) with its static ``mean`` and the ``duration`` of one block; its cycles come from the
spectral range distribution (`flexcycle.spectra.spectral`). With ``drive = "strain"`` the duty (a history, a
block table or a PSD) is the axial strain a gauge reads at ``gauge = { x, face, ply }``: its cycles are turned
into load-point force cycles through the inverse of the monotone map force → gauge strain
(`flexcycle.mechanics.gauge`; under ``theory = "large-deflection"`` the elastica's, `flexcycle.mechanics.large_gauge`), so the damage path, the report and the outputs are those of a force drive.
Rainflow counting commutes with a monotone map (the reversals and their order are kept; a decreasing map,
a gauge on the compression face, swaps each cycle's min and max), so counting the strain and mapping the
cycles' extremes is the same as counting the mapped history.
"""
from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass
from pathlib import Path

import numpy as np

from flexcycle.errors import InputError
from flexcycle.mechanics import errors as mechanics_errors
from flexcycle.mechanics.beam import Beam
from flexcycle.mechanics.gauge import GAUGE_FACES, Gauge, GaugeMap, linear_gauge_map
from flexcycle.mechanics.units import parse_quantity, psd_factor
from flexcycle.spectra import errors as spectra_errors
from flexcycle.spectra.cycles import Cycles
from flexcycle.spectra.profiles import bundled_profile
from flexcycle.spectra.spectral import METHODS, SpectralCycles, Spectrum, read_spectrum, spectral_cycles
from flexcycle.spectra.streaming import Envelope

BUNDLED_PREFIX = "bundled:"  # psd = "bundled:NAME" reads a demo spectrum shipped with flexcycle (as a profile)
PSD_KEYS = {"psd", "frequency_column", "psd_column", "mean", "duration", "method"}
GAUGE_KEYS = {"x", "face", "ply"}
KIND_OF_DRIVE = {"force": "force", "deflection": "length", "strain": "strain"}  # quantity kind of each drive
EXAMPLE_MEAN = {"force": '"20 N"', "deflection": '"2 mm"', "strain": '"400 ue" or "0.04 %"'}


@dataclass(frozen=True, eq=False)
class SpectralDuty:
    """A duty given as a PSD: the spectrum as read and its cycles.

    spectrum : Spectrum — the drive's one-sided PSD as measured [drive² per Hz, SI]
    spectral : SpectralCycles — its cycles per block in the measured drive [drive], with the moments
    unit : str — the PSD's unit as written in the design file
    """

    spectrum: Spectrum
    spectral: SpectralCycles
    unit: str


def psd_duty(table: Mapping, where: str, base_dir: Path, drive: str) -> SpectralDuty:
    """Read the [duty]'s PSD (``psd``, ``frequency_column``, ``psd_column``, ``unit``, ``mean``, ``duration``,
    ``method``) and turn it into cycles of the measured drive (SI)."""
    kind = KIND_OF_DRIVE[drive]
    for key in ("frequency_column", "psd_column", "unit", "mean", "duration"):
        if key not in table:
            hint = {"mean": f"the static mean of the drive, e.g. mean = {EXAMPLE_MEAN[drive]}",
                    "duration": 'the length of one block of the duty, e.g. duration = "1 h"',
                    "unit": f"the PSD's unit, the drive's unit squared per hertz, e.g. unit = \"{_unit_example(kind)}\""}
            raise InputError(f"{where}: missing key {key!r} for a PSD duty; give {hint.get(key, 'the CSV column name')}")
    path_text = table["psd"]
    if not isinstance(path_text, str) or not path_text.strip():
        raise InputError(f"{where} psd: a CSV file path as a string, e.g. psd = \"vib.csv\", got {path_text!r}")
    for key in ("frequency_column", "psd_column"):
        if not isinstance(table[key], str) or not table[key].strip():
            raise InputError(f"{where} {key}: the name of a column of {path_text} as a string, got {table[key]!r}")
    unit = table["unit"]
    if not isinstance(unit, str):
        raise InputError(f"{where} unit: the PSD's unit as a string, e.g. \"{_unit_example(kind)}\", got {unit!r}")
    method = table.get("method", "dirlik")
    if method not in METHODS:
        raise InputError(f"{where} method: unknown name {method!r}; must be one of {', '.join(map(repr, METHODS))}")
    try:
        scale = psd_factor(unit, kind, f"{where} unit")
        mean = parse_quantity(table["mean"], kind, f"{where} mean")
        duration = parse_quantity(table["duration"], "time", f"{where} duration")
        if not duration > 0:
            raise InputError(f"{where} duration: one block must last > 0 s, got {table['duration']!r}")
        if path_text.startswith(BUNDLED_PREFIX):  # a demo spectrum shipped with flexcycle
            path = bundled_profile(path_text[len(BUNDLED_PREFIX):])
        else:
            path = (base_dir / path_text).resolve()
        spec = read_spectrum(path, table["frequency_column"], table["psd_column"], 1.0, scale, f"{where} psd")
        spectral = spectral_cycles(spec, mean, duration, method)
    except (mechanics_errors.InputError, spectra_errors.InputError) as exc:
        message = str(exc)
        raise InputError(message if message.startswith(where) else f"{where} psd: {message}") from None
    return SpectralDuty(spec, spectral, unit)


def _unit_example(kind: str) -> str:
    return {"force": "N^2/Hz", "length": "mm^2/Hz", "strain": "ue^2/Hz"}[kind]


def gauge_of(table: Mapping, where: str, beam: Beam) -> Gauge:
    """The [duty] gauge = { x, face, ply } of a strain drive, checked against the part."""
    if "gauge" not in table:
        raise InputError(f"{where}: drive = \"strain\" needs the gauge's place, e.g. "
                         "gauge = { x = \"20 mm\", face = \"tension\" }")
    value = table["gauge"]
    if not isinstance(value, Mapping):
        raise InputError(f"{where} gauge: a table {{ x, face, ply }}, e.g. gauge = {{ x = \"20 mm\", face = \"tension\" }}")
    for key in value:
        if key not in GAUGE_KEYS:
            raise InputError(f"{where} gauge: unknown key {key!r}; allowed: {', '.join(sorted(GAUGE_KEYS))}")
    for key in ("x", "face"):
        if key not in value:
            raise InputError(f"{where} gauge: missing key {key!r}")
    try:
        x = parse_quantity(value["x"], "length", f"{where} gauge x")
    except mechanics_errors.InputError as exc:
        raise InputError(str(exc)) from None
    face = value["face"]
    if face not in GAUGE_FACES:
        raise InputError(f"{where} gauge face: must be one of {', '.join(map(repr, GAUGE_FACES))}, got {face!r}")
    ply = value.get("ply")
    if ply is not None and (isinstance(ply, bool) or not isinstance(ply, int)):
        raise InputError(f"{where} gauge ply: a ply number (1 at the tension face), got {ply!r}")
    return Gauge(x, face, ply)


def gauge_map(beam: Beam, gauge: Gauge, where: str, theory: str = "linear",
              strains: tuple[float, float] | None = None) -> GaugeMap:
    """The force → gauge strain map of the part: under linear theory a straight line through zero; under
    ``theory = "large-deflection"`` the elastica's tabulated monotone map (`flexcycle.mechanics.large_gauge`),
    covering the duty's extreme gauge strains ``strains`` = (lowest, highest) [-].
    """
    try:
        if theory != "large-deflection":
            return linear_gauge_map(beam, gauge)
        assert strains is not None  # the duty's strains are read before the large-deflection map is made
        # the elastica's solvers (scipy.integrate, scipy.optimize) are imported only when needed
        from flexcycle.mechanics.large_gauge import large_gauge_map

        return large_gauge_map(beam, gauge, *strains)
    except mechanics_errors.InputError as exc:
        raise InputError(f"{where} {exc}") from None


def strain_extremes(cycles: Cycles, peaks: tuple[float, float] | None) -> tuple[float, float]:
    """The lowest and highest gauge strain of the duty: its cycles' extremes and, for a PSD, its expected peaks [-]."""
    values = [float(cycles.lo.min()), float(cycles.hi.max())] + ([] if peaks is None else list(peaks))
    return min(values), max(values)


def force_cycles(cycles: Cycles, mapping: GaugeMap) -> Cycles:
    """Gauge-strain cycles as load-point force cycles [N] through the inverse map (extremes swapped when the
    strain falls as the force grows)."""
    a, b = mapping.drive(cycles.lo), mapping.drive(cycles.hi)
    return Cycles(lo=np.minimum(a, b), hi=np.maximum(a, b), count=cycles.count)


def force_envelope(trace: Envelope | None, mapping: GaugeMap) -> Envelope | None:
    """A strain history's min/max envelope as force [N] (min and max swapped for a decreasing map)."""
    if trace is None:
        return None
    a, b = mapping.drive(trace.lo), mapping.drive(trace.hi)
    return Envelope(trace.start, np.minimum(a, b), np.maximum(a, b), trace.samples)
