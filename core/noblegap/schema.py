"""One schema per calculator: it drives the form, URL keys, CLI and parsing.

A calculator declares its inputs once, as a list of :class:`Field`. The same
declaration renders the form on the page (build time, jinja2), names the URL
query keys and the command-line ``key=value`` pairs, and parses and validates
what a user typed (:meth:`Calculator.parse`). Nothing about an input is
written twice.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field as dc_field
from typing import Any, Callable

from . import units
from .errors import ChoiceError, InputError, InputErrors, NoblegapError, RangeError, suggest

QUANTITY, CHOICE, INTEGER, NUMBER, TEXT = "quantity", "choice", "integer", "number", "text"

#: Magnitude ceiling (in SI units) for numeric fields that set no ``max``:
#: far beyond any real joint (10^12 m², 31 700 years), and well inside what
#: floating-point arithmetic handles without overflow.
MAGNITUDE_LIMIT = 1e12


@dataclass
class Field:
    """One input of a calculator.

    ``min``/``max`` are in the SI unit of ``quantity`` (see
    :data:`noblegap.units.KINDS`); ``unit`` is the unit a bare number means and
    the unit the range is shown in. ``choices`` is a list of ``(id, label)`` or
    a callable returning one; ``resolve`` maps free text (a UNS number, a
    generic name) to a choice id and raises :class:`ChoiceError` otherwise.
    ``optional`` fields may be left empty and then parse to ``None``.
    """

    key: str
    label: str
    kind: str
    default: Any = None
    quantity: str | None = None
    unit: str | None = None
    min: float | None = None
    max: float | None = None
    min_inclusive: bool = True
    max_inclusive: bool = True
    choices: Any = None
    resolve: Callable | None = None
    widget: str | None = None
    help: str = ""
    source: str = ""
    optional: bool = False
    group: str = ""
    range_note: str = ""

    def choice_list(self):
        c = self.choices() if callable(self.choices) else self.choices
        return [tuple(x) if not isinstance(x, str) else (x, x) for x in (c or [])]

    def allowed_text(self):
        if self.kind == CHOICE:
            ids = [cid for cid, _ in self.choice_list()]
            if len(ids) > 12:
                return (f"one of the {len(ids)} entries in the list (id, UNS number or "
                        "generic name)" if self.resolve else
                        f"one of the {len(ids)} entries in the list")
            return ", ".join(ids)
        if self.kind == TEXT:
            return ""
        parts = []
        if self.min is not None:
            parts.append(("≥ " if self.min_inclusive else "> ") + self._show(self.min))
        if self.max is not None:
            parts.append(("≤ " if self.max_inclusive else "< ") + self._show(self.max))
        rng = " and ".join(parts)
        if self.kind == QUANTITY:
            ex = units.KINDS[self.quantity][2]
            return f"{rng} ({ex})" if rng else f"units {ex}"
        if self.kind == INTEGER:
            return f"a whole number {rng}".replace("1e+06", "1 000 000").strip()
        return rng or "a number"

    def _show(self, si_value):
        if self.kind == QUANTITY and self.unit:
            si = units.KINDS[self.quantity][0]
            shown = units.convert(si_value, si, self.unit)
            return f"{shown:.4g} {units.symbol(self.unit)}".replace("-", "\u2212")
        return f"{si_value:g}"

    def parse(self, raw):
        """Parse one raw value; returns SI float, int, choice id, text or None."""
        text = raw if not isinstance(raw, str) else raw.strip()
        if text is None or text == "":
            if self.optional:
                return None
            raise InputError("This field is empty.", field=self.key, value="",
                             allowed=self.allowed_text())
        if self.kind == QUANTITY:
            value = units.parse(text, self.quantity, field=self.key, default_unit=self.unit)
        elif self.kind in (INTEGER, NUMBER):
            try:
                value = float(str(text).replace("\u2212", "-"))
            except ValueError:
                raise InputError("Not a number.", field=self.key, value=raw,
                                 allowed=self.allowed_text()) from None
            if not math.isfinite(value):
                raise InputError("The number is not finite.", field=self.key, value=raw,
                                 allowed=self.allowed_text())
            if self.kind == INTEGER:
                if value != int(value):
                    raise InputError("Must be a whole number.", field=self.key, value=raw,
                                     allowed=self.allowed_text())
                value = int(value)
        elif self.kind == CHOICE:
            if self.resolve is not None:
                return self.resolve(text, self.key)
            ids = [cid for cid, _ in self.choice_list()]
            if text in ids:
                return text
            folded = {cid.lower(): cid for cid in ids}
            if str(text).lower() in folded:
                return folded[str(text).lower()]
            raise ChoiceError(f"{text!r} is not one of the choices for {self.label.lower()}.",
                              field=self.key, value=raw, allowed=", ".join(ids),
                              suggestions=suggest(text, ids))
        else:
            return str(text)
        self._check_range(value, raw)
        return value

    def _check_range(self, value, raw):
        if self.max is None and abs(value) > MAGNITUDE_LIMIT:
            raise RangeError(f"{self.label} is too large to be a real value.", field=self.key,
                             value=raw, allowed=self.allowed_text() + " (and of a physical size)")
        lo, hi = self.min, self.max
        bad = ((lo is not None and (value < lo if self.min_inclusive else value <= lo)) or
               (hi is not None and (value > hi if self.max_inclusive else value >= hi)))
        if bad:
            note = f" {self.range_note}" if self.range_note else ""
            raise RangeError(f"{self.label} is out of range.{note}", field=self.key,
                             value=raw, allowed=self.allowed_text())

    def to_dict(self):
        """JSON-ready description (choices expanded) for pages and ``describe``."""
        return {
            "key": self.key, "label": self.label, "kind": self.kind,
            "default": self.default, "quantity": self.quantity, "unit": self.unit,
            "allowed": self.allowed_text(), "optional": self.optional,
            "choices": [{"id": cid, "label": lab} for cid, lab in self.choice_list()]
            if self.kind == CHOICE else None,
            "widget": self.widget or ("select" if self.kind == CHOICE and self.resolve is None
                                      else "text"),
            "help": self.help, "source": self.source, "group": self.group,
        }


#: Successful parses kept per field (a joint schedule repeats the same alloys,
#: sizes and environments row after row; live edits revisit values).
PARSE_MEMO_SIZE = 256


def _parse_memo(field, raw):
    """``field.parse(raw)``, remembered for hashable raw values (parsing is pure)."""
    try:
        key = (type(raw), raw)
        hash(key)
    except TypeError:
        return field.parse(raw)
    memo = field.__dict__.setdefault("_parse_memo", {})
    if key in memo:
        return memo[key]
    value = field.parse(raw)
    if not isinstance(value, (str, int, float, type(None))):
        return value  # only immutable results are shared between calls
    if len(memo) >= PARSE_MEMO_SIZE:
        memo.clear()
    memo[key] = value
    return value


@dataclass
class Calculator:
    """A calculator: its schema, its compute function and its worked example.

    ``compute`` takes the parsed inputs as keyword arguments and returns a
    JSON-ready dict (outputs at top level plus ``display``, see
    :mod:`noblegap.report`). ``example`` holds raw inputs (strings as a user
    would type them) that the build pre-renders on the page.
    """

    name: str
    title: str
    summary: str
    fields: list
    compute: Callable
    example: dict = dc_field(default_factory=dict)
    intro: str = ""
    check: Callable | None = None

    def field_map(self):
        return {f.key: f for f in self.fields}

    def raw_inputs(self, inputs):
        """Return every field's raw text: the user's value, else the default."""
        out = {}
        for f in self.fields:
            v = inputs.get(f.key) if inputs else None
            if v is None:
                v = f.default
            out[f.key] = "" if v is None else v
        return out

    def parse(self, inputs):
        """Parse all inputs, collecting every field's error before raising."""
        raw = self.raw_inputs(inputs)
        parsed, errors = {}, []
        for f in self.fields:
            try:
                parsed[f.key] = _parse_memo(f, raw[f.key])
            except NoblegapError as exc:
                errors.append(exc)
        if errors:
            raise InputErrors(errors)
        if self.check is not None:
            self.check(parsed)
        return parsed

    def to_dict(self):
        return {
            "name": self.name, "title": self.title, "summary": self.summary,
            "intro": self.intro, "page": f"{self.name}.html",
            "fields": [f.to_dict() for f in self.fields],
            "example": dict(self.example),
        }
