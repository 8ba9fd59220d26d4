"""The design file (TOML, docs/design.md "Design file v1"): read, convert units, validate, build a Design.

Every dimensional value is a string with its unit (pint, ``flexcycle.mechanics.units``); a missing unit, an unknown
key, a wrong type or an impossible value is an ``InputError`` naming the file, the key (and row) and what
would be right. Nothing is guessed.
"""
from __future__ import annotations

import re
import tomllib
from collections.abc import Callable, Mapping
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

import numpy as np

from flexcycle.errors import InputError, MechanicsInputError, did_you_mean, input_errors
from flexcycle.fatigue.factors import MaterialFactors, factored, read_factors
from flexcycle.fatigue.meanstress import RULES
from flexcycle.measured import (
    PSD_KEYS,
    SpectralDuty,
    force_cycles,
    force_envelope,
    gauge_map,
    gauge_of,
    psd_duty,
    strain_extremes,
)
from flexcycle.mechanics.beam import DEFAULT_STATIONS, SUPPORTS, Beam, Ply, segments, validate
from flexcycle.mechanics.energy import DRIVES
from flexcycle.mechanics.gauge import Gauge, GaugeMap
from flexcycle.mechanics.laminate import SECTIONS
from flexcycle.mechanics.materials import Material, resolve_materials
from flexcycle.mechanics.theory import THEORIES, refuse_unsolved
from flexcycle.mechanics.units import dimension_name, parse_quantity, unit_factor
from flexcycle.spectra.cycles import Cycles
from flexcycle.spectra.profiles import block_table, bundled_profile, refuse_headerless
from flexcycle.spectra.rainflow import RESIDUE_MODES
from flexcycle.spectra.streaming import Envelope, count_history, refuse_constant

BUNDLED_PREFIX = "bundled:"  # profile = "bundled:NAME" reads a demo profile shipped with flexcycle

TOP_KEYS = {"title", "beam", "ply", "duty", "fatigue", "material", "report", "environment"}
BEAM_KEYS = {"support", "span", "width", "load_spacing", "section", "stations", "theory"}
PLY_KEYS = {"material", "angle", "thickness", "count", "ends_at"}
DUTY_KEYS = {"drive", "profile", "column", "unit", "cycles", "blocks_per_day", "residue", "sample_rate", "gauge"} | PSD_KEYS
FATIGUE_KEYS = {"mean_stress", "miner_limit", "stress_factor", "required_life", "survival", "static_strength_factor",
                "fatigue_strength_factor"}
REPORT_KEYS = {"units"}
CYCLE_KEYS = {"min", "max", "count"}

# Lengths the model handles, 1 µm to 1 km: past them the floating-point laminate and beam sums (h³, L³) lose
# their meaning long before any physics does; no flexing part lies outside (common practice).
LENGTH_RANGE = (1e-6, 1e3)


@dataclass(frozen=True)
class Duty:
    """The drive at the load point over one block of the duty.

    drive : str — ``"force"`` or ``"deflection"``
    cycles : Cycles — counted (time history) or tabulated cycles [N or m]
    source : str — where they came from, for reports
    signal : np.ndarray | None — the time history in SI, when one was given and is short enough to keep
        (flexcycle.spectra.streaming.KEEP_SIGNAL samples) [N or m]
    blocks_per_day : float | None — repeats of the whole duty per day [1/day]
    residue : str — how a time history's residue is counted: "half" (ASTM E1049-85, half cycles) or "repeat"
        (the block as one of an endless repetition: the history closed on its largest reversal, full cycles)
    profile_path : Path | None — the time-history file read (for "bundled:NAME", the shipped file); None
        for a block table
    envelope : Envelope | None — a time history's min/max per bin of samples, the counted history's
        ``envelope``, for plots (also when ``signal`` is None) [N or m]
    profile_sha256 : str | None — SHA-256 of the time-history file's bytes as read (hex); None for a block table
    spectral : SpectralDuty | None — for a PSD duty: the spectrum and its range distribution, in the drive as
        measured (strain for a gauge) [SI]
    sample_rate : float | None — the time history's sampling rate, when given [Hz]
    measured : str — the drive as measured: ``drive``, or ``"strain"`` for a gauge (then ``drive`` is
        ``"force"``: the cycles, signal and envelope are the load-point force the gauge strain implies)
    gauge : Gauge | None — where the strain was measured
    gauge_map : GaugeMap | None — the force → gauge strain map used to turn the strain into force
    peaks : tuple[float, float] | None — a PSD duty's expected lowest and highest drive in one block
        (Davenport 1964) [N or m]; None otherwise
    """

    drive: str
    cycles: Cycles
    source: str
    signal: np.ndarray | None
    blocks_per_day: float | None
    residue: str = "half"
    profile_path: Path | None = None
    envelope: Envelope | None = None
    profile_sha256: str | None = None
    spectral: SpectralDuty | None = None
    sample_rate: float | None = None
    measured: str = ""
    gauge: Gauge | None = None
    gauge_map: GaugeMap | None = None

    peaks: tuple[float, float] | None = None

    @property
    def extremes(self) -> tuple[float, float]:
        """Smallest and largest drive of the duty [N or m]: of the cycles, or for a PSD the expected lowest and
        highest of one block (the far tail of the range distribution enters the damage, not the peaks)."""
        if self.peaks is not None:
            return self.peaks
        return float(self.cycles.lo.min()), float(self.cycles.hi.max())


