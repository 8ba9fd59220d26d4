"""The design-file loader, life/design.py (docs/design.md "Design file v1").

Checks: a design in the contract's form loads to SI values checked by hand; width tapers, block tables in
US units and bundled profiles; and one test per impossible input, each asserting that the message is a
``flexcycle.errors.InputError`` naming the file, the key (and row) and what would be right.

Unit factors used by hand here are exact by definition (NIST SP 811, 2008, App. B): 1 in = 0.0254 m;
1 lbf = 0.45359237 kg × 9.80665 m/s² = 4.4482216152605 N.
"""
from __future__ import annotations

import dataclasses
from pathlib import Path

import numpy as np
import pandas as pd
import pytest
import rainflow
from hypothesis import given, settings
from hypothesis import strategies as st

from flexcycle.design import Design, load_design, parse_design
from flexcycle.errors import InputError
from flexcycle.spectra.profiles import bundled_profile

INCH = 0.0254  # m per in, exact (NIST SP 811, App. B)
LBF = 0.45359237 * 9.80665  # N per lbf, exact: avoirdupois pound × standard gravity (NIST SP 811, App. B)

# The example design of docs/design.md ("Design file v1"), with one change: a full-length [[ply]] of the user
# material is added, since the example's only ply row ends at 300 mm of the 420 mm span and a beam needs
# at least one ply that runs its whole length. Its `load_spacing` ("four-point only") is kept: the loader
# ignores it for a cantilever and says so.
DESIGN_MD_EXAMPLE = """\
title = "Cargo-bike rear spring, glass/epoxy"
[beam]
support = "cantilever"        # cantilever | three-point | four-point | guided
span = "420 mm"
width = "50 mm"
load_spacing = "140 mm"       # four-point only: distance between the two load points
section = "beam"              # beam | plate

[[ply]]                       # from the tension face (under positive drive) to the other face
material = "e-glass-epoxy"    # library name, or a [material.NAME] below
angle = 0                     # fibre angle to the beam axis [deg]
thickness = "0.8 mm"
count = 4                     # optional, default 1: this ply repeated
ends_at = "300 mm"            # optional: distance from the root where this ply stops (ply drop)

[[ply]]
material = "my-glass"
angle = 0
thickness = "1 mm"
count = 2

[duty]
drive = "deflection"          # deflection | force, at the load point
profile = "ride.csv"          # a time history, path relative to this file
column = "deflection"
unit = "mm"
blocks_per_day = 2            # optional: how often the whole duty repeats per day

[fatigue]
mean_stress = "goodman"       # goodman | gerber | none | cld (several R curves)
miner_limit = 1.0             # damage sum taken as failure

[material.my-glass]           # a user material, same keys as the library
E1 = "40 GPa"
E2 = "10 GPa"
G12 = "4 GPa"
nu12 = 0.28
density = "1900 kg/m^3"
Xt = "1000 MPa"
Xc = "600 MPa"
Yt = "40 MPa"
Yc = "140 MPa"
S12 = "70 MPa"
[material.my-glass.fatigue]
form = "power"
R = -1
S1 = "800 MPa"
m = 10
"""

# A small time history [mm], its first line a comment; hand-counted by ASTM E1049-85 §5.4.4 below.
RIDE_CSV = """\
# test profile, invented
time_s,deflection
0,5
1,40
2,10
3,35
4,5
"""

# A small design for the error cases (few stations: nothing here runs the estimate).
SMALL = """\
title = "small test cantilever"
[beam]
support = "cantilever"
span = "200 mm"
width = "20 mm"
stations = 4

[[ply]]
material = "e-glass-epoxy"
thickness = "0.5 mm"

[[ply]]
material = "e-glass-epoxy"
angle = 0
thickness = "0.5 mm"
count = 2

[duty]
drive = "deflection"
cycles = [ { min = "2 mm", max = "10 mm", count = 1000 }, { min = "0 mm", max = "4 mm", count = 250 } ]

[fatigue]
mean_stress = "goodman"
"""

