"""Issue 8 §4: fuzzing the design-file loader and the CSV reader.

Whatever text or bytes come in, the only exception allowed out is ``InputError`` with a clear
message: one line, or, for a design file with several problems, the documented form (README,
"Design file format"): a head line ``NAME: N problems`` followed by exactly N one-line
problems, each starting with its key path. No traceback text, no hang (each call must finish
in under 5 s), and sizes are bounded (over-long input is refused, not read whole).

Hypothesis runs derandomised (tests/conftest.py), 200 examples per target.
"""

from __future__ import annotations

import io
import re
import time

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

import floatcalc as fc
from floatcalc.device.design import example_text, list_examples
from floatcalc.errors import InputError
from floatcalc.studies.csvio import read_table

FUZZ = settings(max_examples=200, deadline=None, suppress_health_check=[HealthCheck.too_slow])
TIME_LIMIT_S = 5.0  # CPU seconds of this thread: other jobs on a shared machine do not count
EXAMPLES = [example_text(e["name"]) for e in list_examples()]  # the shipped invented designs
_HEAD = re.compile(r"^.+: (\d+) problems( \(the first (\d+) listed\))?$")


def _check_message(msg: str, *, multi_ok: bool) -> None:
    assert msg.strip(), "empty error message"
    assert "Traceback" not in msg
    lines = msg.split("\n")
    if len(lines) == 1:
        assert ": " in msg, f"no 'field: problem' form: {msg!r}"
        assert "\r" not in msg and "\u2028" not in msg and "\x85" not in msg, repr(msg)
        return
    assert multi_ok, f"more than one line: {msg!r}"
    m = _HEAD.match(lines[0])
    assert m, f"multi-line message without the 'N problems' head: {msg!r}"
    assert int(m.group(3) or m.group(1)) == len(lines) - 1, msg
    assert len(lines) <= 21, "message not bounded"
    for line in lines[1:]:
        assert line.strip() and ": " in line, f"problem line without a key path: {line!r}"
        assert "\r" not in line and "\u2028" not in line and "\x85" not in line, repr(line)


def _timed(fn, *args, **kw):
    t0 = time.thread_time()
    try:
        return fn(*args, **kw), None
    except InputError as exc:
        return None, exc
    finally:
        assert time.thread_time() - t0 < TIME_LIMIT_S, "took too long"


def _load(text: str):
    out, exc = _timed(fc.load_design, None, text=text)
    if exc is not None:
        _check_message(str(exc), multi_ok=True)
    return out


# ------------------------------------------------------------------------------------------------
# Design files

toml_chars = st.sampled_from(list('[]{}="\'.,#-+_ \n\t:01239eEinfaslrutdgmk') + ["\u00b5", "°", "\u2028", "\x00",
                                                                                  "é", "\U0001f600"])
tomlish = st.lists(toml_chars, max_size=300).map("".join)


@FUZZ
@given(tomlish)
def test_random_tomlish_text_only_raises_input_error(text):
    _load(text)


@FUZZ
@given(st.text(max_size=400))
def test_random_unicode_text_only_raises_input_error(text):
    _load(text)


ODD_VALUES = [
    '"nan mm"', '"inf mm"', '"-inf deg"', '"1e308 mm"', '"1e-320 mm"', '"0.2 parsec"', '"0.2"', '""', '" "',
    '"0.2 mm mm"', '"2 mm + 3 s"', '"∞ mm"', '"0,2 mm"', '"0.2 mm\\u2028x"', '"0.2 mm\\nrogue: line"',
    '"__import__(\'os\')"', '"1e999999 mm"', '"10**10**10 mm"', '"µm"', '"0.2 µm"', '"20 °C"', "1e400", "-0.0",
    "99999999999999999999999999", "-99999999999999999999", "nan", "inf", "true", "[]", "{}", '["1 mm"]',
    '["1 mm", "2 mm", "3 mm"]', "{ advancing = 1 }", "1979-05-27T07:32:00Z", "'''multi\nline'''",
]


