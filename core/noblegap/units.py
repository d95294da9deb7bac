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

from .errors import InputError, NoblegapError, RangeError, UnitError

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
    "conductivity": ("S/m", "[current] ** 2 * [time] ** 3 / [mass] / [length] ** 3",
                     "S/m, mS/cm, µS/cm"),
    "resistivity": ("ohm*m", "[mass] * [length] ** 3 / [time] ** 3 / [current] ** 2",
                    "ohm*m, ohm*cm"),
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


_CONSTANTS = {}


def _constant(name, unit):
    # Exact SI constants: converted once, then read from the table (the
    # conversion through pint costs ~0.1 ms, and a rate calls it per case).
    key = (name, unit)
    if key not in _CONSTANTS:
        _CONSTANTS[key] = registry().Quantity(1, name).to(unit).magnitude
    return _CONSTANTS[key]


def faraday():
    """Faraday constant F [C/mol], CODATA (e·N_A, exact in the SI)."""
    return _constant("faraday_constant", "C/mol")


def gas_constant():
    """Molar gas constant R [J/(mol·K)], CODATA (k·N_A, exact in the SI)."""
    return _constant("molar_gas_constant", "J/(mol*K)")


#: Longest text a quantity field reads. Real entries are under 30 characters.
MAX_LENGTH = 200

#: Physical limits per quantity kind, in the kind's SI unit: (smallest magnitude
#: other than zero, largest magnitude, why). Both ends are far outside anything
#: a joint, a water or an inspection can have, and far inside what floating-point
#: arithmetic handles; a value outside them is a typo or a unit slip.
LIMITS = {
    "potential": (1e-9, 100.0, "a potential between a metal and a reference is a few volts",
                  "below 1 nV no instrument reads a potential"),
    "temperature": (1e-3, 1e4, "no liquid or metal in service is above 10 000 K",
                    "nothing is at absolute zero"),
    "length": (1e-10, 1e5, "no joint or structure is longer than 100 km",
               "nothing here is shorter than an atom (0.1 nm)"),
    "area": (1e-14, 1e10, "no structure has more than 10 000 km² of surface",
             "no surface here is smaller than 0.01 µm²"),
    "current": (1e-15, 1e6, "no galvanic cell carries a mega-ampere",
                "below 1 fA no instrument reads a current"),
    "current_density": (1e-12, 1e6, "no corroding surface carries more than 1 MA/m²",
                        "below 1 pA/m² a current density is not measurable"),
    "molar_concentration": (1.66e-21, 25e3,
                            "no aqueous solution holds more than 25 mol/L (the most soluble "
                            "salts stay below that; water itself is 55.5 mol/L)",
                            "less than one ion per litre (1.66e−24 mol/L) is no solution"),
    "molality": (1.66e-24, 40.0, "no salt dissolves beyond 40 mol per kg of water",
                 "less than one ion per kilogram of water is no solution"),
    "mass_concentration": (1e-25, 2000.0,
                           "no aqueous solution holds more than 2000 g/L of dissolved mass",
                           "less than one ion per litre is no solution"),
    "time": (1.0, 3.2e13, "no design life or exposure is longer than a million years",
             "no corrosion time is shorter than one second"),
    "rate": (1e-20, 1e-3, "no metal corrodes faster than 1 mm per second",
             "a rate below 1e−20 m/s is not measurable"),
    "mass": (1e-15, 1e9, "nothing here weighs more than a million tonnes",
             "nothing here weighs less than 1 pg"),
    "fraction": (1e-300, 1e12, "a plain number here stays below 10¹²",
                 "a number this close to zero is not a real value: enter 0"),
}

# A kind added to KINDS without its own limits still refuses the absurd.
_GENERIC_LIMITS = (1e-300, 1e30, "the number is beyond any physical value",
                   "a number this close to zero is not a real value: enter 0")

