"""The one InputError family and the one did-you-mean helper (life/errors.py, mechanics/errors.py).

Layers: mechanics and spectra each raise their own InputError; flexcycle.InputError is a subclass of both,
and `input_errors` turns a lower layer's error into flexcycle's where the library hands user input down.
"""
from __future__ import annotations

import pytest

import flexcycle
from flexcycle.errors import INPUT_ERRORS, InputError, did_you_mean, input_errors
from flexcycle.mechanics.errors import InputError as MechanicsInputError
from flexcycle.mechanics.units import parse_quantity
from flexcycle.spectra.errors import InputError as SpectraInputError
from flexcycle.spectra.profiles import block_table


def test_flexcycle_input_error_is_both_lower_layers_errors():
    """Whatever catches a lower layer's error catches flexcycle's too (and all are ValueErrors)."""
    assert issubclass(InputError, MechanicsInputError)
    assert issubclass(InputError, SpectraInputError)
    assert issubclass(InputError, ValueError)
    assert flexcycle.InputError is InputError
    for root in INPUT_ERRORS:
        with pytest.raises(root):
            raise InputError("x")


def test_a_lower_layers_error_leaves_as_flexcycles_with_the_place_prefixed():
    with pytest.raises(InputError, match=r"^d\.toml \[beam\] span: .*length") as caught:
        with input_errors("d.toml "):
            parse_quantity("50 kg", "length", "[beam] span")
    assert isinstance(caught.value.__cause__, MechanicsInputError)
    with pytest.raises(InputError, match="row 1: min > max"):
        with input_errors():
            block_table([(2.0, 1.0, 10.0)], "duty")


def test_flexcycles_own_error_and_other_exceptions_pass_unchanged():
    original = InputError("kept", parameter="out")
    with pytest.raises(InputError) as caught:
        with input_errors("prefix "):
            raise original
    assert caught.value is original
    with pytest.raises(ZeroDivisionError):
        with input_errors():
            1 / 0  # noqa: B018 — a fault, not bad input: never turned into an InputError


def test_the_message_names_the_parameter_as_the_caller_calls_it():
    error = InputError("target_blocks: must be > 0, got -5", parameter="target_blocks")
    assert error.naming({"target_blocks": "--life"}) == "--life: must be > 0, got -5"
    assert error.naming({}) == str(error)
    assert InputError("no parameter").naming({"out": "--out"}) == "no parameter"


@pytest.mark.parametrize(("given", "names", "expected"), [
    ("spna", ["span", "width", "support"], "did you mean 'span'? "),
    ("e-glass-epoxi", ["e-glass-epoxy", "carbon-epoxy"], "did you mean 'e-glass-epoxy'? "),
    ("zzzz", ["span", "width"], ""),      # nothing near
    (42, ["span"], ""),                   # only a string can be near a name
])
def test_did_you_mean(given, names, expected):
    assert did_you_mean(given, names) == expected


def test_did_you_mean_cutoff():
    """difflib's ratio of 'carbon' to 'carbon-epoxy' is 2·6/18 = 0.67: suggested at 0.6, not at 0.8."""
    assert did_you_mean("carbon", ["carbon-epoxy"]) == "did you mean 'carbon-epoxy'? "
    assert did_you_mean("carbon", ["carbon-epoxy"], cutoff=0.8) == ""


def test_the_library_names_its_parameter_and_the_command_its_flag(tmp_path):
    """write_files(out=…) says ``out``; `flexcycle run --out …` says ``--out`` for the same mistake."""
    from flexcycle.outputs import write_files
    from tests.cli_runner import run_cli

    taken = tmp_path / "a-file"
    taken.write_text("x", encoding="utf-8")
    with pytest.raises(InputError, match=r"^out .*a-file: exists and is not a folder") as caught:
        write_files({"summary.json": "{}"}, taken)
    assert caught.value.parameter == "out"
    ran = run_cli(["run", "--out", taken])
    assert ran.code == 2
    assert ran.err.startswith(f"flexcycle: --out {taken}: exists and is not a folder")


def test_sizing_names_target_blocks_and_the_command_its_life_flag(tmp_path):
    """plan(target_blocks=-5) says ``target_blocks``; `flexcycle size --life -5` says ``--life``."""
    from flexcycle.sizing.plan import plan
    from tests.cli_runner import run_cli

    design = flexcycle.load_design(flexcycle.example_path("prosthetic-keel"))
    with pytest.raises(InputError, match=r"^target_blocks: a number of blocks > 0, got -5") as caught:
        plan(design, -5.0, "thickness", None, False)
    assert caught.value.parameter == "target_blocks"
    ran = run_cli(["size", flexcycle.example_path("prosthetic-keel"), "--life", "-5", "--out", tmp_path / "out"])
    assert ran.code == 2 and ran.err.startswith("flexcycle: --life: a number of blocks > 0, got -5")
