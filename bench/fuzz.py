"""Fuzz the core: N generated inputs per field of every calculator through api.run.

    python3 bench/fuzz.py [--per-field 600] [--seed 1] [--json]

Run by hand, not by the test suite. For each field of each calculator (taken
from the schema, so new fields are covered) it builds N inputs, the rest of
the form at the worked example's values:

* for quantity fields, half are well-formed entries in many spellings (decimal
  point or comma, fractions, mixed numbers, inch and foot marks, exponents,
  ``x`` products for areas, each unit's other spellings), each with the value
  it must mean computed here independently of the core (a reference reading);
* the rest are hostile: random pieces of the grammar glued together, random
  Unicode, power towers, 100 kB strings, denormals, template syntax, bidi and
  combining marks, non-string values.

It prints counts: answered, refused with a message, exceptions (``run``
raising or an internal error), non-finite numbers in any output, silent
misreads (an answer whose echoed reading differs from the reference), and
the slowest parse and slowest whole call in CPU time of this process (the
machine may be shared; the wall-clock slowest is printed too). Targets: 0 hangs, 0 exceptions,
0 non-finite, 0 misreads, slowest call <= 50 ms, over >= 20 000 inputs.
"""

from __future__ import annotations

import argparse
import json
import math
import random
import sys
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[1] / "core"))

from noblegap import api  # noqa: E402
from noblegap.schema import QUANTITY  # noqa: E402

BUDGET_MS = 50.0

# Reference units, with their SI factors written here (not taken from the core).
IN, FT, YEAR = 0.0254, 0.3048, 365 * 86400.0
UNITS = {
    "length": [("mm", 1e-3), ("cm", 1e-2), ("m", 1.0), ("in", IN), ("inch", IN), ('"', IN),
               ("ft", FT), ("'", FT), ("mil", IN / 1000), ("µm", 1e-6), ("um", 1e-6)],
    "area": [("m²", 1.0), ("m2", 1.0), ("m^2", 1.0), ("mm²", 1e-6), ("mm^2", 1e-6),
             ("cm2", 1e-4), ("ft2", FT ** 2), ("ft²", FT ** 2), ("in^2", IN ** 2)],
    "potential": [("V", 1.0), ("mV", 1e-3)],
    "time": [("year", YEAR), ("yr", YEAR), ("y", YEAR), ("years", YEAR), ("day", 86400.0),
             ("h", 3600.0)],
    "molar_concentration": [("mol/L", 1e3), ("mmol/L", 1.0), ("M", 1e3), ("mM", 1.0)],
    "fraction": [("", 1.0), ("%", 0.01), ("ppm", 1e-6)],
    "current_density": [("A/m²", 1.0), ("mA/m2", 1e-3), ("µA/cm²", 1e-2)],
    "rate": [("mm/yr", 1e-3 / YEAR), ("mpy", IN / 1000 / YEAR)],
}
TEMPERATURE = [("°C", lambda x: x + 273.15), ("C", lambda x: x + 273.15),
               ("degC", lambda x: x + 273.15), ("°F", lambda x: (x - 32) * 5 / 9 + 273.15),
               ("F", lambda x: (x - 32) * 5 / 9 + 273.15), ("K", lambda x: x)]

PIECES = ["1", "2,5", "0.375", "1/2", "3/8", "1e-3", "1e308", "1e-320", "-", "+", " ", "x",
          "×", "*", "/", "^2", "**", "2", "mm", "m", "in", '"', "'", "ft", "°C", "C", "F",
          "K", "V", "mV", "mol/L", "M", "mg/L", "year", "y", "m2", "%", "ppm", "M10", "(",
          ")", "{{", "}}", "${", "e", ",", ".", "\u202e", "\u0301", "\u0663", "\U0001f529",
          "\x00", "µ", "²", "½", "316L", "A4-70", "9**9**9", "10**10**10", "\ufeff"]
NASTY = ["10**10**10 V", "9**9**9", "(10**8)**(10**8)", "10**10**7 mm", "x" * 100_000,
         "9" * 100_000, "1e-320 mm", "5e-324 year", "1e-320 mol/L", "1e300 mol/L",
         "{{7*7}} mV", "${7*7} mV", "10 mm 5", "10 \U0001f529 mV", "10\x00 mV",
         "10\u202e mV", "1\u0301 mV", "\u0663 mm", "\uff13 mm", "1,5,5 mm", None, True,
         b"10 mm", ["10 mm"], {"a": 1}, float("nan"), float("inf"), 10 ** 400, -0.0]


