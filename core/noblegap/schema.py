"""One schema per calculator: it drives the form, URL keys, CLI and parsing.

A calculator declares its inputs once, as a list of :class:`Field`. The same
declaration renders the form on the page (build time, jinja2), names the URL
query keys and the command-line ``key=value`` pairs, and parses and validates
what a user typed (:meth:`Calculator.parse`). Nothing about an input is
written twice.
"""

from __future__ import annotations

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
    #: For a long list: ``() -> {choice id: family}``, which groups the touch picker.
    families: Callable | None = None
    help: str = ""
    source: str = ""
    optional: bool = False
    group: str = ""
    range_note: str = ""
    thread: bool | None = None
    reader: Callable | None = None

    def reads_threads(self):
        """Whether metric thread designations (M10) are read: a nominal diameter."""
        if self.thread is not None:
            return self.thread
        return (self.kind == QUANTITY and self.quantity == "length"
                and "nominal diameter" in self.label.lower())

    def choice_list(self):
        c = self.choices() if callable(self.choices) else self.choices
        return [tuple(x) if not isinstance(x, str) else (x, x) for x in (c or [])]

    def allowed_text(self):
        if self.kind == CHOICE:
            labels = [lab for _, lab in self.choice_list()]
            if len(labels) > 12:
                return (f"one of the {len(labels)} entries in the list (a generic name or "
                        "a UNS number)" if self.resolve else
                        f"one of the {len(labels)} entries in the list")
            return "; ".join(labels)
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
            text = f"{shown:.4g}"
            if "e+" in text:  # 1e+06 is for code; people read 1 000 000
                text = f"{shown:,.0f}".replace(",", " ")
            return f"{text} {units.symbol(self.unit)}".replace("-", "\u2212")
        return f"{si_value:g}"

    def parse(self, raw):
        """Parse one raw value; returns SI float, int, choice id, text or None."""
        return self.read(raw)[0]

    def read(self, raw):
        """Parse one raw value; return ``(value, read_as)`` (see :meth:`read_note`)."""
        return self.read_note(raw)[:2]

    def read_note(self, raw):
        """Parse one raw value; return ``(value, read_as, note)``.

        ``read_as`` says in the user's own units what was read (``"2.5 mm"``,
        ``"1200 mm × 800 mm = 0.96 m²"``), or None for an empty optional field.
        Every error names this field (key and label) and what is allowed.
        """
        try:
            out = self._read(raw)
            return out if len(out) == 3 else (*out, None)
        except NoblegapError as exc:
            if exc.field is None or exc.field == self.key:
                exc.field = self.key
                exc.label = self.label
            raise

    def _read(self, raw):
        if isinstance(raw, bool) or not (raw is None or isinstance(raw, (str, int, float))):
            what = "true/false" if isinstance(raw, bool) else f"a {type(raw).__name__} value"
            raise InputError(f"Expected text, got {what}.", field=self.key,
                             value=what, allowed=self.allowed_text() or "text")
        text = raw if not isinstance(raw, str) else raw.strip()
        if text is None or text == "":
            if self.optional:
                return None, None
            raise InputError("This field is empty.", field=self.key, value="",
                             allowed=self.allowed_text())
        if self.kind == QUANTITY:
            reading = units.read(text, self.quantity, field=self.key, default_unit=self.unit,
                                 thread=self.reads_threads())
            value, echo = reading.value, reading.text
            if self.unit:
                si = units.KINDS[self.quantity][0]
                shown = units.show(units.convert(value, si, self.unit), self.unit)
                if shown != echo and not echo.endswith("nominal diameter"):
                    echo = f"{echo} = {shown}"
        elif self.kind in (INTEGER, NUMBER):
            reading = units.read(text, "fraction", field=self.key, default_unit="", plain=True)
            value, echo = reading.value, reading.text
            if self.kind == INTEGER:
                if value != int(value):
                    raise InputError("Must be a whole number.", field=self.key, value=raw,
                                     allowed=self.allowed_text())
                value = int(value)
        elif self.kind == CHOICE:
            if not isinstance(text, str):
                text = str(text)
            if len(text) > units.MAX_LENGTH:
                raise InputError(f"The text is {len(text)} characters long; a choice is at "
                                 f"most {units.MAX_LENGTH}.", field=self.key,
                                 value=text[:units.MAX_LENGTH] + "…",
                                 allowed=self.allowed_text())
            try:
                return self._choose(text, raw)
            except ChoiceError as exc:
                self._words_for_people(exc)
                raise
        else:
            text = str(text)
            if len(text) > units.MAX_LENGTH:
                raise InputError(f"The text is {len(text)} characters long; this field takes "
                                 f"at most {units.MAX_LENGTH}.", field=self.key,
                                 value=text[:units.MAX_LENGTH] + "…",
                                 allowed=self.allowed_text() or "a short text")
            echo = text
            if self.reader is not None:
                echo = self.reader(text, self.key)
            return text, echo
        self._check_range(value, raw)
        return value, echo

    def _choose(self, text, raw):
        """Return ``(id, label)`` (or ``(id, label, note)`` from a resolver) for a choice
        typed as its label, its id or, through the field's resolver, a designation."""
        choices = self.choice_list()
        labels = dict(choices)
        by_label = {lab.casefold(): cid for cid, lab in choices}
        if text.casefold() in by_label:      # a label picked from the list
            cid = by_label[text.casefold()]
            return cid, labels[cid]
        if self.resolve is not None:
            hit = self.resolve(text, self.key)
            cid, note = (hit[0], hit[1:]) if isinstance(hit, tuple) else (hit, None)
            return cid, labels.get(cid, cid), note
        ids = [cid for cid, _ in choices]
        if text in ids:
            return text, labels[text]
        folded = {cid.lower(): cid for cid in ids}
        if text.lower() in folded:
            cid = folded[text.lower()]
            return cid, labels[cid]
        raise ChoiceError(f"{text!r} is not one of the choices for {self.label.lower()}.",
                          field=self.key, value=raw, allowed=self.allowed_text(),
                          suggestions=suggest(text, ids))

    def _words_for_people(self, exc):
        """Show labels, never ids, in a choice error's suggestions and allowed list.

        Ids stay in links and files; a person reads the labels of the list.
        """
        if exc.field not in (None, self.key):
            return
        labels = dict(self.choice_list())
        shown = []
        for s in exc.suggestions:
            lab = labels.get(s, s)
            if lab not in shown:
                shown.append(lab)
        exc.suggestions = shown
        if exc.allowed and all(p.strip() in labels for p in exc.allowed.split(",")):
            exc.allowed = "; ".join(labels[p.strip()] for p in exc.allowed.split(","))

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

    def _choices_dict(self):
        fam = self.families() if self.families else {}
        return [{"id": cid, "label": lab, **({"family": fam[cid]} if cid in fam else {})}
                for cid, lab in self.choice_list()]

    def to_dict(self):
        """JSON-ready description (choices expanded) for pages and ``describe``."""
        return {
            "key": self.key, "label": self.label, "kind": self.kind,
            "default": self.default, "quantity": self.quantity, "unit": self.unit,
            "allowed": self.allowed_text(), "optional": self.optional,
            "choices": self._choices_dict() if self.kind == CHOICE else None,
            "widget": self.widget or ("select" if self.kind == CHOICE and self.resolve is None
                                      else "text"),
            "help": self.help, "source": self.source, "group": self.group,
        }


