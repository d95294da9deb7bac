"""200 fast random edits on every page: the screen ends on the core's answer for the final inputs.

A person types, deletes and pastes faster than the engine answers. Whatever
order the answers come back in, the result on screen must belong to the inputs
on screen: once the page settles, its headline (or its "not computed" state)
must be what the core on CPython gives for the inputs in the page's link.
"""

from __future__ import annotations

import random
from urllib.parse import parse_qsl, urlparse

import pytest

from conftest import wait_for, wait_live
from noblegap import api

CALCS = list(api.calculators())
EDITS = 200
CHARS = "0123456789.,- mMinx/\"'CFy°"


def _pool(field):
    """Entries a person might type or paste into ``field``: good, odd and bad."""
    base = [str(field["default"] or ""), "", "abc", "1,5", "10**10", "{{7*7}}"]
    return base + {
        "length": ["12 mm", "3/8 in", "1 1/2 in", "M10", "0.5 mm", "2,5 mm"],
        "area": ["0.96 m2", "12 ft2", "1200 x 800 mm", "4 ft x 3 ft", "1 cm²"],
        "temperature": ["25 °C", "60 C", "77 F", "300 K"],
        "potential": ["-0.80 V", "-850 mV", "0,5 V"],
        "time": ["25 y", "10 year", "6 months"],
    }.get(field.get("quantity") or "", ["1", "0.5", "3"])


def _fields(page):
    """The page's fields, each with its control's tag and, for a list, its option values."""
    return page.evaluate(
        "() => JSON.parse(document.getElementById('schema').textContent).fields"
        ".map((f) => { const c = document.getElementById(`f-${f.key}`);"
        " return c ? {...f, tag: c.tagName, options: c.tagName === 'SELECT' ?"
        " [...c.options].map((o) => o.value) : []} : null; }).filter(Boolean)")


def _settled(page):
    """Wait until the result panel stops changing in a final state; return its state."""
    page.keyboard.press("Tab")            # leave the field: a pending error shows now
    last = None
    stable_since = None
    for _ in range(600):
        seq = page.get_attribute("#result", "data-result-seq")
        state = page.get_attribute("#result", "data-state")
        now = (seq, state)
        if state in ("live", "error") and now == last:
            stable_since = stable_since or page.evaluate("() => performance.now()")
            if page.evaluate("() => performance.now()") - stable_since > 1500:
                return state
        else:
            stable_since = None
        last = now
        page.wait_for_timeout(100)
    raise AssertionError(f"the result panel never settled (last {last})")


@pytest.mark.parametrize("name", CALCS)
def test_random_edits_end_on_the_cores_answer(page, server, name):
    rng = random.Random(f"edits-{name}")
    page.goto(f"{server}/{name}.html")
    wait_live(page)
    fields = _fields(page)
    assert fields, f"{name} has no fields"
    for _ in range(EDITS):
        f = rng.choice(fields)
        sel = f"#f-{f['key']}"
        action = rng.random()
        if f["tag"] == "SELECT":
            page.select_option(sel, rng.choice(f["options"]))
        elif action < 0.45:
            page.focus(sel)
            page.keyboard.type(rng.choice(CHARS))
        elif action < 0.7:
            page.focus(sel)
            page.keyboard.press("Backspace")
        else:
            page.fill(sel, rng.choice(_pool(f)))
    state = _settled(page)
    wait_for(page, "() => document.body.dataset.engine === 'ready'")
    inputs = dict(parse_qsl(urlparse(page.url).query, keep_blank_values=True))
    for f in fields:                                   # the link holds what is on screen
        assert inputs.get(f["key"], "") == page.input_value(f"#f-{f['key']}")
    expected = api.run(name, inputs)
    if expected["ok"]:
        assert state == "live", (inputs, page.inner_text("#result"))
        assert page.inner_text("#result .headline") == expected["result"]["display"]["headline"]
    else:
        assert state == "error", (inputs, expected["error"]["message"])
        assert page.query_selector("#result .headline") is None
