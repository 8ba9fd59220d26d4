"""Duties as measured (life/measured.py, the design loader, the estimate): a PSD duty, a strain-gauge drive,
logger files of any delimiter, the first frequency and the resonance warning, and the bad inputs.

Sources: a strain-driven design equals the force-driven design whose force gives that strain at the gauge,
with the force worked two independent ways — the closed form of an isotropic cantilever's surface strain
ε = 6F(L − x)/(E·b·h²) (Roark's Formulas for Stress and Strain, 7th ed., Table 8.1 case 1a, M = F(L − x), and
σ = 6M/(bh²)), and the beam response map's axial strain at the root station (`flexcycle.mechanics.beam.respond`)
for a hybrid, off-axis stack. Linear theory here; the large-deflection map (the elastica's) is checked in
tests/test_large_gauge.py. Rainflow counting commutes with a monotone map of the history (ASTM E1049-85 counts reversals, which a
monotone map keeps); a decreasing map swaps each cycle's min and max. Semicolon, tab and comma files of the same
numbers give the same life (the same numbers read). Resonance: a third of the first frequency (common practice).
"""
from __future__ import annotations

import json
from pathlib import Path

import numpy as np
import pytest
from cli_runner import run_cli
from designs import ISOTROPIC

from flexcycle.design import load_design
from flexcycle.estimate import estimate
from flexcycle.mechanics.beam import respond

E, B, H, L = 40e9, 0.030, 0.004, 0.200  # isotropic strip of the strain-gauge check: 4 plies of 1 mm
BEAM = f"""
title = "gauge check (demo)"
[beam]
support = "cantilever"
span = "{L * 1e3:g} mm"
width = "{B * 1e3:g} mm"
[[ply]]
material = "iso"
thickness = "1 mm"
count = 4
"""


def write(tmp_path: Path, duty: str, files: dict[str, str] | None = None, beam: str = BEAM,
          materials: str = ISOTROPIC) -> Path:
    for name, text in (files or {}).items():
        (tmp_path / name).write_text(text, encoding="utf-8")
    path = tmp_path / "design.toml"
    path.write_text(beam + "\n[duty]\n" + duty + "\n" + materials, encoding="utf-8")
    return path


def life(path: Path) -> dict:
    return estimate(load_design(path)).summary()


@pytest.mark.parametrize("x_mm", [0.0, 50.0, 120.0])
def test_strain_drive_equals_the_force_of_the_closed_form(tmp_path, x_mm):
    """Gauge on the tension face at x: F = ε·E·b·h²/(6(L − x)) (Roark case 1a, σ = 6M/bh²; narrow isotropic
    beam, E b h³/12 exactly). The same block table as strain and as force: lives equal (rel 1e-9: round-off)."""
    strains = [(-200e-6, 1500e-6, 1000), (100e-6, 1800e-6, 50)]
    per_strain = E * B * H**2 / (6 * (L - x_mm * 1e-3))  # N per unit strain
    rows = ", ".join(f'{{ min = "{lo * 1e6:.10g} ue", max = "{hi * 1e6:.10g} ue", count = {n} }}' for lo, hi, n in strains)
    strain_design = write(tmp_path, f'drive = "strain"\ngauge = {{ x = "{x_mm:g} mm", face = "tension" }}\n'
                                     f"cycles = [ {rows} ]\n")
    strain = life(strain_design)
    force_dir = tmp_path / "force"
    force_dir.mkdir()
    rows = ", ".join(f'{{ min = "{lo * per_strain!r} N", max = "{hi * per_strain!r} N", count = {n} }}'
                     for lo, hi, n in strains)
    force = life(write(force_dir, f'drive = "force"\ncycles = [ {rows} ]\n'))
    assert strain["life_cycles"] == pytest.approx(force["life_cycles"], rel=1e-9)
    assert strain["peak_strain"] == pytest.approx(force["peak_strain"], rel=1e-9)
    assert strain["static_reserve"] == pytest.approx(force["static_reserve"], rel=1e-9)
    assert strain["measured_drive"] == "strain" and strain["gauge"]["x_m"] == pytest.approx(x_mm * 1e-3)


