"""Tests of flexcycle.mechanics.materials: the bundled library against published tables, user materials,
units, and the validation of impossible input.

Sources of the check values (see docs/references.md):
- Tsai & Hahn, Introduction to Composite Materials (1980), reproduced in Kaw, Mechanics of
  Composite Materials, 2nd ed., Table 2.1 (unidirectional glass/epoxy and carbon/epoxy);
  Tsai & Hahn (1980) for aramid/epoxy.
- USDA Wood Handbook (FPL-GTR-190), sugar maple at 12 % moisture; its clear-wood fatigue points
  (recalled).
- Burton et al., Wind Energy Handbook, p. 387 (glass/epoxy strain S-N slope m = 10).
- NIST SP 811, Appendix B: 1 in = 0.0254 m exactly, 1 lb = 0.45359237 kg exactly,
  1 lbf = 4.4482216152605 N exactly, 1 psi = 6.894757e3 Pa (rounded by NIST to 7 digits).
- Jones, Mechanics of Composite Materials, 2nd ed., Sec. 2.4.3: |nu12| < (E1/E2)^(1/2).
"""
from __future__ import annotations

import dataclasses
import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from flexcycle.mechanics.errors import InputError
from flexcycle.mechanics.material_tables import FATIGUE_TABLES, MATERIAL_KEYS_REQUIRED
from flexcycle.mechanics.materials import (
    Material,
    describe,
    library,
    material_from_table,
    resolve_materials,
)

REQUIRED_MATERIALS = (
    "e-glass-epoxy", "carbon-epoxy", "aramid-epoxy", "glass-epoxy-woven", "sugar-maple", "structural-foam",
)
NUMERIC_KEYS = MATERIAL_KEYS_REQUIRED + ("G13", "G23", "thickness", "S13", "eps1t", "eps1c")
GPa, MPa = 1e9, 1e6

# The [material.my-glass] example of the design-file contract (docs/design.md), verbatim.
DESIGN_EXAMPLE = {
    "E1": "40 GPa", "E2": "10 GPa", "G12": "4 GPa", "nu12": 0.28, "density": "1900 kg/m^3",
    "Xt": "1000 MPa", "Xc": "600 MPa", "Yt": "40 MPa", "Yc": "140 MPa", "S12": "70 MPa",
    "fatigue": {"form": "power", "R": -1, "S1": "800 MPa", "m": 10},
}
WHERE = "design.toml [material.my-glass]"


def _user(**changes: object) -> dict:
    """The docs/design.md example with some keys changed (a value of None removes the key)."""
    table = {k: (dict(v) if isinstance(v, dict) else v) for k, v in DESIGN_EXAMPLE.items()}
    for key, value in changes.items():
        if value is None:
            table.pop(key, None)
        else:
            table[key] = value
    return table


def _fatigue(**changes: object) -> dict:
    curve = dict(DESIGN_EXAMPLE["fatigue"])
    for key, value in changes.items():
        if value is None:
            curve.pop(key, None)
        else:
            curve[key] = value
    return curve


# ---------------------------------------------------------------------------------------------
# The library against published tables.

def test_library_loads_with_every_required_material():
    materials = library()
    assert set(REQUIRED_MATERIALS) <= set(materials)
    assert all(isinstance(m, Material) and m.name == name for name, m in materials.items())


def test_library_returns_a_fresh_dict_each_call():
    first = library()
    first.pop("e-glass-epoxy")
    assert "e-glass-epoxy" in library()


