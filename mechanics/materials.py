"""Materials: the bundled library and user materials, as SI values with a source for each.

A material is either a ``ply`` (an orthotropic lamina: axis 1 along the fibres or the grain,
axis 2 across them in the ply's plane, axis 3 through the thickness) or a ``core`` (an
isotropic core material: E1 = E2, G13 is its shear modulus and S13 its shear strength).

Values come from TOML tables (the package data ``mechanics/data/materials.toml`` and the
``[material.NAME]`` tables of a design file), read and checked by ``flexcycle.mechanics.material_tables``
(keys, units, fatigue curves). Every value carries a source: the library names it in its ``sources``
table; a user material's values are sourced "design file". A user table of a library material's name
overrides it key by key; the library's fatigue curves it leaves in place are rescaled to the new static values.
"""

from __future__ import annotations

import functools
import math
import tomllib
from collections.abc import Mapping
from dataclasses import dataclass
from importlib import resources
from types import MappingProxyType

from .errors import InputError, did_you_mean
from .material_tables import (
    FATIGUE_TABLES,
    MATERIAL_KEYS_REQUIRED,
    MATERIAL_KINDS,
    NUMERIC_KEYS,
    QUANTITY_KIND,
    TABLE_KEYS,
    check_keys,
    check_values,
    fail,
    parse_fatigue_table,
    read_name,
    read_text,
)
from .units import parse_quantity

USER_SOURCE = "design file"
DEFAULT_SOURCES = {
    "G13": "default: G13 = G12 (transversely isotropic ply, or an isotropic core; common practice)",
    "G23": "default: G23 = G13 (assumption: no through-thickness value given)",
    "eps1t": "default: eps1t = Xt/E1 (linear elastic to failure)",
    "eps1c": "default: eps1c = Xc/E1 (linear elastic to failure)",
}
TABLE_LABELS = {
    "fatigue": "fibre direction (axis 1)",
    "transverse_fatigue": "transverse (axis 2)",
    "shear_fatigue": "in-plane shear (1-2)",
    "interlaminar_fatigue": "interlaminar / core shear (1-3)",
}
LIBRARY_FILE = "mechanics/data/materials.toml"


@dataclass(frozen=True)
class Material:
    """One material's static and fatigue data, SI.

    Attributes
    ----------
    name : str — the name design files use
    kind : str — ``"ply"`` (orthotropic lamina) or ``"core"`` (isotropic core material)
    description : str — what the material is
    E1 : float — modulus along the fibres (grain) [Pa]
    E2 : float — modulus across the fibres, in the ply's plane [Pa]
    G12 : float — in-plane shear modulus [Pa]
    nu12 : float — major Poisson's ratio (strain in 2 per strain in 1 under stress in 1) [-]
    density : float — density [kg/m^3]
    Xt : float — tensile strength along the fibres [Pa]
    Xc : float — compressive strength along the fibres, a positive magnitude [Pa]
    Yt : float — tensile strength across the fibres [Pa]
    Yc : float — compressive strength across the fibres, a positive magnitude [Pa]
    S12 : float — in-plane shear strength [Pa]
    G13 : float — transverse shear modulus in the 1-3 plane; a core's shear modulus [Pa]
    G23 : float — transverse shear modulus in the 2-3 plane [Pa]
    thickness : float or None — nominal cured ply thickness [m]
    S13 : float or None — interlaminar shear strength; a core's shear strength [Pa]
    eps1t : float — ultimate tensile strain along the fibres [-]
    eps1c : float — ultimate compressive strain along the fibres, a positive magnitude [-]
    fatigue : mapping — table name (``FATIGUE_TABLES``) -> tuple of curves, each a mapping
        ``{"form", "R", "basis", "S1", "m", "b", "limit", "knee", "m2", "b2", "source"}``:
        S1 and limit are amplitudes [-] on a strain basis or [Pa] on a stress basis, knee in
        cycles [-], absent entries None; only the tables given are present
    sources : mapping — numeric key -> where its value comes from
    notes : tuple[str, ...] — what reading the material did that its user should know (e.g. a library
        curve rescaled to overridden static values)
    """

    name: str
    kind: str
    description: str
    E1: float
    E2: float
    G12: float
    nu12: float
    density: float
    Xt: float
    Xc: float
    Yt: float
    Yc: float
    S12: float
    G13: float
    G23: float
    thickness: float | None
    S13: float | None
    eps1t: float
    eps1c: float
    fatigue: Mapping[str, tuple[Mapping[str, object], ...]]
    sources: Mapping[str, str]
    notes: tuple[str, ...] = ()

    @property
    def nu21(self) -> float:
        """Minor Poisson's ratio [-].

        Notes
        -----
        Reciprocal relation nu12/E1 = nu21/E2, the symmetry of the compliance matrix
        (Jones, Mechanics of Composite Materials, 2nd ed., Sec. 2.4; equation number not checked).
        """
        return self.nu12 * self.E2 / self.E1



