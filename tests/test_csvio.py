"""Unit-headed CSV tables: comments, unit conversion, bad rows reported by line number."""

from __future__ import annotations

import io

import numpy as np
import pytest

from floatcalc.errors import InputError
from floatcalc.studies.csvio import read_table, to_text, write_table

REQ = {"depth": "length", "force": "force"}


def test_units_and_comments():
    # 1 mm = 1e-3 m and 1 mN = 1e-3 N by SI definition; 1 in = 25.4 mm exactly (1959 agreement).
    text = "# invented\n\n# another comment\nForce [mN], depth [in]\n2.5,1\n3.5,0.5\n"
    t = read_table(io.StringIO(text), REQ)
    assert np.allclose(t.columns["depth"], [0.0254, 0.0127], rtol=1e-15)
    assert np.allclose(t.columns["force"], [2.5e-3, 3.5e-3], rtol=1e-15)
    assert t.comments == ("invented", "another comment")
    assert list(t.lines) == [5, 6]


def test_bad_rows_listed_by_line_number_in_one_error():
    text = "# c\ndepth [mm],force [mN]\n0.1,1\nabc,2\n0.3\n\n0.4,inf\n0.5,5\n"
    with pytest.raises(InputError) as exc:
        read_table(io.StringIO(text), REQ)
    msg = str(exc.value)
    assert "\n" not in msg
    assert "3 bad row(s)" in msg
    for line in ("line 4", "line 5", "line 7"):
        assert line in msg
    assert "line 3" not in msg and "line 8" not in msg


def test_skip_bad_rows_reports_warnings():
    text = "depth [mm],force [mN]\n0.1,1\nx,2\n0.3,3\n"
    t = read_table(io.StringIO(text), REQ, skip_bad_rows=True)
    assert t.columns["depth"].size == 2
    assert len(t.warnings) == 1 and "line 3" in t.warnings[0]


@pytest.mark.parametrize("text, needle", [
    ("depth,force\n1,2\n", "unit in brackets"),
    ("depth [kg],force [mN]\n1,2\n", "must be a length"),
    ("depth [mm],push [mN]\n1,2\n", "needs a column 'force"),
    ("depth [mm],force [blorp]\n1,2\n", "unknown unit"),
    ("# only comments\n", "header"),
    ("depth [mm],force [mN]\n", "at least 1 good"),
])
def test_header_errors(text, needle):
    with pytest.raises(InputError) as exc:
        read_table(io.StringIO(text), REQ)
    assert needle in str(exc.value)


def test_write_then_read_round_trip(tmp_path):
    p = tmp_path / "t.csv"
    write_table(p, [("depth", "mm", [0.1, 0.25]), ("force", "mN", [1.0, 2.0])], comments=["made here"])
    t = read_table(p, REQ)
    assert np.allclose(t.columns["depth"], [1e-4, 2.5e-4])
    assert t.comments == ("made here",)
    assert to_text([("x", "m", [1.0])]).splitlines() == ["x [m]", "1"]


def test_cli_fit_reports_bad_rows(tmp_path, capsys):
    from floatcalc.cli import main

    p = tmp_path / "bad.csv"
    p.write_text("# invented\ndepth [mm],force [mN]\n0.1,0.2\n0.2,oops\n0.3,0.5\n0.4,0.6\n0.5,0.7\n")
    code = main(["fit", "--data", str(p), "--radius", "0.25mm", "--length", "60mm"])
    err = capsys.readouterr().err
    assert code == 2
    assert len(err.strip().splitlines()) == 1 and "line 4" in err


def test_every_bad_row_is_named_even_when_many():
    text = "depth [mm],force [mN]\n" + "".join("x,1\n" for _ in range(30)) + "0.1,1\n"
    with pytest.raises(InputError) as exc:
        read_table(io.StringIO(text), REQ)
    msg = str(exc.value)
    assert "30 bad row(s)" in msg and "\n" not in msg
    for line in range(2, 32):
        assert f"{line}" in msg
    assert "line 32" not in msg and ", 32" not in msg


# --- dialects: semicolons, decimal commas, tabs; ambiguous files refused with a hint ---------------

