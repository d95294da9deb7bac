"""Units at the edges: the one pint registry, parsing and formatting.

This is the only module that imports pint. Calculations inside the package use
plain floats in fixed SI units (V, K, m, m², A, A/m², mol/m³, s); pint is used
only to read what a user typed ("3/8 in", "77 degF", "-800 mV") and to convert
results for display.

The registry is built from ``units.txt`` shipped beside this module; the
Faraday and gas constants come from pint's own CODATA constants file (exact SI
definitions since 2019), not from numbers typed here.
"""

from __future__ import annotations

import contextvars
import math
import re
from importlib import resources

import pint

from .errors import InputError, UnitError

_REGISTRY = None

# Each quantity kind: its SI unit (what the core computes in), the pint
# dimensionality it must have, and the units a user is told about.
KINDS = {
    "potential": ("V", "[mass] * [length] ** 2 / [time] ** 3 / [current]", "V, mV"),
    "temperature": ("K", "[temperature]", "°C, °F, K"),
    "length": ("m", "[length]", "mm, cm, m, in, ft, mil"),
    "area": ("m**2", "[length] ** 2", "mm², cm², m², in², ft²"),
    "current": ("A", "[current]", "A, mA, µA"),
    "current_density": ("A/m**2", "[current] / [length] ** 2", "A/m², mA/m², µA/cm²"),
    "molar_concentration": ("mol/m**3", "[substance] / [length] ** 3", "mol/L, mmol/L"),
    "molality": ("mol/kg", "[substance] / [mass]", "mol/kg"),
    "mass_concentration": ("kg/m**3", "[mass] / [length] ** 3", "mg/L, g/L"),
    "time": ("s", "[time]", "year, day, hour"),
    "rate": ("m/s", "[length] / [time]", "mm/yr, mpy"),
    "mass": ("kg", "[mass]", "g, kg, mg"),
    "fraction": ("", "", "a plain number, %, ppm"),
}

# Constants taken, by name, from pint's CODATA constants file.
_CODATA_NAMES = (
    "elementary_charge", "avogadro_number", "boltzmann_constant",
    "avogadro_constant", "molar_gas_constant", "faraday_constant",
)


def registry():
    """Return the package's one :class:`pint.UnitRegistry` (built on first use)."""
    global _REGISTRY
    if _REGISTRY is None:
        defs = resources.files(__package__).joinpath("units.txt")
        with resources.as_file(defs) as path:
            ureg = pint.UnitRegistry(
                str(path), autoconvert_offset_to_baseunit=True, cache_folder=None)
        constants = resources.files("pint").joinpath("constants_en.txt").read_text("utf-8")
        for line in constants.splitlines():
            name = line.split("=", 1)[0].strip()
            if name in _CODATA_NAMES:
                ureg.define(line.split("#", 1)[0].strip())
        _REGISTRY = ureg
    return _REGISTRY


def _constant(name, unit):
    ureg = registry()
    return ureg.Quantity(1, name).to(unit).magnitude


def faraday():
    """Faraday constant F [C/mol], CODATA (e·N_A, exact in the SI)."""
    return _constant("faraday_constant", "C/mol")


def gas_constant():
    """Molar gas constant R [J/(mol·K)], CODATA (k·N_A, exact in the SI)."""
    return _constant("molar_gas_constant", "J/(mol*K)")


_CLEAN = (
    ("\u2212", "-"), ("\u2013", "-"), ("\u00b2", "**2"), ("\u00b3", "**3"),
    ("\u00b7", "*"), ("\u00d7", "*"), ("^", "**"), ("\u2009", " "), ("\u00a0", " "),
)
_NUMBER_ONLY = re.compile(r"^\s*[-+]?(\d+(\.\d*)?|\.\d+)([eE][-+]?\d+)?\s*$")


def _clean(text):
    for a, b in _CLEAN:
        text = text.replace(a, b)
    # "1,5" with a decimal comma and nothing else: accept as 1.5
    if re.fullmatch(r"\s*[-+]?\d+,\d+\s*", text):
        text = text.replace(",", ".")
    text = re.sub(r"(?<=\d)\s*deg\s*C\b", " degC", text)
    text = re.sub(r"(?<=\d)\s*deg\s*F\b", " degF", text)
    return text.strip()