@dataclass(frozen=True)
class Design:
    """A validated design, SI throughout.

    title : str; path : Path | None — the design file
    beam : Beam — the part, stack expanded (each repeat of ``count`` its own ply, numbered from 1 at the tension face)
    duty : Duty
    mean_stress : str — one of flexcycle.fatigue.meanstress.RULES
    miner_limit : float — Miner sum taken as failure [-]
    stress_factor : float — partial factor on every local stress and strain [-]
    materials : dict[str, Material] — the materials the stack uses, at their design values (the factors applied)
    document : dict — the parsed TOML as read (for writing modified designs)
    notes : tuple[str, ...] — what the loader did that the user should know (reported as warnings)
    required_life_blocks : float | None — the life the part must reach, in blocks of the duty ([fatigue]
        required_life); None: no requirement
    required_life_text : str | None — the requirement as written (``"5 years"``, ``"20000"``)
    units : str | None — the display units the file asks for ([report] units: "si" or "us"); None: not given
    theory : str — ``"linear"`` (small deflection) or ``"large-deflection"`` (the elastica), [beam] theory
    survival : float — probability of survival of the lives given [-], 0 < p < 1 (0.5: median lives)
    factors : dict[str, MaterialFactors] — the partial factors and knock-downs of each material of the stack
        (``flexcycle.fatigue.factors``)
    """

    title: str
    path: Path | None
    beam: Beam
    duty: Duty
    mean_stress: str
    miner_limit: float
    stress_factor: float
    materials: dict[str, Material]
    document: dict = field(repr=False)
    notes: tuple[str, ...] = ()
    required_life_blocks: float | None = None
    required_life_text: str | None = None
    units: str | None = None
    theory: str = "linear"
    survival: float = 0.5
    factors: dict[str, MaterialFactors] = field(default_factory=dict)


def _unknown(table: Mapping, allowed: set, where: str) -> None:
    for key in table:
        if key not in allowed:
            hint = did_you_mean(str(key), allowed) or f"allowed: {', '.join(sorted(allowed))}"
            raise InputError(f"{where}: unknown key {key!r}; {hint.rstrip()}")


def _table(doc: Mapping, key: str, where: str, required: bool = True) -> Mapping:
    value = doc.get(key)
    if value is None:
        if required:
            raise InputError(f"{where}: missing table [{key}]")
        return {}
    if not isinstance(value, Mapping):
        raise InputError(f"{where}: [{key}] must be a table, got {type(value).__name__}")
    return value


def _require(table: Mapping, key: str, where: str) -> Any:
    if key not in table:
        raise InputError(f"{where}: missing key {key!r}")
    return table[key]


def _length(value: Any, where: str) -> float:
    """A length [m] from its design-file string, checked > 0 and within LENGTH_RANGE."""
    length = parse_quantity(value, "length", where)
    lo, hi = LENGTH_RANGE
    if length > 0 and not lo <= length <= hi:
        raise InputError(f"{where}: {value!r} is outside the lengths flexcycle models (1 um to 1 km); "
                         "check the number and its unit")
    return length


def _number(value: Any, where: str, positive: bool = True) -> float:
    if isinstance(value, bool) or not isinstance(value, (int, float)):
        raise InputError(f"{where}: must be a bare number, got {value!r}")
    value = float(value)
    if not np.isfinite(value) or (positive and value <= 0):
        raise InputError(f"{where}: must be a finite number > 0, got {value!r}")
    return value