# (material, key, published value in SI). Tolerance rel=1e-12 below: the data file holds the
# published decimal figures, so only float conversion (GPa/MPa -> Pa) can differ.
PUBLISHED = [
    # Tsai & Hahn 1980, via Kaw Table 2.1: E-glass/epoxy, Vf about 0.45
    *[("e-glass-epoxy", k, v) for k, v in {
        "E1": 38.6 * GPa, "E2": 8.27 * GPa, "G12": 4.14 * GPa, "nu12": 0.26,
        "Xt": 1062 * MPa, "Xc": 610 * MPa, "Yt": 31 * MPa, "Yc": 118 * MPa, "S12": 72 * MPa}.items()],
    # Tsai & Hahn 1980, via Kaw Table 2.1: standard-modulus carbon/epoxy
    *[("carbon-epoxy", k, v) for k, v in {
        "E1": 181 * GPa, "E2": 10.3 * GPa, "G12": 7.17 * GPa, "nu12": 0.28,
        "Xt": 1500 * MPa, "Xc": 1500 * MPa, "Yt": 40 * MPa, "Yc": 246 * MPa, "S12": 68 * MPa}.items()],
    # Tsai & Hahn 1980: aramid/epoxy
    *[("aramid-epoxy", k, v) for k, v in {
        "E1": 76 * GPa, "E2": 5.5 * GPa, "G12": 2.3 * GPa, "nu12": 0.34,
        "Xt": 1400 * MPa, "Xc": 235 * MPa, "Yt": 12 * MPa, "Yc": 53 * MPa, "S12": 34 * MPa}.items()],
    # USDA Wood Handbook, sugar maple at 12 % moisture: E, MOR (used as Xt), compression parallel
    ("sugar-maple", "E1", 12.6 * GPa),
    ("sugar-maple", "Xt", 109 * MPa),
    ("sugar-maple", "Xc", 54 * MPa),
    # USDA Wood Handbook SG 0.63 (oven-dry mass, volume at 12 % moisture); hand calc:
    # density = 0.63 x 1000 kg/m^3 x (1 + 0.12) = 705.6 kg/m^3
    ("sugar-maple", "density", 0.63 * 1000.0 * 1.12),
    # docs/references.md densities (recalled figures, checked so the data keep them)
    ("e-glass-epoxy", "density", 1800.0),
    ("carbon-epoxy", "density", 1600.0),
    ("aramid-epoxy", "density", 1460.0),
]


@pytest.mark.parametrize(("name", "key", "published"), PUBLISHED, ids=[f"{n}-{k}" for n, k, _ in PUBLISHED])
def test_library_values_equal_published_tables(name, key, published):
    assert getattr(library()[name], key) == pytest.approx(published, rel=1e-12)


@pytest.mark.parametrize("name", REQUIRED_MATERIALS)
def test_every_value_and_curve_of_the_library_has_a_source(name):
    material = library()[name]
    for key in NUMERIC_KEYS:
        if getattr(material, key) is not None:
            assert material.sources.get(key, "").strip(), f"{name}.{key} has no source"
    for table, curves in material.fatigue.items():
        assert table in FATIGUE_TABLES
        for curve in curves:
            assert str(curve["source"]).strip(), f"{name}.{table} curve has no source"


def test_values_not_in_a_published_table_say_recalled():
    """docs/references.md gives the UD densities as recalled; the data must not pass them off as published."""
    for name in ("e-glass-epoxy", "carbon-epoxy", "aramid-epoxy"):
        assert "recalled" in library()[name].sources["density"]
    assert "Kaw Table 2.1" in library()["e-glass-epoxy"].sources["E1"]
    assert "Wood Handbook" in library()["sugar-maple"].sources["E1"]


def test_glass_epoxy_fatigue_is_burtons_strain_curve():
    """Burton et al., Wind Energy Handbook p. 387: strain-based power law with m = 10 for
    glass/epoxy; S1 = ultimate tensile strain Xt/E1 (common practice) = 1062/38600 = 2.751 %."""
    (curve,) = library()["e-glass-epoxy"].fatigue["fatigue"]
    assert curve["form"] == "power" and curve["basis"] == "strain" and curve["R"] == -1.0
    assert curve["m"] == 10.0
    assert curve["S1"] == pytest.approx(1062.0 / 38600.0, rel=1e-3)  # data rounds to 2.75 %