# Characters people's keyboards and phones produce, read as their plain meaning.
_TYPOGRAPHIC = {
    "\u2212": "-", "\u2013": "-", "\u2010": "-", "\u2011": "-", "\u2012": "-",
    "\u00b2": "^2", "\u00b3": "^3", "\u00b7": "*", "\u22c5": "*", "\u2219": "*",
    "\u00d7": " x ", "\u2009": " ", "\u00a0": " ", "\u202f": " ", "\u2007": " ",
    "\u2002": " ", "\u2003": " ", "\u3000": " ", "\t": " ",
    "\u00b5": "u", "\u03bc": "u", "\u00ba": "\u00b0", "\u02da": "\u00b0",
    "\u2103": "\u00b0C", "\u2109": "\u00b0F", "\u212a": "K",
    "\u2032": "'", "\u2019": "'", "\u2018": "'", "\u2033": '"', "\u201c": '"',
    "\u201d": '"', "\u2044": "/", "\u2215": "/",
}
_VULGAR = {"\u00bd": "1/2", "\u2153": "1/3", "\u2154": "2/3", "\u00bc": "1/4",
           "\u00be": "3/4", "\u2155": "1/5", "\u2156": "2/5", "\u2157": "3/5",
           "\u2158": "4/5", "\u2159": "1/6", "\u215a": "5/6", "\u215b": "1/8",
           "\u215c": "3/8", "\u215d": "5/8", "\u215e": "7/8"}
_ASCII_OK = set("0123456789.,/*^'\"%+- xX") | set("abcdefghijklmnopqrstuvwyzABCDEFGHIJKLMNOPQRSTUVWYZ")
_OTHER_OK = {"\u00b0"}

# Unit words read by the field's quantity: what a letter means depends on it.
_CONTEXT_UNITS = {
    "temperature": {"C": "degC", "c": "degC", "F": "degF", "f": "degF", "°C": "degC",
                    "°F": "degF", "°c": "degC", "°f": "degF", "°K": "kelvin",
                    "degC": "degC", "degF": "degF", "degc": "degC", "degf": "degF"},
    "molar_concentration": {"M": "mol/L", "mM": "mmol/L", "uM": "umol/L", "nM": "nmol/L",
                            "pM": "pmol/L", "molar": "mol/L"},
}
_ALIASES = {"°C": "degC", "°F": "degF", "°K": "kelvin", "y": "year", "yrs": "year",
            "yr": "year", "sqm": "m^2", "thou": "thou", "microns": "um", "micron": "um"}
_MARK_UNITS = {'"': "inch", "'": "foot"}
_MAX_WORD = 16
_MAX_FACTORS = 6


class Reading:
    """What :func:`read` made of a user's text.

    ``value`` is the magnitude in the kind's SI unit; ``text`` says, in the
    user's own units, what was read (``"2.5 mm"``, ``"1.5 in = 38.1 mm"``).
    """

    __slots__ = ("value", "text", "kind")

    def __init__(self, value, text, kind):
        self.value, self.text, self.kind = value, text, kind

    def __repr__(self):
        return f"Reading({self.value!r}, {self.text!r}, {self.kind!r})"


def _refuse(message, field, raw, kind, cls=None):
    allowed = f"a value such as {_example(kind)} (units {KINDS[kind][2]})"
    return (cls or InputError)(message, field=field, value=raw, allowed=allowed)


def _char_problem(ch):
    import unicodedata
    name = unicodedata.name(ch, "")
    code = f"U+{ord(ch):04X} {name}".strip()
    cat = unicodedata.category(ch)
    if cat == "Nd":
        return f"Only the digits 0–9 are read; the text holds another digit ({code})."
    if cat == "Cs":
        return (f"The text holds a broken character ({code}, from bytes that are not "
                "UTF-8); retype the value.")
    if cat in ("Cc", "Cf", "Co", "Cn", "Zl", "Zp"):
        return (f"The text holds an invisible control character ({code}); retype the "
                "value.")
    if cat in ("Mn", "Mc", "Me"):
        return f"The text holds a combining mark ({code}); retype the value without it."
    if ch in "{}[]()<>$#&|\\~`@!?;:=_":
        return (f"Not a number with a unit: the character {ch!r} is not read here (no "
                "brackets, formulas or templates); write a number and a unit, e.g. {ex}.")
    return f"The character {ch!r} ({code}) is not part of a number or a unit."


def _sanitise(raw, field, kind):
    """Plain ASCII (plus °) from what was typed, or an error naming the character."""
    out = []
    for ch in raw:
        if ch in _ASCII_OK or ch in _OTHER_OK:
            out.append(ch)
        elif ch in _TYPOGRAPHIC:
            out.append(_TYPOGRAPHIC[ch])
        elif ch in _VULGAR:
            out.append(" " + _VULGAR[ch])
        else:
            raise _refuse(_char_problem(ch).replace("{ex}", _example(kind)), field, raw, kind)
    return "".join(out)


_NUM_RUN = re.compile(r"[0-9.,]+")
_EXP = re.compile(r"[eE][+-]?[0-9]{1,4}(?![0-9])")
_WORD = re.compile(r"°?\s*[A-Za-z]+|%|°")
_POW = re.compile(r"(\^|\*\*)\s*([+-]?)([0-9]+)")


