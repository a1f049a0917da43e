"""CSV tables with unit-bearing headers: ``depth [mm],force [mN]``.

Reading: lines starting with ``#`` are comments and blank lines are ignored; the first other
line is the header, each column named ``name [unit]`` (text columns, such as ``direction``, need
no unit). Every data row is checked; rows that do
not parse (wrong number of fields, not a number, not finite) are collected with their line
numbers and reported together in one :class:`~floatcalc.errors.InputError`, or, with
``skip_bad_rows=True``, dropped and reported as warnings. Nothing is skipped silently.

Dialects: columns are separated by commas, or by semicolons (or tabs) when the header uses
those; with semicolons or tabs a decimal comma (``0,25``) is read as a decimal point. What
cannot be read unambiguously is refused with a one-line hint naming the fix: a header that mixes
``;`` and ``,``; numbers that mix ``,`` and ``.`` as decimal marks (``1.234,5``); decimal commas
in a comma-separated file (rows split into more fields than the header).

Writing: optional ``#`` comment lines (model, references, cautions) then a header with units.

>>> import io
>>> text = "# invented example\\ndepth [mm],force [mN]\\n0.1,1.5\\n0.2,2.5\\n"
>>> t = read_table(io.StringIO(text), {"depth": "length", "force": "force"})
>>> t.columns["depth"].round(6).tolist(), t.columns["force"].round(6).tolist()
([0.0001, 0.0002], [0.0015, 0.0025])
>>> t = read_table(io.StringIO("depth [mm];force [mN]\\n0,1;1,5\\n"), {"depth": "length", "force": "force"})
>>> t.columns["force"].round(6).tolist(), t.delimiter, t.decimal
([0.0015], ';', ',')
"""

from __future__ import annotations

import csv
import io
import math
import re
from collections.abc import Iterable, Sequence
from dataclasses import dataclass
from dataclasses import field as dc_field
from pathlib import Path
from typing import IO, Any

import numpy as np

from ..errors import input_error
from ..units import KINDS, to_si

_HEADER = re.compile(r"^\s*([^\[\]]+?)\s*\[\s*([^\[\]]*?)\s*\]\s*$")
_MAX_LISTED = 12  # bad rows described in full in one message; the rest are named by line number
from ..design.read import MAX_BYTES  # noqa: E402  (the one size limit of every file floatcalc reads)


@dataclass(frozen=True)
class Table:
    """Columns in SI units (``columns[name]`` float arrays), source line numbers and warnings."""

    columns: dict[str, np.ndarray]
    units: dict[str, str]
    lines: np.ndarray
    warnings: tuple[str, ...]
    comments: tuple[str, ...]
    text: dict[str, list[str]] = dc_field(default_factory=dict)
    delimiter: str = ","
    decimal: str = "."


_INT_CELL = re.compile(r"^\s*[+-]?\d+\s*$")
_COMMA_DECIMAL = re.compile(r"^\s*[+-]?(\d+,\d*|,\d+)([eE][+-]?\d+)?\s*$")


def _delimiter(header_raw: str, field: str, lineno: int) -> str:
    """Column separator from the header line: ',' unless the header uses ';' (or tabs) instead."""
    bare = re.sub(r"\[[^\]]*\]", "", header_raw)  # separators inside a unit do not count
    has = {d: d in bare for d in (",", ";", "\t")}
    if has[","] and has[";"]:
        raise input_error(field, f"line {lineno}: the header mixes ';' and ',' between columns; separate the "
                          "columns with one of them only", repr(header_raw.strip()[:80]))
    if has[";"]:
        return ";"
    if has["\t"] and not has[","]:
        return "\t"
    return ","


def _open(src: Any, field: str = "data") -> tuple[IO[str], bool]:
    if hasattr(src, "read"):
        return src, False
    # a path: the one guarded reader (folder, missing file, size, UTF-8 with a BOM, one line each)
    from ..design.read import read_text
    from ..errors import InputError

    try:
        text, _ = read_text(src, "data file")
    except InputError as exc:  # "data: rig.csv: files may be at most 1000 kB, ..."
        raise InputError(f"{field}: {exc}") from None
    return io.StringIO(text, newline=""), True


