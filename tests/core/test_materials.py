"""materials.py: alloy lookup by id, UNS number or generic name; environments."""

import pytest

from noblegap.materials import data
from noblegap.materials import references as electrodes
from noblegap.materials import alloys as materials
from noblegap import schema
from noblegap.errors import ChoiceError, MissingDataError

ALLOY_IDS = [r["id"] for r in data.table("alloys")]


@pytest.mark.parametrize("text, expected", [
    ("S31600", "S31600"), ("s31600", "S31600"), ("UNS S31600", "S31600"),
    ("S316 00", "S31600"), ("316", "S31600"), ("316 stainless", "S31600"),
    ("Stainless steel 316", "S31600"), ("A4", "S31600"), ("a2", "S30400"),
    ("alloy 400", "N04400"), ("N04400", "N04400"), ("galvanised steel", "galvanized_steel"),
    ("HDG", "galvanized_steel"), ("aluminum 6061", "A96061"), ("Aluminium", "aluminium"),
    ("zinc", "zinc"), ("ZINC", "zinc"), ("90-10 copper-nickel", "C70600"),
    ("titanium grade 2", "R50400"), ("silicon bronze", "C65500"),
    ("nickel aluminium bronze", "C95800"), ("mild steel", "carbon_steel"),
    ("S31600_active", "S31600_active"), ("N06625", "N06625"), ("alloy 625", "N06625"),
])
def test_resolve(text, expected):
    assert materials.resolve_alloy(text, "alloy") == expected


def test_state_selects_the_other_row():
    assert materials.resolve_alloy("S31600", "a", state="active") == "S31600_active"
    assert materials.resolve_alloy("316", "a", state="active") == "S31600_active"
    assert materials.resolve_alloy("S31600_active", "a", state="passive") == "S31600"
    assert materials.resolve_alloy("S31600_active", "a") == "S31600_active"
    # a metal without a passive/active distinction ignores the state
    assert materials.resolve_alloy("copper", "a", state="active") == "copper"


def test_missing_state_row_is_missing_data():
    with pytest.raises(MissingDataError, match=r"no active-state range for Stainless steel 321"):
        materials.resolve_alloy("S32100", "alloy_a", state="active")


def test_unknown_alloy_did_you_mean():
    with pytest.raises(ChoiceError, match=r"Unknown alloy 'zink'.*Did you mean: zinc") as exc:
        materials.resolve_alloy("zink", "alloy_b")
    assert exc.value.field == "alloy_b"
    assert exc.value.to_dict()["suggestions"][0] == "zinc"


def test_ambiguous_alloy_lists_candidates():
    with pytest.raises(ChoiceError, match=r"matches several alloys") as exc:
        materials.resolve_alloy("stainless", "alloy_a")
    assert "S31600" in exc.value.suggestions and "S30400" in exc.value.suggestions
    assert not any(s.endswith("_active") for s in exc.value.suggestions)


def test_empty_alloy_is_an_error():
    with pytest.raises(ChoiceError, match="No alloy given"):
        materials.resolve_alloy("  ", "alloy_a")


def test_alloy_row_and_labels():
    assert materials.alloy("S31600")["uns"] == "S31600"
    assert materials.alloy("S31600_active")["uns"] == "S31600"
    labels = dict(materials.alloy_choices())
    assert labels["S31600"] == "Stainless steel 316 (S31600), passive"
    assert labels["S31600_active"] == "Stainless steel 316 (S31600), active"
    assert labels["zinc"] == "Zinc"
    assert [c for c, _ in materials.alloy_choices()] == ALLOY_IDS
    with pytest.raises(ChoiceError, match="Did you mean"):
        materials.alloy("S3160")


def test_alloy_table_attribute():
    assert materials.ALLOY_TABLE == data.table("alloys")


def test_fastener_alloys():
    f = materials.fastener_alloys()
    for a in ("S30400", "S31600", "S41000", "N04400", "C65500", "R50400", "N06625",
              "galvanized_steel", "carbon_steel", "low_alloy_steel", "A96061", "C95800"):
        assert a in f, a
    assert "S31600_active" not in f and "graphite" not in f


