"""The ``flexcycle`` command: parse arguments, call the library, print. Nothing else lives here.

Exit codes: 0 done; 2 the input is wrong (one message on stderr, no traceback); 1 an internal fault.

Lean start: the library (numpy, pandas, scipy, matplotlib, pint) is imported inside the commands, so that
``flexcycle --help`` shows at once and ``flexcycle check`` never loads scipy or matplotlib.
"""
from __future__ import annotations

import os
import sys
import traceback
from pathlib import Path

import typer

from flexcycle.caution import CAUTION
from flexcycle.errors import INPUT_ERRORS, InputError, did_you_mean, input_errors

# The library's parameters that the commands take as options under another name (InputError.naming)
FLAGS = {"out": "--out", "target_blocks": "--life", "vary": "--vary", "rate": "--rate", "duty_file": "--duty"}
PROGRESS_BYTES = 20_000_000  # a time history file larger than this (about 10⁶ samples) gets a progress bar

app = typer.Typer(
    add_completion=False,
    rich_markup_mode=None,  # plain help: rendering it with rich costs about 0.3 s of start-up (typer.rich_utils)
    no_args_is_help=True,
    help="Fatigue life and stored energy of flexing composite beams. " + CAUTION,
)


def example_design() -> Path:
    """Path of the bundled example design (invented demo data)."""
    from flexcycle.examples import example_path

    return example_path()


UNITS_HELP = "units shown: si or us (in, lbf, ksi, in·lbf, lb, with SI beside); the files stay SI"


def _check_units(units: str | None) -> None:
    """Reject an unknown --units before any work is done."""
    from flexcycle.display import SYSTEMS

    if units is not None and units not in SYSTEMS:
        raise InputError(f"--units: {did_you_mean(units, SYSTEMS)}must be one of {', '.join(SYSTEMS)}, "
                         f"got {units!r}")


@app.command()
def run(
    design: Path | None = typer.Argument(None, help="design file (TOML); without it, the bundled example"),
    out: Path = typer.Option(Path("flexcycle-out"), "--out", "-o", help="folder for summary.json, cycles.csv, locations.csv, stations.csv, report.html"),
    units: str | None = typer.Option(None, "--units", help=UNITS_HELP),
) -> None:
    """Estimate the fatigue life, stiffness, mass and stored energy of a design."""
    from flexcycle.cli import terminal
    from flexcycle.design import load_design
    from flexcycle.display import display_for
    from flexcycle.estimate import estimate

    _check_units(units)
    path = design if design is not None else example_design()
    with _progress() as progress:
        loaded = load_design(path, progress=progress)
    result = estimate(loaded)
    from flexcycle.outputs import render, write_files

    display = display_for(units, loaded.units)
    files = render(result, display=display)
    written = write_files(files, out)
    typer.echo(terminal.summary_text(result, example=design is None, display=display))
    typer.echo(f"\nwrote {', '.join(p.name for p in written)} to {out}")


@app.command()
def compare(
    designs: list[Path] = typer.Argument(..., help="two or more design files (TOML)"),
    out: Path = typer.Option(Path("flexcycle-compare"), "--out", "-o", help="folder for comparison.csv and comparison.html"),
    duty: Path | None = typer.Option(None, "--duty", help="TOML file with one \\[duty] table: run every design with it"),
    units: str | None = typer.Option(None, "--units", help=UNITS_HELP),
) -> None:
    """Run several candidate designs and set their figures side by side."""
    from flexcycle.cli import terminal
    from flexcycle.design import load_design
    from flexcycle.display import display_for
    from flexcycle.estimate import estimate
    from flexcycle.explore.compare import comparison_html, comparison_table, duty_note, with_common_duty
    from flexcycle.outputs import write_files

    _check_units(units)
    if len(designs) < 2:
        raise InputError("compare: give two or more design files to set side by side")
    loaded = [load_design(path) if duty is None else with_common_duty(path, duty) for path in designs]
    results = [estimate(design) for design in loaded]
    table = comparison_table(results)
    note = duty_note(duty)
    display = display_for(units, loaded[0].units)
    write_files({"comparison.csv": table.to_csv(index=False, float_format="%.9g", lineterminator="\n"),
                 "comparison.html": comparison_html(table, results, note, display)}, out)
    typer.echo(terminal.comparison_text(table, note, results, display))
    typer.echo(f"\nwrote comparison.csv, comparison.html to {out}\ncaution: {CAUTION}")


