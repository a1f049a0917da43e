"""``floatcalc ARGS`` run in the test's own process: the console script's entry point
(:func:`floatcalc.cli.main`) with stdout and stderr captured, as a ``subprocess.CompletedProcess``.

Same code path as the command, without a new interpreter's start-up (about 3 s of imports of
NumPy, SciPy, pint and matplotlib per call on the 2-core machine). Tests of what only a real
process shows (the installed console script, exit on a closed pipe, the bad-input catalogue's
one line on stderr) keep running a subprocess.
"""

from __future__ import annotations

import contextlib
import io
import subprocess


def run_cli(*argv: str) -> subprocess.CompletedProcess:
    from floatcalc.cli import main

    out, err = io.StringIO(), io.StringIO()
    with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
        try:
            code = main([str(a) for a in argv])
        except SystemExit as exc:  # argparse: --help, --version or a usage error
            code = exc.code if isinstance(exc.code, int) else (0 if exc.code is None else 2)
    return subprocess.CompletedProcess(["floatcalc", *map(str, argv)], code, out.getvalue(), err.getvalue())
