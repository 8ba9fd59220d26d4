"""Tests of flexcycle.spectra.streaming: chunked reading of a CSV drive column, counting as it is read, the envelope.

References: `flexcycle.spectra.profiles.read_time_history` (the exact reader: same values, same error messages,
whose contents tests/test_profiles.py checks by hand); `flexcycle.spectra.rainflow.rainflow_cycles` on the whole
history (itself checked against the `rainflow` package, ASTM E1049-85) for the chunked count; hand
calculations of min/max per bin for the envelope.
"""
from pathlib import Path

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from flexcycle.spectra.errors import InputError
from flexcycle.spectra.merging import merge_identical
from flexcycle.spectra.profiles import bundled_profile, read_time_history
from flexcycle.spectra.rainflow import rainflow_cycles
from flexcycle.spectra.streaming import ENVELOPE_BIN, count_history, history_chunks

WHERE = "ride.toml [duty] profile"


def write_csv(tmp_path: Path, text: str, name: str = "ride.csv") -> Path:
    path = tmp_path / name
    path.write_text(text, encoding="utf-8")
    return path


def exact_message(path: Path, column: str = "deflection_mm", scale: float = 1e-3) -> str:
    """The message `read_time_history` raises for the file (the contract of tests/test_profiles.py)."""
    with pytest.raises(InputError) as caught:
        read_time_history(path, column, scale, WHERE)
    return str(caught.value)


BAD_FILES = {
    "non-numeric": "# comment\ntime_s,deflection_mm\n0,1.0\n\n0.1,2.0\n0.2,abc\n0.3,1.0\n",
    "empty cell": "time_s,deflection_mm\n0,1.0\n0.1,\n0.2,3.0\n",
    "short row": "time_s,deflection_mm\n0,1.0\n0.1,2.0\n# note\n0.2\n",
    "extra fields": "# header comment\ntime_s,deflection_mm\n0,1.0\n0.1,2.0,7\n",
    "inf": "time_s,deflection_mm\n0,1.0\n0.1,inf\n",
    "nan": "time_s,deflection_mm\n0,1.0\n0.1,nan\n",
    "one sample": "time_s,deflection_mm\n0,1.0\n",
    "header only": "# only a header\ntime_s,deflection_mm\n",
    "no header": "# nothing but comments\n\n",
    "twice": "time_s,deflection_mm,deflection_mm\n0,1,2\n1,2,3\n",
    "wrong column": "time_s,deflection\n0,1.0\n1,2.0\n",
    # without a '#': read by Arrow's reader (the others with a comment by pandas')
    "short row, no comment": "time_s,deflection_mm\n0,1.0\n0.1,2.0\n0.2\n",
    "extra fields, no comment": "time_s,deflection_mm\n0,1.0\n0.1,2.0,7\n",
    "non-numeric, no comment": "time_s,deflection_mm\n0,1.0\n0.2,abc\n0.3,1.0\n",
    "overflow, no comment": "time_s,deflection_mm\n0,1.0\n0.1,1e400\n",
}


@pytest.mark.parametrize("name", sorted(BAD_FILES))
def test_every_error_message_is_that_of_the_exact_reader(tmp_path, name):
    """Reference: read_time_history's message (file, line number, what is wrong), word for word."""
    path = write_csv(tmp_path, BAD_FILES[name])
    expected = exact_message(path)
    with pytest.raises(InputError) as caught:
        count_history(path, "deflection_mm", 1e-3, WHERE)
    assert str(caught.value) == expected


def test_a_bad_cell_in_a_later_chunk_gives_its_line(tmp_path):
    """The bad cell is on line 5002 (header line 1, samples from line 2): found in the fifth chunk of 1024."""
    lines = ["t,deflection_mm"] + [f"{k},{k % 7}" for k in range(5000)] + ["5000,x", "5001,1"]
    path = write_csv(tmp_path, "\n".join(lines) + "\n")
    with pytest.raises(InputError, match="line 5002: column 'deflection_mm' is 'x', not a number"):
        count_history(path, "deflection_mm", 1.0, WHERE, chunk_samples=1024)


def test_missing_file_and_overflow_messages(tmp_path):
    expected = exact_message(tmp_path / "nowhere.csv")
    with pytest.raises(InputError) as caught:
        count_history(tmp_path / "nowhere.csv", "deflection_mm", 1e-3, WHERE)
    assert str(caught.value) == expected
    path = write_csv(tmp_path, "time_s,deflection_mm\n0,1.0\n0.1,1e308\n")
    expected = exact_message(path, scale=10.0)
    with pytest.raises(InputError) as caught:
        count_history(path, "deflection_mm", 10.0, WHERE)
    assert str(caught.value) == expected


