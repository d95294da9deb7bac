"""The joint schedule: CSV in, one result a row, errors kept in their row; the CLI's exit codes."""

import csv
import io
import json
import os
import subprocess
import sys
from pathlib import Path

import pytest

from noblegap import api, schedule

ROOT = Path(__file__).resolve().parents[2]
CORE = str(ROOT / "core")
TEMPLATE = ROOT / "data" / "examples" / "boatyard_joints.csv"


def _cli(*args, cwd=None):
    env = dict(os.environ, PYTHONPATH=CORE)
    return subprocess.run([sys.executable, "-m", "noblegap", "schedule", *args],
                          capture_output=True, text=True, env=env, timeout=120, cwd=cwd)


def _rows(csv_text):
    return list(csv.DictReader(io.StringIO(csv_text)))


def test_template_rows_all_compute_and_match_the_single_check():
    out = schedule.run_text(TEMPLATE.read_text(encoding="utf-8"))
    assert out["ok"]
    assert out["summary"]["errors"] == 0 and out["summary"]["rows"] >= 5
    first = out["results"][0]
    # The schedule runs the same engine as the page: same inputs, same numbers.
    single = api.run(first["calc"], first["inputs"])
    assert first["numbers"]["local_mm_per_yr"] == single["result"]["local_mm_per_yr"]
    assert first["verdict_class"] == single["result"]["display"]["verdict"]["class"]


def test_bad_rows_keep_their_errors_and_never_stop_the_others():
    text = ("id,calculator,metal_a,metal_b\n"
            "A,couple,Zn,Cu\n"
            "B,couple,Zn,Unobtainium\n"
            "C,no_such_check,Zn,Cu\n"
            "D,couple,Zn,Cu,surplus\n"
            "E,,Zn,Cu\n"
            "F,couple,Mg,Au\n")
    out = schedule.run_text(text)
    status = {r["id"]: r["status"] for r in out["results"]}
    assert status == {"A": "computed", "B": "error", "C": "error", "D": "error", "E": "error",
                      "F": "computed"}
    by_id = {r["id"]: r for r in out["results"]}
    assert by_id["B"]["errors"][0]["field"] == "metal_b"
    assert "Unobtainium" in by_id["B"]["errors"][0]["message"]
    assert "couple" in by_id["C"]["errors"][0]["message"]  # did-you-mean
    assert "more cells than the header" in by_id["D"]["errors"][0]["message"]
    assert "calculator cell is empty" in by_id["E"]["errors"][0]["message"]
    assert out["summary"]["exit_status"] == 1
    rows = _rows(out["csv"])
    assert [r["id"] for r in rows] == list("ABCDEF")
    assert rows[1]["result_status"] == "error" and "metal_b" in rows[1]["result_errors"]
    assert rows[0]["result_errors"] == ""


def test_columns_by_label_and_semicolons_and_bom():
    calc = api.get("couple")
    labels = [f.label for f in calc.fields]
    text = "\ufeffRef;Calculator;" + ";".join(labels) + "\nJ-1;couple;Zn;Cu\n"
    out = schedule.run_text(text)
    assert out["results"][0]["status"] == "computed", out["results"][0]["errors"]
    assert out["results"][0]["id"] == "J-1"


def test_a_column_of_another_calculator_filled_is_an_error_in_that_row_only():
    text = "id,calculator,metal_a,metal_b,diameter\nA,couple,Zn,Cu,10 mm\nB,couple,Zn,Cu,\n"
    out = schedule.run_text(text)
    a, b = out["results"]
    assert a["status"] == "error" and a["errors"][0]["field"] == "diameter"
    assert "not an input of the couple check" in a["errors"][0]["message"]
    assert b["status"] == "computed"