PROFILE_DUTY = """\
[duty]
drive = "deflection"
profile = "ride.csv"
column = "deflection"
unit = "mm"
"""
BLOCK_DUTY = SMALL[SMALL.index("[duty]"):SMALL.index("[fatigue]")]
SMALL_WITH_PROFILE = SMALL.replace(BLOCK_DUTY, PROFILE_DUTY + "\n")


def write_design(folder: Path, text: str, name: str = "small.toml", csv: str | None = RIDE_CSV) -> Path:
    """Write a design file (and ride.csv beside it) into ``folder``; return the design's path."""
    folder.mkdir(parents=True, exist_ok=True)
    if csv is not None:
        (folder / "ride.csv").write_text(csv, encoding="utf-8")
    path = folder / name
    path.write_text(text, encoding="utf-8")
    return path


def edit(text: str, old: str, new: str) -> str:
    """Replace ``old`` (which must be there, so that no case silently tests the unchanged design)."""
    assert old in text, f"test setup: {old!r} not in the design text"
    return text.replace(old, new, 1)


# ---------------------------------------------------------------------------------------------
# Good designs


@pytest.fixture()
def example(tmp_path, monkeypatch) -> Design:
    """The docs/design.md example, loaded from another working folder than its own."""
    path = write_design(tmp_path / "parts", DESIGN_MD_EXAMPLE, name="spring.toml")
    monkeypatch.chdir(tmp_path)  # the profile path must be taken from the design's folder, not the cwd
    return load_design(path)


def test_design_md_example_geometry_in_si(example):
    """span "420 mm" = 0.42 m, width "50 mm" = 0.05 m at root and tip (no taper); defaults section "beam"."""
    b = example.beam
    assert example.title == "Cargo-bike rear spring, glass/epoxy"
    assert b.support == "cantilever"
    assert b.span == pytest.approx(0.42, rel=1e-12)  # rel 1e-12: one decimal scaling, float rounding only
    assert b.length == pytest.approx(0.42, rel=1e-12)  # a cantilever's stations cover the whole span
    assert b.width_root == pytest.approx(0.05, rel=1e-12)
    assert b.width_tip == pytest.approx(0.05, rel=1e-12)
    assert b.section == "beam"
    assert b.load_spacing is None
    assert any("load_spacing" in n and "ignored" in n for n in example.notes)


def test_design_md_example_plies_expanded_by_count(example):
    """count = 4 with ends_at "300 mm" gives plies 1-4 of 0.8 mm ending at 0.3 m, then 2 full-length
    plies of 1 mm of the user material: 6 plies, total 4 × 0.8 + 2 × 1 = 5.2 mm."""
    plies = example.beam.plies
    assert len(plies) == 6
    for p in plies[:4]:
        assert p.material.name == "e-glass-epoxy"
        assert p.angle == 0.0
        assert p.thickness == pytest.approx(0.8e-3, rel=1e-12)
        assert p.ends_at == pytest.approx(0.300, rel=1e-12)
    for p in plies[4:]:
        assert p.material.name == "my-glass"
        assert p.thickness == pytest.approx(1e-3, rel=1e-12)
        assert p.ends_at is None
    assert sum(p.thickness for p in plies) == pytest.approx(5.2e-3, rel=1e-12)