def _build(
    name: str,
    table: Mapping,
    where: str,
    base: Material | None,
    default_source: str | None,
) -> Material:
    """Shared reader for library (default_source None: sources required) and user tables."""
    if not isinstance(table, Mapping):
        raise InputError(f"{where}: expected a table of material keys ({', '.join(MATERIAL_KEYS_REQUIRED)}, ...), got {table!r}")
    check_keys(table, TABLE_KEYS, where)

    given_sources: dict[str, str] = {}
    if "sources" in table:
        if not isinstance(table["sources"], Mapping):
            raise fail(where, "sources", "expected a table: key = \"where the value comes from\"")
        check_keys(table["sources"], NUMERIC_KEYS, where, "sources")
        given_sources = {k: read_text(v, where, f"sources.{k}") for k, v in table["sources"].items()}

    # Start from the base material (its own values only, not its defaults), then override.
    values: dict[str, float] = {}
    sources: dict[str, str] = {}
    fatigue: dict[str, tuple[Mapping[str, object], ...]] = {}
    kind, description = "ply", f"user material {name}"
    if base is not None:
        for key in NUMERIC_KEYS:
            value = getattr(base, key)
            if value is not None and base.sources.get(key) != DEFAULT_SOURCES.get(key):
                values[key] = value
                sources[key] = base.sources[key]
        fatigue = dict(base.fatigue)
        kind, description = base.kind, base.description

    for key in NUMERIC_KEYS:
        if key in table:
            values[key] = parse_quantity(table[key], QUANTITY_KIND[key], f"{where} {key}")
            if key in given_sources:
                sources[key] = given_sources[key]
            elif default_source is not None:
                sources[key] = default_source
            else:
                raise fail(where, f"sources.{key}", "missing; every library value names its source")

    missing = [key for key in MATERIAL_KEYS_REQUIRED if key not in values]
    if missing:
        raise fail(where, ", ".join(missing), f"missing; a new material needs all of {', '.join(MATERIAL_KEYS_REQUIRED)}")

    if "kind" in table:
        kind = read_name(table["kind"], MATERIAL_KINDS, where, "kind")
    if "description" in table:
        description = read_text(table["description"], where, "description")

    check_values(values, kind, where)

    # Defaults for the optional elastic constants and ultimate strains.
    if "G13" not in values:
        values["G13"], sources["G13"] = values["G12"], DEFAULT_SOURCES["G13"]
    if "G23" not in values:
        values["G23"], sources["G23"] = values["G13"], DEFAULT_SOURCES["G23"]
    if "eps1t" not in values:
        values["eps1t"], sources["eps1t"] = values["Xt"] / values["E1"], DEFAULT_SOURCES["eps1t"]
    if "eps1c" not in values:
        values["eps1c"], sources["eps1c"] = values["Xc"] / values["E1"], DEFAULT_SOURCES["eps1c"]

    notes: list[str] = []
    if base is not None:
        notes = _rescale_inherited_curves(base, values, table, fatigue, name)
    for table_name in FATIGUE_TABLES:
        if table_name in table:
            fatigue[table_name] = parse_fatigue_table(table[table_name], where, table_name, default_source)

    return Material(
        name=name,
        kind=kind,
        description=description,
        **{key: values[key] for key in MATERIAL_KEYS_REQUIRED + ("G13", "G23", "eps1t", "eps1c")},
        thickness=values.get("thickness"),
        S13=values.get("S13"),
        fatigue=MappingProxyType({t: fatigue[t] for t in FATIGUE_TABLES if t in fatigue}),
        sources=MappingProxyType({k: sources[k] for k in NUMERIC_KEYS if k in sources}),
        notes=tuple(notes),
    )


