"""The one entry point: ``run(calc, inputs) -> dict``, JSON in, JSON out.

The browser worker and the command line both call :func:`run`. It never
raises for a user's input: errors come back as ``{"ok": False, "error": {...}}``
with the field, the value typed and what is allowed. Results are plain JSON
(no NaN, no infinity: non-finite floats become ``None``).
"""

from __future__ import annotations

import importlib
import math
from collections.abc import Mapping

from . import __version__, units
from .errors import ChoiceError, InputError, NoblegapError, suggest

# Modules that define CALCULATORS (a list of schema.Calculator), in page order.
CALCULATOR_MODULES = ("convert", "couple", "series", "nernst", "fastener", "holiday",
                      "joint")

_REGISTRY = None


def calculators():
    """Return ``{name: Calculator}`` for every calculator, in page order."""
    global _REGISTRY
    if _REGISTRY is None:
        reg = {}
        for mod_name in CALCULATOR_MODULES:
            mod = importlib.import_module(f"{__package__}.calculators.{mod_name}")
            for calc in mod.CALCULATORS:
                reg[calc.name] = calc
        _REGISTRY = reg
    return _REGISTRY


def _clean(obj):
    if isinstance(obj, float):
        return obj if math.isfinite(obj) else None
    if isinstance(obj, dict):
        return {str(k): _clean(v) for k, v in obj.items()}
    if isinstance(obj, (list, tuple)):
        return [_clean(v) for v in obj]
    return obj


def get(calc):
    """Return the Calculator named ``calc`` or raise ChoiceError."""
    reg = calculators()
    if calc not in reg:
        raise ChoiceError(f"Unknown calculator {calc!r}.", field="calc", value=calc,
                          allowed=", ".join(reg), suggestions=suggest(calc, reg))
    return reg[calc]


def _jsonable(value):
    """A raw input as it can be echoed in JSON (types no field reads become a tag)."""
    if value is None or isinstance(value, (str, bool)):
        return value
    if isinstance(value, int):
        return value if abs(value) < 2 ** 53 else f"<integer of {value.bit_length()} bits>"
    if isinstance(value, float):
        return value if math.isfinite(value) else None
    return f"<{type(value).__name__}>"


def _error(calc, raw, err, read_as=None):
    out = {"ok": False, "calc": calc if isinstance(calc, str) else _jsonable(calc),
           "inputs": raw, "error": err}
    if read_as:
        out["inputs_read"] = read_as
    return out


def _internal(calc, raw, exc):
    return _error(calc, raw, {
        "type": "InternalError", "kind": "internal", "field": None, "value": None,
        "allowed": None, "label": None,
        "message": ("The calculation failed unexpectedly "
                    f"({type(exc).__name__}). Your inputs are kept; please report "
                    "this page's link to the maintainers."),
    })


def run(calc, inputs=None, *, headline_only=False):
    """Run calculator ``calc`` on raw ``inputs`` (strings as typed, or numbers).

    ``headline_only``: the calculator's compute-only path where it has one
    (:attr:`noblegap.schema.Calculator.headline`): the same numbers, headline,
    verdict and warnings, without alternatives, mitigations and charts (the
    joint schedule's rows).

    Never raises, whatever it is given (a non-dict, bytes, nested values): a
    bad request comes back as an error naming the field to change.

    Returns
    -------
    dict
        ``{"ok": True, "calc", "inputs", "inputs_read", "result"}`` where
        ``inputs`` are the raw values used (defaults filled in) and
        ``inputs_read`` says per field, in the user's units, what was read
        (``{"diameter": "2.5 mm"}``); or ``{"ok": False, "calc", "inputs",
        "error"}`` (with ``inputs_read`` of the fields that were read) where
        ``error`` is :meth:`NoblegapError.to_dict`. No NaN or infinity.
    """
    try:
        return _run(calc, inputs, headline_only)
    except Exception as exc:  # noqa: BLE001 - last line of defence, never a traceback
        return _internal(calc, {}, exc)