def test_design_md_example_materials_in_si(example):
    """The library ply keeps its published E1 = 38.6 GPa (Tsai & Hahn 1980, via Kaw Table 2.1, docs/references.md);
    the user material's strings become SI: 40 GPa = 4e10 Pa, 1900 kg/m^3, 1000 MPa = 1e9 Pa, and its
    fatigue curve S1 "800 MPa" is a stress-basis curve of 8e8 Pa, m = 10, R = -1."""
    mats = example.materials
    assert set(mats) == {"e-glass-epoxy", "my-glass"}  # the materials the stack uses
    assert mats["e-glass-epoxy"].E1 == pytest.approx(38.6e9, rel=1e-12)
    mine = mats["my-glass"]
    assert (mine.E1, mine.E2, mine.G12) == pytest.approx((40e9, 10e9, 4e9), rel=1e-12)
    assert mine.nu12 == 0.28
    assert mine.density == pytest.approx(1900.0, rel=1e-12)
    assert (mine.Xt, mine.Xc, mine.Yt, mine.Yc, mine.S12) == pytest.approx((1e9, 6e8, 4e7, 1.4e8, 7e7), rel=1e-12)
    curve = mine.fatigue["fatigue"][0]
    assert curve["basis"] == "stress"
    assert curve["S1"] == pytest.approx(8e8, rel=1e-12)
    assert (curve["m"], curve["R"]) == (10.0, -1.0)


def test_design_md_example_duty_and_fatigue(example):
    """The profile ride.csv beside the design, column "deflection" in mm: samples 5, 40, 10, 35, 5 mm.

    Hand count, ASTM E1049-85 §5.4.4 (reversals A..E = 5, 40, 10, 35, 5): at D, X = |35 − 10| = 25 <
    Y = |10 − 40| = 30; at E, X = |5 − 35| = 30 >= Y = 25 and Y does not hold the start: count (10, 35)
    as one cycle, drop C, D. Left 5, 40, 5: X = 35 >= Y = 35 and Y holds the start: (5, 40) half a cycle,
    drop A; the residue 40 → 5 is another half. Total 2 cycles per block.
    """
    duty = example.duty
    assert duty.drive == "deflection"
    np.testing.assert_allclose(duty.signal, [0.005, 0.040, 0.010, 0.035, 0.005], rtol=1e-12)  # mm × 1e-3
    assert duty.cycles.n_total == pytest.approx(2.0, abs=1e-12)
    got = sorted(zip(duty.cycles.lo, duty.cycles.hi, duty.cycles.count))
    want = [(0.005, 0.040, 0.5), (0.005, 0.040, 0.5), (0.010, 0.035, 1.0)]
    np.testing.assert_allclose(np.array(got), np.array(want), rtol=1e-12)
    assert duty.extremes == pytest.approx((0.005, 0.040), rel=1e-12)
    assert duty.blocks_per_day == 2.0
    assert (example.mean_stress, example.miner_limit) == ("goodman", 1.0)
    assert example.stress_factor == 1.0  # default when [fatigue] leaves it out (docs/design.md defaults)


def test_width_taper_table(tmp_path):
    """width = { root = "50 mm", tip = "20 mm" }: linear taper, so at mid-span (100 mm of 200) the width is
    (50 + 20)/2 = 35 mm; in inches { root = "2 in", tip = "1 in" } is 0.0508 m → 0.0254 m."""
    text = edit(SMALL, 'width = "20 mm"', 'width = { root = "50 mm", tip = "20 mm" }')
    beam = load_design(write_design(tmp_path, text)).beam
    assert (beam.width_root, beam.width_tip) == pytest.approx((0.050, 0.020), rel=1e-12)
    assert float(beam.width(np.array(0.100))) == pytest.approx(0.035, rel=1e-12)

    text = edit(SMALL, 'width = "20 mm"', 'width = { root = "2 in", tip = "1 in" }')
    beam = load_design(write_design(tmp_path, text)).beam
    assert (beam.width_root, beam.width_tip) == pytest.approx((2 * INCH, INCH), rel=1e-12)


def test_block_table_in_lbf_gives_newtons(tmp_path):
    """A force block table in lbf: −10 lbf = −44.482216152605 N, 45 lbf = 200.17 N, 20 lbf = 88.96 N,
    rows kept in table order, fractional counts allowed (2.5)."""
    text = edit(SMALL, BLOCK_DUTY, """\
[duty]
drive = "force"
cycles = [ { min = "-10 lbf", max = "45 lbf", count = 500 }, { min = "0 lbf", max = "20 lbf", count = 2.5 } ]
""")
    duty = load_design(write_design(tmp_path, text)).duty
    assert duty.drive == "force"
    np.testing.assert_allclose(duty.cycles.lo, [-10 * LBF, 0.0], rtol=1e-12)  # rtol: float rounding only
    np.testing.assert_allclose(duty.cycles.hi, [45 * LBF, 20 * LBF], rtol=1e-12)
    np.testing.assert_allclose(duty.cycles.count, [500.0, 2.5], rtol=0)
    assert duty.signal is None


