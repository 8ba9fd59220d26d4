"""Tests of flexcycle.spectra.profiles: CSV time histories, block tables, constant amplitude,
bundled demo profiles.

References: values written into the test files by hand (hand calc: file number ×
scale); the error contract of docs/design.md (message names the file and the
line or row, and what would be right); the demo-profile brief (cargo-bike ride:
static sag about 28 mm, extremes about 8 mm and 55 mm, 10-20 min at 20 Hz, under
300 kB, labelled as invented demo data).
"""
import re
import subprocess
import sys
from pathlib import Path

import numpy as np
import pytest

from flexcycle.spectra.errors import InputError
from flexcycle.spectra.profiles import (
    TimeHistory,
    block_table,
    bundled_profile,
    bundled_profiles,
    constant_amplitude,
    read_time_history,
)

WHERE = "ride.toml [duty] profile"
REPO = Path(__file__).resolve().parent.parent


def write_csv(tmp_path: Path, text: str, name: str = "ride.csv") -> Path:
    path = tmp_path / name
    path.write_text(text, encoding="utf-8")
    return path


def read_error(path: Path, column: str = "deflection_mm", scale: float = 1e-3) -> str:
    """The message of the InputError reading ``path`` raises; checks it starts with WHERE
    and names the file."""
    with pytest.raises(InputError) as caught:
        read_time_history(path, column, scale, WHERE)
    message = str(caught.value)
    assert message.startswith(WHERE)
    assert path.name in message
    return message


GOOD = """\
# demo data: a test file
# second comment line
time_s,deflection_mm

0.00,28.0
0.05,30.5
0.10,-2.0
"""


# --- read_time_history -------------------------------------------------------------------

def test_reads_column_in_si(tmp_path):
    """Hand calc: 28.0, 30.5, -2.0 mm × 1e-3 = 0.028, 0.0305, -0.002 m; comment and
    blank lines skipped (rel 1e-15: one multiplication, one rounding)."""
    history = read_time_history(write_csv(tmp_path, GOOD), "deflection_mm", 1e-3, WHERE)
    assert isinstance(history, TimeHistory)
    np.testing.assert_allclose(history.values, [0.028, 0.0305, -0.002], rtol=1e-15)
    assert history.source == "ride.csv"
    assert history.column == "deflection_mm"
    assert not history.values.flags.writeable


def test_reads_with_spaces_after_commas(tmp_path):
    """Header and cells with a space after the comma. Hand calc: 2 × 4.448 = 8.896 and
    3 × 4.448 = 13.344 (an arbitrary scale factor; rel 1e-15: one rounding)."""
    path = write_csv(tmp_path, "time_s, force\n0, 2\n1, 3\n")
    history = read_time_history(path, "force", 4.448, WHERE)
    np.testing.assert_allclose(history.values, [8.896, 13.344], rtol=1e-15)


def test_missing_file_is_named(tmp_path):
    message = read_error(tmp_path / "nowhere.csv")
    assert "not found" in message


def test_missing_column_lists_the_columns(tmp_path):
    message = read_error(write_csv(tmp_path, GOOD), column="deflection")
    assert "no column 'deflection'" in message
    assert "'time_s', 'deflection_mm'" in message


def test_non_numeric_cell_gives_its_line(tmp_path):
    """Line numbers count every line of the file, comments included: the bad cell is on line 6."""
    text = "# comment\ntime_s,deflection_mm\n0,1.0\n\n0.1,2.0\n0.2,abc\n0.3,1.0\n"
    message = read_error(write_csv(tmp_path, text))
    assert "line 6" in message and "'abc'" in message and "not a number" in message


def test_empty_cell_gives_its_line(tmp_path):
    text = "time_s,deflection_mm\n0,1.0\n0.1,\n0.2,3.0\n"
    message = read_error(write_csv(tmp_path, text))
    assert "line 3" in message and "empty" in message


def test_short_row_gives_its_line(tmp_path):
    """A row with the drive column missing altogether counts as an empty cell."""
    text = "time_s,deflection_mm\n0,1.0\n0.1,2.0\n# note\n0.2\n"
    message = read_error(write_csv(tmp_path, text))
    assert "line 5" in message and "empty" in message