def read_table(src: Any, required: dict[str, str], *, skip_bad_rows: bool = False,
               field: str = "data", min_rows: int = 1, optional: dict[str, str] | None = None,
               text_columns: Iterable[str] = (), allow_extra: bool = True) -> Table:
    """Read a unit-headed CSV and return the ``required`` columns converted to SI.

    Parameters
    ----------
    src : path or text file
    required : dict
        Column name -> unit kind (see :data:`floatcalc.units.KINDS`), e.g.
        ``{"depth": "length", "force": "force"}``. Names match case-insensitively.
    optional : dict, optional
        Further numeric columns read when present (name -> unit kind).
    text_columns : names
        Columns read as text (lower-cased, stripped), present or not; they need no unit.
        A text cell that is empty makes its row bad.
    allow_extra : bool
        If False, a column that is neither required, optional nor text is refused by name
        (never dropped silently); if True (default) other columns are ignored.
    skip_bad_rows : bool
        Drop bad rows and report them as warnings instead of raising.
    field : str
        Name used in error messages.
    min_rows : int
        Fewest good rows accepted.

    Raises
    ------
    InputError
        Missing header or units, missing columns, units of the wrong dimension, bad rows
        (all listed by line number), too few rows.
    """
    fh, close = _open(src, field)
    try:
        text = fh.read(MAX_BYTES + 1)
    finally:
        if close:
            fh.close()
    if len(text) > MAX_BYTES:
        raise input_error(field, f"files may be at most {MAX_BYTES // 1000} kB (the limit of every file floatcalc "
                          "reads)", "a larger file")
    comments: list[str] = []
    header: list[str] | None = None
    header_line = 0
    rows: list[tuple[int, list[str]]] = []
    delim = ","
    for lineno, raw in enumerate(text.splitlines(), start=1):
        s = raw.strip()
        if not s:
            continue
        if s.startswith("#"):
            comments.append(s.lstrip("#").strip())
            continue
        if header is None:
            delim = _delimiter(raw, field, lineno)
        try:
            fields = next(csv.reader([raw], delimiter=delim))
        except csv.Error as exc:  # e.g. a field over the csv module's 131072-character limit
            raise input_error(field, f"line {lineno}: not readable as CSV ({exc})", f"{len(raw)} characters") from None
        if header is None:
            header, header_line = fields, lineno
        else:
            rows.append((lineno, fields))
    if header is None:
        raise input_error(field, "needs a header line such as 'depth [mm],force [mN]'", "no header")
    optional = dict(optional or {})
    texts = [" ".join(t.lower().split()) for t in text_columns]
    names: list[str] = []
    units: list[str] = []
    for col in header:
        m = _HEADER.match(col)
        plain = " ".join(col.lower().split())
        if not m and plain in texts:
            names.append(plain)
            units.append("")
            continue
        if not m:
            hint = ""
            if delim == "," and ";" in col:
                hint = " (columns separated by ';'? the header must use ';' throughout)"
            raise input_error(field, f"line {header_line}: each column header needs a unit in brackets, "
                              f"e.g. 'depth [mm]'{hint}", repr(col.strip()))
        names.append(" ".join(m.group(1).lower().split()))
        units.append(m.group(2))
    if not allow_extra:
        known = {k.lower() for k in (*required, *optional)} | set(texts)
        for i, n in enumerate(names):
            if n not in known:
                allowed = ", ".join(f"'{k}'" for k in (*required, *optional, *texts))
                raise input_error(field, f"column '{header[i].strip()}' is not used here; remove it (columns "
                                  f"read: {allowed})", f"columns {', '.join(h.strip() for h in header)}")
            if names.count(n) > 1:
                raise input_error(field, f"column '{n}' must appear once", f"columns {', '.join(header)}")
    index: dict[str, int] = {}
    for want in required:
        hits = [i for i, n in enumerate(names) if n == want.lower()]
        if not hits:
            raise input_error(field, f"needs a column '{want} [unit]'", f"columns {', '.join(header)}")
        index[want] = hits[0]
    kinds = dict(required)
    for want, kind in optional.items():
        hits = [i for i, n in enumerate(names) if n == want.lower()]
        if hits:
            index[want] = hits[0]
            kinds[want] = kind
    text_index = {t: names.index(t) for t in texts if t in names}
    decimal = _decimal_mark(rows, list(index.values()), len(header), delim, field)

    bad: list[str] = []
    good_lines: list[int] = []
    values: dict[str, list[float]] = {k: [] for k in index}
    text_values: dict[str, list[str]] = {k: [] for k in text_index}
    split_decimals = False
    for lineno, fields in rows:
        if len(fields) != len(header):
            bad.append(f"line {lineno}: {len(fields)} fields, header has {len(header)}")
            split_decimals |= len(fields) > len(header) and all(_INT_CELL.match(c) for c in fields)
            continue
        row: dict[str, float] = {}
        problem = None
        for name, i in text_index.items():
            if not fields[i].strip():
                problem = f"line {lineno}: {name} is empty"
        for name, i in index.items():
            if problem:
                break
            cell = fields[i].strip()
            if decimal == ",":
                cell = cell.replace(",", ".")
            try:
                x = float(cell)
            except ValueError:
                problem = f"line {lineno}: {name} is not a number ({cell!r})"
                break
            if not math.isfinite(x):
                problem = f"line {lineno}: {name} is not finite ({cell!r})"
                break
            row[name] = x
        if problem:
            bad.append(problem)
            continue
        good_lines.append(lineno)
        for name, x in row.items():
            values[name].append(x)
        for name, i in text_index.items():
            text_values[name].append(" ".join(fields[i].lower().split()))
    warnings: list[str] = []
    if bad:
        listed = "; ".join(bad[:_MAX_LISTED])
        if len(bad) > _MAX_LISTED:  # every bad row is still named, by line number only
            listed += "; also bad: lines " + ", ".join(b.split(":")[0][5:] for b in bad[_MAX_LISTED:])
        if split_decimals and delim == ",":
            listed += ("; decimal commas in a comma-separated file? separate the columns with ';' or write "
                       "decimals with '.'")
        if not skip_bad_rows:
            raise input_error(field, f"{len(bad)} bad row(s) ({listed}); fix them or use --skip-bad-rows",
                              f"{len(rows)} data rows")
        warnings.extend(f"skipped bad row, {b}" for b in bad)
    if len(good_lines) < min_rows:
        raise input_error(field, f"needs at least {min_rows} good data rows", len(good_lines))

    out: dict[str, np.ndarray] = {}
    unit_of: dict[str, str] = {}
    for name, kind in kinds.items():
        unit = units[index[name]]
        mag = np.asarray(values[name], dtype=float)
        if not unit:
            raise input_error(field, f"column '{name}' needs a unit, e.g. '{KINDS[kind][2]}'", "[]")
        from ..units import Q_

        try:
            q = Q_(mag, unit.replace("µ", "u").replace("μ", "u"))
        except Exception:
            raise input_error(field, f"column '{name}': unknown unit", repr(unit)) from None
        try:  # dimension checked on a scalar so the message shows the unit, not an array
            to_si(Q_(1.0, q.units), kind, name)
        except ValueError:
            raise input_error(field, f"column '{name}' must be a {kind} unit, e.g. '{KINDS[kind][2]}'",
                              repr(unit)) from None
        out[name] = np.asarray(to_si(q, kind, f"{field} column '{name}'", array=True), dtype=float)
        unit_of[name] = unit
    return Table(columns=out, units=unit_of, lines=np.asarray(good_lines), warnings=tuple(warnings),
                 comments=tuple(comments), text=text_values, delimiter=delim, decimal=decimal)


