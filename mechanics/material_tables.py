"""Material tables: reading and checking the keys, units and fatigue curves of one material's TOML table.

A material table (the package data ``mechanics/data/materials.toml`` and the ``[material.NAME]`` tables of a
design file) holds one key per property, each value a string with a unit (``"38.6 GPa"``). This module reads
those values to SI and checks them (keys known, units of the right dimension, values possible and plausible);
``flexcycle.mechanics.materials`` builds a ``Material`` from them.

Fatigue tables (``fatigue`` along the fibres, ``transverse_fatigue``, ``shear_fatigue``,
``interlaminar_fatigue``) hold one curve, or ``curves = [...]``, one per stress ratio R, for a
constant-life diagram. A curve gives the alternating amplitude at N cycles:

- ``power``:      amplitude = S1 * N**(-1/m)          (Burton et al., Wind Energy Handbook, p. 387)
- ``log-linear``: amplitude = S1 * (1 - b*log10 N)     (Mandell 1982, recalled)

on a strain basis when S1 is a strain (a bare number or ``"2.6 %"``), on a stress basis when S1
is a stress. This module only reads and checks curves; evaluating them belongs to ``life``.
"""

from __future__ import annotations

import math
from collections.abc import Mapping
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


# ---------------------------------------------------------------------------------------------
# Small readers: every error names where, the key, and what would be right.

def fail(where: str, key: str, message: str) -> InputError:
    """An InputError reading ``<where> <key>: <message>`` (key a dotted path, may be empty)."""
    return InputError(f"{where} {key}: {message}" if key else f"{where}: {message}")


def _join(path: str, key: str) -> str:
    return f"{path}.{key}" if path else key


def check_keys(table: Mapping, allowed: tuple[str, ...], where: str, path: str = "") -> None:
    for key in table:
        if key not in allowed:
            hint = did_you_mean(str(key), allowed)
            raise fail(where, _join(path, str(key)), f"unknown key; {hint}allowed keys: {', '.join(allowed)}")


def read_name(value: object, names: tuple[str, ...], where: str, key: str) -> str:
    """``value`` if it is one of ``names``; otherwise an error suggesting the nearest (difflib)."""
    if isinstance(value, str) and value in names:
        return value
    raise fail(where, key, f"unknown name {value!r}; {did_you_mean(value, names)}"
                            f"must be one of {', '.join(map(repr, names))}")


def _bare_number(value: object, where: str, key: str, example: str) -> float:
    if isinstance(value, bool) or not isinstance(value, (int, float)):
        raise fail(where, key, f"expected a bare number, e.g. {example}, got {value!r}")
    number = float(value)
    if not math.isfinite(number):
        raise fail(where, key, f"must be a finite number, got {value!r}")
    return number


def read_text(value: object, where: str, key: str) -> str:
    if not isinstance(value, str) or not value.strip():
        raise fail(where, key, f"expected a non-empty text string, got {value!r}")
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
        raise fail(where, path, f"a fatigue curve is a table of {', '.join(CURVE_KEYS)}; got {curve!r}")
    check_keys(curve, CURVE_KEYS, where, path)
    for key in ("form", "R", "S1"):
        if key not in curve:
            raise fail(where, key_of(key), "missing; a curve needs form, R and S1 (and m for power, b for log-linear)")

    form = read_name(curve["form"], FATIGUE_FORMS, where, key_of("form"))
    R = _bare_number(curve["R"], where, key_of("R"), "R = -1 or R = 0.1")
    if R == 1.0:
        raise fail(where, key_of("R"), "R = 1 is a constant (static) load, not a cycle; use e.g. R = -1 or R = 0.1")

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
            raise fail(where, key_of(key), f"belongs to the other curve form; a {form} curve takes {slope} (and {slope2})")
    if slope not in curve:
        raise fail(where, key_of(slope), f"missing; a {form} curve needs {slope}")
    if form == "power":
        parsed["m"] = _power_slope(curve["m"], where, key_of("m"))
    else:
        parsed["b"] = _log_slope(curve["b"], where, key_of("b"), allow_zero=False)

    if "limit" in curve:
        limit_basis = "strain" if is_dimensionless(curve["limit"], f"{where} {key_of('limit')}") else "stress"
        if limit_basis != basis:
            raise fail(where, key_of("limit"), f"must be on the same basis as S1 (a {basis}), got {curve['limit']!r}")
        limit = _basis_value(curve["limit"], basis, where, key_of("limit"))
        if limit >= S1:
            raise fail(where, key_of("limit"), f"the fatigue-limit amplitude must be below S1 = {curve['S1']!r}, got {curve['limit']!r}")
        parsed["limit"] = limit
    if "knee" in curve:
        knee = _bare_number(curve["knee"], where, key_of("knee"), "knee = 1e7 (cycles)")
        if knee <= 1.0:
            raise fail(where, key_of("knee"), f"cycles of the knee must be > 1, got {curve['knee']!r}")
        parsed["knee"] = knee
    if slope2 in curve:
        if "knee" not in curve:
            raise fail(where, key_of(slope2), "is the slope after the knee; give knee (cycles) too")
        if form == "power":
            parsed["m2"] = _power_slope(curve["m2"], where, key_of("m2"))
        else:
            parsed["b2"] = _log_slope(curve["b2"], where, key_of("b2"), allow_zero=True)

    if "sd_log10N" in curve:
        sd = _bare_number(curve["sd_log10N"], where, key_of("sd_log10N"), "sd_log10N = 0.3 (decades)")
        if sd < 0.0:
            raise fail(where, key_of("sd_log10N"), f"a standard deviation of log10 N must be >= 0 (typical 0.1-0.6 "
                                                   f"decades), got {curve['sd_log10N']!r}")
        parsed["sd_log10N"] = sd
    if "source" in curve:
        parsed["source"] = read_text(curve["source"], where, key_of("source"))
    elif default_source is not None:
        parsed["source"] = default_source
    else:
        raise fail(where, key_of("source"), "missing; every library curve names its source")
    return MappingProxyType(parsed)