def test_sugar_maple_fatigue_fits_the_wood_handbook_points():
    """Wood Handbook clear-wood fatigue (recalled): R = -1, 3e7 cycles at 28 % of static strength;
    R = 0.1, 2e6 cycles at 60 %. Log-linear S/S0 = 1 - b log10 N through both points by hand:
    b(R=-1) = 0.72 / log10(3e7) = 0.72 / 7.4771 = 0.09629; b(R=0.1) = 0.40 / log10(2e6) = 0.06348."""
    curves = {c["R"]: c for c in library()["sugar-maple"].fatigue["fatigue"]}
    assert curves[-1.0]["b"] == pytest.approx(0.72 / math.log10(3e7), abs=5e-5)  # data keeps 3 digits
    assert curves[0.1]["b"] == pytest.approx(0.40 / math.log10(2e6), abs=5e-5)  # data keeps 3 digits
    # amplitude at 3e7 cycles, R = -1, is 28 % of the modulus of rupture 109 MPa
    c = curves[-1.0]
    assert c["S1"] * (1 - c["b"] * math.log10(3e7)) == pytest.approx(0.28 * 109e6, rel=2e-3)  # b rounded


def test_woven_glass_fatigue_is_mandells_ten_percent_per_decade():
    """Mandell 1982 (recalled): S/S0 = 1 - 0.1 log10 N, at R = 0.1 for the woven glass ply."""
    (curve,) = library()["glass-epoxy-woven"].fatigue["fatigue"]
    assert curve["form"] == "log-linear" and curve["b"] == 0.1 and curve["R"] == 0.1


def test_structural_foam_is_an_isotropic_core():
    foam = library()["structural-foam"]
    assert foam.kind == "core"
    assert foam.E1 == foam.E2
    assert foam.S13 is not None and foam.G13 > 0
    assert 90.0 <= foam.density <= 110.0  # "about 100 kg/m^3" in the brief


# ---------------------------------------------------------------------------------------------
# User materials.

def test_design_example_material_parses_to_si():
    """docs/design.md [material.my-glass], converted by hand: GPa x 1e9, MPa x 1e6; defaults
    G13 = G23 = G12 = 4e9 Pa, eps1t = Xt/E1 = 1e9/40e9 = 0.025, eps1c = Xc/E1 = 0.015,
    nu21 = nu12 E2/E1 = 0.28 x 10/40 = 0.07."""
    m = material_from_table("my-glass", DESIGN_EXAMPLE, WHERE)
    expected = {
        "E1": 40e9, "E2": 10e9, "G12": 4e9, "nu12": 0.28, "density": 1900.0,
        "Xt": 1000e6, "Xc": 600e6, "Yt": 40e6, "Yc": 140e6, "S12": 70e6,
        "G13": 4e9, "G23": 4e9, "eps1t": 0.025, "eps1c": 0.015,
    }
    for key, value in expected.items():
        assert getattr(m, key) == pytest.approx(value, rel=1e-12), key  # float conversion only
    assert m.nu21 == pytest.approx(0.07, rel=1e-12)
    assert m.kind == "ply" and m.thickness is None and m.S13 is None
    (curve,) = m.fatigue["fatigue"]
    assert dict(curve) == {
        "form": "power", "R": -1.0, "basis": "stress", "S1": pytest.approx(800e6, rel=1e-12), "m": 10.0,
        "b": None, "limit": None, "knee": None, "m2": None, "b2": None, "source": "design file",
    }
    assert m.sources["E1"] == "design file"
    assert "default" in m.sources["G23"]


def test_override_of_one_key_keeps_the_rest():
    base = library()["e-glass-epoxy"]
    m = material_from_table("e-glass-epoxy", {"Xt": "1100 MPa"}, "design.toml [material.e-glass-epoxy]", base)
    assert m.Xt == pytest.approx(1100e6, rel=1e-12)
    assert m.sources["Xt"] == "design file"
    for key in NUMERIC_KEYS:
        if key not in ("Xt", "eps1t"):
            assert getattr(m, key) == getattr(base, key), key
            assert m.sources.get(key) == base.sources.get(key), key
    # eps1t was a default (Xt/E1) and follows the new Xt: 1100/38600
    assert m.eps1t == pytest.approx(1100e6 / 38.6e9, rel=1e-12)
    assert m.description == base.description
    # the strain-basis fibre curve starts at the static strain (S1 = Xt/E1): it follows the new Xt
    assert m.fatigue["fatigue"][0]["S1"] == pytest.approx(base.fatigue["fatigue"][0]["S1"] * 1100 / 1062, rel=1e-12)
    for table in ("shear_fatigue", "interlaminar_fatigue"):
        assert m.fatigue[table] == base.fatigue[table]


