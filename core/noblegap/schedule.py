"""A joint schedule: many checks from one CSV table, one row a joint.

Interface layer, beside :mod:`noblegap.api`: the command line
(``python -m noblegap schedule joints.csv -o results.csv``) and the page
``schedule.html`` (through the engine worker) both use it.

The table, as a person writes it in a spreadsheet:

* the first line names the columns; a ``calculator`` column says which check
  a row is (``fastener``, ``holiday``, ... — any calculator of
  :func:`noblegap.api.describe`); a file without one can be given a default;
* an ``id`` column (also ``ref`` or ``tag``) is carried through untouched;
* every other column is an input of the calculator, named by its key
  (``plate_area``) or its label as the page shows it (``Plate area``), with
  the value as a person types it (``3/8 in``, ``1.2 m * 0.8 m``, ``316L``);
  an empty cell means the calculator's default;
* comma, semicolon or tab separated, UTF-8 (a spreadsheet's byte-order mark
  is fine); blank lines and lines starting with ``#`` are skipped.

Every row is run through :func:`noblegap.api.run` on its own: a bad row gets
its errors in its own result and never stops the others. The results table
is the input table with the result columns appended (:data:`RESULT_COLUMNS`).

Three steps, so the page can show progress and cancel between chunks:
:func:`parse` (text → rows, or a file-level error), :func:`run_rows`
(rows → results) and :func:`to_csv` (results → text). :func:`handle` is the
JSON-text entry the browser worker calls.

>>> table = "id,calculator,metal_a,metal_b\\nJ1,couple,Zn,Cu\\nJ2,couple,Zn,Unobtainium\\n"
>>> parsed = parse(table)
>>> [r["id"] for r in parsed["rows"]]
['J1', 'J2']
>>> results = run_rows(parsed["rows"])
>>> [r["status"] for r in results]
['computed', 'error']
>>> summary(results)["exit_status"]
1
"""

from __future__ import annotations

import csv
import io
import json
import math

from . import api
from .errors import NoblegapError
from .verdicts import label as verdict_label

#: Limits of one table: well above a real schedule, below what would stall a
#: tablet (a row takes a few milliseconds).
MAX_BYTES = 2_000_000
MAX_ROWS = 5000

CALC_COLUMNS = ("calculator", "calc", "check")
ID_COLUMNS = ("id", "ref", "reference", "tag", "joint")
DELIMITERS = ",;\t"

#: Output keys a calculator may return at the top level of its result, shown
#: as headline numbers when present: (result key, column header).
NUMBERS = (
    ("delta_E_V_min", "dV_min_V"),
    ("delta_E_V_max", "dV_max_V"),
    ("delta_E_V", "dV_V"),
    ("delta_V_low", "dV_low_V"),
    ("delta_V_likely", "dV_likely_V"),
    ("delta_V_high", "dV_high_V"),
    ("area_ratio", "area_ratio"),
    ("local_mm_per_yr_low", "rate_low_mm_per_yr"),
    ("local_mm_per_yr", "rate_mm_per_yr"),
    ("local_mm_per_yr_high", "rate_high_mm_per_yr"),
    ("average_mm_per_yr", "member_average_mm_per_yr"),
    ("governing_limit", "governing_limit"),
    ("years_to_allowance", "years_to_allowance"),
    ("years_to_perforation", "years_to_perforation"),
)

#: The columns appended to the user's table, in order.
RESULT_COLUMNS = (("line", "result_line"), ("status", "result_status"),
                  ("verdict", "result_verdict"), ("headline", "result_headline"),
                  ("weakest_source", "result_weakest_source")) + tuple(
    (key, f"result_{col}") for key, col in NUMBERS) + (
    ("errors", "result_errors"), ("warnings", "result_warnings"))

STATUS_OK, STATUS_ERROR = "computed", "error"


