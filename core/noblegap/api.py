"""The one entry point: ``run(calc, inputs) -> dict``, JSON in, JSON out.

The browser worker and the command line both call :func:`run`. It never
raises for a user's input: errors come back as ``{"ok": False, "error": {...}}``
with the field, the value typed and what is allowed. Results are plain JSON
(no NaN, no infinity: non-finite floats become ``None``).
"""

from __future__ import annotations

import importlib
import math

from . import __version__, units
from .errors import ChoiceError, InputError, NoblegapError, suggest

# Modules that define CALCULATORS (a list of schema.Calculator), in page order.
CALCULATOR_MODULES = ("convert", "couple", "series", "nernst", "fastener", "holiday")

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


def run(calc, inputs=None):
    """Run calculator ``calc`` on raw ``inputs`` (strings as typed, or numbers).

    Returns
    -------
    dict
        ``{"ok": True, "calc", "inputs", "result"}`` where ``inputs`` are the raw
        values used (defaults filled in), or ``{"ok": False, "calc", "inputs",
        "error"}`` where ``error`` is :meth:`NoblegapError.to_dict`.
    """
    inputs = dict(inputs or {})
    raw = inputs
    token = None
    try:
        calculator = get(calc)
        token = units.set_system(display_system(calculator, inputs))
        raw = calculator.raw_inputs(inputs)
        params = calculator.parse(inputs)
        result = calculator.compute(**params)
        return _clean({"ok": True, "calc": calc, "version": __version__,
                       "inputs": raw, "result": result})
    except NoblegapError as exc:
        return _clean({"ok": False, "calc": calc, "inputs": raw, "error": exc.to_dict()})
    except OverflowError as exc:
        err = InputError("The values entered are too large or too small to compute with "
                         f"({type(exc).__name__}).", allowed="values of a physical size; "
                         "check the magnitudes and their units")
        return _clean({"ok": False, "calc": calc, "inputs": raw, "error": err.to_dict()})
    except Exception as exc:  # noqa: BLE001 - last line of defence, never a traceback
        return {"ok": False, "calc": calc, "inputs": _clean(raw), "error": {
            "type": "InternalError", "kind": "internal", "field": None, "value": None,
            "allowed": None,
            "message": ("The calculation failed unexpectedly "
                        f"({type(exc).__name__}). Your inputs are kept; please report "
                        "this page's link to the maintainers."),
        }}
    finally:
        if token is not None:
            units.reset_system(token)


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