def _number(run, field, raw, kind):
    """(float, text shown, plain integer?) of a run of digits, dots and commas."""
    if len(run) > 40:
        raise _refuse("Too many digits in one number.", field, raw, kind)
    dots, commas = run.count("."), run.count(",")
    if dots + commas > 1:
        raise _refuse(f"{run!r} is not one number: use one decimal point (or one decimal "
                      "comma) and no thousands separators.", field, raw, kind)
    if run.strip(".,") == "":
        raise _refuse(f"{run!r} is not a number.", field, raw, kind)
    if commas:
        whole, frac = run.split(",")
        if not whole or not frac:
            raise _refuse(f"{run!r} is not a number: a decimal comma needs digits on both "
                          "sides.", field, raw, kind)
        if len(frac) == 3 and 1 <= len(whole) <= 3 and not whole.startswith("0"):
            raise _refuse(f"{run!r} is ambiguous: a thousands separator or a decimal comma? "
                          f"Write {whole}{frac} or {whole}.{frac}.", field, raw, kind)
        run = f"{whole}.{frac}"
    return float(run), run, dots + commas == 0


def _tokens(text, field, raw, kind):
    """Split sanitised text into tokens: num, word, op, pow, mark, sign."""
    toks, i, n = [], 0, len(text)
    while i < n:
        ch = text[i]
        if ch == " ":
            i += 1
            continue
        if ch.isdigit() or (ch == "." and i + 1 < n and text[i + 1].isdigit()):
            m = _NUM_RUN.match(text, i)
            run = m.group(0).rstrip(",")
            value, shown, is_int = _number(run, field, raw, kind)
            i += len(run)
            e = _EXP.match(text, i)
            if e:
                mant = value
                value = float(f"{shown}{e.group(0)}")
                shown = f"{shown}{e.group(0)}"
                is_int = False
                i = e.end()
                if mant != 0 and (value == 0 or not math.isfinite(value)):
                    raise _refuse(f"{shown} is beyond the range of numbers computed with.",
                                  field, raw, kind, RangeError)
            if 0 < abs(value) < 1e-300:
                raise _refuse(f"{shown} is so close to zero that it is not a real value: "
                              "enter 0 or a value of a physical size.", field, raw, kind,
                              RangeError)
            toks.append(("num", value, shown, is_int))
            continue
        if ch in "*^":
            m = _POW.match(text, i)
            if m:
                if len(m.group(3)) > 1 or int(m.group(3)) == 0:
                    raise _refuse("A unit takes a small power only (^2, ^3, ^−1 …); powers of "
                                  "numbers and large powers are not read.", field, raw, kind)
                toks.append(("pow", int(m.group(2) + m.group(3)), m.group(0)))
                i = m.end()
                continue
            if ch == "^":
                raise _refuse("'^' must be followed by a small whole power, e.g. m^2.",
                              field, raw, kind)
            toks.append(("op", "*"))
            i += 1
            continue
        if ch == "/":
            toks.append(("op", "/"))
            i += 1
            continue
        if ch in "+-":
            if toks:
                raise _refuse("A sign inside the value: enter one value with at most one "
                              "leading sign (a range such as 10-12 is not read).",
                              field, raw, kind)
            toks.append(("sign", -1.0 if ch == "-" else 1.0))
            i += 1
            continue
        if ch == "'" and text[i + 1:i + 2] == "'":
            toks.append(("mark", '"'))
            i += 2
            continue
        if ch in "'\"":
            toks.append(("mark", ch))
            i += 1
            continue
        m = _WORD.match(text, i)
        if m is None:
            raise _refuse(f"Not a number with a unit: {ch!r} is out of place here.",
                          field, raw, kind)
        word = m.group(0).replace(" ", "")
        end = m.end()
        if word in ("x", "X"):
            toks.append(("op", "x"))
            i = end
            continue
        if len(word) > _MAX_WORD:
            raise _refuse(f"Unknown unit {word[:_MAX_WORD]!r}….", field, raw, kind, UnitError)
        if word.lower() == "deg":
            m2 = re.compile(r"\s*\.?\s*([CcFf])(?![A-Za-z])").match(text, end)
            if m2:
                word, end = "deg" + m2.group(1).upper(), m2.end()
        if word == "°":
            raise _refuse("A degree sign needs its scale: °C or °F.", field, raw, kind,
                          UnitError)
        # "1.2mx0.8m": a unit glued to the x of a product
        if (len(word) > 1 and word[-1] in "xX" and _unit(word, kind) is None
                and _unit(word[:-1], kind) is not None):
            toks.append(("word", word[:-1]))
            toks.append(("op", "x"))
            i = end
            continue
        # "m2", "ft2": a unit's own power written without ^
        d = re.compile(r"([23])(?![0-9.,/])").match(text, end)
        toks.append(("word", word))
        if d and word != "%":
            toks.append(("pow", int(d.group(1)), d.group(1)))
            end = d.end()
        i = end
    return toks


