"""The galvanic-cell model (noblegap.methods.cell, .galvanic, .electrolyte): the
limits physics guarantees, as property tests."""

import math

import pytest
from hypothesis import given, settings, strategies as st

from noblegap.errors import InputError
from noblegap.methods import cell, electrolyte, faraday, galvanic

STEEL = dict(E_corr_V=-0.66, i_corr_A_m2=0.086, b_a_V=0.054, b_c_V=0.12, i_L_A_m2=1.0,
             i0_H_A_m2=1e-3)
BRONZE = dict(E_corr_V=-0.18, i_corr_A_m2=0.009, b_a_V=0.06, b_c_V=0.12, i_L_A_m2=1.0)
ALUMINIUM = dict(E_corr_V=-0.88, i_corr_A_m2=0.001, b_a_V=0.06, b_c_V=0.12, i_L_A_m2=1.0,
                 passive=True, E_b_V=-0.75)
STAINLESS = dict(E_corr_V=-0.05, i_corr_A_m2=1e-4, b_a_V=0.06, b_c_V=0.12, i_L_A_m2=1.0,
                 passive=True, E_b_V=0.2)


def el(**kw):
    return cell.Electrode(**kw)


def test_free_electrode_balances_at_its_corrosion_potential():
    for kw in (STEEL, BRONZE, ALUMINIUM, STAINLESS):
        e = el(**kw)
        assert e.net(e.E_corr_V) == pytest.approx(0.0, abs=1e-12)
        assert e.net(e.E_corr_V + 0.05) > 0 > e.net(e.E_corr_V - 0.05)


@settings(max_examples=40, deadline=None)
@given(A_a=st.floats(1e-6, 10.0), A_c=st.floats(1e-4, 100.0), R=st.floats(0.0, 1e4))
def test_solution_balances_charge_and_ohmic_drop(A_a, A_c, R):
    a, c = el(**STEEL), el(**BRONZE)
    s = cell.solve(a, c, A_a, A_c, R)
    assert a.E_corr_V <= s.E_anode_V <= s.E_cathode_V <= c.E_corr_V
    assert A_a * a.net(s.E_anode_V) == pytest.approx(s.current_A, rel=1e-3, abs=1e-12)
    assert s.E_cathode_V - s.E_anode_V == pytest.approx(s.current_A * R, rel=1e-3, abs=1e-5)
    # the three shares of the driving voltage add up
    assert s.eta_anode_V + s.eta_cathode_V + s.ohmic_V == pytest.approx(s.driving_V, abs=1e-5)
    # the anode's dissolution splits exactly into galvanic and local-cell parts
    assert s.i_galvanic_A_m2 + s.i_local_A_m2 == pytest.approx(s.i_anode_A_m2, rel=1e-9)


@settings(max_examples=30, deadline=None)
@given(A_a=st.floats(1e-3, 10.0), A_c=st.floats(1e-3, 100.0), i_L=st.floats(0.05, 5.0))
def test_zero_resistance_and_fast_anode_give_the_catchment_rule(A_a, A_c, i_L):
    # an active anode whose own corrosion is the oxygen limit (i_corr → i_L) and whose
    # dissolution is fast (b_a → 0), with no resistance and a cathode far enough above
    # it to be at its oxygen limit (the rule's own assumption): i_a = i_L·(A_c + A_a)/A_a
    anode = el(E_corr_V=-0.70, i_corr_A_m2=i_L * (1 - 1e-9), b_a_V=1e-4, b_c_V=0.12,
               i_L_A_m2=i_L)
    cathode = el(E_corr_V=1.0, i_corr_A_m2=1e-4, b_a_V=0.06, b_c_V=0.12, i_L_A_m2=i_L)
    s = cell.solve(anode, cathode, A_a, A_c, 0.0)
    expected = faraday.catchment_current_density(i_L, A_c, A_a)
    assert s.i_anode_A_m2 == pytest.approx(expected, rel=2e-3)
    assert s.limit == cell.LIMIT_CATHODE