def parse(text, kind, *, field=None, default_unit=None):
    """Read a user's quantity and return its magnitude in the kind's SI unit.

    Parameters
    ----------
    text : str or float
        What the user typed, e.g. ``"-800 mV"``, ``"3/8 in"``, ``"77 °F"``.
        A bare number takes ``default_unit``.
    kind : str
        A key of :data:`KINDS`.
    field : str, optional
        The input key, echoed in any error.
    default_unit : str, optional
        Unit for a bare number (required when bare numbers are allowed).

    Returns
    -------
    float
        The magnitude in ``KINDS[kind][0]``.

    Raises
    ------
    InputError
        Empty text or not a number.
    UnitError
        Unknown unit, or a unit of the wrong dimension (``3 kg`` for a potential).
    """
    si_unit, dims, examples = KINDS[kind]
    if text is None or (isinstance(text, str) and not text.strip()):
        raise InputError("This field is empty.", field=field, value="" if text is None else text,
                         allowed=f"a {kind.replace('_', ' ')} such as {_example(kind)}")
    if isinstance(text, bool):
        raise InputError("Expected a quantity, got true/false.", field=field, value=text,
                         allowed=f"units {examples}")
    ureg = registry()
    raw = str(text)
    cleaned = _clean(raw)
    try:
        if isinstance(text, (int, float)) or _NUMBER_ONLY.match(cleaned):
            value = float(cleaned)
            if default_unit is None:
                raise UnitError("A unit is needed here.", field=field, value=raw,
                                allowed=f"units {examples}")
            q = ureg.Quantity(value, default_unit)
        else:
            q = ureg.parse_expression(cleaned)
            if not isinstance(q, ureg.Quantity):
                q = ureg.Quantity(float(q), "")
            if "[temperature]" in dims and len(q._units) == 1:
                # parse_expression gives 25 degC as a multiplicative product;
                # rebuild it as an offset quantity so 25 °C means 298.15 K.
                (unit_name, power), = q._units.items()
                if power == 1:
                    q = ureg.Quantity(q.magnitude, unit_name)
    except UnitError:
        raise
    except pint.errors.UndefinedUnitError as exc:
        names = ", ".join(repr(n) for n in getattr(exc, "unit_names", ()) or ())
        raise UnitError(f"Unknown unit {names}." if names else "Unknown unit.",
                        field=field, value=raw, allowed=f"units {examples}") from None
    except Exception:  # noqa: BLE001 - pint's parser raises many kinds; all mean "unreadable"
        raise InputError("Not a number with a unit.", field=field, value=raw,
                         allowed=f"a value such as {_example(kind)} (units {examples})") from None
    if kind == "fraction":
        if not q.dimensionless:
            raise UnitError(f"Expected a plain number, got units of {q.dimensionality}.",
                            field=field, value=raw, allowed=examples)
        value = q.to("").magnitude
    else:
        if q.dimensionless and q.unitless and default_unit:
            q = ureg.Quantity(q.magnitude, default_unit)
        if q.dimensionality != ureg.parse_expression(si_unit).dimensionality:
            got = _describe_dims(q)
            raise UnitError(f"That is {got}, not a {kind.replace('_', ' ')}.",
                            field=field, value=raw, allowed=f"units {examples}")
        value = q.to(si_unit).magnitude
    value = float(value)
    if not math.isfinite(value):
        raise InputError("The number is not finite.", field=field, value=raw,
                         allowed=f"a finite value such as {_example(kind)}")
    return value


def dimension_of(text):
    """Return which :data:`KINDS` key the text's quantity belongs to, or None."""
    ureg = registry()
    try:
        q = ureg.parse_expression(_clean(str(text)))
    except Exception:  # noqa: BLE001 - any parse failure means "not a quantity"
        return None
    if not isinstance(q, ureg.Quantity):
        return "fraction"
    for kind, (si_unit, _dims, _ex) in KINDS.items():
        if q.dimensionality == ureg.parse_expression(si_unit or "1").dimensionality:
            return kind
    return None


