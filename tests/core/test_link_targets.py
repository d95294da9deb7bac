"""Next-step links carry values the page they open lists and computes.

The browser test (tests/browser/test_next_steps.py) follows every link; this
one checks the same promise in the core for every page's worked example.
"""

from __future__ import annotations

import pytest

from noblegap import api

PAGES = [n for n in api.calculators()]


def _choices(name, key):
    for f in api.get(name).fields:
        if f.key == key and f.widget == "select":
            ch = f.choices() if callable(f.choices) else f.choices
            return {c[0] if isinstance(c, (tuple, list)) else c for c in ch}
    return None


@pytest.mark.parametrize("name", PAGES)
def test_links_carry_listed_choices_and_compute(name):
    out = api.run(name, api.get(name).example)
    assert out["ok"]
    for link in out["result"]["display"].get("links") or []:
        target = link["page"].removesuffix(".html")
        assert target in api.calculators(), link
        for key, value in link["inputs"].items():
            listed = _choices(target, key)
            if listed is not None:
                assert value in listed, (link["label"], key, value)
        base = out["inputs"] if link.get("keep") else api.get(target).example
        assert link.get("keep") is None or target == name, link
        got = api.run(target, {**base, **link["inputs"]})
        assert got["ok"], (link["label"], got.get("error"))


def test_galvanic_pages_link_to_the_others_with_their_alloys():
    out = api.run("fastener", api.get("fastener").example)["result"]
    pages = {link["page"] for link in out["display"]["links"]}
    assert pages == {"fastener.html", "holiday.html", "joint.html", "pair.html", "series.html"}
    joint = next(link for link in out["display"]["links"] if link["page"] == "joint.html")
    assert joint["inputs"]["second"].startswith("Stainless steel 316")
    assert joint["inputs"]["environment"] == "CX"