def test_block_table_and_span_in_inches(tmp_path):
    """span "16.5 in" = 0.4191 m; a deflection block table 0.1 in → 1.5 in is 2.54 mm → 38.1 mm."""
    text = edit(SMALL, 'span = "200 mm"', 'span = "16.5 in"')
    text = edit(text, BLOCK_DUTY, """\
[duty]
drive = "deflection"
cycles = [ { min = "0.1 in", max = "1.5 in", count = 100 } ]
""")
    d = load_design(write_design(tmp_path, text))
    assert d.beam.span == pytest.approx(16.5 * INCH, rel=1e-12)
    assert (d.duty.cycles.lo[0], d.duty.cycles.hi[0]) == pytest.approx((0.1 * INCH, 1.5 * INCH), rel=1e-12)
    assert d.duty.cycles.n_total == 100.0


def test_bundled_profile(tmp_path):
    """profile = "bundled:cargo-bike-ride": the demo profile shipped with spectra, column deflection_mm in
    mm; the signal is the file's column × 1e-3 (read here with pandas), and its cycles per block equal the
    total of the `rainflow` package's count_cycles (reference implementation of ASTM E1049-85)."""
    text = edit(SMALL, BLOCK_DUTY, """\
[duty]
drive = "deflection"
profile = "bundled:cargo-bike-ride"
column = "deflection_mm"
unit = "mm"
""")
    duty = load_design(write_design(tmp_path, text, csv=None)).duty
    column = pd.read_csv(bundled_profile("cargo-bike-ride"), comment="#", skipinitialspace=True)["deflection_mm"]
    expected = column.to_numpy(dtype=float) * 1e-3
    np.testing.assert_allclose(duty.signal, expected, rtol=1e-12)  # rtol: the mm → m scaling only
    reference = rainflow.count_cycles(expected)
    assert duty.cycles.n_total == pytest.approx(sum(n for _, n in reference), abs=1e-9)  # counts are k/2
    # the same cycles, not only as many: Σ range × count agrees too
    assert float((duty.cycles.range * duty.cycles.count).sum()) == pytest.approx(
        sum(r * n for r, n in reference), rel=1e-12)


@settings(max_examples=30, deadline=None)
@given(count=st.integers(min_value=1, max_value=12), microns=st.integers(min_value=50, max_value=3000))
def test_count_expands_to_that_many_plies(count, microns):
    """Invariant: a row with count = n and thickness t µm adds n plies of t × 1e-6 m each, after the first
    row's one ply of 0.5 mm; the stack thickness is 0.5 mm + n·t."""
    import tomllib

    text = edit(SMALL, 'thickness = "0.5 mm"\ncount = 2', f'thickness = "{microns} um"\ncount = {count}')
    beam = parse_design(tomllib.loads(text), "prop.toml", Path(".")).beam
    assert len(beam.plies) == 1 + count
    assert all(p.thickness == pytest.approx(microns * 1e-6, rel=1e-12) for p in beam.plies[1:])
    assert sum(p.thickness for p in beam.plies) == pytest.approx(0.5e-3 + count * microns * 1e-6, rel=1e-12)


# ---------------------------------------------------------------------------------------------
# Impossible input: InputError naming the file, the key (and row), and what would be right.

def _line_of(text: str, fragment: str) -> int:
    return next(k for k, line in enumerate(text.splitlines(), start=1) if fragment in line)


BAD_TOML = edit(SMALL, 'span = "200 mm"', "span = 200 mm")