@app.command()
def size(
    design: Path = typer.Argument(..., help="design file (TOML)"),
    life: float = typer.Option(..., "--life", help="target life in blocks of the duty"),
    vary: str = typer.Option("thickness", "--vary", help="thickness (every ply) or width"),
    rate: str | None = typer.Option(None, "--rate", help='spring rate with its unit, e.g. "30 N/mm": under a deflection drive the width for it after the thickness for the life; under a force drive thickness and width together'),
    taper: bool = typer.Option(False, "--taper", help="propose a width taper (sized.toml) and ply drops (sized-drops.toml) that even the strain"),
    min_width: str | None = typer.Option(None, "--min-width", help='smallest root width you can build, e.g. "20 mm"'),
    max_width: str | None = typer.Option(None, "--max-width", help='largest root width, e.g. "80 mm"'),
    min_thickness: str | None = typer.Option(None, "--min-thickness", help='smallest root thickness, e.g. "4 mm"'),
    max_thickness: str | None = typer.Option(None, "--max-thickness", help='largest root thickness, e.g. "20 mm"'),
    whole_plies: bool = typer.Option(False, "--whole-plies", help="the thickness a whole number of the design's own plies"),
    out: Path = typer.Option(Path("flexcycle-size"), "--out", "-o", help="folder for sized.toml, sizing.json, report.html"),
    units: str | None = typer.Option(None, "--units", help=UNITS_HELP),
) -> None:
    """Size a design for a target life: the thickness (or width), the width for a spring rate, a taper."""
    from flexcycle.cli import terminal
    from flexcycle.design import load_design
    from flexcycle.display import display_for
    from flexcycle.mechanics.units import parse_quantity
    from flexcycle.outputs import render, sizing_json, write_files
    from flexcycle.sizing import parse_rate, plan, sizing_rows
    from flexcycle.sizing.section import Limits

    def length(text: str | None, option: str) -> float | None:
        if text is None:
            return None
        value = parse_quantity(text, "length", option)
        if not value > 0:
            raise InputError(f"{option}: a length > 0 with its unit, e.g. \"20 mm\", got {text!r}")
        return value

    _check_units(units)
    limits = Limits(length(min_width, "--min-width"), length(max_width, "--max-width"),
                    length(min_thickness, "--min-thickness"), length(max_thickness, "--max-thickness"), whole_plies)
    k = None if rate is None else parse_rate(rate)
    loaded = load_design(design)
    display = display_for(units, loaded.units)
    answer = plan(loaded, life, vary, k, taper, limits)
    files = {"sized.toml": answer.sized.text}
    if answer.drops is not None:
        files["sized-drops.toml"] = answer.drops.text
    files["sizing.json"] = sizing_json(answer)
    files["report.html"] = render(answer.sized.result, sizing=sizing_rows(answer, display),
                                  display=display)["report.html"]
    written = write_files(files, out)
    typer.echo(terminal.sizing_text(answer, display))
    typer.echo(f"\nsized.toml SHA-256 {answer.sha256}")
    typer.echo(f"\nwrote {', '.join(p.name for p in written)} to {out}\ncaution: {CAUTION}")


@app.command()
def fit(
    data: Path = typer.Argument(..., help="coupon results (CSV): one row per coupon, a header row, # comments"),
    cycles: str = typer.Option(..., "--cycles", help="column of the cycles reached"),
    unit: str = typer.Option(..., "--unit", "-u", help="unit of the level column: MPa, ksi, psi (stress basis) or %, strain (strain basis)"),
    amplitude: str | None = typer.Option(None, "--amplitude", help="column of the cycle's amplitude"),
    maximum: str | None = typer.Option(None, "--maximum", help="column of the cycle's peak (largest magnitude); needs R"),
    runout: str | None = typer.Option(None, "--runout", help="column marking runouts (1/0, true/false, yes/no)"),
    ratio: float | None = typer.Option(None, "--R", help="stress ratio of every test; without it, the file's R column"),
    form: str = typer.Option("power", "--form", help="power (a = S1 N^(-1/m)) or log-linear (a = S1 (1 - b log10 N))"),
    survival: float = typer.Option(0.95, "--survival", help="survival probability of the design curve"),
    confidence: float = typer.Option(0.95, "--confidence", help="confidence of the design curve (and of the band and test)"),
    material: str = typer.Option("fitted", "--material", help="the material's name in curve.toml (its material.NAME table)"),
    mode: str = typer.Option("fibre", "--mode", help="the table curve.toml fills: fibre, transverse, shear or interlaminar"),
    out: Path = typer.Option(Path("flexcycle-fit"), "--out", "-o", help="folder for fit.json, curve.toml, fit.html"),
) -> None:
    """Fit a fatigue curve, its scatter and a design curve to coupon results (ASTM E739; runouts censored)."""
    from flexcycle.cli import terminal
    from flexcycle.fatigue.coupons import read_coupons
    from flexcycle.fatigue.damage import MODE_TABLES
    from flexcycle.fatigue.fit import fit_coupons
    from flexcycle.fit_outputs import render_fit
    from flexcycle.outputs import write_files

    if mode not in MODE_TABLES:
        raise InputError(f"--mode: must be one of {', '.join(MODE_TABLES)}, got {mode!r}")
    if not material.strip():
        raise InputError("--material: a material name, e.g. my-glass")
    coupons = read_coupons(data, cycles, unit, amplitude=amplitude, maximum=maximum, runout=runout, R=ratio)
    result = fit_coupons(coupons, form, survival, confidence)
    written = write_files(render_fit(result, material.strip(), mode), out)
    typer.echo(terminal.fit_text(result))
    typer.echo(f"\nwrote {', '.join(p.name for p in written)} to {out}\ncaution: {CAUTION}")


