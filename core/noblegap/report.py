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

    def headline(self, text, basis=None):
        """Set the headline. ``basis``: ``(label, source)`` pairs behind it; by
        default every row's source and every table row's source count."""
        self.d["headline"] = text
        self._basis = basis
        return self

    def verdict(self, cls, label, reason):
        """``cls`` is a stable id for styling: ``ok``, ``caution`` or ``avoid``."""
        self.d["verdict"] = {"class": cls, "label": label, "reason": reason}
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
        self.d["charts"].append({"title": title, "svg": svg, "alt": alt})
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
        return self.d
