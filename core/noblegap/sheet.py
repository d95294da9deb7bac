"""The check sheet's QR code: the link that reopens a check, drawn on the device.

Interface layer, beside :mod:`noblegap.api`. The page prints a sheet for a
result (see ``site_src/static/sheet.js``); the QR code on it encodes the
sheet's link, so a phone reopens the same check. The code is made here, by
the pure-Python ``segno`` library (pinned in ``requirements-core.txt``),
as SVG: no network, the same code on CPython and in the browser.

``segno`` is imported only when a code is asked for: the engine's start does
not load it (the page loads its wheel when the user first prints).

>>> svg = qr_svg("https://example.org/fastener.html?count=12")
>>> svg.startswith("<svg") and 'class="qr"' in svg
True
>>> m = qr_matrix("https://example.org/fastener.html?count=12")
>>> len(m) == len(m[0]) and set(map(len, m)) == {len(m)}
True
"""

from __future__ import annotations

import json

#: Longest link a sheet encodes: a version-40 code at error level M holds
#: 2 331 bytes; a check's link is a few hundred.
MAX_LINK = 2000
#: Error correction level: M restores up to 15 % of a damaged print.
ERROR_LEVEL = "m"


class LinkError(ValueError):
    """The link cannot be encoded (empty or too long)."""


def _code(link):
    if not isinstance(link, str) or not link:
        raise LinkError("There is no link to encode.")
    if len(link.encode("utf-8")) > MAX_LINK:
        raise LinkError(f"The link is longer than {MAX_LINK} bytes, too long for a printed code.")
    import segno  # deferred: loaded only when a sheet is printed

    return segno.make(link, error=ERROR_LEVEL, micro=False, boost_error=False)


def qr_matrix(link):
    """The code's modules as rows of 0/1 (no quiet zone), for tests and checks."""
    return [[1 if cell else 0 for cell in row] for row in _code(link).matrix]


def qr_svg(link, title="Link to reopen this check"):
    """The code as a standalone SVG document string (black modules, white quiet zone).

    Scales with its ``viewBox``; the printed size is set by the page's CSS.
    """
    import io

    buf = io.BytesIO()
    _code(link).save(buf, kind="svg", scale=1, border=4, xmldecl=False, svgns=True,
                     title=title, svgclass="qr", lineclass=None, omitsize=True,
                     dark="#000", light="#fff")
    return buf.getvalue().decode("utf-8")


def handle(request_json):
    """JSON text in, JSON text out: the browser worker's entry.

    ``{"op": "qr", "link"}`` gives ``{"ok": True, "svg", "size"}`` (modules
    per side), or ``{"ok": False, "error": {"message", "allowed"}}``.
    """
    try:
        req = json.loads(request_json)
        if req.get("op") != "qr":
            out = {"ok": False, "error": {"type": "UsageError", "message":
                                          f"Unknown sheet operation {req.get('op')!r}.",
                                          "allowed": "qr"}}
        else:
            link = req.get("link")
            out = {"ok": True, "svg": qr_svg(link), "size": len(qr_matrix(link))}
    except LinkError as exc:
        out = {"ok": False, "error": {"type": "LinkError", "message": str(exc),
                                      "allowed": f"a link of 1 to {MAX_LINK} bytes"}}
    except (ValueError, TypeError, AttributeError) as exc:
        out = {"ok": False, "error": {"type": "UsageError", "message":
                                      f"The sheet request is malformed ({type(exc).__name__})."}}
    return json.dumps(out, ensure_ascii=False)