@pytest.mark.parametrize("comments, sep, decimal", [(True, ",", "."), (False, ",", "."), (False, ";", ",")])
def test_values_are_those_of_the_exact_reader(tmp_path, comments, sep, decimal):
    """Reference: read_time_history. Decimal numbers of every magnitude, written with repr (17
    significant digits), spaces after the delimiter, a byte-order mark and blank lines between samples,
    with comments (pandas' reader) or without (Arrow's), commas or semicolons with a decimal comma: the same
    doubles, bit for bit."""
    rng = np.random.default_rng(11)
    values = rng.normal(size=3000) * 10.0 ** rng.integers(-8, 9, 3000)
    note = "\n# a comment\n" if comments else "\n\n"
    body = "\n".join(f"{k}{sep} {float(v)!r}".replace(".", decimal) + (note if k % 500 == 7 else "")
                     for k, v in enumerate(values))
    path = tmp_path / "ride.csv"
    path.write_text("\ufeff" + ("# demo\n" if comments else "") + f"time_s{sep} deflection_mm\n\n" + body + "\n",
                    encoding="utf-8")
    exact = read_time_history(path, "deflection_mm", 1e-3, WHERE).values
    np.testing.assert_array_equal(exact, np.array([float(repr(float(v))) for v in values]) * 1e-3)  # Python's float()
    chunks = list(history_chunks(path, "deflection_mm", 1e-3, WHERE, chunk_samples=1024))
    assert [c.size for c in chunks] == [1024, 1024, 952]
    np.testing.assert_array_equal(np.concatenate(chunks), exact)


def test_bundled_ride_kept_whole_counts_as_before():
    """A short history is kept whole and counted at once: the signal and the cycles (in the
    reference package's order) are those of read_time_history + rainflow_cycles."""
    path = bundled_profile("cargo-bike-ride")
    exact = read_time_history(path, "deflection_mm", 1e-3, WHERE).values
    counted = count_history(path, "deflection_mm", 1e-3, WHERE)
    np.testing.assert_array_equal(counted.signal, exact)
    reference = rainflow_cycles(exact)
    np.testing.assert_array_equal(counted.cycles.lo, reference.lo)
    np.testing.assert_array_equal(counted.cycles.hi, reference.hi)
    np.testing.assert_array_equal(counted.cycles.count, reference.count)
    assert counted.samples == exact.size


@pytest.mark.parametrize("residue", ["half", "repeat"])
def test_streamed_counts_equal_whole_history_counting(residue):
    """The bundled ride (18 000 samples) streamed in chunks of 1024 without keeping it:
    the cycles of rainflow_cycles on the whole history as a multiset (both merged: the same
    extremes, the same counts, exactly)."""
    path = bundled_profile("cargo-bike-ride")
    whole = merge_identical(rainflow_cycles(read_time_history(path, "deflection_mm", 1e-3, WHERE).values, residue))
    streamed = count_history(path, "deflection_mm", 1e-3, WHERE, residue=residue, keep_signal=0, chunk_samples=1024)
    assert streamed.signal is None
    merged = merge_identical(streamed.cycles)
    np.testing.assert_array_equal(merged.lo, whole.lo)
    np.testing.assert_array_equal(merged.hi, whole.hi)
    np.testing.assert_array_equal(merged.count, whole.count)


@settings(max_examples=25, deadline=None)
@given(st.lists(st.integers(min_value=-20, max_value=20), min_size=2, max_size=5000),
       st.sampled_from([1024, 2048]))
def test_streamed_integer_histories_equal_whole_counting(tmp_path_factory, history, chunk):
    """Random integer histories (ties, plateaus) written to CSV and streamed: exactly the cycles of
    counting the whole history at once, as a multiset (both merged)."""
    path = tmp_path_factory.mktemp("h") / "h.csv"
    path.write_text("deflection_mm\n" + "\n".join(map(str, history)) + "\n", encoding="utf-8")
    signal = np.array(history, dtype=float)
    if signal.min() == signal.max():
        return
    whole = merge_identical(rainflow_cycles(signal))
    streamed = merge_identical(count_history(path, "deflection_mm", 1.0, WHERE, keep_signal=0,
                                             chunk_samples=chunk).cycles)
    np.testing.assert_array_equal(streamed.lo, whole.lo)
    np.testing.assert_array_equal(streamed.hi, whole.hi)
    np.testing.assert_array_equal(streamed.count, whole.count)


def test_envelope_by_hand(tmp_path):
    """Hand calc: 3000 samples k % 100 (a sawtooth 0..99), bins of 1024 samples: every bin
    spans 0..99; with 2 bins wanted the three base bins merge into two (2 + 1)."""
    path = write_csv(tmp_path, "deflection_mm\n" + "\n".join(str(k % 100) for k in range(3000)) + "\n")
    counted = count_history(path, "deflection_mm", 1.0, WHERE, chunk_samples=ENVELOPE_BIN)
    env = counted.envelope
    np.testing.assert_array_equal(env.start, [0, 1024, 2048])
    np.testing.assert_array_equal(env.lo, [0.0, 0.0, 0.0])
    np.testing.assert_array_equal(env.hi, [99.0, 99.0, 99.0])
    assert env.samples == 3000


def test_progress_is_called_with_bytes_read(tmp_path):
    path = write_csv(tmp_path, "deflection_mm\n" + "\n".join(str(k % 9) for k in range(5000)) + "\n")
    seen = []
    count_history(path, "deflection_mm", 1.0, WHERE, chunk_samples=1024, progress=lambda done, total: seen.append((done, total)))
    size = path.stat().st_size
    assert len(seen) == 5 and all(total == size for _, total in seen)
    assert seen[-1][0] == size and [d for d, _ in seen] == sorted(d for d, _ in seen)
