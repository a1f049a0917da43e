"""The served page never runs user text as code, never renders it as markup, bounds uploads,
and parses them safely.

Static checks read the source with :mod:`ast` (not a text search, so comments and strings do
not count): no ``eval``/``exec``/``compile`` calls, no pickle/marshal/shelve/dill/yaml imports
anywhere in app.py or the floatcalc package (``__import__`` only with a literal module name). The upload limits are read from the page code and
from .streamlit/config.toml. The upload handler (``floatcalc.page.main.read_upload`` →
``floatcalc.design.load_design``; AppTest has no file-upload element) is then fed hostile
bytes: random binary, a pickle payload whose loading would create a file, oversize bytes and
TOML bombs of many keys. It must answer with a clear error and run nothing.
"""

from __future__ import annotations

import ast
import io
import json
import os
import pickle
import tomllib
from pathlib import Path

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from floatcalc.design.read import MAX_BYTES
from floatcalc.errors import InputError
from floatcalc.page.main import read_upload

ROOT = Path(__file__).resolve().parents[1]
APP = ROOT / "app.py"
MAIN = ROOT / "floatcalc" / "page" / "main.py"
SOURCES = [APP] + sorted((ROOT / "floatcalc").rglob("*.py"))
UNSAFE_MODULES = {"pickle", "cPickle", "marshal", "shelve", "dill", "cloudpickle", "yaml", "joblib", "toml"}


def _trees():
    for path in SOURCES:
        yield path, ast.parse(path.read_text(encoding="utf-8"), filename=str(path))


def test_no_code_evaluation_anywhere():
    found = []
    for path, tree in _trees():
        for node in ast.walk(tree):
            if isinstance(node, ast.Call):
                f = node.func
                name = f.id if isinstance(f, ast.Name) else f.attr if isinstance(f, ast.Attribute) else ""
                builtin = isinstance(f, ast.Name)
                literal = bool(node.args) and isinstance(node.args[0], ast.Constant)
                if (name in {"eval", "exec"} or (builtin and name == "compile")
                        or (builtin and name == "__import__" and not literal)):  # re.compile is fine
                    found.append(f"{path.relative_to(ROOT)}:{node.lineno} {name}()")
                if name in {"load", "unsafe_load", "full_load"} and isinstance(f, ast.Attribute) and \
                        isinstance(f.value, ast.Name) and f.value.id in {"yaml", "pickle", "marshal", "dill"}:
                    found.append(f"{path.relative_to(ROOT)}:{node.lineno} {f.value.id}.{name}()")
    assert not found, found


def test_no_unsafe_deserialisers_imported():
    found = []
    for path, tree in _trees():
        for node in ast.walk(tree):
            names = []
            if isinstance(node, ast.Import):
                names = [a.name.split(".")[0] for a in node.names]
            elif isinstance(node, ast.ImportFrom) and node.module:
                names = [node.module.split(".")[0]]
            found += [f"{path.relative_to(ROOT)}:{node.lineno} import {n}" for n in names if n in UNSAFE_MODULES]
    assert not found, found


def test_allow_pickle_never_enabled():
    """numpy.load of the shipped table must not allow pickles (np.load(..., allow_pickle=True))."""
    found = []
    for path, tree in _trees():
        for node in ast.walk(tree):
            if isinstance(node, ast.keyword) and node.arg == "allow_pickle":
                if not (isinstance(node.value, ast.Constant) and node.value.value is False):
                    found.append(f"{path.relative_to(ROOT)}")
    assert not found, found


def test_upload_goes_through_the_one_design_reader():
    """The page's upload handler hands the bytes to floatcalc.design.load_design (tomllib only)."""
    tree = ast.parse((ROOT / "floatcalc" / "design" / "read.py").read_text(encoding="utf-8"))
    loads = [n for n in ast.walk(tree) if isinstance(n, ast.Call) and isinstance(n.func, ast.Attribute)
             and n.func.attr in {"loads", "load"}]
    assert loads and all(ast.unparse(n.func.value) == "tomllib" for n in loads)
    tree = ast.parse(MAIN.read_text(encoding="utf-8"))
    fn = next(n for n in ast.walk(tree) if isinstance(n, ast.FunctionDef) and n.name == "read_upload")
    calls = {ast.unparse(n.func) for n in ast.walk(fn) if isinstance(n, ast.Call)}
    assert "load_design" in calls and not {c for c in calls if "toml" in c}


def test_upload_size_limit_is_the_same_number_everywhere():
    """Label, page check and .streamlit/config.toml all say the reader's MAX_BYTES (1 MB)."""
    cfg = tomllib.loads((ROOT / ".streamlit" / "config.toml").read_text(encoding="utf-8"))
    assert cfg["server"]["maxUploadSize"] == MAX_BYTES / 1e6 == 1  # Streamlit's limit, in MB
    tree = ast.parse(MAIN.read_text(encoding="utf-8"))
    up = [n for n in ast.walk(tree) if isinstance(n, ast.Call) and ast.unparse(n.func) == "st.file_uploader"]
    assert len(up) == 1
    assert {k.arg: ast.literal_eval(k.value) for k in up[0].keywords if k.arg == "type"}["type"] == ["toml"]
    label = ast.unparse(up[0].args[0])
    assert "mb:g} MB" in label and "mb = MAX_BYTES / 1e6" in MAIN.read_text(encoding="utf-8")
    with pytest.raises(InputError, match="at most 1000 kB"):
        _handler()(b"#" * (MAX_BYTES + 1))


# ------------------------------------------------------------------------------------------------
# The upload handler on hostile bytes

