"""Tampered and on-site links: the page answers, keeps the typed text, says what it read."""

from __future__ import annotations

from urllib.parse import quote

from conftest import wait_live


def test_power_tower_link_is_refused_fast_and_the_page_recovers(page, server):
    page.goto(f"{server}/convert.html?potential={quote('10**10**10 V')}")
    seq = wait_live(page)
    assert page.input_value("#f-potential") == "10**10**10 V"
    msg = page.inner_text("#e-potential")
    assert "small power only" in msg and "Allowed" in msg
    assert page.get_attribute("#result", "data-state") == "error"
    page.fill("#f-potential", "-800 mV")
    wait_live(page, seq)
    assert page.get_attribute("#result", "data-state") == "live"
    assert page.is_hidden("#e-potential")


def test_thread_designation_and_product_links_read_as_people_mean(page, server):
    page.goto(f"{server}/fastener.html?diameter=M10&plate_area={quote('1200 x 800 mm')}"
              f"&fastener=316L")
    wait_live(page)
    assert page.get_attribute("#result", "data-state") == "live"
    assert page.input_value("#f-diameter") == "M10"
    assert "10 mm nominal diameter" in page.inner_text("#r-diameter")
    assert "0.96 m²" in page.inner_text("#r-plate_area")
    assert "316L is taken as 316" in page.text_content("#result")   # folded under "What this means"


def test_decimal_comma_is_echoed(page, server):
    page.goto(f"{server}/convert.html?potential={quote('-0,8 V')}")
    wait_live(page)
    assert page.inner_text("#r-potential") == "read as −0.8 V"


def test_fields_read_well_keep_their_echo_while_another_field_is_wrong(page, server):
    page.goto(f"{server}/fastener.html?diameter=M10&plate=bronze")
    wait_live(page)
    assert page.get_attribute("#result", "data-state") == "error"
    assert "pick one" in page.inner_text("#e-plate")
    assert "Silicon bronze" in page.inner_text("#e-plate")
    assert "10 mm nominal diameter" in page.inner_text("#r-diameter")