def test_row_with_extra_fields_gives_its_line(tmp_path):
    text = "# header comment\ntime_s,deflection_mm\n0,1.0\n0.1,2.0,7\n"
    message = read_error(write_csv(tmp_path, text))
    assert "line 4" in message and "same fields as the header" in message


@pytest.mark.parametrize("cell", ["inf", "nan", "-inf"])
def test_non_finite_cell_gives_its_line(tmp_path, cell):
    text = f"time_s,deflection_mm\n0,1.0\n0.1,{cell}\n"
    message = read_error(write_csv(tmp_path, text))
    assert "line 3" in message and "not finite" in message


def test_overflow_after_scaling_gives_its_line(tmp_path):
    """1e308 × 10 exceeds the largest double (about 1.8e308): not finite in SI."""
    text = "time_s,deflection_mm\n0,1.0\n0.1,1e308\n"
    message = read_error(write_csv(tmp_path, text), scale=10.0)
    assert "line 3" in message and "not finite" in message


@pytest.mark.parametrize("text", ["time_s,deflection_mm\n0,1.0\n", "# only a header\ntime_s,deflection_mm\n"])
def test_fewer_than_two_samples(tmp_path, text):
    message = read_error(write_csv(tmp_path, text))
    assert "at least 2" in message


def test_no_header_line(tmp_path):
    message = read_error(write_csv(tmp_path, "# nothing but comments\n\n"))
    assert "no header line" in message


@pytest.mark.parametrize("to_si", [0.0, float("nan"), float("inf")])
def test_scale_must_be_finite_and_non_zero(tmp_path, to_si):
    with pytest.raises(InputError, match=f"^{re.escape(WHERE)}.*factor to SI"):
        read_time_history(write_csv(tmp_path, GOOD), "deflection_mm", to_si, WHERE)


# --- block_table, constant_amplitude -------------------------------------------------------

def test_block_table_keeps_rows_in_order():
    """Rows in SI come back unchanged, fractional count kept; total 1000 + 2.5 = 1002.5."""
    cycles = block_table([(0.005, 0.040, 1000), (-0.001, 0.055, 2.5)], WHERE)
    np.testing.assert_array_equal(cycles.lo, [0.005, -0.001])
    np.testing.assert_array_equal(cycles.hi, [0.040, 0.055])
    np.testing.assert_array_equal(cycles.count, [1000.0, 2.5])
    assert cycles.n_total == 1002.5


def test_block_table_drops_rows_without_range():
    """A row with min == max (a steady drive) does no fatigue damage and is left out."""
    cycles = block_table([(0.028, 0.028, 500), (0.01, 0.05, 3)], WHERE)
    np.testing.assert_array_equal(cycles.lo, [0.01])
    assert cycles.n_total == 3.0
    assert block_table([(0.028, 0.028, 500)], WHERE).n_total == 0.0


@pytest.mark.parametrize(
    "rows, says",
    [
        ([(0.0, 0.01, 1), (0.02, 0.01, 5)], "row 2: min > max"),
        ([(0.0, 0.01, 1), (0.0, 0.02, 2), (0.0, 0.01, 0)], "row 3: count must be > 0"),
        ([(0.0, 0.01, -4)], "row 1: count must be > 0"),
        ([(0.0, float("nan"), 1)], "row 1: min, max and count must be finite"),
        ([(0.0, 0.01, 1), (0.0, 0.01)], "row 2: expected three numbers"),
        ([(0.0, "x", 1)], "row 1: expected three numbers"),
        ([], "no rows"),
    ],
)
def test_block_table_rejects_bad_rows(rows, says):
    with pytest.raises(InputError, match=f"^{re.escape(WHERE)}: .*{says}"):
        block_table(rows, WHERE)


def test_constant_amplitude():
    """One entry: 5 mm to 40 mm in m, 1e6 cycles."""
    cycles = constant_amplitude(0.005, 0.040, 1e6)
    np.testing.assert_array_equal(cycles.lo, [0.005])
    np.testing.assert_array_equal(cycles.hi, [0.040])
    assert cycles.n_total == 1e6
    assert constant_amplitude(0.02, 0.02, 10).n_total == 0.0  # no range, no damage


@pytest.mark.parametrize("lo, hi, count, says", [(0.04, 0.005, 1, "lo > hi"), (0.0, 1.0, 0, "count must be > 0"),
                                                 (0.0, float("inf"), 1, "finite")])