# The static value each fatigue table's curves start from, per basis: (strength key, modulus key). A library
# curve is built on it (S1 = Xt/E1 on a strain basis, S1 = S12 on a stress basis, ...: common practice, the
# curve starts at the static value); the ultimate strain eps1t, when given, replaces Xt/E1.
CURVE_REFERENCE = {
    "fatigue": ("Xt", "E1"),
    "transverse_fatigue": ("Yt", "E2"),
    "shear_fatigue": ("S12", "G12"),
    "interlaminar_fatigue": ("S13", "G13"),
}


def _reference(values: Mapping[str, float], table_name: str, basis: str) -> float | None:
    """The static value a curve of ``table_name`` starts from, in its basis [Pa or -]; None if unknown."""
    strength, modulus = CURVE_REFERENCE[table_name]
    if values.get(strength) is None:
        return None
    if basis == "stress":
        return values[strength]
    if table_name == "fatigue" and values.get("eps1t") is not None:
        return values["eps1t"]
    return values[strength] / values[modulus]


def _rescale_inherited_curves(base: Material, values: Mapping[str, float], table: Mapping,
                              fatigue: dict[str, tuple[Mapping[str, object], ...]], name: str) -> list[str]:
    """Rescale the base material's curves that the override leaves in place to its new static values.

    A library curve is drawn from the material's static value (S1 = Xt/E1 for a strain-basis fibre curve,
    S1 = S12 for a stress-basis shear curve: common practice). Overriding E1 (or Xt, eps1t, ...) without a new
    curve would leave the curve derived from the old value — it could start below the new static strain and
    shorten the life many-fold without a word. The curve's amplitudes (S1, limit) are scaled by the ratio of
    the new static value to the old, which keeps S1 at the same fraction of it; a note says so.
    """
    notes = []
    old_values = {key: getattr(base, key) for key in NUMERIC_KEYS}
    for table_name, curves in list(fatigue.items()):
        if table_name in table:
            continue  # the override gives its own curve
        basis = str(curves[0]["basis"])
        before, after = _reference(old_values, table_name, basis), _reference(values, table_name, basis)
        if before is None or after is None or math.isclose(before, after, rel_tol=1e-12):
            continue
        ratio = after / before
        fatigue[table_name] = tuple(
            MappingProxyType({**c, "S1": c["S1"] * ratio,
                              "limit": None if c["limit"] is None else c["limit"] * ratio,
                              "source": f"{c['source']} — rescaled by {ratio:.4g} to the overridden static value"})
            for c in curves
        )
        strength, modulus = CURVE_REFERENCE[table_name]
        changed = [key for key in (strength, modulus, "eps1t") if key in table] or [
            key for key in NUMERIC_KEYS if key in table]
        shown = [f"{_amplitude(c['S1'], basis)} → {_amplitude(c['S1'] * ratio, basis)}" for c in curves]
        notes.append(
            f"{name}: {', '.join(changed)} overridden, so the library's {basis}-basis {TABLE_LABELS[table_name]} "
            f"fatigue curve is rescaled to the new static value (S1 {', '.join(shown)}); give "
            f"[material.{name}.{table_name}] to set the curve yourself"
        )
    return notes


def material_from_table(name: str, table: Mapping, where: str, base: Material | None = None) -> Material:
    """A user material from a design file's ``[material.NAME]`` table.

    Parameters
    ----------
    name : str — the material's name in the design file
    table : mapping — the TOML table: the library's keys, values as strings with units
    where : str — prefix of every error, e.g. ``"design.toml [material.my-glass]"``
    base : Material or None — a library material of the same name; the table then overrides
        it key by key (a fatigue table replaces the whole table) and needs no required key

    Returns
    -------
    Material — SI values; the sources of the table's keys are "design file"

    Notes
    -----
    Raises InputError for unknown keys, missing required keys of a new material, wrong
    dimensions and impossible values (see ``flexcycle.mechanics.material_tables``).
    """
    return _build(name, table, where, base, USER_SOURCE)


@functools.cache
def _library() -> Mapping[str, Material]:
    text = resources.files("flexcycle.mechanics").joinpath("data/materials.toml").read_text(encoding="utf-8")
    try:
        tables = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        raise InputError(f"{LIBRARY_FILE}: not valid TOML ({exc})") from None
    return MappingProxyType(
        {name: _build(name, table, f"{LIBRARY_FILE} [{name}]", None, None) for name, table in tables.items()}
    )