def _number(rng):
    """(text, value) of a number in one of the spellings people use."""
    whole = rng.choice([0, 1, 2, 3, 5, 10, 12, 25, 60, 77, 140, 1200])
    style = rng.randrange(7)
    if style == 0:
        return str(whole), float(whole)
    if style == 1:
        dec = rng.randrange(1, 1000)
        return f"{whole}.{dec}", float(f"{whole}.{dec}")
    if style == 2:
        dec = rng.choice(["5", "25", "75", "05", "1234"])    # never 3 digits: ambiguous
        return f"{whole},{dec}", float(f"{whole}.{dec}")
    if style == 3:
        num, den = rng.choice([(1, 2), (3, 8), (1, 4), (5, 16), (7, 8)])
        return f"{num}/{den}", num / den
    if style == 4:
        num, den = rng.choice([(1, 2), (3, 8), (1, 4)])
        w = rng.randrange(1, 4)
        return f"{w} {num}/{den}", w + num / den
    if style == 5:
        exp = rng.randrange(-3, 4)
        return f"{whole or 1}e{exp}", float(f"{whole or 1}e{exp}")
    return f"-{whole}.5", -(whole + 0.5)


def _good(kind, rng):
    """(text, SI value) of a well-formed entry of ``kind``, or None."""
    text, x = _number(rng)
    if kind == "temperature":
        unit, to_k = rng.choice(TEMPERATURE)
        sep = "" if unit in ("C", "F") and rng.random() < 0.5 else " "
        return f"{text}{sep}{unit}", to_k(x)
    if kind == "area" and rng.random() < 0.3:
        b_text, b = _number(rng)
        unit, f = rng.choice(UNITS["length"][:7])
        if rng.random() < 0.5:
            return f"{text} {unit} x {b_text} {unit}", x * f * b * f
        if "/" not in text and "/" not in b_text:
            return f"{text} x {b_text} {unit}", x * f * b * f
        return None
    if kind not in UNITS:
        return None
    unit, f = rng.choice(UNITS[kind])
    sep = "" if unit in ('"', "'") else rng.choice([" ", "", " "])
    return f"{text}{sep}{unit}".strip(), x * f


def _hostile(rng):
    r = rng.random()
    if r < 0.15:
        return rng.choice(NASTY)
    if r < 0.6:
        return "".join(rng.choice(PIECES) for _ in range(rng.randrange(1, 9)))
    if r < 0.8:
        return "".join(chr(rng.randrange(0x20, 0x3000)) for _ in range(rng.randrange(1, 12)))
    return "".join(chr(rng.randrange(0, 0x110000)) for _ in range(rng.randrange(1, 6)))


def _echo_value(echo, unit):
    """The number an echo states in the field's unit (after '=' when converted)."""
    part = echo.rsplit(" = ", 1)[-1]
    num = part.split(" ")[0].replace("\u2212", "-")
    return float(num)


def _non_finite(obj):
    if isinstance(obj, float):
        return 0 if math.isfinite(obj) else 1
    if isinstance(obj, dict):
        return sum(_non_finite(v) for v in obj.values())
    if isinstance(obj, list):
        return sum(_non_finite(v) for v in obj)
    return 0


