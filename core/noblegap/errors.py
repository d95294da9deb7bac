"""Structured errors that cross the worker boundary intact.

Every error raised for a user's input carries the field it concerns, the value
the user typed, and what is allowed, and builds its own message from them.
:meth:`NoblegapError.to_dict` turns it into plain JSON for the page and the
command line; nothing else about an error (no traceback) ever reaches a user.
"""

from __future__ import annotations


class NoblegapError(Exception):
    """Base class of every error this package raises on purpose.

    Parameters
    ----------
    message : str
        What is wrong, in words a user understands.
    field : str, optional
        The input key concerned (``None`` for a whole-calculation problem).
    value : object, optional
        What the user entered, echoed back unchanged.
    allowed : str, optional
        What would be accepted instead.
    """

    kind = "error"
    #: The label of the field on the page (set by the schema), for people.
    label = None

    def __init__(self, message, *, field=None, value=None, allowed=None, hint=None):
        super().__init__(message)
        self.message = message
        self.field = field
        self.value = value
        self.allowed = allowed
        self.hint = hint

    def __str__(self):
        text = self.message
        if self.allowed:
            text += f" Allowed: {self.allowed}."
        if self.hint:
            text += f" {self.hint}"
        return text

    def to_dict(self):
        """Return a JSON-ready dict: type, message, field, value, allowed."""
        return {
            "type": type(self).__name__,
            "kind": self.kind,
            "message": str(self),
            "field": self.field,
            "value": None if self.value is None else str(self.value),
            "allowed": self.allowed,
            "label": self.label,
        }


class InputError(NoblegapError, ValueError):
    """An input value that cannot be used (wrong unit, out of range, empty)."""

    kind = "input"


class UnitError(InputError):
    """A quantity whose unit is unknown or has the wrong dimension."""


class RangeError(InputError):
    """A value outside the range the method or its data is valid for."""


class ChoiceError(NoblegapError, KeyError):
    """An identifier that is not one of the choices (with suggestions)."""

    kind = "input"

    def __init__(self, message, *, field=None, value=None, allowed=None,
                 suggestions=(), hint=None):
        super().__init__(message, field=field, value=value, allowed=allowed, hint=hint)
        self.suggestions = list(suggestions)

    def __str__(self):
        text = NoblegapError.__str__(self)
        if self.suggestions:
            text += " Did you mean: " + "; ".join(self.suggestions) + "?"
        return text

    def to_dict(self):
        out = super().to_dict()
        out["suggestions"] = self.suggestions
        return out


class MissingDataError(NoblegapError, LookupError):
    """The tables hold no sourced value that the calculation needs."""

    kind = "data"


class DataError(NoblegapError, ValueError):
    """A table in ``data/`` is broken: names the file, row and column."""

    kind = "table"

    def __init__(self, message, *, file=None, row=None, column=None):
        where = ", ".join(
            part for part in (
                f"file {file}" if file else "",
                f"row {row}" if row is not None else "",
                f"column {column}" if column else "",
            ) if part
        )
        super().__init__(f"{where}: {message}" if where else message, field=column)
        self.file = file
        self.row = row
        self.column = column


class InputErrors(NoblegapError, ValueError):
    """Several input errors at once, so each field gets its own message."""

    kind = "input"

    def __init__(self, errors):
        self.errors = list(errors)
        first = self.errors[0]
        n = len(self.errors)
        message = first.message if n == 1 else f"{n} inputs need attention; first: {first.message}"
        super().__init__(message, field=first.field, value=first.value, allowed=first.allowed)
        self.label = first.label

    def __str__(self):
        if len(self.errors) == 1:
            return str(self.errors[0])
        return f"{len(self.errors)} inputs need attention: " + "; ".join(
            f"{e.label or e.field}: {e}" for e in self.errors)

    def to_dict(self):
        out = super().to_dict()
        out["errors"] = [e.to_dict() for e in self.errors]
        return out


def suggest(value, candidates, limit=5):
    """Return up to ``limit`` candidates close to ``value`` (difflib, case-folded)."""
    import difflib
    cands = list(candidates)
    lowered = {c.lower(): c for c in cands}
    hits = difflib.get_close_matches(str(value).lower(), list(lowered), n=limit, cutoff=0.5)
    starts = [c for c in cands if c.lower().startswith(str(value).lower()[:3])] if value else []
    out = []
    for c in [lowered[h] for h in hits] + starts:
        if c not in out:
            out.append(c)
    return out[:limit]