def _choice(value: Any, choices: tuple, where: str) -> str:
    if not isinstance(value, str) or value not in choices:
        raise InputError(f"{where}: unknown name {value!r}; {did_you_mean(value, choices)}"
                         f"must be one of {', '.join(map(repr, choices))}")
    return value


def _beam(doc: Mapping, plies: tuple[Ply, ...], name: str, notes: list[str]) -> Beam:
    t = _table(doc, "beam", name)
    _unknown(t, BEAM_KEYS, f"{name} [beam]")
    support = _choice(_require(t, "support", f"{name} [beam]"), SUPPORTS, f"{name} [beam] support")
    span = _length(_require(t, "span", f"{name} [beam]"), f"{name} [beam] span")
    width = _require(t, "width", f"{name} [beam]")
    if isinstance(width, Mapping):
        _unknown(width, {"root", "tip"}, f"{name} [beam] width")
        root = _length(_require(width, "root", f"{name} [beam] width"), f"{name} [beam] width.root")
        tip = _length(_require(width, "tip", f"{name} [beam] width"), f"{name} [beam] width.tip")
    else:
        root = tip = _length(width, f"{name} [beam] width")
    spacing = t.get("load_spacing")
    spacing = None if spacing is None else _length(spacing, f"{name} [beam] load_spacing")
    if spacing is not None and support != "four-point":
        notes.append(f"{name} [beam] load_spacing: only four-point bending has two load points; ignored for "
                     f"support = {support!r}")
        spacing = None
    section = _choice(t.get("section", "beam"), SECTIONS, f"{name} [beam] section")
    stations = t.get("stations", DEFAULT_STATIONS)
    if isinstance(stations, bool) or not isinstance(stations, int) or not 2 <= stations <= 2000:
        raise InputError(f"{name} [beam] stations: must be a whole number from 2 to 2000, got {stations!r}")
    beam = Beam(support, span, root, tip, plies, spacing, section, stations)
    with input_errors(f"{name} "):  # mechanics names the key, not the file
        validate(beam)
    # the [[ply]] row each ply of the expanded stack comes from (rows already checked by _plies)
    row_of = [row_no for row_no, row in enumerate(doc["ply"], start=1) for _ in range(row.get("count", 1))]
    for k, p in enumerate(plies, start=1):
        if p.ends_at is not None and p.ends_at > beam.length * (1 + 1e-12):
            raise InputError(
                f"{name} [[ply]] #{row_of[k - 1]} ends_at: {p.ends_at * 1e3:g} mm (ply {k} of the stack) lies "
                f"beyond the beam's {beam.length * 1e3:g} mm from the root; leave ends_at out for a full-length ply"
            )
    with input_errors(f"{name} "):
        segments(beam)  # every stretch of the beam keeps at least one ply and has bending stiffness
    return beam


def _plies(doc: Mapping, materials: Mapping[str, Material], name: str, notes: list[str]) -> tuple[Ply, ...]:
    rows = doc.get("ply")
    if not rows:
        raise InputError(f"{name}: no [[ply]] given; list the plies from the tension face to the other face")
    if not isinstance(rows, list):
        raise InputError(f"{name}: [[ply]] must be an array of tables (write [[ply]] for every ply)")
    out: list[Ply] = []
    for row_no, row in enumerate(rows, start=1):
        where = f"{name} [[ply]] #{row_no}"
        if not isinstance(row, Mapping):
            raise InputError(f"{where}: must be a table")
        _unknown(row, PLY_KEYS, where)
        mat_name = _require(row, "material", where)
        if not isinstance(mat_name, str):
            raise InputError(f"{where} material: a material name as a string, e.g. \"e-glass-epoxy\", got {mat_name!r}")
        if mat_name not in materials:
            hint = did_you_mean(mat_name, materials).rstrip() or "see `flexcycle materials`"
            raise InputError(f"{where} material: unknown material {mat_name!r}; {hint}")
        mat = materials[mat_name]
        angle = row.get("angle", 0)
        if isinstance(angle, bool) or not isinstance(angle, (int, float)) or not -90 <= angle <= 180:
            raise InputError(f"{where} angle: a fibre angle in degrees as a bare number (-90 … 180), got {angle!r}")
        if "thickness" in row:
            thickness = _length(row["thickness"], f"{where} thickness")
        elif mat.thickness is not None:
            thickness = mat.thickness
            notes.append(f"{where}: no thickness given; the nominal ply thickness of {mat_name} "
                         f"({thickness * 1e3:g} mm) is used")
        else:
            raise InputError(f"{where}: missing key 'thickness' (material {mat_name!r} has no nominal ply thickness)")
        if not thickness > 0:
            raise InputError(f"{where} thickness: must be > 0 [m], got {row.get('thickness')!r}")
        count = row.get("count", 1)
        if isinstance(count, bool) or not isinstance(count, int) or count < 1:
            raise InputError(f"{where} count: must be a whole number >= 1, got {count!r}")
        ends_at = row.get("ends_at")
        if ends_at is not None:
            ends_at = _length(ends_at, f"{where} ends_at")
            if not ends_at > 0:
                raise InputError(f"{where} ends_at: must be > 0 [m] from the root, got {row['ends_at']!r}")
        out.extend(Ply(mat, float(angle), thickness, ends_at) for _ in range(count))
    return tuple(out)


