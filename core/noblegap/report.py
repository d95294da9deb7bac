"""The display part of a result: what a page shows, built by the core.

Calculators return machine outputs at the top level of their result dict and a
``display`` entry built with :class:`Report`. Pages render ``display``
generically with ``textContent`` (never as HTML), and the build pre-renders
the same structure with escaped jinja2 templates, so what a user sees before
and after the engine starts is laid out the same way.

``display`` keys: ``headline`` (one sentence), ``verdict`` (``{class, label,
reason}`` or None), ``paragraphs`` (plain-language reading), ``rows`` (label,
value, source), ``tables`` (title, columns, rows, note, filterable), ``charts``
(title, svg, alt), ``warnings``, ``notes``.
"""

from __future__ import annotations


class Report:
    """Collects the display structure of one result."""

    def __init__(self):
        self.d = {"headline": "", "verdict": None, "paragraphs": [], "rows": [],
                  "tables": [], "charts": [], "warnings": [], "notes": []}

    def headline(self, text):
        self.d["headline"] = text
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
        return self.d
