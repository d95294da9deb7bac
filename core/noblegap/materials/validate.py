"""Integrity checks of the tables in ``data/``.

:func:`validate_all` checks every table; :func:`validate_tables` a chosen few
(the materials module checks its own tables on first use). A broken table
raises :class:`~noblegap.errors.DataError` naming the file, row and column.

Checks: unique ids; every ``*source_id`` resolves in ``sources.csv``; every
``*confidence`` is one of :data:`noblegap.data.CONFIDENCE`; a column whose
cells are all numbers carries a unit in its name; physical ranges (a potential
between −3.1 and +1.9 V, a density between 0.5 and 23 g/cm³, the noble end of
a range not below its active end); row counts pinned in :data:`EXPECTED_ROWS`,
so that adding or removing a row is a deliberate edit of this file too.
"""

from __future__ import annotations

from . import data
from ..errors import DataError

# Row counts, pinned: change them together with the table.
EXPECTED_ROWS = {
    "alloys": 55,
    "environments": 7,
    "half_reactions": 24,
    "reference_electrodes": 7,
    "electrolytes": 4,
    "atmospheres": 6,
    "cell_kinetics": 23,
}

# (column ending, low, high, what) — the physically sensible range of a value.
RANGES = (
    ("_V_SHE", -3.1, 1.9, "a potential"),
    ("_V_SCE", -3.1, 1.9, "a potential"),
    ("_V", -3.1, 1.9, "a potential"),
    ("_g_cm3", 0.5, 23.0, "a density"),
    ("_g_mol", 0.5, 300.0, "a molar or equivalent mass"),
    ("_fraction", 0.0, 1.0, "a fraction"),
    ("_degC", -273.15, 1000.0, "a temperature"),
    ("_A_m2", 0.0, 1.0e5, "a current density"),
    ("_mA_m2", 0.0, 1.0e8, "a current density"),
    ("_S_m", 0.0, 100.0, "a conductivity"),
    ("_psu", 0.0, 42.0, "a practical salinity"),
    ("_mm", 0.0, 1.0e5, "a length"),
    ("_m", 0.0, 1.0e5, "a length"),
)

# Column pairs (noble end, active end) where the first must not be below the second.
ORDERED = (("E_noble_V_SCE", "E_active_V_SCE"), ("T_max_degC", "T_min_degC"))

# Text columns that must hold one of a few words.
ENUMS = {
    ("alloys", "state"): ("passive", "active", "n/a"),
    ("alloys", "fastener_use"): ("yes", "no"),
    ("environments", "kind"): ("immersion", "atmospheric"),
    ("environments", "series_shift"): ("none", "approximate", "not-applicable"),
}


def _is_number(text):
    try:
        float(text)
    except ValueError:
        return False
    return True


def _raw_rows(name):
    """Header and raw string cells, to check columns data.py reads as text."""
    import csv
    import io
    text = data._data_dir().joinpath(f"{name}.csv").read_text(encoding="utf-8")
    reader = csv.reader(io.StringIO(text))
    header = next(reader)
    return header, [c for c in reader if c and any(x.strip() for x in c)]


# A bare ``_V`` column is a potential only when its name says so; other tables
# hold voltages that are not electrode potentials (e.g. a test-voltage constant).
POTENTIAL_WORDS = ("cross_check", "delta", "anodic_index", "potential")


def _is_potential(column):
    return column.startswith("E") or any(w in column for w in POTENTIAL_WORDS)


def _range_for(column):
    for end, lo, hi, what in RANGES:
        if end == "_V" and column.endswith("_V") and not _is_potential(column):
            continue
        if column.endswith(end):
            return lo, hi, what
    return None


def validate_table(name, sources=None):
    """Check one table; raise DataError naming file, row and column."""
    filename = f"{name}.csv"
    rows = data.table(name)
    if sources is None:
        sources = data.sources()
    header, raw = _raw_rows(name)
    # A column of numbers must say its unit.
    for j, column in enumerate(header):
        cells = [c[j].strip() for c in raw if j < len(c)]
        filled = [c for c in cells if c]
        if (filled and all(_is_number(c) for c in filled) and not data._is_numeric(column)
                and column not in ("id", "edition")):
            raise DataError("column of numbers without a unit in its name (add a unit "
                            "suffix such as _V or _mm, see data.UNIT_SUFFIXES)",
                            file=filename, row=1, column=column)
    if "id" in header:
        seen = {}
        for r in rows:
            if not r["id"]:
                raise DataError("empty id", file=filename, row=r["_row"], column="id")
            if r["id"] in seen:
                raise DataError(f"duplicate id {r['id']!r} (first in row {seen[r['id']]})",
                                file=filename, row=r["_row"], column="id")
            seen[r["id"]] = r["_row"]
    if name == "sources":
        return
    for r in rows:
        for column in header:
            value = r.get(column)
            if column.endswith("source_id"):
                if column == "source_id" and not value:
                    raise DataError("every row must name its source", file=filename,
                                    row=r["_row"], column=column)
                if value and value not in sources:
                    raise DataError(f"source_id {value!r} is not in sources.csv",
                                    file=filename, row=r["_row"], column=column)
            elif column.endswith("confidence"):
                if column == "confidence" and not value:
                    raise DataError("every row must state its confidence", file=filename,
                                    row=r["_row"], column=column)
                if value and value not in data.CONFIDENCE:
                    raise DataError(f"confidence {value!r} is not one of "
                                    f"{', '.join(data.CONFIDENCE)}", file=filename,
                                    row=r["_row"], column=column)
            elif (name, column) in ENUMS:
                if value not in ENUMS[(name, column)]:
                    raise DataError(f"{value!r} is not one of "
                                    f"{', '.join(ENUMS[(name, column)])}", file=filename,
                                    row=r["_row"], column=column)
            elif isinstance(value, (int, float)) and not isinstance(value, bool):
                rng = _range_for(column)
                if rng and not rng[0] <= value <= rng[1]:
                    raise DataError(f"{value:g} is outside the range for {rng[2]} "
                                    f"({rng[0]:g} to {rng[1]:g})", file=filename,
                                    row=r["_row"], column=column)
        for hi, lo in ORDERED:
            if r.get(hi) is not None and r.get(lo) is not None and r[hi] < r[lo]:
                raise DataError(f"{hi} = {r[hi]:g} is below {lo} = {r[lo]:g}",
                                file=filename, row=r["_row"], column=hi)
    expected = EXPECTED_ROWS.get(name)
    if expected is not None and len(rows) != expected:
        raise DataError(f"has {len(rows)} rows, validate.EXPECTED_ROWS pins {expected}: "
                        "update the pin together with the table", file=filename)


def validate_tables(names):
    """Check the named tables (and the bibliography they cite)."""
    validate_table("sources")
    srcs = data.sources()
    for name in names:
        validate_table(name, srcs)


def table_names():
    """Names of every ``*.csv`` table in the data folder."""
    return sorted(p.name[:-4] for p in data._data_dir().iterdir() if p.name.endswith(".csv"))


def validate_all():
    """Check every table in ``data/``; return None or raise DataError."""
    validate_tables([n for n in table_names() if n != "sources"])