DRIVE_UNIT = {"deflection": '"mm" or "in"', "force": '"N" or "lbf"', "strain": '"ue", "%" or "strain"'}  # examples
DUTY_DRIVES = (*DRIVES, "strain")  # the drives of [duty] drive: a strain is that of a gauge, turned into force
KIND_OF_DRIVE = {"deflection": "length", "force": "force", "strain": "strain"}


def _unit_of_drive(unit: str, drive: str, where: str) -> None:
    """Reject a profile unit whose dimension is not the drive's (``unit = "N"`` for a deflection drive)."""
    wanted = KIND_OF_DRIVE[drive]
    try:
        parse_quantity(f"1 {unit}", wanted, where)
    except MechanicsInputError:
        got = dimension_name(unit)
        raise InputError(f"{where}: {unit!r} measures {got}, but drive = {drive!r} needs a unit of {wanted}, "
                         f"e.g. {DRIVE_UNIT[drive]}") from None


def _duty(doc: Mapping, name: str, base_dir: Path, notes: list[str],
          progress: Callable[[int, int], None] | None = None, beam: Beam | None = None,
          theory: str = "linear") -> Duty:
    t = _table(doc, "duty", name)
    where = f"{name} [duty]"
    _unknown(t, DUTY_KEYS, where)
    drive = _choice(_require(t, "drive", where), DUTY_DRIVES, f"{where} drive")
    kind = KIND_OF_DRIVE[drive]
    has_profile, has_cycles, has_psd = "profile" in t, "cycles" in t, "psd" in t
    if has_profile + has_cycles + has_psd != 1:
        raise InputError(f"{where}: give exactly one of 'profile' (a time history), 'cycles' (a block table) or "
                         "'psd' (a vibration spectrum)")
    stray = sorted(k for k in PSD_KEYS - {"psd"} if k in t and not has_psd) + (["gauge"] if "gauge" in t and drive != "strain" else [])
    if stray:
        why = "a PSD duty" if stray[0] != "gauge" else 'drive = "strain"'
        raise InputError(f"{where} {stray[0]}: only for {why}; leave it out here")
    mapping = gauge = None
    if drive == "strain":
        assert beam is not None  # parse_design builds the beam first
        gauge = gauge_of(t, where, beam)
        mapping = gauge_map(beam, gauge, f"{where} gauge")
    sample_rate = None
    if "sample_rate" in t:
        if not has_profile:
            raise InputError(f"{where} sample_rate: only for a time history (profile); leave it out here")
        with input_errors():
            sample_rate = parse_quantity(t["sample_rate"], "frequency", f"{where} sample_rate")
        if not sample_rate > 0:
            raise InputError(f"{where} sample_rate: must be > 0 Hz, got {t['sample_rate']!r}")
    spectral = peaks = None
    per_day = t.get("blocks_per_day")
    per_day = None if per_day is None else _number(per_day, f"{where} blocks_per_day")
    residue = _choice(t.get("residue", "half"), RESIDUE_MODES, f"{where} residue")
    if residue != "half" and not has_profile:
        raise InputError(f"{where} residue: only a time history has a residue to count; leave it out for a block table "
                         "or a PSD")
    with input_errors():  # units (mechanics), the profile, the spectrum and the counting (spectra)
        if has_psd:
            spectral = psd_duty(t, where, base_dir, drive)
            cycles = spectral.spectral.cycles
            moments = spectral.spectral.moments
            source = (f"vibration spectrum {t['psd']} [{spectral.unit}], {spectral.spectral.method} ranges about the "
                      f"mean, rms {moments.rms:.4g} (SI), irregularity {moments.irregularity:.3f}, "
                      f"{spectral.spectral.duration:g} s per block")
            signal = envelope = digest = path = None
            peaks = spectral.spectral.extremes
            notes.append(f"{where}: a stationary Gaussian process; the static check, the peak strain and the "
                         f"peak energy are taken at the expected largest excursion of one block (Davenport 1964), "
                         f"mean ± {spectral.spectral.largest_peak / moments.rms:.2f} rms; the rarer larger ranges "
                         "enter the fatigue damage")
        elif has_profile:
            profile = _require(t, "profile", where)
            if not isinstance(profile, str):
                raise InputError(f"{where} profile: a file path as a string, got {profile!r}")
            column = _require(t, "column", where)
            unit = _require(t, "unit", where)
            if not isinstance(unit, str):
                raise InputError(f"{where} unit: the unit of column {column!r} as a string, e.g. \"mm\"")
            # a unit that scales (no offset), of the drive's kind
            if not unit.strip():
                raise InputError(f"{where} unit: empty; give the unit of column {column!r}, e.g. {DRIVE_UNIT[drive]}")
            scale = unit_factor(unit, f"{where} unit")
            _unit_of_drive(unit, drive, f"{where} unit")
            if profile.startswith(BUNDLED_PREFIX):
                with input_errors(f"{where} profile: "):
                    path = bundled_profile(profile[len(BUNDLED_PREFIX):])
            else:
                path = (base_dir / profile).resolve()
            if not isinstance(column, str) or not column.strip():
                raise InputError(f"{where} column: the name of the profile's column as a string, e.g. \"deflection\", "
                                 f"got {column!r}")
            refuse_headerless(path, f"{where} profile: {profile}")
            history = count_history(path, column, scale, f"{where} profile", residue, progress=progress)
            refuse_constant(history, f"{where} profile: {profile}", unit, scale)
            cycles = history.cycles
            source = (f"time history {profile} column {column!r} [{unit}], {history.samples} samples, "
                      + ("residue as half cycles" if residue == "half" else "counted as a repeating block"))
            signal, envelope, digest = history.signal, history.envelope, history.sha256
        else:
            rows = t["cycles"]
            if not isinstance(rows, list) or not rows:
                raise InputError(f"{where} cycles: a list of {{ min, max, count }} tables, e.g. "
                                 "cycles = [ { min = \"5 mm\", max = \"40 mm\", count = 1000 } ]")
            parsed = []
            for k, row in enumerate(rows, start=1):
                rw = f"{where} cycles row {k}"
                if not isinstance(row, Mapping):
                    raise InputError(f"{rw}: must be a table {{ min, max, count }}")
                _unknown(row, CYCLE_KEYS, rw)
                lo = parse_quantity(_require(row, "min", rw), kind, f"{rw} min")
                hi = parse_quantity(_require(row, "max", rw), kind, f"{rw} max")
                parsed.append((lo, hi, _number(_require(row, "count", rw), f"{rw} count")))
            cycles = block_table(parsed, f"{where} cycles")
            steady = [k for k, (lo, hi, _) in enumerate(parsed, start=1) if lo == hi]
            if steady:
                notes.append(f"{where} cycles rows {', '.join(map(str, steady))}: min = max, a steady load with no "
                             "cycle; left out of the fatigue count")
            source = f"block table, {len(rows)} row{'s' if len(rows) != 1 else ''}"
            signal = envelope = digest = None
            path = None
    measured = drive
    if mapping is not None and theory == "large-deflection":  # the elastica's map over the duty's strains
        mapping = gauge_map(beam, gauge, f"{where} gauge", theory,
                            strain_extremes(cycles, None if peaks is None else tuple(peaks)))
    if mapping is not None:  # gauge strain → load-point force through the inverse map (flexcycle.measured)
        cycles = force_cycles(cycles, mapping)
        if peaks is not None:
            peaks = tuple(sorted(float(v) for v in mapping.drive(np.array(peaks))))
        signal = None if signal is None else mapping.drive(signal)
        envelope = force_envelope(envelope, mapping)
        where_gauge = f"x = {gauge.x * 1e3:g} mm, {gauge.face} face" + (f", ply {gauge.ply}" if gauge.ply else "")
        source += f"; strain at a gauge ({where_gauge}) as load-point force"
        drive = "force"
    if cycles.lo.size == 0 or cycles.lo.min() == cycles.hi.max() == 0:  # lo <= hi: every extreme is zero
        raise InputError(f"{where}: the duty never loads the part (no cycles, or every drive is zero)")
    return Duty(drive, cycles, source, signal, per_day, residue, path, envelope, digest, spectral, sample_rate,
                measured, gauge, mapping, peaks)