def _decimal_mark(rows, numeric: list[int], ncols: int, delim: str, field: str) -> str:
    """'.' or ',' (decimal comma, only with ';' or tab separators); refuses mixed marks."""
    if delim == ",":
        return "."
    comma = point = None
    for lineno, fields in rows:
        if len(fields) != ncols:
            continue
        for i in numeric:
            c = fields[i].strip()
            if "," in c and "." in c:
                raise input_error(field, f"line {lineno}: {c!r} mixes ',' and '.' (a thousands separator?); write "
                                  "numbers without thousands separators and with one decimal mark",
                                  f"separator {delim!r}")
            if comma is None and _COMMA_DECIMAL.match(c):
                comma = (lineno, c)
            elif point is None and "." in c:
                point = (lineno, c)
        if comma and point:
            break
    if comma and point:
        raise input_error(field, f"numbers mix ',' (line {comma[0]}: {comma[1]!r}) and '.' (line {point[0]}: "
                          f"{point[1]!r}) as decimal marks; write every decimal the same way, without "
                          "thousands separators", f"separator {delim!r}")
    return "," if comma else "."


def write_table(dst: Any, columns: Sequence[tuple[str, str, Any]], *, comments: Iterable[str] = (),
                digits: int = 8) -> None:
    """Write columns as CSV with ``name [unit]`` headers.

    Parameters
    ----------
    dst : path or text file
    columns : sequence of (name, unit, values)
        ``values`` already in ``unit`` (plain numbers or strings).
    comments : lines written first, each prefixed with ``# ``.
    """
    cols = [(n, u, np.asarray(v).ravel()) for n, u, v in columns]
    nrows = {c[2].size for c in cols}
    if len(nrows) > 1:  # programming error
        raise ValueError(f"columns of unequal length: {sorted(nrows)}")
    own = not hasattr(dst, "write")
    fh = open(Path(dst), "w", newline="", encoding="utf-8") if own else dst
    try:
        for c in comments:
            for line in str(c).splitlines():
                fh.write(f"# {line}\n")
        w = csv.writer(fh, lineterminator="\n")
        w.writerow([f"{n} [{u}]" for n, u, _ in cols])
        for i in range(cols[0][2].size if cols else 0):
            w.writerow([_cell(c[2][i], digits) for c in cols])
    finally:
        if own:
            fh.close()


def _cell(x: Any, digits: int) -> str:
    if isinstance(x, (bool, np.bool_)):
        return "1" if x else "0"
    if isinstance(x, (float, np.floating)):
        return f"{float(x):.{digits}g}"
    return str(x)


def to_text(columns: Sequence[tuple[str, str, Any]], comments: Iterable[str] = ()) -> str:
    """The CSV text :func:`write_table` would write."""
    buf = io.StringIO()
    write_table(buf, columns, comments=comments)
    return buf.getvalue()
