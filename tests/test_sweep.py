"""flexcycle sweep: every row equals `flexcycle run` on the design it describes (exact), in this process and on
a LocalCluster started here; a killed worker, a resumed sweep and an unreachable scheduler."""
from __future__ import annotations

import json
import os
import shutil
import signal
import socket
import time

import dask
import pandas as pd
import pytest
from cli_runner import run_cli
from hypothesis import given
from hypothesis import strategies as st
from sweep_cases import CLONE_PRELOAD, clone_cluster, write_case

from flexcycle.errors import InputError
from flexcycle.explore.sweep import (
    FIGURES,
    LARGEST_BATCH,
    ROWS_FILE,
    SMALLEST_BATCH,
    _cell,
    batches,
    columns_of,
    evaluate_batch,
    prepare,
    read_sweep_table,
    run_sweep,
)


@pytest.fixture(scope="module")
def case(tmp_path_factory):
    folder = tmp_path_factory.mktemp("sweep")
    return write_case(folder)


@pytest.fixture(scope="module")
def client():
    with clone_cluster(2) as dask_client:
        yield dask_client


@pytest.fixture(scope="module")
def runs(case, tmp_path_factory):
    """`flexcycle run` on each candidate's design file (written by `flexcycle sweep --candidate N`): the summary,
    or exit 2 and the message."""
    prepared = prepare(case)
    out = {}
    for number in range(1, len(prepared.space.candidates) + 1):
        folder = tmp_path_factory.mktemp(f"candidate-{number}")
        written = run_cli(["sweep", case, "--candidate", number, "--out", folder])
        assert written.code == 0, written.err
        ran = run_cli(["run", folder / f"candidate-{number}.toml", "--out", folder / "run"])
        if ran.code == 0:
            out[number] = json.loads((folder / "run" / "summary.json").read_text())
        else:
            assert ran.code == 2, ran.err
            out[number] = ran.err
    return out


def _assert_rows_equal_runs(table: pd.DataFrame, runs: dict) -> None:
    """Each row's figures are the run's summary values exactly (written as the shortest text that reads back
    exactly); an invalid candidate's row holds the run's message (the file named in it aside)."""
    assert sorted(table["candidate"].astype(int)) == sorted(runs)
    for _, row in table.iterrows():
        ran = runs[int(row["candidate"])]
        if isinstance(ran, str):
            assert row["life_blocks"] == ""
            assert row["message"].split(": ", 1)[1] in ran
            continue
        assert row["message"] == ""
        for key in FIGURES:
            assert row[key] == _cell(ran[key]), key
        assert row["critical_mode"] == ran["critical"]["mode"]


def test_the_candidates_are_the_grid(case):
    prepared = prepare(case)
    assert len(prepared.space.candidates) == 8
    assert prepared.space.candidates[0] == ("250 mm", "150 mm", 2)
    assert prepared.space.candidates[-1] == ("300 mm", "280 mm", 3)