def _basis_value(value: object, basis: str, where: str, key: str) -> float:
    number = parse_quantity(value, basis, f"{where} {key}")
    if number <= 0.0:
        raise fail(where, key, f"must be a positive amplitude, got {value!r}")
    if basis == "strain" and number >= STRAIN_MAX:
        raise fail(
            where, key,
            f"{value!r} read as a strain is {number:.3g} ({100 * number:.3g} %), not below {STRAIN_MAX:g}: "
            f"surely a stress without its unit (write e.g. \"800 MPa\"), or a percent without \"%\" (write e.g. \"2.6 %\")",
        )
    return number


def _power_slope(value: object, where: str, key: str) -> float:
    m = _bare_number(value, where, key, "m = 10")
    if m <= 1.0:
        raise fail(where, key, f"inverse slope of a power curve must be > 1 (typical 8-20), got {value!r}")
    return m


def _log_slope(value: object, where: str, key: str, allow_zero: bool) -> float:
    b = _bare_number(value, where, key, "b = 0.1")
    low_ok = b >= 0.0 if allow_zero else b > 0.0
    if not low_ok or b >= 1.0:
        low = "0 <=" if allow_zero else "0 <"
        raise fail(where, key, f"fraction of S1 lost per decade of cycles must be {low} b < 1 (typical 0.1), got {value!r}")
    return b


def parse_fatigue_table(value: object, where: str, path: str, default_source: str | None) -> tuple[Mapping[str, object], ...]:
    """A fatigue table: one curve, or ``curves = [...]`` of distinct R and one basis (a constant-life diagram)."""
    if not isinstance(value, Mapping):
        raise fail(where, path, "expected a table: form, R, S1, m|b ... or curves = [ {R = ..., ...}, ... ]")
    if "curves" not in value:
        return (_parse_curve(value, where, path, default_source),)
    check_keys(value, ("curves", "source"), where, path)
    table_source = read_text(value["source"], where, _join(path, "source")) if "source" in value else default_source
    raw = value["curves"]
    if not isinstance(raw, list) or len(raw) < 2:
        raise fail(where, _join(path, "curves"), "a constant-life diagram needs a list of at least 2 curves of distinct R; for one curve give its keys directly")
    curves = tuple(
        _parse_curve(c, where, f"{path}.curves[{i}]", table_source) for i, c in enumerate(raw, start=1)
    )
    ratios = [c["R"] for c in curves]
    if len(set(ratios)) != len(ratios):
        raise fail(where, _join(path, "curves"), f"each curve of a constant-life diagram needs its own R, got R = {ratios}")
    if len({c["basis"] for c in curves}) > 1:
        raise fail(where, _join(path, "curves"), "all curves of a constant-life diagram must share one basis (S1 all strains or all stresses)")
    return curves


# ---------------------------------------------------------------------------------------------
# Static values.

def check_values(values: dict[str, float], kind: str, where: str) -> None:
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
            raise fail(where, key, f"a {what} must be > 0, got {shown}{magnitude}")
    for key, (lo, hi) in PLAUSIBLE.items():
        what = positive[key]
        if key in values and not lo <= values[key] <= hi:
            shown = f"{values[key]:.6g} {si_unit[QUANTITY_KIND[key]]}".strip()
            raise fail(where, key, f"a {what} of {shown} lies outside {lo:g} to {hi:g} "
                                    f"{si_unit[QUANTITY_KIND[key]]}, beyond any structural material; check the number and its unit")
    for key in ("eps1t", "eps1c"):
        if key in values and values[key] >= STRAIN_MAX:
            raise fail(where, key, f"an ultimate strain of {100 * values[key]:.3g} % is implausible (must be < {100 * STRAIN_MAX:g} %); a strain in percent needs \"%\", e.g. \"2.1 %\"")

    E1, E2, nu12 = values["E1"], values["E2"], values["nu12"]
    if kind == "core":
        if not math.isclose(E1, E2, rel_tol=1e-6):
            raise fail(where, "E2", f"a core is isotropic, so E2 must equal E1 ({E1:.6g} Pa), got {E2:.6g} Pa; use kind = \"ply\" for an orthotropic material")
        if not 0.0 <= nu12 < 0.5:
            raise fail(where, "nu12", f"an isotropic core needs 0 <= nu12 < 0.5 (typical 0.3), got {nu12:g}")
    else:
        bound = math.sqrt(E1 / E2)
        if not abs(nu12) < bound:
            raise fail(
                where, "nu12",
                f"|nu12| = {abs(nu12):g} breaks the orthotropic restriction |nu12| < sqrt(E1/E2) = {bound:.4g} "
                f"(E1 = {E1 / 1e9:.4g} GPa, E2 = {E2 / 1e9:.4g} GPa) "
                f"(Jones, Mechanics of Composite Materials, 2nd ed., Sec. 2.4.3): no stable material has it; "
                f"check nu12 (typically 0.2-0.35 for a ply) and that E1 and E2 are not swapped",
            )