@settings(max_examples=30, deadline=None)
@given(A_a=st.floats(1e-4, 10.0), A_c=st.floats(1e-4, 100.0), R=st.floats(0.0, 1e3))
def test_the_catchment_rule_is_an_upper_bound(A_a, A_c, R):
    a, c = el(**STEEL), el(**BRONZE)
    s = cell.solve(a, c, A_a, A_c, R)
    assert s.i_anode_A_m2 <= faraday.catchment_current_density(1.0, A_c, A_a) * (1 + 1e-6)


def test_infinite_resistance_gives_no_current_and_huge_tends_to_none():
    a, c = el(**STEEL), el(**BRONZE)
    assert cell.solve(a, c, 1.0, 1.0, math.inf).current_A == 0.0
    currents = [cell.solve(a, c, 1.0, 1.0, R).current_A for R in (1e2, 1e4, 1e6, 1e8)]
    assert currents == sorted(currents, reverse=True)
    assert currents[-1] < 1e-8


def test_equal_potentials_give_no_current():
    a = el(**STEEL)
    c = el(**dict(BRONZE, E_corr_V=STEEL["E_corr_V"]))
    s = cell.solve(a, c, 1.0, 10.0, 0.0)
    assert s.current_A == 0.0 and s.limit == cell.LIMIT_NONE


@settings(max_examples=40, deadline=None)
@given(A_a=st.floats(1e-6, 10.0), A_c=st.floats(1e-4, 50.0), k=st.floats(1.0, 100.0),
       R=st.floats(0.0, 1e3), pair=st.sampled_from([(STEEL, BRONZE), (ALUMINIUM, STAINLESS),
                                                     (STEEL, STAINLESS)]))
def test_larger_cathode_never_lowers_the_anode_rate(A_a, A_c, k, R, pair):
    a, c = el(**pair[0]), el(**pair[1])
    small = cell.solve(a, c, A_a, A_c, R)
    large = cell.solve(a, c, A_a, A_c * k, R)
    assert large.i_anode_A_m2 >= small.i_anode_A_m2 * (1 - 1e-6)


@settings(max_examples=40, deadline=None)
@given(r=st.floats(0.5e-3, 20e-3), shrink=st.floats(0.05, 0.99), A_c=st.floats(0.01, 50.0),
       rho=st.floats(0.15, 500.0))
def test_smaller_holiday_never_draws_more_total_current(r, shrink, A_c, rho):
    a, c = el(**STEEL), el(**BRONZE)

    def current(radius):
        R = electrolyte.disk_resistance_ohm(rho, radius) + \
            electrolyte.disk_resistance_ohm(rho, electrolyte.equivalent_radius_m(A_c))
        return cell.solve(a, c, math.pi * radius ** 2, A_c, R).current_A
    assert current(r * shrink) <= current(r) * (1 + 1e-6)


def test_passive_anode_is_active_above_its_breakdown_potential():
    e = el(**ALUMINIUM)
    assert e.dissolution(-0.80) == e.i_corr_A_m2
    assert e.dissolution(-0.75 + 0.06) == pytest.approx(10 * e.i_corr_A_m2)   # one decade


def test_own_corrosion_comes_from_the_own_kinetics_not_the_oxygen_limit():
    # issue 16: passive aluminium's own corrosion was taken at i_L; here it is i_pass
    e = el(**ALUMINIUM)
    assert e.dissolution(e.E_corr_V) == pytest.approx(0.001)
    assert e.dissolution(e.E_corr_V) < e.i_L_A_m2 / 100


def test_bad_electrodes_are_refused():
    with pytest.raises(InputError, match="below the oxygen limiting"):
        el(**dict(STEEL, i_corr_A_m2=2.0))
    with pytest.raises(InputError, match="needs a wetted area"):
        cell.solve(el(**STEEL), el(**BRONZE), 0.0, 1.0, 1.0)


def test_spread_length_shrinks_with_more_current_and_lower_conductivity():
    lam = [cell.spread_length_m(0.026, I, 3.0, 0.01, film_m=3e-5) for I in (1e-5, 1e-4, 1e-3)]
    assert lam == sorted(lam, reverse=True)
    assert cell.spread_length_m(0.026, 1e-4, 0.2, 0.01) == math.inf


