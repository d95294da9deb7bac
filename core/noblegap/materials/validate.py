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
    "alloy_designations": 47,
    "environments": 7,
    "half_reactions": 24,
    "reference_electrodes": 8,
    "debye_huckel": 4,
    "holiday_tests": 3,
    "electrolytes": 4,
    "atmospheres": 6,
    "cell_kinetics": 22,
    "anodes": 3,
    "anode_shapes": 3,
    "protection_potentials": 5,
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
    ("_ohm_m", 0.0, 1.0e7, "a resistivity"),
    ("_Ah_kg", 100.0, 3000.0, "an electrochemical capacity of an anode alloy"),
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
    ("reference_electrodes", "dEdT_kind"): ("isothermal", "thermal", ""),
}


# Every value column of every table and the prefix of the source columns that
# stand beside it: a filled value needs ``<prefix>source_id``, a confidence
# (``<prefix>confidence``, else the row's ``confidence``) and a locator
# (``<prefix>locator``, else the row's ``locator`` for the main group, else the
# source's ``locator_hint``). :func:`value_columns` adds any numeric column a
# table has but this map does not list, with the row's own source columns, so
# that no number escapes the count of values by confidence.
VALUE_SOURCES = {
    "alloys": {"E_noble_V_SCE": "", "E_active_V_SCE": "", "density_g_cm3": "density_",
               "equivalent_weight_g_mol": "ew_", "anodic_index_V": "ai_"},
    "environments": {"allowed_delta_V": "allowed_"},
    "half_reactions": {"n": "", "E0_V_SHE": "", "cross_check_V": "cross_check_",
                       "ion_molar_mass_g_mol": "", "dE0dT_mV_per_K": "dEdT_"},
    "reference_electrodes": {"E_V_SHE": "", "dEdT_mV_per_K": "dEdT_",
                             "dEdT_T_min_degC": "dEdT_", "dEdT_T_max_degC": "dEdT_",
                             "T_max_degC": "T_max_"},
    "coatings": {"a_fraction": "", "b_per_yr": ""},
    "holiday_tests": {"max_thickness_mm": "split_", "k_V": ""},
    "debye_huckel": {"T_degC": "", "A_sqrt_kg_per_mol": ""},
    "electrolytes": {"salinity_low_psu": "salinity_", "salinity_psu": "salinity_",
                     "salinity_high_psu": "salinity_",
                     "T_low_degC": "T_", "T_degC": "T_", "T_high_degC": "T_",
                     "kappa_low_S_m": "", "kappa_S_m": "", "kappa_high_S_m": "",
                     "i_L_low_A_m2": "iL_", "i_L_A_m2": "iL_", "i_L_high_A_m2": "iL_"},
    "atmospheres": {"tow_low_h_per_yr": "tow_", "tow_h_per_yr": "tow_",
                    "tow_high_h_per_yr": "tow_",
                    "film_low_mm": "film_", "film_mm": "film_", "film_high_mm": "film_",
                    "kappa_low_S_m": "film_", "kappa_S_m": "film_", "kappa_high_S_m": "film_",
                    "steel_low_um_per_yr": "steel_", "steel_high_um_per_yr": "steel_",
                    "zinc_low_um_per_yr": "zinc_", "zinc_high_um_per_yr": "zinc_",
                    "copper_low_um_per_yr": "", "copper_high_um_per_yr": "",
                    "aluminium_low_g_m2_per_yr": "", "aluminium_high_g_m2_per_yr": ""},
    "cell_kinetics": {"i_corr_low_A_m2": "", "i_corr_A_m2": "", "i_corr_high_A_m2": "",
                      "b_a_mV_per_decade": "ba_", "E_b_V_SCE": "eb_", "b_c_mV_per_decade": "",
                      "i0_H_A_m2": ""},
    "anodes": {"E_cc_V": "", "capacity_Ah_kg": "cap_", "density_g_cm3": "density_",
               "rho_min_ohm_m": "use_", "rho_max_ohm_m": "use_"},
    "anode_shapes": {"utilisation_fraction": ""},
    "protection_potentials": {"E_protect_V": "", "E_limit_V": "", "shift_V": ""},
}


