"""The display part of a result: what a page shows, built by the core.

Calculators return machine outputs at the top level of their result dict and a
``display`` entry built with :class:`Report`. Pages render ``display``
generically with ``textContent`` (never as HTML), and the build pre-renders
the same structure with escaped jinja2 templates, so what a user sees before
and after the engine starts is laid out the same way.

``display`` keys: ``headline`` (one sentence), ``headline_confidence`` (the
weakest confidence among the sources behind the headline, see
:func:`weakest_confidence`; None when nothing graded lies behind it),
``verdict`` (``{class, label,
reason}`` or None), ``paragraphs`` (plain-language reading), ``rows`` (label,
value, source), ``tables`` (title, columns, rows, note, filterable), ``charts``
(title, svg, alt), ``warnings``, ``notes``.
"""

from __future__ import annotations

import re

from . import verdicts

# Words older calculators used for the three classes; the label now comes
# from verdicts.py alone.
_SYNONYMS = {w.casefold() for w in (
    *verdicts.LABEL.values(), "sound", "watch", "reject", "compatible", "marginal",
    "incompatible", "ok", "caution", "avoid")}

# Weakest first. "computed" (a formula applied by noblegap) is not a grade of
# its own: a computed value is as strong as the inputs beside it.
CONFIDENCE_ORDER = ("from-memory", "common-practice", "handbook-compiled", "published")

CONFIDENCE_WORDS = {
    "from-memory": "from memory (not confirmed against a published source)",
    "common-practice": "common practice (a rule of thumb)",
    "handbook-compiled": "handbook-compiled",
    "published": "published",
}


def weakest_confidence(labelled_sources):
    """The weakest grade among ``(label, source)`` pairs.

    ``source`` is a citation dict (``confidence`` key) or None. Returns None if
    no source carries a grade, else ``{"level", "words", "inputs"}`` with the
    labels of the inputs at that level (in order, without repeats).

    Example
    -------
    >>> weakest_confidence([("E°", {"confidence": "published"}),
    ...                     ("density", {"confidence": "from-memory"})])["inputs"]
    ['density']
    >>> weakest_confidence([("x", {"confidence": "computed"})]) is None
    True
    """
    graded = [(label, src["confidence"]) for label, src in labelled_sources
              if isinstance(src, dict) and src.get("confidence") in CONFIDENCE_ORDER]
    if not graded:
        return None
    level = min((c for _, c in graded), key=CONFIDENCE_ORDER.index)
    inputs = []
    for label, c in graded:
        if c == level and label not in inputs:
            inputs.append(label)
    return {"level": level, "words": CONFIDENCE_WORDS[level], "inputs": inputs}


def confidence_line(hc, limit=3):
    """One sentence for a headline's weakest confidence (page and print alike)."""
    if not hc:
        return ""
    names = hc["inputs"][:limit]
    more = len(hc["inputs"]) - len(names)
    tail = f" and {more} more" if more > 0 else ""
    return f"Weakest source behind this result: {hc['words']} — {'; '.join(names)}{tail}."