@pytest.mark.parametrize("text, message", [
    ("", "empty"),
    ("# only a comment\n\n", "no header"),
    ("id,calculator\n", "no joints"),
    ("id,fastener,plate\nA,316,5083\n", "no calculator column"),
    ("id,id,calculator\nA,B,couple\n", "appears twice"),
    ("a\x00b", "binary"),
])
def test_unreadable_tables_say_why(text, message):
    out = schedule.parse(text)
    assert out["ok"] is False
    assert message in out["error"]["message"]
    assert out["error"]["allowed"]


def test_default_calculator_for_a_table_without_the_column():
    out = schedule.run_text("id,metal_a,metal_b\nA,Zn,Cu\n", default_calc="couple")
    assert out["results"][0]["status"] == "computed"


def test_too_many_rows_is_a_file_error():
    text = "id,calculator,metal_a,metal_b\n" + "x,couple,Zn,Cu\n" * (schedule.MAX_ROWS + 1)
    out = schedule.parse(text)
    assert not out["ok"] and "more than" in out["error"]["message"]


def test_spreadsheet_formulas_are_neutralised_in_the_results():
    out = schedule.run_text('id,calculator,metal_a,metal_b\n"=HYPERLINK(1)",couple,Zn,Cu\n-3,couple,Zn,Cu\n')
    rows = _rows(out["csv"])
    assert rows[0]["id"] == "'=HYPERLINK(1)"
    assert rows[1]["id"] == "-3"  # a negative number stays a number


def test_handle_is_json_text_both_ways():
    parsed = json.loads(schedule.handle(json.dumps({"op": "parse", "text": "id,calculator,metal_a,metal_b\nA,couple,Zn,Cu\n"})))
    assert parsed["ok"] and parsed["rows"][0]["calc"] == "couple"
    ran = json.loads(schedule.handle(json.dumps({"op": "run", "rows": parsed["rows"]})))
    assert ran["results"][0]["status"] == "computed"
    text = json.loads(schedule.handle(json.dumps({"op": "csv", "results": ran["results"],
                                                  "columns": parsed["columns"]})))["csv"]
    assert _rows(text)[0]["result_status"] == "computed"
    bad = json.loads(schedule.handle("{not json"))
    assert bad["ok"] is False and "malformed" in bad["error"]["message"]
    unknown = json.loads(schedule.handle(json.dumps({"op": "explode"})))
    assert unknown["ok"] is False and "explode" in unknown["error"]["message"]


def test_cli_exit_0_all_computed(tmp_path):
    out = tmp_path / "results.csv"
    p = _cli(str(TEMPLATE), "-o", str(out))
    assert p.returncode == 0, p.stderr
    rows = _rows(out.read_text(encoding="utf-8"))
    assert rows[0]["id"] == "HER-01 deck cleat"
    assert all(r["result_status"] == "computed" for r in rows)
    assert "computed, 0 with errors" in p.stderr


def test_cli_exit_1_some_rows_with_errors(tmp_path):
    src = tmp_path / "joints.csv"
    src.write_text("id,calculator,metal_a,metal_b\nA,couple,Zn,Cu\nB,couple,Zn,Kryptonite\n",
                   encoding="utf-8")
    p = _cli(str(src))
    assert p.returncode == 1
    rows = _rows(p.stdout)
    assert [r["result_status"] for r in rows] == ["computed", "error"]
    assert "line 3 B" in p.stderr and "Traceback" not in p.stderr


@pytest.mark.parametrize("content", [None, b"\x00\x01\x02binary", b"", b"\xff\xfe\x00a"])
def test_cli_exit_2_unreadable_file(tmp_path, content):
    src = tmp_path / "joints.csv"
    if content is not None:
        src.write_bytes(content)
    p = _cli(str(src))
    assert p.returncode == 2
    assert p.stderr.startswith("error: ") and "Allowed:" in p.stderr
    assert "Traceback" not in p.stderr


