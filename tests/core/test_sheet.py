"""The check sheet's QR code: segno's code for the link, as SVG, made on the device."""

import doctest
import json
import re

import pytest
import segno

from noblegap import sheet

LINK = "http://127.0.0.1:8000/fastener.html?fastener=316+stainless&plate=5083&count=12"


def svg_matrix(svg, border=4):
    """Rebuild the module matrix from segno's SVG path (M/m moves, h runs, y at row + 0.5)."""
    size = int(re.search(r'viewBox="0 0 (\d+) \d+"', svg).group(1))
    path = re.search(r'<path[^>]*stroke="#000"[^>]*d="([^"]+)"', svg).group(1)
    grid = [[0] * size for _ in range(size)]
    x = y = 0.0
    for op, a, b in re.findall(r"([Mmh])(-?[\d.]+)(?:[ ,](-?[\d.]+))?", path):
        if op == "M":
            x, y = float(a), float(b)
        elif op == "m":
            x, y = x + float(a), y + float(b)
        else:
            n = float(a)
            for i in range(int(n)):
                grid[int(y)][int(x) + i] = 1
            x += n
    return [row[border:size - border] for row in grid[border:size - border]]


def test_the_svg_draws_segnos_matrix_for_the_link():
    expected = [[1 if c else 0 for c in row] for row in segno.make(LINK, error="m", micro=False).matrix]
    assert sheet.qr_matrix(LINK) == expected
    assert svg_matrix(sheet.qr_svg(LINK)) == expected


def test_a_different_link_gives_a_different_code():
    assert sheet.qr_matrix(LINK) != sheet.qr_matrix(LINK + "&thickness=8+mm")


def test_too_long_and_empty_links_are_refused_with_a_message():
    out = json.loads(sheet.handle(json.dumps({"op": "qr", "link": "x" * (sheet.MAX_LINK + 1)})))
    assert out["ok"] is False and "too long" in out["error"]["message"]
    out = json.loads(sheet.handle(json.dumps({"op": "qr", "link": ""})))
    assert out["ok"] is False and "no link" in out["error"]["message"]
    with pytest.raises(sheet.LinkError):
        sheet.qr_svg(None)


def test_handle():
    out = json.loads(sheet.handle(json.dumps({"op": "qr", "link": LINK})))
    assert out["ok"] and out["svg"].startswith("<svg") and out["size"] == len(sheet.qr_matrix(LINK))
    assert json.loads(sheet.handle(json.dumps({"op": "draw"})))["ok"] is False


def test_segno_is_not_imported_by_the_engine_start():
    import subprocess
    import sys
    from pathlib import Path
    core = str(Path(__file__).resolve().parents[2] / "core")
    code = ("import sys, noblegap.api as a, noblegap.sheet, noblegap.schedule, noblegap.compare;"
            "a.run('fastener', {}); print('segno' in sys.modules)")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True,
                         env={"PYTHONPATH": core}, check=True)
    assert out.stdout.strip() == "False"


def test_doctests():
    assert doctest.testmod(sheet).failed == 0