@dataclass(frozen=True)
class LoadedDuty:
    """A design's duty read and counted once, to be shared by many designs (a sweep's candidates).

    duty : Duty; notes : tuple[str, ...] — what the loader said about the duty (reported as warnings)
    """

    duty: Duty
    notes: tuple[str, ...] = ()


def load_duty(doc: Mapping, name: str, base_dir: Path, progress: Callable[[int, int], None] | None = None,
              beam: Beam | None = None, theory: str = "linear") -> LoadedDuty:
    """Read and count the [duty] of a parsed design document once (``name`` and ``base_dir`` as in
    `parse_design`; ``beam``: the part, which a strain-gauge duty needs to turn strain into drive force, so
    that such a duty belongs to its beam and is not shared by others; ``theory``: the beam theory of that map,
    ``"linear"`` or ``"large-deflection"``)."""
    notes: list[str] = []
    return LoadedDuty(_duty(doc, name, base_dir, notes, progress, beam, theory), tuple(notes))


def parse_design(doc: Mapping, name: str, base_dir: Path, path: Path | None = None,
                 progress: Callable[[int, int], None] | None = None, duty_name: str | None = None,
                 duty: LoadedDuty | None = None) -> Design:
    """Build a Design from a parsed TOML document.

    name : str — the file name used in messages
    base_dir : Path — folder that relative profile paths start from
    progress : Callable[[int, int], None] | None — called with (bytes read, file size) while a time history
        is read (for a progress display; the library prints nothing)
    duty_name : str | None — the file the [duty] table came from, for its messages, when not ``name``
        (a common duty given to several designs)
    duty : LoadedDuty | None — the duty already read and counted (`load_duty`): the document's [duty] is then
        neither read nor counted again
    """
    _unknown(doc, TOP_KEYS, name)
    _unknown(_table(doc, "beam", name), BEAM_KEYS, f"{name} [beam]")  # before the plies: a stray key says where
    notes: list[str] = []
    title = doc.get("title", "untitled design")
    if not isinstance(title, str):
        raise InputError(f"{name} title: must be a string, got {title!r}")
    user = _table(doc, "material", name, required=False)
    with input_errors():  # a library or user material, a missing unit or a wrong dimension (mechanics)
        materials = resolve_materials(user, name)
        factors = read_factors(_table(doc, "fatigue", name, required=False),
                               _table(doc, "environment", name, required=False), materials, name)
        materials = {key: factored(material, factors[key]) for key, material in materials.items()}
        plies = _plies(doc, materials, name, notes)
        beam = _beam(doc, plies, name, notes)
    theory = _choice(doc["beam"].get("theory", "linear"), THEORIES, f"{name} [beam] theory")
    if theory == "large-deflection":
        with input_errors(f"{name} "):  # three- and four-point bending are not solved under the elastica
            refuse_unsolved(beam.support)
    loaded = duty if duty is not None else load_duty(doc, duty_name or name, base_dir, progress, beam, theory)
    notes.extend(loaded.notes)
    duty = loaded.duty
    fat = _table(doc, "fatigue", name, required=False)
    _unknown(fat, FATIGUE_KEYS, f"{name} [fatigue]")
    rule = _choice(fat.get("mean_stress", "goodman"), RULES, f"{name} [fatigue] mean_stress")
    miner = _number(fat.get("miner_limit", 1.0), f"{name} [fatigue] miner_limit")
    factor = _number(fat.get("stress_factor", 1.0), f"{name} [fatigue] stress_factor")
    if factor < 1.0:
        raise InputError(f"{name} [fatigue] stress_factor: a partial factor is >= 1, got {factor:g}")
    survival = _number(fat.get("survival", 0.5), f"{name} [fatigue] survival")
    if not survival < 1.0:
        raise InputError(f"{name} [fatigue] survival: a probability of survival strictly between 0 and 1 "
                         f"(0.5 median lives, 0.9 for B10 lives), got {survival:g}")
    used = {p.material.name: p.material for p in plies}
    notes += [note for material in used.values() for note in material.notes]
    required = None
    if "required_life" in fat:
        required = _required_life(fat["required_life"], duty, f"{name} [fatigue] required_life")
    report = _table(doc, "report", name, required=False)
    _unknown(report, REPORT_KEYS, f"{name} [report]")
    units = None if "units" not in report else _choice(report["units"], DISPLAY_SYSTEMS, f"{name} [report] units")
    unused = sorted(set(_table(doc, "environment", name, required=False)) - set(used))
    if unused:
        notes.append(f"{name} [environment]: {', '.join(unused)} not used by any ply; its knock-downs change nothing")
    return Design(title, path, beam, duty, rule, miner, factor, used, dict(doc), tuple(notes),
                  required, None if required is None else str(fat["required_life"]), units, theory, survival,
                  {key: factors[key] for key in used})