def test_constant_amplitude_rejects(lo, hi, count, says):
    with pytest.raises(InputError, match=says):
        constant_amplitude(lo, hi, count)


# --- bundled demo profiles --------------------------------------------------------------------

def test_bundled_profiles_are_listed():
    assert "cargo-bike-ride" in bundled_profiles()
    for name in bundled_profiles():
        assert bundled_profile(name).is_file()
    assert bundled_profile("cargo-bike-ride.csv") == bundled_profile("cargo-bike-ride")


def test_unknown_bundled_profile_lists_the_names():
    with pytest.raises(InputError, match="no bundled profile 'gravel'; available: .*cargo-bike-ride"):
        bundled_profile("gravel")


@pytest.mark.parametrize("name", ["cargo-bike-ride", "feeder-flexure"])
def test_bundled_profile_is_labelled_demo_data(name):
    header = [line for line in bundled_profile(name).read_text(encoding="utf-8").splitlines() if line.startswith("#")]
    text = " ".join(header).lower()
    assert "demo data" in text and "invented" in text


def test_cargo_bike_ride_matches_its_description():
    """The brief: static sag about 28 mm, extremes about 55 mm and 8 mm, 10-20 min at
    20 Hz, under 300 kB. Tolerances: 'about' read as ±1 mm on the median (sag) and ±2 mm
    on the extremes; one decimal in the file gives steps of 0.1 mm."""
    path = bundled_profile("cargo-bike-ride")
    assert path.stat().st_size < 300_000
    deflection = read_time_history(path, "deflection_mm", 1e-3, "bundled").values  # [m]
    time = read_time_history(path, "time_s", 1.0, "bundled").values  # [s]
    np.testing.assert_allclose(np.diff(time), 0.05, atol=1e-9)  # 20 Hz; atol: two-decimal times
    assert 600.0 <= time[-1] - time[0] <= 1200.0
    assert np.median(deflection) == pytest.approx(0.028, abs=1e-3)
    assert deflection.max() == pytest.approx(0.055, abs=2e-3)
    assert deflection.min() == pytest.approx(0.008, abs=2e-3)


def test_demo_profiles_are_regenerated_exactly(tmp_path):
    """tools/make_demo_profiles.py is seeded: it writes the bundled files byte for byte."""
    subprocess.run([sys.executable, str(REPO / "tools" / "make_demo_profiles.py"), "--out", str(tmp_path)], check=True)
    for name in bundled_profiles():
        assert (tmp_path / f"{name}.csv").read_bytes() == bundled_profile(name).read_bytes()


def test_spectra_imports_neither_mechanics_nor_life():
    """Layering rule of the design: spectra stands alone, and the `rainflow` package is a test oracle only."""
    code = ("import conftest, sys; before = set(sys.modules); "
            "import flexcycle.spectra.profiles, flexcycle.spectra.rainflow, flexcycle.spectra.chunked, "
            "flexcycle.spectra.streaming, flexcycle.spectra.errors; "
            "print(sorted(m for m in set(sys.modules) - before if m.split('.')[0] in ('mechanics', 'life', 'rainflow') "
            "or m.startswith('flexcycle.') and not m.startswith('flexcycle.spectra')))")
    # cwd: the root conftest maps this clone's folders onto the import name (this tree, not an installed copy)
    result = subprocess.run([sys.executable, "-c", code], check=True, capture_output=True, text=True, cwd=REPO)
    assert result.stdout.strip() == "[]"


def test_a_column_name_given_twice_is_refused(tmp_path):
    """pandas renames a repeated header name ("d" → "d.1") without a word: the reader refuses it, naming the line."""
    path = tmp_path / "dup.csv"
    path.write_text("# a comment\nd,d\n1,2\n3,4\n")
    with pytest.raises(InputError, match=r"line 2: column name 'd' appears more than once"):
        read_time_history(path, "d", 1.0, "test")


def test_a_ragged_row_is_one_line_of_message(tmp_path):
    """A row with more fields than the header names its line, in a message of one line."""
    path = tmp_path / "rag.csv"
    path.write_text("a,b\n1,2\n3,4,5\n")
    with pytest.raises(InputError, match=r"line 3") as info:
        read_time_history(path, "a", 1.0, "test")
    assert "\n" not in str(info.value)