def fuzz(per_field=600, seed=1):
    rng = random.Random(seed)
    stats = {"inputs": 0, "answered": 0, "refused": 0, "exceptions": 0, "non_finite": 0,
             "misreads": 0, "checked_readings": 0, "slowest_call_ms": 0.0,
             "slowest_parse_ms": 0.0, "slowest_input": None, "over_budget": 0,
             "slowest_wall_ms": 0.0}
    examples = {"exceptions": [], "misreads": [], "over_budget": []}
    for name, calc in api.calculators().items():
        base = calc.raw_inputs(calc.example)
        for field in calc.fields:
            for i in range(per_field):
                ref = None
                if field.kind == QUANTITY and i % 2 == 0:
                    good = _good(field.quantity, rng)
                    if good is not None:
                        value, ref = good
                    else:
                        value = _hostile(rng)
                else:
                    value = _hostile(rng)
                inputs = dict(base)
                inputs[field.key] = value
                stats["inputs"] += 1
                t0 = time.process_time()
                try:
                    calc.read(inputs)
                except Exception:  # noqa: BLE001 - the parse may refuse; only its time counts
                    pass
                t_parse = (time.process_time() - t0) * 1e3
                t0, w0 = time.process_time(), time.perf_counter()
                try:
                    out = api.run(name, inputs)
                except Exception as exc:  # noqa: BLE001 - counted: run must never raise
                    stats["exceptions"] += 1
                    examples["exceptions"].append((name, field.key, repr(value)[:60], repr(exc)))
                    continue
                t_call = (time.process_time() - t0) * 1e3
                stats["slowest_wall_ms"] = max(stats["slowest_wall_ms"],
                                               (time.perf_counter() - w0) * 1e3)
                stats["slowest_parse_ms"] = max(stats["slowest_parse_ms"], t_parse)
                if t_call > stats["slowest_call_ms"]:
                    stats["slowest_call_ms"] = t_call
                    stats["slowest_input"] = f"{name}.{field.key}={repr(value)[:50]}"
                if max(t_call, t_parse) > BUDGET_MS:
                    stats["over_budget"] += 1
                    examples["over_budget"].append((name, field.key, repr(value)[:60],
                                                    round(t_call, 1)))
                try:
                    json.dumps(out, allow_nan=False)
                except ValueError:
                    stats["non_finite"] += 1
                stats["non_finite"] += _non_finite(out)
                if out.get("ok"):
                    stats["answered"] += 1
                    if ref is not None:
                        stats["checked_readings"] += 1
                        echo = out["inputs_read"].get(field.key, "")
                        si_unit_value = _to_field_unit(field, ref)
                        try:
                            seen = _echo_value(echo, field.unit)
                        except ValueError:
                            seen = None
                        if seen is None or not math.isclose(seen, si_unit_value, rel_tol=2e-5,
                                                            abs_tol=1e-12):
                            stats["misreads"] += 1
                            examples["misreads"].append((name, field.key, value, echo,
                                                         si_unit_value))
                elif out["error"].get("type") == "InternalError":
                    stats["exceptions"] += 1
                    examples["exceptions"].append((name, field.key, repr(value)[:60],
                                                   out["error"]["message"]))
                elif out["error"].get("message", "").strip():
                    stats["refused"] += 1
                else:
                    stats["exceptions"] += 1
                    examples["exceptions"].append((name, field.key, repr(value)[:60],
                                                   "error without a message"))
    return stats, examples


def _to_field_unit(field, si_value):
    from noblegap import units
    si = units.KINDS[field.quantity][0]
    return units.convert(si_value, si, field.unit) if field.unit else si_value


def main(argv=None):
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("--per-field", type=int, default=600)
    ap.add_argument("--seed", type=int, default=1)
    ap.add_argument("--json", action="store_true")
    args = ap.parse_args(argv)
    t0 = time.perf_counter()
    stats, examples = fuzz(args.per_field, args.seed)
    stats["wall_s"] = round(time.perf_counter() - t0, 1)
    stats["slowest_call_ms"] = round(stats["slowest_call_ms"], 1)
    stats["slowest_parse_ms"] = round(stats["slowest_parse_ms"], 1)
    stats["slowest_wall_ms"] = round(stats["slowest_wall_ms"], 1)
    if args.json:
        print(json.dumps({"stats": stats, "examples": {k: v[:10] for k, v in examples.items()}},
                         indent=2, ensure_ascii=False, default=repr))
    else:
        for key, value in stats.items():
            print(f"{key:>18}: {value}")
        for key, items in examples.items():
            for item in items[:5]:
                print(f"  {key}: {item!r}"[:300])
        ok = (stats["exceptions"] == 0 and stats["non_finite"] == 0 and stats["misreads"] == 0
              and stats["slowest_call_ms"] <= BUDGET_MS and stats["inputs"] >= 20_000)
        print("targets met" if ok else "targets NOT met")
    return 0


if __name__ == "__main__":
    sys.exit(main())