ERROR_CASES = [
    # id, design text, csv beside it, fragments the message must hold
    ("missing unit", edit(SMALL, 'thickness = "0.5 mm"\ncount', 'thickness = "0.8"\ncount'), RIDE_CSV,
     ["[[ply]] #2", "thickness", "'0.8'", "no unit", '"0.8 mm"']),
    ("wrong dimension", edit(SMALL, 'span = "200 mm"', 'span = "5 N"'), RIDE_CSV,
     ["[beam] span", "'5 N'", "not a length", '"0.8 mm"']),
    ("unknown key", edit(SMALL, 'span = "200 mm"', 'spam = "200 mm"'), RIDE_CSV,
     ["[beam]", "'spam'", "did you mean 'span'"]),
    ("unknown material", edit(SMALL, 'material = "e-glass-epoxy"\nangle', 'material = "e-glas-epoxy"\nangle'), RIDE_CSV,
     ["[[ply]] #2", "material", "'e-glas-epoxy'", "did you mean 'e-glass-epoxy'"]),
    ("negative thickness", edit(SMALL, 'thickness = "0.5 mm"\ncount', 'thickness = "-0.5 mm"\ncount'), RIDE_CSV,
     ["[[ply]] #2", "thickness", "'-0.5 mm'", "> 0"]),
    ("count zero", edit(SMALL, "count = 2", "count = 0"), RIDE_CSV,
     ["[[ply]] #2", "count", "got 0", ">= 1"]),
    ("profile and cycles", edit(SMALL, "[fatigue]", 'profile = "ride.csv"\n\n[fatigue]'), RIDE_CSV,
     ["[duty]", "'profile'", "'cycles'", "exactly one"]),
    ("neither profile nor cycles", edit(SMALL, BLOCK_DUTY, '[duty]\ndrive = "deflection"\n'), RIDE_CSV,
     ["[duty]", "'profile'", "'cycles'", "exactly one"]),
    ("missing column", edit(SMALL_WITH_PROFILE, 'column = "deflection"', 'column = "defl"'), RIDE_CSV,
     ["[duty] profile", "ride.csv", "no column 'defl'", "'time_s', 'deflection'"]),
    # line 5 of the file: the comment line, the header, then samples on lines 3, 4, 5
    ("non-numeric cell", SMALL_WITH_PROFILE, RIDE_CSV.replace("2,10", "2,ten"),
     ["[duty] profile", "ride.csv", "line 5", "'deflection'", "'ten'", "not a number"]),
    ("min above max", edit(SMALL, 'min = "0 mm", max = "4 mm"', 'min = "6 mm", max = "4 mm"'), RIDE_CSV,
     ["[duty] cycles", "row 2", "min > max", "swap"]),
    ("unknown support", edit(SMALL, 'support = "cantilever"', 'support = "cantilevered"'), RIDE_CSV,
     ["[beam] support", "'cantilevered'", "'cantilever'", "'four-point'"]),
    ("four-point without load_spacing", edit(SMALL, 'support = "cantilever"', 'support = "four-point"'), RIDE_CSV,
     ["[beam] load_spacing", "four-point", "0 < load_spacing < span"]),
    ("ends_at beyond the span", edit(SMALL, "count = 2", 'count = 2\nends_at = "250 mm"'), RIDE_CSV,
     ["[[ply]] #2", "ends_at", "250 mm", "200 mm", "leave ends_at out"]),
    ("every ply dropped", edit(edit(SMALL, 'thickness = "0.5 mm"\n\n', 'thickness = "0.5 mm"\nends_at = "150 mm"\n\n'),
                               "count = 2", 'count = 2\nends_at = "120 mm"'), RIDE_CSV,
     ["[[ply]]", "ends_at", "150 mm", "full length"]),
    ("stress_factor below 1", edit(SMALL, 'mean_stress = "goodman"', 'mean_stress = "goodman"\nstress_factor = 0.8'),
     RIDE_CSV, ["[fatigue] stress_factor", "0.8", ">= 1"]),
    ("unknown mean_stress", edit(SMALL, 'mean_stress = "goodman"', 'mean_stress = "goodmann"'), RIDE_CSV,
     ["[fatigue] mean_stress", "'goodmann'", "'goodman'", "'gerber'", "'cld'"]),
    ("invalid TOML", BAD_TOML, RIDE_CSV,
     ["not valid TOML", f"line {_line_of(BAD_TOML, 'span = 200 mm')}"]),
    ("drive unit of the wrong kind", edit(SMALL_WITH_PROFILE, 'drive = "deflection"', 'drive = "force"'), RIDE_CSV,
     ["[duty] unit", "'mm' measures length", "drive = 'force'", "a unit of force", '"N" or "lbf"']),
    ("constant history", SMALL_WITH_PROFILE, "time_s,deflection\n0,7\n1,7\n2,7\n",
     ["[duty] profile", "ride.csv, column 'deflection' is constant", "7 mm in all 3 samples", "no cycle to count"]),
    ("header-less profile", SMALL_WITH_PROFILE, "# a comment\n0,5\n1,40\n",
     ["[duty] profile", "ride.csv, line 2", "'0,5' is data, not a header", "must name the columns"]),
    ("profile unit of no dimension", edit(SMALL_WITH_PROFILE, 'unit = "mm"', 'unit = "deg"'), RIDE_CSV,
     ["[duty] unit", "'deg' measures no dimension", "needs a unit of length", '"mm" or "in"']),
    ("material name not a string", edit(SMALL, 'material = "e-glass-epoxy"\nangle', "material = 3\nangle"), RIDE_CSV,
     ["[[ply]] #2 material", "a material name as a string", "got 3"]),
    ("duty all zero", edit(SMALL, BLOCK_DUTY, '[duty]\ndrive = "deflection"\ncycles = [ { min = "0 mm", max = "0 mm", count = 10 } ]\n'),
     RIDE_CSV, ["[duty]", "never loads the part"]),
]