@st.composite
def mutated_examples(draw):
    lines = draw(st.sampled_from(EXAMPLES)).splitlines()
    for _ in range(draw(st.integers(1, 6))):
        op = draw(st.sampled_from(["delete", "duplicate", "value", "unicode", "key"]))
        i = draw(st.integers(0, len(lines) - 1))
        if op == "delete" and len(lines) > 1:
            del lines[i]
        elif op == "duplicate":
            lines.insert(i, lines[i])
        elif op == "value" and "=" in lines[i]:
            key = lines[i].split("=", 1)[0]
            lines[i] = f"{key}= {draw(st.sampled_from(ODD_VALUES))}"
        elif op == "unicode":
            j = draw(st.integers(0, len(lines[i])))
            lines[i] = lines[i][:j] + draw(st.text(min_size=1, max_size=3)) + lines[i][j:]
        elif op == "key" and "=" in lines[i]:
            rest = lines[i].split("=", 1)[1]
            odd = draw(st.sampled_from(['"a\\nb"', '"x\\u2028y"', '"\\r"', "raduis", '"legs[0]"', '"é"',
                                        "schema_version", "a.b.c"]))
            lines[i] = f"{odd} ={rest}"
    return "\n".join(lines)


@FUZZ
@given(mutated_examples())
def test_mutated_example_designs_only_raise_input_error(text):
    _load(text)


@pytest.mark.slow
@FUZZ
@given(st.sampled_from(["radius", "length", "mass", "temperature", "segments", "heading", "spacing"]),
       st.sampled_from(["1e308", "1.7976931348623157e308", "1e-308", "4.9e-324", "123456789012345678901234567890",
                        "-1e308", "1e309"]),
       st.sampled_from(["", " mm", " m", " g", " kg", " degC", " K", " deg"]),
       st.booleans())
def test_huge_and_tiny_numbers_only_raise_input_error(key, number, unit, quoted):
    text = EXAMPLES[1] if len(EXAMPLES) > 1 else EXAMPLES[0]
    value = f'"{number}{unit}"' if quoted else number
    lines = [f"{ln.split('=', 1)[0]}= {value}" if ln.strip().startswith(key + " ") else ln for ln in text.splitlines()]
    if not any(ln.strip().startswith(key + " ") for ln in text.splitlines()):
        lines.insert(len(lines), f"{key} = {value}")
    design = _load("\n".join(lines))
    if design is not None:  # accepted: then it must also solve or refuse cleanly, never NaN
        out, exc = _timed(fc.solve_device, design)
        if exc is not None:
            _check_message(str(exc), multi_ok=False)


@pytest.mark.slow
@settings(max_examples=40, deadline=None)  # fewer: each deep document is up to a few hundred kB of TOML
@given(st.sampled_from(["array", "inline", "dotted", "tables"]), st.integers(10, 200_000))
def test_deeply_nested_documents_only_raise_input_error(shape, depth):
    if shape == "array":
        text = "schema_version = 1\nx = " + "[" * depth + "]" * depth + "\n"
    elif shape == "inline":
        text = "schema_version = 1\nx = " + "{a = " * depth + "1" + "}" * depth + "\n"
    elif shape == "dotted":
        text = "schema_version = 1\n" + ".".join(["a"] * min(depth, 50_000)) + " = 1\n"
    else:
        text = "schema_version = 1\n" + "".join(f"[t{i}]\nk = {i}\n" for i in range(min(depth, 20_000)))
    _load(text)


def test_oversized_design_text_is_refused_without_parsing():
    text = "schema_version = 1\n" + "#" * 2_000_000
    t0 = time.thread_time()
    with pytest.raises(InputError) as exc:
        fc.load_design(None, text=text)
    assert time.thread_time() - t0 < 1.0
    _check_message(str(exc.value), multi_ok=False)
    assert "at most" in str(exc.value)