def test_semicolon_and_decimal_comma_file_is_read(tmp_path):
    # A spreadsheet export in a decimal-comma locale: ';' between columns, ',' for decimals,
    # BOM and CRLF. Same numbers as the plain file (1 mm = 1e-3 m, 1 mN = 1e-3 N).
    p = tmp_path / "rig.csv"
    p.write_bytes("\ufeff# invented\r\ndepth [mm];force [mN]\r\n0,1;1,5\r\n0,25;2\r\n-0,5;-1,25e-1\r\n"
                  .encode("utf-8"))
    t = read_table(p, REQ)
    assert t.delimiter == ";" and t.decimal == ","
    assert t.columns["depth"].tolist() == pytest.approx([1e-4, 2.5e-4, -5e-4])
    assert t.columns["force"].tolist() == pytest.approx([1.5e-3, 2e-3, -1.25e-4])
    # semicolons with decimal points are fine too, and tabs
    t = read_table(io.StringIO("depth [mm];force [mN]\n0.1;1.5\n"), REQ)
    assert t.decimal == "." and t.columns["force"].tolist() == pytest.approx([1.5e-3])
    t = read_table(io.StringIO("depth [mm]\tforce [mN]\n0,1\t1,5\n"), REQ)
    assert t.delimiter == "\t" and t.columns["depth"].tolist() == pytest.approx([1e-4])


@pytest.mark.parametrize("text, needle", [
    # decimal marks mixed: '1.5' could be a thousands separator in a decimal-comma file
    ("depth [mm];force [mN]\n0,1;1.5\n", "decimal marks"),
    ("depth [mm];force [mN]\n1.234,5;2\n", "thousands separator"),
    # header mixing both separators
    ("depth [mm];force [mN],note [s]\n1;2,3\n", "mixes ';' and ','"),
    # decimal commas in a comma-separated file: rows split into too many fields
    ("depth [mm],force [mN]\n0,1,1,5\n0,2,2,5\n", "decimal commas in a comma-separated file"),
])
def test_ambiguous_dialect_is_refused_with_a_one_line_hint(text, needle):
    with pytest.raises(InputError) as exc:
        read_table(io.StringIO(text), REQ)
    msg = str(exc.value)
    assert needle in msg and "\n" not in msg


def test_optional_text_and_unknown_columns():
    text = "depth [mm],force [mN],force uncertainty [uN],Direction\n0.1,1,10,push\n0.2,2,20, Pull \n"
    t = read_table(io.StringIO(text), REQ, optional={"force uncertainty": "force"}, text_columns=("direction",),
                   allow_extra=False)
    assert t.columns["force uncertainty"].tolist() == pytest.approx([1e-5, 2e-5])
    assert t.text["direction"] == ["push", "pull"]
    with pytest.raises(InputError) as exc:
        read_table(io.StringIO("depth [mm],force [mN],temperature [degC]\n0.1,1,20\n"), REQ,
                   optional={"force uncertainty": "force"}, allow_extra=False)
    assert "column 'temperature [degC]' is not used here" in str(exc.value)
    # by default (other callers, e.g. sweep output) extra columns are still ignored
    assert read_table(io.StringIO("depth [mm],force [mN],x [s]\n0.1,1,2\n"), REQ).columns.keys() == {"depth", "force"}


def test_fit_reads_the_uncertainty_column_and_refuses_unknown_columns(tmp_path):
    # The issue: a third column 'force uncertainty [N]' used to be ignored silently. Now it
    # weights the fit (same result as passing the same values to the API), and other columns
    # are refused by name.
    import math

    from floatcalc.studies.fit import fit, fit_csv, force_depth_law

    geo = {"radius": "0.25 mm", "length": "60 mm"}
    law = force_depth_law("rod", geo)
    D = np.linspace(0.1e-3, 3e-3, 20)
    u = np.linspace(0.01e-3, 0.05e-3, 20)
    F = law(D, math.radians(120), 0.0728)[0] + np.random.default_rng(2).normal(0, 1, 20) * u
    p = tmp_path / "rig.csv"
    p.write_text("depth [m],force [N],force uncertainty [N]\n" + "".join(
        f"{d:.17g},{f:.17g},{e:.17g}\n" for d, f, e in zip(D, F, u)))
    a = fit_csv("rod", p, geometry=geo)
    b = fit("rod", D, F, geometry=geo, force_uncertainty=u)
    assert a.contact_angle.magnitude == pytest.approx(b.contact_angle.magnitude, rel=1e-12)
    assert a.force_uncertainty_known and a.error_model.startswith("per row")
    p.write_text("depth [m],force [N],note [s]\n0.1,1,2\n")
    with pytest.raises(InputError, match="column 'note"):
        fit_csv("rod", p, geometry=geo)