DISPLAY_SYSTEMS = ("si", "us")  # [report] units: SI or inch-pound display (flexcycle.display.SYSTEMS)
_COUNT_OF = re.compile(r"^\s*(?P<number>[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?)\s*(?P<what>blocks?|cycles?)\s*$")


def _required_life(value: Any, duty: Duty, where: str) -> float:
    """The required life in blocks of the duty [-].

    A bare number is blocks; ``"2e6 cycles"`` is divided by the cycles per block; a time (``"5 years"``,
    ``"90 days"``; pint's year is the Julian year of 365.25 days) is multiplied by blocks_per_day.
    """
    if isinstance(value, (int, float)) and not isinstance(value, bool):
        return _number(value, where)
    if not isinstance(value, str):
        raise InputError(f"{where}: blocks of the duty as a number (e.g. 20000), cycles (\"2e6 cycles\") or a "
                         f"time (\"5 years\"), got {value!r}")
    count = _COUNT_OF.match(value)
    if count is not None:
        number = _number(float(count.group("number")), where)
        return number if count.group("what").startswith("block") else number / float(duty.cycles.n_total)
    try:
        seconds = parse_quantity(value, "time", where)
    except MechanicsInputError as exc:
        raise InputError(f"{exc}; or give blocks of the duty as a bare number, or \"2e6 cycles\"") from None
    if not seconds > 0:
        raise InputError(f"{where}: a required life must be > 0, got {value!r}")
    if not duty.blocks_per_day:
        raise InputError(f"{where}: {value!r} is a time; [duty] blocks_per_day is needed to turn it into blocks "
                         "of the duty (or give the requirement in blocks, a bare number)")
    return seconds / 86_400.0 * duty.blocks_per_day


