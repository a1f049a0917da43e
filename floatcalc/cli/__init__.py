"""Command-line front end. Holds no physics: parses, calls the API, formats.

Each subcommand lives in its own module ``floatcalc/cli/cmd_<name>.py`` that defines
``register(subparsers)`` and an integer ``ORDER`` (its place in ``--help``). Modules are found
by name, so adding a command touches no shared file. Every command accepts ``--json``.
Bad input prints one line on stderr and exits with code 2; a solver that fails exits with 3.
When the reader of the output goes away early (``floatcalc ... | head``) the command stops
quietly with exit code 141 (128 + SIGPIPE, what a shell reports for ``seq 1000000 | head``).
"""

from __future__ import annotations

import argparse
import importlib
import os
import pkgutil
import sys
import warnings

from ..errors import ConvergenceError, FloatcalcError, InputError
from ._format import one_line as _one_line
from ._format import terminal_safe_stdout


def _command_modules():
    """Import every ``cmd_*`` module of this package, sorted by their ``ORDER``."""
    mods = [importlib.import_module(f"{__name__}.{m.name}")
            for m in pkgutil.iter_modules(__path__) if m.name.startswith("cmd_")]
    return sorted(mods, key=lambda m: (getattr(m, "ORDER", 100), m.__name__))

EXIT_BAD_INPUT = 2
EXIT_SOLVER = 3
EXIT_BROKEN_PIPE = 141  # 128 + SIGPIPE (13), as for any Unix tool whose reader went away


class _Parser(argparse.ArgumentParser):
    """argparse with one-line errors and exit code 2."""

    def error(self, message: str):  # noqa: D401 - argparse API
        self.exit(EXIT_BAD_INPUT, f"floatcalc: error: {_one_line(message)} (see '{self.prog} --help')\n")


def build_parser() -> argparse.ArgumentParser:
    parser = _Parser(
        prog="floatcalc",
        description="Load that legs, pins, balls, pads and rings carry on a liquid surface "
        "by surface tension and meniscus pressure (static estimate, clean liquid).",
    )
    from .. import __version__

    parser.add_argument("--version", action="version", version=f"floatcalc {__version__}")
    sub = parser.add_subparsers(dest="command", metavar="COMMAND", parser_class=_Parser)
    for mod in _command_modules():
        mod.register(sub)
    return parser


def _join_negative_values(argv: list[str]) -> list[str]:
    """Turn ``--radius -1mm`` into ``--radius=-1mm`` so argparse does not take it for a flag.

    The value is then checked (and refused with a clear message) by the API.
    """
    out: list[str] = []
    i = 0
    while i < len(argv):
        tok = argv[i]
        nxt = argv[i + 1] if i + 1 < len(argv) else ""
        if tok.startswith("--") and "=" not in tok and len(nxt) > 1 and nxt[0] == "-" and (
            nxt[1].isdigit() or nxt[1] == "."
        ):
            out.append(f"{tok}={nxt}")
            i += 2
            continue
        out.append(tok)
        i += 1
    return out


def _exit_code(exc: FloatcalcError) -> int:
    """Exit code of a floatcalc error: 2 for bad input (every InputError), 3 for a solver."""
    if isinstance(exc, InputError):
        return EXIT_BAD_INPUT
    if isinstance(exc, ConvergenceError):
        return EXIT_SOLVER
    return EXIT_BAD_INPUT if isinstance(exc, ValueError) else EXIT_SOLVER


def _os_message(exc: Exception) -> str:
    """One plain line for a file that could not be read or written (no raw ``[Errno n]`` text).

    >>> _os_message(FileNotFoundError(2, "No such file or directory", "/x/r.pdf"))
    '/x/r.pdf: cannot be read or written (no such file or directory); check the path and its folder'
    """
    if isinstance(exc, UnicodeDecodeError):
        return f"input: must be UTF-8 text (undecodable byte at position {exc.start})"
    name = getattr(exc, "filename", None)
    why = (getattr(exc, "strerror", None) or type(exc).__name__).lower()
    if name is None:
        return f"file: cannot be read or written ({why})"
    return f"{name}: cannot be read or written ({why}); check the path and its folder"


def _run(argv: list[str] | None) -> int:
    parser = build_parser()
    args = parser.parse_args(_join_negative_values(sys.argv[1:] if argv is None else list(argv)))
    if not getattr(args, "func", None):
        parser.print_help()
        return EXIT_BAD_INPUT
    try:
        with warnings.catch_warnings(), terminal_safe_stdout():
            warnings.simplefilter("ignore")  # results carry their warnings; print those instead
            return int(args.func(args) or 0)
    except BrokenPipeError:
        raise
    except FloatcalcError as exc:
        # A design file with several problems reports them all, one line each (head line first);
        # every other error is a single line. Control characters echoed from input are escaped.
        for line in str(exc).split("\n"):
            print(f"floatcalc: error: {_one_line(line)}", file=sys.stderr)
        return _exit_code(exc)
    except (OSError, UnicodeDecodeError) as exc:
        print(f"floatcalc: error: {_one_line(_os_message(exc))}", file=sys.stderr)
        return EXIT_BAD_INPUT
    except KeyboardInterrupt:
        print("floatcalc: interrupted", file=sys.stderr)
        return 130


def _silence_stdout() -> None:
    """Point stdout at /dev/null so that the flush at interpreter exit cannot fail again."""
    try:
        devnull = os.open(os.devnull, os.O_WRONLY)
        os.dup2(devnull, sys.stdout.fileno())
        os.close(devnull)
    except (OSError, ValueError, AttributeError):  # stdout without a file descriptor (tests)
        pass


def main(argv: list[str] | None = None) -> int:
    """Entry point of the ``floatcalc`` console script; returns the exit code.

    Output is flushed before returning, so that a reader that has gone away (``| head``) is
    noticed here and answered with :data:`EXIT_BROKEN_PIPE` and no message.
    """
    try:
        try:
            code = _run(argv)
        except SystemExit:  # argparse after --help, --version or a usage error
            sys.stdout.flush()
            raise
        sys.stdout.flush()
        return code
    except BrokenPipeError:
        _silence_stdout()
        return EXIT_BROKEN_PIPE


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())
