"""The alloy table against the published galvanic series and G102 equivalent weights.

Source ``astm_g82`` (data/sources.csv): ASTM G82, Fig. 1 — galvanic series in
flowing seawater, potentials in V vs SCE, printed to two decimals, so each check
has a tolerance of ±0.005 V. Source ``astm_g102``: ASTM G102 equivalent weights
as printed in its worked rates (four significant figures: ±0.005 g/mol).
"""

import pytest

from noblegap.materials import data
from noblegap.materials import alloys as materials

TOL_V = 0.005   # two printed decimals

# (alloy ids in data/alloys.csv, most noble, least noble) — ASTM G82 Fig. 1
ASTM_G82_FIG1 = [
    (["graphite"], 0.30, 0.20),
    (["platinum"], 0.26, 0.18),
    (["N10276"], 0.09, -0.03),                       # Ni-Cr-Mo alloy C-276
    (["titanium"], 0.06, -0.04),
    (["S31600", "S31700"], 0.00, -0.10),             # stainless 316/317 passive
    (["N04400", "N05500"], -0.03, -0.14),            # Ni-Cu alloy 400 / K-500
    (["S30200", "S30400", "S32100", "S34700"], -0.04, -0.10),  # 302/304/321/347 passive
    (["silver"], -0.10, -0.15),
    (["nickel"], -0.10, -0.20),                      # nickel 200
    (["N06600"], -0.13, -0.18),                      # Ni-Cr alloy 600 passive
    (["C95800"], -0.14, -0.22),                      # nickel-aluminium bronze
    (["C71500"], -0.17, -0.24),                      # 70-30 copper-nickel
    (["lead"], -0.19, -0.25),
    (["S43000"], -0.20, -0.28),                      # stainless 430 passive
    (["C71000"], -0.21, -0.27),                      # 80-20 copper-nickel
    (["C70600"], -0.22, -0.28),                      # 90-10 copper-nickel
    (["S41000", "S41600"], -0.23, -0.35),            # stainless 410/416 passive
    (["tin_bronze"], -0.24, -0.32),
    (["C65500"], -0.25, -0.29),                      # silicon bronze
    (["manganese_bronze"], -0.26, -0.34),
    (["C44300", "C68700"], -0.26, -0.36),            # admiralty brass, aluminium brass
    (["lead_tin_solder"], -0.27, -0.36),             # 50/50 lead-tin solder
    (["copper"], -0.30, -0.37),
    (["tin"], -0.30, -0.33),
    (["C46400", "C27000", "C23000"], -0.31, -0.40),  # naval, yellow, red brass
    (["aluminium_bronze"], -0.31, -0.40),
    (["S31600_active", "S31700_active"], -0.33, -0.46),   # stainless 316/317 active
    (["austenitic_cast_iron"], -0.43, -0.54),
    (["S30200_active", "S30400_active"], -0.44, -0.58),   # stainless 302/304 active
    (["S41000_active", "S41600_active", "S43000_active"], -0.45, -0.57),  # 410/416/430 active
    (["low_alloy_steel"], -0.57, -0.63),
    (["carbon_steel", "cast_iron"], -0.60, -0.72),   # mild steel, cast iron
    (["cadmium"], -0.70, -0.74),
    (["aluminium", "A95083", "A96061"], -0.76, -1.00),  # aluminium alloys
    (["zinc"], -0.98, -1.03),
    (["magnesium"], -1.60, -1.63),
]


def _cases():
    for ids, noble, active in ASTM_G82_FIG1:
        for alloy_id in ids:
            yield pytest.param(alloy_id, noble, active, id=alloy_id)


@pytest.mark.parametrize("alloy_id, noble, active", _cases())
def test_astm_g82_fig1_flowing_seawater_range_V_SCE(alloy_id, noble, active):
    # ASTM G82, Fig. 1 (source astm_g82)
    row = materials.alloy(alloy_id)
    assert row["source_id"] == "astm_g82"
    assert row["E_noble_V_SCE"] == pytest.approx(noble, abs=TOL_V)
    assert row["E_active_V_SCE"] == pytest.approx(active, abs=TOL_V)
    assert materials.potential_range(alloy_id, "seawater_flowing") == pytest.approx(
        (noble, active), abs=TOL_V)


def test_astm_g82_fig1_every_entry_is_in_the_table():
    # ASTM G82, Fig. 1 (source astm_g82): all 36 entries of the series are represented
    assert len(ASTM_G82_FIG1) == 36
    ids = {r["id"] for r in data.table("alloys")}
    for entry_ids, _, _ in ASTM_G82_FIG1:
        assert set(entry_ids) <= ids


def test_astm_g82_zinc_minus_0_98_to_minus_1_03_V_SCE():
    # ASTM G82, Fig. 1 (source astm_g82): zinc −0.98 to −1.03 V vs SCE
    assert materials.potential_range("zinc", "seawater_flowing") == pytest.approx(
        (-0.98, -1.03), abs=TOL_V)


def test_astm_g82_316_passive_0_00_to_minus_0_10_V_SCE():
    # ASTM G82, Fig. 1 (source astm_g82): stainless 316 passive 0.00 to −0.10 V vs SCE
    assert materials.potential_range("S31600", "seawater_flowing") == pytest.approx(
        (0.00, -0.10), abs=TOL_V)


def test_astm_g82_titanium_plus_0_06_to_minus_0_04_V_SCE():
    # ASTM G82, Fig. 1 (source astm_g82): titanium +0.06 to −0.04 V vs SCE
    assert materials.potential_range("titanium", "seawater_flowing") == pytest.approx(
        (0.06, -0.04), abs=TOL_V)


@pytest.mark.parametrize("alloy_id, ew", [
    # ASTM G102 (source astm_g102), EW values printed in the worked rates: iron 27.92,
    # zinc 32.69, aluminium 8.99, copper 31.77 g/mol
    ("carbon_steel", 27.92), ("zinc", 32.69), ("aluminium", 8.99), ("copper", 31.77),
])
def test_astm_g102_equivalent_weight_pure_metals(alloy_id, ew):
    # ASTM G102 (source astm_g102)
    row = materials.alloy(alloy_id)
    assert row["equivalent_weight_g_mol"] == pytest.approx(ew, abs=0.005)
    assert row["ew_source_id"] == "astm_g102"