HYBRID = """
title = "hybrid keel (demo)"
[beam]
support = "cantilever"
span = "150 mm"
width = { root = "50 mm", tip = "35 mm" }
[[ply]]
material = "carbon-epoxy"
angle = 45
thickness = "0.125 mm"
[[ply]]
material = "e-glass-epoxy"
thickness = "0.25 mm"
count = 8
[[ply]]
material = "carbon-epoxy"
thickness = "0.125 mm"
count = 4
ends_at = "100 mm"
[[ply]]
material = "carbon-epoxy"
angle = -45
thickness = "0.125 mm"
"""


@pytest.mark.parametrize("station", [0, 7, 20])
def test_strain_drive_of_a_hybrid_equals_the_force_from_the_response_map(tmp_path, station):
    """Gauge on the tension face of a hybrid, off-axis, tapered stack with a ply drop, at a station of the beam's
    response map: the force per strain from that map (ply 1, bottom face, εx per unit force) — a second,
    independent path through the moment, the width and the laminate."""
    probe = tmp_path / "probe"
    probe.mkdir()
    beam = load_design(write(probe, 'drive = "force"\ncycles = [ { min = "0 N", max = "1 N", count = 1 } ]\n',
                             beam=HYBRID, materials="")).beam
    response = respond(beam)
    x_mm = float(response.x[station]) * 1e3
    assert response.present[station, 0]
    design = write(tmp_path, f'drive = "strain"\ngauge = {{ x = "{x_mm!r} mm", face = "tension" }}\n'
                             'cycles = [ { min = "0 %", max = "0.3 %", count = 100 } ]\n', beam=HYBRID, materials="")
    strain = life(design)
    per_force = float(response.strain_x[station, 0, 0])
    force_dir = tmp_path / "force"
    force_dir.mkdir()
    force = life(write(force_dir, f'drive = "force"\ncycles = [ {{ min = "0 N", max = "{0.003 / per_force!r} N", '
                                  "count = 100 } ]\n", beam=HYBRID, materials=""))
    assert strain["life_cycles"] == pytest.approx(force["life_cycles"], rel=1e-9)


def test_compression_face_gauge_swaps_min_and_max(tmp_path):
    """The compression face reads −ε at the force that gives +ε on the tension face (a symmetric isotropic
    stack): the mirrored history gives the same life."""
    t = write(tmp_path, 'drive = "strain"\ngauge = { x = "20 mm", face = "tension" }\n'
                        'cycles = [ { min = "-100 ue", max = "1600 ue", count = 500 } ]\n')
    c_dir = tmp_path / "c"
    c_dir.mkdir()
    c = write(c_dir, 'drive = "strain"\ngauge = { x = "20 mm", face = "compression" }\n'
                     'cycles = [ { min = "-1600 ue", max = "100 ue", count = 500 } ]\n')
    assert life(t)["life_cycles"] == pytest.approx(life(c)["life_cycles"], rel=1e-9)


def test_gauge_on_a_named_ply_inside(tmp_path):
    """A sensor on ply 2's tension-side face: z = −h/2 + 1 mm, so it reads (h/2 − 1 mm)/(h/2) = 1/2 of the surface
    strain of the 4 mm isotropic stack (linear strain through the thickness; Kaw Eq. 4.16): the same force
    needs half the strain."""
    surface = life(write(tmp_path, 'drive = "strain"\ngauge = { x = "0 mm", face = "tension" }\n'
                                   'cycles = [ { min = "0 ue", max = "1200 ue", count = 100 } ]\n'))
    d = tmp_path / "ply"
    d.mkdir()
    inside = life(write(d, 'drive = "strain"\ngauge = { x = "0 mm", face = "tension", ply = 2 }\n'
                           'cycles = [ { min = "0 ue", max = "600 ue", count = 100 } ]\n'))
    assert inside["life_cycles"] == pytest.approx(surface["life_cycles"], rel=1e-9)


HISTORY = np.array([0.0, 1.2, -0.4, 2.5, 0.3, 1.9, -1.1, 2.2, 0.0, 1.4, -0.2])


