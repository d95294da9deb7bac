"""The sourced tables in ``data/``: loaded once, lazily, and validated.

Tables are UTF-8, comma-separated CSV files, one topic a file, the unit in each
numeric column's name (``E0_V_SHE``, ``density_g_cm3``). Every row names its
``source_id`` (resolved in ``sources.csv``), a ``locator`` and a
``confidence``. In an installed wheel the tables sit in ``noblegap/_data``; in
a source checkout they are read from the repository's ``data/`` folder.

A broken table raises :class:`~noblegap.errors.DataError` naming the file,
row and column.
"""

from __future__ import annotations

import csv
import io
import math
from functools import lru_cache
from importlib import resources
from pathlib import Path

from ..errors import ChoiceError, DataError, suggest

CONFIDENCE = ("published", "handbook-compiled", "common-practice", "from-memory")

# Column-name endings that mark a numeric column and the unit it is in.
UNIT_SUFFIXES = (
    "_V_SHE", "_V_SCE", "_V", "_mV_per_K", "_g_mol", "_g_cm3", "_A_m2", "_mA_m2",
    "_degC", "_mm", "_m", "_per_yr", "_mV_per_decade", "_fraction", "_kg_m3", "_mol_L",
    "_sqrt_kg_per_mol",
    "_S_m", "_psu", "_ohm_m", "_Ah_kg",
)
INTEGER_COLUMNS = ("n", "count", "rank")


def _data_dir():
    packaged = resources.files("noblegap").joinpath("_data")
    if packaged.is_dir():
        return packaged
    repo = Path(__file__).resolve().parents[3] / "data"
    return repo


def _is_numeric(column):
    return column in INTEGER_COLUMNS or column.endswith(UNIT_SUFFIXES)


@lru_cache(maxsize=None)
def table(name):
    """Return the rows of ``data/<name>.csv`` as a tuple of dicts.

    Numeric columns (by :data:`UNIT_SUFFIXES` or :data:`INTEGER_COLUMNS`) are
    converted to float (int for integer columns); empty cells become ``None``.

    Raises
    ------
    DataError
        Missing file, bad number, or a row whose cell count differs.
    """
    filename = f"{name}.csv"
    path = _data_dir().joinpath(filename)
    try:
        text = path.read_text(encoding="utf-8")
    except FileNotFoundError:
        raise DataError("table not found", file=filename) from None
    reader = csv.reader(io.StringIO(text))
    header = next(reader)
    rows = []
    for lineno, cells in enumerate(reader, start=2):
        if not cells or all(not c.strip() for c in cells):
            continue
        if len(cells) != len(header):
            raise DataError(f"has {len(cells)} cells, the header has {len(header)}",
                            file=filename, row=lineno)
        row = {}
        for column, cell in zip(header, cells):
            cell = cell.strip()
            if _is_numeric(column):
                if cell == "":
                    row[column] = None
                    continue
                try:
                    value = int(cell) if column in INTEGER_COLUMNS else float(cell)
                except ValueError:
                    raise DataError(f"{cell!r} is not a number", file=filename,
                                    row=lineno, column=column) from None
                if isinstance(value, float) and not math.isfinite(value):
                    raise DataError(f"{cell!r} is not finite", file=filename,
                                    row=lineno, column=column)
                row[column] = value
            else:
                row[column] = cell
        row["_row"] = lineno
        rows.append(row)
    return tuple(rows)


@lru_cache(maxsize=None)
def index(name, key="id"):
    """Return ``{row[key]: row}`` for a table; duplicate keys raise DataError."""
    out = {}
    for row in table(name):
        k = row[key]
        if k in out:
            raise DataError(f"duplicate {key} {k!r}", file=f"{name}.csv",
                            row=row["_row"], column=key)
        out[k] = row
    return out


def sources():
    """Return the bibliography, ``{source_id: row}``."""
    return index("sources")


def cite(row, prefix=""):
    """Return a citation dict for a data row: text, locator and confidence.

    ``prefix`` selects an alternative set of source columns in the same row,
    e.g. ``"dEdT_"`` for ``dEdT_source_id`` / ``dEdT_locator`` / ``dEdT_confidence``.
    """
    source_id = row.get(f"{prefix}source_id") or ""
    src = sources().get(source_id)
    if src is None:
        raise DataError(f"unknown source_id {source_id!r}", column=f"{prefix}source_id",
                        row=row.get("_row"))
    locator = row.get(f"{prefix}locator") or src.get("locator_hint", "")
    confidence = row.get(f"{prefix}confidence") or row.get("confidence") or ""
    text = src["citation"]
    if src.get("edition") and src["edition"] != "n/a":
        text += f", {src['edition']}"
    if locator and locator != "n/a":
        text += f"; {locator}"
    note = {
        "from-memory": " (from memory, not confirmed against a published source)",
        "common-practice": " (common practice, a rule of thumb)",
    }.get(confidence, "")
    return {"source_id": source_id, "text": text + note, "confidence": confidence}


def lookup(name, value, *, field, what, key="id"):
    """Return the row of table ``name`` whose ``key`` equals ``value``.

    Raises :class:`ChoiceError` with close matches when there is none.
    """
    rows = index(name, key)
    if value in rows:
        return rows[value]
    folded = {k.lower(): k for k in rows}
    if str(value).strip().lower() in folded:
        return rows[folded[str(value).strip().lower()]]
    raise ChoiceError(f"Unknown {what} {value!r}.", field=field, value=value,
                      allowed=", ".join(rows), suggestions=suggest(value, rows))