@app.command()
def sweep(
    sweep_file: Path = typer.Argument(..., help="sweep file (TOML): design = BASE.toml, [vary], optional [sample], [objectives], [require]"),
    out: Path = typer.Option(Path("flexcycle-sweep"), "--out", "-o", help="folder for sweep.csv, sweep.html and the rows as they finish"),
    scheduler: str | None = typer.Option(None, "--scheduler", help="address of a running Dask scheduler, e.g. tcp://host:8786; default: a local cluster"),
    workers: int | None = typer.Option(None, "--workers", help="worker processes of the local cluster (default: one per core)"),
    resume: bool = typer.Option(False, "--resume", help="go on from the rows already in --out"),
    batch: int | None = typer.Option(None, "--batch", help="candidates per Dask task (default: batches that shrink from at most 100 to 4 as the sweep nears its end, so that the workers finish together)"),
    candidate: int | None = typer.Option(None, "--candidate", help="write candidate N's design file into --out (no sweep)"),
) -> None:
    """Estimate every candidate of a design space on Dask; the Pareto front of life and mass (or the objectives)."""
    if workers is not None and workers < 1:
        raise InputError(f"--workers: a number of worker processes >= 1, got {workers}")
    if batch is not None and batch < 1:
        raise InputError(f"--batch: a number of candidates per task >= 1, got {batch}")
    if candidate is not None:
        from flexcycle.explore.space import candidate_text, read_space

        space = read_space(sweep_file)
        if not 1 <= candidate <= len(space.candidates):
            raise InputError(f"--candidate: the sweep has candidates 1 to {len(space.candidates)}, got {candidate}")
        out.mkdir(parents=True, exist_ok=True)
        path = out / f"candidate-{candidate}.toml"
        path.write_text(candidate_text(space, space.candidates[candidate - 1], out, candidate), encoding="utf-8")
        typer.echo(f"wrote {path}; run it with: flexcycle run {path} --out {out}")
        return
    from flexcycle.cli import terminal
    from flexcycle.explore.sweep import dask_client, prepare, run_sweep

    with _progress() as progress:
        prepared = prepare(sweep_file, progress)
    command = "flexcycle sweep " + " ".join(sys.argv[2:]) if sys.argv[1:2] == ["sweep"] else ""
    with dask_client(scheduler, workers) as client, _count_progress("candidates") as counted:
        outcome = run_sweep(prepared, out, client, resume, batch, counted, command)
    typer.echo(terminal.sweep_text(outcome.table, prepared.space))
    typer.echo(f"\nwrote {', '.join(p.name for p in outcome.files)} to {out}\ncaution: {CAUTION}")


@app.command()
def check(design: Path = typer.Argument(..., help="design file (TOML)")) -> None:
    """Validate a design file without running the estimate."""
    from flexcycle.cli import terminal
    from flexcycle.design import load_design

    typer.echo(terminal.design_text(load_design(design)))
    typer.echo("the design file is valid")


@app.command()
def count(
    profile: Path = typer.Argument(..., help="time history (CSV)"),
    column: str = typer.Option(..., "--column", "-c", help="column to count"),
    unit: str = typer.Option(..., "--unit", "-u", help="unit of that column, e.g. mm, N, lbf"),
    top: int = typer.Option(25, "--top", help="rows to show, largest ranges first (0: all)"),
    residue: str = typer.Option("half", "--residue", help="half (ASTM E1049-85) or repeat (a block of a repeated duty)"),
) -> None:
    """Rainflow-count a time history (ASTM E1049-85) and print the cycle table."""
    from flexcycle.cli import terminal
    from flexcycle.mechanics.units import unit_factor
    from flexcycle.spectra.merging import merge_identical
    from flexcycle.spectra.profiles import refuse_headerless
    from flexcycle.spectra.rainflow import RESIDUE_MODES
    from flexcycle.spectra.streaming import count_history, refuse_constant

    if residue not in RESIDUE_MODES:
        raise InputError(f"--residue: must be one of {', '.join(RESIDUE_MODES)}, got {residue!r}")
    if not unit.strip():
        raise InputError('--unit: the unit of the column, e.g. "mm" or "N"')
    if top < 0:
        raise InputError(f"--top: a number of rows >= 0 (0 shows all), got {top}")
    with input_errors():  # the unit (mechanics), the profile and its counting (spectra)
        to_si = unit_factor(unit, "--unit")
        refuse_headerless(profile, f"count: profile file '{profile}'")
        with _progress() as progress:
            history = count_history(profile, column, to_si, "count", residue, progress=progress)
        refuse_constant(history, f"count: profile file '{profile}'", unit, to_si)
    cycles = merge_identical(history.cycles)
    typer.echo(terminal.cycle_text(cycles, unit, to_si, top, history.samples, residue))