@pytest.mark.parametrize("text, csv, fragments", [c[1:] for c in ERROR_CASES], ids=[c[0] for c in ERROR_CASES])
def test_impossible_input_is_named(tmp_path, text, csv, fragments):
    """The message starts with the file's name and holds the key, the row and what would be right."""
    path = write_design(tmp_path, text, csv=csv)
    with pytest.raises(InputError) as info:  # the life layer's InputError, not another layer's
        load_design(path)
    assert type(info.value) is InputError
    message = str(info.value)
    assert message.startswith("small.toml"), message
    for fragment in fragments:
        assert fragment in message, f"{fragment!r} not in {message!r}"


def test_the_small_design_itself_is_valid(tmp_path):
    """The error cases above change one thing each of designs that load: SMALL and SMALL_WITH_PROFILE.
    SMALL's stack: 0.5 mm + 2 × 0.5 mm = 3 plies; its block table: 1000 + 250 = 1250 cycles."""
    d = load_design(write_design(tmp_path, SMALL))
    assert len(d.beam.plies) == 3
    assert d.duty.cycles.n_total == 1250.0
    d = load_design(write_design(tmp_path, SMALL_WITH_PROFILE))
    assert d.duty.cycles.n_total == 2.0  # hand count in test_design_md_example_duty_and_fatigue


def test_missing_design_file(tmp_path):
    """A path that is not a file: InputError naming it."""
    with pytest.raises(InputError, match="nowhere.toml: no such design file"):
        load_design(tmp_path / "nowhere.toml")


def test_design_is_frozen(example):
    """Designs are frozen dataclasses (DEVELOPERS.md): no field can be rebound."""
    with pytest.raises(dataclasses.FrozenInstanceError):
        example.title = "changed"  # type: ignore[misc]