def _handler():
    """The page's upload handler (AppTest has no file-upload element)."""
    return read_upload


def _refused(data) -> str:
    with pytest.raises(InputError) as exc:
        _handler()(data)
    msg = str(exc.value)
    assert msg.strip() and "Traceback" not in msg
    return msg


def _one_line(msg: str) -> None:
    assert "\n" not in msg and "\r" not in msg, repr(msg)
    assert msg.startswith("design") and ": " in msg


class _Trap:
    """Loading this pickle would create a file: the proof that something ran."""

    def __init__(self, path):
        self.path = path

    def __reduce__(self):
        return (open, (self.path, "w"))


def test_pickle_payload_is_refused_and_not_run(tmp_path):
    marker = tmp_path / "pwned"
    payload = pickle.dumps(_Trap(str(marker)), protocol=4)
    for data in (payload, pickle.dumps(_Trap(str(marker)), protocol=0)):
        _one_line(_refused(data))
    assert not marker.exists()


def test_oversize_upload_is_refused_with_a_clear_message():
    data = b"schema_version = 2\n" + b"#" * (MAX_BYTES + 10)
    msg = _refused(data)
    _one_line(msg)
    assert f"at most {MAX_BYTES // 1000} kB" in msg


@pytest.mark.parametrize("data", [b"\x00\xff\xfe\x01" * 100, b"\x89PNG\r\n\x1a\n" + bytes(range(256)),
                                  b"PK\x03\x04" + b"\x00" * 50, "schema_version = 1\n\ufeff\x00".encode()],
                         ids=["binary", "png", "zip", "nul"])
def test_binary_uploads_are_refused_in_one_line(data):
    _one_line(_refused(data))


@settings(max_examples=200, deadline=None)
@given(st.binary(max_size=2000))
def test_random_bytes_give_one_clear_error_or_a_design(data):
    try:
        _handler()(data)
    except InputError as exc:
        msg = str(exc)
        lines = msg.split("\n")
        assert msg.startswith("design") and len(lines) <= 21, msg
        assert all(": " in ln for ln in lines)


def test_toml_bomb_of_many_keys_device_design_is_bounded():
    body = "schema_version = 2\n" + "".join(f"k{i} = {i}\n" for i in range(5000))  # ~60 kB
    msg = _refused(body.encode())
    lines = msg.split("\n")
    assert len(lines) <= 21, f"{len(lines)} lines"  # head plus at most 20 listed problems
    assert lines[0].startswith("design: ") and "problems" in lines[0]
    assert all(": " in ln for ln in lines)


def test_toml_bomb_of_nested_arrays_and_dotted_keys():
    for body in ("x = " + "[" * 20000 + "]" * 20000, ".".join(["a"] * 20000) + " = 1"):
        _one_line(_refused(body.encode()))


# ------------------------------------------------------------------------------------------------
# User text on the page is plain text, never Markdown or HTML

HOSTILE = ["**fake verdict**", "![x](http://example.invalid/a.png)", "<img src=x onerror=alert(1)>",
           "[click](javascript:alert(1))", "$x^2$ # heading"]


@pytest.mark.parametrize("s", HOSTILE)
def test_escape_makes_markdown_plain(s):
    from floatcalc.page.widgets import esc

    out = esc(s)
    # every Markdown/HTML control character is escaped: none stands unescaped
    for i, ch in enumerate(out):
        if ch in "*_[]()!<>#$`":
            assert i > 0 and out[i - 1] == "\\", (s, out)


@pytest.mark.slow
def test_hostile_description_and_names_render_as_plain_text():
    """A description and an element name with Markdown or an image link show as typed, in a
    plain-text element, and no Markdown element carries them unescaped."""
    from streamlit.testing.v1 import AppTest

    from floatcalc.design import example

    d = example("classroom")
    data = json.loads(json.dumps(d.data))
    data["description"] = "**fake verdict** ![x](http://example.invalid/a.png)"
    data["elements"][0]["name"] = "**sinks** <b>x</b>"
    at = AppTest.from_file(str(APP), default_timeout=180)
    at.session_state["data"] = data
    at.session_state["ver"] = 1
    at.session_state["compare"] = []
    at.session_state["good"] = None
    at.run()
    assert not at.exception, [e.value for e in at.exception]
    assert any(t.value == data["description"] for t in at.text)
    rendered = [m.value for m in [*at.markdown, *at.caption, *at.success, *at.warning, *at.error, *at.info]]
    rendered += [e.label for e in at.expander]  # expander labels render Markdown too
    for t in at.table:  # st.table renders Markdown in its cells
        rendered += [str(v) for col in t.value.columns for v in t.value[col]]
    assert any("\\*\\*sinks\\*\\*" in v for v in rendered)  # the name is there, escaped
    for v in rendered:
        assert "**fake verdict**" not in v and "](http://example.invalid" not in v, v
        assert "**sinks**" not in v and "<b>" not in v, v


def test_a_long_solve_is_cut_by_the_time_budget_and_cached_when_done():
    """The page waits at most its budget for a solve; the solve goes on and is cached."""
    import threading
    import time

    from floatcalc.page import solver

    gate = threading.Event()

    def slow():
        gate.wait(10)
        return "done"

    key = f"test-budget-{time.monotonic()}"
    with pytest.raises(solver.SolveTimeout):
        solver.run(key, slow, budget=0.05)
    assert solver.pending(key)
    gate.set()
    assert solver.run(key, slow, budget=10) == "done"
    assert solver.cached(key) == "done" and not solver.pending(key)