def _describe_dims(q):
    for kind, (si_unit, _dims, _ex) in KINDS.items():
        if si_unit and q.dimensionality == registry().parse_expression(si_unit).dimensionality:
            return f"a {kind.replace('_', ' ')}"
    if q.dimensionless:
        return "a plain number"
    return f"a quantity of dimension {q.dimensionality}"


_EXAMPLES = {
    "potential": "-0.80 V or -800 mV", "temperature": "25 °C", "length": "10 mm",
    "area": "0.5 m²", "current": "2 mA", "current_density": "1 µA/cm²",
    "molar_concentration": "0.1 mol/L", "molality": "0.1 mol/kg",
    "mass_concentration": "5 mg/L", "time": "20 year", "rate": "0.1 mm/yr",
    "mass": "10 g", "fraction": "0.5",
}


def _example(kind):
    return _EXAMPLES[kind]


def convert(value, from_unit, to_unit):
    """Convert a float between units (offset temperatures included)."""
    ureg = registry()
    return float(ureg.Quantity(value, from_unit).to(to_unit).magnitude)


_SYMBOLS = {"degC": "°C", "degF": "°F", "m**2": "m²", "mm**2": "mm²", "cm**2": "cm²",
            "A/m**2": "A/m²", "uA/cm**2": "µA/cm²", "um": "µm", "uA": "µA"}


def symbol(unit):
    """Display symbol of a unit name used in schemas (``degC`` → ``°C``)."""
    return _SYMBOLS.get(unit, unit)


# ---------- the display system: SI or US customary, one rule in one place ----------
#
# Every number a report shows goes through :func:`fmt`. api.run sets the
# display system for the duration of one call (an option, or inferred from the
# units the user typed); fmt then converts the SI units calculators write in
# to the user's system, so no calculator needs its own conversions.
SI, US = "si", "us"
SYSTEMS = {SI: "SI (mm, m², A, mm/yr)", US: "US customary (in, mil, ft², mpy)"}
_SYSTEM = contextvars.ContextVar("noblegap_display_system", default=SI)

#: Units a user types that say "I work in US customary units".
_US_TYPED = re.compile(
    r"\d\s*(?:in|inch|inches|ft|feet|foot|mil|mils|thou|mpy|degF|°F|F|sq ?ft|sq ?in|ft2|ft²|"
    r"in2|in²|yd)(?![A-Za-z0-9])|\d\s*[\"″']")


def system():
    """The display system of the current call: ``"si"`` or ``"us"``."""
    return _SYSTEM.get()


def set_system(name):
    """Set the display system; returns a token for :func:`reset_system`."""
    if name not in SYSTEMS:
        raise ValueError(f"unknown display system {name!r}")
    return _SYSTEM.set(name)


def reset_system(token):
    _SYSTEM.reset(token)


def typed_system(values):
    """``"us"`` if any typed value uses a US customary unit, else ``"si"``.

    >>> typed_system(["3/8 in", "316"]), typed_system(["10 mm", "25 °C", "F10006"])
    ('us', 'si')
    """
    for v in values:
        if isinstance(v, str) and _US_TYPED.search(v):
            return US
    return SI


def _us(value, unit):
    """(value, unit) converted for US customary display, or None to keep SI."""
    if unit in ("mm", "m", "cm", "µm", "um"):
        mm = value * {"mm": 1.0, "m": 1e3, "cm": 10.0, "µm": 1e-3, "um": 1e-3}[unit]
        inch = mm / 25.4
        if unit == "m" and abs(inch) >= 36:
            return inch / 12.0, "ft"
        if abs(inch) < 0.1:
            return inch * 1000.0, "mil"
        return inch, "in"
    if unit in ("m²", "m**2"):
        return value / 0.09290304, "ft²"
    if unit in ("cm²", "mm²"):
        return value * {"cm²": 1e-4, "mm²": 1e-6}[unit] / 0.00064516, "in²"
    if unit == "A/m²":
        return value * 0.09290304 * 1e3, "mA/ft²"
    if unit == "mm/yr":
        return value / 0.0254, "mpy"
    if unit == "mpy":                # the pair "x mm/yr (y mpy)" reads "y mpy (x mm/yr)"
        return value * 0.0254, "mm/yr"
    if unit == "°C":
        return value * 9.0 / 5.0 + 32.0, "°F"
    if unit == "g/cm³":
        return value * 0.0361273, "lb/in³"
    return None