def test_override_of_a_fatigue_table_replaces_the_whole_table():
    base = library()["e-glass-epoxy"]
    table = {"fatigue": {"form": "log-linear", "R": 0.1, "S1": "300 MPa", "b": 0.1}}
    m = material_from_table("e-glass-epoxy", table, "design.toml [material.e-glass-epoxy]", base)
    (curve,) = m.fatigue["fatigue"]
    assert curve["form"] == "log-linear" and curve["m"] is None and curve["basis"] == "stress"
    assert m.fatigue["shear_fatigue"] == base.fatigue["shear_fatigue"]  # the other tables stay


def test_resolve_materials_adds_user_ones_and_overrides_library_ones():
    materials = resolve_materials(
        {"my-glass": DESIGN_EXAMPLE, "carbon-epoxy": {"thickness": "0.15 mm"}}, "design.toml"
    )
    assert set(REQUIRED_MATERIALS) | {"my-glass"} <= set(materials)
    assert materials["carbon-epoxy"].thickness == pytest.approx(0.15e-3, rel=1e-12)
    assert materials["carbon-epoxy"].E1 == library()["carbon-epoxy"].E1
    assert library()["carbon-epoxy"].thickness == pytest.approx(0.125e-3, rel=1e-12)  # library untouched


def test_resolve_materials_suggests_a_library_name_for_a_near_miss():
    with pytest.raises(InputError, match=r"design\.toml \[material\.e-glass-epxy\].*'e-glass-epoxy'"):
        resolve_materials({"e-glass-epxy": {"Xt": "1100 MPa"}}, "design.toml")


def test_user_material_with_cld_and_all_curve_options():
    table = _user(
        fatigue={"curves": [
            {"R": 0.1, "form": "power", "S1": "1.8 %", "m": 10, "limit": "0.3 %", "knee": 1e7, "m2": 20},
            {"R": -1, "form": "power", "S1": "1.5 %", "m": 10},
            {"R": 10, "form": "power", "S1": "1.2 %", "m": 12},
        ]},
        shear_fatigue={"form": "log-linear", "R": -1, "S1": "70 MPa", "b": 0.1, "knee": 1e6, "b2": 0.02},
    )
    m = material_from_table("my-glass", table, WHERE)
    curves = m.fatigue["fatigue"]
    assert [c["R"] for c in curves] == [0.1, -1.0, 10.0]
    assert all(c["basis"] == "strain" for c in curves)
    assert curves[0]["S1"] == pytest.approx(0.018, rel=1e-12)  # "1.8 %" = 0.018 by definition
    assert curves[0]["limit"] == pytest.approx(0.003, rel=1e-12)
    assert curves[0]["knee"] == 1e7 and curves[0]["m2"] == 20.0
    (shear,) = m.fatigue["shear_fatigue"]
    assert shear["b2"] == 0.02 and shear["knee"] == 1e6


def test_material_is_frozen():
    m = library()["carbon-epoxy"]
    with pytest.raises(dataclasses.FrozenInstanceError):
        m.E1 = 1.0  # type: ignore[misc]


# ---------------------------------------------------------------------------------------------
# Units: inch-pound input gives the same SI values (NIST SP 811).

PSI = 6894.757  # Pa, NIST SP 811 (rounded there to 7 significant digits)
INCH = 0.0254  # m, exact by definition (NIST SP 811)
POUND = 0.45359237  # kg, exact by definition (NIST SP 811)


