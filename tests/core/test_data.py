"""validate.py and the data tables: integrity, pinned row counts, clear errors."""

import shutil

import pytest

from noblegap.materials import data
from noblegap.materials import alloys as materials
from noblegap.materials import validate
from noblegap.errors import DataError

DATA_DIR = data._data_dir()


def test_every_table_validates():
    validate.validate_all()


def test_row_counts_are_pinned():
    # Regression pin: a row added or removed must be a deliberate edit of EXPECTED_ROWS.
    for name, n in validate.EXPECTED_ROWS.items():
        assert len(data.table(name)) == n, name


def test_every_source_id_column_resolves():
    srcs = data.sources()
    for name in ("alloys", "environments", "half_reactions", "reference_electrodes"):
        for row in data.table(name):
            for col, val in row.items():
                if col.endswith("source_id") and val:
                    assert val in srcs, (name, row["id"], col)


def test_physical_ranges_of_alloys():
    for row in data.table("alloys"):
        assert -3.1 <= row["E_active_V_SCE"] <= row["E_noble_V_SCE"] <= 1.9
        assert 0.5 <= row["density_g_cm3"] <= 23
        ew = row["equivalent_weight_g_mol"]
        assert ew is None or 5 < ew < 200


def test_ids_are_unique_and_required_alloys_present():
    ids = [r["id"] for r in data.table("alloys")]
    assert len(ids) == len(set(ids)) and len(ids) >= 35
    for needed in ("zinc", "magnesium", "carbon_steel", "cast_iron", "copper", "titanium",
                   "graphite", "platinum", "silver", "nickel", "lead", "tin", "cadmium",
                   "aluminium", "A95083", "A96061", "S30400", "S31600", "S41000", "C70600",
                   "C71500", "C95800", "C65500", "N04400", "N06625", "R50400",
                   "galvanized_steel", "low_alloy_steel", "S31600_active", "S30400_active"):
        assert needed in ids, needed


def test_no_trade_names_in_alloy_table():
    text = DATA_DIR.joinpath("alloys.csv").read_text(encoding="utf-8").lower()
    for brand in ("monel", "inconel", "hastelloy", "ni-resist", "incoloy"):
        assert brand not in text, brand


def test_environments_table():
    ids = [r["id"] for r in data.table("environments")]
    assert ids == ["seawater_flowing", "seawater_quiescent", "marine_splash",
                   "atmosphere_harsh", "atmosphere_normal", "indoor_controlled",
                   "freshwater"]
    for row in data.table("environments"):
        assert 0 < row["allowed_delta_V"] <= 0.5
        assert row["i_limit_A_m2"] > 0
        if row["kind"] == "atmospheric":
            assert row["band_width_mm"] > 0


@pytest.fixture
def broken_dir(tmp_path, monkeypatch):
    """A copy of data/ in a temporary folder, with the caches cleared around it."""
    for p in DATA_DIR.iterdir():
        if p.name.endswith(".csv"):
            shutil.copy(str(p), tmp_path / p.name)
    monkeypatch.setattr(data, "_data_dir", lambda: tmp_path)
    monkeypatch.setattr(materials, "_validated", False)
    data.table.cache_clear()
    data.index.cache_clear()
    yield tmp_path
    data.table.cache_clear()
    data.index.cache_clear()


def _edit(path, row_no, column, value):
    import csv
    import io
    rows = list(csv.reader(io.StringIO(path.read_text(encoding="utf-8"))))
    j = rows[0].index(column)
    rows[row_no - 1][j] = value
    out = io.StringIO()
    csv.writer(out, lineterminator="\n").writerows(rows)
    path.write_text(out.getvalue(), encoding="utf-8")


def test_broken_potential_names_file_row_and_column(broken_dir):
    _edit(broken_dir / "alloys.csv", 5, "E_noble_V_SCE", "7.5")
    with pytest.raises(DataError, match=r"file alloys\.csv, row 5, column E_noble_V_SCE"):
        validate.validate_all()


def test_unknown_source_id_is_caught(broken_dir):
    _edit(broken_dir / "environments.csv", 3, "allowed_source_id", "no_such_source")
    with pytest.raises(DataError, match=r"environments\.csv, row 3, column allowed_source_id"):
        validate.validate_all()


def test_noble_end_below_active_end_is_caught(broken_dir):
    _edit(broken_dir / "alloys.csv", 2, "E_active_V_SCE", "0.9")
    with pytest.raises(DataError, match=r"alloys\.csv, row 2, column E_noble_V_SCE"):
        validate.validate_all()


def test_bad_confidence_and_density_are_caught(broken_dir):
    _edit(broken_dir / "alloys.csv", 4, "confidence", "certain")
    with pytest.raises(DataError, match=r"row 4, column confidence"):
        validate.validate_tables(["alloys"])
    _edit(broken_dir / "alloys.csv", 4, "confidence", "published")
    data.table.cache_clear()
    _edit(broken_dir / "alloys.csv", 6, "density_g_cm3", "40")
    with pytest.raises(DataError, match=r"row 6, column density_g_cm3"):
        validate.validate_tables(["alloys"])