def value_columns(name, header):
    """``{column: prefix}`` of every numeric value column of a table.

    The columns listed in :data:`VALUE_SOURCES`, then any other numeric column
    of the header (read as the row's own ``source_id`` and ``confidence``).
    """
    cols = dict(VALUE_SOURCES.get(name, {}))
    for column in header:
        if column not in cols and data._is_numeric(column):
            cols[column] = ""
    return cols


def value_confidences(name):
    """``[(row id, column, confidence)]`` of every filled value of a table."""
    rows = data.table(name)
    if not rows:
        return []
    header = [c for c in rows[0] if c != "_row"]
    out = []
    for column, prefix in value_columns(name, header).items():
        conf_col = f"{prefix}confidence" if f"{prefix}confidence" in header else "confidence"
        for r in rows:
            if r.get(column) is None:
                continue
            key = r.get("id") or r.get("alloy_id") or str(r["_row"])
            out.append((key, column, r.get(conf_col) or ""))
    return out


# Source kinds that need no locator (a rule of thumb; a value from memory).
NO_LOCATOR_KINDS = ("practice", "memory")


def _check_value_sources(name, header, rows, sources, filename):
    """Each filled value names a known source, a confidence and a locator."""
    for column, prefix in value_columns(name, header).items():
        if column not in header:
            raise DataError(f"value column {column} listed in validate.VALUE_SOURCES "
                            "is missing", file=filename)
        for r in rows:
            if r.get(column) is None:
                continue
            sid = r.get(f"{prefix}source_id") or ""
            if not sid:
                raise DataError(f"{column} has a value but {prefix}source_id is blank: "
                                "name the source", file=filename, row=r["_row"],
                                column=f"{prefix}source_id")
            if sid not in sources:
                raise DataError(f"source_id {sid!r} is not in sources.csv", file=filename,
                                row=r["_row"], column=f"{prefix}source_id")
            conf_col = f"{prefix}confidence" if f"{prefix}confidence" in header else "confidence"
            if not r.get(conf_col):
                raise DataError(f"{column} has a value but its confidence is blank "
                                f"(one of {', '.join(data.CONFIDENCE)})", file=filename,
                                row=r["_row"], column=conf_col)
            loc_col = f"{prefix}locator" if f"{prefix}locator" in header else (
                "locator" if not prefix and "locator" in header else None)
            locator = (r.get(loc_col) or "") if loc_col else ""
            hint = sources[sid].get("locator_hint") or ""
            if sources[sid].get("kind") in NO_LOCATOR_KINDS:
                continue
            if not locator.strip() and hint.strip() in ("", "n/a"):
                raise DataError(f"{column} cites {sid!r} without a locator (table, page or "
                                "address): fill the locator or the source's locator_hint",
                                file=filename, row=r["_row"], column=loc_col or column)


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
        for r in rows:
            for column in ("citation", "edition", "locator_hint", "kind"):
                if not (r.get(column) or "").strip():
                    raise DataError(f"every source needs a {column} ('n/a' where none "
                                    "applies)", file=filename, row=r["_row"], column=column)
        return
    _check_value_sources(name, header, rows, sources, filename)
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
        if name == "alloy_designations":
            validate_designations()


def validate_designations():
    """Every designation names one series row (or, if ambiguous, its choices) that exists."""
    filename = "alloy_designations.csv"
    alloys = {r["id"] for r in data.table("alloys")}
    for r in data.table("alloy_designations"):
        choices = [c for c in (r["choices"] or "").split(";") if c]
        if bool(r["series_id"]) == bool(choices):
            raise DataError("give either series_id or choices (an ambiguous name), not both "
                            "or neither", file=filename, row=r["_row"], column="series_id")
        for ref in ([r["series_id"]] if r["series_id"] else choices):
            if ref not in alloys:
                raise DataError(f"{ref!r} is not an id in alloys.csv", file=filename,
                                row=r["_row"], column="series_id" if r["series_id"] else
                                "choices")


def table_names():
    """Names of every ``*.csv`` table in the data folder."""
    return sorted(p.name[:-4] for p in data._data_dir().iterdir() if p.name.endswith(".csv"))


def validate_all():
    """Check every table in ``data/``; return None or raise DataError."""
    validate_tables([n for n in table_names() if n != "sources"])