def test_anode_rule_is_one_rule_for_both_orders():
    a = galvanic.anode_rule("S31600", "A95083", "seawater_flowing")
    b = galvanic.anode_rule("A95083", "S31600", "seawater_flowing")
    assert a["anode"] == b["anode"] == "A95083"
    assert a["delta_V"] == b["delta_V"]
    lo, likely, hi = a["delta_V"]
    assert 0 <= lo <= likely <= hi


def test_same_alloy_is_no_couple():
    r = galvanic.anode_rule("carbon_steel", "carbon_steel", "seawater_flowing")
    assert not r["galvanic"] and r["delta_V"] == (0.0, 0.0, 0.0)


def test_cases_are_ordered_low_likely_high():
    lay = galvanic.Layout("anode", 1, math.pi * 25e-6, 10.0, 5e-3, surrounds=False)
    for env in ("seawater_flowing", "brackish", "freshwater", "C3", "CX"):
        a = galvanic.assess("carbon_steel", "C95800", env, lambda rule: lay,
                            allowance_of=lambda _a: (1e-3, None))
        lo, li, hi = (a["cases"][c]["local_mm_per_yr"] for c in galvanic.CASES)
        assert lo <= li <= hi, env


def test_film_oxygen_limit_follows_ficks_law():
    # i_L = 4·F·D·c/h is inversely proportional to the film thickness
    assert galvanic.film_limit_A_m2(1e-5) == pytest.approx(10 * galvanic.film_limit_A_m2(1e-4))


def test_one_law_in_the_solver_and_on_the_charts():
    """The solver's net law (one closure) is the charts' dissolution − cathodic."""
    for kw in (STEEL, BRONZE, ALUMINIUM, STAINLESS, dict(STAINLESS, E_b_V=None)):
        e = el(**kw)
        for k in range(-40, 41):
            E = e.E_corr_V + 0.02 * k
            assert e.net(E) == pytest.approx(e.dissolution(E) - e.cathodic(E), rel=1e-12,
                                             abs=1e-15)


@settings(max_examples=40, deadline=None)
@given(A_a=st.floats(1e-6, 10.0), A_c=st.floats(1e-4, 100.0), R=st.floats(0.0, 1e4),
       shift=st.floats(-0.3, 0.3))
def test_a_guess_changes_only_the_work_not_the_answer(A_a, A_c, R, shift):
    a, c = el(**STEEL), el(**BRONZE)
    s = cell.solve(a, c, A_a, A_c, R)
    g = cell.solve(a, c, A_a, A_c, R, guess_V=s.E_anode_V + shift)
    assert g.E_anode_V == pytest.approx(s.E_anode_V, abs=1e-8)
    assert g.E_cathode_V == pytest.approx(s.E_cathode_V, abs=1e-8)
    assert g.current_A == pytest.approx(s.current_A, rel=1e-6, abs=1e-15)


#: Cases where the damped spread steps cycle between a small and the whole
#: member instead of settling (λ_new falls steeply with λ): 12 M10 carbon-steel
#: bolts in a 1.375 m² 316 plate in seawater; 12 M10 N06625 bolts in a 316 plate,
#: C1 atmosphere, high case.
CYCLING = (("carbon_steel", "S31600", "seawater_flowing", 1.375, "likely"),
           ("N06625", "S31600", "C1", 0.96, "high"))


@pytest.mark.parametrize("fastener_id, plate_id, env, plate_m2, case", CYCLING)
def test_spread_length_does_not_depend_on_the_number_of_damped_steps(
        monkeypatch, fastener_id, plate_id, env, plate_m2, case):
    from noblegap.calculators import fastener

    def local(iterations):
        monkeypatch.setattr(galvanic, "SPREAD_ITERATIONS", iterations)
        a = galvanic.assess(fastener_id, plate_id, env,
                            lambda r: fastener.layout(r, fastener_id, "bolt", 0.01, 12, None,
                                                      plate_m2),
                            allowance_of=lambda _a: (1e-3, None), cases=("likely", "high"))
        return a["cases"][case]

    runs = [local(n) for n in (11, 12, 13)]
    for c in runs[1:]:
        assert c["local_mm_per_yr"] == pytest.approx(runs[0]["local_mm_per_yr"],
                                                     rel=2 * galvanic.SPREAD_TOLERANCE)
    for c in runs:
        # the effective area is the one within the reported spread length
        lay = fastener.layout({"anode": fastener_id if c["A_anode_m2"] < 0.5 else plate_id,
                               "cathode": None, "galvanic": True}, fastener_id, "bolt",
                              0.01, 12, None, plate_m2)
        lam = c["spread_m"]
        if math.isfinite(lam):
            within = 12 * lay.faces * 2 * math.pi * lam * (lay.site_radius_m + lam)
            sur = c["A_cathode_eff_m2"] if lay.site_role == "anode" else c["A_anode_eff_m2"]
            assert sur == pytest.approx(min(within, plate_m2), rel=1e-9)