def test_duplicate_id_and_pinned_count(broken_dir):
    path = broken_dir / "environments.csv"
    lines = path.read_text(encoding="utf-8").splitlines()
    path.write_text("\n".join(lines + [lines[1].replace("seawater_flowing", "spare", 1)])
                    + "\n", encoding="utf-8")
    with pytest.raises(DataError, match=r"environments\.csv.*EXPECTED_ROWS"):
        validate.validate_tables(["environments"])
    path.write_text("\n".join(lines + [lines[1]]) + "\n", encoding="utf-8")
    data.table.cache_clear()
    with pytest.raises(DataError, match=r"row 9, column id: duplicate id"):
        validate.validate_tables(["environments"])


def test_numbers_without_a_unit_are_caught(broken_dir):
    path = broken_dir / "environments.csv"
    lines = path.read_text(encoding="utf-8").splitlines()
    lines = [lines[0] + ",depth"] + [ln + ",3" for ln in lines[1:]]
    path.write_text("\n".join(lines) + "\n", encoding="utf-8")
    with pytest.raises(DataError, match=r"column depth"):
        validate.validate_tables(["environments"])


def test_materials_validates_lazily_on_first_use(broken_dir):
    _edit(broken_dir / "alloys.csv", 7, "source_id", "")
    with pytest.raises(DataError, match=r"alloys\.csv, row 7, column source_id"):
        materials.alloy_choices()


def test_blank_confidence_beside_a_value_is_caught(broken_dir):
    # A density with its confidence cell emptied.
    _edit(broken_dir / "alloys.csv", 3, "density_confidence", "")
    with pytest.raises(DataError, match=r"alloys\.csv, row 3, column density_confidence.*"
                                        r"|row 3, column density_confidence"):
        validate.validate_tables(["alloys"])


def test_value_without_a_source_is_caught(broken_dir):
    _edit(broken_dir / "half_reactions.csv", 7, "dEdT_source_id", "")
    with pytest.raises(DataError, match=r"row 7, column dEdT_source_id"):
        validate.validate_tables(["half_reactions"])


def test_unknown_source_beside_a_value_is_caught(broken_dir):
    _edit(broken_dir / "reference_electrodes.csv", 3, "dEdT_source_id", "no_such_book")
    with pytest.raises(DataError, match=r"row 3, column dEdT_source_id"):
        validate.validate_tables(["reference_electrodes"])


def test_missing_locator_is_caught(broken_dir):
    # Row 4 (sce) cites refel_temp_table for its coefficient; empty both the row's
    # locator and the source's locator hint.
    _edit(broken_dir / "reference_electrodes.csv", 4, "dEdT_locator", "")
    srcs = broken_dir / "sources.csv"
    import csv
    import io
    rows = list(csv.reader(io.StringIO(srcs.read_text(encoding="utf-8"))))
    n = next(i for i, r in enumerate(rows) if r and r[0] == "refel_temp_table") + 1
    _edit(srcs, n, "locator_hint", "n/a")
    with pytest.raises(DataError, match=r"without a locator"):
        validate.validate_tables(["reference_electrodes"])


def test_source_without_edition_is_caught(broken_dir):
    _edit(broken_dir / "sources.csv", 2, "edition", "")
    with pytest.raises(DataError, match=r"sources\.csv, row 2, column edition"):
        validate.validate_all()


def test_no_blank_confidence_anywhere_beside_a_value():
    # Every filled value in data/ has a confidence, a known source and a locator;
    # validate_all enforces it, and here every confidence is one of the four words.
    validate.validate_all()
    for name, cols in validate.VALUE_SOURCES.items():
        header = data.table(name)[0].keys()
        for row in data.table(name):
            for col, prefix in cols.items():
                if row.get(col) is not None:
                    conf = row.get(f"{prefix}confidence") if f"{prefix}confidence" in header \
                        else row.get("confidence")
                    assert conf in data.CONFIDENCE, (name, row.get("id"), col)


def _from_memory_values():
    out = []
    for name, cols in validate.VALUE_SOURCES.items():
        rows = data.table(name)
        header = rows[0].keys()
        for row in rows:
            for col, prefix in cols.items():
                if row.get(col) is None:
                    continue
                conf = (row.get(f"{prefix}confidence") if f"{prefix}confidence" in header
                        else row.get("confidence"))
                if conf == "from-memory":
                    out.append((name, row.get("id") or row.get("alloy_id"), col))
    return out


def test_from_memory_values_do_not_grow():
    # Regression pin (issue 15): values recalled but not confirmed may only go down.
    # 2026-12-03: 181 confidence cells before sourcing; the ceiling below is the
    # count of individual values still marked from memory after it. Issue 12's
    # sacrificial anode added 7 it could not confirm (3 utilisation factors in
    # anode_shapes.csv, 4 protection potentials in protection_potentials.csv).
    assert len(_from_memory_values()) <= 118 + 7