def test_inch_pound_input_equals_metric():
    imperial = _user(
        E1="5.8e6 psi", E2="1.45e6 psi", G12="0.58e6 lbf/in^2", density="0.0686 lb/in^3",
        Xt="145 ksi", Xc="87 ksi", Yt="5.8 ksi", Yc="20.3 ksi", S12="10.15 ksi",
        thickness="0.008 in", fatigue=_fatigue(S1="116 ksi"),
    )
    m = material_from_table("my-glass", imperial, WHERE)
    rel_psi = 1e-7  # NIST gives 1 psi to 7 digits; pint derives it from the exact lbf and inch
    assert m.E1 == pytest.approx(5.8e6 * PSI, rel=rel_psi)
    assert m.E2 == pytest.approx(1.45e6 * PSI, rel=rel_psi)
    assert m.G12 == pytest.approx(0.58e6 * PSI, rel=rel_psi)
    assert m.Xt == pytest.approx(145e3 * PSI, rel=rel_psi)
    assert m.Xc == pytest.approx(87e3 * PSI, rel=rel_psi)
    assert m.S12 == pytest.approx(10.15e3 * PSI, rel=rel_psi)
    assert m.fatigue["fatigue"][0]["S1"] == pytest.approx(116e3 * PSI, rel=rel_psi)
    # exact definitions: only float rounding may differ
    assert m.thickness == pytest.approx(0.008 * INCH, rel=1e-12)
    assert m.density == pytest.approx(0.0686 * POUND / INCH**3, rel=1e-12)


def test_psi_is_lbf_per_square_inch_exactly():
    """NIST SP 811: 1 lbf = 4.4482216152605 N exactly, 1 in = 0.0254 m exactly, so
    1 psi = 4.4482216152605 / 0.0254^2 = 6894.7572932 Pa."""
    a = material_from_table("a", _user(Xt="150000 psi"), WHERE)
    b = material_from_table("b", _user(Xt="150000 lbf/in^2"), WHERE)
    assert a.Xt == pytest.approx(b.Xt, rel=1e-12)
    assert a.Xt == pytest.approx(150000 * 4.4482216152605 / INCH**2, rel=1e-12)


# ---------------------------------------------------------------------------------------------
# Validation: each impossible input raises InputError naming where and the key.