#: Successful parses kept per field (a joint schedule repeats the same alloys,
#: sizes and environments row after row; live edits revisit values).
PARSE_MEMO_SIZE = 256


def _read_memo(field, raw):
    """``field.read_note(raw)``, remembered for hashable raw values (reading is pure).

    Only results made of immutable values are shared between calls.
    """
    try:
        key = (type(raw), raw)
        hash(key)
    except TypeError:
        return field.read_note(raw)
    memo = field.__dict__.setdefault("_read_memo", {})
    if key in memo:
        return memo[key]
    result = field.read_note(raw)
    try:
        hash(result)
    except TypeError:
        return result
    if len(memo) >= PARSE_MEMO_SIZE:
        memo.clear()
    memo[key] = result
    return result


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
    #: The compute-only path for many rows (a joint schedule): same parameters
    #: as ``compute``, the same top-level numbers and the same display
    #: headline, weakest source, verdict and warnings, without the parts only
    #: a page shows (alternatives, mitigations, other scenarios, charts).
    #: None: ``compute`` serves both.
    headline: Callable | None = None

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
        return self.read(inputs)[0]

    def read(self, inputs):
        """Parse all inputs; return ``(parsed, read_as)`` (see :meth:`read_all`)."""
        return self.read_all(inputs)[:2]

    def read_all(self, inputs):
        """Parse all inputs; return ``(parsed, read_as, notes)``.

        ``read_as`` maps each field read to what was read (:meth:`Field.read`);
        ``notes`` are ``(sentence, is_warning)`` on how a designation was taken.

        Every field's error is collected before raising :class:`InputErrors`,
        which then carries ``read_as`` of the fields that were read.
        """
        raw = self.raw_inputs(inputs)
        parsed, read_as, notes, errors = {}, {}, [], []
        for f in self.fields:
            try:
                parsed[f.key], echo, note = _read_memo(f, raw[f.key])
                if echo is not None:
                    read_as[f.key] = echo
                if note:
                    notes.append(note)
            except NoblegapError as exc:
                errors.append(exc)
        if errors:
            err = InputErrors(errors)
            err.read_as = read_as
            raise err
        if self.check is not None:
            try:
                self.check(parsed)
            except NoblegapError as exc:
                exc.read_as = read_as
                raise
        return parsed, read_as, notes

    def to_dict(self):
        return {
            "name": self.name, "title": self.title, "summary": self.summary,
            "intro": self.intro, "page": f"{self.name}.html",
            "fields": [f.to_dict() for f in self.fields],
            "example": dict(self.example),
            # The page runs the headline first, then the rest, where this is true.
            "headline_path": self.headline is not None,
        }