class ScheduleFileError(ValueError):
    """The table as a whole cannot be read (not a row's problem)."""

    def __init__(self, message, allowed=""):
        super().__init__(message)
        self.message = message
        self.allowed = allowed

    def to_dict(self):
        return {"type": "ScheduleFileError", "kind": "file", "message": self.message,
                "allowed": self.allowed, "field": None, "value": None}


def _fold(text):
    return " ".join(str(text).replace("_", " ").split()).casefold()


def _column_map(calc):
    """``{folded header: field key}`` for one calculator's inputs (key and label)."""
    out = {}
    for f in calc.fields:
        out[_fold(f.key)] = f.key
        out[_fold(f.label)] = f.key
    return out


def _sniff(text):
    first = next((ln for ln in text.splitlines() if ln.strip() and not ln.lstrip().startswith("#")), "")
    counts = {d: first.count(d) for d in DELIMITERS}
    best = max(counts, key=counts.get)
    return best if counts[best] else ","


def parse(text, default_calc=None):
    """Read a schedule table.

    Parameters
    ----------
    text : str
        The CSV text.
    default_calc : str, optional
        The calculator of rows whose table has no calculator column, or whose
        cell is empty.

    Returns
    -------
    dict
        ``{"ok": True, "columns": [headers], "rows": [row], "delimiter"}``
        where each row is ``{"line", "id", "calc", "cells": {header: text}}``;
        or ``{"ok": False, "error": {...}}`` when the file as a whole cannot
        be read (empty, too large, no header, no calculator named anywhere).
    """
    try:
        return _parse(text, default_calc)
    except ScheduleFileError as exc:
        return {"ok": False, "error": exc.to_dict()}


def _parse(text, default_calc):
    if not isinstance(text, str):
        raise ScheduleFileError("The schedule is not text.", "a CSV file in UTF-8")
    if len(text) > MAX_BYTES:
        raise ScheduleFileError(
            f"The schedule is too large ({len(text):,} characters).",
            f"at most {MAX_BYTES:,} characters and {MAX_ROWS} rows; split it into parts")
    text = text.lstrip("\ufeff")
    if "\x00" in text:
        raise ScheduleFileError("The file holds binary data, not a CSV table.",
                                "a CSV file (comma, semicolon or tab separated) in UTF-8")
    if not text.strip():
        raise ScheduleFileError("The schedule is empty.",
                                "a header line naming the columns, then one line a joint")
    delimiter = _sniff(text)
    reader = csv.reader(io.StringIO(text), delimiter=delimiter)
    header = None
    rows = []
    try:
        for record in reader:
            line = reader.line_num
            if not any(c.strip() for c in record) or record[0].lstrip().startswith("#"):
                continue
            if header is None:
                header = [c.strip() for c in record]
                _check_header(header)
                continue
            if len(rows) >= MAX_ROWS:
                raise ScheduleFileError(f"The schedule has more than {MAX_ROWS} rows.",
                                        f"at most {MAX_ROWS} rows; split it into parts")
            rows.append((line, record))
    except csv.Error as exc:
        raise ScheduleFileError(f"The CSV cannot be read near line {reader.line_num}: {exc}.",
                                "a CSV table; quote a cell that holds the separator") from None
    if header is None:
        raise ScheduleFileError("The schedule has no header line.",
                                "a first line naming the columns, e.g. id,calculator,fastener,plate")
    folded = [_fold(h) for h in header]
    calc_col = next((i for i, h in enumerate(folded) if h in CALC_COLUMNS), None)
    id_col = next((i for i, h in enumerate(folded) if h in ID_COLUMNS), None)
    if calc_col is None and not default_calc:
        names = ", ".join(api.calculators())
        raise ScheduleFileError(
            "The schedule has no calculator column, so no row says which check it is.",
            f"a column named 'calculator' holding one of {names} (or give a default calculator)")
    out = []
    for line, record in rows:
        cells = {}
        extra = []
        for i, value in enumerate(record):
            if i < len(header):
                cells[header[i]] = value.strip()
            elif value.strip():
                extra.append(value.strip())
        for h in header:
            cells.setdefault(h, "")
        calc = cells.get(header[calc_col], "") if calc_col is not None else ""
        row = {"line": line, "id": cells.get(header[id_col], "") if id_col is not None else "",
               "calc": calc or (default_calc or ""), "cells": cells}
        if extra:
            row["extra"] = extra
        out.append(row)
    if not out:
        raise ScheduleFileError("The schedule has a header but no joints.",
                                "one line a joint under the header line")
    return {"ok": True, "columns": header, "rows": out, "delimiter": delimiter,
            "calc_column": header[calc_col] if calc_col is not None else None,
            "id_column": header[id_col] if id_col is not None else None}