def test_nominal_ply_thickness_is_used_and_said(tmp_path):
    """A ply row without thickness takes the material's nominal cured ply thickness (library: 0.2 mm for
    e-glass-epoxy), and the design says so — never a silent default."""
    path = tmp_path / "nominal.toml"
    path.write_text(
        'title = "nominal"\n[beam]\nsupport = "cantilever"\nspan = "100 mm"\nwidth = "10 mm"\n'
        '[[ply]]\nmaterial = "e-glass-epoxy"\ncount = 5\n'
        '[duty]\ndrive = "force"\ncycles = [ { min = "0 N", max = "5 N", count = 10 } ]\n'
    )
    design = load_design(path)
    assert [p.thickness for p in design.beam.plies] == [pytest.approx(0.2e-3, rel=1e-12)] * 5
    assert any("nominal ply thickness" in n and "#1" in n for n in design.notes)


def test_residue_of_a_repeating_block(tmp_path):
    """[duty] residue = "repeat" counts the history as one block of a repeated duty: the ASTM E1049-85 example
    history −2, 1, −3, 5, −1, 3, −4, 4, −2 closed on its largest reversal gives four full cycles of ranges
    3, 4, 7, 9 (hand count, see tests/validation/test_astm_e1049_rainflow_example.py); "half" gives 4 cycles
    as 5 ranges with halves (ASTM E1049-85 §5.4.4). A block table has no residue: the key is refused there."""
    (tmp_path / "h.csv").write_text("f\n-2\n1\n-3\n5\n-1\n3\n-4\n4\n-2\n")
    base = ('title = "r"\n[beam]\nsupport = "cantilever"\nspan = "100 mm"\nwidth = "10 mm"\n'
            '[[ply]]\nmaterial = "e-glass-epoxy"\nthickness = "1 mm"\ncount = 4\n'
            '[duty]\ndrive = "force"\nprofile = "h.csv"\ncolumn = "f"\nunit = "N"\n')
    (tmp_path / "repeat.toml").write_text(base + 'residue = "repeat"\n')
    (tmp_path / "half.toml").write_text(base)
    repeat = load_design(tmp_path / "repeat.toml").duty.cycles
    assert sorted(repeat.range.tolist()) == [3.0, 4.0, 7.0, 9.0]
    assert set(repeat.count.tolist()) == {1.0}
    half = load_design(tmp_path / "half.toml").duty.cycles
    assert half.n_total == 4.0 and sorted(set(half.range.tolist())) == [3.0, 4.0, 6.0, 8.0, 9.0]
    (tmp_path / "table.toml").write_text(base.replace('profile = "h.csv"\ncolumn = "f"\nunit = "N"\n',
                                                      'cycles = [ { min = "0 N", max = "1 N", count = 1 } ]\n')
                                         + 'residue = "repeat"\n')
    with pytest.raises(InputError, match="residue"):
        load_design(tmp_path / "table.toml")


@pytest.mark.parametrize("duty, says", [
    ('drive = "deflection"\nprofile = "bundled:nope"\ncolumn = "d"\nunit = "mm"\n', "[duty] profile"),
    ('drive = "deflection"\nprofile = "bundled:cargo-bike-ride"\ncolumn = "deflection_mm"\nunit = "degC"\n',
     "offset unit"),
])
def test_duty_profile_messages_name_the_key(tmp_path, duty, says):
    """A bundled profile that does not exist and an offset unit are refused naming the file and [duty] key."""
    path = tmp_path / "d.toml"
    path.write_text('title = "x"\n[beam]\nsupport = "cantilever"\nspan = "100 mm"\nwidth = "10 mm"\n'
                    '[[ply]]\nmaterial = "e-glass-epoxy"\nthickness = "1 mm"\ncount = 4\n[duty]\n' + duty)
    with pytest.raises(InputError) as info:
        load_design(path)
    assert "d.toml [duty]" in str(info.value) and says in str(info.value)


def test_a_directory_given_as_the_design_says_so(tmp_path):
    """A folder is no design file: the message says it is a directory (not "no such design file")."""
    with pytest.raises(InputError, match="is a directory, not a design file"):
        load_design(tmp_path)