@pytest.mark.parametrize("sep, decimal", [(",", "."), (";", "."), (";", ","), ("\t", ".")])
def test_logger_delimiters_give_the_same_life(tmp_path, sep, decimal):
    """The same numbers as comma, semicolon (decimal point or comma) and tab files: the same life, exactly."""
    lines = [f"time_s{sep}deflection_mm"] + [f"{k * 0.01:.2f}{sep}{v:.1f}".replace(".", decimal) if decimal == ","
                                             else f"{k * 0.01:.2f}{sep}{v:.1f}" for k, v in enumerate(HISTORY)]
    duty = 'drive = "deflection"\nprofile = "ride.csv"\ncolumn = "deflection_mm"\nunit = "mm"\n'
    path = write(tmp_path, duty, {"ride.csv": "# logger export\n" + "\n".join(lines) + "\n"})
    reference_dir = tmp_path / "ref"
    reference_dir.mkdir()
    comma = "\n".join(["time_s,deflection_mm"] + [f"{k * 0.01:.2f},{v:.1f}" for k, v in enumerate(HISTORY)]) + "\n"
    reference = write(reference_dir, duty, {"ride.csv": comma})
    assert life(path)["life_cycles"] == life(reference)["life_cycles"]
    assert np.array_equal(load_design(path).duty.signal, HISTORY * 1e-3)


def psd_csv(f: np.ndarray, g: np.ndarray) -> str:
    return "f_hz,g\n" + "".join(f"{float(a)!r},{float(b)!r}\n" for a, b in zip(f, g))


def test_strain_psd_equals_the_force_psd(tmp_path):
    """A strain PSD G_ε at the gauge is the force PSD G_F = G_ε/s² (s the strain per unit force, closed form
    above), and the mean ε̄ the force s·ε̄... divided: F̄ = ε̄/s. Lives equal (rel 1e-9)."""
    s = 6 * L / (E * B * H**2)  # strain per N at the root, x = 0 (Roark case 1a)
    f = np.linspace(0.0, 40.0, 81)
    g_strain = np.where((f >= 5) & (f <= 30), 1e-10, 0.0)  # strain²/Hz
    strain = life(write(tmp_path, 'drive = "strain"\ngauge = { x = "0 mm", face = "tension" }\npsd = "vib.csv"\n'
                                  'frequency_column = "f_hz"\npsd_column = "g"\nunit = "strain^2/Hz"\n'
                                  'mean = "300 ue"\nduration = "10 min"\n', {"vib.csv": psd_csv(f, g_strain)}))
    d = tmp_path / "force"
    d.mkdir()
    force = life(write(d, f'drive = "force"\npsd = "vib.csv"\nfrequency_column = "f_hz"\npsd_column = "g"\n'
                          f'unit = "N^2/Hz"\nmean = "{300e-6 / s!r} N"\nduration = "600 s"\n',
                       {"vib.csv": psd_csv(f, g_strain / s**2)}))
    assert strain["life_cycles"] == pytest.approx(force["life_cycles"], rel=1e-9)
    assert strain["damage_per_block"] == pytest.approx(force["damage_per_block"], rel=1e-9)


def test_psd_duty_summary_and_outputs(tmp_path):
    """A PSD duty runs through `flexcycle run`: exit 0, summary.json with first_mode_hz and the spectrum keys,
    cycles per block = duration × √(m4/m2), the report with the PSD figure and the Gaussian-process limit."""
    f = np.linspace(0.0, 60.0, 121)
    path = write(tmp_path, 'drive = "deflection"\npsd = "vib.csv"\nfrequency_column = "f_hz"\npsd_column = "g"\n'
                           'unit = "mm^2/Hz"\nmean = "1 mm"\nduration = "1 h"\nmethod = "narrow-band"\n',
                 {"vib.csv": psd_csv(f, np.where((f >= 10) & (f <= 20), 0.02, 0.0))})
    ran = run_cli(["run", path, "--out", tmp_path / "out"])
    assert ran.code == 0, ran.err
    s = json.loads((tmp_path / "out" / "summary.json").read_text(encoding="utf-8"))
    assert s["first_mode_hz"] > 0 and s["spectrum"]["method"] == "narrow-band"
    m = s["spectrum"]
    assert s["cycles_per_block"] == pytest.approx(3600 * np.sqrt(m["m2"] / m["m0"]), rel=1e-9)
    report = (tmp_path / "out" / "report.html").read_text(encoding="utf-8")
    assert 'id="fig-2b"' in report and "stationary Gaussian process" in report and "range distribution" in report
    assert "first frequency" in ran.out