# ------------------------------------------------------------------------------------------------
# CSV reader (force-depth data for the fit)

REQUIRED = {"depth": "length", "force": "force"}
header_cells = st.sampled_from(["depth [mm]", "force [mN]", "depth [m]", "force [N]", "depth", "force [kg]",
                                "depth [parsec]", "force [mN", "[mN]", "Depth [MM]", " force [ µN ] ", "depth [°]",
                                "force [mN]\ufeff", "\ufeffdepth [mm]", "extra [s]", "depth [mm**99999]",
                                "force [1e308 N]", "depth [__import__('os')]", "force []", '"depth [mm]"'])
cells = st.one_of(st.sampled_from(["0.1", "1e308", "-1e308", "1e999", "nan", "inf", "", " ", "abc", "0x10", "1,5",
                                   "١٢", "\x00", '"', '"1.5"', "1_000", "-0"]),
                  st.floats(allow_nan=True, allow_infinity=True).map(repr), st.text(max_size=6))


@st.composite
def csv_texts(draw):
    head = draw(st.lists(header_cells, min_size=0, max_size=4))
    rows = draw(st.lists(st.lists(cells, min_size=0, max_size=5), max_size=25))
    sep = draw(st.sampled_from(["\n", "\r\n", "\r"]))
    bom = draw(st.sampled_from(["", "\ufeff"]))
    comment = draw(st.sampled_from(["", "# invented data" + sep, "#" + sep]))
    lines = [",".join(head)] + [",".join(r) for r in rows]
    return bom + comment + sep.join(lines) + draw(st.sampled_from(["", sep]))


def _read(text):
    for skip in (False, True):
        out, exc = _timed(read_table, io.StringIO(text), REQUIRED, skip_bad_rows=skip)
        if exc is not None:
            _check_message(str(exc), multi_ok=False)
        else:
            for v in out.columns.values():
                assert all(map(lambda x: x == x and abs(x) != float("inf"), v.tolist())), "NaN/inf let through"


@pytest.mark.slow
@FUZZ
@given(csv_texts())
def test_structured_random_csv_only_raises_input_error(text):
    _read(text)


@FUZZ
@given(st.text(max_size=500))
def test_random_text_csv_only_raises_input_error(text):
    _read(text)


@FUZZ
@given(st.sampled_from(["depth [mm],force [mN]", "depth [mm],force [mN],note [s]", "force [mN],depth [mm]"]),
       st.integers(1, 50), st.sampled_from([1, 1000, 200_000]), st.sampled_from(["\n", "\r\n"]))
def test_huge_lines_and_many_rows_are_bounded(header, n_rows, width, sep):
    row = "0.1," + "7" * width
    text = header + sep + sep.join([row] * n_rows) + sep
    _read(text)


def test_oversized_csv_is_refused_quickly():
    text = "depth [mm],force [mN]\n" + "0.1,0.2\n" * 1_000_000  # 8 MB
    t0 = time.thread_time()
    with pytest.raises(InputError) as exc:
        read_table(io.StringIO(text), REQUIRED)
    assert time.thread_time() - t0 < 2.0
    _check_message(str(exc.value), multi_ok=False)
    assert "at most" in str(exc.value)


def test_csv_file_with_bom_and_crlf_reads_like_plain_text(tmp_path):
    """A spreadsheet export (UTF-8 BOM, CRLF) gives the same numbers as plain text."""
    plain = "depth [mm],force [mN]\n0.1,1.5\n0.2,2.5\n"
    p = tmp_path / "rig.csv"
    p.write_bytes(("\ufeff" + plain.replace("\n", "\r\n")).encode("utf-8"))
    a = read_table(io.StringIO(plain), REQUIRED)
    b = read_table(p, REQUIRED)
    assert a.columns["depth"].tolist() == b.columns["depth"].tolist() == [1e-4, 2e-4]
    assert b.columns["force"].tolist() == pytest.approx([1.5e-3, 2.5e-3])
