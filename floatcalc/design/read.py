"""The one guarded reader for every file floatcalc takes in (design files, CSV data).

Every command, the page and the Python API read text through :func:`read_text` (a path) or
:func:`decode` (bytes from an upload), and TOML through :func:`parse_toml`, so the same limits
hold everywhere:

* size: at most :data:`MAX_BYTES` (1 MB);
* encoding: UTF-8; a byte-order mark at the start is accepted and dropped;
* TOML: at most :data:`MAX_KEY_PARTS` dotted parts in a key (tomllib takes quadratic time in
  them) and no nesting deep enough to exhaust Python's recursion (tomllib recurses once per
  nested array or inline table); malformed TOML gives one line with tomllib's position.

Nothing read is ever evaluated: TOML goes to :mod:`tomllib` only.
"""

from __future__ import annotations

from pathlib import Path

from ..errors import input_error

#: Largest file accepted [bytes], the same for every command, the page and the API.
MAX_BYTES = 1_000_000
#: Dotted parts allowed in one TOML key or table header.
MAX_KEY_PARTS = 64
_BOM = "\ufeff"


def decode(data: bytes | str, source: str = "file") -> str:
    """Text of an uploaded file: size-limited UTF-8, a leading byte-order mark dropped.

    >>> decode(b"\\xef\\xbb\\xbfa = 1")
    'a = 1'
    """
    if isinstance(data, str):
        text = data
        if len(text.encode("utf-8", "surrogatepass")) > MAX_BYTES:
            raise input_error(source, f"files may be at most {MAX_BYTES // 1000} kB",
                              f"{len(text.encode('utf-8', 'surrogatepass'))} bytes")
    else:
        if len(data) > MAX_BYTES:
            raise input_error(source, f"files may be at most {MAX_BYTES // 1000} kB", f"{len(data)} bytes")
        try:
            text = bytes(data).decode("utf-8")
        except UnicodeDecodeError as exc:
            raise input_error(source, f"must be UTF-8 text (undecodable byte at position {exc.start}); "
                              "save it as UTF-8 and try again") from None
    return text[1:] if text.startswith(_BOM) else text


def read_text(path, what: str = "design file") -> tuple[str, str]:
    """(text, source name) of a file on disk, with the limits of :func:`decode`.

    A missing file, a directory or an unreadable file gives one plain line.
    """
    if isinstance(path, bytes) or not isinstance(path, str) and not hasattr(path, "__fspath__"):
        raise input_error("path", f"must be the path of a {what}", type(path).__name__)
    p = Path(path)
    if p.is_dir():
        raise input_error(str(path), f"is a folder, not a {what}")
    if not p.exists():
        raise input_error(str(path), f"no such {what}")
    try:
        size = p.stat().st_size
        if size > MAX_BYTES:
            raise input_error(str(path), f"files may be at most {MAX_BYTES // 1000} kB", f"{size} bytes")
        data = p.read_bytes()
    except OSError as exc:
        raise input_error(str(path), f"cannot be read ({exc.strerror or 'read error'})") from None
    return decode(data, str(path)), str(path)


def check_key_depth(text: str, source: str) -> None:
    """Refuse a key or table header with more than MAX_KEY_PARTS dotted parts before parsing
    (a 64 kB line of ``a.a.a...`` keeps tomllib busy for many seconds)."""
    for n, line in enumerate(text.splitlines(), start=1):
        s = line.lstrip()
        if s and s[0] != "#" and s.split("=", 1)[0].count(".") >= MAX_KEY_PARTS:
            raise input_error(source, f"line {n}: keys may have at most {MAX_KEY_PARTS} dotted parts",
                              f"{s.split('=', 1)[0].count('.') + 1} parts")


def parse_toml(text: str, source: str = "design") -> dict:
    """Parse TOML text with the guards above; one InputError line on any problem.

    >>> parse_toml("a = [[[1]]]")["a"]
    [[[1]]]
    """
    import tomllib

    if text.startswith(_BOM):
        text = text[1:]
    check_key_depth(text, source)
    try:
        return tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        hint = ("; a design file is TOML, this looks like CSV data (for 'floatcalc fit --data')"
                if str(source).lower().endswith(".csv") else "")
        raise input_error(source, f"is not valid TOML ({str(exc).splitlines()[0]}){hint}") from None
    except RecursionError:
        raise input_error(source, "is not a design file: arrays or tables nested too deeply") from None