def _run(calc, inputs, headline_only=False):
    raw = {}
    if not isinstance(calc, str):
        err = ChoiceError(f"The calculator name must be text, got a {type(calc).__name__}.",
                          field="calc", value=_jsonable(calc), allowed=", ".join(calculators()))
        return _clean(_error(calc, raw, err.to_dict()))
    if inputs is None:
        inputs = {}
    if not isinstance(inputs, Mapping):
        err = InputError(f"The inputs must be pairs of field and value, got a "
                         f"{type(inputs).__name__}.", value=f"<{type(inputs).__name__}>",
                         allowed="a mapping such as {\"potential\": \"-0.80 V\"}")
        return _clean(_error(calc, raw, err.to_dict()))
    inputs = {k: v for k, v in inputs.items() if isinstance(k, str)}
    read_as = {}
    token = None
    try:
        calculator = get(calc)
        token = units.set_system(display_system(calculator, inputs))
        raw = {k: _jsonable(v) for k, v in calculator.raw_inputs(inputs).items()}
        params, read_as, notes = calculator.read_all(inputs)
        compute = (calculator.headline if headline_only and calculator.headline else
                   calculator.compute)
        result = compute(**params)
        _add_read_notes(result, notes)
        return _clean({"ok": True, "calc": calc, "version": __version__,
                       "inputs": raw, "inputs_read": read_as, "result": result})
    except NoblegapError as exc:
        err = exc.to_dict()
        keys = _field_keys(calc)
        if err.get("field") not in (None, UNITS_KEY) and keys and err["field"] not in keys:
            # an internal quantity: no field on the page carries that name
            err["field"] = None
        return _clean(_error(calc, raw, err, getattr(exc, "read_as", None) or read_as))
    except OverflowError as exc:
        err = InputError("The values entered are too large or too small to compute with "
                         f"({type(exc).__name__}).", allowed="values of a physical size; "
                         "check the magnitudes and their units")
        return _clean(_error(calc, raw, err.to_dict(), read_as))
    except Exception as exc:  # noqa: BLE001 - last line of defence, never a traceback
        return _clean(_internal(calc, raw, exc))
    finally:
        if token is not None:
            units.reset_system(token)


def _field_keys(calc):
    try:
        return {f.key for f in get(calc).fields}
    except NoblegapError:
        return set()


def _add_read_notes(result, notes):
    """Say on the result how a designation was read (316L taken as the 316 row)."""
    display = result.get("display") if isinstance(result, dict) else None
    if not notes or not isinstance(display, dict):
        return
    for text, warn in notes:
        where = "warnings" if warn else "paragraphs"
        items = display.setdefault(where, [])
        if text not in items:
            items.insert(0, text)


#: The input key of the display-units option (not a calculator field): it
#: rides in the link and on the command line like any input.
UNITS_KEY = "units"


def display_system(calculator, inputs):
    """Pop the ``units`` option from ``inputs``; return ``"si"`` or ``"us"``.

    ``si`` or ``us`` is the user's choice; empty or ``auto`` follows what the
    user typed (inches in, inches out). An unknown value is an input error.
    """
    if UNITS_KEY in calculator.field_map():
        return units.typed_system(v for v in inputs.values())
    choice = inputs.pop(UNITS_KEY, None)
    choice = "" if choice is None else str(choice).strip().lower()
    if choice in ("", "auto"):
        return units.typed_system(inputs.values())
    aliases = {"si": units.SI, "metric": units.SI, "us": units.US, "imperial": units.US,
               "us customary": units.US}
    if choice not in aliases:
        raise ChoiceError(f"{choice!r} is not a units choice.", field=UNITS_KEY,
                          value=choice, allowed="; ".join(units.SYSTEMS.values()) +
                          "; or leave it empty to follow the units you type",
                          suggestions=suggest(choice, list(aliases)))
    return aliases[choice]


def describe(calc=None):
    """Return the schema of one calculator, or of all with site pages."""
    if calc is not None:
        try:
            return {"ok": True, "calculator": get(calc).to_dict()}
        except NoblegapError as exc:
            return {"ok": False, "error": exc.to_dict()}
    return {"ok": True, "version": __version__,
            "calculators": [c.to_dict() for c in calculators().values()]}
