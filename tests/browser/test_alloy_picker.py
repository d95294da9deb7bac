"""The touch picker: a gloved user picks an alloy by family or search, without typing in the field."""

from __future__ import annotations

from conftest import wait_live
from noblegap.materials import alloys


def test_pick_an_alloy_by_search_and_by_family(page, server):
    page.set_viewport_size({"width": 390, "height": 844})
    page.goto(f"{server}/fastener.html")
    seq = wait_live(page)
    page.click("#po-plate")
    assert page.get_attribute("#po-plate", "aria-expanded") == "true"
    page.fill("#pk-plate .pick-search", "6061")
    visible = page.locator("#pk-plate .pick:visible").all_inner_texts()
    assert visible == [alloys.alloy_label("A96061")]
    box = page.locator("#pk-plate .pick:visible").first.bounding_box()
    assert box["height"] >= 44                      # a target for a gloved finger
    page.locator("#pk-plate .pick:visible").first.click()
    assert page.is_hidden("#pk-plate")
    assert page.input_value("#f-plate") == alloys.alloy_label("A96061")
    wait_live(page, seq)
    assert page.get_attribute("#result", "data-state") == "live"
    assert "plate=" in page.url and "6061" in page.url
    # by family, without the search box
    seq = int(page.get_attribute("#result", "data-result-seq"))
    page.click("#po-fastener")
    fam = page.locator("#pk-fastener .pick-family", has_text="Titanium")
    fam.locator("summary").click()
    fam.locator(".pick").first.click()
    assert "Titanium" in page.input_value("#f-fastener")
    wait_live(page, seq)
    assert page.get_attribute("#result", "data-state") == "live"
    # the open picker and its buttons stay inside the phone's width
    page.click("#po-plate")
    right = page.evaluate("() => Math.max(...[...document.querySelectorAll('#pk-plate, #pk-plate .pick')]"
                          ".filter((e) => e.offsetParent).map((e) => e.getBoundingClientRect().right))")
    assert right <= 390


def test_a_search_with_no_match_says_what_to_do(page, server):
    page.goto(f"{server}/joint.html")
    wait_live(page)
    page.click("#po-first")
    page.fill("#pk-first .pick-search", "unobtainium")
    assert page.is_visible("#pk-first .pick-none")
    assert page.locator("#pk-first .pick:visible").count() == 0