def library() -> dict[str, Material]:
    """All bundled materials by name (read from the package data once; a fresh dict each call)."""
    return dict(_library())


def resolve_materials(user_tables: Mapping[str, Mapping], where: str) -> dict[str, Material]:
    """The library plus a design file's user materials (a user table of a library name overrides it).

    Parameters
    ----------
    user_tables : mapping — the design file's ``[material]`` table: name -> material table
    where : str — the design file, e.g. ``"design.toml"``; errors name ``[material.NAME]`` after it

    Returns
    -------
    dict — name -> Material, library and user materials
    """
    if not isinstance(user_tables, Mapping):
        raise InputError(f"{where} [material]: expected tables [material.NAME], got {user_tables!r}")
    materials = library()
    for name, table in user_tables.items():
        place = f"{where} [material.{name}]"
        base = materials.get(name)
        if base is None and isinstance(table, Mapping):
            missing = [k for k in MATERIAL_KEYS_REQUIRED if k not in table]
            hint = did_you_mean(name, materials, cutoff=0.8)
            if missing and hint:
                raise InputError(
                    f"{place}: {name!r} is not a library material ({hint.rstrip()}), "
                    f"and as a new material it lacks {', '.join(missing)}"
                )
        materials[name] = material_from_table(name, table, place, base)
    return materials


# ---------------------------------------------------------------------------------------------
# Text.

def _modulus(value: float) -> str:
    return f"{value / 1e9:.4g} GPa" if value >= 1e9 else f"{value / 1e6:.4g} MPa"


def _amplitude(value: float, basis: str) -> str:
    return f"{100 * value:.4g} %" if basis == "strain" else f"{value / 1e6:.4g} MPa"


def describe(material: Material) -> str:
    """Every value of a material with its unit and source, and its fatigue curves, as text lines."""
    m = material
    rows = [
        ("E1", _modulus(m.E1)), ("E2", _modulus(m.E2)), ("G12", _modulus(m.G12)),
        ("G13", _modulus(m.G13)), ("G23", _modulus(m.G23)),
        ("nu12", f"{m.nu12:.4g}"), ("density", f"{m.density:.4g} kg/m^3"),
        ("Xt", f"{m.Xt / 1e6:.4g} MPa"), ("Xc", f"{m.Xc / 1e6:.4g} MPa"),
        ("Yt", f"{m.Yt / 1e6:.4g} MPa"), ("Yc", f"{m.Yc / 1e6:.4g} MPa"),
        ("S12", f"{m.S12 / 1e6:.4g} MPa"),
        ("S13", None if m.S13 is None else f"{m.S13 / 1e6:.4g} MPa"),
        ("thickness", None if m.thickness is None else f"{m.thickness * 1e3:.4g} mm"),
        ("eps1t", f"{100 * m.eps1t:.4g} %"), ("eps1c", f"{100 * m.eps1c:.4g} %"),
    ]
    lines = [f"{m.name} ({m.kind}): {m.description}"]
    for key, text in rows:
        if text is not None:
            lines.append(f"  {key:<10}{text:<14}{m.sources.get(key, '')}")
    lines.append(f"  {'nu21':<10}{m.nu21:<14.4g}derived: nu12 E2/E1")
    if not m.fatigue:
        lines.append("  fatigue: none given")
    for table_name, curves in m.fatigue.items():
        lines.append(f"  {table_name} — {TABLE_LABELS[table_name]}:")
        for c in curves:
            basis = str(c["basis"])
            slope = f"m = {c['m']:g}" if c["form"] == "power" else f"b = {c['b']:g}"
            parts = [f"R = {c['R']:g}", str(c["form"]), f"{basis} basis", f"S1 = {_amplitude(c['S1'], basis)}", slope]
            if c["limit"] is not None:
                parts.append(f"limit = {_amplitude(c['limit'], basis)}")
            if c["knee"] is not None:
                parts.append(f"knee = {c['knee']:.3g} cycles")
            if c["m2"] is not None:
                parts.append(f"m2 = {c['m2']:g}")
            if c["b2"] is not None:
                parts.append(f"b2 = {c['b2']:g}")
            if c.get("sd_log10N") is not None:
                parts.append(f"sd_log10N = {c['sd_log10N']:g}")
            lines.append(f"    {', '.join(parts)}")
            lines.append(f"      source: {c['source']}")
    return "\n".join(lines)