INVALID = [
    # (id, table, key path expected in the message as "<path>:")
    ("unknown-key", _user(E_1="40 GPa"), "E_1"),
    ("missing-required", _user(E2=None), "E2"),
    ("no-unit", _user(E1="40"), "E1"),
    ("bare-number-modulus", _user(E1=40e9), "E1"),
    ("wrong-dimension", _user(E1="40 mm"), "E1"),
    ("density-dimension", _user(density="1900 kg"), "density"),
    ("nu12-dimension", _user(nu12="0.3 GPa"), "nu12"),
    ("negative-modulus", _user(E2="-10 GPa"), "E2"),
    ("zero-shear-modulus", _user(G12="0 GPa"), "G12"),
    ("negative-compressive-strength", _user(Xc="-600 MPa"), "Xc"),
    ("negative-density", _user(density="-1900 kg/m^3"), "density"),
    ("zero-thickness", _user(thickness="0 mm"), "thickness"),
    ("negative-G13", _user(G13="-1 GPa"), "G13"),
    ("strain-not-percent", _user(eps1t=2.1), "eps1t"),
    ("kind", _user(kind="sandwich"), "kind"),
    ("core-poisson", _user(kind="core", E2="40 GPa", nu12=0.5), "nu12"),
    ("core-negative-poisson", _user(kind="core", E2="40 GPa", nu12=-0.1), "nu12"),
    ("core-not-isotropic", _user(kind="core", nu12=0.3), "E2"),
    ("ply-stability", _user(E2="40 GPa", nu12=1.2), "nu12"),
    ("fatigue-form", _user(fatigue=_fatigue(form="exponential")), "fatigue.form"),
    ("fatigue-unknown-key", _user(fatigue=_fatigue(slope=10)), "fatigue.slope"),
    ("fatigue-missing-S1", _user(fatigue=_fatigue(S1=None)), "fatigue.S1"),
    ("power-m-one", _user(fatigue=_fatigue(m=1)), "fatigue.m"),
    ("power-missing-m", _user(fatigue=_fatigue(m=None)), "fatigue.m"),
    ("power-with-b", _user(fatigue=_fatigue(b=0.1)), "fatigue.b"),
    ("log-linear-b-zero", _user(transverse_fatigue={"form": "log-linear", "R": -1, "S1": "40 MPa", "b": 0}), "transverse_fatigue.b"),
    ("log-linear-b-negative", _user(transverse_fatigue={"form": "log-linear", "R": -1, "S1": "40 MPa", "b": -0.1}), "transverse_fatigue.b"),
    ("R-one", _user(fatigue=_fatigue(R=1)), "fatigue.R"),
    ("R-text", _user(fatigue=_fatigue(R="-1")), "fatigue.R"),
    ("S1-stress-without-unit", _user(fatigue=_fatigue(S1=800)), "fatigue.S1"),
    ("S1-wrong-dimension", _user(fatigue=_fatigue(S1="800 mm")), "fatigue.S1"),
    ("S1-negative", _user(fatigue=_fatigue(S1="-800 MPa")), "fatigue.S1"),
    ("limit-above-S1", _user(fatigue=_fatigue(limit="900 MPa")), "fatigue.limit"),
    ("limit-other-basis", _user(fatigue=_fatigue(limit="0.3 %")), "fatigue.limit"),
    ("knee-below-one", _user(fatigue=_fatigue(knee=0.5)), "fatigue.knee"),
    ("m2-without-knee", _user(fatigue=_fatigue(m2=20)), "fatigue.m2"),
    ("cld-one-curve", _user(fatigue={"curves": [_fatigue()]}), "fatigue.curves"),
    ("cld-same-R", _user(fatigue={"curves": [_fatigue(), _fatigue(S1="700 MPa")]}), "fatigue.curves"),
    ("cld-mixed-basis", _user(fatigue={"curves": [_fatigue(), _fatigue(R=0.1, S1="1.5 %")]}), "fatigue.curves"),
    ("cld-bad-curve", _user(fatigue={"curves": [_fatigue(), _fatigue(R=0.1, m=0.5)]}), "fatigue.curves[2].m"),
    ("sources-unknown-key", _user(sources={"E11": "a book"}), "sources.E11"),
]


@pytest.mark.parametrize(("table", "key"), [(t, k) for _, t, k in INVALID], ids=[i for i, _, _ in INVALID])
def test_invalid_input_raises_input_error_naming_the_key(table, key):
    with pytest.raises(InputError) as info:
        material_from_table("my-glass", table, WHERE)
    message = str(info.value)
    assert message.startswith(WHERE), message
    assert f"{key}:" in message or f"{key}," in message, message


def test_unknown_key_suggests_the_close_one():
    with pytest.raises(InputError, match=r"did you mean 'E1'"):
        material_from_table("my-glass", _user(E_1="40 GPa"), WHERE)


def test_stress_without_unit_as_S1_is_called_a_stress():
    with pytest.raises(InputError, match=r"stress without its unit"):
        material_from_table("my-glass", _user(fatigue=_fatigue(S1=800)), WHERE)


def test_stability_bound_rejects_nu12_of_3_with_equal_moduli():
    """Jones Sec. 2.4.3: |nu12| < sqrt(E1/E2) = 1 for E1 = E2, so nu12 = 3 is impossible."""
    with pytest.raises(InputError, match=r"nu12.*sqrt\(E1/E2\) = 1\b.*Jones"):
        material_from_table("my-glass", _user(E1="10 GPa", E2="10 GPa", nu12=3), WHERE)