def test_cli_reads_windows_1252_with_a_note(tmp_path):
    src = tmp_path / "joints.csv"
    src.write_bytes("id,calculator,metal_a,metal_b\nJoint n°1,couple,Zn,Cu\n".encode("cp1252"))
    p = _cli(str(src), "--json")
    assert p.returncode == 0
    assert "Windows-1252" in p.stderr
    assert json.loads(p.stdout)["results"][0]["id"] == "Joint n°1"


def test_doctests():
    import doctest
    assert doctest.testmod(schedule).failed == 0


def test_parse_memo_gives_the_same_values_and_never_remembers_an_error():
    from noblegap.errors import InputErrors
    calc = api.get("fastener")
    first = calc.parse({"diameter": "3/8 in"})
    again = calc.parse({"diameter": "3/8 in"})
    assert first == again
    for _ in range(2):
        with pytest.raises(InputErrors, match="a mass, not a length"):
            calc.parse({"diameter": "3 kg"})


#: Rows of each galvanic calculator for the compute-only path: several alloys,
#: immersion and atmospheres, each anode role, holidays on each side.
HEADLINE_ROWS = (
    ("fastener", {}),
    ("fastener", {"fastener": "carbon steel", "plate": "316", "environment": "seawater_flowing",
                  "count": "40", "plate_area": "1.375 m²"}),
    ("fastener", {"fastener": "galvanized steel", "plate": "C95800",
                  "environment": "freshwater"}),
    ("fastener", {"fastener": "5083", "plate": "6061", "environment": "C3",
                  "diameter": "3/8 in", "allowance": "0.5 mm"}),
    ("fastener", {"fastener": "316", "plate": "316", "environment": "C5"}),
    ("joint", {}),
    ("joint", {"first": "carbon steel", "second": "C95800", "environment": "seawater_quiescent",
               "first_area": "50 m²", "second_area": "0.2 m²", "distance": "50 mm"}),
    ("joint", {"first": "6061", "second": "carbon steel", "environment": "CX",
               "resistivity": "2 ohm*m"}),
    ("holiday", {}),
    ("holiday", {"coated_side": "cathode", "coated": "nickel-aluminium bronze",
                 "other": "carbon steel", "environment": "seawater_flowing"}),
    ("holiday", {"coated_side": "both", "environment": "C4"}),
    ("holiday", {"coated_side": "none", "holiday_count": "", "holiday_diameter": "",
                 "inspected_area": "", "coating_category": "none"}),
    ("holiday", {"holiday_count": "0"}),
)


@pytest.mark.parametrize("calc, change", HEADLINE_ROWS)
def test_compute_only_rows_give_the_pages_headline(calc, change):
    """A schedule row (compute-only path) carries exactly the page's verdict,
    headline, weakest source, warnings and numbers."""
    inputs = {**api.get(calc).example, **change}
    row = {"line": 2, "id": "J", "calc": calc, "cells": inputs}
    fast, page = schedule.run_row(row), schedule.run_row(row, page=True)
    assert fast["status"] == page["status"] == schedule.STATUS_OK, fast["errors"]
    assert fast == page
    assert fast["weakest_source"].startswith("Weakest source behind this result")
    # and the numbers are the page's own
    full = api.run(calc, inputs)["result"]
    assert fast["numbers"] == {k: full[k] for k, _ in schedule.NUMBERS
                               if isinstance(full.get(k), float) or
                               isinstance(full.get(k), int)}
    assert fast["headline"] == full["display"]["headline"]
    assert fast["verdict_class"] == full["verdict_class"]


def test_compute_only_path_leaves_out_only_the_page_parts():
    ex = api.get("fastener").example
    fast = api.run("fastener", ex, headline_only=True)["result"]
    page = api.run("fastener", ex)["result"]
    assert page["alternatives"] and page["mitigations"] and page["display"]["charts"]
    assert fast["alternatives"] is None and fast["mitigations"] is None
    assert fast["display"]["charts"] == [] and fast["display"]["tables"] == []
    assert fast["display"]["headline_confidence"] == page["display"]["headline_confidence"]
    assert fast["display"]["warnings"] == page["display"]["warnings"]