@app.command()
def materials(name: str | None = typer.Argument(None, help="a material to show in full")) -> None:
    """List the bundled materials, or show one with the source of every value."""
    from flexcycle.cli import terminal
    from flexcycle.mechanics.materials import describe, library

    lib = library()
    if name is None:
        typer.echo(terminal.materials_text(lib))
        return
    if name not in lib:
        raise InputError(f"materials: unknown material {name!r}; {did_you_mean(name, lib)}"
                         f"bundled: {', '.join(sorted(lib))}")
    typer.echo(describe(lib[name]))


class _progress:
    """A progress bar on stderr while a long time history is read (rich), as a callback for the library.

    Shown only for a file over PROGRESS_BYTES and only on a terminal; the library itself prints nothing.
    """

    def __enter__(self):
        self.bar = None
        return self.update

    def update(self, done: int, total: int) -> None:
        if self.bar is None:
            if total < PROGRESS_BYTES or not sys.stderr.isatty():
                return
            from rich.console import Console
            from rich.progress import BarColumn, DownloadColumn, Progress, TimeRemainingColumn

            self.bar = Progress("reading and counting the time history", BarColumn(), DownloadColumn(),
                                TimeRemainingColumn(), console=Console(stderr=True), transient=True)
            self.bar.start()
            self.task = self.bar.add_task("read", total=total)
        self.bar.update(self.task, completed=done)

    def __exit__(self, *exc) -> None:
        if self.bar is not None:
            self.bar.stop()


class _count_progress:
    """A progress bar on stderr over a count of finished items (rich), as a callback ``(done, total)``; only on
    a terminal."""

    def __init__(self, what: str) -> None:
        self.what = what

    def __enter__(self):
        self.bar = None
        return self.update

    def update(self, done: int, total: int) -> None:
        if self.bar is None:
            if not sys.stderr.isatty():
                return
            from rich.console import Console
            from rich.progress import BarColumn, MofNCompleteColumn, Progress, TimeRemainingColumn

            self.bar = Progress(self.what, BarColumn(), MofNCompleteColumn(), TimeRemainingColumn(),
                                console=Console(stderr=True), transient=True)
            self.bar.start()
            self.task = self.bar.add_task(self.what, total=total)
        self.bar.update(self.task, completed=done)

    def __exit__(self, *exc) -> None:
        if self.bar is not None:
            self.bar.stop()


def entry() -> None:
    """The ``flexcycle`` console script: `main`, its exit code, and the streams flushed.

    Tests and other Python callers use `main`.
    """
    try:
        main()
        code = 0
    except SystemExit as exc:
        code = exc.code if isinstance(exc.code, int) else 0 if exc.code is None else 1
        if isinstance(exc.code, str):
            print(exc.code, file=sys.stderr)
    for stream in (sys.stdout, sys.stderr):
        try:
            stream.flush()
        except (OSError, ValueError):  # a closed pipe: nothing more can be said
            code = code or 1
    sys.exit(code)


def main() -> None:
    """Console entry point: turn input errors into exit 2 with one message, faults into exit 1."""
    try:
        app(standalone_mode=False)
    except INPUT_ERRORS as exc:  # flexcycle.InputError and the lower layers' (it is a subclass of both)
        message = exc.naming(FLAGS) if isinstance(exc, InputError) else str(exc)
        typer.echo(f"flexcycle: {message}", err=True)
        sys.exit(2)
    except typer.Exit as exc:
        sys.exit(exc.exit_code)
    except typer.Abort:
        sys.exit(1)
    except typer.TyperException as exc:  # a wrong option or argument; or no command at all
        if type(exc).__name__ == "NoArgsIsHelpError":  # the help, on stdout as --help shows it (typer's own click)
            typer.echo(exc.format_message())
            sys.exit(exc.exit_code)
        if exc.format_message():
            typer.echo(f"flexcycle: {exc.format_message()}", err=True)
        sys.exit(exc.exit_code)
    except Exception as exc:
        typer.echo(f"flexcycle: internal fault: {type(exc).__name__}: {exc}", err=True)
        if os.environ.get("FLEXCYCLE_DEBUG"):
            traceback.print_exc()
        sys.exit(1)
