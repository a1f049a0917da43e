"""CLI robustness: --version, a reader that goes away (| head), exit codes, escaped output."""

from __future__ import annotations

import io
import json
import os
import subprocess
import sys
import time
from pathlib import Path

import pytest

import floatcalc
from floatcalc.cli import EXIT_BROKEN_PIPE, _exit_code, main
from floatcalc.cli._format import one_line, print_json, print_table
from floatcalc.errors import ConvergenceError, FloatcalcError, InputError

ROOT = Path(__file__).resolve().parents[1]
RUN_CLI = "import sys; from floatcalc.cli import main; sys.exit(main())"


def run(capsys, *argv):
    try:
        code = main(list(argv))
    except SystemExit as exc:  # argparse's own exit (--help, --version, usage errors)
        code = exc.code
    out, err = capsys.readouterr()
    return code, out, err


def test_version(capsys):
    code, out, err = run(capsys, "--version")
    assert code == 0 and err == ""
    assert out == f"floatcalc {floatcalc.__version__}\n"


@pytest.mark.parametrize("unbuffered", ["", "1"])
@pytest.mark.parametrize("argv", [["liquid", "list"], ["liquid", "water", "--json"]])
def test_reader_gone_exits_141_quietly(argv, unbuffered):
    # The read end of the pipe is closed before floatcalc writes, as when `head` has quit.
    env = {k: v for k, v in os.environ.items() if k != "PYTHONUNBUFFERED"}
    if unbuffered:
        env["PYTHONUNBUFFERED"] = "1"
    r, w = os.pipe()
    os.close(r)
    try:
        proc = subprocess.run([sys.executable, "-c", RUN_CLI, *argv], stdout=w, stderr=subprocess.PIPE,
                              text=True, timeout=120, cwd=ROOT, env=env)
    finally:
        os.close(w)
    assert proc.returncode == EXIT_BROKEN_PIPE == 141, proc.stderr
    assert proc.stderr == ""


def test_broken_pipe_in_process(monkeypatch, capsys):
    class GoneReader(io.StringIO):
        def write(self, s):
            raise BrokenPipeError(32, "Broken pipe")

    monkeypatch.setattr(sys, "stdout", GoneReader())
    code = main(["liquid", "list"])
    err = capsys.readouterr().err
    assert code == EXIT_BROKEN_PIPE and err == ""


class _MyInputProblem(InputError):
    pass


class _BothKinds(ConvergenceError, InputError):
    pass


@pytest.mark.parametrize("exc, code", [
    (InputError("x: bad"), 2), (_MyInputProblem("x: bad"), 2), (_BothKinds("x: bad"), 2),
    (ConvergenceError("solver failed"), 3), (FloatcalcError("other"), 3),
])
def test_exit_codes(exc, code):
    assert _exit_code(exc) == code


@pytest.mark.parametrize("exc, code", [(_MyInputProblem("liquid: bad"), 2), (ConvergenceError("no root"), 3)])
def test_exit_codes_end_to_end(monkeypatch, capsys, exc, code):
    import floatcalc.cli.cmd_liquid as cmd

    def failing(*args, **kwargs):
        raise exc

    monkeypatch.setattr(cmd, "liquid", failing)
    got, out, err = run(capsys, "liquid", "water")
    assert got == code
    assert err == f"floatcalc: error: {exc}\n"


def test_hostile_value_on_the_command_line_is_refused_at_once(capsys):
    t0 = time.process_time()
    code, out, err = run(capsys, "leg", "--radius", "9**9**9**9 mm", "--length", "40mm", "--contact-angle", "150deg")
    assert time.process_time() - t0 < 5.0  # the old parser never finished
    assert code == 2 and err.count("\n") == 1 and "radius: is not a number with a unit" in err


def test_temperature_in_coulomb_gets_a_hint(capsys):
    code, out, err = run(capsys, "liquid", "water", "--temperature", "22 C")
    assert code == 2 and "for Celsius write 22 degC" in err


def test_print_table_escapes_control_characters(capsys):
    print_table("design \x1b[2J", [("leg\x1b]0;owned\x07", "1 mm\u2028x"), ("ok", 3.5)], notes=["see\rthis"])
    out = capsys.readouterr().out
    for raw in ("\x1b", "\x07", "\u2028", "\r"):
        assert raw not in out
    lines = out.split("\n")
    assert lines[0] == "design \\x1b[2J"
    assert "  leg\\x1b]0;owned\\x07  1 mm\\u2028x" in lines
    assert "  note: see\\rthis" in lines
    assert any(line.startswith("  ok") and line.endswith("3.5") for line in lines)


def test_print_json_escapes_what_json_dumps_leaves_raw(capsys):
    data = {"name": "a\x9bb\u2028c\u202ed\x1be", "emoji": "\U0001F600", "tag": "\U000E0041"}
    print_json(data)
    out = capsys.readouterr().out
    for raw in ("\x9b", "\u2028", "\u202e", "\x1b", "\U000E0041"):
        assert raw not in out
    assert json.loads(out) == data  # still valid JSON with the same content
    assert "\U0001F600" in out       # printable characters stay as they are


def test_one_line():
    assert one_line("a\nb\x85c") == "a\\nb\\x85c"
    assert one_line(12) == "12"


def test_everything_a_command_prints_is_terminal_safe(monkeypatch, capsys):
    # A command printing with plain print() (as the device table prints element names) still
    # cannot emit raw control characters: main() guards stdout while a command runs.
    import floatcalc.cli.cmd_liquid as cmd

    def noisy(args):
        print("leg \x1b[2J\x1b]0;owned\x07 \u202eevil\u2028x\r done\tok")
        print("undecodable argv byte: \udcff")
        return 0

    monkeypatch.setattr(cmd, "run", noisy)
    real = sys.stdout
    code, out, err = run(capsys, "liquid")
    assert sys.stdout is real
    assert code == 0 and err == ""
    for raw in ("\x1b", "\x07", "\u202e", "\u2028", "\r", "\udcff"):
        assert raw not in out
    assert out == ("leg \\x1b[2J\\x1b]0;owned\\x07 \\u202eevil\\u2028x\\r done\tok\n"
                   "undecodable argv byte: \\udcff\n")


def test_rod_options_with_a_device_are_refused(capsys):
    from floatcalc.cli import main

    assert main(["sweep", "--example", "skimmer", "--radius", "0.3mm", "--vary",
                 "contact_angle_shift=-5deg:5deg:3"]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and "--radius: applies to rod legs" in err[0]
