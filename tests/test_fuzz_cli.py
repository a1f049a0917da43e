"""Fuzzing the CLI argument handling: whatever the user types, floatcalc answers with an exit
code and at most a one-line error, never an uncaught exception or a hang.

Hypothesis builds argument lists from the real option names and from hostile values (negative
numbers, NaN, huge exponents, odd units, unicode, empty strings).
"""

from __future__ import annotations

import contextlib
import io
import re

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from floatcalc.cli import build_parser, main

_SUBCOMMANDS = sorted(build_parser()._subparsers._group_actions[0].choices)  # noqa: SLF001

_VALUES = st.one_of(
    st.sampled_from([
        "0.2mm", "-1mm", "0mm", "nan mm", "inf mm", "1e308 m", "1e-308 m", "150deg", "190deg",
        "-5deg", "20degC", "500 K", "-300 degC", "3 kg", "abc", "", "1/0", "2**1000 mm", "0.2 µm",
        "35g/kg", "12", "2.5", "-3", "water", "watr", "NaN", "--json", "0.2 mm mm", "1e5 km",
    ]),
    st.text(max_size=12),
)


def _option_names(sub: str) -> list[str]:
    parser = build_parser()
    sp = parser._subparsers._group_actions[0].choices[sub]  # noqa: SLF001
    return [s for a in sp._actions for s in a.option_strings if s.startswith("--") and s != "--help"]  # noqa: SLF001


@st.composite
def _argv(draw):
    sub = draw(st.sampled_from(_SUBCOMMANDS))
    opts = _option_names(sub)
    argv = [sub]
    for _ in range(draw(st.integers(0, 6))):
        if opts and draw(st.booleans()):
            argv.append(draw(st.sampled_from(opts)))
        argv.append(draw(_VALUES))
    return argv


@pytest.mark.slow
@settings(max_examples=200, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(argv=_argv())
def test_cli_never_raises(argv):
    # Commands that write files or contact a scheduler are fuzzed elsewhere, not here.
    if any(a in ("-o", "--output", "--csv-dir", "--out", "--save", "--scheduler") for a in argv):
        return
    out_buf, err_buf = io.StringIO(), io.StringIO()
    with contextlib.redirect_stdout(out_buf), contextlib.redirect_stderr(err_buf):
        try:
            code = main(argv)
        except SystemExit as exc:  # argparse's own exit for --help or bad syntax
            code = exc.code
    out, err = out_buf.getvalue(), err_buf.getvalue()
    assert code in (0, 2, 3), (argv, code, err)
    assert "Traceback" not in err and "Traceback" not in out
    if code == 2:
        lines = [ln for ln in err.splitlines() if ln.strip()]
        assert len(lines) == 1, (argv, err)
    if code == 0:
        assert not re.search(r"\bnan\b|\binf\b", out, flags=re.IGNORECASE), (argv, out)


@pytest.mark.parametrize("sub", _SUBCOMMANDS)
def test_every_subcommand_has_help(sub, capsys):
    with pytest.raises(SystemExit) as exc:
        main([sub, "--help"])
    assert exc.value.code == 0
    assert "usage" in capsys.readouterr().out