@settings(max_examples=200, deadline=None)
@given(
    E1=st.floats(1e8, 5e11),
    E2=st.floats(1e8, 5e11),
    nu12=st.floats(-5.0, 5.0),
)
def test_accepted_plies_have_positive_definite_compliance(E1, E2, nu12):
    """Independent check of the bound by linear algebra: the in-plane normal compliances
    [[1/E1, -nu12/E1], [-nu12/E1, 1/E2]] (Jones Sec. 2.4; det = (1 - nu12^2 E2/E1)/(E1 E2)) must be
    positive definite exactly when a ply is accepted; a band of 1e-6 around the bound is skipped
    because float rounding decides there."""
    ratio = nu12**2 * E2 / E1
    if abs(ratio - 1.0) < 1e-6:
        return
    table = _user(E1=f"{E1!r} Pa", E2=f"{E2!r} Pa", nu12=nu12)
    S = np.array([[1 / E1, -nu12 / E1], [-nu12 / E1, 1 / E2]]) * min(E1, E2)  # scaled to order 1
    positive_definite = bool(np.all(np.linalg.eigvalsh(S) > 0))
    if positive_definite:
        m = material_from_table("p", table, WHERE)
        assert m.nu21 * m.E1 == pytest.approx(m.nu12 * m.E2, rel=1e-12)  # reciprocity nu21/E2 = nu12/E1
    else:
        with pytest.raises(InputError, match="nu12"):
            material_from_table("p", table, WHERE)


@settings(max_examples=50, deadline=None)
@given(value=st.floats(0.1, 1000.0))
def test_the_same_modulus_in_any_unit_is_the_same_material(value):
    """1 GPa = 1000 MPa = 1e9 Pa (SI prefixes): the parsed modulus does not depend on the unit."""
    in_gpa = material_from_table("a", _user(E1=f"{value!r} GPa", E2=f"{value / 4!r} GPa"), WHERE)
    in_mpa = material_from_table("b", _user(E1=f"{value * 1000!r} MPa", E2=f"{value * 250!r} MPa"), WHERE)
    assert in_gpa.E1 == pytest.approx(in_mpa.E1, rel=1e-12)
    assert in_gpa.E1 == pytest.approx(value * 1e9, rel=1e-12)


# ---------------------------------------------------------------------------------------------
# Text.

def test_describe_shows_values_with_units_and_sources():
    text = describe(library()["e-glass-epoxy"])
    for piece in ("38.6 GPa", "1062 MPa", "1800 kg/m^3", "0.2 mm", "2.751 %", "Kaw Table 2.1",
                  "power", "m = 10", "S1 = 2.75 %", "Burton"):
        assert piece in text, piece
    foam = describe(library()["structural-foam"])
    assert "105 MPa" in foam and "core" in foam
    maple = describe(library()["sugar-maple"])
    assert "R = -1" in maple and "R = 0.1" in maple and "b = 0.0963" in maple


def test_overriding_e1_rescales_the_library_strain_curve_with_a_note():
    """The library's E-glass/epoxy fibre curve starts at the static strain, S1 = Xt/E1 = 1062/38600 = 2.75 %
    (Burton et al., Wind Energy Handbook, p. 387: common practice). With E1 overridden to 30 GPa the static
    strain is 1062/30000 = 3.54 %: the inherited curve is scaled by 38.6/30, S1 = 2.75 % × 1.28667 = 3.5383 %,
    and a note says so; without it the curve would start below the static strain."""
    material = resolve_materials({"e-glass-epoxy": {"E1": "30 GPa"}}, "d.toml")["e-glass-epoxy"]
    (curve,) = material.fatigue["fatigue"]
    assert curve["S1"] == pytest.approx(0.0275 * 38.6 / 30, rel=1e-12)  # exact scaling
    assert material.eps1t == pytest.approx(1062 / 30000, rel=1e-12)
    assert any("E1 overridden" in note and "rescaled" in note for note in material.notes)
    # stress-basis curves that do not depend on E1 stay as they are
    (shear,) = material.fatigue["shear_fatigue"]
    assert shear["S1"] == pytest.approx(72e6, rel=1e-12)


def test_an_override_with_its_own_curve_keeps_it():
    table = {"E1": "30 GPa", "fatigue": {"form": "power", "R": -1, "S1": "2 %", "m": 10}}
    material = resolve_materials({"e-glass-epoxy": table}, "d.toml")["e-glass-epoxy"]
    assert material.fatigue["fatigue"][0]["S1"] == pytest.approx(0.02, rel=1e-12)
    assert not any("fibre direction" in note for note in material.notes)


def test_the_library_itself_has_no_notes():
    assert all(not material.notes for material in library().values())