def _check_header(header):
    seen = {}
    for h in header:
        if not h:
            continue
        f = _fold(h)
        if f in seen:
            raise ScheduleFileError(f"The column {h!r} appears twice in the header.",
                                    "each column name once")
        seen[f] = h


def _row_inputs(row, calc):
    """The calculator's raw inputs from a row's cells; problems as error dicts."""
    cmap = _column_map(calc)
    inputs, errors, used = {}, [], {}
    for header, value in row["cells"].items():
        f = _fold(header)
        if f in CALC_COLUMNS or f in ID_COLUMNS or not header:
            continue
        key = cmap.get(f)
        if key is None:
            if value:
                errors.append({"field": header, "value": value, "type": "ColumnError",
                               "message": f"The column {header!r} is not an input of the "
                                          f"{calc.name} check, but this row fills it.",
                               "allowed": ", ".join(fl.key for fl in calc.fields)})
            continue
        if key in used and value:
            errors.append({"field": key, "value": value, "type": "ColumnError",
                           "message": f"The columns {used[key]!r} and {header!r} both give "
                                      f"{key}.", "allowed": "one column an input"})
            continue
        if value:
            used[key] = header
            inputs[key] = value
    if row.get("extra"):
        errors.append({"field": None, "value": ", ".join(row["extra"]), "type": "ColumnError",
                       "message": "This row has more cells than the header has columns.",
                       "allowed": "one cell a column; quote a cell that holds the separator"})
    return inputs, errors


def _flatten_error(err):
    subs = err.get("errors") or [err]
    return [{k: s.get(k) for k in ("field", "value", "message", "allowed")} for s in subs]


def _finite(x):
    return isinstance(x, (int, float)) and not isinstance(x, bool) and math.isfinite(x)


def run_row(row, *, page=False):
    """Run one parsed row; never raises. Returns the row's result dict.

    A row takes the calculator's compute-only path (``api.run(...,
    headline_only=True)``): the page's numbers, headline, weakest source, verdict
    and warnings without alternatives, mitigations and charts. ``page=True`` runs
    the whole page instead (the same row result; tests compare the two).
    """
    out = {"line": row.get("line"), "id": row.get("id", ""), "calc": row.get("calc", ""),
           "cells": row.get("cells", {}), "status": STATUS_ERROR, "verdict": "",
           "verdict_class": "", "headline": "", "weakest_source": "", "numbers": {},
           "errors": [], "warnings": [], "inputs": {}}
    name = out["calc"]
    if not name:
        out["errors"] = [{"field": "calculator", "value": "", "message":
                          "The calculator cell is empty: the row does not say which check it is.",
                          "allowed": ", ".join(api.calculators())}]
        return out
    try:
        calc = api.get(name)
    except NoblegapError as exc:
        out["errors"] = _flatten_error(exc.to_dict())
        return out
    inputs, errors = _row_inputs(row, calc)
    result = api.run(name, inputs, headline_only=not page)
    out["inputs"] = result.get("inputs", inputs)
    if not result.get("ok"):
        out["errors"] = errors + _flatten_error(result["error"])
        return out
    if errors:
        out["errors"] = errors
        return out
    res = result["result"]
    disp = res.get("display") or {}
    out["status"] = STATUS_OK
    out["headline"] = disp.get("headline", "")
    out["weakest_source"] = (disp.get("headline_confidence") or {}).get("line", "")
    v = disp.get("verdict")
    if v and v.get("class"):
        out["verdict_class"] = v["class"]
        out["verdict"] = verdict_label(v["class"])
    out["numbers"] = {key: res[key] for key, _ in NUMBERS if _finite(res.get(key))}
    out["warnings"] = list(disp.get("warnings", []))
    return out