def _unit(word, kind):
    """Registry unit expression for a unit word read in a field of ``kind``, or None."""
    ctx = _CONTEXT_UNITS.get(kind, {})
    if word in ctx:
        return ctx[word]
    return _unit_name(word)


def _unit_name(word):
    hit = _UNIT_CACHE.get(word)
    if hit is None and word not in _UNIT_CACHE:
        w = _ALIASES.get(word, word)
        ureg = registry()
        if w == "%":
            hit = "percent"
        elif "/" in w or "^" in w:
            hit = w
        else:
            try:
                hit = ureg.get_name(w.replace("°", "deg"))
            except Exception:  # noqa: BLE001 - pint's lookup raises several kinds for "unknown"
                hit = None
        _UNIT_CACHE[word] = hit
    return hit


_UNIT_CACHE = {}
_BASE_CACHE = {}


def _base(unit_expr):
    """(factor, dims) of a unit expression in the registry's base units."""
    hit = _BASE_CACHE.get(unit_expr)
    if hit is None:
        ureg = registry()
        q = ureg.Quantity(1.0, ureg.parse_units(unit_expr.replace("^", "**"))
                          if ("/" in unit_expr or "^" in unit_expr or "*" in unit_expr)
                          else unit_expr)
        if unit_expr in ("degC", "degF", "kelvin", "K"):
            hit = (None, (("[temperature]", 1),))
        else:
            b = q.to_base_units()
            hit = (float(b.magnitude), tuple(sorted(dict(b.dimensionality).items())))
        _BASE_CACHE[unit_expr] = hit
    return hit


def _symbol_of(unit_expr):
    ureg = registry()
    try:
        text = f"{ureg.parse_units(unit_expr.replace('^', '**')):~}"
        text = re.sub(r"(?<![A-Za-z])l(?![A-Za-z])", "L", text)
    except Exception:  # noqa: BLE001 - fall back to the expression itself
        text = unit_expr
    return (text.replace("degC", "°C").replace("degF", "°F").replace(" ** 2", "²")
            .replace(" ** 3", "³").replace("**2", "²").replace("**3", "³").replace(" ", ""))


def _show_number(x):
    text = f"{x:.6g}"
    if "e" in text:
        mant, exp = text.split("e")
        text = f"{mant}e{int(exp)}"
    return text.replace("-", "\u2212")


