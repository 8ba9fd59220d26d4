"""Materials: the bundled library and user materials, as SI values with a source for each.

A material is either a ``ply`` (an orthotropic lamina: axis 1 along the fibres or the grain,
axis 2 across them in the ply's plane, axis 3 through the thickness) or a ``core`` (an
isotropic core material: E1 = E2, G13 is its shear modulus and S13 its shear strength).

Values come from TOML tables (the package data ``mechanics/data/materials.toml`` and the
``[material.NAME]`` tables of a design file), one key per property, each value a string with a
unit (``"38.6 GPa"``). Every value carries a source: the library names it in its ``sources``
table; a user material's values are sourced "design file".

Fatigue tables (``fatigue`` along the fibres, ``transverse_fatigue``, ``shear_fatigue``,
``interlaminar_fatigue``) hold one curve, or ``curves = [...]``, one per stress ratio R, for a
constant-life diagram. A curve gives the alternating amplitude at N cycles:

- ``power``:      amplitude = S1 * N**(-1/m)          (Burton et al., Wind Energy Handbook, p. 387)
- ``log-linear``: amplitude = S1 * (1 - b*log10 N)     (Mandell 1982, recalled)

on a strain basis when S1 is a strain (a bare number or ``"2.6 %"``), on a stress basis when S1
is a stress. This module only reads and checks curves; evaluating them belongs to ``life``.
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
from .units import is_dimensionless, parse_quantity

MATERIAL_KEYS_REQUIRED = ("E1", "E2", "G12", "nu12", "density", "Xt", "Xc", "Yt", "Yc", "S12")
MATERIAL_KEYS_OPTIONAL = ("G13", "G23", "thickness", "S13", "eps1t", "eps1c")
FATIGUE_TABLES = ("fatigue", "transverse_fatigue", "shear_fatigue", "interlaminar_fatigue")
MATERIAL_KINDS = ("ply", "core")
FATIGUE_FORMS = ("power", "log-linear")
CURVE_KEYS = ("form", "R", "S1", "m", "b", "limit", "knee", "m2", "b2", "source", "sd_log10N")

NUMERIC_KEYS = MATERIAL_KEYS_REQUIRED + MATERIAL_KEYS_OPTIONAL
TABLE_KEYS = ("description", "kind", "sources") + NUMERIC_KEYS + FATIGUE_TABLES

# The quantity kind (flexcycle.mechanics.units.KINDS) each numeric key is read as.
QUANTITY_KIND = {
    "E1": "stress", "E2": "stress", "G12": "stress", "G13": "stress", "G23": "stress",
    "nu12": "strain", "density": "density",
    "Xt": "stress", "Xc": "stress", "Yt": "stress", "Yc": "stress", "S12": "stress", "S13": "stress",
    "thickness": "length", "eps1t": "strain", "eps1c": "strain",
}

# A strain-basis value at or above this is not a plausible strain of a fibre composite, wood or
# foam (20 %): it is almost surely a stress written without its unit, or a percent without "%".
STRAIN_MAX = 0.2

# Where a value lies beyond any structural material, SI (common practice: the stiffest solid, diamond, has a
# modulus near 1.2 TPa, recalled; foams are near 1 MPa; densities run from foams near 20 kg/m^3 to metals near
# 20 000 kg/m^3). A value outside is a slip of number or unit, and past it the sums lose their meaning.
PLAUSIBLE = {
    **{key: (1e3, 1e13) for key in ("E1", "E2", "G12", "G13", "G23", "Xt", "Xc", "Yt", "Yc", "S12", "S13")},
    "density": (1.0, 1e5),
    "thickness": (1e-6, 1.0),
}

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


# ---------------------------------------------------------------------------------------------
# Small readers: every error names where, the key, and what would be right.

def _fail(where: str, key: str, message: str) -> InputError:
    """An InputError reading ``<where> <key>: <message>`` (key a dotted path, may be empty)."""
    return InputError(f"{where} {key}: {message}" if key else f"{where}: {message}")


def _join(path: str, key: str) -> str:
    return f"{path}.{key}" if path else key


def _check_keys(table: Mapping, allowed: tuple[str, ...], where: str, path: str = "") -> None:
    for key in table:
        if key not in allowed:
            hint = did_you_mean(str(key), allowed)
            raise _fail(where, _join(path, str(key)), f"unknown key; {hint}allowed keys: {', '.join(allowed)}")


def _name(value: object, names: tuple[str, ...], where: str, key: str) -> str:
    """``value`` if it is one of ``names``; otherwise an error suggesting the nearest (difflib)."""
    if isinstance(value, str) and value in names:
        return value
    raise _fail(where, key, f"unknown name {value!r}; {did_you_mean(value, names)}"
                            f"must be one of {', '.join(map(repr, names))}")


def _bare_number(value: object, where: str, key: str, example: str) -> float:
    if isinstance(value, bool) or not isinstance(value, (int, float)):
        raise _fail(where, key, f"expected a bare number, e.g. {example}, got {value!r}")
    number = float(value)
    if not math.isfinite(number):
        raise _fail(where, key, f"must be a finite number, got {value!r}")
    return number


def _text(value: object, where: str, key: str) -> str:
    if not isinstance(value, str) or not value.strip():
        raise _fail(where, key, f"expected a non-empty text string, got {value!r}")
    return value.strip()


# ---------------------------------------------------------------------------------------------
# Fatigue curves.

def _parse_curve(curve: object, where: str, path: str, default_source: str | None) -> Mapping[str, object]:
    """One fatigue curve, SI, checked against the range of each curve form.

    Parameters
    ----------
    curve : mapping — the curve's TOML table
    where : str — file and table for errors; path : str — the curve's key path, e.g. ``"fatigue"``
    default_source : str or None — source of a curve without one; None: a source is required

    Notes
    -----
    power: amplitude = S1 N^(-1/m), needs m > 1 (Burton et al., Wind Energy Handbook, p. 387,
    give m = 9-10 for glass); log-linear: amplitude = S1 (1 - b log10 N) (Mandell 1982,
    recalled: b about 0.1), needs 0 < b < 1 (b >= 1 reaches zero amplitude within 10 cycles).
    R = 1 is a static load, not a cycle. A strain-basis S1 of 0.2 or more is taken as a stress
    written without its unit.
    """
    def key_of(key: str) -> str:
        return _join(path, key)

    if not isinstance(curve, Mapping):
        raise _fail(where, path, f"a fatigue curve is a table of {', '.join(CURVE_KEYS)}; got {curve!r}")
    _check_keys(curve, CURVE_KEYS, where, path)
    for key in ("form", "R", "S1"):
        if key not in curve:
            raise _fail(where, key_of(key), "missing; a curve needs form, R and S1 (and m for power, b for log-linear)")

    form = _name(curve["form"], FATIGUE_FORMS, where, key_of("form"))
    R = _bare_number(curve["R"], where, key_of("R"), "R = -1 or R = 0.1")
    if R == 1.0:
        raise _fail(where, key_of("R"), "R = 1 is a constant (static) load, not a cycle; use e.g. R = -1 or R = 0.1")

    basis = "strain" if is_dimensionless(curve["S1"], f"{where} {key_of('S1')}") else "stress"
    S1 = _basis_value(curve["S1"], basis, where, key_of("S1"))

    parsed: dict[str, object] = {
        "form": form, "R": R, "basis": basis, "S1": S1,
        "m": None, "b": None, "limit": None, "knee": None, "m2": None, "b2": None,
    }
    slope, other = ("m", "b") if form == "power" else ("b", "m")
    slope2, other2 = ("m2", "b2") if form == "power" else ("b2", "m2")
    for key in (other, other2):
        if key in curve:
            raise _fail(where, key_of(key), f"belongs to the other curve form; a {form} curve takes {slope} (and {slope2})")
    if slope not in curve:
        raise _fail(where, key_of(slope), f"missing; a {form} curve needs {slope}")
    if form == "power":
        parsed["m"] = _power_slope(curve["m"], where, key_of("m"))
    else:
        parsed["b"] = _log_slope(curve["b"], where, key_of("b"), allow_zero=False)

    if "limit" in curve:
        limit_basis = "strain" if is_dimensionless(curve["limit"], f"{where} {key_of('limit')}") else "stress"
        if limit_basis != basis:
            raise _fail(where, key_of("limit"), f"must be on the same basis as S1 (a {basis}), got {curve['limit']!r}")
        limit = _basis_value(curve["limit"], basis, where, key_of("limit"))
        if limit >= S1:
            raise _fail(where, key_of("limit"), f"the fatigue-limit amplitude must be below S1 = {curve['S1']!r}, got {curve['limit']!r}")
        parsed["limit"] = limit
    if "knee" in curve:
        knee = _bare_number(curve["knee"], where, key_of("knee"), "knee = 1e7 (cycles)")
        if knee <= 1.0:
            raise _fail(where, key_of("knee"), f"cycles of the knee must be > 1, got {curve['knee']!r}")
        parsed["knee"] = knee
    if slope2 in curve:
        if "knee" not in curve:
            raise _fail(where, key_of(slope2), "is the slope after the knee; give knee (cycles) too")
        if form == "power":
            parsed["m2"] = _power_slope(curve["m2"], where, key_of("m2"))
        else:
            parsed["b2"] = _log_slope(curve["b2"], where, key_of("b2"), allow_zero=True)

    if "sd_log10N" in curve:
        sd = _bare_number(curve["sd_log10N"], where, key_of("sd_log10N"), "sd_log10N = 0.3 (decades)")
        if sd < 0.0:
            raise _fail(where, key_of("sd_log10N"), f"a standard deviation of log10 N must be >= 0 (typical 0.1-0.6 "
                                                   f"decades), got {curve['sd_log10N']!r}")
        parsed["sd_log10N"] = sd
    if "source" in curve:
        parsed["source"] = _text(curve["source"], where, key_of("source"))
    elif default_source is not None:
        parsed["source"] = default_source
    else:
        raise _fail(where, key_of("source"), "missing; every library curve names its source")
    return MappingProxyType(parsed)


def _basis_value(value: object, basis: str, where: str, key: str) -> float:
    number = parse_quantity(value, basis, f"{where} {key}")
    if number <= 0.0:
        raise _fail(where, key, f"must be a positive amplitude, got {value!r}")
    if basis == "strain" and number >= STRAIN_MAX:
        raise _fail(
            where, key,
            f"{value!r} read as a strain is {number:.3g} ({100 * number:.3g} %), not below {STRAIN_MAX:g}: "
            f"surely a stress without its unit (write e.g. \"800 MPa\"), or a percent without \"%\" (write e.g. \"2.6 %\")",
        )
    return number


def _power_slope(value: object, where: str, key: str) -> float:
    m = _bare_number(value, where, key, "m = 10")
    if m <= 1.0:
        raise _fail(where, key, f"inverse slope of a power curve must be > 1 (typical 8-20), got {value!r}")
    return m


def _log_slope(value: object, where: str, key: str, allow_zero: bool) -> float:
    b = _bare_number(value, where, key, "b = 0.1")
    low_ok = b >= 0.0 if allow_zero else b > 0.0
    if not low_ok or b >= 1.0:
        low = "0 <=" if allow_zero else "0 <"
        raise _fail(where, key, f"fraction of S1 lost per decade of cycles must be {low} b < 1 (typical 0.1), got {value!r}")
    return b


def _parse_fatigue_table(value: object, where: str, path: str, default_source: str | None) -> tuple[Mapping[str, object], ...]:
    """A fatigue table: one curve, or ``curves = [...]`` of distinct R and one basis (a constant-life diagram)."""
    if not isinstance(value, Mapping):
        raise _fail(where, path, "expected a table: form, R, S1, m|b ... or curves = [ {R = ..., ...}, ... ]")
    if "curves" not in value:
        return (_parse_curve(value, where, path, default_source),)
    _check_keys(value, ("curves", "source"), where, path)
    table_source = _text(value["source"], where, _join(path, "source")) if "source" in value else default_source
    raw = value["curves"]
    if not isinstance(raw, list) or len(raw) < 2:
        raise _fail(where, _join(path, "curves"), "a constant-life diagram needs a list of at least 2 curves of distinct R; for one curve give its keys directly")
    curves = tuple(
        _parse_curve(c, where, f"{path}.curves[{i}]", table_source) for i, c in enumerate(raw, start=1)
    )
    ratios = [c["R"] for c in curves]
    if len(set(ratios)) != len(ratios):
        raise _fail(where, _join(path, "curves"), f"each curve of a constant-life diagram needs its own R, got R = {ratios}")
    if len({c["basis"] for c in curves}) > 1:
        raise _fail(where, _join(path, "curves"), "all curves of a constant-life diagram must share one basis (S1 all strains or all stresses)")
    return curves


# ---------------------------------------------------------------------------------------------
# Materials.

def _check_values(values: dict[str, float], kind: str, where: str) -> None:
    """Reject impossible static data.

    Notes
    -----
    Moduli, strengths, density and thickness are positive; strengths are magnitudes.
    A ply obeys the restriction on the elastic constants of an orthotropic material,
    |nu12| < (E1/E2)^(1/2) (Jones, Mechanics of Composite Materials, 2nd ed., Sec. 2.4.3
    "Restrictions on Elastic Constants"; the equation number there not checked): otherwise the
    compliance matrix is not positive definite and the ply could give out energy.
    A core is isotropic: E1 = E2 and 0 <= nu12 < 0.5 (the isotropic bound nu < 1/2; a
    negative ratio is excluded as implausible for a structural foam).
    """
    positive = {
        "E1": "modulus", "E2": "modulus", "G12": "modulus", "G13": "modulus", "G23": "modulus",
        "density": "density", "thickness": "thickness",
        "Xt": "strength", "Xc": "strength", "Yt": "strength", "Yc": "strength",
        "S12": "strength", "S13": "strength", "eps1t": "ultimate strain", "eps1c": "ultimate strain",
    }
    si_unit = {"stress": "Pa", "density": "kg/m^3", "length": "m", "strain": ""}
    for key, what in positive.items():
        if key in values and values[key] <= 0.0:
            magnitude = " (give compressive strengths and strains as positive magnitudes)" if key in ("Xc", "Yc", "eps1c") else ""
            shown = f"{values[key]:.6g} {si_unit[QUANTITY_KIND[key]]}".strip()
            raise _fail(where, key, f"a {what} must be > 0, got {shown}{magnitude}")
    for key, (lo, hi) in PLAUSIBLE.items():
        what = positive[key]
        if key in values and not lo <= values[key] <= hi:
            shown = f"{values[key]:.6g} {si_unit[QUANTITY_KIND[key]]}".strip()
            raise _fail(where, key, f"a {what} of {shown} lies outside {lo:g} to {hi:g} "
                                    f"{si_unit[QUANTITY_KIND[key]]}, beyond any structural material; check the number and its unit")
    for key in ("eps1t", "eps1c"):
        if key in values and values[key] >= STRAIN_MAX:
            raise _fail(where, key, f"an ultimate strain of {100 * values[key]:.3g} % is implausible (must be < {100 * STRAIN_MAX:g} %); a strain in percent needs \"%\", e.g. \"2.1 %\"")

    E1, E2, nu12 = values["E1"], values["E2"], values["nu12"]
    if kind == "core":
        if not math.isclose(E1, E2, rel_tol=1e-6):
            raise _fail(where, "E2", f"a core is isotropic, so E2 must equal E1 ({E1:.6g} Pa), got {E2:.6g} Pa; use kind = \"ply\" for an orthotropic material")
        if not 0.0 <= nu12 < 0.5:
            raise _fail(where, "nu12", f"an isotropic core needs 0 <= nu12 < 0.5 (typical 0.3), got {nu12:g}")
    else:
        bound = math.sqrt(E1 / E2)
        if not abs(nu12) < bound:
            raise _fail(
                where, "nu12",
                f"|nu12| = {abs(nu12):g} breaks the orthotropic restriction |nu12| < sqrt(E1/E2) = {bound:.4g} "
                f"(E1 = {E1 / 1e9:.4g} GPa, E2 = {E2 / 1e9:.4g} GPa) "
                f"(Jones, Mechanics of Composite Materials, 2nd ed., Sec. 2.4.3): no stable material has it; "
                f"check nu12 (typically 0.2-0.35 for a ply) and that E1 and E2 are not swapped",
            )


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
    _check_keys(table, TABLE_KEYS, where)

    given_sources: dict[str, str] = {}
    if "sources" in table:
        if not isinstance(table["sources"], Mapping):
            raise _fail(where, "sources", "expected a table: key = \"where the value comes from\"")
        _check_keys(table["sources"], NUMERIC_KEYS, where, "sources")
        given_sources = {k: _text(v, where, f"sources.{k}") for k, v in table["sources"].items()}

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
                raise _fail(where, f"sources.{key}", "missing; every library value names its source")

    missing = [key for key in MATERIAL_KEYS_REQUIRED if key not in values]
    if missing:
        raise _fail(where, ", ".join(missing), f"missing; a new material needs all of {', '.join(MATERIAL_KEYS_REQUIRED)}")

    if "kind" in table:
        kind = _name(table["kind"], MATERIAL_KINDS, where, "kind")
    if "description" in table:
        description = _text(table["description"], where, "description")

    _check_values(values, kind, where)

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
            fatigue[table_name] = _parse_fatigue_table(table[table_name], where, table_name, default_source)

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
    dimensions and impossible values (see ``_check_values``, ``_parse_curve``).
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
