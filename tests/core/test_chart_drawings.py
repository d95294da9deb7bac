"""Every chart comes in a wide and a narrow drawing with 12 px text, in the
display system's units. (The browser test tests/browser/test_layout.py checks
what is shown: the drawing that fits, nothing past its edges.)"""

from __future__ import annotations

import re

import pytest

from noblegap import api

CHARTED = ["fastener", "joint", "holiday", "nernst"]


def _charts(name, **extra):
    out = api.run(name, {**api.get(name).example, **extra})
    assert out["ok"]
    return out["result"]["display"]["charts"]


@pytest.mark.parametrize("name", CHARTED)
def test_two_drawings_with_12_px_text(name):
    charts = _charts(name)
    assert charts
    for c in charts:
        for svg, width in ((c["svg"], 640), (c["narrow"]["svg"], 300)):
            assert re.search(rf'viewBox="0 0 {width} ', svg)
            sizes = {float(s) for s in re.findall(r'font-size="([\d.]+)"', svg)}
            assert sizes == {12.0}, sizes
        assert c["min_width"] == 640 and c["narrow"]["min_width"] == 300


def test_rate_charts_follow_the_units_choice():
    si = " ".join(c["narrow"]["svg"] for c in _charts("holiday"))
    us = " ".join(c["narrow"]["svg"] for c in _charts("holiday", units="us"))
    assert ">mm/yr<" in si and "edge, mm<" in si and "mpy" not in si
    assert ">mpy<" in us and "edge, in<" in us and "mm/yr" not in us