def load_design(path: Path, progress: Callable[[int, int], None] | None = None) -> Design:
    """Read and validate a design file; ``progress`` as in `parse_design`."""
    path = Path(path)
    return parse_design(read_document(path), path.name, path.parent, path, progress)


def read_document(path: Path) -> dict:
    """The parsed TOML of a design file; a missing file, invalid TOML (with its line) or non-UTF-8 text is an
    InputError."""
    if path.is_dir():
        raise InputError(f"{path}: is a directory, not a design file; give the design's TOML file, "
                         f"e.g. {path / 'design.toml'}")
    if not path.is_file():
        raise InputError(f"{path}: no such design file")
    try:
        doc = tomllib.loads(path.read_text(encoding="utf-8"))
    except tomllib.TOMLDecodeError as exc:
        text = str(exc)
        found = re.search(r"\s*\(at line (\d+), column (\d+)\)", text)
        if found:  # Python 3.11's tomllib puts the place at the end of the message
            raise InputError(f"{path.name}, line {found.group(1)}, column {found.group(2)}: not valid TOML "
                             f"({text[:found.start()]}); a value with a unit is a quoted string, e.g. span = \"420 mm\"") from None
        raise InputError(f"{path.name}: not valid TOML ({text})") from None
    except UnicodeDecodeError:
        raise InputError(f"{path.name}: not a UTF-8 text file") from None
    return doc
