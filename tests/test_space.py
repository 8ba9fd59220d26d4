"""The design space of a sweep file: the grid, the seeded Latin-hypercube sample, candidate documents and
design files."""
from __future__ import annotations

import tomllib
from pathlib import Path

import numpy as np
import pytest
from sweep_cases import write_case

from flexcycle.design import load_design
from flexcycle.errors import InputError
from flexcycle.explore.space import candidate_document, candidate_text, read_space
from flexcycle.mechanics.units import parse_quantity

LHS = """\
design = "base.toml"
[vary]
"beam.span" = { from = "250 mm", to = "350 mm" }
"ply.1.count" = { from = 2, to = 5 }
"ply.3.material" = ["e-glass-epoxy", "carbon-epoxy"]
"beam.width" = ["40 mm", { root = "50 mm", tip = "30 mm" }]
[sample]
method = "latin-hypercube"
count = 40
seed = 7
"""


def test_the_grid_is_every_combination_in_order(tmp_path):
    space = read_space(write_case(tmp_path))
    assert space.method == "grid"
    assert len(space.candidates) == 2 * 2 * 2
    assert len(set(space.candidates)) == 8
    assert space.candidates[:2] == (("250 mm", "150 mm", 2), ("250 mm", "150 mm", 3))  # last key fastest


def test_bare_dotted_keys_are_the_same_keys(tmp_path):
    space = read_space(write_case(tmp_path, 'design = "base.toml"\n[vary]\nbeam.span = ["250 mm"]\n'
                                            'ply.2.count = [1, 2]\n'))
    assert space.keys == ("beam.span", "ply.2.count")


def test_latin_hypercube_is_seeded_and_stratified(tmp_path):
    """McKay, Beckman & Conover (1979): each of the n equal strata of every sampled range holds exactly one of
    the n candidates."""
    first = read_space(write_case(tmp_path, LHS))
    again = read_space(write_case(tmp_path, LHS))
    assert first.candidates == again.candidates  # the same seed gives the same candidates
    assert len(first.candidates) == 40
    span = np.array([parse_quantity(c[0], "length", "test") for c in first.candidates])
    assert span.min() >= 0.250 and span.max() <= 0.350
    strata = np.floor((span - 0.250) / 0.100 * 40 - 1e-9).astype(int)  # 4 significant digits: a value on an
    # edge may round across it by at most 0.05 mm, well inside the 2.5 mm strata (hence the tiny shift)
    assert len(set(np.clip(strata, 0, 39))) >= 38
    counts = [c[1] for c in first.candidates]
    assert set(counts) == {2, 3, 4, 5} and all(counts.count(k) == 10 for k in (2, 3, 4, 5))  # 40 / 4 each
    materials = [c[2] for c in first.candidates]
    assert materials.count("carbon-epoxy") == 20
    other = read_space(write_case(tmp_path, LHS.replace("seed = 7", "seed = 8")))
    assert other.candidates != first.candidates


def test_a_candidate_document_sets_the_values_and_leaves_the_base(tmp_path):
    space = read_space(write_case(tmp_path, LHS))
    values = ("275 mm", 4, "carbon-epoxy", {"root": "50 mm", "tip": "30 mm"})
    doc = candidate_document(space.document, space.keys, values)
    assert doc["beam"]["span"] == "275 mm" and doc["ply"][0]["count"] == 4
    assert doc["ply"][2]["material"] == "carbon-epoxy" and doc["beam"]["width"] == {"root": "50 mm", "tip": "30 mm"}
    assert space.document["beam"]["span"] == "300 mm" and space.document["ply"][0]["count"] == 3


def test_one_end_of_a_uniform_width(tmp_path):
    space = read_space(write_case(tmp_path, 'design = "base.toml"\n[vary]\n"beam.width.tip" = ["20 mm"]\n'))
    doc = candidate_document(space.document, space.keys, space.candidates[0])
    assert doc["beam"]["width"] == {"root": "40 mm", "tip": "20 mm"}


def test_a_candidate_file_is_the_design_it_describes(tmp_path):
    """Written into another folder, its profile path still finds the history; the file reads back as the
    candidate document (the base's comments kept)."""
    space = read_space(write_case(tmp_path, LHS))
    out = tmp_path / "elsewhere" / "deeper"
    out.mkdir(parents=True)
    text = candidate_text(space, space.candidates[5], out, 6)
    assert text.startswith("# candidate 6 of the sweep")
    (out / "c.toml").write_text(text)
    design = load_design(out / "c.toml")
    assert design.beam.length == pytest.approx(parse_quantity(space.candidates[5][0], "length", "t"), rel=1e-12)
    written = tomllib.loads(text)
    expected = candidate_document(space.document, space.keys, space.candidates[5])
    assert written["beam"] == expected["beam"] and written["ply"] == expected["ply"]


def test_a_range_in_reverse_is_refused(tmp_path):
    with pytest.raises(InputError, match="below 'from'"):
        read_space(write_case(tmp_path, LHS.replace('to = "350 mm"', 'to = "200 mm"')))


def test_the_bundled_demo_sweep_reads():
    from importlib import resources

    space = read_space(Path(str(resources.files("flexcycle") / "examples" / "cargo-bike-sweep.toml")))
    assert space.design_path.name == "cargo-bike-rear-spring.toml"
    assert len(space.candidates) == 3 * 3 * 4 * 4
    assert [r.key for r in space.requirements] == ["static_reserve", "stiffness_n_per_m", "stiffness_n_per_m"]