def run_rows(rows):
    """Run every row (see :func:`run_row`); one bad row never stops the others."""
    return [run_row(r) for r in rows]


def summary(results):
    """Counts and the command line's exit status (0 all computed, 1 some errors)."""
    bad = sum(1 for r in results if r["status"] != STATUS_OK)
    counts = {}
    for r in results:
        if r["verdict_class"]:
            counts[r["verdict_class"]] = counts.get(r["verdict_class"], 0) + 1
    return {"rows": len(results), "computed": len(results) - bad, "errors": bad,
            "verdicts": counts, "exit_status": 1 if bad else 0}


def _safe_cell(text):
    """Keep a spreadsheet from reading a cell as a formula (=, @, +word, -word)."""
    s = "" if text is None else str(text)
    if s[:1] in ("=", "@", "\t", "\r") or (s[:1] in "+-" and len(s) > 1
                                           and not (s[1].isdigit() or s[1] == ".")):
        return "'" + s
    return s


def _number_text(x):
    return f"{x:.6g}"


def _error_text(errors):
    parts = []
    for e in errors:
        field = f"{e['field']}: " if e.get("field") else ""
        allowed = f" Allowed: {e['allowed']}." if e.get("allowed") and "Allowed:" not in (
            e.get("message") or "") else ""
        parts.append(f"{field}{e.get('message', '')}{allowed}")
    return " | ".join(parts)


def to_csv(results, columns=None):
    """The results table: the user's columns as typed, then :data:`RESULT_COLUMNS`.

    ``columns`` is the input header (from :func:`parse`); without it the
    union of the rows' cells, in order of first appearance.
    """
    if columns is None:
        columns = []
        for r in results:
            columns += [c for c in r.get("cells", {}) if c not in columns]
    buf = io.StringIO()
    w = csv.writer(buf, lineterminator="\r\n")
    w.writerow([_safe_cell(c) for c in columns] + [col for _, col in RESULT_COLUMNS])
    for r in results:
        cells = r.get("cells", {})
        extra = {"line": r.get("line", ""), "status": r["status"], "verdict": r["verdict"],
                 "headline": r["headline"], "weakest_source": r.get("weakest_source", ""),
                 "errors": _error_text(r["errors"]),
                 "warnings": " | ".join(r["warnings"])}
        for key, _ in NUMBERS:
            x = r["numbers"].get(key)
            extra[key] = "" if x is None else _number_text(x)
        w.writerow([_safe_cell(cells.get(c, "")) for c in columns] +
                   [_safe_cell(extra[key]) for key, _ in RESULT_COLUMNS])
    return buf.getvalue()


def run_text(text, default_calc=None):
    """Parse and run a whole table: ``{"ok", "columns", "results", "summary", "csv"}``."""
    parsed = parse(text, default_calc)
    if not parsed["ok"]:
        return parsed
    results = run_rows(parsed["rows"])
    return {"ok": True, "columns": parsed["columns"], "results": results,
            "summary": summary(results), "csv": to_csv(results, parsed["columns"])}