@given(st.integers(0, 20_000), st.integers(1, 64))
def test_the_batches_cover_every_candidate_once_and_shrink(candidates, workers):
    """Guided self-scheduling (Polychronopoulos & Kuck 1987): contiguous batches in order, each at most the
    remaining candidates over twice the workers (and LARGEST_BATCH), never growing, none below SMALLEST_BATCH
    but the last."""
    cuts = batches(candidates, workers)
    assert [k for cut in cuts for k in range(cut.start, cut.stop)] == list(range(candidates))
    sizes = [cut.stop - cut.start for cut in cuts]
    assert all(b <= a for a, b in zip(sizes, sizes[1:]))
    assert all(SMALLEST_BATCH <= size <= LARGEST_BATCH for size in sizes[:-1])
    for cut, size in zip(cuts, sizes):
        remaining = candidates - cut.start
        assert size <= max(SMALLEST_BATCH, -(-remaining // (2 * workers)))


def test_the_batches_of_the_benchmark_sweep():
    """400 candidates on 2 workers: 100, 75, 57, … down to 4 (ceil(remaining / 4), worked by hand)."""
    sizes = [cut.stop - cut.start for cut in batches(400, 2)]
    assert sizes[:6] == [100, 75, 57, 42, 32, 24]
    assert sizes[-1] <= 4 and sum(sizes) == 400


def test_rows_in_this_process_equal_flexcycle_run(case, runs):
    prepared = prepare(case)
    rows = evaluate_batch(prepared.context, prepared.duty, list(enumerate(prepared.space.candidates, start=1)))
    table = pd.DataFrame([{c: _cell(r.get(c)) for c in columns_of(prepared.context)} for r in rows])
    _assert_rows_equal_runs(table, runs)
    invalid = table[table["message"] != ""]
    assert list(invalid["candidate"].astype(int)) == [3, 4]  # span 250 mm with a drop at 280 mm
    assert "ends_at" in invalid["message"].iloc[0]


def test_rows_on_a_local_cluster_equal_flexcycle_run(case, runs, client, tmp_path):
    outcome = run_sweep(prepare(case), tmp_path / "out", client, batch=3)
    _assert_rows_equal_runs(outcome.table, runs)
    written = read_sweep_table(tmp_path / "out" / "sweep.csv")
    assert list(written.columns[:3]) == ["beam.span", "ply.2.ends_at", "ply.1.count"]
    assert list(written.columns[3:13]) == [*FIGURES, "critical_mode", "pareto", "meets_requirements"]
    pd.testing.assert_frame_equal(written, outcome.table.astype(str))
    page = (tmp_path / "out" / "sweep.html").read_text()
    assert "Pareto front" in page and "<svg" in page and "<a " not in page  # self-contained, no links


def test_resume_goes_on_from_the_rows_written(case, client, tmp_path):
    full = run_sweep(prepare(case), tmp_path / "full", client)
    crashed = tmp_path / "crashed"
    shutil.copytree(tmp_path / "full", crashed)
    (crashed / "sweep.csv").unlink()
    lines = (crashed / ROWS_FILE).read_text().splitlines(keepends=True)
    (crashed / ROWS_FILE).write_text("".join(lines[:4]) + lines[4][:10])  # 3 rows, then a line cut by a crash
    with pytest.raises(InputError, match="--resume"):
        run_sweep(prepare(case), crashed, client)
    resumed = run_sweep(prepare(case), crashed, client, resume=True)
    assert resumed.evaluated == 5
    pd.testing.assert_frame_equal(resumed.table, full.table)


def test_resume_refuses_the_rows_of_another_sweep(case, client, tmp_path):
    run_sweep(prepare(case), tmp_path / "out", client)
    case.with_name("other.toml").write_text(case.read_text().replace('"250 mm", ', ""))
    with pytest.raises(InputError, match="another sweep"):
        run_sweep(prepare(case.with_name("other.toml")), tmp_path / "out", client, resume=True)


def test_a_killed_worker_leaves_the_table_complete_and_identical(case, tmp_path):
    """A worker process killed in the middle of the sweep: Dask runs its batches again elsewhere."""
    prepared = prepare(case)
    expected = evaluate_batch(prepared.context, prepared.duty, list(enumerate(prepared.space.candidates, start=1)))
    with clone_cluster(2) as client:
        pids = client.run(os.getpid)
        killed = []

        def kill_one(done: int, total: int) -> None:
            if done >= 1 and not killed:
                os.kill(next(iter(pids.values())), signal.SIGKILL)
                killed.append(done)

        outcome = run_sweep(prepared, tmp_path / "out", client, batch=1, progress=kill_one)
    assert killed and killed[0] < len(expected)  # killed while candidates were still to come
    for row, (_, written) in zip(expected, outcome.table.iterrows()):
        for key in columns_of(prepared.context):
            assert str(written[key]) == _cell(row.get(key)), key


def test_the_command_on_its_own_local_cluster(case, runs, tmp_path):
    with dask.config.set({"distributed.worker.preload": [CLONE_PRELOAD]}):
        ran = run_cli(["sweep", case, "--out", tmp_path / "out", "--workers", "1"])
    assert ran.code == 0, ran.err
    _assert_rows_equal_runs(read_sweep_table(tmp_path / "out" / "sweep.csv"), runs)
    again = run_cli(["sweep", case, "--out", tmp_path / "out", "--workers", "1"])
    assert again.code == 2 and "--resume" in again.err


def test_an_unreachable_scheduler_is_reported_within_ten_seconds(case, tmp_path):
    with socket.socket() as probe:  # a port nobody listens on
        probe.bind(("127.0.0.1", 0))
        port = probe.getsockname()[1]
    start = time.monotonic()
    ran = run_cli(["sweep", case, "--out", tmp_path / "out", "--scheduler", f"tcp://127.0.0.1:{port}"])
    elapsed = time.monotonic() - start
    assert ran.code == 2
    assert "no Dask scheduler answered" in ran.err and "Traceback" not in ran.err
    assert elapsed < 10.0


@pytest.mark.parametrize("vary, message", [
    ('"beam.spam" = ["300 mm"]', "did you mean 'beam.span'"),
    ('"ply.2.thicknes" = ["1 mm"]', "did you mean 'ply.2.thickness'"),
    ('"ply.9.count" = [2]', "has 3 [[ply]] entries"),
    ('"ply.1.count" = ["3"]', "whole number of plies"),
    ('"ply.1.count" = [2.5]', "whole number of plies"),
    ('"beam.span" = ["300"]', "beam.span"),
    ('"beam.span" = [300]', "beam.span"),
    ('"ply.1.material" = ["e-glas-epoxy"]', "did you mean 'e-glass-epoxy'"),
    ('"ply.1.angle" = ["45"]', "fibre angle"),
    ('"beam.span" = []', "empty list"),
    ('"beam.span" = { from = "250 mm", to = "300 mm" }', "needs a [sample]"),
    ('"beam.theory" = ["elastic"]', "a beam theory, one of"),
])
def test_bad_values_are_input_errors(tmp_path, vary, message):
    case = write_case(tmp_path, f'design = "base.toml"\n[vary]\n{vary}\n')
    ran = run_cli(["sweep", case, "--out", tmp_path / "out"])
    assert ran.code == 2, ran.err
    assert message in ran.err and "Traceback" not in ran.err
    assert not (tmp_path / "out").exists()


@pytest.mark.parametrize("text, message", [
    ('design = "base.toml"\n[vary]\n', "[vary]: empty"),
    ('design = "base.toml"\n', "[vary]: empty"),
    ('[vary]\n"beam.span" = ["300 mm"]\n', "missing key 'design'"),
    ('design = "base.toml"\n[vary]\n"beam.span" = ["300 mm"]\n[objectives]\nlife_blocs = "maximise"\n',
     "did you mean 'life_blocks'"),
    ('design = "base.toml"\n[vary]\n"beam.span" = ["300 mm"]\n[require]\nstatic_reserve = "> 1.5"\n', ">= 1.5"),
    ('design = "base.toml"\n[vary]\n"beam.span" = ["300 mm"]\n[sample]\ncount = 0\n', "count"),
    ('design = "base.toml"\ndesing = 1\n[vary]\n"beam.span" = ["300 mm"]\n', "did you mean 'design'"),
])
def test_bad_sweep_files_are_input_errors(tmp_path, text, message):
    case = write_case(tmp_path, text)
    ran = run_cli(["sweep", case, "--out", tmp_path / "out"])
    assert ran.code == 2, ran.err
    assert message in ran.err


def test_requirements_and_objectives_reach_the_table(tmp_path, client):
    case = write_case(tmp_path, 'design = "base.toml"\n[vary]\n"beam.span" = ["250 mm", "300 mm", "350 mm"]\n'
                                '"beam.width" = ["30 mm", "40 mm"]\n[objectives]\nstiffness_n_per_m = "maximise"\n'
                                'cycle_energy_j = "maximise"\n[require]\nstatic_reserve = ">= 2"\n')
    table = run_sweep(prepare(case), tmp_path / "out", client).table
    assert "cycle_energy_j" in table.columns  # an objective beyond the fixed figures gets its column
    reserve = table["static_reserve"].astype(float)
    assert ((table["meets_requirements"] == "true") == (reserve >= 2)).all()
    assert not ((table["pareto"] == "true") & (table["meets_requirements"] == "false")).any()


def test_the_beam_theory_is_a_key_of_the_space(tmp_path, tmp_path_factory):
    """beam.theory varies like any key: each row equals `flexcycle run` on the design it describes, under linear
    theory and under the elastica (the duty, a force history, is shared: it does not depend on the theory)."""
    case = write_case(tmp_path, 'design = "base.toml"\n[vary]\n"beam.theory" = ["linear", "large-deflection"]\n'
                                '"beam.span" = ["250 mm", "300 mm"]\n')
    prepared = prepare(case)
    runs = {}
    for number in range(1, 5):
        folder = tmp_path_factory.mktemp(f"theory-{number}")
        assert run_cli(["sweep", case, "--candidate", number, "--out", folder]).code == 0
        ran = run_cli(["run", folder / f"candidate-{number}.toml", "--out", folder / "run"])
        assert ran.code == 0, ran.err
        runs[number] = json.loads((folder / "run" / "summary.json").read_text())
    assert [runs[n]["theory"] for n in range(1, 5)] == ["linear", "linear", "large-deflection", "large-deflection"]
    rows = evaluate_batch(prepared.context, prepared.duty, list(enumerate(prepared.space.candidates, start=1)))
    table = pd.DataFrame([{c: _cell(r.get(c)) for c in columns_of(prepared.context)} for r in rows])
    _assert_rows_equal_runs(table, runs)
    assert runs[4]["life_blocks"] != runs[2]["life_blocks"]  # the two theories answer differently at 300 mm


def test_a_strain_gauge_duty_is_refused(tmp_path):
    """A strain-gauge duty becomes a force history through each candidate's own section, so it cannot be one
    shared duty: exit 2 with one message, nothing written."""
    case = write_case(tmp_path)
    base = (tmp_path / "base.toml").read_text().replace(
        'drive = "force"', 'drive = "strain"\ngauge = { x = "20 mm", face = "tension" }').replace(
        'column = "force_n"\nunit = "N"', 'column = "force_n"\nunit = "ue"\nsample_rate = "100 Hz"')
    (tmp_path / "base.toml").write_text(base)
    ran = run_cli(["sweep", case, "--out", tmp_path / "out"])
    assert ran.code == 2, ran.err
    assert "strain-gauge duty" in ran.err and "Traceback" not in ran.err
    assert not (tmp_path / "out").exists()