def test_flat_passive_metal_needs_no_anodic_slope():
    # A passive metal without a breakdown potential dissolves at its passive current at
    # every potential, so its row may leave b_a blank; any other metal must give one.
    flat = el(**dict(STAINLESS, E_b_V=None, b_a_V=None))
    for dE in (-0.3, 0.0, 0.5, 1.5):
        assert flat.dissolution(flat.E_corr_V + dE) == STAINLESS["i_corr_A_m2"]
    assert flat.net(flat.E_corr_V) == pytest.approx(0.0, abs=1e-12)
    for kw in (STEEL, STAINLESS):
        with pytest.raises(InputError, match="anodic Tafel slope"):
            el(**dict(kw, b_a_V=None))


def test_kinetics_citation_is_as_weak_as_its_weakest_value():
    # The headline's weakest-source line reads the kinetics citation: a row whose own
    # current is sourced but whose slopes or breakdown potential are recalled must still
    # read "from memory".
    from noblegap.materials import cell_data, data
    for alloy_id in ("carbon_steel", "C95800", "S31600", "A95083", "zinc", "titanium"):
        row = cell_data.kinetics_row(alloy_id)
        own = data.index("cell_kinetics")[row["id"]]
        grades = [own["confidence"]]
        if any(own[c] is None for c in cell_data.SHARED_COLUMNS):
            grades.append(cell_data.shared_kinetics()["confidence"])
        if row["b_a_mV_per_decade"] is not None:
            grades.append(own["ba_confidence"])
        if row["E_b_V_SCE"] is not None:
            grades.append(own["eb_confidence"])
        weakest = max(grades, key=data.CONFIDENCE.index)
        assert cell_data.kinetics_cite(row)["confidence"] == weakest, alloy_id


@pytest.mark.parametrize("anode", [STEEL, ALUMINIUM, BRONZE])
@pytest.mark.parametrize("R", [0.0, 3.0, 300.0])
def test_passive_cathode_numbers_do_not_use_its_anodic_slope_or_breakdown(anode, R):
    # The cathode is polarised below its free-corrosion potential, where a passive metal
    # dissolves at its passive current: its anodic slope and breakdown potential enter no
    # number (so kinetics_cite(row, "cathode") may leave them out).
    base = cell.solve(el(**anode), el(**STAINLESS), 1e-4, 1e-2, R)
    for kw in (dict(b_a_V=0.2), dict(b_a_V=0.02), dict(E_b_V=-0.02), dict(E_b_V=None)):
        other = cell.solve(el(**anode), el(**dict(STAINLESS, **kw)), 1e-4, 1e-2, R)
        assert other.E_cathode_V < STAINLESS["E_corr_V"]
        assert other == base, kw


def test_cathode_citation_leaves_out_only_what_the_cathode_does_not_use():
    from noblegap.materials import cell_data
    passive = cell_data.kinetics_row("S31600")
    assert passive["mode"] == "passive" and passive["b_a_mV_per_decade"] is not None
    as_cathode = cell_data.kinetics_cite(passive, role="cathode")["text"]
    assert "anodic slope: " not in as_cathode and "breakdown potential: " not in as_cathode
    as_anode = cell_data.kinetics_cite(passive, role="anode")["text"]
    assert "anodic slope: " in as_anode and "breakdown potential: " in as_anode
    active = cell_data.kinetics_row("C95800")
    assert active["mode"] == "active"
    assert "anodic slope: " in cell_data.kinetics_cite(active, role="cathode")["text"]