def test_first_frequency_of_a_block_table_design_and_no_spectrum_figure(tmp_path):
    path = write(tmp_path, 'drive = "force"\ncycles = [ { min = "0 N", max = "50 N", count = 10 } ]\n')
    ran = run_cli(["run", path, "--out", tmp_path / "out"])
    assert ran.code == 0, ran.err
    s = json.loads((tmp_path / "out" / "summary.json").read_text(encoding="utf-8"))
    # Blevins λ₁ = 1.87510 for the isotropic cantilever (recalled; the validation test checks it to 2e-5)
    EI, m_per_length = E * B * H**3 / 12, 1800 * B * H
    assert s["first_mode_hz"] == pytest.approx(1.87510**2 / (2 * np.pi * L**2) * np.sqrt(EI / m_per_length), rel=1e-4)
    assert 'id="fig-2b"' not in (tmp_path / "out" / "report.html").read_text(encoding="utf-8")


def test_resonance_warning_from_a_psd(tmp_path):
    """f₁ ≈ 82 Hz for the strip: a PSD with most of its variance above 27 Hz is warned of; one below is not."""
    f1 = 1.87510**2 / (2 * np.pi * L**2) * np.sqrt(E * B * H**3 / 12 / (1800 * B * H))
    f = np.linspace(0.0, 3 * f1, 301)
    for band, warned in (((0.5 * f1, 0.9 * f1), True), ((0.05 * f1, 0.25 * f1), False)):
        d = tmp_path / f"{band[0]:.0f}"
        d.mkdir()
        g = np.where((f >= band[0]) & (f <= band[1]), 1e-3, 0.0)
        s = life(write(d, 'drive = "force"\npsd = "vib.csv"\nfrequency_column = "f_hz"\npsd_column = "g"\n'
                          'unit = "N^2/Hz"\nmean = "0 N"\nduration = "1 min"\n', {"vib.csv": psd_csv(f, g)}))
        assert any("a third of the part's first bending frequency" in w for w in s["warnings"]) is warned


def test_resonance_warning_from_a_sampled_history(tmp_path):
    """A history with a tone at 60 Hz sampled at 1 kHz: above f₁/3 (27 Hz): warned; the same samples said to be
    taken at 50 Hz put the tone at 3 Hz: not warned."""
    t = np.arange(2000) / 1000.0
    x = 5.0 + 4.0 * np.sin(2 * np.pi * 60 * t)
    text = "t,force_n\n" + "".join(f"{a:.4f},{b:.6f}\n" for a, b in zip(t, x))
    for rate, warned in (("1000 Hz", True), ("50 Hz", False)):
        d = tmp_path / rate.replace(" ", "")
        d.mkdir()
        s = life(write(d, f'drive = "force"\nprofile = "h.csv"\ncolumn = "force_n"\nunit = "N"\nsample_rate = "{rate}"\n',
                       {"h.csv": text}))
        assert any("the time history holds" in w for w in s["warnings"]) is warned