def _factors(toks, field, raw, kind):
    """Group tokens into factors: [{num, shown, unit word, power, op}]."""
    sign = 1.0
    if toks and toks[0][0] == "sign":
        sign = toks[0][1]
        toks = toks[1:]
    factors, i, n = [], 0, len(toks)
    op = None
    while i < n:
        f = {"num": None, "shown": None, "word": None, "power": 1, "op": op, "mark": None}
        t = toks[i]
        if t[0] == "op":
            raise _refuse("An operator with nothing before it." if op is None else
                          "Two operators in a row.", field, raw, kind)
        if t[0] == "pow":
            raise _refuse("A power belongs after a unit (m^2), not after a number: write "
                          "1000 or 1e3 for a power of ten.", field, raw, kind)
        if t[0] == "mark" and f["num"] is None:
            raise _refuse("An inch or foot mark needs a number before it (3/8\", 2').",
                          field, raw, kind)
        if t[0] == "num":
            value, shown = t[1], t[2]
            i += 1
            # a fraction a/b of two whole numbers, and a mixed number n a/b
            def frac_at(j):
                if (j + 2 < n + 0 and toks[j][0] == "num" and toks[j][3]
                        and toks[j + 1] == ("op", "/") and toks[j + 2][0] == "num"
                        and toks[j + 2][3]):
                    return j
                return None
            if t[3] and i + 1 < n and toks[i] == ("op", "/") and toks[i + 1][0] == "num" \
                    and toks[i + 1][3]:
                den = toks[i + 1][1]
                if den == 0:
                    raise _refuse("A fraction with zero below the line.", field, raw, kind)
                value, shown = value / den, f"{t[2]}/{toks[i + 1][2]}"
                i += 2
            elif t[3] and frac_at(i) is not None:
                num, den = toks[i][1], toks[i + 2][1]
                if den == 0:
                    raise _refuse("A fraction with zero below the line.", field, raw, kind)
                if not num < den:
                    raise _refuse(f"'{t[2]} {toks[i][2]}/{toks[i + 2][2]}' is not a mixed "
                                  "number: the fraction must be below one.", field, raw, kind)
                value, shown = value + num / den, f"{t[2]} {toks[i][2]}/{toks[i + 2][2]}"
                i += 3
            f["num"], f["shown"] = value, shown
            if i < n and toks[i][0] == "num":
                raise _refuse(f"Two numbers in a row ({shown} {toks[i][2]}): a value has one "
                              "number; use x between dimensions (1200 x 800 mm).",
                              field, raw, kind)
        if i < n and toks[i][0] == "mark":
            if f["num"] is None:
                raise _refuse("An inch or foot mark needs a number before it.", field, raw,
                              kind)
            f["word"], f["mark"] = _MARK_UNITS[toks[i][1]], toks[i][1]
            i += 1
        elif i < n and toks[i][0] == "word":
            f["word"] = toks[i][1]
            i += 1
            if i < n and toks[i][0] == "pow":
                f["power"] = toks[i][1]
                i += 1
        if f["num"] is None and f["word"] is None:
            raise _refuse("Not a number with a unit.", field, raw, kind)
        factors.append(f)
        if len(factors) > _MAX_FACTORS:
            raise _refuse("Too many factors: a value is a number and a unit, or a product "
                          "such as 1.2 m x 0.8 m.", field, raw, kind)
        if i >= n:
            break
        t = toks[i]
        if t[0] == "op":
            op = t[1]
            i += 1
            if i >= n:
                raise _refuse("The text ends with an operator.", field, raw, kind)
            continue
        # feet then inches: 5' 6", 5 ft 6 in
        if (f["word"] in ("foot", "ft", "feet") and t[0] == "num" and f["power"] == 1):
            op = "+"
            continue
        if t[0] == "num":
            raise _refuse(f"A number after the unit ({t[2]}): a value has one number and "
                          "one unit; use x between dimensions (1200 x 800 mm).",
                          field, raw, kind)
        if t[0] == "word":
            raise _refuse(f"Two units in a row ({f['word']} {t[1]}): write them with / or * "
                          "(mm/yr).", field, raw, kind)
        if t[0] == "pow":
            raise _refuse("A power belongs directly after a unit (m^2); powers of numbers "
                          "and powers of powers are not read (write 1000 or 1e3).",
                          field, raw, kind)
        raise _refuse("Not a number with a unit.", field, raw, kind)
    return sign, factors