def test_environment_lookup_and_choices():
    assert materials.environment("SEAWATER_FLOWING")["kind"] == "immersion"
    with pytest.raises(ChoiceError, match=r"Unknown environment 'sea'") as exc:
        materials.environment("sea", field="env")
    assert exc.value.field == "env"
    ids = [i for i, _ in materials.environment_choices()]
    assert "atmosphere_harsh" in ids and len(ids) == 7


def test_allowed_delta_common_practice():
    # common practice (mil_std_889 guidance): harsh 0.15, normal 0.25, controlled 0.50 V
    assert materials.environment("atmosphere_harsh")["allowed_delta_V"] == 0.15
    assert materials.environment("atmosphere_normal")["allowed_delta_V"] == 0.25
    assert materials.environment("indoor_controlled")["allowed_delta_V"] == 0.50
    for env in ("seawater_flowing", "seawater_quiescent", "marine_splash"):
        assert materials.environment(env)["allowed_delta_V"] <= 0.15
        assert materials.environment(env)["allowed_confidence"] == "common-practice"


def test_applicability():
    assert materials.applicability("seawater_flowing") == []
    assert "approximation" in materials.applicability("atmosphere_harsh")[0]
    assert "does NOT apply" in materials.applicability("freshwater")[0]


def test_potential_range_on_other_scales():
    hi, lo = materials.potential_range("zinc", "seawater_flowing")
    assert (hi, lo) == (-0.98, -1.03)
    hi_she, lo_she = materials.potential_range("zinc", "seawater_flowing", "she")
    e_sce = electrodes.reference_potential("sce")[0]
    assert hi_she == pytest.approx(hi + e_sce) and lo_she == pytest.approx(lo + e_sce)
    hi_cse, _ = materials.potential_range("zinc", "seawater_flowing", "cse")
    assert hi_cse == pytest.approx(-0.98 + 0.2412 - 0.316)


def test_potential_range_missing_names_the_data(monkeypatch):
    row = dict(materials.alloy("zinc"), E_noble_V_SCE=None)
    monkeypatch.setattr(materials, "alloy", lambda alloy_id: row)
    with pytest.raises(MissingDataError, match=r"No galvanic-series potential range for Zinc"
                                               r".*alloy table"):
        materials.potential_range("zinc", "seawater_flowing")


def test_fields():
    f = materials.alloy_field("fastener", "Fastener", "316")
    assert f.kind == schema.CHOICE and f.widget == "combo"
    assert f.parse("alloy 400") == "N04400"
    with pytest.raises(ChoiceError, match="Did you mean"):
        f.parse("titanum")
    assert materials.alloy_field("x", "X", "", optional=True).parse("") is None
    s = materials.state_field()
    assert s.parse("active") == "active" and s.default == "auto"
    e = materials.environment_field()
    assert e.default == "seawater_flowing" and e.parse("freshwater") == "freshwater"
    assert f.to_dict()["widget"] == "combo"


def test_citations():
    row = materials.alloy("S31600")
    assert materials.cite_potential(row)["source_id"] == "astm_g82"
    assert "Fig. 1" in materials.cite_potential(row)["text"]
    assert materials.cite_density(row)["source_id"] == "asm_matweb"
    assert materials.cite_density(materials.alloy("N10276"))["confidence"] == "from-memory"
    # EW computed by the G102 method from the composition of the cited specification
    assert materials.cite_ew(row)["source_id"] == "scotforge_j405"
    assert "G102 method" in materials.cite_ew(row)["text"]
    assert materials.cite_ew(materials.alloy("graphite")) is None
    env = materials.environment("atmosphere_harsh")
    assert materials.cite_allowed(env)["confidence"] == "common-practice"


def test_g102_weighted_equivalent_weight_recomputed():
    # Independent recomputation of EW = 1/Σ(n_i f_i / W_i) from the composition in ew_basis.
    import re
    masses = {r["id"]: r["ion_molar_mass_g_mol"] for r in data.table("half_reactions")}
    masses["Si"], masses["W"], masses["Nb"] = 28.085, 183.84, 92.906
    for row in data.table("alloys"):
        basis = row["ew_basis"]
        parts = re.findall(r"([A-Z][a-z]?) ([\d.]+)%\(n (\d)\)", basis)
        if not parts:
            continue
        ew = 1.0 / sum(int(n) * float(f) / 100 / masses[e] for e, f, n in parts)
        assert row["equivalent_weight_g_mol"] == pytest.approx(ew, abs=0.006), row["id"]
