"""A LifeResult's views for Python callers, life/views.py: tables as DataFrames equal to the run's CSV files,
the report's figures as matplotlib Figures, and the notebook display."""
from __future__ import annotations

import html

import pandas as pd
import pytest
from matplotlib.figure import Figure

import flexcycle
from flexcycle.views import headline_rows
from tests.cli_runner import run_cli


@pytest.fixture(scope="module")
def run_and_result(tmp_path_factory):
    """`flexcycle run` of the prosthetic-keel example (a force block table), and the same design from Python."""
    out = tmp_path_factory.mktemp("views") / "out"
    path = flexcycle.example_path("prosthetic-keel")
    ran = run_cli(["run", path, "--out", out])
    assert ran.code == 0, ran.err
    return out, flexcycle.estimate(flexcycle.load_design(path))


@pytest.mark.parametrize(("attribute", "file"), [("station_table", "stations.csv"),
                                                  ("location_table", "locations.csv"),
                                                  ("cycle_table", "cycles.csv")])
def test_each_table_is_its_csv_file(run_and_result, attribute, file):
    """The DataFrame is the file's content: same columns, same rows; numbers to the 9 digits the file keeps."""
    out, result = run_and_result
    table = getattr(result, attribute)
    written = pd.read_csv(out / file)
    assert isinstance(table, pd.DataFrame)
    assert list(table.columns) == list(written.columns)
    pd.testing.assert_frame_equal(table.reset_index(drop=True), written, check_dtype=False,
                                  rtol=1e-8)  # the CSV keeps 9 significant digits ("%.9g")


def test_tables_are_computed_once(run_and_result):
    _, result = run_and_result
    assert result.location_table is result.location_table
    assert "distinct cycles" in result.cycle_note


def test_every_report_figure_is_a_matplotlib_figure(run_and_result):
    _, result = run_and_result
    figures = result.figures()
    from flexcycle.report.figures import FIGURE_APPLIES

    assert tuple(figures) == tuple(name for name in flexcycle.FIGURES if name not in FIGURE_APPLIES)  # no PSD duty
    assert all(isinstance(fig, Figure) and fig.axes for fig in figures.values())
    assert isinstance(result.figure("fatigue-curve"), Figure)


def test_an_unknown_figure_is_an_input_error_with_a_suggestion(run_and_result):
    _, result = run_and_result
    with pytest.raises(flexcycle.InputError, match="did you mean 'fatigue-curve'"):
        result.figure("fatigue-curves")


def test_notebook_display_holds_the_headline_and_the_caution(run_and_result):
    _, result = run_and_result
    shown = result._repr_html_()
    for quantity, value in headline_rows(result):
        assert f">{html.escape(quantity)}<" in shown and f">{html.escape(value)}<" in shown
    assert html.escape(flexcycle.CAUTION) in shown
    assert f"{len(result.warnings)} warning" in shown or "no warnings" in shown
    life = [value for quantity, value in headline_rows(result) if quantity == "life, blocks"][0]
    assert life.split()[0] == f"{result.life_blocks:.3g}"


def test_the_notebook_display_escapes_the_title(run_and_result):
    _, result = run_and_result
    from dataclasses import replace

    odd = replace(result, design=replace(result.design, title="<b>keel</b> & co"))
    assert "&lt;b&gt;keel&lt;/b&gt; &amp; co" in odd._repr_html_()
    assert "<b>keel</b>" not in odd._repr_html_()


def test_large_deflection_rows_in_the_terminal_and_the_notebook():
    """The cargo-bike example runs under the elastica: the headline rows name the theory, the secant stiffness at
    the peak drive, the end's rotation and pull-in (from the summary), in the terminal table and the notebook alike."""
    from flexcycle.cli.terminal import summary_text

    result = flexcycle.estimate(flexcycle.load_design(flexcycle.example_path("cargo-bike-rear-spring")))
    rows = dict(headline_rows(result))
    summary = result.summary()
    assert rows["theory"] == "large deflection (the elastica)"
    assert "secant" in rows["stiffness"] and f"end turned {summary['tip_rotation_deg']:.3g}°" in rows["peak drive"]
    assert "pulled in" in rows["peak drive"]
    text, notebook = summary_text(result), result._repr_html_()
    for quantity, value in rows.items():
        assert quantity in text and html.escape(value) in notebook
    assert "deformed-shapes" in result.figures()