PSD = 'drive = "force"\npsd = "vib.csv"\nfrequency_column = "f_hz"\npsd_column = "g"\nunit = "N^2/Hz"\nmean = "0 N"\nduration = "1 h"\n'
GOOD_PSD = "f_hz,g\n0,0\n10,1\n20,1\n30,0\n"
GAUGE = 'drive = "strain"\ngauge = { x = "20 mm", face = "tension" }\ncycles = [ { min = "0 ue", max = "900 ue", count = 10 } ]\n'
BAD = [
    ("PSD negative", PSD, "f_hz,g\n0,0\n10,-1\n20,1\n", ["[duty] psd", "row 2", "negative"]),
    ("PSD unsorted", PSD, "f_hz,g\n0,0\n20,1\n10,1\n", ["[duty] psd", "row 3", "below the row before", "increasing"]),
    ("PSD repeated frequency", PSD, "f_hz,g\n0,0\n10,1\n10,1\n", ["[duty] psd", "row 3", "repeats"]),
    ("PSD missing mean", PSD.replace('mean = "0 N"\n', ""), GOOD_PSD, ["[duty]", "missing key 'mean'", "static mean"]),
    ("PSD missing duration", PSD.replace('duration = "1 h"\n', ""), GOOD_PSD,
     ["[duty]", "missing key 'duration'", "one block"]),
    ("PSD unit of a deflection for a force", PSD.replace("N^2/Hz", "mm^2/Hz"), GOOD_PSD,
     ["[duty] unit", "'mm^2/Hz' is not a force squared per hertz", "N^2/Hz"]),
    ("PSD unit not per hertz", PSD.replace("N^2/Hz", "N^2"), GOOD_PSD, ["[duty] unit", "not a force squared per hertz"]),
    ("PSD unknown method", PSD + 'method = "dirlick"\n', GOOD_PSD, ["[duty] method", "'dirlick'", "'dirlik'"]),
    ("PSD column missing", PSD.replace('psd_column = "g"', 'psd_column = "G"'), GOOD_PSD, ["[duty] psd", "no column 'G'"]),
    ("PSD and profile both", PSD + 'profile = "ride.csv"\ncolumn = "x"\n', GOOD_PSD,
     ["[duty]", "exactly one of 'profile'", "'psd'"]),
    ("mean without a PSD", 'drive = "force"\nmean = "1 N"\ncycles = [ { min = "0 N", max = "5 N", count = 1 } ]\n',
     GOOD_PSD, ["[duty] mean", "only for a PSD duty"]),
    ("gauge outside the span", GAUGE.replace('"20 mm"', '"250 mm"'), GOOD_PSD,
     ["[duty] gauge", "250 mm lies outside the part", "200 mm"]),
    ("gauge on an absent ply", GAUGE.replace('face = "tension"', 'face = "tension", ply = 7'), GOOD_PSD,
     ["[duty] gauge", "plies 1 to 4", "got 7"]),
    ("gauge at zero moment", GAUGE.replace('"20 mm"', '"200 mm"'), GOOD_PSD,
     ["[duty] gauge", "moment", "is zero"]),
    ("gauge missing", GAUGE.replace('gauge = { x = "20 mm", face = "tension" }\n', ""), GOOD_PSD,
     ["[duty]", 'drive = "strain" needs the gauge']),
    ("gauge face unknown", GAUGE.replace('"tension"', '"top"'), GOOD_PSD, ["[duty] gauge face", "'top'", "'tension'"]),
    ("gauge without a strain drive", 'drive = "force"\ngauge = { x = "20 mm", face = "tension" }\n'
     'cycles = [ { min = "0 N", max = "5 N", count = 1 } ]\n', GOOD_PSD, ["[duty] gauge", 'only for drive = "strain"']),
    ("strain unit of a length", GAUGE.replace('"900 ue"', '"900 mm"'), GOOD_PSD, ["[duty] cycles row 1 max", "strain"]),
    ("sample rate not a frequency", 'drive = "force"\nprofile = "vib.csv"\ncolumn = "g"\nunit = "N"\nsample_rate = "5 mm"\n',
     GOOD_PSD, ["[duty] sample_rate", "not a frequency"]),
    ("decimal comma in a tab file", 'drive = "force"\nprofile = "vib.csv"\ncolumn = "g"\nunit = "N"\n',
     "f_hz\tg\n0\t0,5\n1\t1,5\n", ["[duty] profile", "decimal comma", "tab", "semicolons"]),
    ("delimiter cannot be told", 'drive = "force"\nprofile = "vib.csv"\ncolumn = "g"\nunit = "N"\n',
     "f_hz;g,h\n0;1,2;3\n1;2,3;4,5\n", ["[duty] profile", "cannot tell the column delimiter", "comma", "semicolon"]),
]


@pytest.mark.parametrize("duty, csv, words", [c[1:] for c in BAD], ids=[c[0] for c in BAD])
def test_bad_measured_input_exits_2_with_one_message(tmp_path, duty, csv, words):
    path = write(tmp_path, duty, {"vib.csv": csv})
    ran = run_cli(["run", path, "--out", tmp_path / "out"])
    assert ran.code == 2, (ran.code, ran.err)
    assert "Traceback" not in ran.err
    message = ran.err.strip()
    for word in words:
        assert word in message, (word, message)
    assert not (tmp_path / "out").exists()  # nothing half-written