def _scaled_current(value, unit):
    """Amperes scaled to A, mA or µA so the number reads well."""
    amps = value * {"A": 1.0, "mA": 1e-3, "µA": 1e-6, "uA": 1e-6}[unit]
    a = abs(amps)
    if a == 0 or a >= 1:
        return amps, "A"
    if a >= 1e-3:
        return amps * 1e3, "mA"
    return amps * 1e6, "µA"


def fmt(value, unit="", sig=3):
    """Format a float with ``sig`` significant figures and a unit symbol.

    ``unit`` is the (SI) unit ``value`` is in; under the US customary display
    system (:func:`set_system`) lengths, areas, current densities, rates and
    temperatures are shown in US units. Currents are scaled to A, mA or µA.

    >>> fmt(-0.80123, "V")
    '−0.801 V'
    >>> token = set_system(US); fmt(6, "mm"), fmt(0.96, "m²"); reset_system(token)
    ('0.236 in', '10.3 ft²')
    >>> fmt(0.0042, "A"), fmt(7.65e-6, "mol/L"), fmt(2.95e-5)
    ('4.20 mA', '7.65 µmol/L', '2.95 × 10⁻⁵')
    """
    if value is None:
        return "—"
    if isinstance(value, float) and not math.isfinite(value):
        return "beyond range"
    if unit in ("A", "mA", "µA", "uA"):
        value, unit = _scaled_current(value, unit)
    elif unit in ("mol/L", "mmol/L", "µmol/L") and value != 0:
        value, unit = _scaled_concentration(value, unit)
    elif _SYSTEM.get() == US:
        shown = _us(value, unit)
        if shown is not None:
            value, unit = shown
    if value == 0:
        text = "0"
    else:
        mag = math.floor(math.log10(abs(value)))
        if -4 <= mag < 6:
            decimals = max(sig - 1 - mag, 0)
            text = f"{value:.{decimals}f}"
        else:
            text = _power_of_ten(value, sig)
    text = text.replace("-", "\u2212")
    return f"{text} {unit}".strip()


def fmt_fraction(value, sig=3):
    """A fraction (area fraction, breakdown factor) as an inspector reads it:
    a percentage, or parts per million below 0.1 %.

    >>> fmt_fraction(5.66e-05), fmt_fraction(0.3126), fmt_fraction(0)
    ('56.6 ppm', '31.3 %', '0 %')
    """
    if value is None or (isinstance(value, float) and not math.isfinite(value)):
        return fmt(value)
    if value != 0 and abs(value) < 1e-3:
        return fmt(value * 1e6, "ppm", sig)
    return fmt(value * 100.0, "%", sig)


_SUPERSCRIPT = str.maketrans("0123456789-", "⁰¹²³⁴⁵⁶⁷⁸⁹⁻")


def _power_of_ten(value, sig):
    """``2.95 × 10⁻⁵``: a very small or large number as a person writes it."""
    mantissa, exponent = f"{value:.{sig - 1}e}".split("e")
    return f"{mantissa} × 10{str(int(exponent)).translate(_SUPERSCRIPT)}"


def _scaled_concentration(value, unit):
    """A molar concentration in mol/L, mmol/L, µmol/L or nmol/L, whichever reads."""
    mol_l = value * {"mol/L": 1.0, "mmol/L": 1e-3, "µmol/L": 1e-6}[unit]
    for factor, name in ((1.0, "mol/L"), (1e-3, "mmol/L"), (1e-6, "µmol/L"), (1e-9, "nmol/L")):
        if abs(mol_l) >= factor:
            return mol_l / factor, name
    return mol_l / 1e-9, "nmol/L"