def _evaluate(text, kind, field, raw, default_unit):
    """(SI value, dims, echo) of sanitised text read in a field of ``kind``."""
    toks = _tokens(text, field, raw, kind)
    if not toks or all(t[0] == "sign" for t in toks):
        raise _refuse("Not a number with a unit.", field, raw, kind)
    sign, factors = _factors(toks, field, raw, kind)
    ops = [f["op"] for f in factors[1:]]
    # 1200 x 800 mm: the unit after the last number belongs to every number of the product
    if (len(factors) > 1 and all(o == "x" for o in ops) and factors[-1]["word"]
            and all(f["word"] is None for f in factors[:-1])
            and all(f["num"] is not None for f in factors)):
        for f in factors[:-1]:
            f["word"], f["power"] = factors[-1]["word"], factors[-1]["power"]
    if factors[0]["num"] is None:
        raise _refuse("A number is missing before the unit.", field, raw, kind)
    if len(factors) > 1:
        for f, o in zip(factors[1:], ops):
            if o == "x" and f["num"] is None:
                raise _refuse("Each side of x needs a number (1.2 m x 0.8 m).",
                              field, raw, kind)
            if o == "+" and (f["word"] not in ("inch", "in", "inches") or len(factors) > 2):
                raise _refuse("Feet may be followed by inches only (5 ft 6 in, 5' 6\").",
                              field, raw, kind)
    # resolve every unit word in the field's context
    for f in factors:
        if f["word"] is None:
            continue
        unit = _unit(f["word"], kind)
        if unit is None:
            raise UnitError(f"Unknown unit {f['word']!r}.", field=field, value=raw,
                            allowed=f"units {KINDS[kind][2]}")
        if not -4 <= f["power"] <= 4:
            raise _refuse("A unit takes a small power only (^2, ^3).", field, raw, kind)
        f["unit"] = unit
    # a single offset temperature: 25 °C
    f0 = factors[0]
    if len(factors) == 1 and f0["word"] is not None and _base(f0["unit"])[0] is None:
        if f0["power"] != 1:
            raise _refuse("A temperature takes no power.", field, raw, kind)
        value = sign * f0["num"]
        si = registry().Quantity(value, f0["unit"]).to("K").magnitude
        return (float(si), (("[temperature]", 1),),
                f"{_show_number(value)} {_symbol_of(f0['unit'])}", f0["unit"])
    if len(factors) == 1 and f0["word"] is None:
        if default_unit is None:
            raise UnitError("A unit is needed here.", field=field, value=raw,
                            allowed=f"units {KINDS[kind][2]}")
        value = sign * f0["num"]
        if default_unit in ("degC", "degF"):
            si = registry().Quantity(value, default_unit).to("K").magnitude
            return float(si), (("[temperature]", 1),), \
                f"{_show_number(value)} {_symbol_of(default_unit)}", default_unit
        factor, dims = _base(default_unit) if default_unit else (1.0, ())
        echo = f"{_show_number(value)} {_symbol_of(default_unit)}".strip() \
            if default_unit else _show_number(value)
        return value * factor, dims, echo, default_unit
    magnitude, dims, parts = sign, {}, []
    for f in factors:
        if f["word"] is None:
            # a plain multiplier: 1.2 m * 0.8 m * 2
            if f["op"] == "/":
                if f["num"] == 0:
                    raise _refuse("Division by zero.", field, raw, kind)
                magnitude /= f["num"]
            else:
                magnitude *= f["num"]
            joint = {None: "", "x": " × ", "*": " × ", "/": " / "}[f["op"]]
            parts.append(joint + _show_number(f["num"]))
            continue
        if _base(f["unit"])[0] is None:
            if f["unit"] in ("degC", "degF"):
                raise _refuse("A temperature in °C or °F cannot be multiplied or divided; "
                              "use K.", field, raw, kind)
        factor, fdims = _base(f["unit"]) if _base(f["unit"])[0] is not None else \
            (1.0, (("[temperature]", 1),))
        p = -f["power"] if f["op"] == "/" else f["power"]
        num = 1.0 if f["num"] is None else f["num"]
        if f["op"] == "/":
            if num == 0:
                raise _refuse("Division by zero.", field, raw, kind)
            magnitude /= num
        elif f["op"] == "+":
            # inches after feet: add in feet
            magnitude = magnitude + sign * num / 12.0
            parts.append(f" {_show_number(num)} in")
            continue
        else:
            magnitude *= num
        magnitude *= factor ** p
        for d, e in fdims:
            dims[d] = dims.get(d, 0) + e * p
        sym = _symbol_of(f["unit"])
        if f["power"] != 1:
            sym += {2: "²", 3: "³"}.get(f["power"], f"^{f['power']}")
        shown = f"{_show_number(f['num'])} {sym}" if f["num"] is not None else sym
        joint = {None: "", "x": " × ", "*": " × ", "/": " / "}[f["op"]]
        if f["op"] == "/" and f["num"] is None:
            joint = "/"
        parts.append(joint + shown)
    if factors[-1]["op"] == "+":
        # 5 ft 6 in: re-express in feet and inches
        feet = factors[0]["num"] + factors[1]["num"] / 12.0
        magnitude = sign * feet * _base("foot")[0]
        parts = [f"{_show_number(sign * factors[0]['num'])} ft {_show_number(factors[1]['num'])}"
                 " in"]
    echo = "".join(parts)
    if sign < 0 and factors[-1]["op"] != "+":
        echo = "\u2212" + echo
    dims = tuple(sorted((d, e) for d, e in dims.items() if e != 0))
    return magnitude, dims, echo, None


def _kind_of(dims):
    for kind, (si_unit, _d, _ex) in KINDS.items():
        if dims == _base(si_unit or "dimensionless")[1] if si_unit else dims == ():
            return kind
    return None


def _words(kind):
    return f"a {kind.replace('_', ' ')}" if kind else "not a recognised quantity"


def _dims_words(dims):
    kind = _kind_of(dims)
    if kind == "fraction":
        return "a plain number"
    if kind:
        return _words(kind)
    return "a quantity of another kind"


