"""A small SVG writer for the charts the core draws.

Charts are strings built here, so they are identical at build time (CPython)
and in the browser (Pyodide). Every text is XML-escaped; pages show the SVG
through an ``<img>`` data URL, where no script can run.
"""

from __future__ import annotations

from functools import lru_cache
from xml.sax.saxutils import escape, quoteattr


@lru_cache(maxsize=None)
def _name(key):
    return key.rstrip("_").replace("_", "-")


def _attrs(attrs):
    parts = []
    for k, v in attrs.items():
        if v is None:
            continue
        if isinstance(v, float):      # digits, sign and point: nothing to escape
            parts.append(f'{_name(k)}="{f"{v:.2f}".rstrip("0").rstrip(".")}"')
        elif isinstance(v, int) and not isinstance(v, bool):
            parts.append(f'{_name(k)}="{v}"')
        else:
            parts.append(f"{_name(k)}={quoteattr(str(v))}")
    return " ".join(parts)


#: Every chart is drawn twice: ``wide`` for a column at least 640 px wide and
#: ``narrow`` for anything narrower (a phone is 300–360 px of column). The page
#: shows one, scaled to its column's width, so text drawn at :data:`TEXT` in a
#: drawing no wider than the column is never shown smaller than 12 px.
SIZES = {"wide": {"width": 640, "ticks": 6}, "narrow": {"width": 300, "ticks": 4}}
#: Size of every chart text [px of the drawing].
TEXT = 12


def text_width(text, size=TEXT):
    """A generous estimate of a text's drawn width [px] (system sans-serif).

    >>> text_width("1e-3")
    27.84
    """
    return round(0.58 * size * len(str(text)), 2)


def drawings(draw):
    """``{size name: draw(spec)}`` for every entry of :data:`SIZES`."""
    return {name: draw(spec) for name, spec in SIZES.items()}


class Svg:
    """Collects SVG elements; ``str(svg)`` gives the document."""

    FONT = "system-ui, sans-serif"

    def __init__(self, width, height, title=""):
        self.width, self.height, self.title = width, height, title
        self.items = []

    def add(self, tag, text=None, **attrs):
        body = "" if text is None else escape(str(text))
        self.items.append(f"<{tag} {_attrs(attrs)}>{body}</{tag}>" if text is not None
                          else f"<{tag} {_attrs(attrs)}/>")
        return self

    def line(self, x1, y1, x2, y2, stroke="#333", width=1, dash=None):
        return self.add("line", x1=x1, y1=y1, x2=x2, y2=y2, stroke=stroke,
                        stroke_width=width, stroke_dasharray=dash)

    def rect(self, x, y, w, h, fill="#888", stroke=None, rx=None, opacity=None):
        return self.add("rect", x=x, y=y, width=max(w, 0.0), height=max(h, 0.0), fill=fill,
                        stroke=stroke, rx=rx, fill_opacity=opacity)

    def circle(self, cx, cy, r, fill="#000", stroke=None):
        return self.add("circle", cx=cx, cy=cy, r=r, fill=fill, stroke=stroke)

    def polyline(self, points, stroke="#000", width=2, dash=None):
        pts = " ".join(f"{x:.2f},{y:.2f}" for x, y in points)
        return self.add("polyline", points=pts, fill="none", stroke=stroke,
                        stroke_width=width, stroke_dasharray=dash)

    def text(self, x, y, text, size=12, anchor="start", fill="#222", weight=None):
        return self.add("text", text, x=x, y=y, font_size=size, text_anchor=anchor,
                        fill=fill, font_family=self.FONT, font_weight=weight)

    def __str__(self):
        head = (f'<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 {self.width} '
                f'{self.height}" width="{self.width}" height="{self.height}" role="img">')
        title = f"<title>{escape(self.title)}</title>" if self.title else ""
        return head + title + "".join(self.items) + "</svg>"


def scale(lo, hi, out_lo, out_hi):
    """Return a function mapping [lo, hi] linearly onto [out_lo, out_hi]."""
    span = (hi - lo) or 1.0

    def f(v):
        return out_lo + (v - lo) * (out_hi - out_lo) / span
    return f


def nice_ticks(lo, hi, count=6):
    """Round tick values covering [lo, hi]."""
    import math
    span = hi - lo
    if span <= 0:
        return [lo]
    raw = span / max(count, 1)
    mag = 10 ** math.floor(math.log10(raw))
    step = min((m * mag for m in (1, 2, 2.5, 5, 10) if m * mag >= raw), default=10 * mag)
    start = math.ceil(lo / step) * step
    ticks, v = [], start
    while v <= hi + step * 1e-9:
        ticks.append(round(v, 12))
        v += step
    return ticks