class Report:
    """Collects the display structure of one result."""

    def __init__(self):
        self.d = {"headline": "", "headline_confidence": None, "verdict": None,
                  "paragraphs": [], "rows": [], "tables": [], "charts": [],
                  "warnings": [], "notes": []}
        self._basis = None

    def summary(self, text):
        """The headline's number in a few words, for the page's summary bar
        (a phone shows two lines of it); without it the bar shows the headline."""
        self.d["summary"] = text
        return self

    def headline(self, text, basis=None):
        """Set the headline. ``basis``: ``(label, source)`` pairs behind it; by
        default every row's source and every table row's source count."""
        self.d["headline"] = text
        self._basis = basis
        return self

    def verdict(self, cls, *args):
        """The verdict of class ``cls`` (``ok``, ``caution`` or ``avoid``).

        Called as ``verdict(cls, reason)``. The label a person reads always
        comes from :mod:`noblegap.verdicts`, so every page speaks one
        vocabulary. The older form ``verdict(cls, label, reason)`` is still
        accepted: a label that is only another word for the class is dropped,
        any other (a finding such as "No perforation within 1000 years") is
        kept at the front of the reason.

        >>> Report().verdict("avoid", "reject", "Too fast.").d["verdict"]["label"]
        'Avoid'
        """
        if len(args) == 1:
            (reason,) = args
        else:
            extra, reason = args
            if extra and extra.casefold() not in _SYNONYMS:
                reason = f"{extra}: {reason}"
        self.d["verdict"] = {"class": cls, "label": verdicts.label(cls), "reason": reason}
        return self

    def para(self, text):
        self.d["paragraphs"].append(text)
        return self

    def row(self, label, value, source=None, key=None):
        """One labelled value; ``source`` is a dict from :func:`noblegap.data.cite`
        or plain text (e.g. "computed: E = E° − (RT/nF)·ln Q")."""
        if isinstance(source, str):
            source = {"text": source, "confidence": "computed", "source_id": ""}
        self.d["rows"].append({"label": label, "value": value, "source": source, "key": key})
        return self

    def table(self, title, columns, rows, note="", filterable=False, key=None,
              sources=None):
        """A table of strings. ``sources``, if given, is one citation per row."""
        self.d["tables"].append({"title": title, "columns": list(columns),
                                 "rows": [[str(c) for c in r] for r in rows],
                                 "note": note, "filterable": filterable, "key": key,
                                 "sources": sources})
        return self

    def chart(self, title, svg, alt):
        """An SVG chart: one drawing, or ``{"wide": svg, "narrow": svg}``
        (:func:`noblegap.svg.drawings`). ``min_width`` [px] is the narrowest
        column a drawing may be shown in with its smallest text still 12 px; the
        page shows the wide drawing where the column allows it, else the narrow
        one, scaled to the column."""
        def words(text):
            return re.sub(r">([^<]*)</text>",
                          lambda m: f">{true_minus(chem(m.group(1)))}</text>", str(text))
        both = svg if isinstance(svg, dict) else {"wide": svg}
        wide = words(both["wide"])
        chart = {"title": title, "svg": wide, "alt": alt, "min_width": _min_width(wide)}
        if "narrow" in both:
            narrow = words(both["narrow"])
            chart["narrow"] = {"svg": narrow, "min_width": _min_width(narrow)}
        self.d["charts"].append(chart)
        return self

    def view(self, view):
        """A structured view the page draws itself (the galvanic-series view)."""
        self.d["view"] = view
        return self

    def link(self, label, page, inputs, keep=False, group=None):
        """A next step: another page of the site, opened with ``inputs`` filled in.

        ``keep`` (a link to the same page): the page's other inputs stay as they
        are and only ``inputs`` change (an alternative alloy, another choice).
        ``group``: a heading shared by consecutive links (e.g. "Try another
        fastener")."""
        link = {"label": label, "page": page, "inputs": {k: str(v) for k, v in inputs.items()}}
        if keep:
            link["keep"] = True
        if group:
            link["group"] = group
        self.d.setdefault("links", []).append(link)
        return self

    def warn(self, text):
        self.d["warnings"].append(text)
        return self

    def note(self, text):
        self.d["notes"].append(text)
        return self

    def to_dict(self):
        basis = self._basis
        if basis is None:
            basis = [(r["label"], r["source"]) for r in self.d["rows"]]
            for t in self.d["tables"]:
                for row, src in zip(t["rows"], t["sources"] or []):
                    basis.append((f"{t['title']}: {row[0] if row else ''}", src))
        hc = weakest_confidence(basis)
        if hc:
            hc["line"] = confidence_line(hc)
        self.d["headline_confidence"] = hc
        return _chem_all(self.d)


_MIN_TEXT_PX = 12.0


def _min_width(svg):
    """Narrowest display width [px] keeping the SVG's smallest text ≥ 12 px.

    >>> _min_width('<svg width="600" height="10"><text font-size="10">a</text></svg>')
    720
    """
    import re
    text = str(svg)
    m = re.search(r'<svg[^>]*\bwidth="([\d.]+)"', text)
    sizes = [float(x) for x in re.findall(r'font-size="([\d.]+)"', text)]
    if not m or not sizes:
        return None
    return round(float(m.group(1)) * _MIN_TEXT_PX / min(sizes))


_SUP = str.maketrans("0123456789+-", "⁰¹²³⁴⁵⁶⁷⁸⁹⁺⁻")
_ION = re.compile(r"\b((?:[A-Z][a-z]?)+)(\d*)([+-])(?=$|[\s,;.:)|/])")
_ELECTRON = re.compile(r"\b(\d*)\s?e-(?=$|[\s,;.:)])")
_HALF = re.compile(r"(e⁻) = ")


def chem(text):
    """Chemistry written properly: ions with superscript charges, e⁻, and ⇌.

    >>> chem("Zn2+ + 2e- = Zn")
    'Zn²⁺ + 2e⁻ ⇌ Zn'
    >>> chem("Ag+ + e- = Ag; 316L, A4-70, E = E° − x")
    'Ag⁺ + e⁻ ⇌ Ag; 316L, A4-70, E = E° − x'
    """
    if not isinstance(text, str) or ("+" not in text and "e-" not in text):
        return text
    text = _ELECTRON.sub(lambda m: f"{m.group(1)}e⁻", text)
    text = _ION.sub(lambda m: m.group(1) + (m.group(2) + m.group(3)).translate(_SUP), text)
    return _HALF.sub(r"\1 ⇌ ", text)


_HYPHEN_MINUS = re.compile(r"(?<![\w/.])-(?=\.?\d)")


def true_minus(text):
    """A hyphen before a number becomes a true minus sign (U+2212).

    >>> true_minus("from -7.4 to 4.6, A4-70, 10-27 °C")
    'from −7.4 to 4.6, A4-70, 10-27 °C'
    """
    return _HYPHEN_MINUS.sub("\u2212", text)


def _chem_all(obj):
    if isinstance(obj, str):
        return true_minus(chem(obj))
    if isinstance(obj, list):
        return [_chem_all(x) for x in obj]
    if isinstance(obj, dict):
        return {k: (v if k in ("svg", "key", "class", "page", "inputs", "source_id")
                    else _chem_all(v)) for k, v in obj.items()}
    return obj