def read(text, kind, *, field=None, default_unit=None, kinds=None, thread=False,
         plain=False, what=None):
    """Read a user's quantity by the grammar below; return a :class:`Reading`.

    The grammar (nothing else is read, nothing is dropped):

    * a number: digits with one decimal point, or one unambiguous decimal comma
      (``2,5`` is 2.5; ``1,000`` and ``1,5,5`` are refused), an optional
      exponent (``1e-3``), a fraction ``3/8`` or a mixed number ``1 1/2``;
    * a unit word after the number (``mm``, ``°C``, ``mol/L``) with its own small
      power (``m^2``, ``m²``, ``m2``), or an inch or foot mark (``3/8"``, ``2'``);
    * products and quotients of such factors with ``x``, ``×``, ``*``, ``/``
      (``1.2 m x 0.8 m``; ``1200 x 800 mm`` gives every number the unit);
    * feet then inches (``5' 6"``, ``5 ft 6 in``);
    * with ``thread=True``, a metric thread designation (``M10``, ``M10x1.5``)
      read as its nominal diameter.

    Where a letter means two things, ``kind`` decides: ``60 C`` in a
    temperature field is 60 °C; ``0.01 M`` in a molar concentration is mol/L.
    Only short unit words reach pint, one at a time, so every call is fast.

    Parameters
    ----------
    text : str or int or float
    kind : str
        A key of :data:`KINDS`.
    field : str, optional
        The input key, echoed in any error.
    default_unit : str, optional
        Unit of a bare number.
    kinds : tuple of str, optional
        Several kinds the text may have (the first is the bare number's kind);
        the reading's ``kind`` says which one it was.
    thread : bool
        Accept metric thread designations (a diameter field).
    plain : bool
        A plain number only: no unit, no % (a count, a coefficient).
    what : str, optional
        Words for the kinds together in messages (``"a concentration"``).

    Raises
    ------
    InputError, UnitError, RangeError
        With the field, the text and what is allowed.

    >>> read("2,5 mm", "length").text
    '2.5 mm'
    >>> round(read('1 1/2"', "length").value, 6)
    0.0381
    >>> read("60 C", "temperature").value
    333.15
    """
    kinds = tuple(kinds or (kind,))
    kind = kinds[0]
    if text is None or (isinstance(text, str) and not text.strip()):
        raise InputError("This field is empty.", field=field, value="",
                         allowed=f"a {kind.replace('_', ' ')} such as {_example(kind)}")
    if isinstance(text, bool) or not isinstance(text, (str, int, float)):
        what = "true/false" if isinstance(text, bool) else type(text).__name__
        raise InputError(f"Expected a number with a unit as text, got {what}.", field=field,
                         value=text if isinstance(text, (str, int, float)) else what,
                         allowed=f"a value such as {_example(kind)} (units {KINDS[kind][2]})")
    if isinstance(text, (int, float)):
        try:
            number = float(text)
        except OverflowError:
            raise _refuse("The number is too large to be a real value.", field,
                          f"a whole number of about {int(text.bit_length() * 0.30103)} digits",
                          kind, RangeError) from None
        if not math.isfinite(number):
            raise InputError("The number is not finite.", field=field, value=str(text),
                             allowed=f"a finite value such as {_example(kind)}")
        text = repr(number) if isinstance(text, float) else str(int(number))
    raw = text
    if len(raw) > MAX_LENGTH:
        raise InputError(f"The text is {len(raw)} characters long; a value is at most "
                         f"{MAX_LENGTH}.", field=field, value=raw[:MAX_LENGTH] + "…",
                         allowed=f"a value such as {_example(kind)} (units {KINDS[kind][2]})")
    clean = _sanitise(raw, field, kind).strip()
    if thread:
        m = _THREAD.fullmatch(clean)
        if m:
            d = float(m.group(1).replace(",", "."))
            if not 1 <= d <= 300:
                raise _refuse(f"M{m.group(1)} is not a metric thread size (M1 to M300).",
                              field, raw, kind, RangeError)
            pitch = f" × {m.group(2).replace(',', '.')}" if m.group(2) else ""
            value = d * 1e-3
            si = _base(KINDS[kind][0])[0]
            return Reading(value / si, f"M{_show_number(d)}{pitch} thread: "
                           f"{_show_number(d)} mm nominal diameter", kind)
    value, dims, echo, unit = _evaluate(clean, kind, field, raw, default_unit)
    if plain and not _PLAIN.fullmatch(echo):
        raise _refuse("Expected a plain number, without a unit.", field, raw, kind)
    got = _kind_of(dims)
    if got not in kinds:
        alts = what or " or ".join(_words(k) for k in kinds)
        raise UnitError(f"That is {_dims_words(dims)}, not {alts}.", field=field, value=raw,
                        allowed=f"units {KINDS[kind][2]}")
    si_unit = KINDS[got][0]
    if si_unit and got != "temperature":
        value = value / _base(si_unit)[0]
    value = float(value)
    _check_limits(value, got, field, raw, default_unit if got == kind else None)
    return Reading(value, echo, got)