def handle(request_json):
    """JSON text in, JSON text out: the browser worker's entry.

    ``{"op": "parse", "text", "default_calc"?}``, ``{"op": "run", "rows"}``,
    ``{"op": "csv", "results", "columns"}`` or ``{"op": "summary", "results"}``.
    """
    try:
        req = json.loads(request_json)
        op = req.get("op")
        if op == "parse":
            out = parse(req.get("text", ""), req.get("default_calc"))
        elif op == "run":
            out = {"ok": True, "results": run_rows(req.get("rows", []))}
        elif op == "csv":
            out = {"ok": True, "csv": to_csv(req.get("results", []), req.get("columns"))}
        elif op == "summary":
            out = {"ok": True, "summary": summary(req.get("results", []))}
        else:
            out = {"ok": False, "error": {"type": "UsageError", "message":
                                          f"Unknown schedule operation {op!r}.",
                                          "allowed": "parse, run, csv, summary"}}
    except (ValueError, TypeError, KeyError, AttributeError) as exc:
        out = {"ok": False, "error": {"type": "UsageError", "message":
                                      f"The schedule request is malformed ({type(exc).__name__})."}}
    return json.dumps(out, allow_nan=False, ensure_ascii=False)


# ---------------------------------------------------------------- command line

def add_arguments(parser):
    """The ``schedule`` subcommand's arguments (``python -m noblegap schedule``)."""
    parser.add_argument("table", help="the joint schedule, a CSV file (one row a joint)")
    parser.add_argument("-o", "--output", help="write the results CSV here (default: stdout)")
    parser.add_argument("--calculator", default=None,
                        help="the check of rows whose table has no calculator column")
    parser.add_argument("--json", action="store_true",
                        help="print every row's result as JSON instead of CSV")


def read_table(path):
    """The text of a schedule file, or a ScheduleFileError saying why not.

    UTF-8 (with or without a byte-order mark); a file that is not UTF-8 but
    reads as Windows-1252 (what older spreadsheets save) is accepted with a
    note.
    """
    try:
        with open(path, "rb") as fh:
            data = fh.read(MAX_BYTES * 4 + 1)
    except OSError as exc:
        raise ScheduleFileError(f"The schedule {path!r} cannot be read ({exc.strerror or exc}).",
                                "the path of a readable CSV file") from None
    if b"\x00" in data:
        raise ScheduleFileError(f"{path!r} holds binary data, not a CSV table.",
                                "a CSV file (comma, semicolon or tab separated) in UTF-8")
    try:
        return data.decode("utf-8-sig"), None
    except UnicodeDecodeError:
        try:
            return data.decode("cp1252"), "the file is not UTF-8; it was read as Windows-1252"
        except UnicodeDecodeError:
            raise ScheduleFileError(f"{path!r} is not UTF-8 text.",
                                    "a CSV file saved as UTF-8") from None


def command(args, stdout=None, stderr=None):
    """Run the ``schedule`` subcommand; returns the exit status.

    0 when every row computed, 1 when some rows carry errors (their results
    are still written), 2 when the file cannot be read as a schedule.
    """
    import sys

    stdout = stdout or sys.stdout
    stderr = stderr or sys.stderr
    try:
        text, note = read_table(args.table)
    except ScheduleFileError as exc:
        print(f"error: {exc.message} Allowed: {exc.allowed}.", file=stderr)
        return 2
    if note:
        print(f"note: {note}", file=stderr)
    out = run_text(text, args.calculator)
    if not out["ok"]:
        err = out["error"]
        print(f"error: {err['message']} Allowed: {err['allowed']}.", file=stderr)
        return 2
    body = (json.dumps({"summary": out["summary"], "results": out["results"]}, indent=1,
                       ensure_ascii=False) + "\n") if args.json else out["csv"]
    if args.output:
        try:
            with open(args.output, "w", encoding="utf-8", newline="") as fh:
                fh.write(body)
        except OSError as exc:
            print(f"error: cannot write {args.output!r} ({exc.strerror or exc}).", file=stderr)
            return 2
    else:
        stdout.write(body)
    s = out["summary"]
    verdicts = ", ".join(f"{verdict_label(k)} {v}" for k, v in sorted(s["verdicts"].items()))
    print(f"{s['rows']} rows: {s['computed']} computed, {s['errors']} with errors"
          + (f" ({verdicts})" if verdicts else ""), file=stderr)
    for r in out["results"]:
        if r["errors"]:
            print(f"  line {r['line']} {r['id'] or ''}: {_error_text(r['errors'])}", file=stderr)
    return s["exit_status"]
