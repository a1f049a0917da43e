"""A design file with several problems: the CLI lists every problem, one line each."""

from __future__ import annotations

from floatcalc.cli import main

BAD = """schema_version = 1
[body]
mass = "-1 g"
mas = 3
[[legs]]
kind = "rod"
radius = "-0.1 mm"
"""


def test_every_problem_on_its_own_line(tmp_path, capsys):
    f = tmp_path / "bad.toml"
    f.write_text(BAD, encoding="utf-8")
    before = f.read_bytes()
    code = main(["device", str(f)])
    err = capsys.readouterr().err
    lines = err.splitlines()
    assert code == 2
    assert all(ln.startswith("floatcalc: error: ") for ln in lines), err
    head = lines[0]
    n = int(head.split(":")[-1].split()[0])  # "...: N problems"
    assert len(lines) == n + 1 and n >= 4
    assert any("body.mas: unknown key (did you mean 'mass'?)" in ln for ln in lines)
    assert any(ln.endswith("legs[0].radius: must be positive, got -0.1 mm") for ln in lines)
    assert "\\n" not in err and "Traceback" not in err
    assert f.read_bytes() == before