_PLAIN = re.compile(r"\u2212?[0-9.]+(e\u2212?[0-9]+)?")
_THREAD = re.compile(r"M\s?([0-9]{1,3}(?:[.,][0-9]{1,2})?)"
                     r"(?:\s*[xX*]\s*([0-9](?:[.,][0-9]{1,2})?))?(?:\s*mm)?")


def _check_limits(value, kind, field, raw, unit=None):
    if not math.isfinite(value):
        raise _refuse("The number is beyond the range of real values.", field, raw, kind,
                      RangeError)
    lo, hi, why_hi, why_lo = LIMITS.get(kind, _GENERIC_LIMITS)
    mag = abs(value)
    if kind == "temperature":
        if value <= 0:
            raise _refuse("A temperature cannot be at or below absolute zero.", field, raw,
                          kind, RangeError)
        mag = value
    if mag > hi:
        raise RangeError(f"Too large to be a real value: {why_hi}.", field=field, value=raw,
                         allowed=_limit_text(kind, unit))
    if 0 < mag < lo:
        raise RangeError(f"Too small to be a real value: {why_lo}.", field=field, value=raw,
                         allowed=_limit_text(kind, unit))


def _limit_text(kind, unit=None):
    lo, hi = LIMITS.get(kind, _GENERIC_LIMITS)[:2]
    si = KINDS[kind][0]
    if kind == "temperature":
        return "above absolute zero and below 10 000 K"
    if not unit or unit in ("degC", "degF"):
        unit = {"molar_concentration": "mol/L", "mass_concentration": "g/L", "time": "year",
                "area": "m**2", "rate": "mm/year"}.get(kind, si)
    if si:
        lo, hi = convert(lo, si, unit), convert(hi, si, unit)
    sym = _symbol_of(unit) if unit else ""
    return f"0, or between {_show_number(lo)} and {_show_number(hi)} {sym}".strip()


def check_limits(value, kind, *, field=None, raw=None):
    """Refuse an SI value outside :data:`LIMITS` (for values derived after parsing)."""
    _check_limits(value, kind, field, raw)


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
        The magnitude in ``KINDS[kind][0]`` (see :func:`read` for the grammar).

    Raises
    ------
    InputError
        Empty text or not a number.
    UnitError
        Unknown unit, or a unit of the wrong dimension (``3 kg`` for a potential).
    """
    return read(text, kind, field=field, default_unit=default_unit).value


def dimension_of(text):
    """Return which :data:`KINDS` key the text's quantity belongs to, or None."""
    try:
        clean = _sanitise(str(text)[:MAX_LENGTH], None, "fraction").strip()
        _value, dims, _echo, _unit_used = _evaluate(clean, "molar_concentration", None,
                                                    str(text), None)
    except (NoblegapError, ValueError):
        return None
    return _kind_of(dims)


_EXAMPLES = {
    "potential": "-0.80 V or -800 mV", "temperature": "25 °C", "length": "10 mm",
    "area": "0.5 m²", "current": "2 mA", "current_density": "1 µA/cm²",
    "molar_concentration": "0.1 mol/L", "molality": "0.1 mol/kg",
    "mass_concentration": "5 mg/L", "time": "20 year", "rate": "0.1 mm/yr",
    "mass": "10 g", "fraction": "0.5",
    "conductivity": "200 µS/cm", "resistivity": "25 ohm*m",
}


def _example(kind):
    return _EXAMPLES.get(kind) or f"a number and a unit ({KINDS[kind][2]})"


def convert(value, from_unit, to_unit):
    """Convert a float between units (offset temperatures included)."""
    ureg = registry()
    return float(ureg.Quantity(value, from_unit).to(to_unit).magnitude)


_SYMBOLS = {"degC": "°C", "degF": "°F", "m**2": "m²", "mm**2": "mm²", "cm**2": "cm²",
            "A/m**2": "A/m²", "uA/cm**2": "µA/cm²", "um": "µm", "uA": "µA"}


def show(value, unit):
    """A value as :func:`read` echoes it: ``show(0.0025, "mm")`` is ``'0.0025 mm'``."""
    return f"{_show_number(value)} {_symbol_of(unit)}".strip() if unit else _show_number(value)


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
